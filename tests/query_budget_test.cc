// Budgets of long-lived evaluators and the options that set them (issue 22,
// item 19): the step and time budgets renew per query where an evaluator
// answers independent queries (the public Evaluator, the guard's Model), and
// a clock limit must be a number.
#include <gtest/gtest.h>

#include <bit>
#include <cmath>
#include <limits>
#include <string>

#include "thetagate/thetagate.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/recurrence.h"

namespace thetagate::engine {
namespace {

// T(k * 2^40) walks 40 halvings before it meets the chains of smaller k:
// about 40 new subproblems per query, so 100 queries need about 4000 steps.
constexpr const char* kHalving = "T(n) = T(floor(n/2)) + 1; T(1) = 1";

BigInt scaled(uint64_t k) { return BigInt(k) * BigInt(uint64_t{1} << 40); }

TEST(QueryBudget, WithoutStartQueryTheStepBudgetCoversTheEvaluatorsLife) {
  Budget budget;
  budget.max_steps = 500;
  budget.max_seconds = 0;  // work only: the clock must not decide on a loaded machine
  Evaluator ev(recurrence_from_text(kHalving), budget);
  EXPECT_THROW(
      {
        for (uint64_t k = 1; k <= 100; ++k) ev.value_at(scaled(k));
      },
      BudgetExceeded);
}

// Before: the public Evaluator shared one 30M-step budget over its life, so
// after about 112k queries every new size threw LimitReached.
TEST(QueryBudget, StartQueryRenewsTheStepBudgetForEveryQuery) {
  Budget budget;
  budget.max_steps = 500;
  budget.max_seconds = 0;
  Evaluator ev(recurrence_from_text(kHalving), budget);
  for (uint64_t k = 1; k <= 100; ++k) {
    ev.start_query();
    Value v = ev.value_at(scaled(k));
    // T(m) = floor(lg m) + 1, so T(k 2^40) = floor(lg k) + 41 (from memory).
    EXPECT_EQ(v.integer(), BigInt(std::bit_width(k) + 40)) << k;
  }
  EXPECT_GT(ev.stats().steps, 500u);  // more than one budget's worth in all
  // One query alone is still bounded.
  Budget tiny = budget;
  tiny.max_steps = 10;
  Evaluator small(recurrence_from_text(kHalving), tiny);
  small.start_query();
  EXPECT_THROW(small.value_at(scaled(3)), BudgetExceeded);
}

TEST(QueryBudget, NanMaxSecondsMeansNoClockNotUndefinedBehaviour) {
  Budget budget;
  budget.max_seconds = std::numeric_limits<double>::quiet_NaN();
  Evaluator ev(recurrence_from_text(kHalving), budget);
  EXPECT_EQ(ev.value_at(scaled(1)).integer(), BigInt(41));
}

}  // namespace
}  // namespace thetagate::engine

namespace {

// The public Evaluator renews its step budget (30 million) on every call:
// two calls of 16 million new subproblems each pass, where one life-long
// budget ran out in the second.
TEST(PublicEvaluator, EveryCallGetsTheWholeStepBudget) {
#if defined(__SANITIZE_ADDRESS__)
  GTEST_SKIP() << "16 million steps outlast a call's 20 s clock under AddressSanitizer";
#endif
  thetagate::Evaluator ev(thetagate::Recurrence::parse("T(n) = T(n - 1) + 1; T(0) = 0"));
  EXPECT_EQ(ev.value_at("16000000"), "16000000");
  EXPECT_EQ(ev.value_at("32000000"), "32000000");
}

// Before: clock_limit = NaN passed the "not negative" test and was used.
TEST(PublicCheckOptions, ClockLimitMustBeANumberOfSecondsInRange) {
  thetagate::Claim claim = thetagate::Claim::from_text(
      "orchard::halve / steps", "T(n) = T(floor(n/2)) + 1; T(1) = 1", "Theta(lg n)");
  for (double bad : {std::nan(""), std::numeric_limits<double>::infinity(), -1.0, 2e6}) {
    thetagate::CheckOptions options;
    options.clock_limit = bad;
    try {
      thetagate::check(claim, options);
      ADD_FAILURE() << "accepted clock_limit " << bad;
    } catch (const thetagate::InputError& e) {
      EXPECT_EQ(e.diagnostic().message.rfind(
                    "clock_limit must be a number of seconds from 0 to 1000000, found ", 0),
                0u)
          << e.what();
    }
  }
  thetagate::CheckOptions fine;
  fine.clock_limit = 0;  // no clock
  EXPECT_EQ(thetagate::check(claim, fine).verdict, thetagate::Verdict::kHolds);
}

}  // namespace
