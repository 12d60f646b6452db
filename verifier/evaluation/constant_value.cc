// The exact value of an expression without n (constant_value.h):
// a driving function's coefficients, a logarithm's base, an exponent such as
// lg 7 or 1/2. Values stay exact RealNumbers where the kinds allow; what is
// not a real number (lg 0, the square root of a negative number, division by
// zero) or cannot be decided within precision gives a reason instead.
#include "verifier/evaluation/constant_value.h"

#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "verifier/numbers/value.h"

namespace thetagate::engine {

namespace {

std::optional<RealNumber> fail(std::string* reason, std::string text) {
  if (reason != nullptr) *reason = std::move(text);
  return std::nullopt;
}

}  // namespace

std::optional<RealNumber> constant_value(const Expr& e, std::string* reason) {
  auto arg = [&](size_t i) { return constant_value(*e.args[i], reason); };
  try {
    switch (e.kind) {
      case ExprKind::kNumber:
        return RealNumber(e.number);
      case ExprKind::kVariable:
        return fail(reason, "the expression depends on n");
      case ExprKind::kNeg: {
        auto a = arg(0);
        if (!a) return a;
        return -*a;
      }
      case ExprKind::kAdd:
      case ExprKind::kSub:
      case ExprKind::kMul:
      case ExprKind::kDiv: {
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
        if (a->is_rational() && b->is_integer() &&
            boost::multiprecision::abs(b->rational()) < 4096) {
          long k = static_cast<long>(numerator(b->rational()));
          if (a->sign() == 0 && k < 0) return fail(reason, "'" + print(e) + "' divides by zero");
          Rational r = 1;
          for (long i = 0; i < (k < 0 ? -k : k); ++i) r *= a->rational();
          return RealNumber(k < 0 ? Rational(1) / r : r);
        }
        if (a->sign() <= 0)
          return fail(reason,
                      "'" + print(e) + "' raises a non-positive number to a fractional power");
        return pow(*a, *b);
      }
      case ExprKind::kCall: {
        const std::string& f = e.name;
        if (!is_builtin(f))
          return fail(reason, "'" + print(e) + "' calls " + f + ", which has no closed form here");
        std::vector<RealNumber> v;
        for (size_t i = 0; i < e.args.size(); ++i) {
          auto a = arg(i);
          if (!a) return a;
          v.push_back(*a);
        }
        if (f == "lg" || f == "log2" || f == "ln") {
          if (v[0].sign() <= 0)
            return fail(reason, "'" + print(e) + "' takes the log of a non-positive number");
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
          if (v[0].is_rational() && v[1].is_rational())
            return RealNumber::log(v[0].rational(), v[1].rational());
          if (v[0].is_rational() && v[1].kind() == RealNumber::Kind::kAlgebraic)
            return RealNumber::log_real(v[0].rational(), v[1]);
          return log2_of(v[1]) / log2_of(v[0]);
        }
        if (f == "sqrt") {
          int s = v[0].sign();
          if (s < 0)
            return fail(reason, "'" + print(e) + "' takes the square root of a negative number");
          if (s == 0) return RealNumber(0L);
          if (v[0].is_rational()) return RealNumber::root(v[0].rational(), 2);
          return pow(v[0], RealNumber(Rational(1, 2)));
        }
        if (f == "floor" || f == "ceil") {
          if (v[0].is_rational()) {
            return RealNumber(
                Rational(f == "floor" ? floor_of(v[0].rational()) : ceil_of(v[0].rational())));
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
      case ExprKind::kSum:
      case ExprKind::kBound:
        return fail(reason, "'" + print(e) + "' is a sum, not supported in a constant");
      default:
        return fail(reason, "'" + print(e) + "' is a condition, not a number");
    }
  } catch (const DomainError& error) {
    return fail(reason, "'" + print(e) + "': " + error.what());
  } catch (const PrecisionShortfall& error) {
    return fail(reason, "'" + print(e) + "': " + error.what());
  }
}

}  // namespace thetagate::engine
