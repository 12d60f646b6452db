// The numbers an evaluation produces: exact where the mathematics allows
// (machine integers, big integers, rationals), certified intervals only
// where a value is irrational (lg 3, sqrt 2, 1.5^n ...).
#ifndef THETAGATE_VERIFIER_NUMBERS_VALUE_H_
#define THETAGATE_VERIFIER_NUMBERS_VALUE_H_

#include <cstdint>
#include <memory>
#include <optional>
#include <stdexcept>
#include <string>
#include <variant>

#include "thetagate/errors.h"
#include "verifier/numbers/interval.h"
#include "verifier/numbers/number.h"

namespace thetagate::engine {

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
// time): the public LimitReached (thetagate/errors.h). Running out gives an
// `undecided` verdict with this reason.
using BudgetExceeded = ::thetagate::LimitReached;
using ::thetagate::Limit;

// The budget that ran out was interval precision: two sides agree to more
// digits than the largest precision holds (they may be equal).
struct PrecisionExhausted : BudgetExceeded {
  explicit PrecisionExhausted(const std::string& what) : BudgetExceeded(Limit::kPrecision, what) {}
};

// Precision and size limits for arithmetic on values.
struct NumericContext {
  long precision_bits = 128;           // for intervals made from exact values
  uint64_t max_value_bits = 1u << 22;  // a larger exact value is a budget error
};

// Throws BudgetExceeded when a value of `bits` bits is over ctx's limit.
void check_bits(uint64_t bits, const NumericContext& ctx);

// An exact or certified number. Big integers, rationals and intervals live
// in shared immutable storage, so copying a Value (the size n at each use, a
// memo lookup) costs a reference count, never a limb allocation.
class Value {
 public:
  Value() : repr_(int64_t{0}) {}
  Value(int64_t x) : repr_(x) {}  // NOLINT: implicit from integers is natural
  // Kept in the big form even when small (tests exercise both forms); use
  // canonical_integer() for the machine form where it fits.
  Value(const BigInt& x);    // NOLINT
  Value(BigInt&& x);         // NOLINT: takes the limbs, no copy
  Value(const Rational& x);  // NOLINT
  Value(Rational&& x);       // NOLINT
  Value(Interval x);         // NOLINT

  bool is_exact() const { return !std::holds_alternative<IntervalPtr>(repr_); }
  bool is_integer() const;
  // REQUIRES: is_exact().
  Rational exact() const;
  // REQUIRES: is_integer().
  BigInt integer() const;
  // The integer without copying when it is stored big; small integers are
  // written to `scratch`. REQUIRES: is_integer().
  const BigInt& integer_ref(BigInt& scratch) const;
  // The small-integer value if this is an integer fitting in int64.
  std::optional<int64_t> small() const {
    if (auto* s = std::get_if<int64_t>(&repr_)) return *s;
    return std::nullopt;
  }
  // This value as an interval of at least the given precision.
  Interval interval(long precision_bits) const;
  // REQUIRES: !is_exact().
  const Interval& as_interval() const { return **std::get_if<IntervalPtr>(&repr_); }
  // The big integer when stored in the big form, else null (no copy).
  const BigInt* big_integer() const {
    auto* p = std::get_if<BigIntPtr>(&repr_);
    return p ? p->get() : nullptr;
  }

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
  // Not const: a temporary that owns its storage alone is updated in place
  // (see the rvalue add/sub); shared storage is never written.
  using BigIntPtr = std::shared_ptr<BigInt>;
  using RationalPtr = std::shared_ptr<const Rational>;
  using IntervalPtr = std::shared_ptr<const Interval>;
  const Rational* rational() const {
    auto* p = std::get_if<RationalPtr>(&repr_);
    return p ? p->get() : nullptr;
  }
  const Interval* interval_ptr() const {
    auto* p = std::get_if<IntervalPtr>(&repr_);
    return p ? p->get() : nullptr;
  }

  std::variant<int64_t, BigIntPtr, RationalPtr, IntervalPtr> repr_;
  friend struct ValueOps;
};

// The same integer in canonical form: the machine form when it fits in
// int64, else the big form (a whole rational becomes an integer).
// REQUIRES: v.is_integer(). Canonical integers are equal iff
// same_integer() says so, and hash alike under IntegerValueHash.
Value canonical_integer(const Value& v);
Value canonical_integer(BigInt&& x);

// Equality and hashing of canonical integers, for memo tables.
bool same_integer(const Value& a, const Value& b);
struct IntegerValueHash {
  // Deliberately not noexcept: that makes std::unordered_map cache each
  // key's hash code, so walking a bucket never rehashes big keys.
  size_t operator()(const Value& v) const;
};
struct IntegerValueEqual {
  bool operator()(const Value& a, const Value& b) const noexcept { return same_integer(a, b); }
};

// True when the integer v equals x. REQUIRES: v.is_integer().
bool equals_integer(const Value& v, const BigInt& x);

// Arithmetic. Results are exact when both operands are exact and the result
// is rational; otherwise intervals at ctx.precision_bits.
Value add(const Value& a, const Value& b, const NumericContext& ctx);
Value sub(const Value& a, const Value& b, const NumericContext& ctx);
// The same results; a temporary big operand that owns its storage alone is
// reused for the result instead of allocating new limbs.
Value add(Value&& a, Value&& b, const NumericContext& ctx);
Value sub(Value&& a, Value&& b, const NumericContext& ctx);
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

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_NUMBERS_VALUE_H_
