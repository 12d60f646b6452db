// The numbers an evaluation produces: exact where the mathematics allows
// (machine integers, big integers, rationals), certified intervals only
// where a value is irrational (lg 3, sqrt 2, 1.5^n ...).
#ifndef THETAGATE_VERIFIER_VALUE_H_
#define THETAGATE_VERIFIER_VALUE_H_

#include <cstdint>
#include <optional>
#include <stdexcept>
#include <string>
#include <variant>

#include "verifier/interval.h"
#include "verifier/number.h"

namespace thetagate {

// An interval was too wide to decide a floor, ceiling or comparison; the
// computation must be redone at higher precision, never guessed.
struct PrecisionShortfall : std::runtime_error {
  using std::runtime_error::runtime_error;
};

// A mathematical domain error (lg 0, division by zero, sqrt of a negative).
struct DomainError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

// A value or size grew past the budget (bits per value, steps, memo entries,
// time). Running out gives an `undecided` verdict with this reason.
struct BudgetExceeded : std::runtime_error {
  using std::runtime_error::runtime_error;
};

// Precision and size limits for arithmetic on values.
struct NumericContext {
  long precision_bits = 128;        // for intervals made from exact values
  uint64_t max_value_bits = 1u << 22;  // a larger exact value is a budget error
};

class Value {
 public:
  Value() : repr_(int64_t{0}) {}
  Value(int64_t x) : repr_(x) {}  // NOLINT: implicit from integers is natural
  Value(const BigInt& x);         // NOLINT
  Value(const Rational& x);       // NOLINT
  Value(Interval x) : repr_(std::move(x)) {}  // NOLINT

  bool is_exact() const { return !std::holds_alternative<Interval>(repr_); }
  bool is_integer() const;
  // REQUIRES: is_exact().
  Rational exact() const;
  // REQUIRES: is_integer().
  BigInt integer() const;
  // The integer without copying when it is stored big; small integers are
  // written to `scratch`. REQUIRES: is_integer().
  const BigInt& integer_ref(BigInt& scratch) const;
  // The small-integer value if this is an integer fitting in int64.
  std::optional<int64_t> small() const;
  // This value as an interval of at least the given precision.
  Interval interval(long precision_bits) const;
  // REQUIRES: !is_exact().
  const Interval& as_interval() const { return std::get<Interval>(repr_); }

  // Sign if certain: -1, 0, +1. Throws PrecisionShortfall for an interval
  // containing zero.
  int sign() const;
  // Approximate value as a double (for plots and sorting only).
  double approx() const;
  // log2 |x| as a double, accurate to double precision, for values of any
  // size (a 10^6-bit integer is fine). -infinity for 0.
  double log2_magnitude() const;
  // Bits of the integer part's magnitude (an estimate for intervals).
  uint64_t magnitude_bits() const;

  // "123", "7/2", or "[lo, hi]".
  std::string str() const;

  // Structural equality of exact values (intervals compare unequal).
  bool same_exact(const Value& other) const;

 private:
  std::variant<int64_t, BigInt, Rational, Interval> repr_;
  friend struct ValueOps;
};

// Arithmetic. Results are exact when both operands are exact and the result
// is rational; otherwise intervals at ctx.precision_bits.
Value add(const Value& a, const Value& b, const NumericContext& ctx);
Value sub(const Value& a, const Value& b, const NumericContext& ctx);
Value mul(const Value& a, const Value& b, const NumericContext& ctx);
Value div(const Value& a, const Value& b, const NumericContext& ctx);
Value neg(const Value& a);
Value power(const Value& base, const Value& exponent, const NumericContext& ctx);
Value floor_value(const Value& a);
// floor(a/b) and ceil(a/b) without forming a rational when both are integers.
Value floor_quotient(const Value& a, const Value& b, const NumericContext& ctx);
Value ceil_quotient(const Value& a, const Value& b, const NumericContext& ctx);
Value ceil_value(const Value& a);
Value lg_value(const Value& a, const NumericContext& ctx);
Value ln_value(const Value& a, const NumericContext& ctx);
Value log_value(const Value& base, const Value& x, const NumericContext& ctx);
Value sqrt_value(const Value& a, const NumericContext& ctx);
Value min_value(const Value& a, const Value& b, const NumericContext& ctx);
Value max_value(const Value& a, const Value& b, const NumericContext& ctx);
Value mod_value(const Value& a, const Value& b, const NumericContext& ctx);

// Three-way comparison: -1, 0, +1. Exact when both are exact; for intervals
// decided when they are disjoint, else PrecisionShortfall.
int compare(const Value& a, const Value& b, const NumericContext& ctx);

}  // namespace thetagate

#endif  // THETAGATE_VERIFIER_VALUE_H_
