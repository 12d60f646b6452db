#include "verifier/evaluation/expression_eval.h"

#include <gmp.h>

#include <stdexcept>

namespace thetagate::engine {

namespace {

[[noreturn]] void domain_failure(const DomainError& error, const Expr& at, const Value& n,
                                 const EvalScope& scope) {
  std::string hint = "add a base case for the small sizes where this is undefined, e.g. T(1) = 1";
  // A divisor that does not depend on n is zero at every size: no base case helps.
  bool divides = at.kind == ExprKind::kDiv || (at.kind == ExprKind::kCall && at.name == "mod");
  if (divides && at.args.size() == 2 && !mentions_n(*at.args[1])) {
    hint = "the divisor '" + print(*at.args[1]) +
           "' does not depend on n: it is zero at every "
           "size; fix the expression";
  }
  fail_at(*scope.source, at.pos,
          std::string(error.what()) + " at n = " + n.str() + " (in '" + print(at) + "')", hint);
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
  if (is_builtin(f)) throw std::logic_error("unhandled builtin " + f);
  return std::nullopt;
}

Value call_helper(const Function& helper, const Expr& call, const Value& n,
                  const EvalScope& scope) {
  Value argument = evaluate_expr(*call.args[0], n, scope);
  const CaseLine& line = select_case(helper, argument, scope);
  return evaluate_expr(*line.body, argument, scope);
}

}  // namespace

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
      case ExprKind::kPow:
        return power(evaluate_expr(*e.args[0], n, scope), evaluate_expr(*e.args[1], n, scope), ctx);
      case ExprKind::kNeg:
        return neg(evaluate_expr(*e.args[0], n, scope));
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
      int order = compare(a, b, ctx);
      switch (c.kind) {
        case ExprKind::kEq:
          return order == 0;
        case ExprKind::kNe:
          return order != 0;
        case ExprKind::kLt:
          return order < 0;
        case ExprKind::kLe:
          return order <= 0;
        case ExprKind::kGt:
          return order > 0;
        default:
          return order >= 0;
      }
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
