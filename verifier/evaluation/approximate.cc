#include "verifier/evaluation/approximate.h"

#include <cmath>
#include <string>
#include <utility>
#include <vector>

namespace thetagate::engine {

namespace {

// Integers below this are exact in a double, with room for one product.
constexpr double kExactLimit = 9007199254740992.0;  // 2^53

struct Approx {
  double v = 0;
  bool exact = false;  // v is exactly the true value (an integer below 2^53)
};

bool exact_integer(double v) { return std::fabs(v) < kExactLimit && v == std::floor(v); }

std::optional<Approx> eval(const Expr& e, int64_t n);

std::optional<Approx> rounding(const Expr& e, int64_t n, bool up) {
  const Expr& x = *e.args[0];
  if (x.kind == ExprKind::kDiv) {
    auto p = eval(*x.args[0], n), q = eval(*x.args[1], n);
    if (!p || !q) return std::nullopt;
    if (p->exact && q->exact && q->v != 0) {
      // Integer division: floor and ceiling without rounding error.
      auto a = static_cast<int64_t>(p->v), b = static_cast<int64_t>(q->v);
      int64_t quotient = a / b;
      bool inexact = a % b != 0;
      bool negative = (a < 0) != (b < 0);
      if (inexact && !up && negative) --quotient;
      if (inexact && up && !negative) ++quotient;
      return Approx{static_cast<double>(quotient), true};
    }
  }
  auto a = eval(x, n);
  if (!a) return std::nullopt;
  if (a->exact) return a;
  double nearest = std::round(a->v);
  // An irrational value this close to a whole number may round either way.
  if (std::fabs(a->v - nearest) <= 1e-6 * std::max(1.0, std::fabs(a->v))) return std::nullopt;
  double r = up ? std::ceil(a->v) : std::floor(a->v);
  return Approx{r, exact_integer(r)};
}

std::optional<Approx> call(const Expr& e, int64_t n) {
  const std::string& f = e.name;
  if (f == "floor" || f == "ceil") return rounding(e, n, f == "ceil");
  std::vector<Approx> args;
  for (const auto& a : e.args) {
    auto v = eval(*a, n);
    if (!v) return std::nullopt;
    args.push_back(*v);
  }
  auto inexact = [](double v) { return std::optional<Approx>(Approx{v, false}); };
  if (f == "lg" || f == "log2") {
    if (args[0].v <= 0) return std::nullopt;
    int exponent = 0;
    if (args[0].exact && std::frexp(args[0].v, &exponent) == 0.5) {
      return Approx{static_cast<double>(exponent - 1), true};
    }
    return inexact(std::log2(args[0].v));
  }
  if (f == "ln") return args[0].v > 0 ? inexact(std::log(args[0].v)) : std::nullopt;
  if (f == "log") {
    if (args[0].v <= 0 || args[0].v == 1 || args[1].v <= 0) return std::nullopt;
    return inexact(std::log(args[1].v) / std::log(args[0].v));
  }
  if (f == "sqrt") {
    if (args[0].v < 0) return std::nullopt;
    double r = std::sqrt(args[0].v);
    if (args[0].exact && exact_integer(std::round(r)) &&
        std::round(r) * std::round(r) == args[0].v) {
      return Approx{std::round(r), true};
    }
    return inexact(r);
  }
  if (f == "min" || f == "max") {
    Approx best = args[0];
    for (const Approx& a : args) {
      if (f == "min" ? a.v < best.v : a.v > best.v) best = a;
    }
    return best;
  }
  if (f == "mod") {
    if (!args[0].exact || !args[1].exact || args[1].v == 0) return std::nullopt;
    double r = std::fmod(args[0].v, args[1].v);
    if (r != 0 && ((r < 0) != (args[1].v < 0))) r += args[1].v;
    return Approx{r, true};
  }
  return std::nullopt;  // the recurrence itself, or a helper
}

std::optional<Approx> eval(const Expr& e, int64_t n) {
  std::optional<Approx> a, b;
  if (e.kind >= ExprKind::kAdd && e.kind <= ExprKind::kPow) {
    a = eval(*e.args[0], n);
    b = eval(*e.args[1], n);
    if (!a || !b) return std::nullopt;
  }
  switch (e.kind) {
    case ExprKind::kNumber: {
      double v = e.number.convert_to<double>();
      return Approx{v, e.has_small && exact_integer(v)};
    }
    case ExprKind::kVariable:
      return Approx{static_cast<double>(n), true};
    case ExprKind::kAdd: {
      double v = a->v + b->v;
      return Approx{v, a->exact && b->exact && exact_integer(v)};
    }
    case ExprKind::kSub: {
      double v = a->v - b->v;
      return Approx{v, a->exact && b->exact && exact_integer(v)};
    }
    case ExprKind::kMul: {
      double v = a->v * b->v;
      return Approx{v, a->exact && b->exact && exact_integer(v)};
    }
    case ExprKind::kDiv: {
      if (b->v == 0) return std::nullopt;
      double v = a->v / b->v;
      bool exact = a->exact && b->exact && std::fmod(a->v, b->v) == 0 && exact_integer(v);
      return Approx{v, exact};
    }
    case ExprKind::kPow: {
      if (a->v < 0 && !(b->exact)) return std::nullopt;
      if (a->v == 0 && b->v <= 0) return std::nullopt;
      double v = std::pow(a->v, b->v);
      return Approx{v, a->exact && b->exact && b->v >= 0 && exact_integer(v)};
    }
    case ExprKind::kNeg: {
      auto x = eval(*e.args[0], n);
      if (!x) return std::nullopt;
      return Approx{-x->v, x->exact};
    }
    case ExprKind::kCall:
      return call(e, n);
    default:
      return std::nullopt;  // conditions have no value
  }
}

// A real number as its sign and log2 of its magnitude: products and powers
// of sizes with thousands of bits stay small numbers.
struct LogApprox {
  int sign = 0;     // -1, 0, +1
  double log2 = 0;  // log2 |value|; unused when sign == 0
};

// Below this magnitude a value is also used as a plain double (an exponent,
// an argument of lg).
constexpr double kPlainLog2Limit = 1000;
// A difference whose result is this much smaller than its larger term has
// lost too many digits to promise 1e-12 in log2.
constexpr double kCancellationLog2 = -20;

LogApprox from_double(double v) {
  if (v == 0) return {0, 0};
  return {v < 0 ? -1 : 1, std::log2(std::fabs(v))};
}

std::optional<double> plain(const LogApprox& x) {
  if (x.sign == 0) return 0.0;
  if (x.log2 > kPlainLog2Limit) return std::nullopt;
  return x.sign * std::exp2(x.log2);
}

std::optional<LogApprox> log_eval(const Expr& e, const BigInt& n, double log2_n);

std::optional<LogApprox> log_sum(LogApprox a, LogApprox b) {
  if (a.sign == 0) return b;
  if (b.sign == 0) return a;
  if (a.log2 < b.log2) std::swap(a, b);
  double d = b.log2 - a.log2;  // <= 0
  if (a.sign == b.sign) return LogApprox{a.sign, a.log2 + std::log2(1 + std::exp2(d))};
  double rest = 1 - std::exp2(d);
  if (rest <= 0 || std::log2(rest) < kCancellationLog2) return std::nullopt;
  return LogApprox{a.sign, a.log2 + std::log2(rest)};
}

std::optional<LogApprox> log_call(const Expr& e, const BigInt& n, double log2_n) {
  const std::string& f = e.name;
  std::vector<LogApprox> args;
  for (const auto& a : e.args) {
    auto v = log_eval(*a, n, log2_n);
    if (!v) return std::nullopt;
    args.push_back(*v);
  }
  if (f == "floor" || f == "ceil") {
    // A large value moves by less than one unit in 2^-40 of itself.
    if (args[0].sign != 0 && args[0].log2 > 40) return args[0];
    auto v = plain(args[0]);
    if (!v) return std::nullopt;
    double nearest = std::round(*v);
    if (std::fabs(*v - nearest) <= 1e-6 * std::max(1.0, std::fabs(*v))) return std::nullopt;
    return from_double(f == "ceil" ? std::ceil(*v) : std::floor(*v));
  }
  if (f == "lg" || f == "log2") {
    if (args[0].sign <= 0) return std::nullopt;
    return from_double(args[0].log2);
  }
  if (f == "ln") {
    if (args[0].sign <= 0) return std::nullopt;
    return from_double(args[0].log2 * std::log(2.0));
  }
  if (f == "log") {
    if (args[0].sign <= 0 || args[1].sign <= 0 || args[0].log2 == 0) return std::nullopt;
    return from_double(args[1].log2 / args[0].log2);
  }
  if (f == "sqrt") {
    if (args[0].sign < 0) return std::nullopt;
    return args[0].sign == 0 ? args[0] : LogApprox{1, args[0].log2 / 2};
  }
  if (f == "min" || f == "max") {
    auto order = [](const LogApprox& a, const LogApprox& b) {  // a < b
      if (a.sign != b.sign) return a.sign < b.sign;
      return a.sign > 0 ? a.log2 < b.log2 : a.sign < 0 && a.log2 > b.log2;
    };
    LogApprox best = args[0];
    for (const LogApprox& a : args) {
      if (f == "min" ? order(a, best) : order(best, a)) best = a;
    }
    return best;
  }
  return std::nullopt;  // mod needs the exact value; the recurrence; helpers
}

std::optional<LogApprox> log_eval(const Expr& e, const BigInt& n, double log2_n) {
  std::optional<LogApprox> a, b;
  if (e.kind >= ExprKind::kAdd && e.kind <= ExprKind::kDiv) {
    a = log_eval(*e.args[0], n, log2_n);
    b = log_eval(*e.args[1], n, log2_n);
    if (!a || !b) return std::nullopt;
  }
  switch (e.kind) {
    case ExprKind::kNumber:
      return from_double(e.number.convert_to<double>());
    case ExprKind::kVariable:
      return n == 0 ? LogApprox{0, 0} : LogApprox{1, log2_n};
    case ExprKind::kAdd:
      return log_sum(*a, *b);
    case ExprKind::kSub:
      return log_sum(*a, LogApprox{-b->sign, b->log2});
    case ExprKind::kMul:
      if (a->sign == 0 || b->sign == 0) return LogApprox{0, 0};
      return LogApprox{a->sign * b->sign, a->log2 + b->log2};
    case ExprKind::kDiv:
      if (b->sign == 0) return std::nullopt;
      if (a->sign == 0) return LogApprox{0, 0};
      return LogApprox{a->sign * b->sign, a->log2 - b->log2};
    case ExprKind::kPow: {
      auto base = log_eval(*e.args[0], n, log2_n);
      auto exponent = log_eval(*e.args[1], n, log2_n);
      if (!base || !exponent) return std::nullopt;
      auto y = plain(*exponent);
      if (!y) return std::nullopt;
      if (base->sign == 0) return *y > 0 ? std::optional<LogApprox>(LogApprox{0, 0}) : std::nullopt;
      if (base->sign < 0) {
        // Only whole exponents of negative bases are real.
        if (*y != std::floor(*y) || std::fabs(*y) > 1e15) return std::nullopt;
        bool odd = std::fmod(std::fabs(*y), 2.0) == 1.0;
        return LogApprox{odd ? -1 : 1, base->log2 * *y};
      }
      return LogApprox{1, base->log2 * *y};
    }
    case ExprKind::kNeg: {
      auto x = log_eval(*e.args[0], n, log2_n);
      if (!x) return std::nullopt;
      return LogApprox{-x->sign, x->log2};
    }
    case ExprKind::kCall:
      return log_call(e, n, log2_n);
    default:
      return std::nullopt;
  }
}

}  // namespace

std::optional<double> approximate_log2(const Expr& e, const BigInt& n) {
  if (n < 0) return std::nullopt;
  double log2_n = 0;
  if (n > 0) {
    long exponent = 0;
    double mantissa = mpz_get_d_2exp(&exponent, n.backend().data());
    log2_n = std::log2(mantissa) + static_cast<double>(exponent);
  }
  auto a = log_eval(e, n, log2_n);
  if (!a || a->sign <= 0 || !std::isfinite(a->log2)) return std::nullopt;
  return a->log2;
}

std::optional<double> approximate(const Expr& e, int64_t n) {
  if (n < 0 || n >= (int64_t{1} << 50)) return std::nullopt;
  auto a = eval(e, n);
  if (!a || !std::isfinite(a->v)) return std::nullopt;
  return a->v;
}

}  // namespace thetagate::engine
