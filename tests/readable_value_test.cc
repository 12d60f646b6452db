// Witness values a person reads (issue 17, §1): an exact fraction reads as
// its decimal approximation first, then the fraction or its size. The
// approximation is checked against the standard library's long double
// division and printf rounding (%.6g).
#include <gtest/gtest.h>

#include <cstdio>
#include <string>

#include "reports/number_text.h"

namespace thetagate::engine {
namespace {

std::string printf_6g(long double x) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, "%.6Lg", x);
  return buffer;
}

TEST(ReadableValue, SixSignificantDigitsAsPrintfRoundsThem) {
  const std::pair<long, long> cases[] = {{48723, 8},        {1, 3},     {-1, 8},  {2, 3},
                                         {999999, 1},       {1, 70000}, {31, 21}, {100, 63},
                                         {123456789, 1000}, {5, 1},     {-22, 7}, {1, 1000000}};
  for (const auto& [p, q] : cases) {
    std::string expected = printf_6g(static_cast<long double>(p) / q);
    // printf writes e+06 and e-05 as we do; the two agree digit for digit.
    EXPECT_EQ(approximate_fraction(p, q), expected) << p << "/" << q;
  }
}

TEST(ReadableValue, HugeFractionsKeepTheirExponent) {
  BigInt p = boost::multiprecision::pow(BigInt(10), 60) * 3;  // 3e60
  BigInt q = boost::multiprecision::pow(BigInt(10), 20) * 7;  // 7e20
  EXPECT_EQ(approximate_fraction(p, q), printf_6g(3.0L / 7.0L * 1e40L));
  EXPECT_EQ(approximate_fraction(q, p), printf_6g(7.0L / 3.0L * 1e-40L));
}

TEST(ReadableValue, FractionsReadApproximateFirst) {
  EXPECT_EQ(readable_value("48723/8"), "≈ 6090.38 (= 48723/8)");
  EXPECT_EQ(readable_value("159"), "159");
  EXPECT_EQ(readable_value("[1, 2]"), "[1, 2]");
  std::string big = std::string(40, '7') + "/" + std::string(21, '3');
  EXPECT_EQ(readable_value(big), "≈ 2.33333e+19 (exact: a fraction of 40 and 21 digits)");
}

}  // namespace
}  // namespace thetagate::engine
