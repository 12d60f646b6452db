// The cost counter and its adapters (include/thetagate/cost.h), checked
// against the comparison counts the C++ standard fixes for its algorithms.
#include "thetagate/cost.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cstdint>
#include <functional>
#include <limits>
#include <numeric>
#include <thread>
#include <vector>

namespace thetagate {
namespace {

TEST(CostCounter, MaxElementMakesExactlyNMinusOneComparisons) {
  // ISO C++ [alg.min.max]: max_element applies the comparison exactly
  // max(N - 1, 0) times.
  for (int n : {0, 1, 2, 7, 1000}) {
    std::vector<int> v(n);
    std::iota(v.begin(), v.end(), 0);
    std::reverse(v.begin(), v.end());
    CostCounter c;
    std::max_element(v.begin(), v.end(), counting(c));
    EXPECT_EQ(c.count(), static_cast<uint64_t>(std::max(n - 1, 0))) << "n = " << n;
  }
}

TEST(CostCounter, MergeMakesAtMostNMinusOneComparisons) {
  // ISO C++ [alg.merge]: merge makes at most N - 1 comparisons; interleaved
  // runs reach it, a run entirely below the other needs only its length.
  std::vector<int> odd = {1, 3, 5, 7}, even = {2, 4, 6, 8}, out(8);
  CostCounter c;
  std::merge(odd.begin(), odd.end(), even.begin(), even.end(), out.begin(), counting(c));
  EXPECT_EQ(c.count(), 7u);
  std::vector<int> low = {1, 2, 3, 4}, high = {5, 6, 7, 8};
  c.reset();
  std::merge(low.begin(), low.end(), high.begin(), high.end(), out.begin(), counting(c));
  EXPECT_EQ(c.count(), 4u);
}

TEST(CostCounter, CountingCompareUsesTheGivenComparator) {
  std::vector<int> v = {3, 1, 2};
  CostCounter c;
  std::sort(v.begin(), v.end(), counting(c, std::greater<>()));
  EXPECT_EQ(v, (std::vector<int>{3, 2, 1}));
  EXPECT_GE(c.count(), 2u);  // three elements cannot be sorted with fewer
}

TEST(CostCounter, CountedCallableAddsItsWeightPerCall) {
  CostCounter c;
  auto square = counted(
      c, [](int x) { return x * x; }, 3);
  EXPECT_EQ(square(4), 16);
  EXPECT_EQ(square(5), 25);
  EXPECT_EQ(c.count(), 6u);
  auto copy = square;  // copies count into the same counter
  copy(1);
  EXPECT_EQ(c.count(), 9u);
}

TEST(CostCounter, OverflowThrowsAndKeepsTheCount) {
  const uint64_t max = std::numeric_limits<uint64_t>::max();
  CostCounter c(max - 1);
  c.add(1);
  EXPECT_EQ(c.count(), max);
  EXPECT_THROW(c.add(1), CostOverflow);
  EXPECT_EQ(c.count(), max);
  CostCounter d(5);
  try {
    d.add(max);
    FAIL() << "no overflow reported";
  } catch (const CostOverflow& e) {
    EXPECT_EQ(e.count(), 5u);
    EXPECT_EQ(e.added(), max);
  }
  EXPECT_EQ(d.count(), 5u);
  auto compare = counting(c);
  EXPECT_THROW(compare(1, 2), CostOverflow);
}

TEST(CostCounter, SumOfPerThreadCountersChecksOverflow) {
  const uint64_t max = std::numeric_limits<uint64_t>::max();
  CostCounter a(max / 2 + 1), b(max / 2 + 1), small(3);
  EXPECT_EQ(sum({&a, &small}), max / 2 + 4);
  EXPECT_THROW(sum({&a, &b}), CostOverflow);
}

TEST(SharedCostCounter, ConcurrentAddsAreAllCounted) {
  SharedCostCounter c;
  std::vector<std::thread> threads;
  for (int t = 0; t < 4; ++t) {
    threads.emplace_back([&c] {
      auto less = counting(c);
      for (int i = 0; i < 50'000; ++i) less(i, i + 1);
    });
  }
  for (auto& t : threads) t.join();
  EXPECT_EQ(c.count(), 200'000u);
  SharedCostCounter full;
  full.add(std::numeric_limits<uint64_t>::max());
  EXPECT_THROW(full.add(1), CostOverflow);
}

}  // namespace
}  // namespace thetagate
