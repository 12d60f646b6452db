// JSON report tests. Golden file: tests/golden/report.json. After an intended
// change, regenerate it with
//   THETAGATE_UPDATE_GOLDEN=1 <build>/thetagate_tests --gtest_filter='JsonReport*'
// and review the diff (and docs/json-schema.md if a key changed).
#include "reports/json_report.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <nlohmann/json.hpp>
#include <vector>

#include "reports/verdict_text.h"
#include "tests/golden.h"
#include "tests/support/report_fixture.h"

namespace thetagate::engine {
namespace {

using Json = nlohmann::ordered_json;
using test_support::expect_matches_golden;
using test_support::sample_run;

std::vector<std::string> keys_of(const Json& object) {
  std::vector<std::string> keys;
  for (const auto& item : object.items()) keys.push_back(item.key());
  return keys;
}

TEST(JsonReport, MatchesGolden) { expect_matches_golden("report.json", render_json(sample_run())); }

TEST(JsonReport, TopLevelKeysInOrder) {
  Json j = Json::parse(render_json(sample_run()));
  EXPECT_EQ(keys_of(j), (std::vector<std::string>{"schema_version", "tool_version", "started",
                                                  "seed", "claims"}));
  EXPECT_EQ(j["schema_version"], 3);
  EXPECT_EQ(j["seed"], 20240611u);
  EXPECT_EQ(j["claims"].size(), 6u);
}

TEST(JsonReport, ClaimKeysStartWithTheDesignKeys) {
  Json j = Json::parse(render_json(sample_run()));
  // docs/design.md §6 keys first and in that order, then the schema-1 and
  // schema-2 additions (`code`, from the link to code), then keys added
  // since (`recurrence`; `recheck`, `sizes`, `rounding`, `seconds` in schema 3,
  // `position` only in a shard).
  std::vector<std::string> expected = {"name",
                                       "file",
                                       "line",
                                       "verdict",
                                       "claimed",
                                       "derived",
                                       "method",
                                       "tight",
                                       "witnesses",
                                       "band",
                                       "message",
                                       "numeric_only",
                                       "notes",
                                       "reasons",
                                       "note",
                                       "sizes_checked",
                                       "largest_bits",
                                       "error",
                                       "function",
                                       "proof",
                                       "basis",
                                       "steps",
                                       "failed_hypotheses",
                                       "code",
                                       "recurrence",
                                       "recheck",
                                       "sizes",
                                       "rounding",
                                       "seconds"};
  for (const Json& claim : j["claims"]) EXPECT_EQ(keys_of(claim), expected);
}

TEST(JsonReport, ClaimValuesRoundTrip) {
  RunResult run = sample_run();
  Json j = Json::parse(render_json(run));
  const Json& refuted = j["claims"][1];
  EXPECT_EQ(refuted["name"], "orchard::rope::concat / rebalancing steps");
  EXPECT_EQ(refuted["file"], "claims/ropes.toml");
  EXPECT_EQ(refuted["line"], 3);
  EXPECT_EQ(refuted["verdict"], "refuted");
  EXPECT_EQ(refuted["claimed"], "O(n)");
  EXPECT_EQ(refuted["derived"], "Θ(n lg n)");
  EXPECT_EQ(refuted["method"], "master theorem, case 2");
  EXPECT_EQ(refuted["tight"], true);
  EXPECT_EQ(refuted["numeric_only"], false);
  EXPECT_EQ(refuted["message"], verdict_message(run.claims[1]));
  EXPECT_EQ(refuted["basis"]["kind"], "derivation_contradicts");
  EXPECT_EQ(refuted["proof"], "");
  EXPECT_EQ(j["claims"][0]["proof"], "master theorem, case 2");
  EXPECT_TRUE(refuted["error"].is_null());
  EXPECT_EQ(j["claims"][2]["tight"], false);
  EXPECT_EQ(j["claims"][3]["verdict"], "undecided");
  EXPECT_EQ(j["claims"][3]["numeric_only"], true);
  EXPECT_EQ(j["claims"][3]["notes"].size(), 2u);
  EXPECT_EQ(j["claims"][3]["note"], "visits at most two children per level");
  EXPECT_EQ(j["claims"][3]["largest_bits"], 3901);
}

TEST(JsonReport, WitnessSizesAreFullDecimalStrings) {
  RunResult run = sample_run();
  Json j = Json::parse(render_json(run));
  const Json& witnesses = j["claims"][1]["witnesses"];
  ASSERT_EQ(witnesses.size(), 3u);
  for (size_t i = 0; i < witnesses.size(); ++i) {
    const Witness& w = run.claims[1].witnesses[i];
    EXPECT_TRUE(witnesses[i]["n"].is_string());
    EXPECT_EQ(witnesses[i]["n"], w.n.str());
    EXPECT_EQ(witnesses[i]["value"], w.value);
    EXPECT_EQ(witnesses[i]["bound"], w.bound);
    EXPECT_EQ(witnesses[i]["side"], "upper");
    EXPECT_EQ(witnesses[i]["family"], w.family);
    EXPECT_EQ(witnesses[i]["factor"], w.factor);
    EXPECT_DOUBLE_EQ(witnesses[i]["ratio"].get<double>(), w.ratio);
  }
  EXPECT_EQ(keys_of(witnesses[0]), (std::vector<std::string>{"n", "ratio", "side", "value", "bound",
                                                             "family", "factor", "margin"}));
}

TEST(JsonReport, BandRowsCarryScaleEndsAndWhereFound) {
  RunResult run = sample_run();
  Json j = Json::parse(render_json(run));
  const Json& band = j["claims"][3]["band"];
  ASSERT_EQ(band.size(), 40u);
  EXPECT_EQ(keys_of(band[0]), (std::vector<std::string>{"scale", "low", "high", "low_at", "high_at",
                                                        "samples", "low_log2", "high_log2"}));
  EXPECT_EQ(band[39]["scale"], 3901);
  EXPECT_EQ(band[39]["high_at"], run.claims[3].band[39].high_at.str());
  EXPECT_EQ(band[39]["samples"], 24);
}

TEST(JsonReport, ErrorIsALocatedObject) {
  RunResult run = sample_run();
  Json j = Json::parse(render_json(run));
  const Json& error = j["claims"][4]["error"];
  EXPECT_EQ(j["claims"][4]["verdict"], "error");
  EXPECT_EQ(error["file"], "claims/spatial.toml");
  EXPECT_EQ(error["line"], 14);
  EXPECT_EQ(error["column"], 27);
  EXPECT_EQ(error["message"], "expected ')' after 'n/4'");
  EXPECT_EQ(error["hint"], "close the call: T(n/4)");
  EXPECT_EQ(error["text"], format_diagnostic(*run.claims[4].error));
}

TEST(JsonReport, NonFiniteRatiosAreNull) {
  RunResult run = sample_run();
  run.claims[1].witnesses[0].ratio = std::numeric_limits<double>::infinity();
  run.claims[1].band[0].low = std::nan("");
  run.claims[1].band[0].high = -std::numeric_limits<double>::infinity();
  Json j = Json::parse(render_json(run));
  EXPECT_TRUE(j["claims"][1]["witnesses"][0]["ratio"].is_null());
  EXPECT_TRUE(j["claims"][1]["band"][0]["low"].is_null());
  EXPECT_TRUE(j["claims"][1]["band"][0]["high"].is_null());
  EXPECT_TRUE(j["claims"][1]["witnesses"][1]["ratio"].is_number());
}

TEST(JsonReport, LargestSeedSurvivesExactly) {
  RunResult run;
  run.seed = std::numeric_limits<uint64_t>::max();
  Json j = Json::parse(render_json(run));
  EXPECT_EQ(j["seed"].get<uint64_t>(), std::numeric_limits<uint64_t>::max());
  EXPECT_TRUE(j["claims"].is_array());
}

TEST(JsonReport, InvalidUtf8IsReplacedNotThrown) {
  RunResult run;
  ClaimResult c;
  c.name = "bad \xff byte";
  run.claims.push_back(c);
  std::string text;
  ASSERT_NO_THROW(text = render_json(run));
  Json j = Json::parse(text);
  EXPECT_EQ(j["claims"][0]["name"], "bad \xEF\xBF\xBD byte");
}

TEST(JsonReport, PrettyPrintedWithTwoSpacesAndFinalNewline) {
  std::string text = render_json(sample_run());
  EXPECT_EQ(text.substr(0, 24), "{\n  \"schema_version\": 3,");
  EXPECT_EQ(text.back(), '\n');
}

}  // namespace
}  // namespace thetagate::engine
