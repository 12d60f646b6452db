// Guards orchard::stable_sort with its claim: the comparisons of every run
// stay within the worst-case recurrence, and the recurrence is Θ(n lg n).
#include <orchard/sort.h>
#include <thetagate/testing/gtest.h>

#include <algorithm>
#include <vector>

namespace {

thetagate::guard::Runner<std::vector<int>> stable_sort_runner() {
  thetagate::guard::Runner<std::vector<int>> runner;
  runner.name = "orchard::stable_sort";
  runner.inputs = [](uint64_t n) {
    // Few distinct keys as well as many: ties take the merge's other branch.
    return rc::gen::container<std::vector<int>>(n, rc::gen::inRange<int>(0, 1 + n / 2));
  };
  runner.run = [](uint64_t, const std::vector<int>& input, thetagate::CostCounter& cost) {
    std::vector<int> v = input;
    orchard::stable_sort(v, thetagate::counting(cost));
    if (!std::is_sorted(v.begin(), v.end())) throw std::logic_error("not sorted");
  };
  return runner;
}

TEST(OrchardSort, StableSortKeepsItsComparisonClaim) {
  EXPECT_GUARDED(
      thetagate::guard::claim("sorting.toml", "orchard::stable_sort / comparisons, worst case"),
      stable_sort_runner());
}

}  // namespace
