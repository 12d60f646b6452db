#include "verifier/classify.h"

#include <algorithm>
#include <vector>

#include "verifier/value.h"

namespace thetagate {

namespace {

struct Refusal {
  std::string reason;
};

struct Term {
  RealNumber c;
  GrowthClass g;
};

// value = sum of terms + R, with R = O(error); error_sign = +-1 when R is
// known to be Θ(error) with that sign (a leading constant we do not know).
struct Expansion {
  std::vector<Term> terms;  // decreasing classes, all above `error`
  std::optional<GrowthClass> error;
  int error_sign = 0;

  bool is_zero() const { return terms.empty() && !error; }
  bool is_pure() const { return terms.empty() && error; }
};

constexpr size_t kMaxTerms = 24;
constexpr int kMaxDepth = 32;

const GrowthClass& n_class() {
  static const GrowthClass g = GrowthClass::polylog(RealNumber(1L));
  return g;
}

bool is_class(const GrowthClass& g, long alpha, long beta, long gamma) {
  return g.is_subexponential() && g.alpha == RealNumber(alpha) && g.beta == RealNumber(beta) &&
         g.gamma == RealNumber(gamma);
}

Expansion constant_expansion(const RealNumber& c) {
  Expansion x;
  if (c.sign() != 0) x.terms.push_back({c, GrowthClass::constant()});
  return x;
}

Expansion term_expansion(const RealNumber& c, const GrowthClass& g) {
  Expansion x;
  if (c.sign() != 0) x.terms.push_back({c, g});
  return x;
}

Expansion pure_expansion(const GrowthClass& g, int sign) {
  Expansion x;
  x.error = g;
  x.error_sign = sign;
  return x;
}

void absorb(Expansion& x, const GrowthClass& g, int sign) {
  if (!x.error || compare(g, *x.error) > 0) {
    x.error = g;
    x.error_sign = sign;
  } else if (compare(g, *x.error) == 0 && x.error_sign != sign) {
    x.error_sign = 0;
  }
}

void normalize(Expansion& x) {
  std::stable_sort(x.terms.begin(), x.terms.end(),
                   [](const Term& a, const Term& b) { return compare(a.g, b.g) > 0; });
  std::vector<Term> merged;
  for (auto& t : x.terms) {
    if (!merged.empty() && compare(merged.back().g, t.g) == 0) {
      merged.back().c = merged.back().c + t.c;
    } else {
      merged.push_back(t);
    }
  }
  std::vector<Term> kept;
  for (auto& t : merged) {
    int s = t.c.sign();
    if (s == 0) continue;
    if (x.error && compare(t.g, *x.error) <= 0) {
      if (compare(t.g, *x.error) == 0 && x.error_sign != s) x.error_sign = 0;
      continue;
    }
    kept.push_back(t);
  }
  if (kept.size() > kMaxTerms) {
    // The first dropped term dominates everything after it: its sign is the remainder's.
    absorb(x, kept[kMaxTerms].g, kept[kMaxTerms].c.sign());
    kept.resize(kMaxTerms);
  }
  x.terms = std::move(kept);
}

struct Lead {
  GrowthClass g;
  RealNumber c;
  bool known;
  int sign;
};

Lead lead_of(const Expansion& x) {
  if (!x.terms.empty()) return {x.terms[0].g, x.terms[0].c, true, x.terms[0].c.sign()};
  if (x.error && x.error_sign != 0) return {*x.error, RealNumber(static_cast<long>(x.error_sign)), false, x.error_sign};
  if (x.error) {
    throw Refusal{"the leading terms cancel, leaving a remainder known only as O(" +
                  to_string(*x.error) + ")"};
  }
  throw Refusal{"the expression is zero"};
}

Expansion add(Expansion x, const Expansion& y) {
  for (const auto& t : y.terms) x.terms.push_back(t);
  if (y.error) absorb(x, *y.error, y.error_sign);
  normalize(x);
  return x;
}

Expansion negate(Expansion x) {
  for (auto& t : x.terms) t.c = -t.c;
  x.error_sign = -x.error_sign;
  return x;
}

Expansion multiply(const Expansion& x, const Expansion& y) {
  if (x.is_zero() || y.is_zero()) return {};
  if (x.is_pure() || y.is_pure()) {
    Lead a = lead_of(x), b = lead_of(y);
    return pure_expansion(a.g.times(b.g), a.sign * b.sign);
  }
  Expansion r;
  for (const auto& s : x.terms) {
    for (const auto& t : y.terms) r.terms.push_back({s.c * t.c, s.g.times(t.g)});
  }
  if (x.error) absorb(r, y.terms[0].g.times(*x.error), 0);
  if (y.error) absorb(r, x.terms[0].g.times(*y.error), 0);
  r.error_sign = 0;
  normalize(r);
  return r;
}

// The class just below the leading term: the second term or the remainder.
std::optional<GrowthClass> next_class(const Expansion& x) {
  std::optional<GrowthClass> next;
  if (x.terms.size() >= 2) next = x.terms[1].g;
  if (x.error && (!next || compare(*x.error, *next) > 0)) next = x.error;
  return next;
}

// x^r by its leading term: c^r G^r (1 + O(next/G)).
Expansion approximate_power(const Expansion& x, const RealNumber& r, const std::string& what) {
  if (x.is_zero()) throw Refusal{"'" + what + "' takes a power of zero"};
  Lead l = lead_of(x);
  if (l.sign < 0) throw Refusal{"'" + what + "' takes a fractional or negative power of a negative quantity"};
  GrowthClass g = l.g.power(r);
  if (!l.known) return pure_expansion(g, 1);
  Expansion out = term_expansion(pow(l.c, r), g);
  if (auto next = next_class(x)) out.error = g.times(next->over(l.g));
  return out;
}

Expansion integer_power(const Expansion& x, long k, const std::string& what) {
  if (k > 12) return approximate_power(x, RealNumber(k), what);
  Expansion r = constant_expansion(RealNumber(1L));
  for (long i = 0; i < k; ++i) r = multiply(r, x);
  return r;
}

RealNumber log2_of(const RealNumber& c) {
  if (c.is_rational()) return RealNumber::log(2, c.rational());
  return RealNumber::enclosed([c](long prec) { return c.enclose(prec).log2(); });
}

RealNumber ln2() {
  return RealNumber::enclosed([](long prec) { return Interval(Rational(2), prec).log(); });
}

Expansion lg_of(const Expansion& x, const std::string& what) {
  if (x.is_zero()) throw Refusal{"'" + what + "' takes lg of zero"};
  Lead l = lead_of(x);
  if (l.sign < 0) throw Refusal{"'" + what + "' takes lg of a negative quantity"};
  if (l.g.is_constant()) {
    if (!l.known) throw Refusal{"'" + what + "' takes lg of a bounded quantity with unknown constant"};
    if (l.c == RealNumber(1L)) throw Refusal{"'" + what + "' takes lg of a quantity tending to 1"};
    Expansion out = constant_expansion(log2_of(l.c));
    if (auto next = next_class(x)) absorb(out, next->over(l.g), 0);
    return out;
  }
  Expansion out;
  if (!l.g.is_subexponential()) out.terms.push_back({log2_of(l.g.rho), n_class()});
  if (l.g.alpha.sign() != 0) out.terms.push_back({l.g.alpha, GrowthClass::polylog(0, 1)});
  if (l.g.beta.sign() != 0) out.terms.push_back({l.g.beta, GrowthClass::polylog(0, 0, 1)});
  if (l.g.gamma.sign() != 0) {
    if (out.terms.empty()) throw Refusal{"'" + what + "' grows like lg lg lg n, outside the normal form"};
    absorb(out, GrowthClass::polylog(0, 0, Rational(1, 2)), 0);  // lg lg lg n = o(sqrt(lg lg n))
  }
  if (l.known) {
    if (l.c != RealNumber(1L)) out.terms.push_back({log2_of(l.c), GrowthClass::constant()});
  } else {
    absorb(out, GrowthClass::constant(), 0);
  }
  if (auto next = next_class(x)) absorb(out, next->over(l.g), 0);
  normalize(out);
  return out;
}

class Classifier {
 public:
  explicit Classifier(const HelperTable* helpers) : helpers_(helpers) {}

  Expansion run(const Expr& e) {
    if (++depth_ > kMaxDepth) throw Refusal{"the expression nests too deeply"};
    Expansion r = expand(e);
    --depth_;
    return r;
  }

 private:
  RealNumber constant(const Expr& e) {
    std::string reason;
    auto v = constant_value(e, &reason);
    if (!v) throw Refusal{reason};
    return *v;
  }

  Expansion expand(const Expr& e) {
    if (!mentions_n(e) && !(e.kind == ExprKind::kCall && !is_builtin(e.name))) {
      return constant_expansion(constant(e));
    }
    switch (e.kind) {
      case ExprKind::kVariable: return term_expansion(RealNumber(1L), n_class());
      case ExprKind::kNeg: return negate(run(*e.args[0]));
      case ExprKind::kAdd: return add(run(*e.args[0]), run(*e.args[1]));
      case ExprKind::kSub: return add(run(*e.args[0]), negate(run(*e.args[1])));
      case ExprKind::kMul: return multiply(run(*e.args[0]), run(*e.args[1]));
      case ExprKind::kDiv: {
        Expansion d = run(*e.args[1]);
        if (d.is_zero()) throw Refusal{"'" + print(e) + "' divides by zero"};
        return multiply(run(*e.args[0]), approximate_power(d, RealNumber(-1L), print(e)));
      }
      case ExprKind::kPow: return power(e);
      case ExprKind::kCall: return call(e);
      default: throw Refusal{"'" + print(e) + "' is a condition, not a value"};
    }
  }

  Expansion power(const Expr& e) {
    const Expr& base = *e.args[0];
    const Expr& exponent = *e.args[1];
    if (!mentions_n(exponent)) {
      RealNumber r = constant(exponent);
      Expansion x = run(base);
      if (r.is_integer() && r.sign() >= 0) return integer_power(x, static_cast<long>(numerator(r.rational())), print(e));
      return approximate_power(x, r, print(e));
    }
    if (mentions_n(base)) {
      throw Refusal{"'" + print(e) + "' has n in both base and exponent: it grows faster than "
                    "every c^n, outside the normal form"};
    }
    RealNumber c = constant(base);
    int s = c.sign();
    if (s < 0) throw Refusal{"'" + print(e) + "' alternates in sign: a negative base raised to n oscillates"};
    if (s == 0) return {};
    Expansion y = run(exponent);
    RealNumber lgc = log2_of(c);
    GrowthClass g;
    RealNumber coefficient(1L);
    for (const auto& t : y.terms) {
      if (t.g.is_constant()) coefficient = coefficient * pow(c, t.c);
      else if (is_class(t.g, 1, 0, 0)) g = g.times(GrowthClass::exponential(pow(c, t.c)));
      else if (is_class(t.g, 0, 1, 0)) g = g.times(GrowthClass::polylog(t.c * lgc));
      else if (is_class(t.g, 0, 0, 1)) g = g.times(GrowthClass::polylog(0, t.c * lgc));
      else {
        throw Refusal{"'" + print(e) + "' has exponent growing like " + to_string(t.g) +
                      (compare(t.g, n_class()) < 0 ? ": it lies between polynomial and exponential growth"
                                                    : ": it grows faster than every c^n") +
                      ", outside the normal form"};
      }
    }
    if (y.error) {
      int order = compare(*y.error, GrowthClass::constant());
      if (order > 0) {
        throw Refusal{"the exponent of '" + print(e) + "' is known only up to O(" + to_string(*y.error) + ")"};
      }
      if (order == 0) return pure_expansion(g, 1);  // c^O(1) is a bounded positive factor
      Expansion out = term_expansion(coefficient, g);
      out.error = g.times(*y.error);  // c^o(1) = 1 + O(o(1))
      return out;
    }
    return term_expansion(coefficient, g);
  }

  Expansion call(const Expr& e) {
    const std::string& name = e.name;
    std::string what = print(e);
    if (name == "floor" || name == "ceil") {
      Expansion x = run(*e.args[0]);
      Lead l = lead_of(x);
      if (compare(l.g, GrowthClass::constant()) <= 0) {
        throw Refusal{"'" + what + "' rounds a quantity that does not grow, which can change its order"};
      }
      absorb(x, GrowthClass::constant(), 0);
      normalize(x);
      return x;
    }
    if (name == "lg" || name == "log2") return lg_of(run(*e.args[0]), what);
    if (name == "ln") return multiply(lg_of(run(*e.args[0]), what), constant_expansion(ln2()));
    if (name == "log") {
      if (mentions_n(*e.args[0])) throw Refusal{"'" + what + "' has a base that depends on n"};
      RealNumber b = constant(*e.args[0]);
      if (b.sign() <= 0 || b == RealNumber(1L)) throw Refusal{"'" + what + "' has an invalid base"};
      return multiply(lg_of(run(*e.args[1]), what), constant_expansion(RealNumber(1L) / log2_of(b)));
    }
    if (name == "sqrt") return approximate_power(run(*e.args[0]), RealNumber(Rational(1, 2)), what);
    if (name == "min" || name == "max") {
      Expansion best = run(*e.args[0]);
      for (size_t i = 1; i < e.args.size(); ++i) best = extreme(best, run(*e.args[i]), name == "max", what);
      return best;
    }
    if (name == "mod") {
      throw Refusal{"'" + what + "' oscillates with n (a remainder has no growth class)"};
    }
    if (helpers_ != nullptr) {
      auto it = helpers_->find(name);
      if (it != helpers_->end()) return helper(it->second, e);
    }
    throw Refusal{"'" + what + "' calls " + name + ", which has no closed form here" +
                  (helpers_ == nullptr ? "" : " (the recurrence itself, or an unknown function)")};
  }

  Expansion extreme(const Expansion& a, const Expansion& b, bool maximum, const std::string& what) {
    Expansion d = add(a, negate(b));
    if (d.is_zero()) return a;
    int s = !d.terms.empty() ? d.terms[0].c.sign() : d.error_sign;
    if (s == 0) {
      Lead la = lead_of(a), lb = lead_of(b);
      if (compare(la.g, lb.g) == 0 && la.sign > 0 && lb.sign > 0) return pure_expansion(la.g, 1);
      throw Refusal{"'" + what + "' compares two quantities whose order is not known"};
    }
    return (s > 0) == maximum ? a : b;
  }

  // The helper's lines, except those that hold only for finitely many n
  // (n <= 10, n == 1), must share one class.
  Expansion helper(const Function& f, const Expr& call_expr) {
    if (call_expr.args.size() != 1) throw Refusal{"'" + print(call_expr) + "' takes one argument"};
    const ExprPtr& argument = call_expr.args[0];
    std::vector<std::pair<std::string, Expansion>> cases;
    for (const CaseLine* line : f.lines_in_order()) {
      if (line->point) continue;
      int reach = line->condition ? thetagate::condition_reach(*line->condition) : 1;
      if (reach < 0) continue;
      Expansion x = run(*substitute(line->body, argument));
      cases.emplace_back(line->condition ? print(*line->condition) : "otherwise", x);
      if (reach > 0) break;
    }
    if (cases.empty()) throw Refusal{"helper " + f.name + " has no line for large n"};
    if (cases.size() == 1) return cases[0].second;
    Lead first = lead_of(cases[0].second);
    bool same_constant = first.known;
    for (size_t i = 1; i < cases.size(); ++i) {
      Lead l = lead_of(cases[i].second);
      if (compare(l.g, first.g) != 0 || l.sign != first.sign) {
        throw Refusal{"helper " + f.name + "(n) is " + to_string(first.g) + (cases[0].first == "otherwise" ? " " : " when ") + cases[0].first +
                      " but " + to_string(l.g) + (cases[i].first == "otherwise" ? " " : " when ") + cases[i].first +
                      ": its case lines differ in class, so it oscillates between them"};
      }
      same_constant = same_constant && l.known && l.c == first.c;
    }
    if (same_constant) return term_expansion(first.c, first.g);
    return pure_expansion(first.g, first.sign);
  }

  const HelperTable* helpers_;
  int depth_ = 0;
};

std::optional<RealNumber> fail(std::string* reason, std::string text) {
  if (reason != nullptr) *reason = std::move(text);
  return std::nullopt;
}

}  // namespace

int condition_reach(const Expr& c) {
  if (c.args.size() == 2) {
    bool n_left = c.args[0]->kind == ExprKind::kVariable && !mentions_n(*c.args[1]);
    bool n_right = c.args[1]->kind == ExprKind::kVariable && !mentions_n(*c.args[0]);
    ExprKind k = c.kind;
    if (n_right) {
      // c < n is n > c.
      if (k == ExprKind::kLt) k = ExprKind::kGt;
      else if (k == ExprKind::kLe) k = ExprKind::kGe;
      else if (k == ExprKind::kGt) k = ExprKind::kLt;
      else if (k == ExprKind::kGe) k = ExprKind::kLe;
    }
    if (n_left || n_right) {
      if (k == ExprKind::kLt || k == ExprKind::kLe || k == ExprKind::kEq) return -1;
      if (k == ExprKind::kGt || k == ExprKind::kGe || k == ExprKind::kNe) return 1;
    }
  }
  return 0;
}

ExprPtr substitute(const ExprPtr& e, const ExprPtr& argument) {
  if (e->kind == ExprKind::kVariable) return argument;
  if (e->args.empty()) return e;
  auto copy = std::make_shared<Expr>(*e);
  for (auto& a : copy->args) a = substitute(a, argument);
  return copy;
}

std::optional<RealNumber> constant_value(const Expr& e, std::string* reason) {
  auto arg = [&](size_t i) { return constant_value(*e.args[i], reason); };
  try {
    switch (e.kind) {
      case ExprKind::kNumber: return RealNumber(e.number);
      case ExprKind::kVariable: return fail(reason, "the expression depends on n");
      case ExprKind::kNeg: {
        auto a = arg(0);
        if (!a) return a;
        return -*a;
      }
      case ExprKind::kAdd: case ExprKind::kSub: case ExprKind::kMul: case ExprKind::kDiv: {
        auto a = arg(0), b = arg(1);
        if (!a || !b) return std::nullopt;
        if (e.kind == ExprKind::kAdd) return *a + *b;
        if (e.kind == ExprKind::kSub) return *a - *b;
        if (e.kind == ExprKind::kMul) return *a * *b;
        if (b->sign() == 0) return fail(reason, "'" + print(e) + "' divides by zero");
        return *a / *b;
      }
      case ExprKind::kPow: {
        auto a = arg(0), b = arg(1);
        if (!a || !b) return std::nullopt;
        if (a->is_rational() && b->is_integer() && boost::multiprecision::abs(b->rational()) < 4096) {
          long k = static_cast<long>(numerator(b->rational()));
          if (a->sign() == 0 && k < 0) return fail(reason, "'" + print(e) + "' divides by zero");
          Rational r = 1;
          for (long i = 0; i < (k < 0 ? -k : k); ++i) r *= a->rational();
          return RealNumber(k < 0 ? Rational(1) / r : r);
        }
        if (a->sign() <= 0) return fail(reason, "'" + print(e) + "' raises a non-positive number to a fractional power");
        return pow(*a, *b);
      }
      case ExprKind::kCall: {
        const std::string& f = e.name;
        if (!is_builtin(f)) return fail(reason, "'" + print(e) + "' calls " + f + ", which has no closed form here");
        std::vector<RealNumber> v;
        for (size_t i = 0; i < e.args.size(); ++i) {
          auto a = arg(i);
          if (!a) return a;
          v.push_back(*a);
        }
        if (f == "lg" || f == "log2" || f == "ln") {
          if (v[0].sign() <= 0) return fail(reason, "'" + print(e) + "' takes the log of a non-positive number");
          if (f == "ln") {
            RealNumber x = v[0];
            if (x == RealNumber(1L)) return RealNumber(0L);
            return RealNumber::enclosed([x](long prec) { return x.enclose(prec).log(); });
          }
          return log2_of(v[0]);
        }
        if (f == "log") {
          if (v[0].sign() <= 0 || v[0] == RealNumber(1L) || v[1].sign() <= 0) {
            return fail(reason, "'" + print(e) + "' is not a valid logarithm");
          }
          if (v[0].is_rational() && v[1].is_rational()) return RealNumber::log(v[0].rational(), v[1].rational());
          return log2_of(v[1]) / log2_of(v[0]);
        }
        if (f == "sqrt") {
          int s = v[0].sign();
          if (s < 0) return fail(reason, "'" + print(e) + "' takes the square root of a negative number");
          if (s == 0) return RealNumber(0L);
          if (v[0].is_rational()) return RealNumber::root(v[0].rational(), 2);
          return pow(v[0], RealNumber(Rational(1, 2)));
        }
        if (f == "floor" || f == "ceil") {
          if (v[0].is_rational()) {
            return RealNumber(Rational(f == "floor" ? floor_of(v[0].rational()) : ceil_of(v[0].rational())));
          }
          for (long prec = 64; prec <= 4096; prec *= 2) {
            Interval x = v[0].enclose(prec);
            auto k = f == "floor" ? x.common_floor() : x.common_ceil();
            if (k) return RealNumber(Rational(*k));
          }
          return fail(reason, "'" + print(e) + "' cannot be rounded with certainty");
        }
        if (f == "min" || f == "max") {
          RealNumber best = v[0];
          for (size_t i = 1; i < v.size(); ++i) {
            int c = compare(v[i], best);
            if ((f == "max" && c > 0) || (f == "min" && c < 0)) best = v[i];
          }
          return best;
        }
        if (f == "mod") {
          if (!v[0].is_rational() || !v[1].is_rational() || v[1].sign() == 0) {
            return fail(reason, "'" + print(e) + "' needs rational operands");
          }
          Rational x = v[0].rational(), m = v[1].rational();
          return RealNumber(x - m * Rational(floor_of(x / m)));
        }
        return fail(reason, "'" + print(e) + "' is not supported in a constant");
      }
      default:
        return fail(reason, "'" + print(e) + "' is a condition, not a number");
    }
  } catch (const DomainError& error) {
    return fail(reason, "'" + print(e) + "': " + error.what());
  } catch (const PrecisionShortfall& error) {
    return fail(reason, "'" + print(e) + "': " + error.what());
  }
}

Classification classify(const Expr& e, const HelperTable* helpers) {
  Classification out;
  try {
    Classifier classifier(helpers);
    Expansion x = classifier.run(e);
    if (x.is_zero()) {
      out.zero = true;
      out.reason = "'" + print(e) + "' is zero";
      return out;
    }
    Lead l = lead_of(x);
    if (l.sign < 0) {
      out.reason = "'" + print(e) + "' is negative for large n (its leading term is " +
                   (l.known ? l.c.str() + " * " : "-") + to_string(l.g) + ")";
      return out;
    }
    out.growth = l.g;
    out.coefficient = l.c;
    out.coefficient_known = l.known;
  } catch (const Refusal& r) {
    out.reason = r.reason;
  } catch (const PrecisionShortfall& error) {
    out.reason = std::string("an exponent comparison could not be decided: ") + error.what();
  } catch (const DomainError& error) {
    out.reason = "'" + print(e) + "': " + error.what();
  }
  return out;
}

}  // namespace thetagate
