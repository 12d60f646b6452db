// The recurrence's shape (verifier/derivation/shape.h) read off recurrences
// written in the claim language: the terms each theorem needs, the driving
// function, the base cases, and the reason when no shape fits.
#include "verifier/derivation/shape.h"

#include <gtest/gtest.h>
#include <rapidcheck/gtest.h>

#include <string>

#include "verifier/model/recurrence.h"

namespace thetagate::engine {
namespace {

// The recurrence stays alive with the shape: base_cases point into it.
struct Read {
  std::shared_ptr<const Recurrence> recurrence;
  Shape shape;
};

Read read(const std::string& text) {
  Read r;
  r.recurrence = recurrence_from_text(text);
  r.shape = extract_shape(*r.recurrence);
  return r;
}

TEST(Shape, DivideAndConquerTermsAndDriver) {
  // The master theorem's form a T(n/b) + f(n) (Bentley, Haken & Saxe 1980),
  // n/2 read as a floor: a bounded perturbation (Leighton 1996).
  Read r = read("T(n) = 2T(n/2) + n; T(1) = 1");
  const Shape& s = r.shape;
  ASSERT_TRUE(s.ok) << s.reason;
  ASSERT_EQ(s.scaled.size(), 1u);
  EXPECT_EQ(s.scaled[0].a, Rational(2));
  EXPECT_EQ(s.scaled[0].b, Rational(1, 2));
  EXPECT_EQ(s.scaled[0].perturbation, Perturbation::kBounded);
  EXPECT_TRUE(s.subtractive.empty());
  EXPECT_TRUE(s.roots.empty());
  ASSERT_TRUE(s.driving);
  EXPECT_EQ(print(*s.driving), "n");
  ASSERT_EQ(s.base_cases.size(), 1u);
  EXPECT_FALSE(s.has_driving_cases());
}

TEST(Shape, MergeSortHasTwoHalvesAndItsDriver) {
  // Suchenek 2017: W(n) = W(ceil(n/2)) + W(floor(n/2)) + n - 1.
  Read r = read("T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0");
  const Shape& s = r.shape;
  ASSERT_TRUE(s.ok) << s.reason;
  ASSERT_EQ(s.scaled.size(), 2u);
  for (const ScaledTerm& t : s.scaled) {
    EXPECT_EQ(t.a, Rational(1));
    EXPECT_EQ(t.b, Rational(1, 2));
    EXPECT_EQ(t.perturbation, Perturbation::kBounded);
  }
  EXPECT_EQ(s.scaled[0].argument, "ceil(n/2)");
  ASSERT_TRUE(s.driving);
  EXPECT_EQ(print(*s.driving), "n - 1");
}

TEST(Shape, ExactArgumentHasNoPerturbationAndAGrowingOneItsClass) {
  // Leighton 1996: h(n) = O(n / lg^2 n) perturbations; sqrt(n) is one.
  Read exact = read("T(n) = 4T(n/4) + n; T(1) = 1");
  ASSERT_TRUE(exact.shape.ok);
  // n/4 inside T is read as its floor, so even the plain quotient is bounded.
  EXPECT_EQ(exact.shape.scaled[0].perturbation, Perturbation::kBounded);
  Read shifted = read("T(n) = 2T(floor(n/2) + 6) + n; T(1) = 1");
  ASSERT_TRUE(shifted.shape.ok) << shifted.shape.reason;
  EXPECT_EQ(shifted.shape.scaled[0].perturbation, Perturbation::kBounded);
  Read growing = read("T(n) = 2T(floor(n/2 + sqrt(n))) + n; T(1) = 1; T(2) = 1; T(3) = 1");
  ASSERT_TRUE(growing.shape.ok) << growing.shape.reason;
  const ScaledTerm& t = growing.shape.scaled[0];
  EXPECT_EQ(t.perturbation, Perturbation::kGrowing);
  ASSERT_TRUE(t.perturbation_growth.has_value());
  EXPECT_EQ(compare(*t.perturbation_growth, GrowthClass::polylog(RealNumber(Rational(1, 2)))), 0);
}

TEST(Shape, SubtractiveAndRootTerms) {
  // Subtract-and-conquer a T(n - b) (docs/sources.md, common practice) and
  // the change of variables T(n^(1/k)) (calc in docs/sources.md).
  Read fib = read("T(n) = T(n - 1) + T(n - 2) + 1; T(1) = 1; T(0) = 1");
  ASSERT_TRUE(fib.shape.ok) << fib.shape.reason;
  ASSERT_EQ(fib.shape.subtractive.size(), 2u);
  EXPECT_EQ(fib.shape.subtractive[0].c, BigInt(1));
  EXPECT_EQ(fib.shape.subtractive[1].c, BigInt(2));
  EXPECT_TRUE(fib.shape.scaled.empty());

  Read root = read("T(n) = 2T(sqrt(n)) + lg n; T(2) = 1; T(1) = 1; T(3) = 1");
  ASSERT_TRUE(root.shape.ok) << root.shape.reason;
  ASSERT_EQ(root.shape.roots.size(), 1u);
  EXPECT_EQ(root.shape.roots[0].a, Rational(2));
  EXPECT_EQ(root.shape.roots[0].k, 2u);
  EXPECT_FALSE(root.shape.roots[0].rounded);
  Read cube = read("T(n) = T(floor(n^(1/3))) + 1; T(1) = 1; T(2) = 1; T(3) = 1");
  ASSERT_TRUE(cube.shape.ok) << cube.shape.reason;
  ASSERT_EQ(cube.shape.roots.size(), 1u);
  EXPECT_EQ(cube.shape.roots[0].k, 3u);
  EXPECT_TRUE(cube.shape.roots[0].rounded);
}

TEST(Shape, CaseLinesMayListTheirRootTermsInAnyOrder) {
  Read r = read(
      "T(n) = T(sqrt(n)) + 2T(n^(1/3)) + 1 if n even\n"
      "T(n) = 2T(n^(1/3)) + T(sqrt(n)) + n otherwise\n"
      "T(1) = 1; T(2) = 1; T(3) = 1; T(4) = 1; T(5) = 1; T(6) = 1; T(7) = 1");
  ASSERT_TRUE(r.shape.ok) << r.shape.reason;
  EXPECT_EQ(r.shape.roots.size(), 2u);
  // Different coefficients are still a different recursion.
  Read other = read(
      "T(n) = T(sqrt(n)) + 2T(n^(1/3)) + 1 if n even\n"
      "T(n) = T(n^(1/3)) + 2T(sqrt(n)) + n otherwise\n"
      "T(1) = 1; T(2) = 1; T(3) = 1; T(4) = 1; T(5) = 1; T(6) = 1; T(7) = 1");
  EXPECT_FALSE(other.shape.ok);
}

TEST(Shape, SumOverEarlierValuesKeepsItsFactor) {
  // Quicksort's average (Knuth, TAOCP vol. 3, §5.2.2):
  // T(n) = n - 1 + (2/n) sum_{k<n} T(k).
  Read r = read("T(n) = n - 1 + (2/n) * sum(k, 0, n - 1, T(k)); T(0) = 0");
  ASSERT_TRUE(r.shape.ok) << r.shape.reason;
  ASSERT_EQ(r.shape.sums.size(), 1u);
  EXPECT_EQ(r.shape.sums[0].scale, Rational(2));
  EXPECT_EQ(r.shape.sums[0].n_power, -1);
  ASSERT_TRUE(r.shape.driving);
  EXPECT_EQ(print(*r.shape.driving), "n - 1");
}

TEST(Shape, CaseLinesThatDifferOnlyInTheDriverBecomeDrivingCases) {
  Read r = read("T(n) = 2T(n/2) + n if n even; T(n) = 2T(n/2) + n^2 otherwise; T(1) = 1");
  ASSERT_TRUE(r.shape.ok) << r.shape.reason;
  EXPECT_FALSE(r.shape.driving);
  ASSERT_TRUE(r.shape.has_driving_cases());
  ASSERT_EQ(r.shape.driving_cases.size(), 2u);
  EXPECT_EQ(r.shape.driving_cases[0].condition, "n even");
  EXPECT_EQ(print(*r.shape.driving_cases[0].f), "n");
  EXPECT_EQ(r.shape.driving_cases[1].condition, "otherwise");
  EXPECT_EQ(print(*r.shape.driving_cases[1].f), "n^2");
  EXPECT_FALSE(r.shape.driving_cases[1].test);
}

TEST(Shape, NoShapeFitsAndTheReasonSaysWhy) {
  const std::pair<const char*, const char*> cases[] = {
      {"T(n) = 2T(n/2) + 1 if n even; T(n) = T(n - 1) + 1 otherwise; T(1) = 1",
       "the case lines differ in their recursive part"},
      {"T(n) = T(floor(n/2)) * T(floor(n/2)) + 1; T(1) = 1", "multiplies two T terms"},
      {"T(n) = n * T(floor(n/2)) + 1; T(1) = 1", "depends on n (a factor n^1)"},
      {"T(n) = 2^T(floor(n/2)); T(1) = 1", "the recurrence is not linear in T"},
      // b = 1/2 + 2/3 = 7/6 (calc): the argument grows.
      {"T(n) = T(floor(n/2) + floor(2n/3)) + 1; T(1) = 1; T(2) = 1; T(3) = 1", "with 0 < b < 1"},
      // sqrt(n) sqrt(n) is of order n: not a perturbation h = o(n).
      {"T(n) = T(floor(n/2 + sqrt(n) * sqrt(n)/3)) + 1; T(1) = 1; T(2) = 1; T(3) = 1",
       "with h = o(n)"},
  };
  for (const auto& [text, why] : cases) {
    Read r = read(text);
    EXPECT_FALSE(r.shape.ok) << text;
    EXPECT_NE(r.shape.reason.find(why), std::string::npos) << text << "\n" << r.shape.reason;
  }
}

// a T(op(n / b)) + n^k for op in {floor, ceil, none}: one scaled term with
// exactly that a and 1/b, a bounded perturbation, and f as written (the
// master theorem's form, Bentley, Haken & Saxe 1980).
RC_GTEST_PROP(ShapeProperty, MasterFormIsReadBack, ()) {
  const int a = *rc::gen::inRange(1, 10);
  const int b = *rc::gen::inRange(2, 9);
  const int k = *rc::gen::inRange(0, 4);
  const int op = *rc::gen::inRange(0, 3);
  std::string q = "n/" + std::to_string(b);
  std::string arg = op == 0 ? "floor(" + q + ")" : op == 1 ? "ceil(" + q + ")" : q;
  std::string text =
      "T(n) = " + std::to_string(a) + "T(" + arg + ") + n^" + std::to_string(k) + "; T(1) = 1";
  Read r = read(text);
  RC_ASSERT(r.shape.ok);
  RC_ASSERT(r.shape.scaled.size() == 1u);
  RC_ASSERT(r.shape.scaled[0].a == Rational(a));
  RC_ASSERT(r.shape.scaled[0].b == Rational(1, b));
  RC_ASSERT(r.shape.scaled[0].perturbation == Perturbation::kBounded);
  RC_ASSERT(r.shape.driving != nullptr);
  RC_ASSERT(print(*r.shape.driving) == "n^" + std::to_string(k));
}

}  // namespace
}  // namespace thetagate::engine
