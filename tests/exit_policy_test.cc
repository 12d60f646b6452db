// The command line's exit policy (cli/exit_policy.h): --fail-on words, and
// which outcomes give which exit code. The codes are the README's.
#include "cli/exit_policy.h"

#include <gtest/gtest.h>

#include "api/access.h"
#include "tests/support/report_fixture.h"

namespace thetagate::cli {
namespace {

using detail::Access;
using engine::test_support::sample_run;

Report report_of(const engine::RunResult& run) { return Access::make_report(run); }

TEST(ExitPolicy, FailOnCountsOnlyTheKindsAsked) {
  engine::RunResult run = sample_run();  // one refuted, one undecided
  engine::RunResult calm = sample_run();
  calm.claims.erase(calm.claims.begin() + 1);  // no refuted claim
  engine::RunResult changed = sample_run();
  changed.claims[0].verdict = engine::Verdict::kRefuted;  // holds today
  Report now = report_of(run);
  Drift drift = drift_from_baseline(report_of(changed), now);
  Drift none = drift_from_baseline(now, now);
  ASSERT_TRUE(drift.any());
  ASSERT_FALSE(none.any());

  EXPECT_TRUE(should_fail(now, nullptr, FailOn{}));  // default: refuted
  EXPECT_FALSE(should_fail(report_of(calm), nullptr, FailOn{}));
  EXPECT_TRUE(should_fail(report_of(calm), nullptr, FailOn{false, true, false}));
  EXPECT_FALSE(should_fail(now, &none, FailOn{false, false, true}));
  EXPECT_TRUE(should_fail(now, &drift, FailOn{false, false, true}));
  EXPECT_FALSE(should_fail(now, nullptr, FailOn{false, false, true}));  // no baseline given
  // An error verdict alone is not a failure of the claims: exit 2, not 1.
  engine::RunResult errors_only;
  errors_only.claims = {sample_run().claims[4]};
  ASSERT_EQ(errors_only.claims[0].verdict, engine::Verdict::kError);
  EXPECT_FALSE(should_fail(report_of(errors_only), nullptr, FailOn{true, true, true}));
  EXPECT_EQ(exit_code(report_of(errors_only), nullptr, FailOn{}), kExitBadInput);
}

TEST(ExitPolicy, AnInternalErrorWinsOverEveryOtherOutcome) {
  engine::RunResult run = sample_run();  // refuted and error claims too
  EXPECT_EQ(exit_code(report_of(run), nullptr, FailOn{}), kExitBadInput);  // bad input wins
  engine::RunResult refuted = sample_run();
  refuted.claims.erase(refuted.claims.begin() + 4);  // the error claim
  EXPECT_EQ(exit_code(report_of(refuted), nullptr, FailOn{}), kExitFailed);
  run.claims[2].verdict = engine::Verdict::kError;
  run.claims[2].internal_error = "vector::_M_range_check";
  EXPECT_EQ(exit_code(report_of(run), nullptr, FailOn{}), kExitInternalError);
}

TEST(ExitPolicy, ParsesFailOnWords) {
  FailOn on = parse_fail_on({"undecided,drift"});
  EXPECT_FALSE(on.refuted);
  EXPECT_TRUE(on.undecided);
  EXPECT_TRUE(on.drift);
  on = parse_fail_on({"refuted", "drift"});
  EXPECT_TRUE(on.refuted);
  EXPECT_FALSE(on.undecided);
  EXPECT_TRUE(on.drift);
  try {
    parse_fail_on({"refuted,drfit"});
    ADD_FAILURE() << "no InputError thrown";
  } catch (const InputError& e) {
    EXPECT_EQ(e.diagnostic().message, "unknown kind 'drfit'");
    EXPECT_EQ(e.diagnostic().where.file, "--fail-on");
    EXPECT_EQ(e.diagnostic().where.column, 9);
  }
  // Columns count characters, not bytes.
  try {
    parse_fail_on({"refuted,undecided,ä"});
    ADD_FAILURE() << "no InputError thrown";
  } catch (const InputError& e) {
    EXPECT_EQ(e.diagnostic().where.column, 19);
  }
}

}  // namespace
}  // namespace thetagate::cli
