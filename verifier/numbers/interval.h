// Certified real intervals (MPFI), used only where a value is irrational.
//
// Boost 1.74's mpfi_float keeps its default precision in a process-wide
// static, which races under --jobs; this small owner of an mpfi_t carries its
// precision explicitly instead. Every operation rounds outward, so the true
// value always lies inside.
#ifndef THETAGATE_VERIFIER_NUMBERS_INTERVAL_H_
#define THETAGATE_VERIFIER_NUMBERS_INTERVAL_H_

#include <mpfi.h>

#include <optional>
#include <string>

#include "verifier/numbers/number.h"

namespace thetagate::engine {

class Interval {
 public:
  explicit Interval(long precision_bits);
  Interval(const Rational& x, long precision_bits);
  Interval(const BigInt& x, long precision_bits);
  Interval(const Interval& other);
  Interval(Interval&& other) noexcept;
  Interval& operator=(const Interval& other);
  Interval& operator=(Interval&& other) noexcept;
  ~Interval();

  long precision() const { return mpfi_get_prec(value_); }

  friend Interval operator+(const Interval& a, const Interval& b);
  friend Interval operator-(const Interval& a, const Interval& b);
  friend Interval operator*(const Interval& a, const Interval& b);
  // REQUIRES: 0 not in b (check with contains_zero()).
  friend Interval operator/(const Interval& a, const Interval& b);
  Interval operator-() const;

  // Elementary functions. REQUIRES: the argument is inside the domain
  // (positive for logs, non-negative for sqrt); callers check first.
  Interval log2() const;
  Interval log() const;
  Interval exp() const;
  Interval sqrt() const;
  // x^y for x > 0, computed as exp(y ln x).
  Interval pow(const Interval& y) const;
  static Interval min(const Interval& a, const Interval& b);
  static Interval max(const Interval& a, const Interval& b);

  bool contains_zero() const;
  // True when every point is > 0 (resp. < 0, >= 0).
  bool certainly_positive() const;
  bool certainly_negative() const;
  bool certainly_nonnegative() const;

  // The common floor (ceiling) of every point, if all points share it.
  std::optional<BigInt> common_floor() const;
  std::optional<BigInt> common_ceil() const;

  // Exact endpoints, as rationals.
  Rational lower() const;
  Rational upper() const;
  // Relative width (hi - lo) / |mid|, as a double; infinity where mid == 0.
  double relative_width() const;
  // Midpoint as a double (approximate, for plots and sorting).
  double approx() const;

  // "[lo, hi]" with `digits` significant digits, lo rounded down, hi up.
  std::string str(int digits = 12) const;

  mpfi_srcptr raw() const { return value_; }
  mpfi_ptr raw() { return value_; }

 private:
  mpfi_t value_;
};

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_NUMBERS_INTERVAL_H_
