// Guards the rest of orchard with its claims: binary search probes,
// median-of-medians comparisons, Karatsuba digit products (exact), and the
// nodes a balanced tree allocates (exact).
#include <orchard/bignum.h>
#include <orchard/search.h>
#include <orchard/select.h>
#include <orchard/tree.h>
#include <thetagate/testing/gtest.h>

#include <algorithm>
#include <string>
#include <vector>

namespace {

using thetagate::CostCounter;
using thetagate::guard::Runner;

using thetagate::guard::claim;

// These runners also check their results against a reference (a sort, a
// schoolbook product) that costs more than the code under test: a smaller
// work per size (input elements' worth of random inputs and of search steps
// at each size) keeps each guard a fast unit test.
thetagate::guard::GuardOptions lean(uint64_t size_work) {
  thetagate::guard::GuardOptions options;
  options.inputs_per_size = 20;
  options.search_steps = 20;
  options.size_work = size_work;
  return options;
}

TEST(OrchardSearch, FindSortedKeepsItsProbeClaim) {
  // Input: n keys (sorted by the runner) and the key to look for last.
  Runner<std::vector<int>> runner;
  runner.name = "orchard::find_sorted";
  runner.inputs = [](uint64_t n) {
    return rc::gen::container<std::vector<int>>(n + 1, rc::gen::inRange<int>(0, 2 * n + 2));
  };
  runner.run = [](uint64_t n, const std::vector<int>& input, CostCounter& cost) {
    std::vector<int> keys(input.begin(), input.begin() + n);
    std::sort(keys.begin(), keys.end());
    int key = input[n];
    auto probe = thetagate::counted(cost, [](int a, int b) { return a < b ? -1 : a > b ? 1 : 0; });
    auto found = orchard::find_sorted(keys, key, probe);
    bool present = std::binary_search(keys.begin(), keys.end(), key);
    if (found.has_value() != present || (found && keys[*found] != key)) {
      throw std::logic_error("find_sorted disagrees with std::binary_search");
    }
  };
  EXPECT_GUARDED(claim("search.toml", "orchard::find_sorted / probes, worst case"), runner,
                 lean(1 << 14));
}

TEST(OrchardSelect, SelectNthKeepsItsComparisonClaim) {
  Runner<std::vector<int>> runner;
  runner.name = "orchard::select_nth";
  runner.inputs = [](uint64_t n) {
    return rc::gen::container<std::vector<int>>(n, rc::gen::inRange<int>(0, 4 * n + 1));
  };
  runner.run = [](uint64_t n, const std::vector<int>& v, CostCounter& cost) {
    size_t k = n / 2;
    int got = orchard::select_nth(v, k, thetagate::counting(cost));
    std::vector<int> sorted = v;
    std::nth_element(sorted.begin(), sorted.begin() + k, sorted.end());
    if (got != sorted[k]) throw std::logic_error("select_nth disagrees with std::nth_element");
  };
  EXPECT_GUARDED(claim("search.toml", "orchard::select_nth / comparisons, as implemented"), runner,
                 lean(1 << 14));
}

TEST(OrchardBignum, KaratsubaMakesExactlyItsDigitProducts) {
  // Input: the 2n digits of two n-digit numbers.
  Runner<std::vector<int>> runner;
  runner.name = "orchard::mul_karatsuba";
  runner.inputs = [](uint64_t n) {
    return rc::gen::container<std::vector<int>>(2 * n, rc::gen::inRange(0, 10));
  };
  runner.mutate = [](const std::vector<int>& v, uint64_t, std::mt19937_64& random) {
    std::vector<int> w = v;
    w[random() % w.size()] = static_cast<int>(random() % 10);  // stay a digit
    return w;
  };
  runner.run = [](uint64_t n, const std::vector<int>& digits, CostCounter& cost) {
    std::vector<int> a(digits.begin(), digits.begin() + n), b(digits.begin() + n, digits.end());
    std::vector<int> product = orchard::mul_karatsuba(
        a, b, thetagate::counted(cost, [](int64_t x, int64_t y) { return x * y; }));
    // Schoolbook check of the digits (common practice).
    std::vector<long long> school(2 * n, 0);
    for (size_t i = 0; i < n; ++i)
      for (size_t j = 0; j < n; ++j) school[i + j] += a[i] * b[j];
    for (size_t i = 0; i + 1 < school.size(); ++i) {
      school[i + 1] += school[i] / 10;
      school[i] %= 10;
    }
    for (size_t i = 0; i < school.size(); ++i)
      if (product[i] != school[i]) throw std::logic_error("wrong product digit");
  };
  EXPECT_GUARDED(
      claim("bignum.toml", "orchard::mul_karatsuba / digit products, documented constant"), runner,
      lean(1 << 10));
}

TEST(OrchardTree, BuildBalancedAllocatesExactlyOneNodePerKey) {
  Runner<std::vector<int>> runner;
  runner.name = "orchard::tree::build_balanced";
  runner.inputs = [](uint64_t n) {
    return rc::gen::container<std::vector<int>>(n, rc::gen::arbitrary<int>());
  };
  runner.run = [](uint64_t n, const std::vector<int>& input, CostCounter& cost) {
    std::vector<int> keys = input;
    std::sort(keys.begin(), keys.end());
    auto allocate =
        thetagate::counted(cost, [] { return std::make_unique<orchard::tree::Node>(); });
    auto root = orchard::tree::build_balanced(keys, allocate);
    // Balanced: height floor(lg n) + 1.
    size_t expected = 0;
    while ((uint64_t{1} << expected) <= n) ++expected;
    if (orchard::tree::height(root.get()) != expected) throw std::logic_error("not balanced");
  };
  // The runner sorts the keys first, so their order cannot matter: no shapes.
  thetagate::guard::GuardOptions options = lean(1 << 13);
  options.shapes = false;
  EXPECT_GUARDED(claim("trees.toml", "orchard::tree::build_balanced / nodes allocated"), runner,
                 options);
}

// The adversarial sizes in a maintainer's own property: the tree is balanced
// at every family size, not only at powers of two.
TEST(OrchardTree, BalancedAtAdversarialSizes) {
  EXPECT_TRUE(rc::check("build_balanced height is floor(lg n) + 1", [] {
    uint64_t n = *thetagate::guard::gen::adversarial_size(1 << 14);
    std::vector<int> keys(n);
    for (uint64_t i = 0; i < n; ++i) keys[i] = static_cast<int>(i);
    auto root =
        orchard::tree::build_balanced(keys, [] { return std::make_unique<orchard::tree::Node>(); });
    size_t expected = 0;
    while ((uint64_t{1} << expected) <= n) ++expected;
    RC_ASSERT(orchard::tree::height(root.get()) == expected);
  }));
}

}  // namespace
