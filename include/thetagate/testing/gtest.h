// One include for a GoogleTest suite: checks a claim's two links in one
// assertion, model -> bound (the recurrence meets its claimed bound) and
// code -> model (the code's counted costs keep to the recurrence).
//
//   #include <thetagate/testing/gtest.h>
//
//   TEST(StableSort, KeepsItsComplexityClaim) {
//     auto model = thetagate::guard::Model::from_file(
//         "claims/sorting.toml", "orchard::stable_sort / comparisons, worst case");
//     EXPECT_GUARDED(model, stable_sort_runner());
//   }
//
// A failure message holds the witness size, the shrunk input, the counted
// cost, T(n), and a command that replays exactly that failure:
//   THETAGATE_GUARD_SEED=1 THETAGATE_GUARD_N=5 ./tests --gtest_filter=StableSort.*
#ifndef THETAGATE_TESTING_GTEST_H_
#define THETAGATE_TESTING_GTEST_H_

#include <gtest/gtest.h>

#include <filesystem>
#include <string>
#include <system_error>

#include "thetagate/cost.h"
#include "thetagate/guard.h"
#include "thetagate/testing/rapidcheck.h"

namespace thetagate::guard {

namespace detail {

// The running test binary and the current test, as a command line.
inline std::string current_test_command() {
  std::error_code ec;
  std::filesystem::path self = std::filesystem::read_symlink("/proc/self/exe", ec);
  std::string command = ec ? std::string("<test binary>") : self.string();
  if (const auto* info = ::testing::UnitTest::GetInstance()->current_test_info()) {
    command +=
        " --gtest_filter='" + std::string(info->test_suite_name()) + "." + info->name() + "'";
  }
  return command;
}

}  // namespace detail

// Checks both links; the message is GuardResult::report(). A model that
// cannot be evaluated at a size fails with the error's text
// (thetagate::Error: InputError or LimitReached). What the runner's own
// callbacks throw, a hung or non-deterministic runner and a refused replay
// setting fail with GuardResult::error, naming n (check_code); a run that
// never ends and never counts aborts the process (GuardOptions::run_time_limit).
template <class Input>
::testing::AssertionResult Guards(Model& model, const Runner<Input>& runner,
                                  GuardOptions options = {}) {
  if (options.replay_command == GuardOptions{}.replay_command) {
    options.replay_command = detail::current_test_command();
  }
  try {
    GuardResult result = check_code(model, runner, options);
    if (result.passed()) return ::testing::AssertionSuccess() << result.report();
    return ::testing::AssertionFailure() << result.report();
  } catch (const ::thetagate::Error& e) {
    return ::testing::AssertionFailure() << "cannot guard '" << model.name() << "': " << e.what();
  }
}

template <class Input>
::testing::AssertionResult Guards(Model&& model, const Runner<Input>& runner,
                                  GuardOptions options = {}) {
  return Guards(model, runner, std::move(options));
}

}  // namespace thetagate::guard

// EXPECT_GUARDED(model, runner[, options]): both links hold, else a
// non-fatal failure with the witness and the replay command.
#define EXPECT_GUARDED(...) EXPECT_TRUE(::thetagate::guard::Guards(__VA_ARGS__))
#define ASSERT_GUARDED(...) ASSERT_TRUE(::thetagate::guard::Guards(__VA_ARGS__))

#endif  // THETAGATE_TESTING_GTEST_H_
