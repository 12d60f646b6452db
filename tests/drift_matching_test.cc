// Drift: which baseline claim a claim of this run is compared with (issue
// "Hardening, second round", items 13 and 17): by name and file below each
// run's root, then by name; repeated baseline copies are not "lost".
#include <gtest/gtest.h>

#include "tests/support/report_fixture.h"
#include "verifier/checking/run_comparison.h"

namespace thetagate::engine {
namespace {

using test_support::run_of;

ClaimResult claim(const std::string& name, const std::string& file, Verdict verdict) {
  ClaimResult c;
  c.name = name;
  c.file = file;
  c.line = 1;
  c.verdict = verdict;
  return c;
}

// `check claimsdir` against `check ./claimsdir`: the same claims, and the one
// real change is still seen.
TEST(DriftMatching, ThePathAsTypedDoesNotMatter) {
  RunResult before = run_of({claim("orchard::prune", "claimsdir/trees.toml", Verdict::kHolds),
                             claim("orchard::graft", "claimsdir/sub/graft.toml", Verdict::kHolds)});
  RunResult after =
      run_of({claim("orchard::prune", "./claimsdir/trees.toml", Verdict::kHolds),
              claim("orchard::graft", "./claimsdir/sub/../sub/graft.toml", Verdict::kRefuted)});
  DriftReport drift = compare_runs(before, after);
  EXPECT_EQ(drift.compared, 2u);
  ASSERT_EQ(drift.claims.size(), 1u);
  EXPECT_EQ(drift.claims[0].name, "orchard::graft");
  EXPECT_TRUE(drift.claims[0].verdict_changed());
  EXPECT_FALSE(drift.claims[0].is_new());
}

// The same tree checked from another folder (absolute against relative
// paths): files are compared below each run's root.
TEST(DriftMatching, FilesAreComparedBelowTheRunsRoot) {
  RunResult before = run_of({claim("a", "/home/ci/orchard/claims/x.toml", Verdict::kHolds),
                             claim("b", "/home/ci/orchard/claims/deep/y.toml", Verdict::kHolds)});
  RunResult after = run_of({claim("a", "claims/x.toml", Verdict::kHolds),
                            claim("b", "claims/deep/y.toml", Verdict::kUndecided)});
  DriftReport drift = compare_runs(before, after);
  EXPECT_EQ(drift.compared, 2u);
  ASSERT_EQ(drift.claims.size(), 1u);
  EXPECT_EQ(drift.claims[0].name, "b");
  EXPECT_EQ(drift.claims[0].before, Verdict::kHolds);
  EXPECT_EQ(drift.claims[0].after, Verdict::kUndecided);
}

// A claim whose file moved is matched by its name.
TEST(DriftMatching, AMovedClaimIsMatchedByName) {
  RunResult before = run_of({claim("a", "claims/old.toml", Verdict::kHolds),
                             claim("b", "claims/old.toml", Verdict::kHolds)});
  RunResult after = run_of({claim("a", "claims/old.toml", Verdict::kHolds),
                            claim("b", "claims/new.toml", Verdict::kRefuted)});
  DriftReport drift = compare_runs(before, after);
  EXPECT_EQ(drift.compared, 2u);
  ASSERT_EQ(drift.claims.size(), 1u);
  EXPECT_TRUE(drift.claims[0].verdict_changed());
}

// A claim that is really new, and one really gone, still show as such.
TEST(DriftMatching, NewAndLostClaimsStillShow) {
  RunResult before =
      run_of({claim("a", "c/x.toml", Verdict::kHolds), claim("gone", "c/x.toml", Verdict::kHolds)});
  RunResult after = run_of(
      {claim("a", "c/x.toml", Verdict::kHolds), claim("fresh", "c/x.toml", Verdict::kHolds)});
  DriftReport drift = compare_runs(before, after);
  EXPECT_EQ(drift.compared, 1u);
  ASSERT_EQ(drift.claims.size(), 2u);
  EXPECT_EQ(drift.claims[0].name, "fresh");
  EXPECT_TRUE(drift.claims[0].is_new());
  EXPECT_EQ(drift.claims[1].name, "gone");
  EXPECT_TRUE(drift.claims[1].is_lost());
}

// A baseline from a run that checked a claim twice (`--claim X --claim X`
// before it was read once): the copy is not a lost claim.
TEST(DriftMatching, ARepeatedBaselineClaimIsNotLost) {
  RunResult before =
      run_of({claim("x", "c/x.toml", Verdict::kHolds), claim("x", "c/x.toml", Verdict::kHolds)});
  RunResult after = run_of({claim("x", "c/x.toml", Verdict::kHolds)});
  DriftReport drift = compare_runs(before, after);
  EXPECT_EQ(drift.compared, 1u);
  EXPECT_FALSE(drift.any());
}

}  // namespace
}  // namespace thetagate::engine
