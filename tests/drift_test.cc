// Drift against a baseline: reading our own JSON report back, comparing a
// run with a doctored copy of itself, and the text and JSON drift writers
// (the --fail-on decision: tests/exit_policy_test.cc).
#include "reports/drift.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <nlohmann/json.hpp>

#include "reports/baseline.h"
#include "reports/json_report.h"
#include "tests/support/report_fixture.h"

namespace thetagate::engine {
namespace {

using test_support::sample_run;
using Json = nlohmann::ordered_json;

// The message of the InputError `f` throws, or "" (and a failure) if none.
template <class F>
Diagnostic diagnostic_of(F&& f) {
  try {
    f();
  } catch (const InputError& e) {
    return e.diagnostic();
  }
  ADD_FAILURE() << "no InputError thrown";
  return {};
}

TEST(DriftBaseline, ReadsItsOwnReportBackByteForByte) {
  RunResult run = sample_run();
  std::string json = render_json(run);
  RunResult back = read_json_report(json, "old.json");
  EXPECT_EQ(render_json(back), json);
  EXPECT_EQ(back.seed, 20240611u);
  ASSERT_EQ(back.claims.size(), run.claims.size());
  EXPECT_EQ(back.claims[1].witnesses[1].n, (BigInt(1) << 1000) + 1);
  EXPECT_EQ(back.claims[1].witnesses[1].factor, "1000");
  EXPECT_EQ(back.claims[3].band.size(), 40u);
  EXPECT_EQ(back.claims[3].band[39].samples, 24u);
  // The error's source line comes back from its "text", so the diagnostic
  // renders with its caret again.
  ASSERT_TRUE(back.claims[4].error.has_value());
  EXPECT_EQ(back.claims[4].error->source_line, run.claims[4].error->source_line);
  EXPECT_EQ(format_diagnostic(*back.claims[4].error), format_diagnostic(*run.claims[4].error));
}

TEST(DriftBaseline, OverflowingBandEndsComeBackAsInfinity) {
  RunResult run;
  run.seed = 3;
  ClaimResult c;
  c.name = "orchard::rope_snapshot / copies";
  BandRow r;
  r.scale = 4095;
  r.low = r.high = INFINITY;
  r.low_log2 = 3000;
  r.high_log2 = 3100;
  c.band = {r};
  Witness w;
  w.n = 7;
  w.ratio = NAN;
  c.witnesses = {w};
  run.claims = {c};
  std::string json = render_json(run);
  RunResult back = read_json_report(json);
  EXPECT_TRUE(std::isinf(back.claims[0].band[0].high));
  EXPECT_EQ(back.claims[0].band[0].high_log2, 3100);
  EXPECT_TRUE(std::isnan(back.claims[0].witnesses[0].ratio));
  EXPECT_EQ(render_json(back), json);
}

TEST(DriftBaseline, IgnoresUnknownKeysAndTrimmedOptionalOnes) {
  std::string text = R"json({"schema_version": 1, "seed": 5, "from_a_later_release": [1, 2],
    "claims": [{"name": "a", "file": "f.toml", "line": 2, "verdict": "holds",
      "claimed": "O(n)", "derived": "", "method": "numeric", "tight": true,
      "witnesses": [{"n": "12", "ratio": null, "side": "lower"}],
      "band": [{"scale": 3, "low": 0.5, "high": 2}], "message": "", "colour": "green"}],
    "drift": {"changed": false}})json";
  RunResult run = read_json_report(text);
  ASSERT_EQ(run.claims.size(), 1u);
  EXPECT_EQ(run.claims[0].witnesses[0].side, Side::kLower);
  EXPECT_EQ(run.claims[0].band[0].high_log2, 1.0);
  EXPECT_EQ(run.claims[0].band[0].low_log2, -1.0);
  EXPECT_TRUE(run.claims[0].notes.empty());
  EXPECT_FALSE(run.claims[0].error.has_value());
}

TEST(DriftBaseline, MissingKeyIsNamedAndLocatedAtItsObject) {
  Json j = Json::parse(render_json(sample_run()));
  j["claims"][1].erase("verdict");
  std::string text = j.dump(2);
  Diagnostic d = diagnostic_of([&] { read_json_report(text, "nightly/old.json"); });
  EXPECT_EQ(d.message, "missing key 'claims[1].verdict'");
  EXPECT_EQ(d.where.file, "nightly/old.json");
  // The second claim object opens on the line after the first one closes.
  size_t second_name = text.find("\"name\": \"orchard::rope::concat");
  size_t object_line = std::count(text.begin(), text.begin() + second_name, '\n');  // 0-based
  EXPECT_EQ(d.where.line, static_cast<int>(object_line));                           // 1-based '{'
  EXPECT_EQ(d.source_line, "    {");
}

TEST(DriftBaseline, WrongTypeIsNamedAndLocatedAtTheValue) {
  std::string text = R"({"schema_version": 1, "seed": 5, "claims": [
  {"name": "a", "file": "f.toml", "line": "2", "verdict": "holds"}]})";
  Diagnostic d = diagnostic_of([&] { read_json_report(text); });
  EXPECT_EQ(d.message, "'claims[0].line' should be a whole number >= 0, not a string");
  EXPECT_EQ(d.where.file, "<baseline>");
  EXPECT_EQ(d.where.line, 2);
  EXPECT_EQ(d.where.column, 43);  // the opening quote of "2"
  EXPECT_EQ(d.source_line[d.where.column - 1], '"');
}

TEST(DriftBaseline, RejectsOtherVersionsBadVerdictsAndBadSizes) {
  Diagnostic version =
      diagnostic_of([] { read_json_report(R"({"schema_version": 4, "seed": 1, "claims": []})"); });
  EXPECT_EQ(version.message,
            "schema_version 4 is not one this thetagate reads (it reads versions 1 to 3)");
  EXPECT_EQ(version.where.column, 20);

  Diagnostic missing = diagnostic_of([] { read_json_report(R"({"seed": 1, "claims": []})"); });
  EXPECT_EQ(missing.message, "missing key 'schema_version'");
  EXPECT_EQ(missing.where.line, 1);
  EXPECT_EQ(missing.where.column, 1);

  Json j = Json::parse(render_json(sample_run()));
  j["claims"][0]["verdict"] = "passed";
  Diagnostic verdict = diagnostic_of([&] { read_json_report(j.dump(2)); });
  EXPECT_EQ(verdict.message,
            "'claims[0].verdict' is \"passed\"; expected \"holds\", \"refuted\", "
            "\"undecided\" or \"error\"");

  j = Json::parse(render_json(sample_run()));
  j["claims"][1]["witnesses"][2]["n"] = "2^4096";
  Diagnostic size = diagnostic_of([&] { read_json_report(j.dump(2)); });
  EXPECT_EQ(size.message,
            "'claims[1].witnesses[2].n' should be a size in decimal digits, not \"2^4096\"");
  EXPECT_NE(size.source_line.find("\"n\": \"2^4096\""), std::string::npos);
}

TEST(DriftBaseline, RejectsAnUnknownTheoremKindOrCodeRelation) {
  Json j = Json::parse(render_json(sample_run()));
  ASSERT_EQ(j["claims"][0]["basis"]["theorem"]["kind"], "Theta");
  j["claims"][0]["basis"]["theorem"]["kind"] = "Tetha";
  Diagnostic kind = diagnostic_of([&] { read_json_report(j.dump(2)); });
  EXPECT_EQ(kind.message,
            "'claims[0].basis.theorem.kind' is \"Tetha\"; expected \"Theta\", \"O\", \"Omega\", "
            "\"explicit\", \"upper\" or \"lower\"");

  RunResult run = sample_run();
  run.claims[0].code = CodeResult{};
  run.claims[0].code->relation = ModelRelation::kLowerBound;
  run.claims[0].code->source = "costs.txt";
  EXPECT_EQ(read_json_report(render_json(run)).claims[0].code->relation,
            ModelRelation::kLowerBound);
  j = Json::parse(render_json(run));
  ASSERT_EQ(j["claims"][0]["code"]["relation"], "lower bound");
  j["claims"][0]["code"]["relation"] = "lower";
  Diagnostic relation = diagnostic_of([&] { read_json_report(j.dump(2)); });
  EXPECT_EQ(relation.message,
            "'claims[0].code.relation' is \"lower\"; expected \"upper bound\", \"exact\" or "
            "\"lower bound\"");
}

TEST(DriftBaseline, TextThatIsNotJsonIsLocatedAtTheBadByte) {
  Diagnostic d = diagnostic_of([] { read_json_report("{\n  \"seed\": 1,\n  \"claims\": [,]\n}"); });
  EXPECT_EQ(d.where.line, 3);
  EXPECT_EQ(d.where.column, 14);  // the ','
  EXPECT_EQ(d.message.rfind("not valid JSON: syntax error", 0), 0u) << d.message;
  EXPECT_EQ(d.source_line, "  \"claims\": [,]");
}

// The sample run as yesterday's report, edited by hand: every kind of drift
// once, plus a band end that wobbles within the tolerance.
RunResult doctored_baseline() {
  Json j = Json::parse(render_json(sample_run()));
  Json& claims = j["claims"];
  claims[0]["verdict"] = "refuted";  // stable_sort: refuted → holds today
  claims[0]["derived"] = "Θ(n^2)";   // and a different derived class
  Json& rope = claims[1];
  rope["witnesses"].erase(0);  // today's n = 2048 is new
  Json extra = rope["witnesses"][0];
  extra["n"] = "4097";
  rope["witnesses"].push_back(extra);  // n = 4097 is lost today
  rope["band"][1]["high"] = 1.5;       // scale 2: today 3.5, log2 ratio 1.22: moved
  rope["band"][1]["high_log2"] = std::log2(1.5);
  rope["band"][2]["low"] = 3.4;  // scale 3: today 4, ratio 1.18: within tolerance
  rope["band"][2]["low_log2"] = std::log2(3.4);
  claims.erase(2);  // lower_bound: new today
  Json gone = claims[0];
  gone["name"] = "orchard::heap_sort / sift-downs";
  gone["line"] = 40;
  gone["verdict"] = "holds";
  claims.push_back(gone);  // lost today
  j["seed"] = 99;
  return read_json_report(j.dump(2), "old.json");
}

TEST(Drift, SameRunHasNoDrift) {
  DriftReport drift = compare_runs(sample_run(), sample_run());
  EXPECT_FALSE(drift.any());
  EXPECT_EQ(drift.compared, 6u);
  EXPECT_EQ(render_drift_text(drift, TextStyle{}),
            "\nno drift against the baseline: 6 claims compared\n");
}

TEST(Drift, FindsEveryKindOfChangeInADoctoredBaseline) {
  DriftReport drift = compare_runs(doctored_baseline(), sample_run());
  EXPECT_EQ(drift.baseline_seed, 99u);
  EXPECT_EQ(drift.current_seed, 20240611u);
  EXPECT_EQ(drift.compared, 5u);
  ASSERT_EQ(drift.claims.size(), 4u);

  const ClaimDrift& sorted = drift.claims[0];
  EXPECT_EQ(sorted.name, "orchard::stable_sort / comparisons, worst case");
  EXPECT_TRUE(sorted.verdict_changed());
  EXPECT_EQ(*sorted.before, Verdict::kRefuted);
  EXPECT_EQ(*sorted.after, Verdict::kHolds);
  EXPECT_TRUE(sorted.derived_changed());
  EXPECT_EQ(sorted.derived_before, "Θ(n^2)");

  const ClaimDrift& rope = drift.claims[1];
  EXPECT_FALSE(rope.verdict_changed());
  ASSERT_EQ(rope.new_witnesses.size(), 1u);
  EXPECT_EQ(rope.new_witnesses[0].n, 2048);
  ASSERT_EQ(rope.lost_witnesses.size(), 1u);
  EXPECT_EQ(rope.lost_witnesses[0].n, 4097);
  ASSERT_EQ(rope.band_moves.size(), 1u);  // scale 3 moved by less than 2^0.5
  EXPECT_EQ(rope.band_moves[0].after.scale, 2u);
  EXPECT_TRUE(rope.band_moves[0].high_moved);
  EXPECT_FALSE(rope.band_moves[0].low_moved);

  EXPECT_TRUE(drift.claims[2].is_new());
  EXPECT_EQ(drift.claims[2].name, "orchard::lower_bound / probes");
  EXPECT_TRUE(drift.claims[3].is_lost());
  EXPECT_EQ(drift.claims[3].name, "orchard::heap_sort / sift-downs");
  EXPECT_EQ(drift.claims[3].line, 40);
}

TEST(Drift, WitnessesMatchByNAndSide) {
  RunResult before = sample_run(), after = sample_run();
  after.claims[1].witnesses[0].side = Side::kLower;  // same n, other side
  after.claims[1].witnesses[1].ratio = 7;            // same n and side: not drift
  after.claims[1].witnesses[1].factor = "100";
  DriftReport drift = compare_runs(before, after);
  ASSERT_EQ(drift.claims.size(), 1u);
  ASSERT_EQ(drift.claims[0].new_witnesses.size(), 1u);
  EXPECT_EQ(drift.claims[0].new_witnesses[0].side, Side::kLower);
  ASSERT_EQ(drift.claims[0].lost_witnesses.size(), 1u);
  EXPECT_EQ(drift.claims[0].lost_witnesses[0].side, Side::kUpper);
}

TEST(Drift, BandEndsMoveBeyondTheToleranceOrWhenTheyStopBeingFinite) {
  RunResult before = sample_run(), after = sample_run();
  BandRow& row = after.claims[3].band[5];
  row.low_log2 = before.claims[3].band[5].low_log2 - 0.49;  // within 2^0.5
  row.high = INFINITY;                                      // finite → not: moved
  row.high_log2 = NAN;
  after.claims[3].band.pop_back();  // a lost scale is no move
  DriftReport drift = compare_runs(before, after);
  ASSERT_EQ(drift.claims.size(), 1u);
  ASSERT_EQ(drift.claims[0].band_moves.size(), 1u);
  EXPECT_FALSE(drift.claims[0].band_moves[0].low_moved);
  EXPECT_TRUE(drift.claims[0].band_moves[0].high_moved);
}

TEST(Drift, TextSectionListsEveryChange) {
  DriftReport drift = compare_runs(doctored_baseline(), sample_run());
  EXPECT_EQ(render_drift_text(drift, TextStyle{}),
            "\n"
            "drift against the baseline: 2 of 5 claims changed, 1 new, 1 lost\n"
            "    the seeds differ (baseline 99, this run 20240611): witnesses and band ends at "
            "random sizes may move for that reason alone\n"
            "changed    orchard::stable_sort / comparisons, worst case   claims/sorting.toml:1\n"
            "    verdict refuted → holds\n"
            "    derived Θ(n^2) → Θ(n lg n)\n"
            "changed    orchard::rope::concat / rebalancing steps   claims/ropes.toml:3\n"
            "    new witness n = 2048 (upper, ratio 12, c = 10)\n"
            "    lost witness n = 4097 (upper, ratio 1001, c = 1000)\n"
            "    band at scale 2: high 1.5 → 3.5\n"
            "new        orchard::lower_bound / probes   claims/sorting.toml:9   holds\n"
            "lost       orchard::heap_sort / sift-downs   claims/sorting.toml:40   was holds\n");
  std::string coloured = render_drift_text(drift, TextStyle{true});
  EXPECT_NE(coloured.find("\033[1mdrift against the baseline"), std::string::npos);
}

TEST(Drift, JsonAddsOneDriftKeyAndKeepsTheReport) {
  RunResult run = sample_run();
  DriftReport drift = compare_runs(doctored_baseline(), run);
  std::string text = render_json_with_drift(run, drift);
  Json j = Json::parse(text);
  const Json& d = j["drift"];
  EXPECT_EQ(d["baseline_seed"], 99);
  EXPECT_EQ(d["claims_compared"], 5);
  EXPECT_EQ(d["band_move_log2"], 0.5);
  EXPECT_EQ(d["changed"], true);
  ASSERT_EQ(d["claims"].size(), 4u);
  EXPECT_EQ(d["claims"][0]["change"], "changed");
  EXPECT_EQ(d["claims"][0]["verdict_before"], "refuted");
  EXPECT_EQ(d["claims"][0]["verdict_after"], "holds");
  EXPECT_EQ(d["claims"][1]["new_witnesses"][0]["n"], "2048");
  EXPECT_EQ(d["claims"][1]["lost_witnesses"][0]["n"], "4097");
  EXPECT_EQ(d["claims"][1]["band_moves"][0]["scale"], 2);
  EXPECT_EQ(d["claims"][1]["band_moves"][0]["before"]["high"], 1.5);
  EXPECT_EQ(d["claims"][1]["band_moves"][0]["after"]["high"], 3.5);
  EXPECT_EQ(d["claims"][2]["change"], "new");
  EXPECT_EQ(d["claims"][2]["verdict_before"], "");
  EXPECT_EQ(d["claims"][3]["change"], "lost");
  EXPECT_EQ(d["claims"][3]["verdict_after"], "");
  // Without "drift" it is the plain report, byte for byte; and it reads back
  // as a baseline.
  j.erase("drift");
  EXPECT_EQ(j.dump(2) + "\n", render_json(run));
  EXPECT_EQ(render_json(read_json_report(text)), render_json(run));
}

}  // namespace
}  // namespace thetagate::engine
