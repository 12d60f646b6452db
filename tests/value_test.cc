// Exact values, certified intervals and the number helpers under them.
// Big-number results are checked against GMP's mpz functions called
// directly (the reference library), machine-real results against <cmath>.
#include "verifier/numbers/value.h"

#include <gmp.h>
#include <gtest/gtest.h>

#include <chrono>
#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include "tests/support/test_support.h"
#include "verifier/numbers/interval.h"
#include "verifier/numbers/number.h"

namespace thetagate::engine {
namespace {

// A GMP integer with automatic cleanup; the reference side of every check.
using test_support::Mpz;

// 2^k + delta, built with mpz alone.
Mpz mpz_pow2_plus(unsigned long k, long delta) {
  Mpz r;
  mpz_ui_pow_ui(r.get(), 2, k);
  if (delta >= 0)
    mpz_add_ui(r.get(), r.get(), static_cast<unsigned long>(delta));
  else
    mpz_sub_ui(r.get(), r.get(), static_cast<unsigned long>(-delta));
  return r;
}

Mpz mpz_neg_of(const Mpz& x) {
  Mpz r;
  mpz_neg(r.get(), x.get());
  return r;
}

BigInt big(const Mpz& x) { return BigInt(x.str()); }

// The machine word edges, and one step either side of them.
std::vector<Mpz> word_edges() {
  std::vector<Mpz> out;
  for (unsigned long k : {31ul, 32ul, 62ul, 63ul, 64ul}) {
    for (long d : {-1l, 0l, 1l}) {
      out.push_back(mpz_pow2_plus(k, d));
      out.push_back(mpz_neg_of(mpz_pow2_plus(k, d)));
    }
  }
  out.push_back(Mpz("0"));
  out.push_back(Mpz("1"));
  out.push_back(Mpz("-1"));
  out.push_back(Mpz("3"));
  return out;
}

// The value two ways: as a machine integer where it fits (the fast path),
// and forced into a big integer (the slow path).
std::vector<Value> both_forms(const Mpz& x) {
  std::vector<Value> out{Value(big(x))};
  if (mpz_fits_slong_p(x.get())) out.push_back(Value(static_cast<int64_t>(mpz_get_si(x.get()))));
  return out;
}

Interval interval_between(double lo, double hi) {
  Interval i(64);
  mpfi_interv_d(i.raw(), lo, hi);
  return i;
}

double next_up(double x) { return std::nextafter(x, std::numeric_limits<double>::infinity()); }
double next_down(double x) { return std::nextafter(x, -std::numeric_limits<double>::infinity()); }

// (hi - lo) / |lo|, exactly.
Rational exact_relative_width(const Interval& i) {
  Rational lo = i.lower();
  return (i.upper() - lo) / abs(lo);
}

// The interval holds the double `reference` up to one unit in the last place
// (glibc's log2/log/sqrt are accurate to within 1 ulp), and is far narrower
// than a double.
void expect_certifies(const Value& v, double reference) {
  ASSERT_FALSE(v.is_exact()) << v.str();
  const Interval& i = v.as_interval();
  EXPECT_LE(i.lower(), Rational(next_up(reference))) << i.str(30);
  EXPECT_GE(i.upper(), Rational(next_down(reference))) << i.str(30);
  EXPECT_LT(exact_relative_width(i), Rational(1, BigInt(1) << 100)) << i.str(30);
}

const NumericContext kContext{};

TEST(ValueNumber, BitLengthMatchesMpzAtWordEdges) {
  for (const Mpz& x : word_edges()) {
    uint64_t expected = mpz_sgn(x.get()) == 0 ? 0 : mpz_sizeinbase(x.get(), 2);
    EXPECT_EQ(bit_length(big(x)), expected) << x.str();
  }
  EXPECT_EQ(bit_length(big(mpz_pow2_plus(64, 0))), 65u);
  EXPECT_EQ(bit_length(big(mpz_pow2_plus(64, -1))), 64u);
}

TEST(ValueNumber, FloorAndCeilingRoundTowardMinusAndPlusInfinity) {
  EXPECT_EQ(floor_of(Rational(7, 2)), 3);
  EXPECT_EQ(ceil_of(Rational(7, 2)), 4);
  EXPECT_EQ(floor_of(Rational(-7, 2)), -4);
  EXPECT_EQ(ceil_of(Rational(-7, 2)), -3);
  EXPECT_EQ(floor_of(Rational(6, 3)), 2);
  EXPECT_EQ(ceil_of(Rational(6, 3)), 2);
}

TEST(ValueNumber, IntegerRootsMatchMpz) {
  for (const Mpz& x : word_edges()) {
    if (mpz_sgn(x.get()) < 0) continue;
    Mpz r2, r3;
    mpz_sqrt(r2.get(), x.get());
    mpz_root(r3.get(), x.get(), 3);
    EXPECT_EQ(isqrt(big(x)), big(r2)) << x.str();
    EXPECT_EQ(iroot(big(x), 3), big(r3)) << x.str();
  }
  // (2^64 + 1)^2 - 1 is one short of a square.
  BigInt s = (BigInt(1) << 64) + 1;
  EXPECT_EQ(isqrt(s * s), s);
  EXPECT_EQ(isqrt(s * s - 1), s - 1);
}

TEST(ValueNumber, ExactLog2OnlyForPowersOfTwo) {
  EXPECT_EQ(exact_log2(Rational(1)), 0);
  EXPECT_EQ(exact_log2(Rational(BigInt(1) << 4096)), 4096);
  EXPECT_EQ(exact_log2(Rational(1, 8)), -3);
  EXPECT_EQ(exact_log2(Rational(BigInt(1) << 64, 1)), 64);
  EXPECT_FALSE(exact_log2(Rational(3, 4)).has_value());
  EXPECT_FALSE(exact_log2(Rational((BigInt(1) << 64) + 1)).has_value());
  EXPECT_FALSE(exact_log2(Rational(0)).has_value());
  EXPECT_FALSE(exact_log2(Rational(-4)).has_value());
}

TEST(ValueNumber, FloorModTakesTheSignOfTheModulus) {
  EXPECT_EQ(floor_mod(BigInt(-7), BigInt(3)), 2);
  EXPECT_EQ(floor_mod(BigInt(7), BigInt(-3)), -2);
  EXPECT_EQ(floor_mod(BigInt(7), BigInt(3)), 1);
  EXPECT_EQ(floor_mod((BigInt(1) << 64) + 1, BigInt(3)), 2);  // 2^64 = 1 mod 3
}

TEST(ValueNumber, HashAgreesForEqualValuesBuiltDifferently) {
  BigIntHash h;
  BigInt a = (BigInt(1) << 64) + 5;
  BigInt b = BigInt("18446744073709551621");
  EXPECT_EQ(a, b);
  EXPECT_EQ(h(a), h(b));
  EXPECT_NE(h(a), h(BigInt(-a)));
}

TEST(Value, ArithmeticAtWordEdgesMatchesMpz) {
  const std::vector<Mpz> edges = word_edges();
  int checked = 0;
  for (const Mpz& x : edges) {
    for (const Mpz& y : edges) {
      Mpz sum, difference, product;
      mpz_add(sum.get(), x.get(), y.get());
      mpz_sub(difference.get(), x.get(), y.get());
      mpz_mul(product.get(), x.get(), y.get());
      for (const Value& a : both_forms(x)) {
        for (const Value& b : both_forms(y)) {
          SCOPED_TRACE(x.str() + " and " + y.str());
          EXPECT_EQ(add(a, b, kContext).str(), sum.str());
          EXPECT_EQ(sub(a, b, kContext).str(), difference.str());
          EXPECT_EQ(mul(a, b, kContext).str(), product.str());
          if (mpz_sgn(y.get()) != 0) {
            Mpz remainder;
            mpz_fdiv_r(remainder.get(), x.get(), y.get());
            EXPECT_EQ(mod_value(a, b, kContext).str(), remainder.str());
            Mpz floor_q, ceil_q;
            mpz_fdiv_q(floor_q.get(), x.get(), y.get());
            mpz_cdiv_q(ceil_q.get(), x.get(), y.get());
            EXPECT_EQ(floor_quotient(a, b, kContext).str(), floor_q.str());
            EXPECT_EQ(ceil_quotient(a, b, kContext).str(), ceil_q.str());
            // Exact quotient: multiplying back gives x.
            Value q = div(a, b, kContext);
            EXPECT_TRUE(q.is_exact());
            EXPECT_EQ(mul(q, b, kContext).str(), x.str());
          }
          ++checked;
        }
      }
    }
  }
  EXPECT_GT(checked, 1000);
}

TEST(Value, ResultsThatFitAWordUseTheMachineForm) {
  // Normalisation matters for speed: a sum back inside int64 is small again.
  Value big_value = add(Value(std::numeric_limits<int64_t>::max()), Value(int64_t{1}), kContext);
  EXPECT_FALSE(big_value.small().has_value());
  EXPECT_EQ(big_value.str(), mpz_pow2_plus(63, 0).str());
  Value back = sub(big_value, Value(int64_t{1}), kContext);
  ASSERT_TRUE(back.small().has_value());
  EXPECT_EQ(*back.small(), std::numeric_limits<int64_t>::max());
  // -2^32 * 2^31 = -2^63 still fits.
  Value most_negative = mul(Value(-(int64_t{1} << 32)), Value(int64_t{1} << 31), kContext);
  ASSERT_TRUE(most_negative.small().has_value());
  EXPECT_EQ(*most_negative.small(), std::numeric_limits<int64_t>::min());
}

TEST(Value, NegationAndDivisionOfTheMostNegativeWordPromote) {
  const Value min64(std::numeric_limits<int64_t>::min());
  EXPECT_EQ(neg(min64).str(), mpz_pow2_plus(63, 0).str());
  EXPECT_EQ(div(min64, Value(int64_t{-1}), kContext).str(), mpz_pow2_plus(63, 0).str());
  EXPECT_EQ(mod_value(min64, Value(int64_t{-1}), kContext).str(), "0");
  EXPECT_EQ(mul(min64, Value(int64_t{-1}), kContext).str(), mpz_pow2_plus(63, 0).str());
}

TEST(Value, PowersOfTwoAtWordEdgesMatchMpz) {
  for (unsigned long k : {31ul, 32ul, 63ul, 64ul, 65ul, 4096ul}) {
    Value p = power(Value(int64_t{2}), Value(static_cast<int64_t>(k)), kContext);
    EXPECT_EQ(p.str(), mpz_pow2_plus(k, 0).str()) << k;
    EXPECT_EQ(sub(p, Value(int64_t{1}), kContext).str(), mpz_pow2_plus(k, -1).str()) << k;
    EXPECT_EQ(add(p, Value(int64_t{1}), kContext).str(), mpz_pow2_plus(k, 1).str()) << k;
  }
  // (2^64 + 1)(2^64 - 1) = 2^128 - 1.
  Value a =
      add(power(Value(int64_t{2}), Value(int64_t{64}), kContext), Value(int64_t{1}), kContext);
  Value b =
      sub(power(Value(int64_t{2}), Value(int64_t{64}), kContext), Value(int64_t{1}), kContext);
  EXPECT_EQ(mul(a, b, kContext).str(), mpz_pow2_plus(128, -1).str());
}

TEST(Value, QuotientsOfRationalsRoundLikeFloorAndCeiling) {
  EXPECT_EQ(floor_quotient(Value(Rational(7, 2)), Value(int64_t{2}), kContext).str(), "1");
  EXPECT_EQ(ceil_quotient(Value(Rational(7, 2)), Value(int64_t{2}), kContext).str(), "2");
  EXPECT_EQ(floor_quotient(Value(int64_t{-7}), Value(Rational(1, 2)), kContext).str(), "-14");
}

TEST(Value, RationalArithmeticIsExactAndReduced) {
  Value third = div(Value(int64_t{1}), Value(int64_t{3}), kContext);
  Value sixth = div(Value(int64_t{1}), Value(int64_t{6}), kContext);
  Value half = add(third, sixth, kContext);
  EXPECT_EQ(half.str(), "1/2");
  Value one = mul(half, Value(int64_t{2}), kContext);
  ASSERT_TRUE(one.small().has_value());  // 2/2 is normalised back to a word
  EXPECT_EQ(*one.small(), 1);
  EXPECT_EQ(sub(third, half, kContext).str(), "-1/6");
  EXPECT_EQ(mod_value(Value(Rational(7, 2)), Value(int64_t{2}), kContext).str(), "3/2");
  EXPECT_EQ(power(Value(Rational(2, 3)), Value(int64_t{-2}), kContext).str(), "9/4");
  EXPECT_EQ(power(Value(int64_t{2}), Value(int64_t{-3}), kContext).str(), "1/8");
}

TEST(Value, FractionalPowersOfPerfectPowersStayExact) {
  EXPECT_EQ(power(Value(int64_t{4}), Value(Rational(1, 2)), kContext).str(), "2");
  EXPECT_EQ(power(Value(Rational(8, 27)), Value(Rational(2, 3)), kContext).str(), "4/9");
  EXPECT_EQ(power(Value(int64_t{32}), Value(Rational(-3, 5)), kContext).str(), "1/8");
  // 2^0.5 is irrational: an interval around sqrt 2.
  expect_certifies(power(Value(int64_t{2}), Value(Rational(1, 2)), kContext), std::sqrt(2.0));
}

TEST(Value, LgOfPowersOfTwoIsExact) {
  for (int64_t k : {0, 1, 31, 32, 63, 64, 65, 4096}) {
    Value lg = lg_value(Value(BigInt(1) << k), kContext);
    ASSERT_TRUE(lg.small().has_value()) << lg.str();
    EXPECT_EQ(*lg.small(), k);
  }
  EXPECT_EQ(lg_value(Value(Rational(1, 1024)), kContext).str(), "-10");
  EXPECT_EQ(lg_value(Value(int64_t{1} << 62), kContext).str(), "62");
}

TEST(Value, SqrtOfPerfectSquaresAndRationalSquaresIsExact) {
  BigInt r = (BigInt(1) << 64) + 1;
  EXPECT_EQ(sqrt_value(Value(BigInt(r * r)), kContext).str(), r.str());
  EXPECT_EQ(sqrt_value(Value(int64_t{0}), kContext).str(), "0");
  EXPECT_EQ(sqrt_value(Value(Rational(9, 4)), kContext).str(), "3/2");
  EXPECT_EQ(sqrt_value(Value(Rational(BigInt(r * r), 49)), kContext).str(), Rational(r, 7).str());
  EXPECT_FALSE(sqrt_value(Value(BigInt(r * r - 1)), kContext).is_exact());
}

TEST(Value, LogIsExactWhenXIsAPowerOfTheBase) {
  EXPECT_EQ(
      log_value(Value(int64_t{3}), Value(BigInt(3) * BigInt("1853020188851841")), kContext).str(),
      "33");  // 3 * 3^32
  EXPECT_EQ(
      log_value(Value(int64_t{10}), Value(BigInt("1000000000000000000000000000000")), kContext)
          .str(),
      "30");
  EXPECT_EQ(log_value(Value(Rational(1, 2)), Value(int64_t{8}), kContext).str(), "-3");
  EXPECT_EQ(log_value(Value(int64_t{7}), Value(int64_t{1}), kContext).str(), "0");
  EXPECT_EQ(log_value(Value(int64_t{2}), Value(BigInt(1) << 200), kContext).str(), "200");
  // log_3(3^40 + 1) is not an integer: a certified interval just above 40.
  BigInt near = 1;
  for (int i = 0; i < 40; ++i) near *= 3;
  Value v = log_value(Value(int64_t{3}), Value(BigInt(near + 1)), kContext);
  ASSERT_FALSE(v.is_exact());
  EXPECT_GT(v.as_interval().lower(), Rational(40));
  EXPECT_LT(v.as_interval().upper(), Rational(40) + Rational(1, BigInt(1) << 60));
  // log_4 2 = 1/2 is rational but not an integer; the interval must hold it.
  Value half = log_value(Value(int64_t{4}), Value(int64_t{2}), kContext);
  if (half.is_exact()) {
    EXPECT_EQ(half.str(), "1/2");
  } else {
    EXPECT_LE(half.as_interval().lower(), Rational(1, 2));
    EXPECT_GE(half.as_interval().upper(), Rational(1, 2));
  }
}

TEST(Interval, LgLnSqrtCertifyTheStandardLibraryValues) {
  // Reference: <cmath> (glibc, within 1 ulp).
  expect_certifies(lg_value(Value(int64_t{3}), kContext), std::log2(3.0));
  expect_certifies(lg_value(Value(int64_t{7}), kContext), std::log2(7.0));
  expect_certifies(lg_value(Value(Rational(1, 3)), kContext), std::log2(1.0 / 3.0));
  expect_certifies(ln_value(Value(int64_t{2}), kContext), std::log(2.0));
  expect_certifies(sqrt_value(Value(int64_t{2}), kContext), std::sqrt(2.0));
  expect_certifies(log_value(Value(int64_t{3}), Value(int64_t{10}), kContext),
                   std::log(10.0) / std::log(3.0));
  // Arithmetic on intervals stays certified: lg 3 + lg 5 holds log2(15).
  expect_certifies(
      add(lg_value(Value(int64_t{3}), kContext), lg_value(Value(int64_t{5}), kContext), kContext),
      std::log2(15.0));
}

TEST(Interval, SqrtTwoEndpointsBracketTwoExactly) {
  // Exact check, no floating point: lo^2 <= 2 <= hi^2.
  Value s = sqrt_value(Value(int64_t{2}), kContext);
  ASSERT_FALSE(s.is_exact());
  Rational lo = s.as_interval().lower();
  Rational hi = s.as_interval().upper();
  EXPECT_LE(lo * lo, Rational(2));
  EXPECT_GE(hi * hi, Rational(2));
  EXPECT_LT(hi - lo, Rational(1, BigInt(1) << 120));
}

TEST(Interval, RelativeWidthSeesBelowDoublePrecision) {
  // A 128-bit enclosure of lg 3 is about 2^-126 wide relative to its size;
  // relative_width() promises that figure as a double (1e-38 is a double).
  Value lg3 = lg_value(Value(int64_t{3}), kContext);
  ASSERT_FALSE(lg3.is_exact());
  ASSERT_LT(exact_relative_width(lg3.as_interval()), Rational(1, BigInt(1) << 120));
  EXPECT_LT(lg3.as_interval().relative_width(), 1e-30);
}

TEST(Interval, FloorOfAnIntervalStraddlingAnIntegerIsAShortfall) {
  Value straddles(interval_between(0.9, 1.1));
  EXPECT_THROW(floor_value(straddles), PrecisionShortfall);
  EXPECT_THROW(ceil_value(straddles), PrecisionShortfall);
  Value inside(interval_between(1.2, 1.3));
  EXPECT_EQ(floor_value(inside).str(), "1");
  EXPECT_EQ(ceil_value(inside).str(), "2");
  // floor(lg 3) = 1 and ceil(lg 3) = 2 are decided.
  EXPECT_EQ(floor_value(lg_value(Value(int64_t{3}), kContext)).str(), "1");
  EXPECT_EQ(ceil_value(lg_value(Value(int64_t{3}), kContext)).str(), "2");
}

TEST(Interval, UndecidableComparisonsAndSignsAreShortfalls) {
  Value around_one(interval_between(0.9, 1.1));
  EXPECT_THROW(compare(around_one, Value(int64_t{1}), kContext), PrecisionShortfall);
  EXPECT_EQ(compare(around_one, Value(int64_t{2}), kContext), -1);
  EXPECT_EQ(compare(Value(int64_t{2}), around_one, kContext), 1);
  Value around_zero(interval_between(-0.1, 0.1));
  EXPECT_THROW(around_zero.sign(), PrecisionShortfall);
  EXPECT_THROW(div(Value(int64_t{1}), around_zero, kContext), PrecisionShortfall);
  // lg 3 vs 1.58496 and 1.58497: decided.
  Value lg3 = lg_value(Value(int64_t{3}), kContext);
  EXPECT_EQ(compare(lg3, Value(Rational(158496, 100000)), kContext), 1);
  EXPECT_EQ(compare(lg3, Value(Rational(158497, 100000)), kContext), -1);
}

TEST(Value, DomainErrorsAreReportedNotComputed) {
  const Value zero(int64_t{0});
  const Value one(int64_t{1});
  const Value minus_one(int64_t{-1});
  EXPECT_THROW(lg_value(zero, kContext), DomainError);
  EXPECT_THROW(lg_value(minus_one, kContext), DomainError);
  EXPECT_THROW(ln_value(zero, kContext), DomainError);
  EXPECT_THROW(sqrt_value(minus_one, kContext), DomainError);
  EXPECT_THROW(div(one, zero, kContext), DomainError);
  EXPECT_THROW(mod_value(one, zero, kContext), DomainError);
  EXPECT_THROW(floor_quotient(one, zero, kContext), DomainError);
  EXPECT_THROW(ceil_quotient(Value(BigInt(1) << 70), Value(BigInt(0)), kContext), DomainError);
  EXPECT_THROW(log_value(one, Value(int64_t{8}), kContext), DomainError);
  EXPECT_THROW(log_value(Value(int64_t{2}), zero, kContext), DomainError);
  EXPECT_THROW(power(zero, minus_one, kContext), DomainError);
  EXPECT_THROW(power(Value(int64_t{-8}), Value(Rational(1, 2)), kContext), DomainError);
  EXPECT_THROW(lg_value(Value(interval_between(-2, -1)), kContext), DomainError);
}

TEST(Value, HugePowersAreBudgetErrorsAndFailFast) {
  const auto start = std::chrono::steady_clock::now();
  Value exponent = power(Value(int64_t{2}), Value(int64_t{40}), kContext);
  EXPECT_THROW(power(Value(int64_t{2}), exponent, kContext), BudgetExceeded);  // 2^(2^40)
  EXPECT_THROW(power(Value(int64_t{3}), Value(int64_t{1} << 23), kContext), BudgetExceeded);
  EXPECT_THROW(power(Value(Rational(1, 3)), Value(int64_t{1} << 23), kContext), BudgetExceeded);
  // A product over the bits-per-value budget is refused before it is formed.
  NumericContext small_budget;
  small_budget.max_value_bits = 1000;
  Value wide = power(Value(int64_t{2}), Value(int64_t{600}), small_budget);
  EXPECT_THROW(mul(wide, wide, small_budget), BudgetExceeded);
  // Powers of 0, 1 and -1 are cheap whatever the exponent.
  EXPECT_EQ(power(Value(int64_t{1}), exponent, kContext).str(), "1");
  EXPECT_EQ(power(Value(int64_t{-1}), add(exponent, Value(int64_t{1}), kContext), kContext).str(),
            "-1");
  EXPECT_EQ(power(Value(int64_t{0}), exponent, kContext).str(), "0");
  double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  EXPECT_LT(seconds, 1.0);  // refused by estimate, not by trying
}

TEST(Value, StringsOfEachForm) {
  EXPECT_EQ(Value(int64_t{-12}).str(), "-12");
  EXPECT_EQ(Value(BigInt(1) << 70).str(), "1180591620717411303424");
  EXPECT_EQ(Value(Rational(-7, 2)).str(), "-7/2");
  EXPECT_EQ(Value(interval_between(1.5, 2.5)).str(), "[1.5, 2.5]");
}

TEST(Value, Log2MagnitudeHandlesHugeIntegers) {
  Value huge(BigInt(1) << 1000000);
  EXPECT_DOUBLE_EQ(huge.log2_magnitude(), 1000000.0);
  EXPECT_DOUBLE_EQ(Value(Rational(1, 1024)).log2_magnitude(), -10.0);
  EXPECT_EQ(Value(int64_t{0}).log2_magnitude(), -std::numeric_limits<double>::infinity());
  EXPECT_EQ(huge.magnitude_bits(), 1000001u);
}

TEST(Value, MinMaxAndSameExact) {
  Value a(Rational(1, 3));
  Value b(int64_t{1});
  EXPECT_EQ(min_value(a, b, kContext).str(), "1/3");
  EXPECT_EQ(max_value(a, b, kContext).str(), "1");
  EXPECT_TRUE(Value(BigInt(5)).same_exact(Value(int64_t{5})));
  EXPECT_FALSE(Value(interval_between(1, 1)).same_exact(Value(int64_t{1})));
}

}  // namespace
}  // namespace thetagate::engine
