// The double-precision shortcut used for ratio bands must never round a
// floor or ceiling the wrong way: where a double cannot be trusted it must
// say so (nullopt) and leave the value to exact evaluation.
#include "verifier/evaluation/approximate.h"

#include <gtest/gtest.h>

#include <bit>
#include <cmath>

#include "verifier/evaluation/expression_eval.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {
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
  EXPECT_FALSE(at("lg n", 0).has_value());         // domain
  EXPECT_FALSE(at("n", int64_t{1} << 50).has_value());
  EXPECT_FALSE(at("1/(n - 5)", 5).has_value());
}

TEST(Approximate, ClosesInOnIrrationalValues) {
  // std::log2 as the reference (standard library).
  EXPECT_NEAR(*at("n lg n", 1000), 1000 * std::log2(1000.0), 1e-9);
  EXPECT_NEAR(*at("n^(lg 7)", 12345), std::pow(12345.0, std::log2(7.0)), 1e-3);
  EXPECT_EQ(at("sqrt(n)", 1024), 32.0);
}

std::optional<double> log2_at(const char* text, const BigInt& n) {
  return approximate_log2(*parse_expression(SourceText::whole("<t>", text)), n);
}

// log2 of the exact (interval) value, by the evaluator's certified route.
double exact_log2(const char* text, const BigInt& n) {
  SourceText source = SourceText::whole("<t>", text);
  ExprPtr e = parse_expression(source);
  NumericContext ctx;
  ctx.precision_bits = 256;
  ctx.max_value_bits = 1u << 24;
  EvalScope scope;
  scope.source = &source;
  scope.ctx = &ctx;
  return evaluate_expr(*e, Value(n), scope).log2_magnitude();
}

TEST(ApproximateLog2, AgreesWithCertifiedEvaluationAtThousandsOfBits) {
  // The reference is the evaluator's exact or interval arithmetic (GMP and
  // MPFR); the log domain must agree to 1e-12 in log2, well inside the
  // checker's 1e-9 margin for exact re-checks.
  const char* shapes[] = {"n",
                          "n lg n",
                          "n lg^2 n",
                          "n^2 - n",
                          "n^(lg 7)",
                          "n/lg n",
                          "n lg lg n",
                          "sqrt(n) + 3",
                          "2n lg n - n",
                          "n lg n - 0.9139 n + 1",
                          "floor(n/2) + ceil(n/3)",
                          "max(n, n lg n)",
                          "log(3, n)^2 n",
                          "n^1.5/ln n"};
  for (int bits : {50, 64, 300, 1000, 4096}) {
    for (BigInt n :
         {BigInt(1) << (bits - 1), (BigInt(1) << bits) - 1, (BigInt(3) << (bits - 2)) + 7}) {
      for (const char* shape : shapes) {
        std::optional<double> approx = log2_at(shape, n);
        ASSERT_TRUE(approx.has_value()) << shape << " at " << bits << " bits";
        EXPECT_NEAR(*approx, exact_log2(shape, n), 1e-12 * std::max(1.0, *approx))
            << shape << " at " << bits << " bits";
      }
    }
  }
}

TEST(ApproximateLog2, AbstainsWhereDigitsAreLost) {
  const BigInt n = BigInt(1) << 1000;
  EXPECT_FALSE(log2_at("n - n", n).has_value());            // zero: no logarithm
  EXPECT_FALSE(log2_at("(n + 1) - n", n).has_value());      // cancellation
  EXPECT_FALSE(log2_at("n mod 3 + 1", n).has_value());      // needs the exact value
  EXPECT_FALSE(log2_at("T(n/2)", n).has_value());           // the recurrence itself
  EXPECT_FALSE(log2_at("-n", n).has_value());               // not positive
  EXPECT_FALSE(log2_at("floor(lg n)", n - 1).has_value());  // a small value near a whole number
  EXPECT_EQ(log2_at("lg n", n), std::log2(1000.0));
}

}  // namespace
}  // namespace thetagate::engine
