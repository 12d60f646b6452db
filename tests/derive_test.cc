// Derivations checked against published worked examples (sources named
// beside each check, as listed in docs/sources.md).
#include "verifier/derivation/derive.h"

#include <gtest/gtest.h>
#include <rapidcheck/gtest.h>

#include <cmath>

#include "verifier/derivation/classify.h"
#include "verifier/derivation/theorems/akra_bazzi.h"
#include "verifier/derivation/theorems/linear.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {
namespace {

Derivation derived(const std::string& text) { return derive(*recurrence_from_text(text)); }

std::string reasons(const Derivation& d) {
  std::string s;
  for (const auto& r : d.failed_hypotheses) s += r + "\n";
  return s;
}

std::string steps_of(const Derivation& d) {
  std::string s;
  for (const auto& step : d.steps) s += step + "\n";
  return s;
}

ClaimComparison against(const std::string& recurrence, const std::string& bound) {
  return compare_with_derivation(derived(recurrence),
                                 parse_bound(SourceText::whole("<bound>", bound)));
}

// Found by the bound fuzz target (ten minutes): 55555555^(5554/100) was taken
// exactly as a root of degree 50 of a 71,000-bit number, isolated by bisection
// for minutes. Such powers are certified enclosures now; small ones stay exact
// (4^(3/2) = 8).
TEST(DeriveShape, HugeFractionalPowerOfAConstantIsEnclosedQuickly) {
  std::string reason;
  auto huge =
      constant_value(*parse_expression(SourceText::whole("<e>", "55555555^55.54")), &reason);
  ASSERT_TRUE(huge.has_value()) << reason;
  EXPECT_FALSE(huge->is_rational());
  // 55555555^55.54 lies between 10^429 and 10^431 (log10 55555555 = 7.7447...).
  EXPECT_GT(huge->enclose(64).lower(), boost::multiprecision::pow(BigInt(10), 429));
  EXPECT_LT(huge->enclose(64).upper(), boost::multiprecision::pow(BigInt(10), 431));
  auto exact = constant_value(*parse_expression(SourceText::whole("<e>", "4^(3/2)")), &reason);
  ASSERT_TRUE(exact.has_value()) << reason;
  ASSERT_TRUE(exact->is_rational());
  EXPECT_EQ(exact->rational(), 8);
}

// Found by the derive fuzz target: a divisor that is a constant expression
// equal to zero reached Boost's rational division, which throws
// std::overflow_error (a terminate in the fuzzer). No shape fits instead.
TEST(DeriveShape, ZeroDivisorExpressionIsNoShapeNotACrash) {
  for (const char* text : {"T(n) = 54T(n/0^10)", "T(n) = 2T(floor(n/(1 - 1))) + n"}) {
    Derivation d = derived(text);
    EXPECT_TRUE(d.derived.empty()) << text;
    EXPECT_NE(reasons(d).find("is zero"), std::string::npos) << text << "\n" << reasons(d);
  }
}

TEST(DeriveMaster, CaseTwo) {
  Derivation d = derived("T(n) = 2T(n/2) + n; T(1) = 1");
  EXPECT_EQ(d.derived, "n lg n") << reasons(d);
  EXPECT_EQ(d.method, "master theorem, case 2");
}

TEST(DeriveMaster, CaseOneWithLogExponent) {
  // Bentley, Haken, Saxe 1980: a = 7, b = 2 gives n^(log_2 7).
  Derivation d = derived("T(n) = 7T(n/2) + n^2; T(1) = 1");
  EXPECT_EQ(d.derived, "n^(lg 7)") << reasons(d);
  EXPECT_EQ(d.method, "master theorem, case 1");
}

TEST(DeriveMaster, ZeroDrivingFunctionCostsOnlyTheLeaves) {
  // Common practice: with f = 0, T(n) = a^(log_b n) T(1) = Θ(n^(log_b a)).
  Derivation d = derived("T(n) = 3T(ceil(n/2)); T(1) = 1");
  EXPECT_EQ(d.derived, "n^(lg 3)");
  EXPECT_EQ(d.method, "master theorem, case 1");
  std::string steps = steps_of(d);
  EXPECT_NE(steps.find("f(n) = 0: only the n^p leaves cost"), std::string::npos) << steps;
  EXPECT_EQ(steps.find("ε"), std::string::npos) << "f = 0 has no ε to speak of:\n" << steps;
}

// With f = 0 the leaves are all T is: T(1) = 0 makes T = 0 at every size
// (T(n) = a^(log_b n) T(1), common practice), so no theorem may conclude
// Θ(n^p), Θ(1) or Θ(a^(n/b)) from the leaves unless every base value is a
// positive constant. The reason names the base value.
TEST(DeriveMaster, ZeroDriverWithAZeroOrUnknownBaseValueConcludesNothing) {
  for (const char* text :
       {"T(n) = 2T(n/2); T(1) = 0", "T(n) = 3T(ceil(n/2)); T(1) = 1; T(2) = 0",
        "T(n) = T(n/3) + T(2n/3); T(n) = 0 if n < 3", "T(n) = T(n - 1); T(0) = 0",
        "T(n) = 2T(n - 1); T(0) = 0", "T(n) = 2T(sqrt(n)); T(n) = n - 2 if n <= 2",
        "T(n) = 2T(n/2); T(1) = O(1)"}) {
    SCOPED_TRACE(text);
    Derivation d = derived(text);
    EXPECT_FALSE(d.growth.has_value()) << d.derived;
    EXPECT_FALSE(d.lower.has_value());
    std::string reasons;
    for (const std::string& r : d.failed_hypotheses) reasons += r + "\n";
    EXPECT_NE(reasons.find("a sum of base values over its leaves, and the base value"),
              std::string::npos)
        << reasons;
  }
  // Positive constants, or a Θ(1) class, keep the leaves' growth.
  EXPECT_EQ(derived("T(n) = 2T(n/2); T(1) = Θ(1)").derived, "n");
  EXPECT_EQ(derived("T(n) = T(n - 1); T(0) = 3").derived, "1");
  EXPECT_EQ(derived("T(n) = 2T(n - 1); T(0) = 1/2").derived, "2^n");
  // A driver that is eventually positive needs no positive base: T(n) =
  // 2T(n/2) + 1, T(1) = 0 is n - 1 at powers of two (common practice).
  EXPECT_EQ(derived("T(n) = 2T(n/2) + 1; T(1) = 0").derived, "n");
}

TEST(DeriveMaster, CaseThreeWithRegularity) {
  Derivation d = derived("T(n) = 3T(n/4) + n lg n; T(1) = 1");
  EXPECT_EQ(d.derived, "n lg n") << reasons(d);
  EXPECT_EQ(d.method, "master theorem, case 3");
}

TEST(DeriveMaster, MergeSortWithFloorsAndCeilings) {
  // Suchenek 2017: W(n) = n ceil(lg n) - 2^ceil(lg n) + 1 = Θ(n lg n).
  Derivation d = derived("T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0");
  EXPECT_EQ(d.derived, "n lg n") << reasons(d);
}

TEST(DeriveMaster, PolylogExtension) {
  // Eberl, "The Akra–Bazzi theorem and the Master theorem", AFP 2015:
  // master2_1 (k > -1), master2_2 (k = -1), master2_3 (k < -1).
  EXPECT_EQ(derived("T(n) = 2T(n/2) + n lg n; T(1) = 1").derived, "n lg^2 n");
  Derivation gap = derived("T(n) = 2T(n/2) + n/lg n; T(1) = 1; T(2) = 1");
  EXPECT_EQ(gap.derived, "n lg lg n");
  EXPECT_EQ(gap.method, "master theorem, case 2 (polylog extension, k = -1)");
  bool names_gap = false;
  for (const auto& s : gap.steps)
    names_gap = names_gap || s.find("not by a factor n^ε") != std::string::npos;
  EXPECT_TRUE(names_gap);
  EXPECT_EQ(derived("T(n) = 2T(n/2) + n/lg^2 n; T(1) = 1; T(2) = 1").derived, "n");
}

TEST(DeriveAkraBazzi, PublishedExamples) {
  // Akra, Bazzi 1998; values from docs/sources.md (certified root finding).
  Derivation a = derived("T(n) = T(n/5) + T(7n/10) + n; T(1) = 1");
  EXPECT_EQ(a.derived, "n") << reasons(a);
  EXPECT_EQ(a.method, "Akra–Bazzi");
  // The integral's exponent is shown as 1 - p before its digits.
  std::string steps = steps_of(a);
  EXPECT_NE(steps.find("du = Θ(n^(1 - p)) = Θ(n^0.160220…)"), std::string::npos) << steps;
  EXPECT_EQ(derived("T(n) = T(n/2) + T(n/3) + T(n/6) + n; T(1) = 1").derived, "n lg n");
  // Leighton 1996 example (from memory): 2T(n/4) + 3T(n/6) + n lg n.
  EXPECT_EQ(derived("T(n) = 2T(n/4) + 3T(n/6) + n lg n; T(1) = 1").derived, "n lg^2 n");
  Derivation golden = derived("T(n) = T(n/2) + T(n/4) + 1; T(1) = 1");
  // calc: p = lg φ = 0.6942419..., exactly: x + x^2 = 1 in x = 2^-p.
  EXPECT_EQ(golden.derived, "n^(lg((1 + sqrt(5))/2))") << reasons(golden);
  EXPECT_EQ(derived("T(n) = 0.5T(n/2) + n; T(1) = 1").derived, "n");
  EXPECT_EQ(derived("T(n) = (1/2)T(n/2) + 1/n; T(1) = 1").derived, "lg n/n");
}

TEST(DeriveAkraBazzi, CriticalExponentIsCertified) {
  RealNumber p = critical_exponent({{Rational(1), Rational(1, 5)}, {Rational(1), Rational(7, 10)}});
  EXPECT_EQ(p.digits(), "0.839780…");  // docs/sources.md: p = 0.83978...
  EXPECT_LT(p, RealNumber(1L));
  EXPECT_EQ(critical_exponent({{1, Rational(1, 2)}, {1, Rational(1, 3)}, {1, Rational(1, 6)}}),
            RealNumber(1L));
}

TEST(DeriveChangeOfVariables, RootTerms) {
  // docs/sources.md [calc]: T(2^(2^k)) = lg n (T(2) + lg lg n).
  EXPECT_EQ(derived("T(n) = 2T(sqrt(n)) + lg n; T(2) = 1; T(1) = 1; T(3) = 1").derived,
            "lg n lg lg n");
  EXPECT_EQ(derived("T(n) = T(floor(sqrt(n))) + 1; T(1) = 1; T(2) = 1; T(3) = 1").derived,
            "lg lg n");
}

TEST(DeriveSubtract, CommonPractice) {
  // Graham, Knuth, Patashnik, Concrete Mathematics, ch. 1: 2^n - 1.
  EXPECT_EQ(derived("T(n) = 2T(n-1) + 1; T(0) = 0").derived, "2^n");
  EXPECT_EQ(derived("T(n) = T(n-1) + n; T(0) = 0").derived, "n^2");             // common practice
  EXPECT_EQ(derived("T(n) = 0.5T(n-1) + n; T(0) = 0").derived, "n");            // common practice
  EXPECT_EQ(derived("T(n) = 4T(n-2) + 1; T(0) = 1; T(1) = 1").derived, "2^n");  // 4^(n/2)
}

TEST(DeriveLinear, DominantRootAndItsCoefficient) {
  // Fibonacci: Θ(φ^n) (Neapolitan, Naimipour, appendix B).
  Derivation fib = derived("T(n) = T(n-1) + T(n-2); T(0) = 0; T(1) = 1");
  EXPECT_EQ(fib.derived, "((1 + sqrt(5))/2)^n") << reasons(fib);
  // docs/sources.md [calc]: 1 - 2^n + 2*3^n.
  EXPECT_EQ(derived("T(n) = 6T(n-1) - 11T(n-2) + 6T(n-3); T(0) = 2; T(1) = 5; T(2) = 15").derived,
            "3^n");
  // docs/sources.md [calc]: a_n = 1, the root 2 has coefficient 0.
  Derivation trap = derived("T(n) = 3T(n-1) - 2T(n-2); T(0) = 1; T(1) = 1");
  EXPECT_EQ(trap.derived, "1") << reasons(trap);
  // docs/sources.md [calc]: a_n = -a_{n-2} has no Θ of the form n^j r^n.
  Derivation oscillating = derived("T(n) = -T(n-2); T(0) = 1; T(1) = 1");
  EXPECT_FALSE(oscillating.derived_class());
  EXPECT_NE(reasons(oscillating).find("oscillates"), std::string::npos) << reasons(oscillating);
}

TEST(DeriveLinear, DominanceIsCertifiedAndRepeatedRootsAreFound) {
  // x^2 - x - 1 has roots 1.618… and −0.618… (from memory).
  Derivation fib = derived("T(n) = T(n-1) + T(n-2); T(0) = 0; T(1) = 1");
  EXPECT_NE(steps_of(fib).find("(certified: Pellet's theorem after Graeffe root-squaring)"),
            std::string::npos)
      << steps_of(fib);
  // Characteristic polynomial (x - 1)^3 with the root 1 of the constant
  // driving function: (x - 1)^4, so T(n) = Θ(n^3) (common practice). A
  // fourfold root used to scatter numerically into four "roots".
  Derivation cubic = derived("T(n) = 3T(n-1) - 3T(n-2) + T(n-3) + 1; T(0) = 0; T(1) = 1; T(2) = 3");
  EXPECT_EQ(cubic.derived, "n^3") << reasons(cubic);
  EXPECT_NE(steps_of(cubic).find("multiplicity 4"), std::string::npos) << steps_of(cubic);
}

TEST(DeriveLinear, ActivePolynomialDropsCancelledRoots) {
  Polynomial c({Rational(2), Rational(-3), Rational(1)});  // x^2 - 3x + 2
  EXPECT_EQ(active_polynomial(c, {1, 1, 1}).str(), "x - 1");
  EXPECT_EQ(active_polynomial(c, {1, 2, 4}).str(), "x - 2");
}

TEST(DeriveRegularity, FailsWhereCaseThreeWouldBeWrong) {
  // docs/sources.md [calc]: f(2^k) = 8^k for even k, 4^k for odd k; f = Ω(n^2) but
  // T(n) >= n^3/4 at odd k, so Θ(f) is false.
  Derivation d = derived(
      "f(n) = n^3 if floor(lg n) mod 2 == 0; f(n) = n^2 otherwise;"
      "T(n) = 2T(n/2) + f(n); T(1) = 1");
  EXPECT_FALSE(d.derived_class());
  std::string r = reasons(d);
  EXPECT_NE(r.find("regularity"), std::string::npos) << r;
  EXPECT_NE(r.find("2^3"), std::string::npos) << r;
}

TEST(DeriveShape, ReasonsInAReviewersWords) {
  EXPECT_NE(reasons(derived("T(n) = n T(n/2) + 1; T(1) = 1")).find("depends on n"),
            std::string::npos);
  EXPECT_NE(reasons(derived("T(n) = T(n/2)^2 + 1; T(1) = 1")).find("not linear"),
            std::string::npos);
  EXPECT_NE(reasons(derived("T(n) = 2T(n/2) + 1 if n even; T(n) = T(n-1) + 1 otherwise; T(1) = 1"))
                .find("differ in their recursive part"),
            std::string::npos);
  Derivation parity =
      derived("T(n) = 2T(n/2) + n if n even; T(n) = 2T(n/2) + n^2 otherwise; T(1) = 1");
  EXPECT_FALSE(parity.derived_class());
  EXPECT_NE(reasons(parity).find("different classes"), std::string::npos) << reasons(parity);
}

TEST(DeriveClaim, ExactComparison) {
  const std::string strassen = "T(n) = 7T(n/2) + n^2; T(1) = 1";
  EXPECT_EQ(against(strassen, "Theta(n^(lg 7))").agreement, Agreement::kSame);
  EXPECT_EQ(against(strassen, "Theta(n^2.807)").agreement, Agreement::kContradicts);
  EXPECT_EQ(against(strassen, "O(n^2.81)").agreement, Agreement::kLoose);
  EXPECT_EQ(against(strassen, "Omega(n^2.81)").agreement, Agreement::kContradicts);
  const std::string gap = "T(n) = 2T(n/2) + n/lg n; T(1) = 1; T(2) = 1";
  EXPECT_EQ(against(gap, "Theta(n)").agreement, Agreement::kContradicts);  // lg lg n counts
  EXPECT_EQ(against(gap, "Theta(n lg lg n)").agreement, Agreement::kSame);
  ClaimComparison loose = against(gap, "O(n lg n)");
  EXPECT_EQ(loose.agreement, Agreement::kLoose);
  EXPECT_EQ(
      against("T(n) = T(n-1) + T(n-2); T(0) = 0; T(1) = 1", "Theta(((1+sqrt(5))/2)^n)").agreement,
      Agreement::kSame);
  ClaimComparison unclassified = against(strassen, "Theta(n mod 3)");
  EXPECT_FALSE(unclassified.agreement);
  EXPECT_TRUE(unclassified.claim_unclassified);
  EXPECT_FALSE(against("T(n) = T(n/2) + n mod 3; T(1) = 1", "Theta(n)").agreement)
      << "no theorem derives a class: nothing to compare";
}

// log2 of a positive big value without overflowing a double.
double log2_of(const Value& v) {
  Rational q = v.is_exact() ? v.exact() : v.interval(256).lower();
  auto log2_int = [](const BigInt& x) {
    uint64_t bits = bit_length(x);
    uint64_t drop = bits > 64 ? bits - 64 : 0;
    BigInt top = x >> static_cast<unsigned>(drop);
    return std::log2(top.convert_to<double>()) + static_cast<double>(drop);
  };
  return log2_int(numerator(q)) - log2_int(denominator(q));
}

// The derived class agrees with the trend of exact evaluation: between
// n = b^K and n = b^(2K), T(n)/g(n) drifts less than it does against g lg n
// or g / lg n (the nearest wrong answers).
RC_GTEST_PROP(DeriveMaster, AgreesWithExactTrend, ()) {
  const long a = *rc::gen::inRange(1, 9);
  const long b = *rc::gen::inRange(2, 5);
  const long alpha = *rc::gen::inRange(0, 4);
  const long beta = *rc::gen::inRange(-2, 3);
  std::string f = "n^" + std::to_string(alpha) + " * lg(n)^(" + std::to_string(beta) + ")";
  std::string text =
      "T(n) = " + std::to_string(a) + "T(n/" + std::to_string(b) + ") + " + f + "; T(1) = 1";
  Derivation d = derive(*recurrence_from_text(text));
  if (!d.growth) RC_DISCARD("no class: " + reasons(d));  // lg lg lg n boundaries
  Evaluator ev(recurrence_from_text(text));
  // Large sizes: leaf costs n^p and the driving function cross late when
  // alpha is close to p (3T(n/4) + n/lg^2 n needs n > 2^100).
  const int k = static_cast<int>(std::ceil(200 / std::log2(static_cast<double>(b))));
  auto log_ratio = [&](int power, double extra_lg) {
    BigInt n = boost::multiprecision::pow(BigInt(b), static_cast<unsigned>(power));
    double lg_n = power * std::log2(static_cast<double>(b));
    double lg_t = log2_of(ev.value_at(n));
    const GrowthClass& g = *d.growth;
    double lg_g = g.alpha.approx() * lg_n + (g.beta.approx() + extra_lg) * std::log2(lg_n) +
                  g.gamma.approx() * std::log2(std::log2(lg_n));
    return lg_t - lg_g;
  };
  double drift = std::fabs(log_ratio(2 * k, 0) - log_ratio(k, 0));
  double drift_up = std::fabs(log_ratio(2 * k, 1) - log_ratio(k, 1));
  double drift_down = std::fabs(log_ratio(2 * k, -1) - log_ratio(k, -1));
  RC_LOG() << text << " -> " << d.derived << " drift " << drift << " / " << drift_up << " / "
           << drift_down;
  RC_ASSERT(drift < drift_up);
  RC_ASSERT(drift < drift_down);
}

}  // namespace
}  // namespace thetagate::engine
