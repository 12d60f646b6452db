// Golden files from a real run: the claims of tests/data/golden_claims.toml
// checked with a fixed seed, rendered as text, JSON, JUnit XML and Markdown,
// compared byte for byte with tests/golden/run.{txt,json,junit.xml,md}. Regenerate with
//   THETAGATE_UPDATE_GOLDEN=1 build/thetagate_tests --gtest_filter='GoldenRunReport*'
// and review the diff: a change here is a change in what users see.
#include <gtest/gtest.h>

#include <fstream>
#include <sstream>

#include "reports/json_report.h"
#include "reports/junit_report.h"
#include "reports/markdown_report.h"
#include "reports/text_report.h"
#include "tests/golden.h"
#include "verifier/checking/checker.h"
#include "verifier/model/claim.h"

namespace thetagate::engine {
namespace {

using test_support::expect_matches_golden;

// The path the reports show; relative, so the golden files do not depend on
// where the tree is checked out.
const char* const kClaimFile = "tests/data/golden_claims.toml";

CheckOptions golden_options() {
  CheckOptions options;
  options.seed = 20240611;
  // Time must never decide a verdict here: only the step and memory limits,
  // which count the same on every machine, may stop a search. (A day; the
  // evaluator turns seconds into a clock deadline, so not infinity.)
  options.budget.max_seconds = 86400;
  return options;
}

RunResult check_golden_claims() {
  std::ifstream in(std::string(THETAGATE_SOURCE_DIR) + "/" + kClaimFile, std::ios::binary);
  std::stringstream text;
  text << in.rdbuf();
  return check_entries(load_claim_text(text.str(), kClaimFile), golden_options());
}

// One run shared by the tests below (checking takes a few seconds).
const RunResult& golden_run() {
  static const RunResult run = check_golden_claims();
  return run;
}

TEST(GoldenRunReport, CoversEveryVerdict) {
  const RunResult& run = golden_run();
  ASSERT_EQ(run.claims.size(), 7u);
  std::vector<std::string> verdicts;
  for (const ClaimResult& c : run.claims) verdicts.push_back(verdict_name(c.verdict));
  EXPECT_EQ(verdicts, (std::vector<std::string>{"holds", "holds", "refuted", "refuted", "undecided",
                                                "undecided", "error"}));
  // (4n^2 - 1)/3 > n^2 from n = 2 on: T(2) = 5 > 4 [calc].
  ASSERT_FALSE(run.claims[2].witnesses.empty());
  EXPECT_EQ(run.claims[2].witnesses[0].n, 2);
  EXPECT_EQ(run.claims[2].witnesses[0].value, "5");
  EXPECT_FALSE(run.claims[1].tight);
}

TEST(GoldenRunReport, SameSeedGivesTheSameBytes) {
  EXPECT_EQ(render_json(check_golden_claims()), render_json(golden_run()));
}

TEST(GoldenRunReport, Text) {
  expect_matches_golden("run.txt", render_text(golden_run(), TextStyle{}));
}

TEST(GoldenRunReport, Json) { expect_matches_golden("run.json", render_json(golden_run())); }

TEST(GoldenRunReport, Junit) {
  expect_matches_golden("run.junit.xml", render_junit(golden_run(), JunitOptions{}));
}

TEST(GoldenRunReport, Markdown) { expect_matches_golden("run.md", render_markdown(golden_run())); }

}  // namespace
}  // namespace thetagate::engine
