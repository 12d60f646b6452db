// What the guard catches (docs/guard.md, "Where the runs go"): cost
// regressions that show on one input shape only at n > 1000, which random
// inputs never reach; and no false alarm on the correct code.
#include <gtest/gtest.h>

#include <algorithm>
#include <string>
#include <vector>

#include "thetagate/testing/gtest.h"

namespace thetagate::guard {
namespace {

const char* kMergeRecurrence = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0";

// The regressions: each costs more than the merge-sort model only on one
// input shape, and only in merges of more than 1000 elements.
enum class Regression {
  kNone,
  // A merge that runs to its last element (one run exhausted with a single
  // element left in the other) checks that boundary once more: only the
  // worst-case order of a merge sort reaches it at every level.
  kRecheckFullMerge,
  // Halves already in order are confirmed pair by pair: quadratic on
  // already-sorted input, never reached on random input.
  kConfirmSortedHalves,
};

// Top-down merge sort, with the left half the larger (`left_larger`) or the
// smaller of an odd range: T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
// comparisons in the worst case (a merge of a and b elements makes at most
// a + b - 1; common practice).
void merge_sort(std::vector<int>& v, size_t lo, size_t hi, std::vector<int>& scratch,
                CostCounter& cost, bool left_larger, Regression regression) {
  if (hi - lo < 2) return;
  size_t mid = lo + (hi - lo + (left_larger ? 1 : 0)) / 2;
  merge_sort(v, lo, mid, scratch, cost, left_larger, regression);
  merge_sort(v, mid, hi, scratch, cost, left_larger, regression);
  auto less = counting(cost);
  const bool large = hi - lo > 1000;
  if (large && regression == Regression::kConfirmSortedHalves && !less(v[mid], v[mid - 1])) {
    for (size_t i = lo; i < mid; ++i)
      for (size_t j = mid; j < hi; ++j)
        if (less(v[j], v[i])) throw std::logic_error("halves out of order");
    return;
  }
  size_t i = lo, j = mid, k = lo;
  while (i < mid && j < hi) scratch[k++] = less(v[j], v[i]) ? v[j++] : v[i++];
  if (large && regression == Regression::kRecheckFullMerge && (mid - i) + (hi - j) == 1) {
    if (less(v[i < mid ? i : j], scratch[k - 1])) throw std::logic_error("merge out of order");
  }
  while (i < mid) scratch[k++] = v[i++];
  while (j < hi) scratch[k++] = v[j++];
  std::copy(scratch.begin() + lo, scratch.begin() + hi, v.begin() + lo);
}

Runner<std::vector<int>> sort_runner(bool left_larger, Regression regression, int range) {
  Runner<std::vector<int>> r;
  r.name = "merge sort";
  r.inputs = [range](uint64_t n) {
    return rc::gen::container<std::vector<int>>(n, rc::gen::inRange(0, range));
  };
  r.run = [=](uint64_t n, const std::vector<int>& input, CostCounter& cost) {
    std::vector<int> v = input, scratch(n);
    merge_sort(v, 0, n, scratch, cost, left_larger, regression);
    if (!std::is_sorted(v.begin(), v.end())) throw std::logic_error("not sorted");
  };
  return r;
}

GuardOptions to_4096() {
  GuardOptions o;
  o.seed = 3;
  o.max_n = 4096;
  o.check_bound = false;
  return o;
}

TEST(GuardCatching, CorrectMergeSortsRaiseNoAlarmAndReachTheirWorstCase) {
  Model model = Model::from_text("merge", kMergeRecurrence, "Theta(n lg n)");
  for (bool left_larger : {true, false}) {
    GuardResult r =
        check_code(model, sort_runner(left_larger, Regression::kNone, 1 << 30), to_4096());
    ASSERT_TRUE(r.passed()) << r.report();
    // The worst case is met exactly at every size: T(n) is the exact worst
    // case of a top-down merge sort (M. A. Suchenek, "Elementary yet precise
    // worst-case analysis of MergeSort", arXiv:1702.08443, 2017), and the
    // orders built up from smaller sizes reach it.
    for (const CostRow& row : r.rows)
      EXPECT_EQ(row.sign, 0) << "n = " << row.n << " (" << row.family << "), left_larger "
                             << left_larger;
  }
}

TEST(GuardCatching, AMergeCostlierOnlyInTheWorstCaseOrderAbove1000IsCaught) {
  Model model = Model::from_text("merge", kMergeRecurrence, "Theta(n lg n)");
  for (bool left_larger : {true, false}) {
    GuardResult r = check_code(
        model, sort_runner(left_larger, Regression::kRecheckFullMerge, 1 << 30), to_4096());
    ASSERT_TRUE(r.violation.has_value()) << r.report();
    EXPECT_GT(r.violation->n, 1000u);
    EXPECT_EQ(r.violation->cost, std::stoull(r.violation->model) + 1);
    EXPECT_FALSE(r.error.has_value()) << *r.error;
  }
}

TEST(GuardCatching, AMergeQuadraticOnlyOnSortedInputAbove1000IsCaught) {
  Model model = Model::from_text("merge", kMergeRecurrence, "Theta(n lg n)");
  // Values with many repeats (the benchmark's generator) as well as few.
  for (int range : {1 << 30, 100}) {
    GuardResult r =
        check_code(model, sort_runner(true, Regression::kConfirmSortedHalves, range), to_4096());
    ASSERT_TRUE(r.violation.has_value()) << r.report();
    EXPECT_GT(r.violation->n, 1000u);
    EXPECT_TRUE(r.violation->stopped);  // far past T(n): stopped at the ceiling
  }
}

TEST(GuardCatching, NamedSeedsRunAtEverySizeAndAFailingOneIsShrunk) {
  // A cost that breaks the model only on one input the maintainer names: a
  // run of n copies of 7.
  Model model = Model::from_text("linear", "T(n) = n", "Theta(n)");
  Runner<std::vector<int>> r;
  r.inputs = [](uint64_t n) {
    return rc::gen::container<std::vector<int>>(n, rc::gen::inRange(0, 5));
  };
  r.run = [](uint64_t n, const std::vector<int>& v, CostCounter& cost) {
    cost.add(n);
    if (n > 40 && std::all_of(v.begin(), v.end(), [](int x) { return x == 7; })) cost.add(1);
  };
  GuardOptions o = to_4096();
  o.shapes = false;
  GuardResult unseeded = check_code(model, r, o);
  EXPECT_TRUE(unseeded.passed()) << unseeded.report();
  r.seeds = [](uint64_t n) { return std::vector<std::vector<int>>{std::vector<int>(n, 7)}; };
  GuardResult seeded = check_code(model, r, o);
  ASSERT_TRUE(seeded.violation.has_value()) << seeded.report();
  EXPECT_GT(seeded.violation->n, 40u);
  EXPECT_EQ(seeded.violation->cost, seeded.violation->n + 1);
  EXPECT_EQ(seeded.violation->input.substr(0, 7), "[7, 7, ");  // no smaller input fails
}

TEST(GuardCatching, ShapesKeepTheGeneratedValuesAndLength) {
  // Digits stay digits: a runner that needs them is never handed another value.
  const std::vector<int> digits = {3, 9, 0, 0, 7, 1, 4};
  for (detail::Shape shape : detail::kShapes) {
    std::vector<int> s = detail::shaped(digits, shape);
    ASSERT_EQ(s.size(), digits.size()) << detail::shape_name(shape);
    for (int d : s) EXPECT_NE(std::find(digits.begin(), digits.end(), d), digits.end());
  }
  EXPECT_EQ(detail::shaped(digits, detail::Shape::kSorted),
            (std::vector<int>{0, 0, 1, 3, 4, 7, 9}));
  EXPECT_EQ(detail::shaped(digits, detail::Shape::kOrganPipe),
            (std::vector<int>{0, 1, 4, 9, 7, 3, 0}));
  EXPECT_EQ(detail::shaped(digits, detail::Shape::kRotated),
            (std::vector<int>{0, 1, 3, 4, 7, 9, 0}));
}

TEST(GuardCatching, BuiltUpOrdersInterleaveTheHalves) {
  // The worst case of merging two sorted runs of 2 and 2 (1 3 | 2 4 in rank
  // terms) from the worst orders of size 2, [1, 0] each (common practice).
  std::vector<std::pair<uint64_t, detail::Order>> found = {{1, {0}}, {2, {1, 0}}};
  detail::OrderBuilder builder(&found);
  EXPECT_EQ(builder.build(4, true, detail::Join::kInterleave), (detail::Order{2, 0, 3, 1}));
  EXPECT_EQ(builder.build(4, true, detail::Join::kLeftLow), (detail::Order{1, 0, 3, 2}));
  // Size 8 from sizes never run (4), built from their own halves.
  std::optional<detail::Order> eight = builder.build(8, true, detail::Join::kInterleave);
  ASSERT_TRUE(eight);
  std::vector<int> values = {0, 1, 2, 3, 4, 5, 6, 7};
  std::vector<int> arranged = detail::arranged(values, *eight);
  CostCounter cost;
  std::vector<int> scratch(8);
  merge_sort(arranged, 0, 8, scratch, cost, true, Regression::kNone);
  EXPECT_EQ(cost.count(), 17u);  // T(8) = 17, the worst case
}

}  // namespace
}  // namespace thetagate::guard
