// EXPECT_GUARDED and ASSERT_GUARDED as predicate-formatters (the message is
// the guard's report alone), claims loaded where the assertion stands, claim
// files found from the test target's claims folder, the printable cost check
// for RapidCheck properties, and what a guard shows of its coverage and budget.
#define THETAGATE_CLAIMS_DIR THETAGATE_SOURCE_DIR "/claims"

#include <gtest/gtest-spi.h>
#include <gtest/gtest.h>

#include <algorithm>
#include <chrono>
#include <cstdlib>
#include <functional>
#include <sstream>
#include <string>
#include <thread>
#include <vector>

#include "thetagate/testing/gtest.h"

namespace thetagate::guard {
namespace {

const char* kMergeRecurrence = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0";

// Insertion sort: n(n-1)/2 comparisons on reversed input, n - 1 on sorted
// input (common practice). With `recompare`, one comparison too many on any
// input of 3 or more.
Runner<std::vector<int>> insertion_runner(bool recompare) {
  Runner<std::vector<int>> r;
  r.name = "insertion sort";
  r.inputs = [](uint64_t n) {
    return rc::gen::container<std::vector<int>>(n, rc::gen::inRange(0, 1000));
  };
  r.run = [recompare](uint64_t, const std::vector<int>& input, CostCounter& cost) {
    std::vector<int> v = input;
    auto less = counting(cost);
    for (size_t i = 1; i < v.size(); ++i)
      for (size_t j = i; j > 0 && less(v[j], v[j - 1]); --j) std::swap(v[j], v[j - 1]);
    if (recompare && v.size() >= 3) less(v[0], v[1]);
  };
  return r;
}

const char* kInsertion = "T(n) = T(n-1) + n - 1; T(1) = 0";

GuardOptions quick() {
  GuardOptions o;
  o.seed = 5;
  o.max_n = 64;
  o.check_bound = false;
  return o;
}

// The failures `body` reports, intercepted.
std::vector<::testing::TestPartResult> failures_of(const std::function<void()>& body) {
  ::testing::TestPartResultArray results;
  {
    ::testing::ScopedFakeTestPartResultReporter reporter(
        ::testing::ScopedFakeTestPartResultReporter::INTERCEPT_ONLY_CURRENT_THREAD, &results);
    body();
  }
  std::vector<::testing::TestPartResult> out;
  for (int i = 0; i < results.size(); ++i) out.push_back(results.GetTestPartResult(i));
  return out;
}

void expect_only_the_report(const std::string& message) {
  for (const char* boolean_talk : {"Value of", "Actual:", "Expected:", "evaluates to"}) {
    EXPECT_EQ(message.find(boolean_talk), std::string::npos) << boolean_talk << "\n" << message;
  }
}

TEST(GuardAssertion, AFailureMessageIsTheReportLocatedAtTheAssertion) {
  Model model = Model::from_text("insertion", kInsertion, "Theta(n^2)");
  const int line = __LINE__ + 1;
  auto failures = failures_of([&] { EXPECT_GUARDED(model, insertion_runner(true), quick()); });
  ASSERT_EQ(failures.size(), 1u);
  EXPECT_TRUE(failures[0].nonfatally_failed());
  EXPECT_EQ(failures[0].line_number(), line);
  EXPECT_NE(std::string(failures[0].file_name()).find("guard_assertion_test.cc"),
            std::string::npos);
  std::string message = failures[0].message();
  EXPECT_EQ(message.rfind("the code breaks its model 'insertion' (seed 5)\n", 0), 0u) << message;
  EXPECT_NE(message.find("counted cost 4 > T(n) = 3"), std::string::npos) << message;
  EXPECT_NE(message.find("THETAGATE_GUARD_SEED=5 THETAGATE_GUARD_N=3"), std::string::npos);
  expect_only_the_report(message);
}

TEST(GuardAssertion, ARefutedBoundIsReportedWithoutCommandLineLines) {
  Runner<std::vector<int>> linear = insertion_runner(false);
  linear.run = [](uint64_t n, const std::vector<int>&, CostCounter& cost) { cost.add(n - 1); };
  GuardOptions o = quick();
  o.check_bound = true;
  auto failures = failures_of([&] {
    EXPECT_GUARDED(Model::from_text("quadratic, claimed linear", kInsertion, "O(n)"), linear, o);
  });
  ASSERT_EQ(failures.size(), 1u);
  std::string message = failures[0].message();
  EXPECT_EQ(message.rfind("model -> bound: the claim 'quadratic, claimed linear' is refuted\n"
                          "refuted    quadratic, claimed linear  claimed O(n)",
                          0),
            0u)
      << message;
  // No run header (the tool, --seed) and no run summary: not a command line.
  EXPECT_EQ(message.find("--seed"), std::string::npos) << message;
  EXPECT_EQ(message.find("1 claim:"), std::string::npos) << message;
  EXPECT_NE(message.find("code -> model: runner 'insertion sort'"), std::string::npos) << message;
  expect_only_the_report(message);
}

TEST(GuardAssertion, AssertGuardedIsFatal) {
  Model model = Model::from_text("insertion", kInsertion, "Theta(n^2)");
  bool went_on = false;
  auto failures = failures_of([&] {
    [&] {
      ASSERT_GUARDED(model, insertion_runner(true), quick());
      went_on = true;
    }();
  });
  ASSERT_EQ(failures.size(), 1u);
  EXPECT_TRUE(failures[0].fatally_failed());
  EXPECT_FALSE(went_on);
  expect_only_the_report(failures[0].message());
  // Two arguments as well as three.
  EXPECT_GUARDED(Model::from_text("insertion", kInsertion, "Theta(n^2)", Relation::kUpperBound, 64),
                 insertion_runner(false));
}

TEST(GuardAssertion, AClaimThatCannotBeLoadedIsALocatedFailureNotAnException) {
  auto missing = failures_of([] {
    EXPECT_GUARDED(claim("no-such-file.toml", "orchard::stable_sort / comparisons, worst case"),
                   insertion_runner(false), quick());
  });
  ASSERT_EQ(missing.size(), 1u);
  std::string message = missing[0].message();
  EXPECT_EQ(
      message.rfind("cannot load the claim 'orchard::stable_sort / comparisons, worst case': ", 0),
      0u)
      << message;
  EXPECT_NE(message.find(THETAGATE_SOURCE_DIR "/claims/no-such-file.toml"), std::string::npos)
      << message;
  auto misspelt = failures_of([] {
    ASSERT_GUARDED(claim("sorting.toml", "orchard::stable_sort / comparison, worst case"),
                   insertion_runner(false), quick());
  });
  ASSERT_EQ(misspelt.size(), 1u);
  message = misspelt[0].message();
  EXPECT_NE(message.find("no claim is named 'orchard::stable_sort / comparison, worst case'"),
            std::string::npos)
      << message;
  EXPECT_NE(message.find("the closest name is 'orchard::stable_sort / comparisons, worst case'"),
            std::string::npos)
      << message;
  expect_only_the_report(message);
}

TEST(GuardAssertion, RelativeClaimFilesComeFromTheTargetsClaimsFolder) {
  ClaimRef ref = claim("sorting.toml", "x");
  EXPECT_EQ(ref.file, THETAGATE_SOURCE_DIR "/claims/sorting.toml");
  EXPECT_EQ(claim("/elsewhere/a.toml", "x").file, "/elsewhere/a.toml");
  Runner<std::vector<int>> merge = insertion_runner(false);
  merge.run = [](uint64_t n, const std::vector<int>& input, CostCounter& cost) {
    std::vector<int> v = input;
    std::stable_sort(v.begin(), v.end(), counting(cost));
  };
  // Only the loading is checked here (std::stable_sort is not the claim's
  // merge sort): the claim loads and the guard runs.
  GuardOptions o = quick();
  o.max_n = 8;
  ::testing::AssertionResult r =
      Guards(claim("sorting.toml", "orchard::stable_sort / comparisons, worst case"), merge, o);
  EXPECT_EQ(std::string(r.message()).find("cannot load"), std::string::npos) << r.message();
}

TEST(GuardAssertion, ACostCheckPrintsNCostAndTInsideAProperty) {
  Model model = Model::from_text("merge", kMergeRecurrence, "Theta(n lg n)");
  CostCheck kept = model.check_cost(3, 3);
  EXPECT_TRUE(kept);
  std::ostringstream shown;
  shown << model.check_cost(3, 4);
  EXPECT_EQ(shown.str(), "n = 3: counted cost 4 > T(n) = 3 (model: upper bound, broken)");
  // What RC_ASSERT reports: the value, not "false".
  try {
    RC_ASSERT(model.check_cost(3, 4));
    FAIL() << "RC_ASSERT passed";
  } catch (const rc::detail::CaseResult& failure) {
    EXPECT_NE(failure.description.find("n = 3: counted cost 4 > T(n) = 3"), std::string::npos)
        << failure.description;
  }
  Model exact =
      Model::from_text("max", "T(n) = T(n-1) + 1; T(1) = 0", "Theta(n)", Relation::kExact);
  EXPECT_EQ(to_string(exact.check_cost(5, 3)),
            "n = 5: counted cost 3 < T(n) = 4 (model: exact, broken)");
}

TEST(GuardCoverage, APassingGuardShowsItsSizesRunsAndTightnessPerScale) {
  Model model = Model::from_text("insertion", kInsertion, "Theta(n^2)");
  GuardResult r = check_code(model, insertion_runner(false), quick());
  ASSERT_TRUE(r.passed()) << r.report();
  std::string coverage = r.coverage();
  EXPECT_EQ(coverage.rfind("guard coverage of 'insertion' (upper bound, seed 5, effort 1): ", 0),
            0u)
      << coverage;
  // Reversed input is a shape the guard adds: insertion sort's worst case,
  // exactly T(n), at every scale.
  EXPECT_NE(coverage.find("n in [2^5, 2^6): "), std::string::npos) << coverage;
  EXPECT_NE(coverage.find("tightest cost/T(n) = 1.0000 at n = 32 (496 of 496)"), std::string::npos)
      << coverage;
  EXPECT_NE(coverage.find("n in [2^0, 2^1): 1 sizes"), std::string::npos) << coverage;
}

TEST(GuardCoverage, TheEnvironmentAsksEveryAssertionForItsCoverage) {
  Model model = Model::from_text("insertion", kInsertion, "Theta(n^2)");
  ::setenv("THETAGATE_GUARD_COVERAGE", "1", 1);
  ::testing::internal::CaptureStdout();
  EXPECT_GUARDED(model, insertion_runner(false), quick());
  std::string shown = ::testing::internal::GetCapturedStdout();
  ::unsetenv("THETAGATE_GUARD_COVERAGE");
  EXPECT_EQ(shown.rfind("guard coverage of 'insertion' (upper bound, seed 5, effort 1): ", 0), 0u)
      << shown;
  ::testing::internal::CaptureStdout();
  EXPECT_GUARDED(model, insertion_runner(false), quick());
  EXPECT_EQ(::testing::internal::GetCapturedStdout(), "");
}

TEST(GuardProgress, ALongGuardShowsItsSizeOnOneLineAndErasesIt) {
  // Runs of 0.15 s at 12 sizes: past the first second the line appears.
  // (progress = false: never, even past a second.)
  Model model = Model::from_text("slow", "T(n) = n", "Theta(n)");
  Runner<std::vector<int>> slow = insertion_runner(false);
  slow.run = [](uint64_t, const std::vector<int>&, CostCounter&) {
    std::this_thread::sleep_for(std::chrono::milliseconds(150));
  };
  GuardOptions o = quick();
  o.max_n = 12;
  o.inputs_per_size = 1;
  o.search_steps = 0;
  o.min_search_steps = 0;
  o.shapes = false;
  o.progress = true;
  ::testing::internal::CaptureStderr();
  GuardResult r = check_code(model, slow, o);
  std::string shown = ::testing::internal::GetCapturedStderr();
  ASSERT_TRUE(r.passed()) << r.report();
  EXPECT_EQ(shown.rfind("\r\033[Kthetagate guard: 'slow': n = ", 0), 0u) << shown;
  EXPECT_NE(shown.find(" of 12, "), std::string::npos) << shown;
  EXPECT_EQ(shown.substr(shown.size() - 4), "\r\033[K");  // erased at the end
  o.progress = false;
  o.max_n = 8;
  ::testing::internal::CaptureStderr();
  check_code(model, slow, o);
  EXPECT_EQ(::testing::internal::GetCapturedStderr(), "");
}

TEST(GuardBudget, PastTheTimeBudgetShapesStillRunAndTheReportSaysWhere) {
  Model model = Model::from_text("insertion", kInsertion, "Theta(n^2)");
  GuardOptions o = quick();
  o.time_budget = 1e-9;  // out at once
  GuardResult r = check_code(model, insertion_runner(false), o);
  ASSERT_TRUE(r.passed()) << r.report();
  ASSERT_TRUE(r.budget_reached_at.has_value());
  EXPECT_EQ(*r.budget_reached_at, 1u);
  EXPECT_NE(r.report().find("the time budget ran out at n = 1"), std::string::npos) << r.report();
  EXPECT_NE(r.coverage().find("the time budget ran out at n = 1"), std::string::npos);
  // One random input, seeds, shapes and built-up orders only: the reversed
  // shape still meets T(n).
  for (const CostRow& row : r.rows) EXPECT_EQ(row.sign, 0) << row.n;
}

TEST(GuardBudget, EffortScalesTheRunsAndBadSettingsAreRefused) {
  Model model = Model::from_text("insertion", kInsertion, "Theta(n^2)");
  GuardOptions o = quick();
  o.effort = 1;
  GuardResult one = check_code(model, insertion_runner(false), o);
  o.effort = 3;
  GuardResult three = check_code(model, insertion_runner(false), o);
  EXPECT_EQ(three.effort, 3u);
  EXPECT_GT(three.runs, 2 * one.runs);
  o.effort = 0;
  GuardResult zero = check_code(model, insertion_runner(false), o);
  ASSERT_TRUE(zero.error.has_value());
  EXPECT_EQ(*zero.error,
            "GuardOptions::effort = 0 is outside 1 to 1000: it multiplies the guard's runs and "
            "time budget (1 for a unit test, 10 for a nightly run)");
  o.effort.reset();
  ::setenv("THETAGATE_GUARD_EFFORT", "ten", 1);
  GuardResult words = check_code(model, insertion_runner(false), o);
  ::unsetenv("THETAGATE_GUARD_EFFORT");
  ASSERT_TRUE(words.error.has_value());
  EXPECT_EQ(words.error->rfind("THETAGATE_GUARD_EFFORT='ten' is not a whole number", 0), 0u)
      << *words.error;
  o.time_budget = -1;
  GuardResult negative = check_code(model, insertion_runner(false), o);
  ASSERT_TRUE(negative.error.has_value());
  EXPECT_EQ(*negative.error,
            "GuardOptions::time_budget must be a number of seconds from 0 to 1000000 (0: no "
            "budget), found -1");
}

}  // namespace
}  // namespace thetagate::guard
