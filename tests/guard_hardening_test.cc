// Hardening the guard (include/thetagate/testing/rapidcheck.h, gtest.h, cost.h):
// runs that never end, replay settings out of range, exceptions from the
// maintainer's callbacks, non-deterministic runners (issue 22, items 9, 11, 18).
#include <gtest/gtest.h>
#include <rapidcheck/shrinkable/Create.h>
#include <rapidcheck/shrinkable/Transform.h>

#include <algorithm>
#include <atomic>
#include <cmath>
#include <cstdlib>
#include <map>
#include <memory>
#include <optional>
#include <stdexcept>
#include <string>
#include <type_traits>
#include <vector>

#include "thetagate/testing/gtest.h"

namespace thetagate::guard {
namespace {

const char* kMergeRecurrence = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0";

// A top-down merge sort as commonly written: at most T(n) comparisons.
void merge_sort(std::vector<int>& v, size_t lo, size_t hi, std::vector<int>& scratch,
                CostCounter& cost) {
  if (hi - lo < 2) return;
  size_t mid = lo + (hi - lo) / 2;
  merge_sort(v, lo, mid, scratch, cost);
  merge_sort(v, mid, hi, scratch, cost);
  auto less = counting(cost);
  size_t i = lo, j = mid, k = lo;
  while (i < mid && j < hi) scratch[k++] = less(v[j], v[i]) ? v[j++] : v[i++];
  while (i < mid) scratch[k++] = v[i++];
  while (j < hi) scratch[k++] = v[j++];
  std::copy(scratch.begin() + lo, scratch.begin() + hi, v.begin() + lo);
}

void sort_counted(uint64_t n, const std::vector<int>& input, CostCounter& cost) {
  std::vector<int> v = input, scratch(n);
  merge_sort(v, 0, n, scratch, cost);
}

Runner<std::vector<int>> merge_runner() {
  Runner<std::vector<int>> r;
  r.name = "merge sort";
  r.inputs = [](uint64_t n) {
    return rc::gen::container<std::vector<int>>(n, rc::gen::inRange(0, 1000));
  };
  r.run = sort_counted;
  return r;
}

GuardOptions quick() {
  GuardOptions o;
  o.seed = 7;
  o.max_n = 64;
  o.inputs_per_size = 5;
  o.search_steps = 5;
  o.check_bound = false;
  return o;
}

Model merge_model(Relation relation = Relation::kUpperBound, uint64_t max_n = 64) {
  return Model::from_text("merge", kMergeRecurrence, "Theta(n lg n)", relation, max_n);
}

// Sets an environment variable for one scope.
class ScopedEnv {
 public:
  ScopedEnv(const char* name, const char* value) : name_(name) {
    if (const char* old = std::getenv(name)) old_ = old;
    setenv(name, value, 1);
  }
  ~ScopedEnv() {
    if (old_)
      setenv(name_, old_->c_str(), 1);
    else
      unsetenv(name_);
  }

 private:
  const char* name_;
  std::optional<std::string> old_;
};

bool contains(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

// ---- Item 9: runs that never end ----

TEST(CostCounterLimits, CeilingStopsTheRunWithTheCountPastIt) {
  CostCounter c;
  c.set_ceiling(3);
  c.add(2);
  c.add(1);  // 3: at the ceiling, still allowed
  try {
    c.add(2);
    FAIL() << "no RunStopped";
  } catch (const RunStopped& s) {
    EXPECT_EQ(s.reason(), RunStopped::Reason::kCeiling);
    EXPECT_EQ(s.count(), 5u);
  }
  EXPECT_EQ(c.count(), 5u);            // the count shows the passed ceiling
  EXPECT_THROW(c.add(0), RunStopped);  // and every later add stops again
  // Not a std::exception: code that recovers from its own errors with
  // catch (const std::exception&) lets it through.
  EXPECT_FALSE((std::is_base_of_v<std::exception, RunStopped>));
}

TEST(CostCounterLimits, StopFlagStopsTheNextAddAndAPlainCounterNeverStops) {
  std::atomic<bool> flag{false};
  CostCounter c;
  c.stop_when(flag);
  c.add(10);
  flag = true;
  try {
    c.add(1);
    FAIL() << "no RunStopped";
  } catch (const RunStopped& s) {
    EXPECT_EQ(s.reason(), RunStopped::Reason::kStopped);
  }
  CostCounter plain;
  plain.add(~uint64_t{0});
  EXPECT_EQ(plain.count(), ~uint64_t{0});
  EXPECT_EQ(plain.ceiling(), ~uint64_t{0});
  EXPECT_THROW(plain.add(1), CostOverflow);
}

// Before: a runner that counts forever hung the test although its count
// passed T(n) at once.
TEST(GuardHardening, EndlessCountingIsStoppedAsSoonAsItPassesTheModel) {
  Model model = merge_model();
  Runner<std::vector<int>> r = merge_runner();
  r.run = [](uint64_t n, const std::vector<int>& input, CostCounter& cost) {
    if (n < 5) return sort_counted(n, input, cost);
    for (;;) cost.add();
  };
  GuardResult result = check_code(model, r, quick());
  ASSERT_TRUE(result.violation.has_value()) << result.report();
  EXPECT_EQ(result.violation->n, 5u);
  EXPECT_EQ(result.violation->model, "8");  // T(5) = 8
  EXPECT_EQ(result.violation->cost, 9u);    // stopped at the first count past it
  EXPECT_TRUE(result.violation->stopped);
  EXPECT_FALSE(result.error.has_value()) << *result.error;
  std::string report = result.report();
  EXPECT_TRUE(contains(report, "the run at n = 5 was stopped as soon as its count passed T(n)"))
      << report;
  EXPECT_TRUE(contains(report, "counted cost 9 > T(n) = 8")) << report;
}

TEST(GuardHardening, ExactModelStopsTheRunToo) {
  Model model = merge_model(Relation::kExact);
  Runner<std::vector<int>> r = merge_runner();
  r.run = [](uint64_t, const std::vector<int>&, CostCounter& cost) {
    for (;;) cost.add();
  };
  GuardResult result = check_code(model, r, quick());
  ASSERT_TRUE(result.violation.has_value()) << result.report();
  EXPECT_EQ(result.violation->n, 1u);
  EXPECT_EQ(result.violation->cost, 1u);  // T(1) = 0
  EXPECT_TRUE(result.violation->stopped);
}

TEST(GuardHardening, ARunnerThatSwallowsTheStopStillBreaksTheModel) {
  Model model = merge_model();
  Runner<std::vector<int>> r = merge_runner();
  r.run = [](uint64_t n, const std::vector<int>& input, CostCounter& cost) {
    if (n < 3) return sort_counted(n, input, cost);
    try {
      for (;;) cost.add();
    } catch (...) {
      // Swallows everything, then returns as if it had finished.
    }
  };
  GuardResult result = check_code(model, r, quick());
  ASSERT_TRUE(result.violation.has_value()) << result.report();
  EXPECT_EQ(result.violation->n, 3u);
  EXPECT_EQ(result.violation->cost, 4u);  // T(3) = 3
  EXPECT_TRUE(result.violation->stopped);
}

// A lower-bound model allows any larger count: the time limit ends the run.
TEST(GuardHardening, EndlessCountingUnderALowerBoundStopsAtTheTimeLimitNamingN) {
  Model model = Model::from_text("floor", "T(n) = T(n-1) + 1; T(1) = 0", "Theta(n)",
                                 Relation::kLowerBound, 64);
  Runner<std::vector<int>> r = merge_runner();
  r.run = [](uint64_t n, const std::vector<int>& input, CostCounter& cost) {
    if (n < 4) return sort_counted(n, input, cost);
    for (;;) cost.add();
  };
  GuardOptions options = quick();
  options.run_time_limit = 0.05;
  GuardResult result = check_code(model, r, options);
  ASSERT_TRUE(result.error.has_value()) << result.report();
  EXPECT_EQ(result.error->rfind("the run at n = 4 on input [", 0), 0u) << *result.error;
  EXPECT_TRUE(contains(*result.error, "passed its time limit of 0.05 s")) << *result.error;
  EXPECT_FALSE(result.violation.has_value());
  EXPECT_FALSE(result.passed());
}

// A run that never counts cannot be stopped: the watchdog names n and aborts.
TEST(GuardHardeningDeathTest, ARunThatNeverCountsAbortsNamingNAndTheReplay) {
  GTEST_FLAG_SET(death_test_style, "threadsafe");
  auto hang = [] {
    Model model = merge_model();
    Runner<std::vector<int>> r = merge_runner();
    r.run = [](uint64_t n, const std::vector<int>& input, CostCounter& cost) {
      if (n < 6) return sort_counted(n, input, cost);
      volatile bool forever = true;
      while (forever) {
      }
    };
    GuardOptions options = quick();
    options.run_time_limit = 0.05;
    options.replay_command = "./orchard_tests";
    check_code(model, r, options);
  };
  EXPECT_DEATH(hang(),
               "runner 'merge sort' of 'merge' is hung at n = 6.*\n.*replay: "
               "THETAGATE_GUARD_SEED=7 THETAGATE_GUARD_N=6 ./orchard_tests");
}

TEST(GuardHardening, RunTimeLimitMustBeAFiniteNumberOfSeconds) {
  Model model = merge_model();
  for (double bad : {-1.0, std::nan(""), 1e300}) {
    GuardOptions options = quick();
    options.run_time_limit = bad;
    GuardResult result = check_code(model, merge_runner(), options);
    ASSERT_TRUE(result.error.has_value()) << bad;
    EXPECT_TRUE(contains(*result.error, "run_time_limit must be a number of seconds")) << bad;
    EXPECT_EQ(result.runs, 0u);
  }
}

// ---- Item 11: replay settings ----

// Before: THETAGATE_GUARD_N=100000000 ran the guard at n = 10^8 though max_n
// was 64.
TEST(GuardHardening, ReplaySizeOutsideOneToMaxNIsRefused) {
  Model model = merge_model(Relation::kUpperBound, 64);
  GuardOptions options = quick();
  options.max_n.reset();  // the model's max_n, 64
  for (const char* n : {"100000000", "65", "0"}) {
    ScopedEnv env("THETAGATE_GUARD_N", n);
    GuardResult result = check_code(model, merge_runner(), options);
    ASSERT_TRUE(result.error.has_value()) << n;
    EXPECT_EQ(*result.error, "THETAGATE_GUARD_N=" + std::string(n) +
                                 " is outside the sizes this guard runs, 1 to max_n = 64: "
                                 "replay a size the guard reported, or raise max_n (the "
                                 "claim's [claim.code] max_n, or GuardOptions::max_n)");
    EXPECT_EQ(result.runs, 0u);
  }
  {
    ScopedEnv env("THETAGATE_GUARD_N", "64");  // max_n itself runs
    GuardResult result = check_code(model, merge_runner(), options);
    EXPECT_TRUE(result.passed()) << result.report();
    ASSERT_EQ(result.rows.size(), 1u);
    EXPECT_EQ(result.rows.front().n, 64u);
  }
  options.only_n = 65;  // the same rule for the option
  GuardResult result = check_code(model, merge_runner(), options);
  ASSERT_TRUE(result.error.has_value());
  EXPECT_EQ(result.error->rfind("GuardOptions::only_n = 65 is outside", 0), 0u) << *result.error;
}

// Before: THETAGATE_GUARD_SEED=-5 was read as 2^64 - 5, and a size past
// 2^64 - 1 saturated to it.
TEST(GuardHardening, UnparsableReplaySettingsAreRefused) {
  Model model = merge_model();
  for (const char* seed : {"-5", "+5", " 5", "5x", "18446744073709551616", "0x10"}) {
    ScopedEnv env("THETAGATE_GUARD_SEED", seed);
    GuardOptions options = quick();
    options.seed.reset();
    GuardResult result = check_code(model, merge_runner(), options);
    ASSERT_TRUE(result.error.has_value()) << seed;
    EXPECT_EQ(*result.error, "THETAGATE_GUARD_SEED='" + std::string(seed) +
                                 "' is not a whole number from 0 to 18446744073709551615 "
                                 "(decimal digits only): unset it, or copy the replay command "
                                 "of a guard failure");
    EXPECT_EQ(result.runs, 0u);
  }
  for (const char* n : {"99999999999999999999999", "-3", "3.0"}) {
    ScopedEnv env("THETAGATE_GUARD_N", n);
    GuardResult result = check_code(model, merge_runner(), quick());
    ASSERT_TRUE(result.error.has_value()) << n;
    EXPECT_EQ(result.error->rfind("THETAGATE_GUARD_N='" + std::string(n) + "' is not a whole", 0),
              0u)
        << *result.error;
  }
  {
    ScopedEnv env("THETAGATE_GUARD_SEED", "18446744073709551615");  // 2^64 - 1 is a seed
    GuardOptions options = quick();
    options.seed.reset();
    GuardResult result = check_code(model, merge_runner(), options);
    EXPECT_TRUE(result.passed()) << result.report();
    EXPECT_EQ(result.seed, ~uint64_t{0});
  }
}

// ---- Item 18: exceptions from the maintainer's callbacks ----

// Counts T(n) + 1 on the first run of each input (a violation) and behaves
// otherwise as `later` says: a runner whose witness does not replay.
Runner<std::vector<int>> first_run_breaks(bool later_throws) {
  Runner<std::vector<int>> r = merge_runner();
  auto seen = std::make_shared<std::map<std::vector<int>, int>>();
  r.run = [seen, later_throws](uint64_t n, const std::vector<int>& input, CostCounter& cost) {
    if (n < 4) return sort_counted(n, input, cost);
    if ((*seen)[input]++ == 0) {
      cost.add(9);  // T(4) = 5 and T(5) = 8: past both
      return;
    }
    if (later_throws) throw std::runtime_error("second run");
  };
  return r;
}

// Before: the runner throwing in the final re-run after shrinking escaped
// check_code.
TEST(GuardHardening, ARunnerThrowingWhenTheWitnessIsReRunIsReportedNotThrown) {
  Model model = merge_model();
  for (uint64_t shrink_runs : {uint64_t{0}, uint64_t{4000}}) {
    GuardOptions options = quick();
    options.max_shrink_runs = shrink_runs;
    GuardResult result = check_code(model, first_run_breaks(true), options);
    ASSERT_TRUE(result.error.has_value()) << shrink_runs;
    EXPECT_EQ(result.error->rfind("the runner is not deterministic at n = 4: on input [", 0), 0u)
        << *result.error;
    EXPECT_TRUE(contains(*result.error,
                         "it counted 9 (T(n) = 5), then threw: second run on a "
                         "re-run of the same input"))
        << *result.error;
    EXPECT_FALSE(result.violation.has_value());
  }
}

// Before: "counted cost 0 < T(n) = 5" was reported as a violation of an
// upper-bound model.
TEST(GuardHardening, ANonDeterministicRunnerIsNamedNotReportedAsAViolation) {
  Model model = merge_model();
  GuardResult result = check_code(model, first_run_breaks(false), quick());
  ASSERT_TRUE(result.error.has_value()) << result.report();
  EXPECT_TRUE(contains(*result.error, "the runner is not deterministic at n = 4")) << *result.error;
  EXPECT_TRUE(contains(*result.error, "it counted 9 (T(n) = 5), then counted 0 on a re-run"))
      << *result.error;
  EXPECT_FALSE(result.violation.has_value());
  EXPECT_FALSE(contains(result.report(), "counted cost 0")) << result.report();
}

TEST(GuardHardening, InputsThrowingOrFailingToGenerateNameN) {
  Model model = merge_model();
  Runner<std::vector<int>> r = merge_runner();
  r.inputs = [](uint64_t n) {
    if (n == 4) throw std::length_error("vector too long");
    return rc::gen::container<std::vector<int>>(n, rc::gen::inRange(0, 1000));
  };
  GuardResult thrown = check_code(model, r, quick());
  ASSERT_TRUE(thrown.error.has_value());
  EXPECT_EQ(*thrown.error, "`inputs` of runner 'merge sort' threw at n = 4: vector too long");

  // RapidCheck gives up on a generator whose filter rejects everything.
  r.inputs = [](uint64_t n) {
    auto any = rc::gen::container<std::vector<int>>(n, rc::gen::inRange(0, 1000));
    if (n < 3) return any;
    return rc::gen::suchThat(any, [](const std::vector<int>&) { return false; });
  };
  GuardResult failed = check_code(model, r, quick());
  ASSERT_TRUE(failed.error.has_value());
  EXPECT_EQ(failed.error->rfind("generating input 0 at n = 3 failed (`inputs` of runner 'merge "
                                "sort'): ",
                                0),
            0u)
      << *failed.error;
}

TEST(GuardHardening, MutateShrinkAndShowThrowingAreReportedNotThrown) {
  Model model = merge_model();
  Runner<std::vector<int>> r = merge_runner();
  r.mutate = [](const std::vector<int>&, uint64_t n, std::mt19937_64&) -> std::vector<int> {
    if (n == 2) throw std::runtime_error("no mutation");
    return std::vector<int>(n, 1);
  };
  GuardResult mutated = check_code(model, r, quick());
  ASSERT_TRUE(mutated.error.has_value());
  EXPECT_EQ(mutated.error->rfind("`mutate` of runner 'merge sort' threw at n = 2 on input [", 0),
            0u)
      << *mutated.error;
  EXPECT_TRUE(contains(*mutated.error, "]: no mutation")) << *mutated.error;

  // Building a shrunk candidate throws (a mapped generator whose mapping
  // refuses the value it shrinks to): the violation stays, unshrunk, and the
  // error says why. (A shrink function that throws is RapidCheck's business:
  // Shrinkable::shrinks() and Seq::next() read it as "no more shrinks".)
  r.mutate = nullptr;
  r.inputs = [](uint64_t n) {
    return rc::Gen<std::vector<int>>([n](const rc::Random&, int) {
      auto one_to_zero = rc::shrinkable::shrinkRecur(
          1, [](int k) { return k > 0 ? rc::seq::just(k - 1) : rc::Seq<int>(); });
      return rc::shrinkable::map(one_to_zero, [n](int k) {
        if (k == 0) throw std::runtime_error("no input from 0");
        return std::vector<int>(n, k);
      });
    });
  };
  r.run = [](uint64_t n, const std::vector<int>& input, CostCounter& cost) {
    sort_counted(n, input, cost);
    if (n >= 3 && input[0] == 1) cost.add(n);
  };
  GuardResult shrunk = check_code(model, r, quick());
  ASSERT_TRUE(shrunk.violation.has_value()) << shrunk.report();
  EXPECT_EQ(shrunk.violation->n, 3u);
  EXPECT_EQ(shrunk.violation->input, "[1, 1, 1]");
  ASSERT_TRUE(shrunk.error.has_value());
  EXPECT_EQ(*shrunk.error,
            "shrinking the failing input threw at n = 3: no input from 0; the input shown is the "
            "smallest found before");

  // show throwing while an error is being reported.
  Runner<std::vector<int>> s = merge_runner();
  s.run = [](uint64_t n, const std::vector<int>&, CostCounter&) {
    if (n == 2) throw std::runtime_error("boom");
  };
  s.show = [](const std::vector<int>&) -> std::string { throw std::runtime_error("no text"); };
  GuardResult shown = check_code(model, s, quick());
  ASSERT_TRUE(shown.error.has_value());
  EXPECT_EQ(*shown.error, "the runner threw at n = 2 on input <runner.show threw: no text>: boom");
}

// Before: a runner without `inputs` threw std::bad_function_call.
TEST(GuardHardening, ARunnerWithoutInputsOrRunIsAnError) {
  Model model = merge_model();
  Runner<std::vector<int>> r;
  r.name = "half";
  r.run = sort_counted;
  GuardResult no_inputs = check_code(model, r, quick());
  ASSERT_TRUE(no_inputs.error.has_value());
  EXPECT_EQ(*no_inputs.error, "runner 'half' has no `inputs`: it is required");
  Runner<std::vector<int>> q = merge_runner();
  q.run = nullptr;
  GuardResult no_run = check_code(model, q, quick());
  ASSERT_TRUE(no_run.error.has_value());
  EXPECT_EQ(*no_run.error, "runner 'merge sort' has no `run`: it is required");
}

TEST(GuardHardening, TheAssertionFailsWithTheMessageInsteadOfThrowing) {
  Model model = merge_model();
  Runner<std::vector<int>> r = merge_runner();
  r.inputs = [](uint64_t n) -> rc::Gen<std::vector<int>> {
    if (n == 3) throw 42;  // not even a std::exception
    return rc::gen::container<std::vector<int>>(n, rc::gen::inRange(0, 1000));
  };
  ::testing::AssertionResult guarded = Guards(model, r, quick());
  EXPECT_FALSE(guarded);
  EXPECT_TRUE(contains(guarded.message(),
                       "code -> model: `inputs` of runner 'merge sort' threw at n = 3: a "
                       "non-standard exception"))
      << guarded.message();
}

// ---- Item 19: a claim built in code ----

// Before: a line break in the name came back as an error about TOML the
// caller never wrote.
TEST(GuardModelFromText, ANameWithALineBreakIsRefusedWithoutTalkOfToml) {
  for (const char* name : {"merge\nsort", "merge\rsort", "merge\x01"}) {
    try {
      Model::from_text(name, kMergeRecurrence, "Theta(n lg n)");
      ADD_FAILURE() << "accepted " << name;
    } catch (const InputError& e) {
      EXPECT_EQ(e.diagnostic().message,
                "a claim name cannot contain a line break or another control character");
      EXPECT_EQ(e.diagnostic().where.file, "<claim>");
      std::string text = e.what();
      EXPECT_FALSE(contains(text, "TOML") || contains(text, "toml") || contains(text, "'''"))
          << text;
    }
  }
  EXPECT_THROW(Model::from_text(" ", kMergeRecurrence, "O(n^2)"), InputError);
  // A tab is a character of a one-line name; so are quotes.
  EXPECT_EQ(Model::from_text("orchard's\tmerge", kMergeRecurrence, "O(n^2)").name(),
            "orchard's\tmerge");
}

TEST(GuardModelFromText, ErrorsAreLocatedInTheTextTheCallerWrote) {
  try {
    Model::from_text("bad", "T(n) = 2T(n/2 + n", "O(n)");
    ADD_FAILURE() << "no error";
  } catch (const InputError& e) {
    EXPECT_EQ(e.diagnostic().where.file, "<recurrence>") << e.what();
    EXPECT_EQ(e.diagnostic().where.line, 1) << e.what();
    EXPECT_FALSE(contains(e.what(), "recurrence = '''")) << e.what();
  }
  try {
    Model::from_text("bad bound", kMergeRecurrence, "Theta(n lg");
    ADD_FAILURE() << "no error";
  } catch (const InputError& e) {
    EXPECT_EQ(e.diagnostic().where.file, "<bound>") << e.what();
  }
}

}  // namespace
}  // namespace thetagate::guard
