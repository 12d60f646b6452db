// Guarding code with its claim (include/thetagate/testing/gtest.h): counted costs of
// real runs on generated and searched inputs, compared with T(n) exactly.
#include <gtest/gtest.h>

#include <algorithm>
#include <limits>
#include <set>
#include <stdexcept>
#include <vector>

#include "thetagate/testing/gtest.h"

namespace thetagate::guard {
namespace {

const char* kMergeRecurrence = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0";

// A top-down merge sort as commonly written. With `recompare`, the merge
// checks once more, after taking from the right run, that the element just
// placed is not below the previous one: a realistic "defensive" regression
// that re-compares an element already placed.
void merge_sort(std::vector<int>& v, size_t lo, size_t hi, std::vector<int>& scratch,
                CostCounter& cost, bool recompare) {
  if (hi - lo < 2) return;
  size_t mid = lo + (hi - lo) / 2;
  merge_sort(v, lo, mid, scratch, cost, recompare);
  merge_sort(v, mid, hi, scratch, cost, recompare);
  auto less = counting(cost);
  size_t i = lo, j = mid, k = lo;
  while (i < mid && j < hi) {
    if (less(v[j], v[i])) {
      scratch[k++] = v[j++];
      if (recompare && k - lo >= 2 && less(scratch[k - 1], scratch[k - 2])) {
        throw std::logic_error("merge out of order");
      }
    } else {
      scratch[k++] = v[i++];
    }
  }
  while (i < mid) scratch[k++] = v[i++];
  while (j < hi) scratch[k++] = v[j++];
  std::copy(scratch.begin() + lo, scratch.begin() + hi, v.begin() + lo);
}

Runner<std::vector<int>> merge_runner(bool recompare) {
  Runner<std::vector<int>> r;
  r.name = recompare ? "merge sort, re-comparing" : "merge sort";
  r.inputs = [](uint64_t n) {
    return rc::gen::container<std::vector<int>>(n, rc::gen::inRange(0, 1000));
  };
  r.run = [recompare](uint64_t n, const std::vector<int>& input, CostCounter& cost) {
    std::vector<int> v = input, scratch(n);
    merge_sort(v, 0, n, scratch, cost, recompare);
    if (!std::is_sorted(v.begin(), v.end())) throw std::logic_error("not sorted");
  };
  return r;
}

GuardOptions quick() {
  GuardOptions o;
  o.seed = 7;
  o.max_n = 300;
  o.inputs_per_size = 10;
  o.search_steps = 10;
  return o;
}

TEST(Guard, CorrectMergeSortKeepsToTheWorstCaseModel) {
  Model model = Model::from_text("merge", kMergeRecurrence, "Theta(n lg n)");
  GuardResult r = check_code(model, merge_runner(false), quick());
  EXPECT_TRUE(r.passed()) << r.report();
  EXPECT_EQ(r.bound.verdict, Verdict::kHolds);
  ASSERT_FALSE(r.rows.empty());
  // Every n up to the small limit, then the families' sizes up to max_n.
  EXPECT_EQ(r.rows.front().n, 1u);
  EXPECT_EQ(r.rows.back().n <= 300, true);
  std::set<uint64_t> sizes;
  for (const CostRow& row : r.rows) sizes.insert(row.n);
  for (uint64_t n : {1u, 2u, 31u, 32u, 63u, 64u, 65u, 127u, 129u, 255u, 256u, 257u, 192u})
    EXPECT_TRUE(sizes.count(n)) << n;
  for (const CostRow& row : r.rows) EXPECT_LE(row.sign, 0) << row.n;
  // At n = 2 one comparison is all a merge sort makes: exactly T(2) = 1.
  EXPECT_EQ(r.rows[1].cost, 1u);
  EXPECT_EQ(r.rows[1].sign, 0);
}

TEST(Guard, ReComparingMergeIsCaughtWithAShrunkInputAndAReplay) {
  Model model = Model::from_text("merge", kMergeRecurrence, "Theta(n lg n)");
  GuardResult r = check_code(model, merge_runner(true), quick());
  ASSERT_FALSE(r.passed());
  ASSERT_TRUE(r.violation.has_value()) << r.report();
  const Violation& v = *r.violation;
  // Three elements are the fewest where a right-run element is placed second:
  // [1] merged with [0, 2] (or alike) costs T(3) + 1 = 4 comparisons.
  EXPECT_EQ(v.n, 3u);
  EXPECT_EQ(v.model, "3");
  EXPECT_EQ(v.cost, 4u);
  EXPECT_LE(v.input.size(), 12u) << v.input;  // shrunk toward 0: "[1, 0, 0]" or alike
  EXPECT_NE(v.replay.find("THETAGATE_GUARD_SEED=7 THETAGATE_GUARD_N=3"), std::string::npos);
  std::string report = r.report();
  EXPECT_NE(report.find("the code breaks its model 'merge' (seed 7)"), std::string::npos) << report;
  EXPECT_NE(report.find("counted cost 4 > T(n) = 3"), std::string::npos) << report;
  EXPECT_NE(report.find("input:  " + v.input), std::string::npos) << report;
  // Replaying the one size with the same seed finds the same failure.
  GuardOptions replay = quick();
  replay.only_n = v.n;
  GuardResult again = check_code(model, merge_runner(true), replay);
  ASSERT_TRUE(again.violation.has_value());
  EXPECT_EQ(again.violation->input, v.input);
}

TEST(Guard, ExactModelOfMaxElement) {
  // ISO C++ [alg.min.max]: max_element compares exactly n - 1 times.
  Model exact =
      Model::from_text("max", "T(n) = T(n-1) + 1; T(1) = 0", "Theta(n)", Relation::kExact);
  Runner<std::vector<int>> r;
  r.inputs = [](uint64_t n) {
    return rc::gen::container<std::vector<int>>(n, rc::gen::arbitrary<int>());
  };
  r.run = [](uint64_t, const std::vector<int>& v, CostCounter& cost) {
    std::max_element(v.begin(), v.end(), counting(cost));
  };
  GuardResult good = check_code(exact, r, quick());
  EXPECT_TRUE(good.passed()) << good.report();
  // One more comparison than the standard allows is caught at n = 1.
  Model one_off =
      Model::from_text("max", "T(n) = T(n-1) + 1; T(1) = 1", "Theta(n)", Relation::kExact);
  GuardResult bad = check_code(one_off, r, quick());
  ASSERT_TRUE(bad.violation.has_value());
  EXPECT_EQ(bad.violation->n, 1u);
  EXPECT_EQ(bad.violation->cost, 0u);
}

TEST(Guard, LowerBoundModelSearchesForTheCheapestInput) {
  // A comparison sort of n distinct keys compares at least n - 1 times (each
  // adjacent pair of the output must be compared; from memory). Merge sort on
  // sorted input makes only about (n/2) lg n, so n lg n is not a lower bound.
  Model model = Model::from_text("sort floor", "T(n) = T(n-1) + 1; T(1) = 0", "Theta(n)",
                                 Relation::kLowerBound);
  GuardResult r = check_code(model, merge_runner(false), quick());
  EXPECT_TRUE(r.passed()) << r.report();
  Model too_much =
      Model::from_text("sort n lg n", kMergeRecurrence, "Theta(n lg n)", Relation::kLowerBound);
  GuardResult broken = check_code(too_much, merge_runner(false), quick());
  ASSERT_TRUE(broken.violation.has_value());
  EXPECT_EQ(broken.violation->n, 3u);  // [0, 1, 2]-like inputs need 2 < T(3) = 3
}

TEST(Guard, ThrowingRunnerAndOverflowAreErrorsNamingSizeAndInput) {
  Model model = Model::from_text("merge", kMergeRecurrence, "Theta(n lg n)");
  Runner<std::vector<int>> r = merge_runner(false);
  r.run = [](uint64_t n, const std::vector<int>&, CostCounter&) {
    if (n == 5) throw std::runtime_error("boom");
  };
  GuardResult thrown = check_code(model, r, quick());
  ASSERT_TRUE(thrown.error.has_value());
  EXPECT_EQ(thrown.error->rfind("the runner threw at n = 5 on input [", 0), 0u) << *thrown.error;
  EXPECT_NE(thrown.error->find("boom"), std::string::npos);
  EXPECT_FALSE(thrown.passed());
  r.run = [](uint64_t n, const std::vector<int>&, CostCounter& cost) {
    cost.add(std::numeric_limits<uint64_t>::max());
    cost.add(n);
  };
  // Under a lower-bound model no ceiling stops the count first (under an
  // upper bound, 2^64 - 1 already passes T(1) = 0: a violation).
  Model floor =
      Model::from_text("merge floor", kMergeRecurrence, "Theta(n lg n)", Relation::kLowerBound);
  GuardResult overflow = check_code(floor, r, quick());
  ASSERT_TRUE(overflow.error.has_value());
  EXPECT_EQ(overflow.error->rfind("the cost overflowed at n = 1 on input [", 0), 0u)
      << *overflow.error;
}

TEST(Guard, AssertionPassesAndFailsWithTheReport) {
  Model model = Model::from_text("merge", kMergeRecurrence, "Theta(n lg n)");
  EXPECT_GUARDED(model, merge_runner(false), quick());
  ::testing::AssertionResult failed = Guards(model, merge_runner(true), quick());
  EXPECT_FALSE(failed);
  std::string message = failed.message();
  EXPECT_NE(message.find("THETAGATE_GUARD_N=3"), std::string::npos) << message;
  EXPECT_NE(message.find("--gtest_filter='Guard.AssertionPassesAndFailsWithTheReport'"),
            std::string::npos)
      << message;
  // A refuted bound fails the assertion even when the code keeps to T(n).
  Model wrong = Model::from_text("merge, wrong bound", kMergeRecurrence, "O(n)");
  ::testing::AssertionResult refuted = Guards(wrong, merge_runner(false), quick());
  EXPECT_FALSE(refuted);
  EXPECT_NE(std::string(refuted.message())
                .find("model -> bound: the claim 'merge, wrong bound' is refuted"),
            std::string::npos)
      << refuted.message();
}

TEST(Guard, ModelErrorsAreLocatedInputErrors) {
  try {
    Model::from_text("bad", "T(n) = 2T(n/2 + n", "O(n)");
    FAIL() << "no error";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("error:"), std::string::npos) << e.what();
  }
  try {
    Model::from_file(THETAGATE_SOURCE_DIR "/claims/sorting.toml",
                     "orchard::stable_sort / comparison");
    FAIL() << "no error";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("no claim is named"), std::string::npos) << e.what();
    EXPECT_NE(std::string(e.what()).find("closest name is 'orchard::stable_sort /"),
              std::string::npos)
        << e.what();
  }
}

TEST(AdversarialSize, DrawsTheFamiliesShapesWithinRange) {
  rc::Gen<uint64_t> sizes = gen::adversarial_size(4096);
  std::set<uint64_t> seen;
  for (uint64_t i = 0; i < 3000; ++i) {
    uint64_t n = sizes(rc::Random(i), 100).value();
    ASSERT_GE(n, 1u);
    ASSERT_LE(n, 4096u);
    seen.insert(n);
  }
  for (uint64_t n : {1023u, 1024u, 1025u, 3u * 512, 2047u, 4095u}) EXPECT_TRUE(seen.count(n)) << n;
  // 0b1010...: halvings alternate odd and even.
  EXPECT_TRUE(seen.count(0b101010101010u) || seen.count(0b10101010101u));
}

}  // namespace
}  // namespace thetagate::guard
