// The Evaluator's pieces one by one: each strategy (evaluator.h,
// EvaluationStrategy) on a recurrence of its shape, checked against a
// closed form or GMP; the bottom-up sweeps' kept errors; the precision
// ladder as the Evaluator uses it. Sources are named beside each check.
#include <gmp.h>
#include <gtest/gtest.h>

#include <functional>
#include <map>
#include <string>

#include "tests/support/diagnostic_matchers.h"
#include "tests/support/test_support.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/parser.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {
namespace {

using test_support::Mpz;

using test_support::located_error_of;

std::string gmp_text(const BigInt& n) {
  Mpz m;
  mpz_set(m.get(), n.backend().data());
  return m.str();
}

// Only work limits, never the clock: results must not depend on the load.
Budget work_only() {
  Budget b;
  b.max_seconds = 0;
  return b;
}

TEST(EvaluatorStrategy, FullHistorySumOfAllEarlierValuesIsAPowerOfTwo) {
  // T(n) = 1 + T(0) + ... + T(n - 1), T(0) = 1 gives T(n) = 2^n (from
  // memory; by induction, 1 + (2^0 + ... + 2^(n-1)) = 2^n). Reference: GMP's
  // mpz_ui_pow_ui.
  Evaluator ev(recurrence_from_text("T(n) = 1 + sum(k, 0, n - 1, T(k))\nT(0) = 1"), work_only());
  EXPECT_EQ(ev.strategy(), EvaluationStrategy::kFullHistory);
  for (unsigned long n : {0ul, 1ul, 10ul, 64ul, 3000ul}) {
    Mpz expected;
    mpz_ui_pow_ui(expected.get(), 2, n);
    EXPECT_EQ(ev.value_at(BigInt(n)).str(), expected.str()) << "n = " << n;
  }
  // Sizes below the sweep's end are kept: asking again sweeps nothing.
  uint64_t steps = ev.stats().steps;
  Mpz expected;
  mpz_ui_pow_ui(expected.get(), 2, 1234);
  EXPECT_EQ(ev.value_at(BigInt(1234)).str(), expected.str());
  EXPECT_EQ(ev.stats().steps, steps);
}

TEST(EvaluatorStrategy, SlidingWindowKeepsAnUndefinedSizesErrorUntilItIsNeeded) {
  // Only T(1) is given, so T(0) (which would call T(-2)) is undefined and so
  // is every even size; odd sizes are fine. T(2k - 1) = 1 + 3 + ... + (2k - 1)
  // = k^2 (from memory: the sum of the first k odd numbers).
  Evaluator ev(recurrence_from_text("T(n) = T(n - 2) + n\nT(1) = 1"), work_only());
  EXPECT_EQ(ev.strategy(), EvaluationStrategy::kSlidingWindow);
  EXPECT_EQ(ev.value_at(BigInt(999999)).str(), "250000000000");  // k = 500000
  EXPECT_EQ(
      located_error_of([&] { ev.value_at(BigInt(1000000)); }),
      "<recurrence>:1:8: T(n - 2) at n = 0 calls T(-2), which is not a size; it is reached "
      "from n = 2 (T(n - 2) at n = 2 is T(0)), and no base case covers that size [hint: add a base "
      "case for n < 3, e.g. T(n) = 1 if n < 3 (once base cases are written, no other small "
      "size is assumed: see 'Base cases' in docs/language.md)]");
  // Below the ring's two kept sizes: the sweep starts over from 0 and meets
  // the same values.
  EXPECT_EQ(ev.value_at(BigInt(11)).str(), "36");  // k = 6
  // T(8) needs T(0), which is undefined: the error is T(0)'s, located at
  // its call and kept by every even size.
  EXPECT_EQ(
      located_error_of([&] { ev.value_at(BigInt(8)); }),
      "<recurrence>:1:8: T(n - 2) at n = 0 calls T(-2), which is not a size; it is reached "
      "from n = 2 (T(n - 2) at n = 2 is T(0)), and no base case covers that size [hint: add a base "
      "case for n < 3, e.g. T(n) = 1 if n < 3 (once base cases are written, no other small "
      "size is assumed: see 'Base cases' in docs/language.md)]");
}

TEST(EvaluatorStrategy, SlidingWindowOfThreeMatchesGmpLucasNumbers) {
  // L(n) = L(n - 1) + L(n - 2) written with a third, unused-width call: the
  // window spans the largest c. Reference: GMP's mpz_lucnum_ui (GMP manual,
  // "Number Theoretic Functions"); L(n - 1) + L(n - 3) + L(n - 2) - L(n - 3).
  Evaluator ev(
      recurrence_from_text(
          "L(n) = L(n - 1) + L(n - 2) + L(n - 3) - L(n - 3)\nL(0) = 2\nL(1) = 1\nL(2) = 3"),
      work_only());
  EXPECT_EQ(ev.strategy(), EvaluationStrategy::kSlidingWindow);
  for (unsigned long n : {0ul, 2ul, 3ul, 90ul, 5000ul}) {
    Mpz expected;
    mpz_lucnum_ui(expected.get(), n);
    EXPECT_EQ(ev.value_at(BigInt(n)).str(), expected.str()) << "n = " << n;
  }
}

TEST(EvaluatorStrategy, TopDownPathsAgreeWithGmpOnARecurrenceOverTwoPrimes) {
  // T(n) = T(floor(n/2)) + T(floor(n/3)) + n, T(0) = 0: the reference is the
  // same recurrence computed directly in GMP with a std::map memo (common
  // practice), independently of both evaluator paths.
  auto recurrence = recurrence_from_text("T(n) = T(floor(n/2)) + T(floor(n/3)) + n\nT(0) = 0");
  Evaluator fast(recurrence, work_only());
  Evaluator general(recurrence, work_only(), EvaluationPath::kGeneral);
  EXPECT_EQ(fast.strategy(), EvaluationStrategy::kIntegerKernel);
  EXPECT_EQ(general.strategy(), EvaluationStrategy::kTopDown);
  const BigInt n = (BigInt(1) << 300) + 7;
  std::map<std::string, Mpz> memo;
  std::function<Mpz(const Mpz&)> t = [&](const Mpz& m) -> Mpz {
    if (mpz_sgn(m.get()) == 0) return Mpz("0");
    auto it = memo.find(m.str());
    if (it != memo.end()) return it->second;
    Mpz half, third, sum;
    mpz_fdiv_q_ui(half.get(), m.get(), 2);
    mpz_fdiv_q_ui(third.get(), m.get(), 3);
    Mpz a = t(half), b = t(third);
    mpz_add(sum.get(), a.get(), b.get());
    mpz_add(sum.get(), sum.get(), m.get());
    memo.emplace(m.str(), sum);
    return sum;
  };
  Mpz size(gmp_text(n));
  std::string expected = t(size).str();
  EXPECT_EQ(fast.value_at(n).str(), expected);
  EXPECT_EQ(general.value_at(n).str(), expected);
}

TEST(EvaluatorPrecision, AFloorTooWideAtTheStartIsRedoneAtDoubledPrecision) {
  // floor(sqrt(2) * 10^60): about 200 bits, so 128-bit intervals cannot
  // settle the floor and the evaluator raises once. Reference: GMP's exact
  // mpz_sqrt of 2 * 10^120 (GMP manual, "Integer Roots").
  Evaluator ev(recurrence_from_text("T(n) = T(n/2) + 1\nT(1) = 0"), work_only());
  SourceText source = SourceText::whole("<bound>", "floor(sqrt(2) * 10^60)");
  ExprPtr e = parse_expression(source);
  Value v = ev.evaluate(*e, source, BigInt(0));
  Mpz square("2" + std::string(120, '0')), root;
  mpz_sqrt(root.get(), square.get());
  EXPECT_EQ(v.str(), root.str());
  EXPECT_EQ(ev.stats().precision_retries, 1u);
}

TEST(EvaluatorPrecision, EqualIrrationalSidesRunOutOfPrecisionNeverGuessed) {
  // sqrt(2)^2 against 2: equal, so no interval separates them (common
  // practice); the ladder ends in PrecisionExhausted, a precision limit.
  Budget budget = work_only();
  budget.max_precision_bits = 1024;
  Evaluator ev(recurrence_from_text("T(n) = T(n/2) + 1\nT(1) = 0"), budget);
  SourceText a_source = SourceText::whole("<a>", "sqrt(2) * sqrt(2)");
  SourceText b_source = SourceText::whole("<b>", "2");
  ExprPtr a = parse_expression(a_source), b = parse_expression(b_source);
  try {
    ev.compare_at(*a, a_source, *b, b_source, BigInt(5));
    FAIL() << "expected PrecisionExhausted";
  } catch (const PrecisionExhausted& e) {
    EXPECT_EQ(e.limit(), Limit::kPrecision);
    EXPECT_NE(std::string(e.what()).find("even at 1024 bits"), std::string::npos) << e.what();
  }
  // 128 -> 256 -> 512 -> 1024.
  EXPECT_EQ(ev.stats().precision_retries, 3u);
}

// T(n) = n sqrt(2) exactly, so T(n) against n sqrt(2) is equal irrational
// sides (common practice: no interval separates them). The comparison must
// climb the whole ladder and end in PrecisionExhausted: T(n)'s own
// evaluation, reached from inside the comparison, must neither restart the
// precision nor keep intervals made at a lower one (before, the window
// strategy looped here without end and without charging a step).
TEST(EvaluatorPrecision, ComparingAnIntervalTWithAnEqualSideClimbsTheWholeLadder) {
  const char* recurrences[] = {
      "T(n) = T(n - 1) + sqrt(2)\nT(0) = 0",                                   // sliding window
      "T(n) = T(n - 1) + sqrt(2) if n > 0\nT(0) = 0\nT(n) = T(n/2) if n < 0",  // top-down
  };
  for (const char* text : recurrences) {
    Budget budget = work_only();
    budget.max_precision_bits = 1024;
    Evaluator ev(recurrence_from_text(text), budget);
    SourceText t_source = SourceText::whole("<t>", "T(n)");
    SourceText g_source = SourceText::whole("<g>", "n sqrt(2)");
    ExprPtr t = parse_expression(t_source), g = parse_expression(g_source);
    EXPECT_THROW(ev.compare_at(*t, t_source, *g, g_source, BigInt(10)), PrecisionExhausted) << text;
    // 128 -> 256 -> 512 -> 1024, each attempt re-evaluating T at its precision.
    EXPECT_EQ(ev.stats().precision_retries, 3u) << text;
    EXPECT_LE(ev.stats().steps, 4u * 11u) << text;
  }
}

}  // namespace
}  // namespace thetagate::engine
