// The precision ladder (verifier/evaluation/precision.h): a computation that
// intervals cannot settle is redone at doubled precision until it decides
// or the ladder ends, and the outcome says which.
#include "verifier/evaluation/precision.h"

#include <gmp.h>
#include <gtest/gtest.h>

#include <stdexcept>
#include <string>

#include "tests/support/test_support.h"

namespace thetagate::engine {
namespace {

using test_support::Mpz;

// floor(sqrt(2) * 10^60) through intervals: sqrt(2) * 10^60 is about 2^200,
// so a 128-bit interval is about 2^72 wide and its floor is not settled.
Value floor_sqrt2_times_ten_to_60(const NumericContext& ctx) {
  Value ten_to_60 = power(Value(int64_t{10}), Value(int64_t{60}), ctx);
  return floor_value(mul(sqrt_value(Value(int64_t{2}), ctx), ten_to_60, ctx));
}

TEST(PrecisionLadder, AFloorTooWideAtTheStartIsDecidedOneRungHigherAndMatchesGmp) {
  NumericContext ctx;
  ctx.precision_bits = 128;
  int raises = 0;
  PrecisionOutcome<Value> outcome = run_at_increasing_precision(
      ctx, 1 << 16, [&] { return floor_sqrt2_times_ten_to_60(ctx); }, [&] { ++raises; });
  ASSERT_TRUE(outcome.decided());
  // 200 bits of magnitude need more than 128 bits of precision but fit in
  // 256: exactly one raise.
  EXPECT_EQ(raises, 1);
  EXPECT_EQ(outcome.bits, 256);
  EXPECT_EQ(ctx.precision_bits, 256);
  // Reference: GMP's exact integer square root, floor(sqrt(2 * 10^120)) =
  // floor(sqrt(2) * 10^60) (GMP manual, "Integer Roots", mpz_sqrt).
  Mpz square("2" + std::string(120, '0'));
  Mpz root;
  mpz_sqrt(root.get(), square.get());
  EXPECT_EQ(outcome.value->str(), root.str());
}

TEST(PrecisionLadder, EqualIrrationalSidesAreUndecidedAtTheTopNeverGuessed) {
  // sqrt(2) * sqrt(2) against 2: every interval around the product holds 2,
  // so no precision separates them (common practice: interval arithmetic
  // cannot prove an equality).
  NumericContext ctx;
  ctx.precision_bits = 64;
  int raises = 0;
  PrecisionOutcome<int> outcome = run_at_increasing_precision(
      ctx, 1024,
      [&] {
        Value root = sqrt_value(Value(int64_t{2}), ctx);
        return compare(mul(root, root, ctx), Value(int64_t{2}), ctx);
      },
      [&] { ++raises; });
  EXPECT_FALSE(outcome.decided());
  // 64 -> 128 -> 256 -> 512 -> 1024; doubling 1024 would pass the top.
  EXPECT_EQ(raises, 4);
  EXPECT_EQ(outcome.bits, 1024);
  EXPECT_EQ(outcome.shortfall, "a comparison of overlapping intervals");
}

TEST(PrecisionLadder, ExactWorkDecidesAtTheStartWithoutARaise) {
  NumericContext ctx;
  ctx.precision_bits = 128;
  int raises = 0;
  // 3^100 is exact: intervals never enter. Reference: GMP's mpz_ui_pow_ui.
  PrecisionOutcome<Value> outcome = run_at_increasing_precision(
      ctx, 1 << 16, [&] { return power(Value(int64_t{3}), Value(int64_t{100}), ctx); },
      [&] { ++raises; });
  ASSERT_TRUE(outcome.decided());
  EXPECT_EQ(raises, 0);
  EXPECT_EQ(outcome.bits, 128);
  Mpz expected;
  mpz_ui_pow_ui(expected.get(), 3, 100);
  EXPECT_EQ(outcome.value->str(), expected.str());
}

TEST(PrecisionLadder, OtherErrorsPassThroughAtTheirPrecision) {
  NumericContext ctx;
  ctx.precision_bits = 128;
  int raises = 0;
  auto divide_by_zero = [&] { return div(Value(int64_t{1}), Value(int64_t{0}), ctx); };
  EXPECT_THROW(run_at_increasing_precision(ctx, 1 << 16, divide_by_zero, [&] { ++raises; }),
               DomainError);
  EXPECT_EQ(raises, 0);
  EXPECT_EQ(ctx.precision_bits, 128);
}

}  // namespace
}  // namespace thetagate::engine
