// Drift names its cause (issue 18, §2): an edit of the claim itself (its
// recurrence or bound, before → after) comes first and replaces band moves,
// which an edit causes by itself; a renamed claim (same text, new name) is
// matched, not reported as one lost and one new.
#include <gtest/gtest.h>

#include <cmath>
#include <nlohmann/json.hpp>

#include "reports/baseline.h"
#include "reports/drift.h"
#include "reports/html_report.h"
#include "reports/json_report.h"
#include "tests/support/report_fixture.h"
#include "verifier/checking/run_comparison.h"

namespace thetagate::engine {
namespace {

using test_support::run_of;

constexpr const char* kHalving = "T(n) = T(floor(n/2)) + 1\nT(1) = 1";

ClaimResult claim(const std::string& name, const std::string& recurrence, const std::string& bound,
                  double high) {
  ClaimResult c;
  c.name = name;
  c.file = "claims/search.toml";
  c.line = 1;
  c.verdict = Verdict::kHolds;
  c.recurrence = recurrence;
  c.claimed = bound;
  c.derived = "Theta(lg n)";
  BandRow row;
  row.scale = 10;
  row.low = 1;
  row.high = high;
  row.low_log2 = 0;
  row.high_log2 = std::log2(high);
  c.band = {row};
  return c;
}

TEST(DriftCause, AnEditedBoundIsNamedAndItsBandMovesAreNot) {
  RunResult before = run_of({claim("orchard::bisect / probes", kHalving, "Theta(lg n)", 1.1)});
  RunResult after = run_of({claim("orchard::bisect / probes", kHalving, "O(n)", 0.01)});
  DriftReport drift = compare_runs(before, after);
  ASSERT_EQ(drift.claims.size(), 1u);
  const ClaimDrift& d = drift.claims[0];
  EXPECT_TRUE(d.bound_edited());
  EXPECT_FALSE(d.recurrence_edited());
  EXPECT_TRUE(d.band_moves.empty());  // T(n)/g(n) moved because g did
  std::string text = render_claim_drift_text(d);
  EXPECT_NE(text.find("the bound changed: Theta(lg n) → O(n)"), std::string::npos) << text;
  EXPECT_EQ(text.find("band at scale"), std::string::npos) << text;
  nlohmann::json j = nlohmann::json::parse(render_json_with_drift(after, drift));
  EXPECT_EQ(j["drift"]["claims"][0]["claimed_before"], "Theta(lg n)");
  EXPECT_EQ(j["drift"]["claims"][0]["claimed_after"], "O(n)");
}

TEST(DriftCause, AnEditedRecurrenceIsShownOnOneLine) {
  RunResult before = run_of({claim("orchard::bisect / probes", kHalving, "Theta(lg n)", 1.1)});
  RunResult after = run_of(
      {claim("orchard::bisect / probes", "T(n) = T(floor(n/2)) + 2\nT(1) = 1", "Theta(lg n)", 2)});
  DriftReport drift = compare_runs(before, after);
  ASSERT_EQ(drift.claims.size(), 1u);
  std::string text = render_claim_drift_text(drift.claims[0]);
  EXPECT_NE(text.find("the recurrence changed: T(n) = T(floor(n/2)) + 1; T(1) = 1 → "
                      "T(n) = T(floor(n/2)) + 2; T(1) = 1"),
            std::string::npos)
      << text;
}

TEST(DriftCause, AnUneditedClaimStillShowsItsBandMoves) {
  RunResult before = run_of({claim("orchard::bisect / probes", kHalving, "Theta(lg n)", 1.1)});
  RunResult after = run_of({claim("orchard::bisect / probes", kHalving, "Theta(lg n)", 9)});
  DriftReport drift = compare_runs(before, after);
  ASSERT_EQ(drift.claims.size(), 1u);
  EXPECT_FALSE(drift.claims[0].edited());
  EXPECT_EQ(drift.claims[0].band_moves.size(), 1u);
}

TEST(DriftCause, ARenamedClaimIsMatchedByItsText) {
  RunResult before = run_of({claim("orchard::bisect / probes", kHalving, "Theta(lg n)", 1.1)});
  RunResult after = run_of({claim("orchard::bisect / comparisons", kHalving, "Theta(lg n)", 1.1)});
  DriftReport drift = compare_runs(before, after);
  EXPECT_EQ(drift.compared, 1u);
  ASSERT_EQ(drift.claims.size(), 1u);  // one renamed claim: not one lost and one new
  const ClaimDrift& d = drift.claims[0];
  EXPECT_FALSE(d.is_new());
  EXPECT_FALSE(d.is_lost());
  EXPECT_EQ(d.renamed_from, "orchard::bisect / probes");
  EXPECT_NE(render_claim_drift_text(d).find("renamed from orchard::bisect / probes"),
            std::string::npos);
  // A different text under a new name stays one lost and one new.
  RunResult other = run_of({claim("orchard::bisect / comparisons", kHalving, "O(n)", 1.1)});
  EXPECT_EQ(compare_runs(before, other).claims.size(), 2u);
}

// Sizes and rounding are part of the claim too (issue 18, §2): an edit of
// either is named first, read back from the JSON of both runs.
TEST(DriftCause, EditedSizesAndRoundingAreNamed) {
  ClaimResult old = claim("orchard::bisect / probes", kHalving, "Theta(lg n)", 1.1);
  ClaimResult now = old;
  now.sizes = "max_bits = 128";
  now.rounding = "both";
  RunResult before = read_json_report(render_json(run_of({old})), "last.json");
  RunResult after = read_json_report(render_json(run_of({now})), "now.json");
  DriftReport drift = compare_runs(before, after);
  ASSERT_EQ(drift.claims.size(), 1u);
  const ClaimDrift& d = drift.claims[0];
  EXPECT_TRUE(d.sizes_edited());
  EXPECT_TRUE(d.rounding_edited());
  std::string text = render_claim_drift_text(d);
  EXPECT_NE(text.find("the sizes changed: (defaults) → max_bits = 128"), std::string::npos) << text;
  EXPECT_NE(text.find("the rounding changed: (defaults) → both"), std::string::npos) << text;
  nlohmann::json j = nlohmann::json::parse(render_json_with_drift(after, drift));
  EXPECT_EQ(j["drift"]["claims"][0]["sizes_after"], "max_bits = 128");
  EXPECT_EQ(j["drift"]["claims"][0]["rounding_after"], "both");
  // A baseline from before reports carried the settings claims no edit.
  nlohmann::json old_json = nlohmann::json::parse(render_json(run_of({old})));
  old_json["claims"][0].erase("sizes");
  old_json["claims"][0].erase("rounding");
  RunResult older = read_json_report(old_json.dump(), "older.json");
  EXPECT_FALSE(compare_runs(older, after).claims.size() == 1 &&
               compare_runs(older, after).claims[0].edited());
}

TEST(DriftCause, ABaselineWithoutRecurrencesReportsNoEdit) {
  // Written before reports carried the recurrence: its absence is not an edit.
  ClaimResult old = claim("orchard::bisect / probes", "", "Theta(lg n)", 1.1);
  RunResult before = run_of({old});
  RunResult after = run_of({claim("orchard::bisect / probes", kHalving, "Theta(lg n)", 1.1)});
  EXPECT_FALSE(compare_runs(before, after).any());
}

// A claim that held by a theorem and now holds only by induction, or no
// longer holds, says how its proof changed.
TEST(DriftCause, AChangedProofIsNamed) {
  ClaimResult theorem = claim("orchard::bisect / probes", kHalving, "Theta(lg n)", 1.1);
  theorem.basis.kind = BasisKind::kDerivationAgrees;
  theorem.method = "master theorem, case 2";
  ClaimResult induction = theorem;
  induction.basis.kind = BasisKind::kInduction;
  DriftReport drift = compare_runs(run_of({theorem}), run_of({induction}));
  ASSERT_EQ(drift.claims.size(), 1u);
  EXPECT_TRUE(drift.claims[0].proof_changed());
  EXPECT_NE(render_claim_drift_text(drift.claims[0])
                .find("the proof changed: master theorem, case 2 → induction"),
            std::string::npos)
      << render_claim_drift_text(drift.claims[0]);
  ClaimResult lost = theorem;
  lost.verdict = Verdict::kUndecided;
  lost.basis.kind = BasisKind::kBudgetReached;
  DriftReport gone = compare_runs(run_of({theorem}), run_of({lost}));
  ASSERT_EQ(gone.claims.size(), 1u);
  EXPECT_NE(render_claim_drift_text(gone.claims[0])
                .find("no longer proved (it held by master theorem, case 2)"),
            std::string::npos)
      << render_claim_drift_text(gone.claims[0]);
  nlohmann::json j = nlohmann::json::parse(render_json_with_drift(run_of({induction}), drift));
  EXPECT_EQ(j["drift"]["claims"][0]["proof_before"], "master theorem, case 2");
  EXPECT_EQ(j["drift"]["claims"][0]["proof_after"], "induction");
}

// HTML: the drift comes first, each drifted claim with its cause, and a run
// without drift says that nothing changed.
TEST(DriftCause, TheHtmlReportOpensWithTheDrift) {
  RunResult before = run_of({claim("orchard::bisect / probes", kHalving, "Theta(lg n)", 1.1)});
  RunResult after = run_of({claim("orchard::bisect / probes", kHalving, "O(n)", 0.01)});
  DriftReport drift = compare_runs(before, after);
  std::string html = render_html(after, &drift);
  size_t section = html.find("<h2>Changes since the baseline</h2>");
  size_t table = html.find("<table class=\"summary\">");
  ASSERT_NE(section, std::string::npos) << html;
  EXPECT_LT(section, table);
  EXPECT_NE(html.find("the bound changed: Theta(lg n) → O(n)"), std::string::npos) << html;
  EXPECT_EQ(render_html(after).find("Changes since the baseline"), std::string::npos);
  DriftReport none = compare_runs(after, after);
  EXPECT_NE(render_html(after, &none).find("nothing changed"), std::string::npos);
}

// HTML reading order: refuted before drifted before holding claims; a claim
// that holds without drift is collapsed, the others are open.
TEST(DriftCause, TheHtmlReportPutsWhatNeedsAReaderFirst) {
  ClaimResult steady = claim("orchard::a / holds", kHalving, "Theta(lg n)", 1.1);
  ClaimResult edited = claim("orchard::b / edited", kHalving, "Theta(lg n)", 1.1);
  ClaimResult broken = claim("orchard::c / refuted", kHalving, "O(1)", 1.1);
  broken.verdict = Verdict::kRefuted;
  RunResult before = run_of({steady, edited, broken});
  ClaimResult edited_now = edited;
  edited_now.claimed = "O(n)";
  RunResult after = run_of({steady, edited_now, broken});
  DriftReport drift = compare_runs(before, after);
  std::string html = render_html(after, &drift);
  size_t refuted = html.find("<section class=\"claim refuted\" id=\"claim-3\">");
  size_t drifted = html.find("<section class=\"claim holds\" id=\"claim-2\">\n<h2>");
  size_t holds = html.find("<section class=\"claim holds\" id=\"claim-1\">\n<details>\n<summary>");
  ASSERT_NE(refuted, std::string::npos) << html;
  ASSERT_NE(drifted, std::string::npos) << html;
  ASSERT_NE(holds, std::string::npos) << html;
  EXPECT_LT(refuted, drifted);
  EXPECT_LT(drifted, holds);
}

}  // namespace
}  // namespace thetagate::engine
