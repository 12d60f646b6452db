#include "verifier/recheck/small_eval.h"

#include <algorithm>
#include <exception>
#include <optional>

#include "verifier/recheck/expansion.h"

namespace thetagate::engine::recheck {
namespace {

constexpr int kMaxDepth = 4000;
constexpr int64_t kMaxSumTerms = 1000000;

bool calls_anything(const Expr& e) {
  if (e.kind == ExprKind::kCall || e.kind == ExprKind::kSum || e.kind == ExprKind::kBound)
    return !(e.kind == ExprKind::kCall &&
             (e.name == "lg" || e.name == "log" || e.name == "log2" || e.name == "sqrt")) ||
           std::any_of(e.args.begin(), e.args.end(),
                       [](const ExprPtr& a) { return calls_anything(*a); });
  return std::any_of(e.args.begin(), e.args.end(),
                     [](const ExprPtr& a) { return calls_anything(*a); });
}

}  // namespace

SmallEvaluator::SmallEvaluator(const Recurrence& recurrence) : recurrence_(recurrence) {
  ctx_.precision_bits = 512;
}

int SmallEvaluator::sign_of_difference(const Value& a, const Value& b) const {
  try {
    return compare(a, b, ctx_);
  } catch (const PrecisionShortfall&) {
    throw Unsupported("two values agree to " + std::to_string(ctx_.precision_bits) +
                      " bits: " + a.str() + " and " + b.str());
  }
}

bool SmallEvaluator::at_least(const Value& a, const Value& b, bool strict) const {
  Value d = sub(a, b, ctx_);
  if (d.is_exact()) {
    int sign = d.exact() == 0 ? 0 : (d.exact() > 0 ? 1 : -1);
    return strict ? sign > 0 : sign >= 0;
  }
  const Interval& iv = d.as_interval();
  if (strict ? iv.certainly_positive() : iv.certainly_nonnegative()) return true;
  if (strict ? !(iv.upper() > 0) : iv.certainly_negative()) return false;
  throw Unsupported("the difference of " + a.str() + " and " + b.str() + " is not decided at " +
                    std::to_string(ctx_.precision_bits) + " bits");
}

Value SmallEvaluator::at(const BigInt& n) {
  if (n < 0 || n > kLargestSize)
    throw Unsupported("T(" + n.str() + ") is beyond the re-checker's range");
  if (auto it = memo_.find(n); it != memo_.end()) return it->second;
  // Sizes are filled in ascending order, so a call T(n - 1) or T(n/2) finds
  // its value remembered and the recursion stays shallow.
  BigInt m = memo_.empty() ? BigInt(0) : memo_.rbegin()->first + 1;
  for (; m < n; ++m) {
    try {
      at(m);
    } catch (const Unsupported&) {
      // A size the claim never reaches (T(0) with lg 0 in its line): only an
      // error if some later size needs it, and then it is raised there.
    } catch (const LimitReached&) {
    }
  }
  std::map<std::string, Value> bound;
  Value nv(n);
  const Function& f = recurrence_.main;
  const CaseLine& line = line_at(f, nv, 0);
  for (const Expr* call : line.calls) {
    Value arg = call_argument(*call, nv, bound, 0);
    if (arg.sign() < 0 || sign_of_difference(arg, nv) >= 0) {
      if (!recurrence_.default_base)
        throw Unsupported(print(*call) + " at n = " + n.str() + " does not shrink");
      return memo_[n] = Value(int64_t{1});
    }
  }
  Value v = eval(*line.body, nv, bound, 0);
  return memo_[n] = v;
}

Value SmallEvaluator::value(const Expr& e, const BigInt& n) {
  std::map<std::string, Value> bound;
  return eval(e, Value(n), bound, 0);
}

const CaseLine& SmallEvaluator::line_at(const Function& f, const Value& n, int depth) {
  if (n.is_integer()) {
    auto it = f.point_at.find(n.integer());
    if (it != f.point_at.end()) return f.points[it->second];
  }
  std::map<std::string, Value> bound;
  for (const CaseLine& line : f.conditional)
    if (test(*line.condition, n, bound, depth)) return line;
  if (!f.fallback) throw Unsupported("no line of " + f.name + " applies at n = " + n.str());
  return *f.fallback;
}

Value SmallEvaluator::call_argument(const Expr& call, const Value& n,
                                    std::map<std::string, Value>& bound, int depth) {
  Value v = eval(*call.args[0], n, bound, depth);
  if (v.is_integer()) return canonical_integer(v);
  try {
    return canonical_integer(floor_value(v));
  } catch (const PrecisionShortfall&) {
    throw Unsupported("the argument " + print(call) + " at n = " + n.str() +
                      " is too close to a whole number");
  }
}

bool SmallEvaluator::test(const Expr& c, const Value& n, std::map<std::string, Value>& bound,
                          int depth) {
  switch (c.kind) {
    case ExprKind::kAnd:
      return test(*c.args[0], n, bound, depth) && test(*c.args[1], n, bound, depth);
    case ExprKind::kOr:
      return test(*c.args[0], n, bound, depth) || test(*c.args[1], n, bound, depth);
    case ExprKind::kNot:
      return !test(*c.args[0], n, bound, depth);
    case ExprKind::kEven:
    case ExprKind::kOdd: {
      Value v = eval(*c.args[0], n, bound, depth);
      if (!v.is_integer()) return false;  // a fraction is neither even nor odd
      bool even = floor_mod(v.integer(), BigInt(2)) == 0;
      return c.kind == ExprKind::kEven ? even : !even;
    }
    default: {
      Value a = eval(*c.args[0], n, bound, depth);
      Value b = eval(*c.args[1], n, bound, depth);
      return comparison_holds(c.kind, sign_of_difference(a, b));
    }
  }
}

Value SmallEvaluator::eval(const Expr& e, const Value& n, std::map<std::string, Value>& bound,
                           int depth) {
  if (depth > kMaxDepth) throw Unsupported("an expression nested too deeply for the re-checker");
  auto sub = [&](size_t i) { return eval(*e.args[i], n, bound, depth + 1); };
  try {
    switch (e.kind) {
      case ExprKind::kNumber:
        return Value(e.number);
      case ExprKind::kVariable:
        return n;
      case ExprKind::kBound: {
        auto it = bound.find(e.name);
        if (it == bound.end()) throw Unsupported("the unbound variable " + e.name);
        return it->second;
      }
      case ExprKind::kAdd:
        return add(sub(0), sub(1), ctx_);
      case ExprKind::kSub:
        return engine::sub(sub(0), sub(1), ctx_);
      case ExprKind::kMul:
        return mul(sub(0), sub(1), ctx_);
      case ExprKind::kDiv:
        return div(sub(0), sub(1), ctx_);
      case ExprKind::kNeg:
        return neg(sub(0));
      case ExprKind::kPow: {
        Value base = sub(0);
        // 2^(lg 3) is 3: a constant exponent on an exact base is tried
        // exactly first (rational_power verifies its guess with exact logs).
        if (base.is_exact() && base.exact() > 0 && !mentions_n(*e.args[1]) &&
            !calls_anything(*e.args[1])) {
          try {
            Coef c = rational_power(base.exact(), constant_value(*e.args[1]));
            if (c.exact) return Value(*c.exact);
          } catch (const Unsupported&) {
          }
        }
        return power(base, sub(1), ctx_);
      }
      case ExprKind::kSum: {
        Value lo = sub(0), hi = sub(1);
        if (!lo.is_integer() || !hi.is_integer())
          throw Unsupported("a sum with limits that are not whole");
        BigInt k = lo.integer(), last = hi.integer();
        if (last - k > kMaxSumTerms) throw Unsupported("a sum too long for the re-checker");
        Value total(int64_t{0});
        auto saved = bound.find(e.name) == bound.end() ? std::optional<Value>() : bound[e.name];
        for (; k <= last; ++k) {
          bound[e.name] = Value(k);
          total = add(total, eval(*e.args[2], n, bound, depth + 1), ctx_);
        }
        if (saved)
          bound[e.name] = *saved;
        else
          bound.erase(e.name);
        return total;
      }
      case ExprKind::kCall:
        break;
      default:
        throw Unsupported("a condition where a value is expected");
    }
    const std::string& name = e.name;
    if (name == recurrence_.main.name) {
      Value arg = call_argument(e, n, bound, depth + 1);
      if (arg.sign() < 0) throw Unsupported(print(e) + " at n = " + n.str() + " is not a size");
      return at(arg.integer());
    }
    if (name == "floor") return floor_value(sub(0));
    if (name == "ceil") return ceil_value(sub(0));
    if (name == "lg" || name == "log2") return lg_value(sub(0), ctx_);
    if (name == "ln") return ln_value(sub(0), ctx_);
    if (name == "log") return log_value(sub(0), sub(1), ctx_);
    if (name == "sqrt") return sqrt_value(sub(0), ctx_);
    if (name == "mod") return mod_value(sub(0), sub(1), ctx_);
    if (name == "min" || name == "max") {
      Value best = sub(0);
      for (size_t i = 1; i < e.args.size(); ++i) {
        Value v = sub(i);
        best = name == "min" ? min_value(best, v, ctx_) : max_value(best, v, ctx_);
      }
      return best;
    }
    auto it = recurrence_.helpers.find(name);
    if (it == recurrence_.helpers.end()) throw Unsupported("the function " + name);
    Value arg = sub(0);
    const CaseLine& line = line_at(it->second, arg, depth + 1);
    std::map<std::string, Value> inner;
    return eval(*line.body, arg, inner, depth + 1);
  } catch (const PrecisionShortfall&) {
    throw Unsupported("a value the re-checker's precision cannot decide: " + print(e) +
                      " at n = " + n.str());
  } catch (const DomainError& error) {
    throw Unsupported(std::string(error.what()) + " in " + print(e) + " at n = " + n.str());
  }
}

}  // namespace thetagate::engine::recheck
