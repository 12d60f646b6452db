#include "generators/local_search.h"

#include <gtest/gtest.h>

#include <cmath>
#include <vector>

namespace thetagate::engine {
namespace {

BigInt pow2(uint64_t k) { return BigInt(1) << k; }

// lg n in double precision for any size: the top 64 bits carry the fraction.
double lg(const BigInt& n) {
  uint64_t bits = bit_length(n);
  uint64_t shift = bits > 64 ? bits - 64 : 0;
  BigInt top = n >> shift;
  return static_cast<double>(shift) + std::log2(top.convert_to<double>());
}

// (W(n) − n lg n)/n for the merge sort worst case without its 1/n term:
// A(u) = 1 − {u} − 2^(1−{u}), u = lg n. Closed form from M. A. Suchenek,
// "Elementary yet precise worst-case analysis of MergeSort", arXiv:1702.08443
// (see docs/sources.md); its maximum −lg(ln 2) − 1/ln 2 = −0.913928667944… at
// n = 2 ln 2 · 2^⌊lg n⌋ and its minimum −1 at powers of two follow by calculus.
std::optional<double> merge_sort_gap(const BigInt& n) {
  double u = lg(n);
  double frac = u - std::floor(u);
  return 1 - frac - std::exp2(1 - frac);
}

const double kPeak = -std::log2(std::log(2.0)) - 1 / std::log(2.0);
const double kPeakRatio = 2 * std::log(2.0);

double ratio_in_scale(const BigInt& n) {
  return std::exp2(lg(n) - static_cast<double>(bit_length(n) - 1));
}

TEST(LocalSearch, FindsTheMergeSortPeakBetweenTwoPowers) {
  for (uint64_t k : {20, 100, 1000, 4095}) {
    LocalSearchOptions options;
    options.seed = 11;
    auto found = local_search(pow2(k), merge_sort_gap, options);
    ASSERT_TRUE(found) << k;
    EXPECT_NEAR(found->score, kPeak, 1e-9) << k;
    EXPECT_NEAR(ratio_in_scale(found->n), kPeakRatio, 1e-4) << k;
    EXPECT_EQ(bit_length(found->n), k + 1);
    EXPECT_LE(found->evaluations, options.max_evaluations);
  }
}

TEST(LocalSearch, FindsANarrowSpikeExactly) {
  // A sharp, non-smooth peak at one odd n: common practice for testing a
  // climber's resolution. Within 2^40 every step size is tried.
  const uint64_t k = 40;
  const BigInt target = (pow2(k) * 1386294361) / 1000000000 + 7;
  SizeScore spike = [&](const BigInt& n) -> std::optional<double> {
    BigInt d = n > target ? BigInt(n - target) : BigInt(target - n);
    return -d.convert_to<double>();
  };
  auto found = local_search(pow2(k) + pow2(k - 1) + 12345, spike, LocalSearchOptions{});
  ASSERT_TRUE(found);
  EXPECT_EQ(found->n, target);
  EXPECT_EQ(found->score, 0.0);
}

TEST(LocalSearch, MinimisesTowardThePowerOfTwo) {
  LocalSearchOptions options;
  options.maximise = false;
  auto found = local_search(pow2(300) + pow2(299), merge_sort_gap, options);
  ASSERT_TRUE(found);
  EXPECT_NEAR(found->score, -1.0, 1e-12);
  EXPECT_EQ(bit_length(found->n), 301u);
}

TEST(LocalSearch, BitFlipsFindEveryHalvingOdd) {
  // Score: how many floor halvings of n are odd. The best of scale 12 is
  // 2^13 − 1 (all ones), common practice.
  SizeScore odd_halvings = [](const BigInt& n) -> std::optional<double> {
    int odd = 0;
    for (BigInt m = n; m > 1; m /= 2) odd += m % 2 == 1;
    return odd;
  };
  auto found = local_search(pow2(12), odd_halvings, LocalSearchOptions{});
  ASSERT_TRUE(found);
  EXPECT_EQ(found->n, pow2(13) - 1);
  EXPECT_EQ(found->score, 12.0);
}

TEST(LocalSearch, StaysInScaleAndWithinBudget) {
  const uint64_t k = 64;
  std::vector<BigInt> asked;
  SizeScore noisy = [&](const BigInt& n) -> std::optional<double> {
    asked.push_back(n);
    BigInt h = (n * 2654435761u) % 1000003;
    return h.convert_to<double>();
  };
  LocalSearchOptions options;
  options.max_evaluations = 300;
  auto found = local_search(pow2(k) + 5, noisy, options);
  ASSERT_TRUE(found);
  EXPECT_EQ(found->evaluations, 300u);
  EXPECT_EQ(asked.size(), 300u);
  for (const BigInt& n : asked) {
    EXPECT_GE(n, pow2(k));
    EXPECT_LT(n, pow2(k + 1));
  }
}

TEST(LocalSearch, SameSeedSameResultOtherSeedOtherPath) {
  SizeScore noisy = [](const BigInt& n) -> std::optional<double> {
    BigInt h = (n * 40503u + 17) % 999983;
    return h.convert_to<double>();
  };
  LocalSearchOptions a, b;
  a.seed = b.seed = 3;
  auto first = local_search(pow2(200) + 99, noisy, a);
  auto again = local_search(pow2(200) + 99, noisy, b);
  ASSERT_TRUE(first && again);
  EXPECT_EQ(first->n, again->n);
  EXPECT_EQ(first->score, again->score);
  // Random kicks from another seed take another path through a rugged score.
  b.seed = 4;
  b.max_evaluations = a.max_evaluations = 2000;
  first = local_search(pow2(200) + 99, noisy, a);
  auto other = local_search(pow2(200) + 99, noisy, b);
  ASSERT_TRUE(first && other);
  EXPECT_NE(first->n, other->n);
}

TEST(LocalSearch, SkipsSizesWithoutAScore) {
  // Only odd n are evaluable; the search must still climb among them.
  SizeScore odd_only = [](const BigInt& n) -> std::optional<double> {
    if (n % 2 == 0) return std::nullopt;
    return merge_sort_gap(n);
  };
  auto found = local_search(pow2(50) + 1, odd_only, LocalSearchOptions{});
  ASSERT_TRUE(found);
  EXPECT_EQ(found->n % 2, 1);
  EXPECT_NEAR(found->score, kPeak, 1e-9);
  SizeScore never = [](const BigInt&) -> std::optional<double> { return std::nullopt; };
  EXPECT_FALSE(local_search(pow2(10), never, LocalSearchOptions{}));
}

}  // namespace
}  // namespace thetagate::engine
