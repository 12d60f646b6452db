// The exact evaluator against published closed forms and reference
// libraries. Each outside check names its source beside it (see
// docs/sources.md); "[calc]" means the value follows from the stated
// closed form by exact arithmetic.
#include "verifier/evaluation/evaluator.h"

#include <gmp.h>
#include <gtest/gtest.h>
#include <mpfr.h>

#include <bit>
#include <cstdint>
#include <map>
#include <random>
#include <string>
#include <vector>

#include "tests/support/diagnostic_matchers.h"
#include "verifier/evaluation/size_expression.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {
namespace {

using test_support::located_error_of;

BigInt pow2(uint64_t k) { return BigInt(1) << k; }

// ceil(lg n) for n >= 1, by doubling (independent of the engine's bit_length).
uint64_t ceil_lg(const BigInt& n) {
  uint64_t c = 0;
  BigInt p = 1;
  while (p < n) {
    p <<= 1;
    ++c;
  }
  return c;
}

BigInt integer_of(const Value& v) {
  EXPECT_TRUE(v.is_integer()) << v.str();
  return v.is_integer() ? v.integer() : BigInt(-1);
}

std::shared_ptr<const Recurrence> rec(const std::string& text) {
  return recurrence_from_text(text);
}

// Suchenek's closed form for the merge sort worst case.
BigInt merge_sort_worst(const BigInt& n) {
  uint64_t c = ceil_lg(n);
  return n * c - pow2(c) + 1;
}

const char kMergeSort[] = "W(n) = W(ceil(n/2)) + W(floor(n/2)) + n - 1\nW(1) = 0";

TEST(Evaluator, MergeSortWorstCaseMatchesSucheneksFormExhaustively) {
  Evaluator ev(rec(kMergeSort));
  for (int64_t n = 1; n <= 2000; ++n) {
    // M. A. Suchenek, "Elementary yet precise worst-case analysis of
    // MergeSort", arXiv:1702.08443, 2017: W(n) = n⌈lg n⌉ − 2^⌈lg n⌉ + 1.
    ASSERT_EQ(integer_of(ev.value_at(BigInt(n))), merge_sort_worst(BigInt(n))) << "n = " << n;
  }
  EXPECT_EQ(integer_of(ev.value_at(BigInt(37))), 159);  // [calc] from Suchenek's form
}

TEST(Evaluator, MergeSortWorstCaseMatchesSucheneksFormAtWordEdgesAndBeyond) {
  Evaluator ev(rec(kMergeSort));
  for (const BigInt& n : {BigInt(pow2(32) - 1), pow2(32), BigInt(pow2(64) - 1), pow2(64),
                          BigInt(pow2(64) + 1), BigInt(pow2(4096) + 12345)}) {
    // Suchenek 2017 (arXiv:1702.08443), closed form of W(n).
    EXPECT_EQ(integer_of(ev.value_at(n)), merge_sort_worst(n)) << "n = " << n;
  }
  // Memoised over distinct arguments: two per level, not n of them.
  EXPECT_LT(ev.stats().memo_entries, 30000u);
}

TEST(Evaluator, SplitAtHalfWithLinearCostMatchesClosedForm) {
  // [calc] C(1) = 1, C(n) = C(⌊n/2⌋) + C(⌈n/2⌉) + n → n⌈lg n⌉ + 2n − 2^⌈lg n⌉.
  Evaluator ev(rec("C(n) = C(floor(n/2)) + C(ceil(n/2)) + n; C(1) = 1"));
  auto closed = [](const BigInt& n) {
    uint64_t c = ceil_lg(n);
    return BigInt(n * c + 2 * n - pow2(c));
  };
  for (int64_t n = 1; n <= 2000; ++n) {
    ASSERT_EQ(integer_of(ev.value_at(BigInt(n))), closed(BigInt(n))) << "n = " << n;
  }
  for (const BigInt& n :
       {BigInt(pow2(64) - 1), pow2(64), BigInt(pow2(64) + 1), BigInt(pow2(4096) + 12345)}) {
    EXPECT_EQ(integer_of(ev.value_at(n)), closed(n)) << "n = " << n;
  }
}

TEST(Evaluator, TowerOfHanoiMatchesConcreteMathematics) {
  Evaluator ev(rec("T(n) = 2T(n-1) + 1; T(0) = 0"));
  EXPECT_TRUE(ev.bottom_up());
  for (int64_t n = 0; n <= 2000; ++n) {
    // Graham, Knuth, Patashnik, Concrete Mathematics, 2nd ed., ch. 1: 2^n − 1.
    ASSERT_EQ(integer_of(ev.value_at(BigInt(n))), pow2(static_cast<uint64_t>(n)) - 1)
        << "n = " << n;
  }
}

TEST(Evaluator, JosephusWithEvenOddCaseLinesMatchesConcreteMathematics) {
  Evaluator ev(
      rec("J(n) = 2J(n/2) - 1 if n even\n"
          "J(n) = 2J((n-1)/2) + 1 if n odd\n"
          "J(1) = 1"));
  // Graham, Knuth, Patashnik, Concrete Mathematics, 2nd ed., ch. 1: J(40) = 17.
  EXPECT_EQ(integer_of(ev.value_at(BigInt(40))), 17);
  // Same book, ch. 1: J(2^m + l) = 2l + 1 for 0 <= l < 2^m.
  for (uint64_t m = 0; m <= 11; ++m) {
    for (uint64_t l = 0; l < (uint64_t{1} << m); ++l) {
      BigInt n = pow2(m) + l;
      ASSERT_EQ(integer_of(ev.value_at(n)), BigInt(2 * l + 1)) << "n = " << n;
    }
  }
  for (uint64_t m : {63u, 64u, 4096u}) {
    for (const BigInt& l : {BigInt(0), BigInt(1), BigInt(12345), BigInt(pow2(m) - 1)}) {
      EXPECT_EQ(integer_of(ev.value_at(pow2(m) + l)), 2 * l + 1) << "m = " << m << ", l = " << l;
    }
  }
}

TEST(Evaluator, BinarySearchDepthMatchesStdBitWidth) {
  // [mem; calc] T(1) = 1, T(n) = T(⌊n/2⌋) + 1 → ⌊lg n⌋ + 1, which is
  // std::bit_width(n) (standard library reference).
  Evaluator ev(rec("T(n) = T(floor(n/2)) + 1; T(1) = 1"));
  for (uint64_t n = 1; n <= 5000; ++n) {
    ASSERT_EQ(integer_of(ev.value_at(BigInt(n))), std::bit_width(n)) << "n = " << n;
  }
  for (uint64_t n : {(uint64_t{1} << 31) - 1, uint64_t{1} << 31, (uint64_t{1} << 32) - 1,
                     uint64_t{1} << 32, (uint64_t{1} << 32) + 1, (uint64_t{1} << 63) - 1,
                     uint64_t{1} << 63, ~uint64_t{0} - 1, ~uint64_t{0}}) {
    EXPECT_EQ(integer_of(ev.value_at(BigInt(n))), std::bit_width(n)) << "n = " << n;
  }
  // One past the word, where <bit> stops: ⌊lg n⌋ + 1 = 65 [calc].
  EXPECT_EQ(integer_of(ev.value_at(pow2(64))), 65);
  EXPECT_EQ(integer_of(ev.value_at(pow2(64) + 1)), 65);
  EXPECT_EQ(integer_of(ev.value_at(pow2(4096) + 12345)), 4097);
}

TEST(Evaluator, BitCountRecurrenceMatchesStdPopcount) {
  // s(0) = 0, s(n) = s(⌊n/2⌋) + (n mod 2) against std::popcount (reference).
  Evaluator ev(rec("s(n) = s(floor(n/2)) + (n mod 2); s(0) = 0"));
  for (uint64_t n = 0; n <= 5000; ++n) {
    ASSERT_EQ(integer_of(ev.value_at(BigInt(n))), std::popcount(n)) << "n = " << n;
  }
  std::mt19937_64 rng(20240917);
  std::vector<uint64_t> sizes = {
      (uint64_t{1} << 32) - 1, uint64_t{1} << 32, (uint64_t{1} << 63) - 1,
      uint64_t{1} << 63,       ~uint64_t{0},      0xAAAAAAAAAAAAAAAAull};
  for (int i = 0; i < 200; ++i) sizes.push_back(rng());
  for (uint64_t n : sizes) {
    EXPECT_EQ(integer_of(ev.value_at(BigInt(n))), std::popcount(n)) << "n = " << n;
  }
}

TEST(Evaluator, FibonacciMatchesGmpFibonacciNumbers) {
  Evaluator ev(rec("T(n) = T(n-1) + T(n-2); T(0) = 0; T(1) = 1"));
  EXPECT_TRUE(ev.bottom_up());
  mpz_t f;
  mpz_init(f);
  for (unsigned long n = 0; n <= 3000; ++n) {
    mpz_fib_ui(f, n);  // reference library: GMP's Fibonacci numbers
    BigInt expected(f);
    ASSERT_EQ(integer_of(ev.value_at(BigInt(n))), expected) << "n = " << n;
  }
  // A fresh sweep straight to the top, and a step back down inside the window.
  Evaluator jump(rec("T(n) = T(n-1) + T(n-2); T(0) = 0; T(1) = 1"));
  mpz_fib_ui(f, 3000);
  EXPECT_EQ(integer_of(jump.value_at(BigInt(3000))), BigInt(f));
  mpz_fib_ui(f, 17);
  EXPECT_EQ(integer_of(jump.value_at(BigInt(17))), BigInt(f));
  mpz_clear(f);
  EXPECT_EQ(jump.stats().memo_entries, 0u);
}

TEST(Evaluator, LogLinearDrivingFunctionAtPowersOfTwoIsExact) {
  // [calc] T(n) = 2T(n/2) + n lg n, T(1) given: T(2^k) = 2^k (T(1) + k(k+1)/2).
  Evaluator ev(rec("T(n) = 2T(n/2) + n lg n; T(1) = 3"));
  for (uint64_t k = 0; k <= 300; ++k) {
    BigInt expected = pow2(k) * (3 + BigInt(k * (k + 1) / 2));
    ASSERT_EQ(integer_of(ev.value_at(pow2(k))), expected) << "k = " << k;
  }
}

TEST(Evaluator, DrivingFunctionNOverLgNAtPowersOfTwoIsAnExactHarmonicSum) {
  // n/lg n is 1/0 at n = 1, so T(1) must be a point case (see the test
  // below); from n = 2 on, lg 2^k = k exactly and every value is rational.
  // [calc] T(2^k) = 2^k (T(1) + H_k).
  Evaluator ev(rec("T(n) = 2T(n/2) + n/lg n; T(1) = 1"));
  Rational harmonic = 0;
  for (uint64_t k = 0; k <= 200; ++k) {
    if (k > 0) harmonic += Rational(1, k);
    Value v = ev.value_at(pow2(k));
    ASSERT_TRUE(v.is_exact()) << "k = " << k << ": " << v.str();
    ASSERT_EQ(v.exact(), Rational(pow2(k)) * (1 + harmonic)) << "k = " << k;
  }
  EXPECT_EQ(ev.value_at(BigInt(2)).str(), "4");
  EXPECT_EQ(ev.value_at(BigInt(8)).str(), "68/3");  // 8(1 + 1 + 1/2 + 1/3)
}

TEST(Evaluator, DrivingFunctionUndefinedAtOneIsALocatedError) {
  // Without T(1), the line is used at n = 1 and n/lg n divides by lg 1 = 0.
  Evaluator ev(rec("T(n) = 2T(n/2) + n/lg n; T(0) = 0"));
  EXPECT_EQ(located_error_of([&] { ev.value_at(BigInt(2)); }),
            "<recurrence>:1:19: division by zero at n = 1 (in 'n/lg(n)') [hint: add a base case "
            "for the small sizes where this is undefined, e.g. T(1) = 1]");
}

TEST(Evaluator, SquareRootChangeOfVariablesAtDoublyExponentialSizes) {
  // [calc] T(n) = 2T(√n) + lg n at n = 2^(2^k): T(n) = lg n (T(2) + lg lg n).
  Evaluator ev(rec("T(n) = 2T(floor(sqrt(n))) + lg n; T(2) = 5"));
  for (uint64_t k = 0; k <= 12; ++k) {
    BigInt expected = pow2(k) * (5 + k);  // lg n = 2^k, lg lg n = k
    EXPECT_EQ(integer_of(ev.value_at(pow2(uint64_t{1} << k))), expected) << "k = " << k;
  }
}

TEST(Evaluator, ArithmeticSeriesAtAMillionRunsBottomUp) {
  // [calc] T(0) = 0, T(n) = T(n−1) + n → n(n+1)/2.
  Budget work_only;  // the clock must not decide on a loaded machine
  work_only.max_seconds = 0;
  Evaluator ev(rec("T(n) = T(n-1) + n; T(0) = 0"), work_only);
  EXPECT_TRUE(ev.bottom_up());  // sliding window: memory does not grow with n
  EXPECT_EQ(integer_of(ev.value_at(BigInt(1000000))), BigInt(500000500000));
  EXPECT_EQ(ev.stats().memo_entries, 0u);
}

// An independent route to T(n) = 2T(⌊n/2⌋) + n/lg n, T(1) = 1: MPFR at 1024
// bits, plain recursion.
void reference_n_over_lg_n(const BigInt& n, mpfr_t out) {
  if (n == 1) {
    mpfr_set_ui(out, 1, MPFR_RNDN);
    return;
  }
  mpfr_t child, term, lg;
  mpfr_inits2(1024, child, term, lg, static_cast<mpfr_ptr>(nullptr));
  reference_n_over_lg_n(n / 2, child);
  mpfr_set_z(term, n.backend().data(), MPFR_RNDN);
  mpfr_log2(lg, term, MPFR_RNDN);
  mpfr_div(term, term, lg, MPFR_RNDN);
  mpfr_mul_ui(out, child, 2, MPFR_RNDN);
  mpfr_add(out, out, term, MPFR_RNDN);
  mpfr_clears(child, term, lg, static_cast<mpfr_ptr>(nullptr));
}

TEST(Evaluator, IrrationalValuesAreCertifiedIntervalsThatHoldTheTrueValue) {
  Evaluator ev(rec("T(n) = 2T(n/2) + n/lg n; T(1) = 1"));
  for (const BigInt& n :
       {BigInt(3), BigInt(1000), BigInt(3 * pow2(100) + 1), BigInt(pow2(300) - 1)}) {
    Value v = ev.value_at(n);
    ASSERT_FALSE(v.is_exact()) << "n = " << n;
    mpfr_t ref;
    mpfr_init2(ref, 1024);
    reference_n_over_lg_n(n, ref);
    Rational reference;
    mpfr_get_q(reference.backend().data(), ref);
    mpfr_clear(ref);
    EXPECT_LE(v.as_interval().lower(), reference) << "n = " << n << ": " << v.str();
    EXPECT_GE(v.as_interval().upper(), reference) << "n = " << n << ": " << v.str();
    // Narrow, too: relative width below 2^-80 (exact, not through doubles).
    Rational lo = v.as_interval().lower();
    EXPECT_LT((v.as_interval().upper() - lo) / lo, Rational(1, pow2(80)))
        << "n = " << n << ": " << v.str();
  }
}

TEST(Evaluator, CallThatDoesNotShrinkIsAnErrorAtTheCall) {
  Evaluator ev(rec("T(n) = T(n) + 1; T(1) = 0"));
  // Under the call T(n); found before evaluating, at the first size where
  // the call fails.
  EXPECT_EQ(located_error_of([&] { ev.value_at(BigInt(5)); }),
            "<recurrence>:1:8: T(n) at n = 0 calls T(0), which does not shrink [hint: each call "
            "must reach a smaller size, such as T(n/2) or T(n-1)]");
}

TEST(Evaluator, GrowingCallWithoutBaseCaseIsAnErrorAtTheCall) {
  Evaluator ev(rec("T(n) = T(n+1) + 1"));
  EXPECT_EQ(located_error_of([&] { ev.value_at(BigInt(3)); }),
            "<recurrence>:1:8: T(n + 1) at n = 0 calls T(1), which does not shrink [hint: each "
            "call must reach a smaller size, such as T(n/2) or T(n-1)]");
}

TEST(Evaluator, SquaringEachStepRunsOutOfValueBitsQuickly) {
  // Values double in length every step: the bits-per-value budget stops it
  // after about 20 steps, long before 10^5.
  Evaluator ev(rec("T(n) = T(n-1)^2 + 1; T(0) = 1"));
  try {
    ev.value_at(BigInt(100000));
    FAIL() << "expected BudgetExceeded";
  } catch (const BudgetExceeded& e) {
    EXPECT_NE(std::string(e.what()).find("bits"), std::string::npos) << e.what();
  }
  EXPECT_LT(ev.stats().steps, 100u);
}

TEST(Evaluator, HugeSubtractiveSizeIsRefusedBeforeRunning) {
  Evaluator ev(rec("T(n) = T(n-1) + n; T(0) = 0"));
  EXPECT_THROW(ev.value_at(pow2(100)), BudgetExceeded);
  EXPECT_THROW(ev.value_at(BigInt(1000000000000)), BudgetExceeded);
  EXPECT_EQ(ev.stats().steps, 0u);
}

TEST(Evaluator, MissingBaseCaseDefaultsToOneWhereTheCallWouldNotShrink) {
  auto r = rec("T(n) = 2T(n/2) + n");
  EXPECT_TRUE(r->default_base);
  bool noted = false;
  for (const std::string& note : r->notes)
    noted |= note.find("no base case given") != std::string::npos;
  EXPECT_TRUE(noted);
  Evaluator ev(r);
  EXPECT_EQ(ev.value_at(BigInt(0)).str(), "1");  // T(0) would call T(0)
  EXPECT_EQ(ev.value_at(BigInt(1)).str(), "3");  // 2T(0) + 1
  EXPECT_EQ(ev.value_at(BigInt(2)).str(), "8");
  EXPECT_EQ(ev.value_at(BigInt(4)).str(), "20");
}

TEST(Evaluator, SeveralDivisorsAndShiftedFloors) {
  // Checked against a direct table of the same definition.
  Evaluator ev(
      rec("T(n) = T(floor(n/5)) + T(floor(7n/10) + 6) + n if n > 100; T(n) = n otherwise"));
  std::vector<BigInt> table(3001);
  for (int64_t m = 0; m <= 3000; ++m) {
    table[m] = m > 100 ? table[m / 5] + table[7 * m / 10 + 6] + m : BigInt(m);
  }
  for (int64_t m : {0, 100, 101, 999, 3000}) {
    EXPECT_EQ(integer_of(ev.value_at(BigInt(m))), table[m]) << "n = " << m;
  }
}

TEST(Evaluator, NegativeTermsAndModularCases) {
  // 2T(n/2) − 1 with T(1) = 1 is 1 at every size [calc: 2·1 − 1 = 1].
  Evaluator ones(rec("T(n) = 2T(n/2) - 1; T(1) = 1"));
  EXPECT_EQ(ones.value_at(pow2(4096) + 7).str(), "1");
  // The mod-3 line wins over the default where it holds.
  Evaluator cases(rec("T(n) = T(n-1) + 10 if n mod 3 == 1; T(n) = T(n-1) + 1 otherwise; T(0) = 0"));
  EXPECT_EQ(cases.value_at(BigInt(6)).str(), "24");  // n = 1 and 4 add 10, the rest add 1
}

TEST(Evaluator, SizesAreExactConstantExpressions) {
  EXPECT_EQ(evaluate_size("2^4096+7"), pow2(4096) + 7);
  EXPECT_EQ(evaluate_size("10^30"), BigInt("1000000000000000000000000000000"));
  EXPECT_EQ(evaluate_size("3*2^50"), 3 * pow2(50));
  EXPECT_EQ(evaluate_size("010"), 10);  // decimal, never octal
  EXPECT_EQ(
      located_error_of([] { evaluate_size("n + 1"); }),
      "<size>:1:1: a size must be a number, not an expression in n [hint: for example 2^4096 + 7]");
  EXPECT_EQ(located_error_of([] { evaluate_size("7/2"); }),
            "<size>:1:1: the size 7/2 is not a whole number [hint: sizes are whole numbers: 10^6, "
            "3*2^50]");
  EXPECT_EQ(located_error_of([] { evaluate_size("-3"); }),
            "<size>:1:1: the size -3 is negative [hint: sizes are >= 0]");
}

// The starting 128 bits cannot settle the floor of a 41-digit irrational; the
// precision is raised until they do. Reference: GMP's integer square root,
// floor(sqrt(2 * 10^80)) = floor(sqrt(2) * 10^40).
TEST(Evaluator, IrrationalSizesAreSettledAtHigherPrecision) {
  for (const char* digits : {"40", "300", "3000"}) {
    BigInt scale = evaluate_size(std::string("10^") + digits);
    BigInt square = 2 * scale * scale;
    BigInt expected;
    mpz_sqrt(expected.backend().data(), square.backend().data());
    EXPECT_EQ(evaluate_size(std::string("floor(sqrt(2) * 10^") + digits + ")"), expected) << digits;
  }
  // sqrt(2)^2 is 2, but an interval never shows it: an error, not a guess.
  std::string error = located_error_of([] { evaluate_size("floor(sqrt(2)^2)"); });
  EXPECT_EQ(error.rfind("<size>:1:1: the size could not be settled as a whole number at 65536 "
                        "bits of precision",
                        0),
            0u)
      << error;
}

}  // namespace
}  // namespace thetagate::engine

namespace {

TEST(EvaluatorWellFoundedness, NonShrinkingCallNamesTheFirstOffendingSize) {
  // docs/design.md §3: the error names the first offending n and call.
  EXPECT_EQ(thetagate::engine::test_support::located_error_of([] {
              thetagate::engine::Evaluator ev(
                  thetagate::engine::recurrence_from_text("T(n) = T(n+1) + 1"));
              ev.value_at(thetagate::engine::BigInt(3));
            }),
            "<recurrence>:1:8: T(n + 1) at n = 0 calls T(1), which does not shrink [hint: each "
            "call must reach a smaller size, such as T(n/2) or T(n-1)]");
}

}  // namespace
