// The double-precision shortcut used for ratio bands must never round a
// floor or ceiling the wrong way: where a double cannot be trusted it must
// say so (nullopt) and leave the value to exact evaluation.
#include "verifier/approximate.h"

#include <gtest/gtest.h>

#include <bit>
#include <cmath>

#include "verifier/parser.h"

namespace thetagate {
namespace {

std::optional<double> at(const char* text, int64_t n) {
  return approximate(*parse_expression(SourceText::whole("<t>", text)), n);
}

TEST(Approximate, IntegerFloorsAndCeilingsAreExact) {
  for (int64_t n = 1; n < 2000; ++n) {
    ASSERT_EQ(at("floor(n/3)", n), static_cast<double>(n / 3)) << n;
    ASSERT_EQ(at("ceil(n/3)", n), static_cast<double>((n + 2) / 3)) << n;
    ASSERT_EQ(at("n mod 7", n), static_cast<double>(n % 7)) << n;
  }
}

TEST(Approximate, FloorOfLgAgreesWithBitWidthOrAbstains) {
  // floor(lg n) = bit_width(n) - 1 (standard library as reference).
  for (int k = 1; k < 50; ++k) {
    for (int64_t n : {(int64_t{1} << k) - 1, int64_t{1} << k, (int64_t{1} << k) + 1}) {
      std::optional<double> v = at("floor(lg n)", n);
      if (v) {
        EXPECT_EQ(*v, static_cast<double>(std::bit_width(static_cast<uint64_t>(n)) - 1)) << n;
      }
    }
  }
  // 2^49 - 1 is within 1e-14 of a power of two: a double must abstain.
  EXPECT_FALSE(at("floor(lg n)", (int64_t{1} << 49) - 1).has_value());
  EXPECT_EQ(at("floor(lg n)", int64_t{1} << 49), 49.0);
}

TEST(Approximate, AbstainsOutsideItsReach) {
  EXPECT_FALSE(at("T(n/2) + n", 10).has_value());  // the recurrence itself
  EXPECT_FALSE(at("lg n", 0).has_value());          // domain
  EXPECT_FALSE(at("n", int64_t{1} << 50).has_value());
  EXPECT_FALSE(at("1/(n - 5)", 5).has_value());
}

TEST(Approximate, ClosesInOnIrrationalValues) {
  // std::log2 as the reference (standard library).
  EXPECT_NEAR(*at("n lg n", 1000), 1000 * std::log2(1000.0), 1e-9);
  EXPECT_NEAR(*at("n^(lg 7)", 12345), std::pow(12345.0, std::log2(7.0)), 1e-3);
  EXPECT_EQ(at("sqrt(n)", 1024), 32.0);
}

}  // namespace
}  // namespace thetagate
