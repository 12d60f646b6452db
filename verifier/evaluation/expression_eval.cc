#include "verifier/evaluation/expression_eval.h"

#include <gmp.h>

#include <stdexcept>

#include "verifier/evaluation/constant_value.h"
#include "verifier/numbers/real_number_node.h"

namespace thetagate::engine {

namespace {

// b^x exactly, for a rational b that is an integer power of the base g of
// a constant exponent x = q + c log_g(a) (such as 4^(lg 3) = 9): then
// b^x = g^(e q) a^(e c), rational when e q and e c are integers. Bounds
// like 3 (n - 1)^(lg 3) meet T(n) with equality at such n, which no
// interval can decide.
std::optional<Value> exact_log_power(const Rational& b, const Expr& exponent) {
  if (b <= 0 || mentions_n(exponent)) return std::nullopt;
  std::optional<RealNumber> x = constant_value(exponent);
  if (!x || x->kind() != RealNumber::Kind::kLog) return std::nullopt;
  const RealNumber::Node& node = x->node();
  if (denominator(node.g) != 1 || (denominator(b) != 1 && numerator(b) != 1)) return std::nullopt;
  // b = g^e or 1/g^e.
  BigInt whole = denominator(b) == 1 ? numerator(b) : denominator(b);
  BigInt g = numerator(node.g);
  long e = 0;
  while (whole > 1 && whole % g == 0 && e < 100000) {
    whole /= g;
    ++e;
  }
  if (whole != 1) return std::nullopt;
  if (denominator(b) != 1) e = -e;
  Rational eq = node.q * e, ec = node.c * e;
  if (denominator(eq) != 1 || denominator(ec) != 1) return std::nullopt;
  auto int_pow = [](Rational base, BigInt k) {
    Rational r = 1;
    if (k < 0) {
      base = Rational(1) / base;
      k = -k;
    }
    if (k > 65536) return std::optional<Rational>();
    for (BigInt i = 0; i < k; ++i) r *= base;
    return std::optional<Rational>(r);
  };
  std::optional<Rational> p1 = int_pow(node.g, numerator(eq));
  std::optional<Rational> p2 = int_pow(node.a, numerator(ec));
  if (!p1 || !p2) return std::nullopt;
  return Value(*p1 * *p2);
}

bool calls_function(const Expr& e, const std::string& name) {
  if (e.kind == ExprKind::kCall && e.name == name) return true;
  for (const ExprPtr& a : e.args) {
    if (calls_function(*a, name)) return true;
  }
  return false;
}

[[noreturn]] void domain_failure(const DomainError& error, const Expr& at, const Value& n,
                                 const EvalScope& scope) {
  std::string hint = "add a base case for the small sizes where this is undefined, e.g. T(1) = 1";
  auto constant = [](const Expr& e) { return !mentions_n(e) && !has_free_bound(e); };
  bool everywhere = false;
  // A divisor that does not depend on n is zero at every size: no base case helps.
  bool divides = at.kind == ExprKind::kDiv || (at.kind == ExprKind::kCall && at.name == "mod");
  if (divides && at.args.size() == 2 && !mentions_n(*at.args[1])) {
    hint = "the divisor '" + print(*at.args[1]) +
           "' does not depend on n: it is zero at every "
           "size; fix the expression";
  } else if (at.kind == ExprKind::kCall && at.name == "log" && at.args.size() == 2 &&
             constant(*at.args[0]) && std::string(error.what()).find("base") != std::string::npos) {
    everywhere = true;
    hint = "the base '" + print(*at.args[0]) +
           "' is the same at every size, and a logarithm's base must be positive and not 1: "
           "write log(2, n), lg n or ln n";
  } else if (constant(at)) {
    everywhere = true;
    hint = "'" + print(at) +
           "' does not depend on n: it is undefined at every size, so no base case helps; fix "
           "the expression";
  } else if (!mentions_n(at)) {
    hint = "it is undefined at a value of the sum's variable: start the sum where it is defined";
  }
  // Undefined at every size: the size it was met at would mislead.
  std::string where = everywhere ? "" : " at n = " + n.str();
  fail_at(*scope.source, at.pos, std::string(error.what()) + where + " (in '" + print(at) + "')",
          hint);
}

// The value of a builtin call; nullopt when `e` names no builtin.
std::optional<Value> builtin(const Expr& e, const Value& n, const EvalScope& scope) {
  const NumericContext& ctx = *scope.ctx;
  const std::string& f = e.name;
  auto arg = [&](size_t i) { return evaluate_expr(*e.args[i], n, scope); };
  if (f == "floor" || f == "ceil") {
    const Expr& x = *e.args[0];
    if (x.kind == ExprKind::kDiv) {  // floor(n/2): no rational in between
      Value p = evaluate_expr(*x.args[0], n, scope);
      Value q = evaluate_expr(*x.args[1], n, scope);
      try {
        return f == "floor" ? floor_quotient(p, q, ctx) : ceil_quotient(p, q, ctx);
      } catch (const DomainError& error) {
        domain_failure(error, x, n, scope);
      }
    }
    return f == "floor" ? floor_value(arg(0)) : ceil_value(arg(0));
  }
  if (f == "lg" || f == "log2") return lg_value(arg(0), ctx);
  if (f == "ln") return ln_value(arg(0), ctx);
  if (f == "sqrt") return sqrt_value(arg(0), ctx);
  if (f == "log") return log_value(arg(0), arg(1), ctx);
  if (f == "mod") return mod_value(arg(0), arg(1), ctx);
  if (f == "min" || f == "max") {
    Value best = arg(0);
    for (size_t i = 1; i < e.args.size(); ++i) {
      best = f == "min" ? min_value(best, arg(i), ctx) : max_value(best, arg(i), ctx);
    }
    return best;
  }
  if (is_builtin(f)) throw InternalError("", "unhandled builtin " + f);
  return std::nullopt;
}

Value call_helper(const Function& helper, const Expr& call, const Value& n,
                  const EvalScope& scope) {
  Value argument = evaluate_expr(*call.args[0], n, scope);
  if (scope.resolver) return scope.resolver->helper(helper, argument, scope);
  return evaluate_helper(helper, argument, scope);
}

}  // namespace

Value CallResolver::sum(const Expr& sum, const Value& n, const EvalScope& scope) {
  return sum_directly(sum, n, scope);
}

Value CallResolver::helper(const Function& f, const Value& argument, const EvalScope& scope) {
  return evaluate_helper(f, argument, scope);
}

Value evaluate_helper(const Function& f, const Value& argument, const EvalScope& scope) {
  EvalScope inner = scope;
  inner.bound = nullptr;
  const CaseLine& line = select_case(f, argument, inner);
  return evaluate_expr(*line.body, argument, inner);
}

std::pair<int64_t, int64_t> sum_limits(const Expr& sum, const Value& n, const EvalScope& scope) {
  int64_t limits[2];
  for (int i = 0; i < 2; ++i) {
    const Expr& limit = *sum.args[i];
    Value v = evaluate_expr(limit, n, scope);
    const char* which = i == 0 ? "lower" : "upper";
    if (!v.is_integer()) {
      fail_at(*scope.source, limit.pos,
              std::string("the ") + which + " limit " + print(limit) + " of the sum is " + v.str() +
                  " at n = " + n.str() + ", not a whole number",
              "round it: floor(" + print(limit) + ") or ceil(" + print(limit) + ")");
    }
    BigInt scratch;
    const BigInt& k = v.integer_ref(scratch);
    if (bit_length(k) > 62) {
      throw BudgetExceeded(Limit::kSteps, std::string("the ") + which + " limit of " + print(sum) +
                                              " is " + k.str() + " at n = " + n.str() +
                                              ", too far to add term by term");
    }
    limits[i] = static_cast<int64_t>(k);
  }
  return {limits[0], limits[1]};
}

Value sum_term(const Expr& sum, int64_t k, const Value& n, const EvalScope& scope) {
  Binding binding{&sum.name, Value(k), scope.bound};
  EvalScope inner = scope;
  inner.bound = &binding;
  return evaluate_expr(*sum.args[2], n, inner);
}

Value sum_directly(const Expr& sum, const Value& n, const EvalScope& scope,
                   const std::function<void()>& charge) {
  auto [lo, hi] = sum_limits(sum, n, scope);
  Value total(int64_t{0});
  if (hi < lo) return total;
  constexpr int64_t kMaxUnchargedTerms = int64_t{1} << 22;
  if (!charge && hi - lo >= kMaxUnchargedTerms) {
    throw BudgetExceeded(Limit::kSteps, print(sum) + " has " + std::to_string(hi - lo + 1) +
                                            " terms at n = " + n.str() +
                                            ", too many to add one by one");
  }
  for (int64_t k = lo;; ++k) {
    if (charge) charge();
    total = add(total, sum_term(sum, k, n, scope), *scope.ctx);
    if (k == hi) break;
  }
  return total;
}

Value evaluate_expr(const Expr& e, const Value& n, const EvalScope& scope) {
  const NumericContext& ctx = *scope.ctx;
  try {
    switch (e.kind) {
      case ExprKind::kNumber:
        return e.has_small ? Value(e.small) : Value(e.number);
      case ExprKind::kVariable:
        return n;
      case ExprKind::kAdd:
        return add(evaluate_expr(*e.args[0], n, scope), evaluate_expr(*e.args[1], n, scope), ctx);
      case ExprKind::kSub:
        return sub(evaluate_expr(*e.args[0], n, scope), evaluate_expr(*e.args[1], n, scope), ctx);
      case ExprKind::kMul:
        return mul(evaluate_expr(*e.args[0], n, scope), evaluate_expr(*e.args[1], n, scope), ctx);
      case ExprKind::kDiv:
        return div(evaluate_expr(*e.args[0], n, scope), evaluate_expr(*e.args[1], n, scope), ctx);
      case ExprKind::kPow: {
        Value base = evaluate_expr(*e.args[0], n, scope);
        Value exponent = evaluate_expr(*e.args[1], n, scope);
        if (base.is_exact() && !exponent.is_exact()) {
          if (std::optional<Value> v = exact_log_power(base.exact(), *e.args[1])) return *v;
        }
        return power(base, exponent, ctx);
      }
      case ExprKind::kNeg:
        return neg(evaluate_expr(*e.args[0], n, scope));
      case ExprKind::kBound:
        for (const Binding* b = scope.bound; b != nullptr; b = b->outer) {
          if (*b->name == e.name) return b->value;
        }
        fail_at(*scope.source, e.pos, "'" + e.name + "' is used outside its sum",
                "a sum's variable exists only inside its body: sum(k, 0, n - 1, T(k))");
      case ExprKind::kSum:
        return scope.resolver ? scope.resolver->sum(e, n, scope) : sum_directly(e, n, scope);
      case ExprKind::kCall: {
        const Recurrence* r = scope.recurrence;
        // The recurrence's own calls are the hot path; its name is never a
        // builtin's (definitions refuse that), so test it first.
        if (r && e.name == r->main.name) {
          if (!scope.resolver) {
            fail_at(*scope.source, e.pos, "'" + e.name + "' cannot be used here",
                    "write an expression in n alone");
          }
          return scope.resolver->resolve(e, n, scope);
        }
        if (std::optional<Value> v = builtin(e, n, scope)) return std::move(*v);
        if (r) {
          auto it = r->helpers.find(e.name);
          if (it != r->helpers.end()) return call_helper(it->second, e, n, scope);
        }
        fail_at(*scope.source, e.pos, "unknown function '" + e.name + "'",
                "the functions are floor, ceil, lg, ln, log2, log(b, x), sqrt, min, max, mod");
      }
      default:
        fail_at(*scope.source, e.pos, "a condition stands where a number is expected");
    }
  } catch (const DomainError& error) {
    domain_failure(error, e, n, scope);
  } catch (const BudgetExceeded& limit) {
    // A constant beyond the value-size limit (2^(2^20)) is too large at every
    // size: the input's fault, located at the constant, not a budget that a
    // smaller size would stay within.
    if (limit.limit() != Limit::kValueSize || scope.recurrence == nullptr || mentions_n(e) ||
        has_free_bound(e) || calls_function(e, scope.recurrence->main.name)) {
      throw;
    }
    fail_at(
        *scope.source, e.pos,
        "the constant '" + print(e) + "' is too large to compute exactly (" + limit.what() + ")",
        "it does not depend on n, so every size needs it; write a smaller constant (values "
        "are limited to " +
            std::to_string(scope.ctx->max_value_bits) + " bits)");
  }
}

bool test_condition(const Expr& c, const Value& n, const EvalScope& scope) {
  const NumericContext& ctx = *scope.ctx;
  switch (c.kind) {
    case ExprKind::kAnd:
      return test_condition(*c.args[0], n, scope) && test_condition(*c.args[1], n, scope);
    case ExprKind::kOr:
      return test_condition(*c.args[0], n, scope) || test_condition(*c.args[1], n, scope);
    case ExprKind::kNot:
      return !test_condition(*c.args[0], n, scope);
    case ExprKind::kEven:
    case ExprKind::kOdd: {
      Value v = evaluate_expr(*c.args[0], n, scope);
      if (!v.is_integer()) return false;  // 5/2 is neither even nor odd
      BigInt scratch;
      bool even = v.small() ? (*v.small() % 2 == 0)
                            : mpz_even_p(v.integer_ref(scratch).backend().data()) != 0;
      return c.kind == ExprKind::kEven ? even : !even;
    }
    case ExprKind::kEq:
    case ExprKind::kNe:
    case ExprKind::kLt:
    case ExprKind::kLe:
    case ExprKind::kGt:
    case ExprKind::kGe: {
      Value a = evaluate_expr(*c.args[0], n, scope);
      Value b = evaluate_expr(*c.args[1], n, scope);
      // Overlapping intervals throw PrecisionShortfall: never guessed.
      return comparison_holds(c.kind, compare(a, b, ctx));
    }
    default:
      fail_at(*scope.source, c.pos, "expected a condition, found the value '" + print(c) + "'",
              "conditions look like 'n even', 'n mod 3 == 1', 'n <= 4'");
  }
}

const CaseLine& select_case(const Function& f, const Value& n, const EvalScope& scope) {
  if (!f.points.empty() && n.is_integer()) {
    // An index, not a scan: a claim may list tens of thousands of points.
    BigInt scratch;
    auto it = f.point_at.find(n.integer_ref(scratch));
    if (it != f.point_at.end()) return f.points[it->second];
  }
  for (const CaseLine& line : f.conditional) {
    if (test_condition(*line.condition, n, scope)) return line;
  }
  if (f.fallback) return *f.fallback;
  fail_at(
      *scope.source, f.pos, "no line of " + f.name + " applies at n = " + n.str(),
      "add a line with 'otherwise', or a base case such as " + f.name + "(" + n.str() + ") = 1");
}

BigInt call_argument(const Expr& call, const Value& n, const EvalScope& scope) {
  return call_argument_value(call, n, scope).integer();
}

Value call_argument_value(const Expr& call, const Value& n, const EvalScope& scope) {
  const Expr& x = *call.args[0];
  Value v;
  if (x.kind == ExprKind::kDiv) {  // n/2 inside T(...) is read as floor(n/2)
    Value p = evaluate_expr(*x.args[0], n, scope);
    Value q = evaluate_expr(*x.args[1], n, scope);
    try {
      v = floor_quotient(p, q, *scope.ctx);
    } catch (const DomainError& error) {
      domain_failure(error, x, n, scope);
    }
  } else {
    v = evaluate_expr(x, n, scope);
  }
  if (v.small()) return v;
  if (v.is_integer()) return canonical_integer(v);
  return canonical_integer(floor_value(v));
}

}  // namespace thetagate::engine
