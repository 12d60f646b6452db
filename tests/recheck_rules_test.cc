// The independent re-checker's rules on certificates written by hand
// (issue 20): true certificates are re-checked, and certificates with one
// wrong number, a wrong case, a modulus too small for the floors or a
// constant loosened past the truth are rejected, never accepted.
#include <gtest/gtest.h>

#include <string>

#include "tests/support/recheck_rule_test.h"
#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"
#include "verifier/recheck/expansion.h"
#include "verifier/recheck/rules.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine::recheck {
namespace {

// The certificate against the claim written as text.
constexpr auto* run = &test_support::run_rule;

CertificateData divide(const std::string& proof, const std::string& g, const std::string& low,
                       const std::string& high, const std::string& from = "64") {
  CertificateData c;
  c.method = "divide";
  c.proof = proof;
  c.driver_class = g;
  c.driver_low = low;
  c.driver_high = high;
  c.driver_from = from;
  return c;
}

CertificateData induction(const std::string& hypothesis, const std::string& m,
                          const std::string& modulus, std::vector<std::string> sides = {"upper"}) {
  CertificateData c;
  c.method = "induction";
  c.proof = "induction";
  c.sides = std::move(sides);
  c.hypothesis = hypothesis;
  c.checked_to = m;
  c.modulus = modulus;
  return c;
}

// --- The expansions -------------------------------------------------------

Expansion of(const std::string& text, uint64_t modulus = 1, uint64_t residue = 0,
             BigInt from = 64) {
  return expand(*parse_expression(SourceText::whole("<e>", text)),
                Context{from, modulus, residue, nullptr});
}

TEST(RecheckExpansion, MergeSortSlackCancelsExactly) {
  // n lg n - 2 (n/2) lg(n/2) = n: the leading terms cancel in exact rationals.
  Expansion e = add(of("n*lg(n)"), negate(of("2*(n/2)*lg(n/2)")));
  ASSERT_EQ(e.terms.size(), 1u) << describe(e);
  EXPECT_EQ(prove_nonnegative(e, 64).proof, Proof::kProved);
  EXPECT_EQ(prove_nonnegative(negate(e), 64).proof, Proof::kFalse);
}

TEST(RecheckExpansion, PowersOfLogThreeCancelExactly) {
  // 3 (n/2)^(lg 3) = n^(lg 3): (1/2)^(lg 3) = 1/3 exactly (common practice).
  Expansion e = add(of("n^lg(3)"), negate(of("3*(n/2)^lg(3)")));
  EXPECT_TRUE(e.terms.empty()) << describe(e);
}

TEST(RecheckExpansion, FloorsAreExactOnAResidueClass) {
  // floor(n/2) + ceil(n/2) = n on both classes mod 2.
  for (uint64_t r = 0; r < 2; ++r) {
    Expansion e = add(of("floor(n/2) + ceil(n/2)", 2, r), negate(of("n", 2, r)));
    EXPECT_TRUE(e.terms.empty()) << r << ": " << describe(e);
  }
}

TEST(RecheckExpansion, ARemainderKeepsTheEnclosureHonest) {
  // lg(n + 1) - lg n lies in (0, 1/(n ln 2)]: positive, and below 1/n·2.
  Expansion gap = add(of("lg(n + 1)"), negate(of("lg(n)")));
  EXPECT_EQ(prove_nonnegative(gap, 64).proof, Proof::kProved) << describe(gap);
  Expansion above = add(of("2/n"), negate(gap));
  EXPECT_EQ(prove_nonnegative(above, 64).proof, Proof::kProved) << describe(above);
  // ... but not below 1/(2n): 1/(n ln 2) > 1/(2n).
  Expansion below = add(of("1/(2*n)"), negate(gap));
  EXPECT_EQ(prove_nonnegative(below, 64).proof, Proof::kFalse);
}

TEST(RecheckExpansion, ANegativeDipIsFoundBetweenTheStartAndTheTail) {
  // n^2 - 100 n lg n + 1 is negative for n around 64..1000 and positive beyond.
  Expansion e = of("n^2 - 100*n*lg(n) + 1");
  ProofOutcome dip = prove_nonnegative(e, 64);
  EXPECT_EQ(dip.proof, Proof::kFalse);
  EXPECT_NE(dip.why.find("negative at n = 64"), std::string::npos) << dip.why;
  EXPECT_EQ(prove_nonnegative(e, 2048).proof, Proof::kProved);
}

TEST(RecheckExpansion, AnUndecidedSignIsNotAFalsehood) {
  // lg 3 - lg 3 in intervals straddles zero: not proved, and not false either.
  Expansion e = add(scale(of("n"), Coef::of(Interval(Rational(3), kPrecision).log2())),
                    negate(scale(of("n"), Coef::of(Interval(Rational(3), kPrecision).log2()))));
  EXPECT_EQ(prove_nonnegative(e, 64).proof, Proof::kUnproved) << describe(e);
}

// --- Divide-and-conquer (Akra–Bazzi with Leighton's conditions) -----------

// orchard::merge_rows merges two sorted halves: n - 1 comparisons.
const char* kMerge = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1\nT(1) = 0";

TEST(RecheckDivide, MergeOfTwoHalvesIsThetaNLgN) {
  EXPECT_RECHECKED(run(kMerge, "Theta(n lg n)", divide("master theorem, case 2", "n", "1/2", "1")));
  EXPECT_RECHECKED(run(kMerge, "O(n^2)", divide("master theorem, case 2", "n", "1/2", "1")));
}

TEST(RecheckDivide, AClaimTheTheoremDoesNotGiveIsRejected) {
  EXPECT_REJECTED(run(kMerge, "Theta(n)", divide("master theorem, case 2", "n", "1/2", "1")),
                  "does not establish");
  EXPECT_REJECTED(run(kMerge, "O(n)", divide("master theorem, case 2", "n", "1/2", "1")),
                  "does not establish");
}

TEST(RecheckDivide, DriverConstantsPastTheTruthAreRejected) {
  // n - 1 >= (1/2) n holds; n - 1 >= n does not, and n - 1 <= (1/2) n does not.
  EXPECT_REJECTED(run(kMerge, "Theta(n lg n)", divide("master theorem, case 2", "n", "1", "2")),
                  "f(n) >= 1 g(n)");
  EXPECT_REJECTED(run(kMerge, "Theta(n lg n)", divide("master theorem, case 2", "n", "1/4", "1/2")),
                  "f(n) <= 1/2 g(n)");
  // A driver class from another class entirely.
  EXPECT_REJECTED(run(kMerge, "Theta(n lg n)", divide("master theorem, case 2", "n^2", "1/4", "4")),
                  "f(n) >= 1/4 g(n)");
}

TEST(RecheckDivide, ASwappedCaseIsRejected) {
  EXPECT_REJECTED(run(kMerge, "Theta(n lg n)", divide("master theorem, case 1", "n", "1/2", "1")),
                  "names case 1");
  EXPECT_REJECTED(run(kMerge, "Theta(n lg n)", divide("master theorem, case 3", "n", "1/2", "1")),
                  "names case 3");
}

TEST(RecheckDivide, TheThreeCasesAndThePolylogExtension) {
  // orchard::grid_split: five half-size subproblems and n^2 work: case 1, n^(lg 5).
  EXPECT_RECHECKED(run("T(n) = 5T(n/2) + n^2\nT(1) = 1", "Theta(n^(lg 5))",
                       divide("master theorem, case 1", "n^2", "1", "1")));
  // Seven quarter-size subproblems: log_4 7 < 2, so n^2 work is case 3.
  EXPECT_RECHECKED(run("T(n) = 7T(n/4) + n^2\nT(n) = 1 if n < 4", "Theta(n^2)",
                       divide("master theorem, case 3", "n^2", "1", "1")));
  EXPECT_REJECTED(run("T(n) = 7T(n/4) + n^2\nT(n) = 1 if n < 4", "Theta(n^(log(4, 7)))",
                      divide("master theorem, case 1", "n^2", "1", "1")),
                  "names case 1");
  // Case 3: T(n) = 2T(n/2) + n^2 is Θ(n^2).
  EXPECT_RECHECKED(run("T(n) = 2T(n/2) + n^2\nT(1) = 1", "Theta(n^2)",
                       divide("master theorem, case 3", "n^2", "1", "1")));
  // Polylog extension: 2T(n/2) + n lg n is Θ(n lg^2 n).
  EXPECT_RECHECKED(
      run("T(n) = 2T(n/2) + n*lg(n)\nT(1) = 1", "Theta(n lg^2 n)",
          divide("master theorem, case 2 (polylog extension, k > -1)", "n*lg(n)", "1", "1")));
  EXPECT_REJECTED(run("T(n) = 2T(n/2) + n*lg(n)\nT(1) = 1", "Theta(n lg n)",
                      divide("master theorem, case 2", "n*lg(n)", "1", "1")),
                  "does not establish");
}

TEST(RecheckDivide, UnequalSplitsUseTheCriticalExponent) {
  // T(n) = T(n/3) + T(2n/3) + n: p = 1 (1/3 + 2/3 = 1), so Θ(n lg n)
  // (Akra & Bazzi 1998, "On the solution of linear recurrence equations", example).
  EXPECT_RECHECKED(run("T(n) = T(floor(n/3)) + T(floor(2*n/3)) + n\nT(1) = 1\nT(2) = 1",
                       "Theta(n lg n)", divide("Akra–Bazzi", "n", "1", "1")));
}

TEST(RecheckDivide, IrregularDriverRegularityStatementIsRejectedWithItsClass) {
  // f(n) = n^2 for even n, n^2/8 for odd n: a f(floor(n/2)) <= (1/2) f(n)
  // fails at every n ≡ 1 (mod 4), where floor(n/2) is even.
  const char* rec = "T(n) = T(n/2) + f(n)\nT(1) = 1\nf(n) = n^2 if n even\nf(n) = n^2/8";
  CertificateData c = divide("master theorem, case 3", "n^2", "1/8", "1");
  EXPECT_RECHECKED(run(rec, "Theta(n^2)", c));
  c.regularity_c = "1/2";
  c.regularity_from = "64";
  EXPECT_REJECTED(run(rec, "Theta(n^2)", c), "n ≡ 1 (mod 4)");
}

TEST(RecheckDivide, AComparisonWithTwoDriversBoundsEachSide) {
  // orchard::prune_odd: odd sizes cost n^2, even ones n. T lies between the
  // recursions driven by n and by n^2: O(n^2) and Ω(n lg n).
  const char* rec = "T(n) = 2T(n/2) + f(n)\nf(n) = n^2 if n odd\nf(n) = n otherwise\nT(1) = 1";
  CertificateData c =
      divide("comparison with the drivers n and n^2: master theorem", "n^2", "1/2", "1");
  c.driver_class_low = "n";
  EXPECT_RECHECKED(run(rec, "O(n^2)", c));
  EXPECT_RECHECKED(run(rec, "Omega(n lg n)", c));
  EXPECT_REJECTED(run(rec, "Theta(n^2)", c), "O(n^2) and Ω(n lg n)");
  EXPECT_REJECTED(run(rec, "O(n lg n)", c), "does not establish");
  // The lower constant past the truth on even lines: n >= 2 n fails.
  c.driver_low = "2";
  EXPECT_REJECTED(run(rec, "O(n^2)", c), "f(n) >= 2 g_low(n)");
}

TEST(RecheckDivide, APositiveBaseIsRequired) {
  // T(1) = -5 makes T(n) negative for a while: Leighton's base is positive.
  EXPECT_REJECTED(run("T(n) = 2T(n/2) + 1\nT(1) = -1000", "Theta(n)",
                      divide("master theorem, case 1", "1", "1", "1")),
                  "T(n) > 0");
}

// --- Subtract-and-conquer --------------------------------------------------

TEST(RecheckSubtract, OneStepAtATimeSumsTheDriver) {
  CertificateData c = divide("subtract-and-conquer, a = 1", "n", "1/2", "1", "4");
  c.method = "subtract";
  EXPECT_RECHECKED(run("T(n) = T(n - 1) + n - 1\nT(1) = 0", "Theta(n^2)", c));
  EXPECT_REJECTED(run("T(n) = T(n - 1) + n - 1\nT(1) = 0", "Theta(n^3)", c), "does not establish");
}

TEST(RecheckSubtract, AHarmonicDriverSumsToALogarithm) {
  // orchard::ordered_map: the n-th key lands 2/n deeper on average; the sum
  // of 2/j is 2 H_n = Θ(lg n) (common practice: the harmonic numbers).
  CertificateData c = divide("subtract-and-conquer, a = 1", "1/n", "2", "2", "4");
  c.method = "subtract";
  EXPECT_RECHECKED(run("T(n) = T(n - 1) + 2/n\nT(0) = 0", "Theta(lg n)", c));
  EXPECT_REJECTED(run("T(n) = T(n - 1) + 2/n\nT(0) = 0", "Theta(1)", c), "does not establish");
}

TEST(RecheckSubtract, AnExponentialDriverIsSummedAgainstA) {
  // T(n) = 2T(n - 1) + 2^n, T(0) = 1 is (n + 1) 2^n (from memory: divide by
  // 2^n and sum); theta = a / r^b = 1 gives Θ(n 2^n).
  CertificateData c = divide("subtract-and-conquer, exponential driver", "2^n", "1/2", "2", "4");
  c.method = "subtract";
  const char* rec = "T(n) = 2T(n - 1) + 2^n\nT(0) = 1";
  EXPECT_RECHECKED(run(rec, "Theta(n 2^n)", c));
  EXPECT_REJECTED(run(rec, "Theta(2^n)", c), "does not establish");
  // theta < 1: the driver's own term dominates (a geometric series).
  EXPECT_RECHECKED(run("T(n) = T(n - 1) + 2^n\nT(0) = 1", "Theta(2^n)", c));
  // theta > 1: a^n dominates when T > 0 where the unrolling stops (T(1) = 0
  // early on does not matter).
  EXPECT_RECHECKED(run("T(n) = 3T(n - 1) + 2^n\nT(1) = 0", "Theta(3^n)", c));
  // A driver class past the truth: 2^n >= (1/2) 3^n fails.
  c.driver_class = "3^n";
  EXPECT_REJECTED(run(rec, "Theta(n 3^n)", c), "f(n) >= 1/2 g(n)");
}

// --- Linear recurrences ----------------------------------------------------

CertificateData linear(std::vector<std::string> polynomial, const std::string& low,
                       const std::string& high) {
  CertificateData c;
  c.method = "linear";
  c.proof = "linear recurrence, dominant characteristic root";
  c.root_polynomial = std::move(polynomial);
  c.root_low = low;
  c.root_high = high;
  return c;
}

TEST(RecheckLinear, TheGoldenRatioIsComparedExactly) {
  // T(n) = T(n - 1) + T(n - 2) + 1 with T(0) = T(1) = 1 is 2 F(n + 1) - 1
  // (from memory), Θ(phi^n) with phi = (1 + sqrt(5))/2 the positive root of
  // x^2 - x - 1 (common practice).
  const char* rec = "T(n) = T(n - 1) + T(n - 2) + 1\nT(1) = 1\nT(0) = 1";
  const char* phi = "Theta(((1 + sqrt(5))/2)^n)";
  EXPECT_RECHECKED(run(rec, phi, linear({"-1", "-1", "1"}, "8/5", "17/10")));
  EXPECT_RECHECKED(run(rec, "O(2^n)", linear({"-1", "-1", "1"}, "8/5", "17/10")));
  EXPECT_REJECTED(run(rec, "Theta(2^n)", linear({"-1", "-1", "1"}, "8/5", "17/10")),
                  "does not establish");
  EXPECT_REJECTED(run(rec, "Theta(((1 + sqrt(3))/2)^n)", linear({"-1", "-1", "1"}, "8/5", "17/10")),
                  "does not establish");
  // The other root of x^2 - x - 1, about -0.618, is no growth rate.
  EXPECT_REJECTED(run(rec, phi, linear({"-1", "-1", "1"}, "-7/10", "-3/5")), "is not > 1");
  // An interval without the root, and a root of another polynomial.
  EXPECT_REJECTED(run(rec, phi, linear({"-1", "-1", "1"}, "17/10", "9/5")), "does not isolate");
  EXPECT_REJECTED(run(rec, phi, linear({"-2", "0", "1"}, "7/5", "3/2")),
                  "no root of the characteristic polynomial");
}

TEST(RecheckLinear, APolynomialDriverAndARationalRoot) {
  // T(n) = 2T(n - 1) + n, T(0) = 1 is 2^(n+2) - n - 2 (from memory).
  const char* rec = "T(n) = 2T(n - 1) + n\nT(0) = 1";
  EXPECT_RECHECKED(run(rec, "Theta(2^n)", linear({"-2", "1"}, "3/2", "2")));
  EXPECT_REJECTED(run(rec, "Theta(n 2^n)", linear({"-2", "1"}, "3/2", "2")), "does not establish");
  // A negative coefficient is beyond this rule: not re-checked, not rejected.
  RuleOutcome o = run("T(n) = 3T(n - 1) - T(n - 2) + 1\nT(0) = 1\nT(1) = 2", "Theta(3^n)",
                      linear({"1", "-3", "1"}, "5/2", "3"));
  EXPECT_EQ(o.status, RuleStatus::kNotRechecked) << o.detail;
}

// --- Full-history recurrences ----------------------------------------------

CertificateData full_history(const std::string& g, const std::string& low, const std::string& high,
                             const std::string& from = "64") {
  CertificateData c;
  c.method = "full-history";
  c.proof = "full-history recurrence (summation factor)";
  c.bound_class = g;
  c.bound_low = low;
  c.bound_high = high;
  c.bound_from = from;
  return c;
}

TEST(RecheckFullHistory, QuicksortsAverageIsDifferencedAndCarried) {
  // C(n) = 2(n + 1) H_n - 4n ~ 2 n ln n = (2 ln 2) n lg n, 2 ln 2 = 1.386...
  // (Knuth, The Art of Computer Programming, vol. 3, §5.2.2).
  const char* rec = "C(n) = n - 1 + (2/n) sum(k, 0, n - 1, C(k))\nC(0) = 0";
  EXPECT_RECHECKED(run(rec, "Theta(n lg n)", full_history("n*lg(n)", "1/2", "4")));
  // An upper constant below 2 ln 2: the step fails for large n.
  EXPECT_REJECTED(run(rec, "Theta(n lg n)", full_history("n*lg(n)", "1/2", "5/4")), "step");
  // A lower constant above C(64)/(64 lg 64) = 0.939...: the start fails.
  EXPECT_REJECTED(run(rec, "Theta(n lg n)", full_history("n*lg(n)", "1", "4")), "T(64)");
  EXPECT_REJECTED(run(rec, "Theta(n)", full_history("n*lg(n)", "1/2", "4")), "does not establish");
}

TEST(RecheckFullHistory, SelectingTheSmallestKeyIsLinear) {
  // C(n) = 2(n - H_n) (from memory): the differenced form is C(n) = C(n - 1) + 2 - 2/n.
  const char* rec = "C(n) = n - 1 + (1/n) sum(k, 0, n - 1, C(k))\nC(0) = 0";
  EXPECT_RECHECKED(run(rec, "Theta(n)", full_history("n", "1/2", "4")));
  // C(64) = 118.5... <= (15/8) 64, but the step needs 15/8 >= 2 - 2/n.
  EXPECT_REJECTED(run(rec, "Theta(n)", full_history("n", "1/2", "15/8")), "step");
  EXPECT_REJECTED(run(rec, "Theta(n)", full_history("n", "1/2", "3/2")), "T(64)");
}

// --- Change of variables ---------------------------------------------------

TEST(RecheckChangeOfVariables, SquareRootLevelsAreLgLgN) {
  // m = lg n: S(m) = S(m/2) + 1, master theorem case 2, Θ(lg m) = Θ(lg lg n)
  // (common practice).
  const char* rec = "T(n) = 1 if n <= 2\nT(n) = T(floor(sqrt(n))) + 1";
  CertificateData c = divide("change of variables, then master theorem, case 2", "1", "1/2", "2");
  c.method = "change-of-variables";
  EXPECT_RECHECKED(run(rec, "Theta(lg lg n)", c));
  EXPECT_REJECTED(run(rec, "Theta(lg n)", c), "does not establish");
  c.proof = "change of variables, then master theorem, case 1";
  EXPECT_REJECTED(run(rec, "Theta(lg lg n)", c), "names case 1");
}

TEST(RecheckChangeOfVariables, ALogarithmicDriverBecomesPolynomialInM) {
  // S(m) = 2 S(m/2) + m: Θ(m lg m) = Θ(lg n lg lg n) (common practice).
  const char* rec = "T(n) = 1 if n <= 2\nT(n) = 2T(floor(sqrt(n))) + lg(n)";
  CertificateData c =
      divide("change of variables, then master theorem, case 2", "lg(n)", "1/2", "2");
  c.method = "change-of-variables";
  EXPECT_RECHECKED(run(rec, "Theta(lg n lg lg n)", c));
  EXPECT_REJECTED(run(rec, "Theta(lg n)", c), "does not establish");
}

TEST(RecheckDivide, AGoldenCriticalExponentIsDecidedInQOfSqrtFive) {
  // (1/2)^p + (1/4)^p = 1 at p = lg phi: 1/phi + 1/phi^2 = 1 exactly
  // (common practice: phi^2 = phi + 1).
  const char* rec = "T(n) = T(n/2) + T(n/4) + 1\nT(1) = 1\nT(2) = 1\nT(3) = 1";
  CertificateData c = divide("Akra–Bazzi", "1", "1/2", "2");
  EXPECT_RECHECKED(run(rec, "Theta(n^(lg((1 + sqrt(5))/2)))", c));
  EXPECT_REJECTED(run(rec, "Theta(n^(lg((1 + sqrt(3))/2)))", c), "does not establish");
  EXPECT_REJECTED(run(rec, "Theta(n^(lg((1 + sqrt(5))/2)) lg n)", c), "does not establish");
}

// --- Induction -------------------------------------------------------------

TEST(RecheckInduction, MergeWorstCaseIsAtMostTwoNLgN) {
  EXPECT_RECHECKED(
      run(kMerge, "T(n) <= 2 n lg n for n >= 2", induction("<= 2n*lg(n)", "130", "2")));
}

TEST(RecheckInduction, ExactIdentitiesAreProvedBothWays) {
  EXPECT_RECHECKED(run("T(n) = 2T(n - 1) + 1\nT(1) = 1", "T(n) = 2^n - 1",
                       induction("= 2^n - 1", "64", "1", {"upper", "lower"})));
  EXPECT_RECHECKED(run("T(n) = T(n - 1) + n - 1\nT(1) = 0", "T(n) = n(n - 1)/2",
                       induction("= n*(n - 1)/2", "65", "1", {"upper", "lower"})));
}

TEST(RecheckInduction, AShiftedVariableKeepsAnIdentityExact) {
  // orchard::mul_digits: T(n) = 3 T(ceil(n/2)) with T(1) = 1 stays below
  // 3 (n - 1)^(lg 3) + 1; on odd n the step's slack is exactly zero, which
  // stays exact in x = n - 1, where (x/2)^(lg 3) = x^(lg 3)/3.
  EXPECT_RECHECKED(run("T(n) = 3T(ceil(n/2))\nT(1) = 1", "T(n) <= 3 (n - 1)^(lg 3) for n >= 2",
                       induction("<= 3*(n - 1)^lg(3)", "65", "2")));
}

TEST(RecheckInduction, AModulusTooSmallForTheFloorsIsRejected) {
  EXPECT_REJECTED(run(kMerge, "T(n) <= 2 n lg n for n >= 2", induction("<= 2n*lg(n)", "130", "1")),
                  "not exact modulo 1");
}

TEST(RecheckInduction, AFalseBoundIsRejected) {
  // n lg n - n + 1 is the exact worst case at powers of two (common
  // practice): T(n) <= n lg n - n cannot hold.
  EXPECT_REJECTED(
      run(kMerge, "T(n) <= n lg n - n for n >= 2", induction("<= n*lg(n) - n", "130", "2")),
      "fails at n = 2");
  // T(n) <= n fails at n = 4 already (T(4) = 5).
  EXPECT_REJECTED(run(kMerge, "T(n) <= n for n >= 1", induction("<= n", "130", "2")),
                  "fails at n = 4");
}

TEST(RecheckInduction, AStrengthenedHypothesisMustLieInsideTheClaim) {
  // Carrying n lg n + n through the step does not prove T(n) <= n lg n.
  EXPECT_REJECTED(run(kMerge, "T(n) <= n lg n for n >= 1", induction("<= n*lg(n) + n", "130", "2")),
                  "n*lg(n) + n <= n*lg(n) for every n > 130");
}

}  // namespace
}  // namespace thetagate::engine::recheck
