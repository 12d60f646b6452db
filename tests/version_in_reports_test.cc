// Every report names the thetagate that wrote it (issue 17, §3): the text
// header, JSON "tool_version", a JUnit property, the HTML footer and the
// Markdown report; a JSON report reads back with it, and a report from
// before versions were recorded reads back with none.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>
#include <string>

#include "reports/baseline.h"
#include "reports/html_report.h"
#include "reports/json_report.h"
#include "reports/junit_report.h"
#include "reports/markdown_report.h"
#include "reports/text_report.h"
#include "thetagate/version.h"

namespace thetagate::engine {
namespace {

RunResult one_claim_run() {
  RunResult run;
  run.seed = 11;
  ClaimResult c;
  c.name = "orchard::bisect / probes";
  c.verdict = Verdict::kUndecided;
  c.claimed = "Theta(lg n)";
  run.claims.push_back(c);
  return run;
}

TEST(VersionInReports, EveryFormatNamesTheVersion) {
  const std::string version = THETAGATE_VERSION_STRING;
  RunResult run = one_claim_run();
  EXPECT_EQ(render_text(run, TextStyle{}).rfind("thetagate " + version + " \u00b7 seed 11", 0), 0u);
  EXPECT_EQ(nlohmann::json::parse(render_json(run)).at("tool_version"), version);
  EXPECT_NE(render_junit(run, JunitOptions{})
                .find("<property name=\"thetagate.version\" value=\"" + version + "\"/>"),
            std::string::npos);
  EXPECT_NE(render_html(run).find("<footer><p>Checked by thetagate " + version + ".</p></footer>"),
            std::string::npos);
  EXPECT_NE(render_markdown(run).find("Seed 11, thetagate " + version + "."), std::string::npos);
}

TEST(VersionInReports, AJsonReportReadsBackWithItsVersion) {
  RunResult run = one_claim_run();
  run.tool_version = "9.8.7";
  EXPECT_EQ(read_json_report(render_json(run), "r.json").tool_version, "9.8.7");
  // A report written before the key existed: no version, not an error.
  nlohmann::json old = nlohmann::json::parse(render_json(run));
  old.erase("tool_version");
  EXPECT_EQ(read_json_report(old.dump(), "old.json").tool_version, "");
}

}  // namespace
}  // namespace thetagate::engine
