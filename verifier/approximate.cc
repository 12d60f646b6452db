#include "verifier/approximate.h"

#include <cmath>

namespace thetagate {

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
    if (args[0].exact && exact_integer(std::round(r)) && std::round(r) * std::round(r) == args[0].v) {
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

}  // namespace

std::optional<double> approximate(const Expr& e, int64_t n) {
  if (n < 0 || n >= (int64_t{1} << 50)) return std::nullopt;
  auto a = eval(e, n);
  if (!a || !std::isfinite(a->v)) return std::nullopt;
  return a->v;
}

}  // namespace thetagate
