// One include for a GoogleTest suite: checks a claim's two links in one
// assertion, model -> bound (the recurrence meets its claimed bound) and
// code -> model (the code's counted costs keep to the recurrence).
//
//   #include <thetagate/testing/gtest.h>
//
//   TEST(StableSort, KeepsItsComplexityClaim) {
//     EXPECT_GUARDED(thetagate::guard::claim("sorting.toml",
//                                            "orchard::stable_sort / comparisons, worst case"),
//                    stable_sort_runner());
//   }
//
// A failure message is the guard's report: the witness size, the shrunk
// input, the counted cost, T(n), and a command that replays exactly that
// failure:
//   THETAGATE_GUARD_SEED=1 THETAGATE_GUARD_N=5 ./tests --gtest_filter=StableSort.*
// A claim file that cannot be loaded (missing, an error in it, no claim of
// that name) fails the assertion where it stands, with the located error.
#ifndef THETAGATE_TESTING_GTEST_H_
#define THETAGATE_TESTING_GTEST_H_

#include <gtest/gtest.h>

#include <cstdio>
#include <filesystem>
#include <string>
#include <system_error>
#include <utility>

#include "thetagate/cost.h"
#include "thetagate/guard.h"
#include "thetagate/testing/rapidcheck.h"

namespace thetagate::guard {

// A claim to load when the assertion runs, so that a file that cannot be
// loaded is a failure of that assertion rather than an exception.
struct ClaimRef {
  std::string file;
  std::string name;
};

// Internal linkage on purpose: claim() reads a macro that each test target
// sets for itself, so its definition may differ between targets' sources.
namespace {

// The claim `name` of claim file `file`. A relative `file` is taken from
// THETAGATE_CLAIMS_DIR when the test target defines it (the package's CMake
// function thetagate_guard_claims(<target> <folder>) does), so a test finds
// its claims from any working directory, under ctest too.
inline ClaimRef claim(const std::string& file, const std::string& name) {
#ifdef THETAGATE_CLAIMS_DIR
  if (!file.empty() && !std::filesystem::path(file).is_absolute()) {
    return {(std::filesystem::path(THETAGATE_CLAIMS_DIR) / file).string(), name};
  }
#endif
  return {file, name};
}

}  // namespace

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

template <class Input>
::testing::AssertionResult guard_assertion(Model& model, const Runner<Input>& runner,
                                           GuardOptions options) {
  if (options.replay_command == GuardOptions{}.replay_command) {
    options.replay_command = current_test_command();
  }
  try {
    GuardResult result = check_code(model, runner, options);
    // THETAGATE_GUARD_COVERAGE=1: what a passing guard covered, on stdout.
    EnvSetting coverage = env_number("THETAGATE_GUARD_COVERAGE");
    if (coverage.value.value_or(0) != 0) std::fputs(result.coverage().c_str(), stdout);
    if (result.passed()) return ::testing::AssertionSuccess();
    return ::testing::AssertionFailure() << result.report();
  } catch (const ::thetagate::Error& e) {
    return ::testing::AssertionFailure() << "cannot guard '" << model.name() << "': " << e.what();
  }
}

template <class Input>
::testing::AssertionResult guard_assertion(const ClaimRef& claim, const Runner<Input>& runner,
                                           GuardOptions options) {
  std::optional<Model> model;
  try {
    model.emplace(Model::from_file(claim.file, claim.name));
  } catch (const ::thetagate::Error& e) {
    return ::testing::AssertionFailure()
           << "cannot load the claim '" << claim.name << "': " << e.what();
  }
  return guard_assertion(*model, runner, std::move(options));
}

template <class Input>
::testing::AssertionResult guard_assertion(Model&& model, const Runner<Input>& runner,
                                           GuardOptions options) {
  return guard_assertion(model, runner, std::move(options));
}

}  // namespace detail

// Checks both links; on failure the message is GuardResult::report(). A
// claim that cannot be loaded, or a model that cannot be evaluated at a
// size, fails with the error's text (thetagate::Error: InputError or
// LimitReached). What the runner's own callbacks throw, a hung or
// non-deterministic runner and a refused setting fail with
// GuardResult::error, naming n (check_code); a run that never ends and never
// counts aborts the process (GuardOptions::run_time_limit). With
// THETAGATE_GUARD_COVERAGE=1 the coverage (GuardResult::coverage()) is
// printed to stdout.
template <class ModelOrClaim, class Input>
::testing::AssertionResult Guards(ModelOrClaim&& model, const Runner<Input>& runner,
                                  GuardOptions options = {}) {
  return detail::guard_assertion(std::forward<ModelOrClaim>(model), runner, std::move(options));
}

// The predicate-formatters behind EXPECT_GUARDED: the failure message is the
// guard's report alone.
template <class ModelOrClaim, class Input>
::testing::AssertionResult GuardsFormat(const char*, const char*, ModelOrClaim&& model,
                                        const Runner<Input>& runner) {
  return Guards(std::forward<ModelOrClaim>(model), runner);
}
template <class ModelOrClaim, class Input>
::testing::AssertionResult GuardsFormat(const char*, const char*, const char*, ModelOrClaim&& model,
                                        const Runner<Input>& runner, const GuardOptions& options) {
  return Guards(std::forward<ModelOrClaim>(model), runner, options);
}

}  // namespace thetagate::guard

#define THETAGATE_GUARDED_PICK_(a, b, c, chosen, ...) chosen

// EXPECT_GUARDED(model or claim, runner[, options]): both links hold, else a
// non-fatal failure whose message is the guard's report (the witness and the
// replay command). ASSERT_GUARDED: a fatal failure.
#define EXPECT_GUARDED(...)                                                                \
  THETAGATE_GUARDED_PICK_(__VA_ARGS__, EXPECT_PRED_FORMAT3, EXPECT_PRED_FORMAT2, unused, ) \
  (::thetagate::guard::GuardsFormat, __VA_ARGS__)
#define ASSERT_GUARDED(...)                                                                \
  THETAGATE_GUARDED_PICK_(__VA_ARGS__, ASSERT_PRED_FORMAT3, ASSERT_PRED_FORMAT2, unused, ) \
  (::thetagate::guard::GuardsFormat, __VA_ARGS__)

#endif  // THETAGATE_TESTING_GTEST_H_
