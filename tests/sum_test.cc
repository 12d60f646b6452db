// Sums over earlier values (sum(k, lo, hi, body)), harmonic drivers, powers
// after a factor (n 2^n), exact critical exponents and the messages for
// features the language lacks. Exact values are checked against GMP
// rationals computed here from the published closed forms.
#include <gmp.h>
#include <gtest/gtest.h>
#include <rapidcheck/gtest.h>

#include <string>
#include <vector>

#include "verifier/derivation/classify.h"
#include "verifier/derivation/derive.h"
#include "verifier/derivation/growth.h"
#include "verifier/derivation/theorems/akra_bazzi.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {
namespace {

// A plain GMP rational, independent of Boost.Multiprecision.
class Mpq {
 public:
  Mpq() { mpq_init(v_); }
  Mpq(long num, unsigned long den) {
    mpq_init(v_);
    mpq_set_si(v_, num, den);
    mpq_canonicalize(v_);
  }
  Mpq(const Mpq& o) {
    mpq_init(v_);
    mpq_set(v_, o.v_);
  }
  Mpq& operator=(const Mpq& o) {
    mpq_set(v_, o.v_);
    return *this;
  }
  ~Mpq() { mpq_clear(v_); }
  friend Mpq operator+(const Mpq& a, const Mpq& b) {
    Mpq r;
    mpq_add(r.v_, a.v_, b.v_);
    return r;
  }
  friend Mpq operator-(const Mpq& a, const Mpq& b) {
    Mpq r;
    mpq_sub(r.v_, a.v_, b.v_);
    return r;
  }
  friend Mpq operator*(const Mpq& a, const Mpq& b) {
    Mpq r;
    mpq_mul(r.v_, a.v_, b.v_);
    return r;
  }
  std::string str() const {
    char* s = mpq_get_str(nullptr, 10, v_);
    std::string out(s);
    void (*release)(void*, size_t);
    mp_get_memory_functions(nullptr, nullptr, &release);
    release(s, out.size() + 1);
    return out;
  }

 private:
  mpq_t v_;
};

Mpq q(long n) { return Mpq(n, 1); }

// H_0 .. H_max with GMP.
std::vector<Mpq> harmonic(long max) {
  std::vector<Mpq> h(max + 1);
  for (long k = 1; k <= max; ++k) h[k] = h[k - 1] + Mpq(1, k);
  return h;
}

std::string value_text(Evaluator& ev, long n) { return ev.value_at(BigInt(n)).str(); }

Derivation derived(const std::string& text) { return derive(*recurrence_from_text(text)); }

std::string all_steps(const Derivation& d) {
  std::string s;
  for (const auto& x : d.steps) s += x + "\n";
  for (const auto& x : d.failed_hypotheses) s += x + "\n";
  return s;
}

std::string error_of(const std::string& text) {
  try {
    recurrence_from_text(text);
  } catch (const InputError& e) {
    return format_diagnostic(e.diagnostic());
  }
  return "";
}

constexpr const char* kQuicksort = "C(n) = n - 1 + (2/n) sum(k, 0, n - 1, C(k)); C(0) = 0";

TEST(SumSyntax, ParsesAndPrintsBack) {
  SourceText s = SourceText::whole("<e>", "n - 1 + (2/n) sum(k, 0, n - 1, T(k))");
  ExprPtr e = parse_expression(s);
  std::string printed = print(*e);
  EXPECT_NE(printed.find("sum(k, 0, n - 1, T(k))"), std::string::npos) << printed;
  ExprPtr again = parse_expression(SourceText::whole("<p>", printed));
  EXPECT_TRUE(same_tree(*e, *again)) << printed;
}

TEST(SumSyntax, VariableExistsOnlyInsideTheBody) {
  std::string error = error_of("T(n) = k + sum(k, 1, n, 1/k)");
  EXPECT_NE(error.find("unknown name 'k'"), std::string::npos) << error;
}

TEST(SumSyntax, UnsupportedSpellingsSayWhatIsMissing) {
  struct Case {
    const char* text;
    const char* message;
  } cases[] = {
      {"T(n) = n + Σ T(k)", "summation sign"},
      {"T(n) = n + ∑ T(k)", "summation sign"},
      {"T(n) = n + sum(T(k), k = 0..n-1)", "'..' are not part of the language"},
      {"T(n) = n + sum_{k=0}^{n-1} T(k)", "TeX style"},
      {"T(n) = n + sum(k = 0, n - 1, T(k))", "the name of its variable"},
      {"T(n) = U(n-1) + 1\nU(n) = T(n-1) + 1", "mutual recursion"},
  };
  for (const Case& c : cases) {
    std::string error = error_of(c.text);
    EXPECT_NE(error.find(c.message), std::string::npos) << c.text << "\n" << error;
    EXPECT_EQ(error.find("unexpected character"), std::string::npos) << error;
    // Every one of them is located and carries a hint.
    EXPECT_NE(error.find("<recurrence>:"), std::string::npos) << error;
    EXPECT_NE(error.find("hint"), std::string::npos) << error;
  }
  EXPECT_NE(error_of("T(n) = n + Σ T(k)").find("sum(k, lo, hi, body)"), std::string::npos);
}

TEST(SumEvaluation, QuicksortAverageMatchesKnuth) {
  // Knuth, TAOCP vol. 3, §5.2.2; Sedgewick & Flajolet, An Introduction to the
  // Analysis of Algorithms, ch. 1: C(n) = 2(n+1)H_n - 4n for n - 1
  // comparisons per partitioning stage.
  Evaluator ev(recurrence_from_text(kQuicksort));
  EXPECT_TRUE(ev.full_history());
  EXPECT_FALSE(ev.uses_integer_kernel());
  std::vector<Mpq> h = harmonic(1500);
  for (long n = 0; n <= 1500; n += (n < 40 ? 1 : 97)) {
    Mpq expected = q(2) * q(n + 1) * h[n] - q(4 * n);
    EXPECT_EQ(value_text(ev, n), expected.str()) << "n = " << n;
  }
}

TEST(SumEvaluation, RunningSumsCostConstantStepsPerSize) {
  // O(1) amortised: one case line and one new term per size, for a sum
  // from a constant and for one whose lower limit moves too.
  Evaluator ev(recurrence_from_text("T(n) = n + sum(k, 0, n - 1, T(k)) mod 1009; T(0) = 1"));
  ev.value_at(BigInt(20000));
  EXPECT_LE(ev.stats().steps, 2u * 20001u + 64u);
  EXPECT_GE(ev.stats().steps, 20001u);
  Evaluator window(
      recurrence_from_text("T(n) = n + sum(k, floor(n/3), n - 1, T(k)) mod 1009; T(0) = 1"));
  window.value_at(BigInt(20000));
  EXPECT_LE(window.stats().steps, 3u * 20001u + 4u * 64u * 2u);
  // Reference: the same values term by term (common practice).
  std::vector<long> t(2001);
  t[0] = 1;
  for (long n = 1; n <= 2000; ++n) {
    long s = 0;
    for (long k = n / 3; k <= n - 1; ++k) s += t[k];
    t[n] = n + s % 1009;
  }
  for (long n = 0; n <= 2000; n += 37) EXPECT_EQ(value_text(window, n), std::to_string(t[n]));
}

TEST(SumEvaluation, SelectingTheMinimumMatchesTheClosedForm) {
  // Quickselect for rank 1: the pivot's rank r is uniform and the search
  // continues in the r - 1 smaller keys. From memory (and Knuth's C_{n,m}
  // at m = 1): C(n) = 2(n - H_n).
  Evaluator ev(recurrence_from_text("C(n) = n - 1 + (1/n) sum(k, 0, n - 1, C(k)); C(0) = 0"));
  std::vector<Mpq> h = harmonic(600);
  for (long n = 0; n <= 600; n += 7) {
    EXPECT_EQ(value_text(ev, n), (q(2) * (q(n) - h[n])).str()) << "n = " << n;
  }
}

TEST(SumEvaluation, MovingLowerLimitMatchesTermByTerm) {
  // The larger-side bound of quickselect sums T(floor(n/2)) .. T(n-1): a
  // window whose both ends move. Reference: the same recurrence in GMP,
  // term by term.
  Evaluator ev(recurrence_from_text(
      "T(n) = n - 1 + (2/n) sum(k, floor(n/2), n - 1, T(k)) if n >= 2; T(n) = 0 otherwise"));
  std::vector<Mpq> t(401);
  for (long n = 2; n <= 400; ++n) {
    Mpq s;
    for (long k = n / 2; k <= n - 1; ++k) s = s + t[k];
    t[n] = q(n - 1) + Mpq(2, n) * s;
  }
  for (long n = 0; n <= 400; n += 3) EXPECT_EQ(value_text(ev, n), t[n].str()) << "n = " << n;
}

TEST(SumEvaluation, BodyThatDependsOnNIsAddedTermByTerm) {
  // sum(k, 1, n, (n - k) k) = (n^3 - n)/6 (common practice).
  Evaluator ev(recurrence_from_text("T(n) = sum(k, 1, n, (n - k) k) + 0 T(n - 1); T(0) = 0"));
  for (long n = 1; n <= 60; n += 11) {
    EXPECT_EQ(value_text(ev, n), std::to_string((n * n * n - n) / 6)) << "n = " << n;
  }
}

TEST(SumEvaluation, HarmonicNumbersInABoundSide) {
  // A bound side may hold a sum; an evaluator of any recurrence evaluates it.
  Evaluator ev(recurrence_from_text("T(n) = T(n - 1) + 1/n; T(0) = 0"));
  std::vector<Mpq> h = harmonic(300);
  SourceText side = SourceText::whole("<bound>", "sum(j, 1, n, 1/j)");
  ExprPtr e = parse_expression(side);
  for (long n = 1; n <= 300; n += 13) {
    EXPECT_EQ(ev.evaluate(*e, side, BigInt(n)).str(), h[n].str());
    // T(n) = H_n (common practice: the harmonic numbers' own recurrence).
    EXPECT_EQ(value_text(ev, n), h[n].str());
  }
}

TEST(SumEvaluation, ACallThatDoesNotShrinkIsAnError) {
  Evaluator ev(recurrence_from_text("T(n) = 1 + sum(k, 0, n, T(k))"));
  try {
    ev.value_at(BigInt(3));
    FAIL() << "T(n) inside its own sum must be refused";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("does not shrink"), std::string::npos) << e.what();
  }
}

TEST(SumDerivation, QuicksortIsTwoNLnN) {
  // Knuth, TAOCP vol. 3, §5.2.2: C(n) ~ 2 n ln n.
  Derivation d = derived(kQuicksort);
  EXPECT_EQ(d.derived, "n lg n") << all_steps(d);
  EXPECT_EQ(d.method, "full-history recurrence (summation factor)");
  std::string steps = all_steps(d);
  EXPECT_NE(steps.find("T(n) ~ 2 n ln n"), std::string::npos) << steps;
  EXPECT_NE(steps.find("1.386294"), std::string::npos) << steps;  // 2 ln 2
  EXPECT_NE(steps.find("n T(n) = (n + 1) T(n-1) + g(n)"), std::string::npos) << steps;
  EXPECT_NE(steps.find("g(n) = n f(n) - (n-1) f(n-1) ~ 2 n"), std::string::npos) << steps;
}

TEST(SumDerivation, SelectingTheMinimumIsTwoN) {
  // 2(n - H_n) ~ 2n (from memory, as above).
  Derivation d = derived("C(n) = n - 1 + (1/n) sum(k, 0, n - 1, C(k)); C(0) = 0");
  EXPECT_EQ(d.derived, "n") << all_steps(d);
  EXPECT_NE(all_steps(d).find("T(n) ~ 2 n"), std::string::npos) << all_steps(d);
}

TEST(SumDerivation, QuadraticDriverGivesThreeNSquared) {
  // Common practice: C n^2 = n^2 + (2/n) C n^3/3 gives C = 3.
  Derivation d = derived("T(n) = n^2 + (2/n) sum(k, 0, n - 1, T(k)); T(0) = 0");
  EXPECT_EQ(d.derived, "n^2") << all_steps(d);
  EXPECT_NE(all_steps(d).find("T(n) ~ 3 n^2"), std::string::npos) << all_steps(d);
}

TEST(SumDerivation, OtherShapesSayWhy) {
  Derivation d = derived("T(n) = n + (2/n^2) sum(k, 0, n - 1, k T(k)); T(0) = 0");
  EXPECT_FALSE(d.derived_class());
  EXPECT_NE(all_steps(d).find("c/n"), std::string::npos) << all_steps(d);
  d = derived("T(n) = n - 1 + (2/n) sum(k, floor(n/2), n - 1, T(k)) if n >= 2; T(n) = 0 otherwise");
  EXPECT_FALSE(d.derived_class());
  EXPECT_NE(all_steps(d).find("from a constant"), std::string::npos) << all_steps(d);
}

TEST(SubtractDerivation, HarmonicDriverIsLogarithmic) {
  // T(n) = T(n-1) + 1/n is H_n ~ ln n (common practice).
  Derivation d = derived("T(n) = T(n - 1) + 1/n; T(0) = 0");
  EXPECT_EQ(d.derived, "lg n") << all_steps(d);
  EXPECT_NE(all_steps(d).find("T(n) ~ ln n"), std::string::npos) << all_steps(d);
  d = derived("T(n) = T(n - 1) + lg n; T(1) = 0");
  EXPECT_EQ(d.derived, "n lg n") << all_steps(d);
  EXPECT_NE(all_steps(d).find("T(n) ~ n lg n"), std::string::npos) << all_steps(d);
  d = derived("T(n) = T(n - 1) + 1/n^2; T(0) = 1");
  EXPECT_EQ(d.derived, "1") << all_steps(d);
  d = derived("T(n) = T(n - 2) + lg n/n; T(1) = 0; T(0) = 0");
  EXPECT_EQ(d.derived, "lg^2 n") << all_steps(d);
}

TEST(PowerAfterFactor, JuxtapositionMultiplies) {
  auto parsed = [](const std::string& text) {
    return parse_expression(SourceText::whole("<e>", text));
  };
  EXPECT_TRUE(same_tree(*parsed("n 2^n"), *parsed("n * 2^n")));
  EXPECT_TRUE(same_tree(*parsed("n^2 3^n"), *parsed("n^2 * 3^n")));
  EXPECT_TRUE(same_tree(*parsed("n lg n 2^n"), *parsed("n * lg(n) * 2^n")));
  try {
    parsed("n 3");
    FAIL() << "a bare number after a factor stays an error";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("a number directly after a factor"), std::string::npos);
  }
}

TEST(PowerAfterFactor, BoundsClassify) {
  for (const char* text : {"Theta(n 2^n)", "Theta(n 3^n)", "O(n^2 2^n)"}) {
    Bound b = parse_bound(SourceText::whole("<bound>", text));
    Classification c = classify(*b.growth);
    ASSERT_TRUE(c) << text << ": " << c.reason;
    EXPECT_FALSE(c.growth->is_subexponential()) << text;
  }
}

// Exponents the derivations produce, and bases of exponentials.
rc::Gen<RealNumber> exponent_gen() {
  return rc::gen::oneOf(
      rc::gen::map(rc::gen::pair(rc::gen::inRange(-6, 7), rc::gen::inRange(1, 5)),
                   [](std::pair<int, int> p) { return RealNumber(Rational(p.first, p.second)); }),
      rc::gen::map(rc::gen::elementOf(std::vector<int>{3, 5, 6, 7, 10}),
                   [](int a) { return RealNumber::log(2, a); }),
      rc::gen::map(rc::gen::elementOf(std::vector<int>{2, 5, 7}),
                   [](int a) { return RealNumber::log(3, a); }),
      rc::gen::just(
          critical_exponent({{Rational(1), Rational(1, 2)}, {Rational(1), Rational(1, 4)}})),
      rc::gen::just(
          critical_exponent({{Rational(2), Rational(1, 3)}, {Rational(1), Rational(1, 9)}})));
}

rc::Gen<RealNumber> base_gen() {
  return rc::gen::oneOf(
      rc::gen::just(RealNumber(1L)),
      rc::gen::map(
          rc::gen::pair(rc::gen::inRange(2, 9), rc::gen::inRange(1, 4)),
          [](std::pair<int, int> p) { return RealNumber(Rational(p.first + p.second, p.second)); }),
      rc::gen::just(RealNumber::algebraic(Polynomial({-1, -1, 1}), 1, 2)),  // golden ratio
      rc::gen::just(RealNumber::root(2, 2)));
}

RC_GTEST_PROP(GrowthRoundTrip, PrintedClassesParseBackAsBounds, ()) {
  GrowthClass g;
  g.rho = *base_gen();
  g.alpha = *exponent_gen();
  g.beta = RealNumber(Rational(*rc::gen::inRange(-3, 4), *rc::gen::inRange(1, 3)));
  g.gamma = RealNumber(Rational(*rc::gen::inRange(-2, 3)));
  std::string text = to_string(g);
  RC_TAG(text);
  Bound b = parse_bound(SourceText::whole("<bound>", "Theta(" + text + ")"));
  Classification c = classify(*b.growth);
  RC_ASSERT(c.growth.has_value());
  RC_ASSERT(compare(*c.growth, g) == 0);
}

TEST(GrowthRoundTrip, DerivedClassesParseBack) {
  for (const char* text : {
           kQuicksort,
           "T(n) = T(n/2) + T(n/4) + 1",
           "T(n) = 2T(n - 1) + n",
           "T(n) = T(n - 1) + T(n - 2) + 1; T(1) = 1; T(0) = 1",
           "T(n) = 7T(n/2) + n^2",
           "T(n) = 2T(n/2) + n lg n",
           "T(n) = T(n - 1) + 1/n; T(0) = 0",
           "T(n) = 2T(n - 1) + 2^n; T(0) = 1",
       }) {
    Derivation d = derived(text);
    ASSERT_TRUE(d.derived_class()) << text << "\n" << all_steps(d);
    Bound b = parse_bound(SourceText::whole("<bound>", "Theta(" + d.derived + ")"));
    Classification c = classify(*b.growth);
    ASSERT_TRUE(c) << d.derived << ": " << c.reason;
    EXPECT_EQ(compare(*c.growth, *d.growth), 0) << text << " -> " << d.derived;
  }
}

TEST(CriticalExponent, PowersOfOneBaseAreSolvedExactly) {
  // T(n/2) + T(n/4): x + x^2 = 1 with x = 2^-p, so p = lg of the golden ratio
  // (Akra and Bazzi, 1998: sum a_i b_i^p = 1).
  RealNumber p = critical_exponent({{Rational(1), Rational(1, 2)}, {Rational(1), Rational(1, 4)}});
  EXPECT_EQ(p.kind(), RealNumber::Kind::kLogAlgebraic);
  EXPECT_EQ(p.str(), "lg((1 + sqrt(5))/2)");
  EXPECT_EQ(p.digits(), "0.694242…");
  Bound b = parse_bound(SourceText::whole("<bound>", "Theta(n^(lg((1 + sqrt(5))/2)))"));
  Classification c = classify(*b.growth);
  ASSERT_TRUE(c);
  EXPECT_EQ(compare(c.growth->alpha, p), 0);  // exact, not by ever finer intervals
  // lg 1.6180339887... = 0.6942419136... (from memory).
  EXPECT_GT(compare(p, RealNumber(Rational(694241, 1000000))), 0);
  EXPECT_LT(compare(p, RealNumber(Rational(694242, 1000000))), 0);
  // Over base 3: 2 (1/3)^p + (1/9)^p = 1, so 3^p = 1 + sqrt(2).
  RealNumber p3 = critical_exponent({{Rational(2), Rational(1, 3)}, {Rational(1), Rational(1, 9)}});
  EXPECT_EQ(p3.kind(), RealNumber::Kind::kLogAlgebraic);
  EXPECT_EQ(p3.str().rfind("log(3, ", 0), 0u) << p3.str();
  EXPECT_EQ(compare(p3, RealNumber::log_real(3, RealNumber(1L) + RealNumber::root(2, 2))), 0);
  // b_i without a common base keep a certified enclosure.
  RealNumber p23 =
      critical_exponent({{Rational(1), Rational(1, 2)}, {Rational(1), Rational(1, 3)}});
  EXPECT_EQ(p23.kind(), RealNumber::Kind::kEnclosed);
}

TEST(CriticalExponent, GoldenClaimAgreesExactly) {
  Derivation d = derived("T(n) = T(n/2) + T(n/4) + 1");
  EXPECT_EQ(d.derived, "n^(lg((1 + sqrt(5))/2))") << all_steps(d);
  ClaimComparison c = compare_with_derivation(
      d, parse_bound(SourceText::whole("<b>", "Theta(n^(lg((1 + sqrt(5))/2)))")));
  EXPECT_EQ(c.agreement, Agreement::kSame) << c.detail;
  c = compare_with_derivation(d, parse_bound(SourceText::whole("<b>", "O(n^0.6942)")));
  EXPECT_EQ(c.agreement, Agreement::kContradicts) << c.detail;
}

}  // namespace
}  // namespace thetagate::engine
