// classify(): walks an expression in n and builds its asymptotic expansion
// (classify_expansion.h) node by node, then reads the growth class and leading
// constant off the first term. Helper functions are expanded line by line
// through substitute() and condition_reach(), both defined here; constants
// come from constant_value() (verifier/evaluation/constant_value.h).
#include "verifier/derivation/classify.h"

#include <string>
#include <utility>
#include <vector>

#include "verifier/derivation/classify_expansion.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine {

namespace {

using classify_internal::absorb;
using classify_internal::add;
using classify_internal::approximate_power;
using classify_internal::constant_expansion;
using classify_internal::Expansion;
using classify_internal::integer_power;
using classify_internal::is_class;
using classify_internal::Lead;
using classify_internal::lead_of;
using classify_internal::lg_of;
using classify_internal::log2_of;
using classify_internal::multiply;
using classify_internal::n_class;
using classify_internal::negate;
using classify_internal::normalize;
using classify_internal::pure_expansion;
using classify_internal::Refusal;
using classify_internal::term_expansion;

constexpr int kMaxDepth = 32;

RealNumber ln2() {
  return RealNumber::enclosed([](long prec) { return Interval(Rational(2), prec).log(); });
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
      case ExprKind::kVariable:
        return term_expansion(RealNumber(1L), n_class());
      case ExprKind::kNeg:
        return negate(run(*e.args[0]));
      case ExprKind::kAdd:
        return add(run(*e.args[0]), run(*e.args[1]));
      case ExprKind::kSub:
        return add(run(*e.args[0]), negate(run(*e.args[1])));
      case ExprKind::kMul:
        return multiply(run(*e.args[0]), run(*e.args[1]));
      case ExprKind::kDiv: {
        Expansion d = run(*e.args[1]);
        if (d.is_zero()) throw Refusal{"'" + print(e) + "' divides by zero"};
        return multiply(run(*e.args[0]), approximate_power(d, RealNumber(-1L), print(e)));
      }
      case ExprKind::kPow:
        return power(e);
      case ExprKind::kCall:
        return call(e);
      case ExprKind::kSum:
        return sum(e);
      case ExprKind::kBound:
        throw Refusal{"'" + print(e) + "' is a sum's variable outside its sum"};
      default:
        throw Refusal{"'" + print(e) + "' is a condition, not a value"};
    }
  }

  // sum(j, lo, hi, h(j)) with lo constant, hi = Θ(n) and h(j) =
  // Θ(j^a lg^b j (lg lg j)^c) positive for large j, by comparison with the
  // integral of h (docs/design.md §4, "Sums as driving functions"): Θ(n^(a+1)
  // lg^b n (lg lg n)^c) for a > -1, Θ(lg^(b+1) n (lg lg n)^c) for a = -1 and
  // b > -1. The constant is left unknown. A sum that converges (a < -1, ...)
  // or grows exponentially is refused.
  Expansion sum(const Expr& e) {
    std::string what = print(e);
    if (!sum_body_closed(e) || contains_sum(*e.args[2]) || mentions_n(*e.args[0]))
      throw Refusal{"'" + what + "' has a body or lower limit that depends on n"};
    Lead hi = lead_of(run(*e.args[1]));
    if (hi.sign <= 0 || compare(hi.g, n_class()) != 0)
      throw Refusal{"'" + what + "' does not run up to a multiple of n"};
    Lead h = lead_of(run(*bound_as_n(e.args[2], e.name)));
    if (h.sign <= 0) throw Refusal{"the terms of '" + what + "' are not positive for large n"};
    const GrowthClass& g = h.g;
    if (!g.is_subexponential())
      throw Refusal{"'" + what + "' sums exponentially growing terms, not derived here"};
    RealNumber minus_one(-1L);
    int a = compare(g.alpha, minus_one);
    if (a > 0)
      return pure_expansion(GrowthClass::polylog(g.alpha + RealNumber(1L), g.beta, g.gamma), 1);
    if (a == 0 && compare(g.beta, minus_one) > 0)
      return pure_expansion(GrowthClass::polylog(RealNumber(), g.beta + RealNumber(1L), g.gamma),
                            1);
    throw Refusal{"'" + what + "' sums terms of class " + to_string(g) +
                  ", whose sum converges or grows like lg lg n: not derived here"};
  }

  Expansion power(const Expr& e) {
    const Expr& base = *e.args[0];
    const Expr& exponent = *e.args[1];
    if (!mentions_n(exponent)) {
      RealNumber r = constant(exponent);
      Expansion x = run(base);
      if (r.is_integer() && r.sign() >= 0)
        return integer_power(x, static_cast<long>(numerator(r.rational())), print(e));
      return approximate_power(x, r, print(e));
    }
    if (mentions_n(base)) {
      throw Refusal{"'" + print(e) +
                    "' has n in both base and exponent: it grows faster than "
                    "every c^n, outside the normal form"};
    }
    RealNumber c = constant(base);
    int s = c.sign();
    if (s < 0)
      throw Refusal{"'" + print(e) +
                    "' alternates in sign: a negative base raised to n oscillates"};
    if (s == 0) return {};
    Expansion y = run(exponent);
    RealNumber lgc = log2_of(c);
    GrowthClass g;
    RealNumber coefficient(1L);
    for (const auto& t : y.terms) {
      if (t.g.is_constant())
        coefficient = coefficient * pow(c, t.c);
      else if (is_class(t.g, 1, 0, 0))
        g = g.times(GrowthClass::exponential(pow(c, t.c)));
      else if (is_class(t.g, 0, 1, 0))
        g = g.times(GrowthClass::polylog(t.c * lgc));
      else if (is_class(t.g, 0, 0, 1))
        g = g.times(GrowthClass::polylog(0, t.c * lgc));
      else {
        throw Refusal{"'" + print(e) + "' has exponent growing like " + to_string(t.g) +
                      (compare(t.g, n_class()) < 0
                           ? ": it lies between polynomial and exponential growth"
                           : ": it grows faster than every c^n") +
                      ", outside the normal form"};
      }
    }
    if (y.error) {
      int order = compare(*y.error, GrowthClass::constant());
      if (order > 0) {
        throw Refusal{"the exponent of '" + print(e) + "' is known only up to O(" +
                      to_string(*y.error) + ")"};
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
        throw Refusal{"'" + what +
                      "' rounds a quantity that does not grow, which can change its order"};
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
      return multiply(lg_of(run(*e.args[1]), what),
                      constant_expansion(RealNumber(1L) / log2_of(b)));
    }
    if (name == "sqrt") return approximate_power(run(*e.args[0]), RealNumber(Rational(1, 2)), what);
    if (name == "min" || name == "max") {
      Expansion best = run(*e.args[0]);
      for (size_t i = 1; i < e.args.size(); ++i)
        best = extreme(best, run(*e.args[i]), name == "max", what);
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
    if (f.inlined_size > kMaxInlinedHelperSize) {
      throw Refusal{"helper " + f.name + " expands to more than " +
                    std::to_string(kMaxInlinedHelperSize) +
                    " terms with the helpers it calls written out"};
    }
    const ExprPtr& argument = call_expr.args[0];
    std::vector<std::pair<std::string, Expansion>> cases;
    for (const CaseLine* line : f.lines_in_order()) {
      if (line->point) continue;
      int reach = line->condition ? thetagate::engine::condition_reach(*line->condition) : 1;
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
        throw Refusal{"helper " + f.name + "(n) is " + to_string(first.g) +
                      (cases[0].first == "otherwise" ? " " : " when ") + cases[0].first + " but " +
                      to_string(l.g) + (cases[i].first == "otherwise" ? " " : " when ") +
                      cases[i].first +
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

}  // namespace

int condition_reach(const Expr& c) {
  if (c.args.size() == 2) {
    bool n_left = c.args[0]->kind == ExprKind::kVariable && !mentions_n(*c.args[1]);
    bool n_right = c.args[1]->kind == ExprKind::kVariable && !mentions_n(*c.args[0]);
    ExprKind k = c.kind;
    if (n_right) {
      // c < n is n > c.
      if (k == ExprKind::kLt)
        k = ExprKind::kGt;
      else if (k == ExprKind::kLe)
        k = ExprKind::kGe;
      else if (k == ExprKind::kGt)
        k = ExprKind::kLt;
      else if (k == ExprKind::kGe)
        k = ExprKind::kLe;
    }
    if (n_left || n_right) {
      if (k == ExprKind::kLt || k == ExprKind::kLe || k == ExprKind::kEq) return -1;
      if (k == ExprKind::kGt || k == ExprKind::kGe || k == ExprKind::kNe) return 1;
    }
  }
  return 0;
}

ExprPtr bound_as_n(const ExprPtr& e, const std::string& variable) {
  if (e->kind == ExprKind::kBound && e->name == variable) return make_variable(e->pos);
  if (e->args.empty()) return e;
  auto copy = std::make_shared<Expr>(*e);
  for (auto& a : copy->args) a = bound_as_n(a, variable);
  update_depth(*copy);
  return copy;
}

ExprPtr substitute(const ExprPtr& e, const ExprPtr& argument) {
  if (e->kind == ExprKind::kVariable) return argument;
  if (e->args.empty()) return e;
  auto copy = std::make_shared<Expr>(*e);
  for (auto& a : copy->args) a = substitute(a, argument);
  update_depth(*copy);
  return copy;
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

}  // namespace thetagate::engine
