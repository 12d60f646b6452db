#include "verifier/derivation/shape.h"

#include <algorithm>

#include "verifier/derivation/classify.h"

namespace thetagate::engine {

namespace {

struct ShapeError {
  std::string reason;
};

bool contains_call(const ExprPtr& e, const std::string& function) {
  std::vector<const Expr*> calls;
  collect_calls(e, function, calls);
  return !calls.empty();
}

Rational rational_constant(const Expr& e, const std::string& role) {
  std::string reason;
  auto v = constant_value(e, &reason);
  if (!v) throw ShapeError{"the " + role + " '" + print(e) + "' is not a number: " + reason};
  if (!v->is_rational())
    throw ShapeError{"the " + role + " '" + print(e) +
                     "' is irrational; only rational ones are supported"};
  return v->rational();
}

// A constant divisor; zero (n/0, n/0^10) has no shape to derive from.
Rational divisor_constant(const Expr& e) {
  Rational d = rational_constant(e, "divisor");
  if (d == 0) throw ShapeError{"the divisor '" + print(e) + "' is zero"};
  return d;
}

// A T argument as b n + c + (extra summands) with rounding noted.
struct LinearForm {
  Rational b, c;
  bool rounded = false;
  std::vector<ExprPtr> extra;
};

LinearForm linear_form(const ExprPtr& e) {
  LinearForm f;
  if (!mentions_n(*e)) {
    f.c = rational_constant(*e, "constant");
    return f;
  }
  auto scale = [](LinearForm x, const Rational& s) {
    x.b *= s;
    x.c *= s;
    return x;
  };
  auto sum = [](LinearForm x, const LinearForm& y) {
    x.b += y.b;
    x.c += y.c;
    x.rounded = x.rounded || y.rounded;
    x.extra.insert(x.extra.end(), y.extra.begin(), y.extra.end());
    return x;
  };
  switch (e->kind) {
    case ExprKind::kVariable:
      f.b = 1;
      return f;
    case ExprKind::kAdd:
      return sum(linear_form(e->args[0]), linear_form(e->args[1]));
    case ExprKind::kSub:
      return sum(linear_form(e->args[0]), scale(linear_form(e->args[1]), -1));
    case ExprKind::kNeg:
      return scale(linear_form(e->args[0]), -1);
    case ExprKind::kMul:
      if (!mentions_n(*e->args[0]))
        return scale(linear_form(e->args[1]), rational_constant(*e->args[0], "factor"));
      if (!mentions_n(*e->args[1]))
        return scale(linear_form(e->args[0]), rational_constant(*e->args[1], "factor"));
      break;
    case ExprKind::kDiv:
      if (!mentions_n(*e->args[1])) {
        // Inside T(...) a quotient is read as its floor: a bounded perturbation.
        LinearForm x = scale(linear_form(e->args[0]), Rational(1) / divisor_constant(*e->args[1]));
        x.rounded = true;
        return x;
      }
      break;
    case ExprKind::kCall:
      if (e->name == "floor" || e->name == "ceil") {
        LinearForm x = linear_form(e->args[0]);
        x.rounded = true;
        return x;
      }
      break;
    default:
      break;
  }
  f.extra.push_back(e);
  return f;
}

// n^(1/k), sqrt(n), possibly inside floor/ceil: k, else 0.
unsigned long root_index(const Expr& e, bool& rounded, bool* ceiling = nullptr) {
  const Expr* x = &e;
  if (x->kind == ExprKind::kCall && (x->name == "floor" || x->name == "ceil")) {
    rounded = true;
    if (ceiling) *ceiling = x->name == "ceil";
    x = x->args[0].get();
  }
  if (x->kind == ExprKind::kCall && x->name == "sqrt" && x->args[0]->kind == ExprKind::kVariable)
    return 2;
  if (x->kind == ExprKind::kPow && x->args[0]->kind == ExprKind::kVariable &&
      !mentions_n(*x->args[1])) {
    auto v = constant_value(*x->args[1]);
    if (v && v->is_rational() && numerator(v->rational()) == 1 && denominator(v->rational()) >= 2) {
      return static_cast<unsigned long>(denominator(v->rational()));
    }
  }
  return 0;
}

// A factor c · n^u · floor(n^(1/k))^v · ... that a root term's coefficient
// may carry (2 floor(sqrt(n)), sqrt(n), n/ceil(n^(1/3))); nullopt for any
// other expression.
struct RootFactor {
  Rational c = 1;
  RootCoefficient coefficient;
};

void merge_rounded(RootCoefficient& into, const RoundedRoot& r) {
  for (auto it = into.rounded.begin(); it != into.rounded.end(); ++it) {
    if (it->ceiling != r.ceiling || it->k != r.k) continue;
    it->exponent += r.exponent;
    if (it->exponent == 0) into.rounded.erase(it);
    return;
  }
  if (r.exponent != 0) into.rounded.push_back(r);
}

std::optional<RootFactor> root_factor(const Expr& e);

std::optional<RootFactor> root_power(const RootFactor& base, const Rational& r) {
  RootFactor out;
  if (base.c != 1) {
    if (denominator(r) != 1 || abs(numerator(r)) > 64 || base.c == 0) return std::nullopt;
    long j = numerator(r).convert_to<long>();
    Rational c = 1;
    for (long i = 0; i < (j < 0 ? -j : j); ++i) c *= base.c;
    out.c = j < 0 ? Rational(1) / c : c;
  }
  out.coefficient.n_exponent = base.coefficient.n_exponent * r;
  for (RoundedRoot x : base.coefficient.rounded) {
    x.exponent *= r;
    merge_rounded(out.coefficient, x);
  }
  return out;
}

std::optional<RootFactor> root_factor(const Expr& e) {
  if (!mentions_n(e)) {
    auto v = constant_value(e);
    if (!v || !v->is_rational()) return std::nullopt;
    return RootFactor{v->rational(), {}};
  }
  RootFactor out;
  switch (e.kind) {
    case ExprKind::kVariable:
      out.coefficient.n_exponent = 1;
      return out;
    case ExprKind::kNeg: {
      auto a = root_factor(*e.args[0]);
      if (a) a->c = -a->c;
      return a;
    }
    case ExprKind::kMul:
    case ExprKind::kDiv: {
      auto a = root_factor(*e.args[0]), b = root_factor(*e.args[1]);
      if (!a || !b) return std::nullopt;
      if (e.kind == ExprKind::kDiv) {
        if (b->c == 0) return std::nullopt;
        b = root_power(*b, Rational(-1));
        if (!b) return std::nullopt;
      }
      out.c = a->c * b->c;
      out.coefficient = a->coefficient;
      out.coefficient.n_exponent += b->coefficient.n_exponent;
      for (const RoundedRoot& x : b->coefficient.rounded) merge_rounded(out.coefficient, x);
      return out;
    }
    case ExprKind::kPow: {
      if (mentions_n(*e.args[1])) return std::nullopt;
      auto r = constant_value(*e.args[1]);
      auto base = root_factor(*e.args[0]);
      if (!r || !r->is_rational() || !base) return std::nullopt;
      return root_power(*base, r->rational());
    }
    case ExprKind::kCall: {
      bool rounded = false, ceiling = false;
      if (e.name == "sqrt" && e.args.size() == 1 && e.args[0]->kind == ExprKind::kVariable) {
        out.coefficient.n_exponent = Rational(1, 2);
        return out;
      }
      if ((e.name == "floor" || e.name == "ceil") && e.args.size() == 1) {
        if (unsigned long k = root_index(e, rounded, &ceiling)) {
          merge_rounded(out.coefficient, RoundedRoot{ceiling, k, Rational(1)});
          return out;
        }
      }
      return std::nullopt;
    }
    default:
      return std::nullopt;
  }
}

struct LineParts {
  std::string condition;
  ExprPtr test;
  std::vector<ScaledTerm> scaled;
  std::vector<SubtractiveTerm> subtractive;
  std::vector<RootTerm> roots;
  std::vector<HistorySum> sums;
  std::vector<ExprPtr> driving;
};

// c n^j for an expression built from constants and n by * / ^ and unary
// minus (2/n, n^2/3); empty otherwise.
std::optional<std::pair<Rational, int>> monomial(const Expr& e) {
  if (!mentions_n(e)) {
    auto v = constant_value(e);
    if (!v || !v->is_rational()) return std::nullopt;
    return std::make_pair(v->rational(), 0);
  }
  switch (e.kind) {
    case ExprKind::kVariable:
      return std::make_pair(Rational(1), 1);
    case ExprKind::kNeg: {
      auto a = monomial(*e.args[0]);
      if (!a) return a;
      return std::make_pair(Rational(-a->first), a->second);
    }
    case ExprKind::kMul:
    case ExprKind::kDiv: {
      auto a = monomial(*e.args[0]), b = monomial(*e.args[1]);
      if (!a || !b) return std::nullopt;
      if (e.kind == ExprKind::kMul)
        return std::make_pair(Rational(a->first * b->first), a->second + b->second);
      if (b->first == 0) return std::nullopt;
      return std::make_pair(Rational(a->first / b->first), a->second - b->second);
    }
    case ExprKind::kPow: {
      auto a = monomial(*e.args[0]);
      const Expr& k = *e.args[1];
      if (!a || k.kind != ExprKind::kNumber || !k.has_small || k.small < 0 || k.small > 64)
        return std::nullopt;
      Rational c = 1;
      for (int64_t i = 0; i < k.small; ++i) c *= a->first;
      return std::make_pair(c, a->second * static_cast<int>(k.small));
    }
    default:
      return std::nullopt;
  }
}

void add_term(LineParts& parts, const Rational& a, const Expr& call,
              const RootCoefficient& varying) {
  const ExprPtr& arg = call.args[0];
  bool rounded = false, ceiling = false;
  if (unsigned long k = root_index(*arg, rounded, &ceiling)) {
    parts.roots.push_back({a, k, rounded, ceiling, print(*arg), varying});
    return;
  }
  if (varying.varies()) {
    throw ShapeError{"the coefficient '" + varying.text + "' of " + print(call) +
                     " depends on n; a coefficient that depends on n is read only for root "
                     "terms such as T(floor(sqrt(n)))"};
  }
  LinearForm f = linear_form(arg);
  std::string written = print(*arg);
  std::optional<GrowthClass> extra_growth;
  for (const auto& x : f.extra) {
    Classification c = classify(*x);
    if (!c) {
      throw ShapeError{"the argument '" + written + "' is not of the form b*n + h(n): its part '" +
                       print(*x) + "' has no growth class (" + c.reason + ")"};
    }
    if (!extra_growth || compare(*c.growth, *extra_growth) > 0) extra_growth = c.growth;
  }
  if (extra_growth && compare(*extra_growth, GrowthClass::polylog(1)) >= 0) {
    throw ShapeError{"the argument '" + written +
                     "' is not of the form b*n + h(n) with h = o(n): "
                     "it contains a part of order " +
                     to_string(*extra_growth)};
  }
  if (f.b == 1 && !extra_growth) {
    if (f.c < 0 && denominator(f.c) == 1) {
      parts.subtractive.push_back({a, -numerator(f.c)});
      return;
    }
    throw ShapeError{"the argument '" + written + "' does not shrink by a whole constant"};
  }
  if (f.b <= 0 || f.b >= 1) {
    throw ShapeError{"the argument '" + written + "' is not of the form b*n + h(n) with 0 < b < 1"};
  }
  ScaledTerm t;
  t.a = a;
  t.b = f.b;
  t.argument = written;
  if (extra_growth) {
    t.perturbation = Perturbation::kGrowing;
    t.perturbation_growth = extra_growth;
  } else if (f.rounded || f.c != 0) {
    t.perturbation = Perturbation::kBounded;
  }
  parts.scaled.push_back(t);
}

ExprPtr scaled_piece(const ExprPtr& e, const Rational& s, int n_power) {
  ExprPtr x = e;
  if (n_power > 0)
    x = make_binary(ExprKind::kMul, x,
                    make_binary(ExprKind::kPow, make_variable(), make_number(n_power)));
  if (n_power < 0)
    x = make_binary(ExprKind::kDiv, x,
                    make_binary(ExprKind::kPow, make_variable(), make_number(-n_power)));
  if (s == 1) return x;
  if (s == -1) return make_unary(ExprKind::kNeg, x);
  return make_binary(ExprKind::kMul, make_number(s), x);
}

// `varying` times the factor `factor` (which mentions n): its n-dependence
// multiplied in, to the power `sign` (+1, or -1 for a divisor), and its text.
RootCoefficient times_factor(RootCoefficient varying, const RootCoefficient& factor, int sign,
                             const Expr& written) {
  varying.n_exponent += sign * factor.n_exponent;
  for (RoundedRoot r : factor.rounded) {
    r.exponent *= sign;
    merge_rounded(varying, r);
  }
  std::string text = sign > 0 ? print(written) : "1/(" + print(written) + ")";
  varying.text = varying.text.empty() ? text : varying.text + " " + text;
  return varying;
}

// Splits a line's body into its T terms and the driving function; a factor
// c n^j (j != 0) is allowed only in front of a sum over earlier values, and
// a factor with roots of n (2 floor(sqrt(n))) only in front of a root term.
void split(const ExprPtr& e, const Rational& scale, LineParts& parts, const std::string& name,
           int n_power = 0, const RootCoefficient& varying = {}) {
  if (!contains_call(e, name)) {
    if (varying.varies())
      throw ShapeError{"the factor '" + varying.text + "' multiplies '" + print(*e) +
                       "', which has no call of " + name};
    parts.driving.push_back(scaled_piece(e, scale, n_power));
    return;
  }
  const std::string text = print(*e);
  switch (e->kind) {
    case ExprKind::kAdd:
      split(e->args[0], scale, parts, name, n_power, varying);
      split(e->args[1], scale, parts, name, n_power, varying);
      return;
    case ExprKind::kSub:
      split(e->args[0], scale, parts, name, n_power, varying);
      split(e->args[1], -scale, parts, name, n_power, varying);
      return;
    case ExprKind::kNeg:
      split(e->args[0], -scale, parts, name, n_power, varying);
      return;
    case ExprKind::kMul: {
      bool left = contains_call(e->args[0], name), right = contains_call(e->args[1], name);
      if (left && right)
        throw ShapeError{"'" + text + "' multiplies two " + name +
                         " terms: the recurrence is not linear in " + name};
      const ExprPtr& inner = left ? e->args[0] : e->args[1];
      const ExprPtr& factor = left ? e->args[1] : e->args[0];
      if (mentions_n(*factor)) {
        if (auto m = monomial(*factor)) {
          split(inner, scale * m->first, parts, name, n_power + m->second, varying);
          return;
        }
        if (auto r = root_factor(*factor)) {
          split(inner, scale * r->c, parts, name, n_power,
                times_factor(varying, r->coefficient, 1, *factor));
          return;
        }
        throw ShapeError{"the coefficient '" + print(*factor) + "' of " + print(*inner) +
                         " depends on n"};
      }
      split(inner, scale * rational_constant(*factor, "coefficient"), parts, name, n_power,
            varying);
      return;
    }
    case ExprKind::kDiv:
      if (contains_call(e->args[1], name))
        throw ShapeError{"'" + text + "' divides by " + name + ": not linear in " + name};
      if (mentions_n(*e->args[1])) {
        if (auto m = monomial(*e->args[1]); m && m->first != 0) {
          split(e->args[0], scale / m->first, parts, name, n_power - m->second, varying);
          return;
        }
        if (auto r = root_factor(*e->args[1]); r && r->c != 0) {
          split(e->args[0], scale / r->c, parts, name, n_power,
                times_factor(varying, r->coefficient, -1, *e->args[1]));
          return;
        }
        throw ShapeError{"the coefficient 1/(" + print(*e->args[1]) + ") in '" + text +
                         "' depends on n"};
      }
      split(e->args[0], scale / divisor_constant(*e->args[1]), parts, name, n_power, varying);
      return;
    case ExprKind::kSum:
      if (varying.varies())
        throw ShapeError{"the coefficient '" + varying.text + "' of " + text + " depends on n"};
      parts.sums.push_back({scale, n_power, e});
      return;
    case ExprKind::kCall:
      if (e->name == name) {
        bool rounded = false;
        bool root = e->args.size() == 1 && root_index(*e->args[0], rounded) != 0;
        if (n_power != 0 && !root) {
          throw ShapeError{"the coefficient of " + text + " depends on n (a factor n^" +
                           std::to_string(n_power) + ")"};
        }
        RootCoefficient coefficient = varying;
        if (n_power != 0) {
          coefficient.n_exponent += n_power;
          std::string power = n_power == 1 ? "n" : "n^" + std::to_string(n_power);
          coefficient.text = coefficient.text.empty() ? power : coefficient.text + " " + power;
        }
        add_term(parts, scale, *e, coefficient);
        return;
      }
      throw ShapeError{name + " appears inside '" + text + "': the recurrence is not linear in " +
                       name};
    case ExprKind::kPow:
      throw ShapeError{name + " appears inside the power '" + text +
                       "': the recurrence is not linear in " + name};
    default:
      throw ShapeError{name + " appears inside '" + text + "'"};
  }
}

std::string recursion_text(const LineParts& p, const std::string& name) {
  std::string s;
  auto add = [&](const Rational& a, const std::string& call) {
    s += (s.empty() ? "" : " + ") + (a == 1 ? "" : to_string(a) + " ") + call;
  };
  for (const auto& t : p.scaled) add(t.a, name + "(" + t.argument + ")");
  for (const auto& t : p.subtractive) add(t.a, name + "(n - " + t.c.str() + ")");
  for (const auto& t : p.roots) {
    std::string factor = t.coefficient.varies() ? t.coefficient.text + " " : "";
    add(t.a, factor + name + "(" + t.argument + ")");
  }
  for (const auto& t : p.sums) add(t.scale, print(*t.sum));
  return s.empty() ? "no recursive call" : s;
}

bool same_recursion(LineParts x, LineParts y) {
  if (x.scaled.size() != y.scaled.size() || x.subtractive.size() != y.subtractive.size() ||
      x.roots.size() != y.roots.size() || x.sums.size() != y.sums.size()) {
    return false;
  }
  for (size_t i = 0; i < x.sums.size(); ++i) {
    if (x.sums[i].scale != y.sums[i].scale || x.sums[i].n_power != y.sums[i].n_power ||
        !same_tree(*x.sums[i].sum, *y.sums[i].sum))
      return false;
  }
  auto by_b = [](const ScaledTerm& s, const ScaledTerm& t) {
    return s.b < t.b || (s.b == t.b && s.a < t.a);
  };
  std::sort(x.scaled.begin(), x.scaled.end(), by_b);
  std::sort(y.scaled.begin(), y.scaled.end(), by_b);
  for (size_t i = 0; i < x.scaled.size(); ++i) {
    if (x.scaled[i].a != y.scaled[i].a || x.scaled[i].b != y.scaled[i].b) return false;
  }
  auto by_c = [](const SubtractiveTerm& s, const SubtractiveTerm& t) { return s.c < t.c; };
  std::sort(x.subtractive.begin(), x.subtractive.end(), by_c);
  std::sort(y.subtractive.begin(), y.subtractive.end(), by_c);
  for (size_t i = 0; i < x.subtractive.size(); ++i) {
    if (x.subtractive[i].a != y.subtractive[i].a || x.subtractive[i].c != y.subtractive[i].c)
      return false;
  }
  // Lines may list their root terms in any order: T(sqrt(n)) + 2 T(n^(1/3))
  // recurses as 2 T(n^(1/3)) + T(sqrt(n)).
  auto by_k = [](const RootTerm& s, const RootTerm& t) {
    return s.k < t.k || (s.k == t.k && s.a < t.a);
  };
  std::sort(x.roots.begin(), x.roots.end(), by_k);
  std::sort(y.roots.begin(), y.roots.end(), by_k);
  for (size_t i = 0; i < x.roots.size(); ++i) {
    if (x.roots[i].a != y.roots[i].a || x.roots[i].k != y.roots[i].k ||
        !x.roots[i].coefficient.same_as(y.roots[i].coefficient))
      return false;
  }
  return true;
}

ExprPtr join_driving(const std::vector<ExprPtr>& pieces) {
  ExprPtr f;
  for (const auto& p : pieces) {
    if (f && p->kind == ExprKind::kNeg)
      f = make_binary(ExprKind::kSub, f, p->args[0]);
    else
      f = f ? make_binary(ExprKind::kAdd, f, p) : p;
  }
  return f;
}

bool same_driving(const ExprPtr& a, const ExprPtr& b) {
  if (!a || !b) return !a && !b;
  return same_tree(*a, *b);
}

}  // namespace

bool RootCoefficient::same_as(const RootCoefficient& other) const {
  if (n_exponent != other.n_exponent || rounded.size() != other.rounded.size()) return false;
  for (const RoundedRoot& r : rounded) {
    bool found = false;
    for (const RoundedRoot& o : other.rounded)
      found = found || (o.ceiling == r.ceiling && o.k == r.k && o.exponent == r.exponent);
    if (!found) return false;
  }
  return true;
}

Shape extract_shape(const Recurrence& recurrence) {
  Shape shape;
  const Function& main = recurrence.main;
  std::vector<LineParts> lines;
  try {
    for (const CaseLine* line : main.lines_in_order()) {
      if (line->point) {
        shape.base_cases.push_back(line);
        continue;
      }
      int reach = line->condition ? condition_reach(*line->condition) : 1;
      if (reach < 0) {
        shape.base_cases.push_back(line);
        continue;
      }
      LineParts parts;
      parts.condition = line->condition ? print(*line->condition) : "otherwise";
      parts.test = line->condition;
      split(line->body, 1, parts, main.name);
      if (lines.empty()) shape.recursive_text = print(*line->body);
      lines.push_back(std::move(parts));
      if (reach > 0) break;
    }
    if (lines.empty()) throw ShapeError{main.name + " has no line for large n"};
    for (size_t i = 1; i < lines.size(); ++i) {
      if (!same_recursion(lines[0], lines[i])) {
        throw ShapeError{"the case lines differ in their recursive part: when " +
                         lines[0].condition + " it is " + recursion_text(lines[0], main.name) +
                         ", when " + lines[i].condition + " it is " +
                         recursion_text(lines[i], main.name)};
      }
    }
  } catch (const ShapeError& e) {
    shape.reason = e.reason;
    return shape;
  }
  const LineParts& first = lines[0];
  shape.scaled = first.scaled;
  shape.subtractive = first.subtractive;
  shape.roots = first.roots;
  shape.sums = first.sums;
  // Perturbations may differ between lines (n/2 when even, (n-1)/2 when odd):
  // keep the largest.
  for (size_t i = 1; i < lines.size(); ++i) {
    for (auto& t : shape.scaled) {
      for (const auto& u : lines[i].scaled) {
        if (u.b != t.b || u.a != t.a) continue;
        if (u.perturbation > t.perturbation) {
          t.perturbation = u.perturbation;
          t.perturbation_growth = u.perturbation_growth;
        }
      }
    }
  }
  shape.driving = join_driving(first.driving);
  bool all_same = true;
  for (size_t i = 1; i < lines.size(); ++i)
    all_same = all_same && same_driving(shape.driving, join_driving(lines[i].driving));
  if (!all_same) {
    for (const auto& l : lines)
      shape.driving_cases.push_back({l.condition, join_driving(l.driving), l.test});
    shape.driving = nullptr;
  }
  shape.ok = true;
  return shape;
}

}  // namespace thetagate::engine
