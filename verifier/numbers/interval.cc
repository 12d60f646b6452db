#include "verifier/numbers/interval.h"

#include <mpfr.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <utility>

#include "verifier/numbers/value.h"

namespace thetagate::engine {

namespace {
// Endpoints beyond 2^(2^20) are not turned into exact rationals.
constexpr long kMaxExactExponentBits = 1L << 20;

long joint_precision(const Interval& a, const Interval& b) {
  return std::max(a.precision(), b.precision());
}

Rational rational_of(mpfr_srcptr x) {
  // mpfr_get_q is exact for finite values, and as long as the value's
  // exponent: 2^(10^10) would need 1.25 GB. Such a number is a budget
  // error, not an allocation that takes the machine down.
  if (mpfr_regular_p(x) && std::abs(mpfr_get_exp(x)) > kMaxExactExponentBits) {
    throw BudgetExceeded(Limit::kValueSize, "a number near 2^" + std::to_string(mpfr_get_exp(x)) +
                                                " has too many bits to handle exactly");
  }
  Rational q;
  mpfr_get_q(q.backend().data(), x);
  return q;
}

std::string endpoint_text(mpfr_srcptr x, int digits, bool round_up) {
  char* buffer = nullptr;
  int length = round_up ? mpfr_asprintf(&buffer, "%.*RUg", digits, x)
                        : mpfr_asprintf(&buffer, "%.*RDg", digits, x);
  std::string text = length >= 0 ? std::string(buffer, static_cast<size_t>(length)) : "?";
  if (buffer != nullptr) mpfr_free_str(buffer);
  return text;
}
}  // namespace

Interval::Interval(long precision_bits) { mpfi_init2(value_, precision_bits); }

Interval::Interval(const Rational& x, long precision_bits) {
  mpfi_init2(value_, precision_bits);
  mpfi_set_q(value_, x.backend().data());
}

Interval::Interval(const BigInt& x, long precision_bits) {
  mpfi_init2(value_, precision_bits);
  mpfi_set_z(value_, x.backend().data());
}

Interval::Interval(const Interval& other) {
  mpfi_init2(value_, other.precision());
  mpfi_set(value_, other.value_);
}

Interval::Interval(Interval&& other) noexcept {
  mpfi_init2(value_, MPFR_PREC_MIN);
  mpfi_swap(value_, other.value_);
}

Interval& Interval::operator=(const Interval& other) {
  if (this != &other) {
    mpfi_set_prec(value_, other.precision());
    mpfi_set(value_, other.value_);
  }
  return *this;
}

Interval& Interval::operator=(Interval&& other) noexcept {
  mpfi_swap(value_, other.value_);
  return *this;
}

Interval::~Interval() { mpfi_clear(value_); }

Interval operator+(const Interval& a, const Interval& b) {
  Interval r(joint_precision(a, b));
  mpfi_add(r.value_, a.value_, b.value_);
  return r;
}

Interval operator-(const Interval& a, const Interval& b) {
  Interval r(joint_precision(a, b));
  mpfi_sub(r.value_, a.value_, b.value_);
  return r;
}

Interval operator*(const Interval& a, const Interval& b) {
  Interval r(joint_precision(a, b));
  mpfi_mul(r.value_, a.value_, b.value_);
  return r;
}

Interval operator/(const Interval& a, const Interval& b) {
  Interval r(joint_precision(a, b));
  mpfi_div(r.value_, a.value_, b.value_);
  return r;
}

Interval Interval::operator-() const {
  Interval r(precision());
  mpfi_neg(r.value_, value_);
  return r;
}

Interval Interval::log2() const {
  Interval r(precision());
  mpfi_log2(r.value_, value_);
  return r;
}

Interval Interval::log() const {
  Interval r(precision());
  mpfi_log(r.value_, value_);
  return r;
}

Interval Interval::exp() const {
  Interval r(precision());
  mpfi_exp(r.value_, value_);
  return r;
}

Interval Interval::sqrt() const {
  Interval r(precision());
  mpfi_sqrt(r.value_, value_);
  return r;
}

Interval Interval::pow(const Interval& y) const { return (y * log()).exp(); }

Interval Interval::min(const Interval& a, const Interval& b) {
  Interval r(joint_precision(a, b));
  mpfr_t lo, hi;
  mpfr_init2(lo, r.precision());
  mpfr_init2(hi, r.precision());
  mpfr_min(lo, &a.value_->left, &b.value_->left, MPFR_RNDD);
  mpfr_min(hi, &a.value_->right, &b.value_->right, MPFR_RNDU);
  mpfi_interv_fr(r.value_, lo, hi);
  mpfr_clear(lo);
  mpfr_clear(hi);
  return r;
}

Interval Interval::max(const Interval& a, const Interval& b) {
  Interval r(joint_precision(a, b));
  mpfr_t lo, hi;
  mpfr_init2(lo, r.precision());
  mpfr_init2(hi, r.precision());
  mpfr_max(lo, &a.value_->left, &b.value_->left, MPFR_RNDD);
  mpfr_max(hi, &a.value_->right, &b.value_->right, MPFR_RNDU);
  mpfi_interv_fr(r.value_, lo, hi);
  mpfr_clear(lo);
  mpfr_clear(hi);
  return r;
}

bool Interval::contains_zero() const { return mpfi_has_zero(value_) != 0; }
bool Interval::certainly_positive() const { return mpfi_is_strictly_pos(value_) != 0; }
bool Interval::certainly_negative() const { return mpfi_is_strictly_neg(value_) != 0; }
bool Interval::certainly_nonnegative() const { return mpfi_is_nonneg(value_) != 0; }

std::optional<BigInt> Interval::common_floor() const {
  if (mpfi_nan_p(value_) || mpfi_inf_p(value_)) return std::nullopt;
  BigInt lo, hi;
  mpfr_get_z(lo.backend().data(), &value_->left, MPFR_RNDD);
  mpfr_get_z(hi.backend().data(), &value_->right, MPFR_RNDD);
  if (lo != hi) return std::nullopt;
  return lo;
}

std::optional<BigInt> Interval::common_ceil() const {
  if (mpfi_nan_p(value_) || mpfi_inf_p(value_)) return std::nullopt;
  BigInt lo, hi;
  mpfr_get_z(lo.backend().data(), &value_->left, MPFR_RNDU);
  mpfr_get_z(hi.backend().data(), &value_->right, MPFR_RNDU);
  if (lo != hi) return std::nullopt;
  return lo;
}

Rational Interval::lower() const { return rational_of(&value_->left); }
Rational Interval::upper() const { return rational_of(&value_->right); }

double Interval::relative_width() const {
  if (mpfi_has_zero(value_)) return std::numeric_limits<double>::infinity();
  mpfr_t width;
  mpfr_init2(width, 64);
  mpfi_diam_rel(width, value_);  // (hi - lo) / |mid|, rounded up
  double w = mpfr_get_d(width, MPFR_RNDU);
  mpfr_clear(width);
  return w;
}

double Interval::approx() const {
  mpfr_t mid;
  mpfr_init2(mid, precision());
  mpfi_mid(mid, value_);
  double d = mpfr_get_d(mid, MPFR_RNDN);
  mpfr_clear(mid);
  return d;
}

std::string Interval::str(int digits) const {
  return "[" + endpoint_text(&value_->left, digits, false) + ", " +
         endpoint_text(&value_->right, digits, true) + "]";
}

}  // namespace thetagate::engine
