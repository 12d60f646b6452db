// Growth classes, exact real exponents and the classifier.
#include "verifier/derivation/growth.h"

#include <gtest/gtest.h>

#include "verifier/derivation/classify.h"
#include "verifier/numbers/real_number.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {
namespace {

ExprPtr expr(const std::string& text) {
  return parse_expression(SourceText::whole("<test>", text));
}

Classification classified(const std::string& text) { return classify(*expr(text)); }

std::string class_text(const std::string& text) {
  Classification c = classified(text);
  return c ? to_string(*c.growth) : "refused: " + c.reason;
}

TEST(GrowthRealNumber, LogSevenIsNotADecimal) {
  RealNumber lg7 = RealNumber::log(2, 7);
  // Calc: 7^1000 > 2^2807, so lg 7 > 2.807; and 7^10000 < 2^28074.
  EXPECT_GT(compare(lg7, RealNumber(Rational(2807, 1000))), 0);
  EXPECT_LT(compare(lg7, RealNumber(Rational(28074, 10000))), 0);
  EXPECT_NE(lg7, RealNumber(Rational(2807, 1000)));
  EXPECT_EQ(lg7.str(), "lg 7");
  EXPECT_EQ(lg7.digits(), "2.807355…");  // calc: lg 7 = 2.8073549...
}

TEST(GrowthRealNumber, LogarithmsAreCanonical) {
  EXPECT_EQ(RealNumber::log(4, 49), RealNumber::log(2, 7));  // log_4 49 = lg 7
  EXPECT_EQ(RealNumber::log(8, 4), RealNumber(Rational(2, 3)));
  EXPECT_TRUE(RealNumber::log(8, 4).is_rational());
  EXPECT_EQ(RealNumber::log(3, 5).str(), "log(3, 5)");
  EXPECT_EQ((RealNumber::log(2, 7) - RealNumber(2L)).str(), "lg 7 - 2");
  EXPECT_LT(RealNumber::log(3, 5), RealNumber::log(2, 3));  // 1.4650 < 1.5850 (calc)
}

TEST(GrowthRealNumber, RationalRootsOfReduciblePolynomialsPrintAsFractions) {
  // (3x - 50)(x^2 - 2) and (1000003x - 7)(x^2 - x - 1): the rational root is
  // found whatever its place in the interval and the size of its denominator.
  Polynomial a =
      Polynomial({Rational(-50), Rational(3)}) * Polynomial({Rational(-2), 0, Rational(1)});
  EXPECT_EQ(RealNumber::algebraic(a, 10, 100).str(), "50/3");
  Polynomial b = Polynomial({Rational(-7), Rational(1000003)}) *
                 Polynomial({Rational(-1), Rational(-1), Rational(1)});
  EXPECT_EQ(RealNumber::algebraic(b, 0, Rational(1, 2)).str(), "7/1000003");
  // The irrational root of the same polynomial stays algebraic.
  RealNumber root2 = RealNumber::algebraic(a, 1, 2);
  EXPECT_FALSE(root2.is_rational());
  EXPECT_EQ(root2.digits(), "1.414214…");
}

TEST(GrowthRealNumber, GoldenRatioIsExact) {
  RealNumber phi =
      RealNumber::algebraic(Polynomial({Rational(-1), Rational(-1), Rational(1)}), 1, 2);
  auto written = constant_value(*expr("(1 + sqrt(5))/2"));
  ASSERT_TRUE(written);
  EXPECT_EQ(compare(phi, *written), 0);
  EXPECT_EQ(phi.str(), "(1 + sqrt(5))/2");
  EXPECT_EQ(phi.digits(), "1.618034…");
  EXPECT_GT(phi, RealNumber(Rational(1618033, 1000000)));
  EXPECT_LT(phi, RealNumber(Rational(1618034, 1000000)));
}

TEST(GrowthRealNumber, RootsOfRationals) {
  EXPECT_EQ(RealNumber::root(8, 3), RealNumber(2L));
  EXPECT_EQ(RealNumber::root(2, 3).str(), "2^(1/3)");
  EXPECT_GT(RealNumber::root(2, 2), RealNumber(Rational(14142, 10000)));
}

// A fuzzed bound (2^555.5455^55.4555^5.54…) took the root of degree 50 of
// a 9,000-bit number through a bisection from (0, q + 1) in search of a
// rational root, for minutes. Such a root is irrational (q is not a 50th
// power) and is bracketed by integer roots at once.
TEST(GrowthRealNumber, ARootOfDegreeFiftyOfAHugeNumberIsQuick) {
  Rational q = Rational(boost::multiprecision::pow(BigInt(10), 2700) + 7);
  RealNumber r = RealNumber::root(q, 50);
  EXPECT_EQ(r.kind(), RealNumber::Kind::kAlgebraic);
  // 10^54 < (10^2700 + 7)^(1/50) < 10^54 + 1 (from the binomial theorem).
  Rational ten54 = Rational(boost::multiprecision::pow(BigInt(10), 54));
  EXPECT_GT(r, RealNumber(ten54));
  EXPECT_LT(r, RealNumber(ten54 + 1));
}

// The derive fuzzer's ten-minute run: a product of such roots searched its
// resultant (coefficients of thousands of bits) for a rational root by
// bisection for 100 s. The search is skipped where it would be slow; the
// product stays exact as an algebraic number.
TEST(GrowthRealNumber, AProductOfRootsOfHugeNumbersIsQuick) {
  Rational a = Rational(boost::multiprecision::pow(BigInt(10), 75) + 1);
  Rational b = Rational(boost::multiprecision::pow(BigInt(10), 150) + 3);
  RealNumber product = RealNumber::root(a, 2) * RealNumber::root(b, 3);
  // sqrt(10^75) * cbrt(10^150) = 10^87.5, and both factors are a little above.
  Rational low = Rational(boost::multiprecision::pow(BigInt(10), 87)) * 3;
  EXPECT_GT(product, RealNumber(low));
  EXPECT_LT(product, RealNumber(low * 2));
}

TEST(GrowthClassOrder, LexicographicOnRhoAlphaBetaGamma) {
  GrowthClass n_lg_n = GrowthClass::polylog(1, 1);
  GrowthClass n_lglg = GrowthClass::polylog(1, 0, 1);
  EXPECT_LT(compare(n_lglg, n_lg_n), 0);
  EXPECT_GT(compare(GrowthClass::polylog(RealNumber::log(2, 7)),
                    GrowthClass::polylog(Rational(2807, 1000))),
            0);
  EXPECT_GT(compare(GrowthClass::exponential(Rational(11, 10)), GrowthClass::polylog(100, 5)), 0);
}

TEST(GrowthPrinter, TradeNotation) {
  EXPECT_EQ(to_string(GrowthClass::polylog(1, 1)), "n lg n");
  EXPECT_EQ(to_string(GrowthClass::polylog(RealNumber::log(2, 7))), "n^(lg 7)");
  EXPECT_EQ(to_string(GrowthClass::polylog(1, -2)), "n/lg^2 n");
  EXPECT_EQ(to_string(GrowthClass::polylog(0, 1, 1)), "lg n lg lg n");
  EXPECT_EQ(to_string(GrowthClass::polylog(-1, 1)), "lg n/n");
  EXPECT_EQ(to_string(GrowthClass::constant()), "1");
  EXPECT_EQ(to_string(GrowthClass::polylog(Rational(3, 2))), "n^(3/2)");
  EXPECT_EQ(to_string(GrowthClass::exponential(2).times(GrowthClass::polylog(2))), "2^n n^2");
}

TEST(GrowthClassify, SumsKeepTheDominantTerm) {
  Classification c = classified("3n^2 + n lg n + 7");
  ASSERT_TRUE(c);
  EXPECT_EQ(to_string(*c.growth), "n^2");
  EXPECT_EQ(c.coefficient, RealNumber(3L));
  EXPECT_EQ(class_text("(n+1)^2 - n^2"), "n");  // exactly 2n + 1
  EXPECT_EQ(classified("(n+1)^2 - n^2").coefficient, RealNumber(2L));
}

TEST(GrowthClassify, NormalForms) {
  EXPECT_EQ(class_text("n/lg n"), "n/lg n");
  EXPECT_EQ(class_text("n/lg^2 n"), "n/lg^2 n");
  EXPECT_EQ(class_text("1/lg n"), "1/lg n");
  EXPECT_EQ(class_text("n^(lg 7)"), "n^(lg 7)");
  EXPECT_EQ(class_text("sqrt(n) lg n"), "n^(1/2) lg n");
  EXPECT_EQ(class_text("2^n n^2"), "2^n n^2");
  EXPECT_EQ(class_text("2^(lg n)"), "n");
  EXPECT_EQ(class_text("3^(lg n)"), "n^(lg 3)");
  EXPECT_EQ(class_text("log(4, n^2)"), "lg n");
  EXPECT_EQ(class_text("ln n"), "lg n");
  EXPECT_EQ(class_text("lg lg n"), "lg lg n");
  EXPECT_EQ(class_text("floor(n/2) + ceil(sqrt(n))"), "n");
  EXPECT_EQ(class_text("max(n, n^2/lg n)"), "n^2/lg n");
  EXPECT_EQ(class_text("min(n, n^2)"), "n");
  EXPECT_EQ(class_text("((1+sqrt(5))/2)^n"), "((1 + sqrt(5))/2)^n");
  EXPECT_EQ(class_text("lg(n^3 + n)"), "lg n");
  EXPECT_EQ(class_text("n lg(2n)"), "n lg n");
}

TEST(GrowthClassify, RefusesWithAReason) {
  EXPECT_NE(classified("n mod 3").reason.find("oscillates"), std::string::npos);
  EXPECT_NE(classified("n^2 - n^3").reason.find("negative"), std::string::npos);
  EXPECT_NE(classified("(-1)^n n").reason.find("alternates"), std::string::npos);
  EXPECT_NE(classified("2^sqrt(n)").reason.find("between polynomial and exponential"),
            std::string::npos);
  EXPECT_NE(classified("sqrt(n+1) - sqrt(n)").reason.find("cancel"), std::string::npos);
  EXPECT_NE(classified("n^n").reason.find("base and exponent"), std::string::npos);
  EXPECT_TRUE(classified("n - n").zero);
}

}  // namespace
}  // namespace thetagate::engine
