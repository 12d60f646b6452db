// Root terms whose coefficient depends on n (issue 19, §5): T(n) = a(n)
// T(floor(n^(1/k))) + f(n) with a(n) = c floor(n^(1/k))^v or c n^(v/k),
// divided by n^q and solved by the change of variables m = lg n
// (verifier/derivation/theorems/normalised_roots.h). The property tests
// evaluate T and the comparison recurrence V exactly with GMP's integer roots
// and rationals written out here, not with the engine's evaluator.
#include "verifier/derivation/theorems/normalised_roots.h"

#include <gmp.h>
#include <gtest/gtest.h>
#include <rapidcheck/gtest.h>

#include <cmath>
#include <map>
#include <string>
#include <vector>

#include "reports/verdict_text.h"
#include "tests/support/check_recurrence.h"
#include "verifier/checking/checker.h"
#include "verifier/derivation/certificate.h"
#include "verifier/derivation/derive.h"
#include "verifier/model/bound.h"
#include "verifier/model/claim.h"
#include "verifier/model/recurrence.h"
#include "verifier/recheck/rules.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {
namespace {

Derivation derived(const std::string& text) { return derive(*recurrence_from_text(text)); }

std::string reasons(const Derivation& d) {
  std::string s = d.method + "\n";
  for (const auto& step : d.steps) s += "  " + step + "\n";
  for (const auto& r : d.failed_hypotheses) s += r + "\n";
  return s;
}

ClaimResult check_text(const std::string& recurrence, const std::string& bound) {
  return test_support::check_recurrence(recurrence, bound, {5, 1024, "orchard::roots"});
}

const char* kSquareRootFloors =
    "T(n) = 2 floor(sqrt(n)) T(floor(sqrt(n))) + n\nT(1) = 1\nT(2) = 1\nT(3) = 1";

// T(n) = 2 floor(sqrt(n)) T(floor(sqrt(n))) + n: with U = T/n, U(n) =
// r(n) U(floor(sqrt(n))) + 1 and r(n) -> 2, so U = Θ(lg n) (from memory: the
// unrolled sum has lg lg n levels, the level j contributing 2^j, and 2^(lg lg n)
// = lg n).
TEST(NormalisedRoots, SquareRootFloorsDeriveNLgN) {
  Derivation d = derived(kSquareRootFloors);
  ASSERT_TRUE(d.growth) << reasons(d);
  EXPECT_EQ(d.derived, "n lg n");
  EXPECT_EQ(d.theorem, kNormalisedRootsTheorem);
  EXPECT_EQ(d.method.rfind("change of variables after dividing by n (the factor r(n) = 2 "
                           "floor(sqrt(n))^2/n stays in [",
                           0),
            0u)
      << d.method;
  ASSERT_TRUE(d.normalisation);
  EXPECT_EQ(d.normalisation->power, 1);
  EXPECT_EQ(d.normalisation->limit, 2);
  EXPECT_EQ(d.normalisation->from, 4);  // T(1), T(2), T(3) are points
  // 2 floor(sqrt(n))^2/n at n = 8 is 1 and at n = 4 is 2 (exact): the proved
  // range must contain both.
  EXPECT_LE(d.normalisation->factor_low, 1);
  EXPECT_GE(d.normalisation->factor_high, 2);
  EXPECT_GT(d.normalisation->chain_low, 0);
}

TEST(NormalisedRoots, ExampleClaimHoldsWithItsMethodNamed) {
  ClaimResult r = check_text(kSquareRootFloors, "Theta(n lg n)");
  EXPECT_EQ(r.verdict, Verdict::kHolds) << verdict_message(r);
  EXPECT_NE(r.method.find("after dividing by n"), std::string::npos) << r.method;
}

// Without floors r(n) = 2 exactly: T(n) = 2 sqrt(n) T(sqrt(n)) + n is n times
// V(n) = 2 V(sqrt(n)) + 1 = Θ(lg n) (from memory).
TEST(NormalisedRoots, UnflooredVariantHolds) {
  const char* text = "T(n) = 2 sqrt(n) T(sqrt(n)) + n\nT(n) = 1 if n <= 2";
  Derivation d = derived(text);
  ASSERT_TRUE(d.growth) << reasons(d);
  EXPECT_EQ(d.derived, "n lg n");
  ASSERT_TRUE(d.normalisation);
  EXPECT_EQ(d.normalisation->factor_low, 2);
  EXPECT_EQ(d.normalisation->factor_high, 2);
  EXPECT_EQ(check_text(text, "Theta(n lg n)").verdict, Verdict::kHolds);
}

// Cube roots: a(n) = 3 floor(n^(1/3))^2 gives q = (2/3)·3/2 = 1 and r(n) ->
// 3 = k, so V(n) = 3 V(n^(1/3)) + 1 = Θ(lg n) and T = Θ(n lg n); with the
// driver n^2, f/g = n dominates: T = Θ(n^2) (from memory).
TEST(NormalisedRoots, CubeRoots) {
  Derivation d = derived("T(n) = 3 floor(n^(1/3))^2 T(floor(n^(1/3))) + n\nT(n) = 1 if n <= 7");
  ASSERT_TRUE(d.growth) << reasons(d);
  EXPECT_EQ(d.derived, "n lg n");
  EXPECT_EQ(d.normalisation->power, 1);
  Derivation big = derived("T(n) = 3 floor(n^(1/3))^2 T(floor(n^(1/3))) + n^2\nT(n) = 1 if n <= 7");
  ASSERT_TRUE(big.growth) << reasons(big);
  EXPECT_EQ(big.derived, "n^2");
  EXPECT_EQ(check_text("T(n) = 3 floor(n^(1/3))^2 T(floor(n^(1/3))) + n\nT(n) = 1 if n <= 7",
                       "Theta(n lg n)")
                .verdict,
            Verdict::kHolds);
}

TEST(NormalisedRoots, OneSidedClaimsHold) {
  EXPECT_EQ(check_text(kSquareRootFloors, "O(n lg n)").verdict, Verdict::kHolds);
  EXPECT_EQ(check_text(kSquareRootFloors, "Omega(n lg n)").verdict, Verdict::kHolds);
  EXPECT_EQ(check_text(kSquareRootFloors, "O(n^2)").verdict, Verdict::kHolds);
}

// A driver written as a class: the base lines are still decided exactly, and
// the proof comes from the classes alone (no certificate for any member).
TEST(NormalisedRoots, AClassTermDriverDerivesToo) {
  const char* text = "T(n) = 2 floor(sqrt(n)) T(floor(sqrt(n))) + Θ(n)\nT(n) = 1 if n <= 3";
  Derivation d = derived(text);
  ASSERT_TRUE(d.growth) << reasons(d);
  EXPECT_EQ(d.derived, "n lg n");
  EXPECT_EQ(d.normalisation->from, 4);
  EXPECT_FALSE(theorem_certificate(*recurrence_from_text(text), d));
}

// Near misses must never hold: T = Θ(n lg n) is not Θ(n), Θ(n lg lg n) or
// Θ(n lg^2 n), nor O(n lg lg n), nor Ω(n lg^2 n).
TEST(NormalisedRoots, NearMissesNeverHold) {
  for (const char* bound :
       {"Theta(n)", "Theta(n lg lg n)", "Theta(n lg^2 n)", "O(n lg lg n)", "Omega(n lg^2 n)"}) {
    ClaimResult r = check_text(kSquareRootFloors, bound);
    EXPECT_NE(r.verdict, Verdict::kHolds) << bound << ": " << verdict_message(r);
    EXPECT_NE(r.verdict, Verdict::kError) << bound << ": " << verdict_message(r);
  }
}

// A hypothesis that fails is named: a coefficient whose constant factor is
// not positive has no positive limit for r(n); a coefficient of another form
// is a shape problem.
TEST(NormalisedRoots, FailingHypothesesAreNamed) {
  Derivation negative =
      derived("T(n) = -2 floor(sqrt(n)) T(floor(sqrt(n))) + n\nT(n) = 1 if n <= 3");
  EXPECT_FALSE(negative.growth);
  EXPECT_NE(reasons(negative).find("no positive limit"), std::string::npos) << reasons(negative);
  Derivation other = derived("T(n) = lg(n) T(floor(sqrt(n))) + n\nT(n) = 1 if n <= 3");
  EXPECT_FALSE(other.growth);
  EXPECT_NE(reasons(other).find("depends on n"), std::string::npos) << reasons(other);
  Derivation scaled = derived("T(n) = floor(sqrt(n)) T(n/2) + n\nT(n) = 1 if n <= 3");
  EXPECT_FALSE(scaled.growth);
  EXPECT_NE(reasons(scaled).find("only for root terms"), std::string::npos) << reasons(scaled);
}

// The certificate names its own method and carries the normalisation; the
// re-checker has no rule for it, so it is never reported as re-checked.
TEST(NormalisedRoots, CertificateCarriesTheNormalisation) {
  auto rec = recurrence_from_text(kSquareRootFloors);
  Derivation d = derive(*rec);
  std::optional<Certificate> cert = theorem_certificate(*rec, d);
  ASSERT_TRUE(cert) << reasons(d);
  EXPECT_EQ(cert->method, "normalised-change-of-variables");
  EXPECT_EQ(cert->normaliser, "n");
  EXPECT_EQ(cert->factor_limit, "2");
  EXPECT_EQ(cert->factor_from, "4");
  EXPECT_EQ(cert->driver_class, "n");
  EXPECT_FALSE(cert->chain_low.empty());
}

// The same rounded root before T and inside it cancels: n/floor(sqrt(n)) ·
// floor(sqrt(n))/n = 1, so r(n) = 1 with nothing to bound, and T/n = V with
// V(n) = V(floor(sqrt(n))) + 1 = Θ(lg lg n) (from memory: lg lg n levels).
TEST(NormalisedRoots, TheSameRootInCoefficientAndArgumentCancels) {
  Derivation d = derived("T(n) = (n/floor(sqrt(n))) T(floor(sqrt(n))) + n\nT(n) = 1 if n <= 3");
  ASSERT_TRUE(d.growth) << reasons(d);
  EXPECT_EQ(d.derived, "n lg lg n");
  ASSERT_TRUE(d.normalisation);
  EXPECT_EQ(d.normalisation->factor_low, 1);
  EXPECT_EQ(d.normalisation->factor_high, 1);
  EXPECT_EQ(d.normalisation->factor, "1");
}

// The re-checker has no rule for the method: not re-checked, never accepted
// (docs/design.md, "The re-checker").
TEST(NormalisedRoots, TheReCheckerDoesNotClaimToFollowIt) {
  auto rec = recurrence_from_text(kSquareRootFloors);
  Derivation d = derive(*rec);
  std::optional<Certificate> cert = theorem_certificate(*rec, d);
  ASSERT_TRUE(cert);
  recheck::CertificateData data;
  data.method = cert->method;
  data.proof = cert->proof;
  data.driver_class = cert->driver_class;
  data.driver_low = cert->driver_low;
  data.driver_high = cert->driver_high;
  data.driver_from = cert->driver_from;
  Bound bound = parse_bound(SourceText::whole("<bound>", "Theta(n lg n)"));
  recheck::RuleOutcome out = recheck::check_certificate(*rec, bound, data);
  EXPECT_EQ(out.status, recheck::RuleStatus::kNotRechecked) << out.detail;
}

// ---------------------------------------------------------------------------
// Exact evaluation, written out here.

BigInt floor_root(const BigInt& n, unsigned long k) {
  BigInt r;
  mpz_root(r.backend().data(), n.backend().data(), k);  // GMP: the truncated k-th root
  return r;
}

Rational power(const Rational& x, long e) {
  Rational out = 1;
  for (long i = 0; i < (e < 0 ? -e : e); ++i) out *= x;
  return e < 0 ? Rational(1) / out : out;
}

double log2_of(const Rational& x) {
  auto log2_mpz = [](const BigInt& z) {
    long e = 0;
    double m = mpz_get_d_2exp(&e, z.backend().data());  // GMP: z = m 2^e, 0.5 <= m < 1
    return std::log2(m) + static_cast<double>(e);
  };
  return log2_mpz(numerator(x)) - log2_mpz(denominator(x));
}

double as_double(const RealNumber& x) {
  Interval box = x.enclose(64);
  return (box.lower().convert_to<double>() + box.upper().convert_to<double>()) / 2;
}

// T(n) = c R^v T(floor(n^(1/k))) + n^p lg^j n, T(n) = 1 for n <= 7, where R
// is floor(n^(1/k)) (rounded) or n^(1/k) itself; and, with g = n^q,
// q = v/(k - 1), the comparison recurrence V(n) = c V(floor(n^(1/k))) +
// n^p lg^j n/g(n), V = T/g for n <= 7.
struct Family {
  Rational c = 2;
  unsigned long k = 2;
  long v = 1;  // a whole q = v/(k - 1): v even for cube roots
  long p = 1;
  long j = 0;
  bool rounded = true;

  long q() const { return v / static_cast<long>(k - 1); }
  std::string root() const { return k == 2 ? "sqrt(n)" : "n^(1/" + std::to_string(k) + ")"; }
  std::string text() const {
    std::string factor = rounded ? "floor(" + root() + ")^" + std::to_string(v)
                                 : "n^(" + std::to_string(v) + "/" + std::to_string(k) + ")";
    std::string driver = "n^" + std::to_string(p) + (j ? " * lg(n)^" + std::to_string(j) : "");
    return "T(n) = " + to_string(c) + " * " + factor + " * T(floor(" + root() + ")) + " + driver +
           "\nT(n) = 1 if n <= 7";
  }
  // lg n for the sizes used with j > 0: powers of two only.
  static Rational lg(const BigInt& n) { return Rational(static_cast<long>(bit_length(n) - 1)); }
  Rational f(const BigInt& n) const {
    return power(Rational(n), p) * (j ? power(lg(n), j) : Rational(1));
  }
  Rational a(const BigInt& n, const BigInt& s) const {
    // n^(v/k) is exact at the sizes 2^(k^i) the unrounded family is used at.
    if (rounded) return c * power(Rational(s), v);
    return c * power(Rational(floor_root(n, k)), v);
  }
  Rational t(const BigInt& n, std::map<BigInt, Rational>& memo) const {
    if (n <= 7) return 1;
    if (auto it = memo.find(n); it != memo.end()) return it->second;
    BigInt s = floor_root(n, k);
    Rational value = a(n, s) * t(s, memo) + f(n);
    return memo[n] = value;
  }
  Rational u(const BigInt& n, std::map<BigInt, Rational>& tm) const {
    return t(n, tm) / power(Rational(n), q());
  }
  Rational v_at(const BigInt& n, std::map<BigInt, Rational>& tm,
                std::map<BigInt, Rational>& vm) const {
    if (n <= 7) return u(n, tm);
    if (auto it = vm.find(n); it != vm.end()) return it->second;
    Rational value = c * v_at(floor_root(n, k), tm, vm) + f(n) / power(Rational(n), q());
    return vm[n] = value;
  }
};

rc::Gen<Family> family_gen(bool with_lg) {
  return rc::gen::exec([with_lg] {
    static const std::vector<Rational> cs = {Rational(1), Rational(3, 2), Rational(2), Rational(3),
                                             Rational(4)};
    Family fam;
    fam.c = cs[*rc::gen::inRange<size_t>(0, cs.size())];
    fam.k = *rc::gen::inRange<unsigned long>(2, 4);
    fam.v = fam.k == 2 ? *rc::gen::inRange(1, 3) : 2 * *rc::gen::inRange(1, 3);
    fam.p = *rc::gen::inRange(0, 4);
    fam.j = with_lg ? *rc::gen::inRange(0, 3) : 0;
    fam.rounded = with_lg ? *rc::gen::arbitrary<bool>() : true;
    return fam;
  });
}

// What the derivation proves about r(n) and about U/V, at sizes where the
// floors bite (random bits, k-th powers and their neighbours), against exact
// values: r(n) in [factor_low, factor_high], U/V in [chain_low, chain_high].
RC_GTEST_PROP(NormalisedRootsProperty, ProvedRangesHoldExactly, ()) {
  const Family fam = *family_gen(false);
  Derivation d = derived(fam.text());
  RC_ASSERT(d.growth.has_value());
  RC_ASSERT(d.normalisation.has_value());
  const RootNormalisation& norm = *d.normalisation;
  RC_ASSERT(norm.power == fam.q());
  RC_ASSERT(norm.limit == fam.c);
  std::map<BigInt, Rational> tm, vm;
  std::vector<BigInt> sizes;
  for (int i = 0; i < 12; ++i) {
    int bits = *rc::gen::inRange(4, 300);
    BigInt n = BigInt(1) << bits;
    n += *rc::gen::inRange<uint64_t>(0, uint64_t{1} << 20);
    sizes.push_back(n);
  }
  for (BigInt b = 2; bit_length(b) < 200; b *= 3) {
    BigInt kth = 1;
    for (unsigned long i = 0; i < fam.k; ++i) kth *= b;
    sizes.insert(sizes.end(), {kth - 1, kth, kth + 1});
  }
  for (const BigInt& n : sizes) {
    if (n < norm.from) continue;
    BigInt s = floor_root(n, fam.k);
    Rational r = fam.c * power(Rational(s), fam.v + fam.q()) / power(Rational(n), fam.q());
    RC_ASSERT(norm.factor_low <= r);
    RC_ASSERT(r <= norm.factor_high);
    Rational ratio = fam.u(n, tm) / fam.v_at(n, tm, vm);
    RC_ASSERT(norm.chain_low <= ratio);
    RC_ASSERT(ratio <= norm.chain_high);
  }
}

// The derived class against exact values at n = 2^(k^i), where every size
// of the chain is a power of two (lg exact) and the floors vanish: between
// the two largest sizes T(n)/G(n) moves by less than 2^0.6 in either
// direction, where a wrong power of lg n would move it by at least a factor
// 2 (k = 2: lg n doubles) and a wrong power of n by far more.
RC_GTEST_PROP(NormalisedRootsProperty, DerivedClassMatchesExactValues, ()) {
  const Family fam = *family_gen(true);
  Derivation d = derived(fam.text());
  RC_ASSERT(d.growth.has_value());
  const GrowthClass& g = *d.growth;
  RC_ASSERT(g.is_subexponential());
  double alpha = as_double(g.alpha), beta = as_double(g.beta), gamma = as_double(g.gamma);
  std::map<BigInt, Rational> tm;
  auto log2_ratio = [&](int i) {
    BigInt lg_n = 1;
    for (int x = 0; x < i; ++x) lg_n *= fam.k;
    BigInt n = BigInt(1) << static_cast<unsigned>(lg_n);
    double l = lg_n.convert_to<double>();
    return log2_of(fam.t(n, tm)) - alpha * l - beta * std::log2(l) -
           gamma * std::log2(std::log2(l));
  };
  int last = fam.k == 2 ? 10 : 6;
  double move = log2_ratio(last) - log2_ratio(last - 1);
  RC_ASSERT(std::fabs(move) < 0.6);
}

}  // namespace
}  // namespace thetagate::engine
