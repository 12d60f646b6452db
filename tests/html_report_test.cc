// HTML report tests: self-contained page, one section per claim, one sized
// SVG band plot per claim with a band. The browser check runs Debian's
// `chromium` headless and skips with a message where it is absent.
#include <gtest/gtest.h>

#include <sys/wait.h>
#include <unistd.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <sstream>

#include "reports/band_plot.h"
#include "reports/html_report.h"
#include "tests/report_fixture.h"

namespace thetagate {
namespace {

using test_support::sample_run;

size_t count_of(const std::string& text, const std::string& needle) {
  size_t count = 0;
  for (size_t at = text.find(needle); at != std::string::npos; at = text.find(needle, at + 1)) {
    ++count;
  }
  return count;
}

TEST(HtmlReport, IsSelfContainedWithoutScript) {
  std::string html = render_html(sample_run());
  EXPECT_EQ(html.rfind("<!DOCTYPE html>\n", 0), 0u);
  EXPECT_EQ(html.find("<script"), std::string::npos);
  EXPECT_EQ(html.find("http://"), std::string::npos);
  EXPECT_EQ(html.find("https://"), std::string::npos);
  EXPECT_EQ(html.find(" src="), std::string::npos);
  EXPECT_EQ(html.find("<link"), std::string::npos);
}

TEST(HtmlReport, OneSectionPerClaimAndOnePlotPerBand) {
  RunResult run = sample_run();
  std::string html = render_html(run);
  EXPECT_EQ(count_of(html, "<section class=\"claim "), run.claims.size());
  // The refuted and the undecided claim carry a band.
  EXPECT_EQ(count_of(html, "<svg class=\"band-plot\" width=\"640\" height=\"260\""), 2u);
  EXPECT_NE(html.find("<section class=\"claim refuted\" id=\"claim-2\">"), std::string::npos);
}

TEST(HtmlReport, ShowsWitnessesDerivationAndDiagnostic) {
  RunResult run = sample_run();
  std::string html = render_html(run);
  EXPECT_NE(html.find("<td class=\"num\" title=\"" + run.claims[1].witnesses[1].n.str() +
                      "\">2^1000+1</td>"),
            std::string::npos);
  EXPECT_NE(html.find("<li>a = 2, b = 2, f(n) = n: case 2 of the master theorem gives Θ(n lg n)"
                      "</li>"),
            std::string::npos);
  EXPECT_NE(html.find("<pre class=\"diagnostic\">claims/spatial.toml:14:27: error: expected "
                      "')' after 'n/4'"),
            std::string::npos);
  EXPECT_NE(html.find("orchard::bignum::mul&lt;karatsuba&gt; &amp;"), std::string::npos);
}

TEST(BandPlot, DrawsLadderConstantsAsLines) {
  RunResult run = sample_run();
  std::string svg = render_band_plot(run.claims[1].band, {{1.0, "ratio 1"}, {1000.0, "c = 1000"}});
  EXPECT_EQ(count_of(svg, "<line class=\"constant\""), 2u);
  EXPECT_NE(svg.find(">c = 1000</text>"), std::string::npos);
  EXPECT_EQ(count_of(svg, "<polygon class=\"band\""), 1u);
}

TEST(BandPlot, EmptyOrUnusableBandDrawsNothing) {
  EXPECT_EQ(render_band_plot({}, {}), "");
  BandRow unusable;
  unusable.low = std::nan("");
  unusable.high = std::nan("");
  unusable.low_log2 = std::nan("");
  unusable.high_log2 = std::nan("");
  EXPECT_EQ(render_band_plot({unusable}, {}), "");
}

TEST(BandPlot, OverflowingRatiosArePlacedByLog2) {
  BandRow row;
  row.scale = 4095;
  row.low = row.high = 1.0 / 0.0;
  row.low_log2 = 3000;
  row.high_log2 = 3100;
  std::string svg = render_band_plot({row}, {});
  EXPECT_NE(svg.find("<polygon class=\"band\""), std::string::npos);
  EXPECT_NE(svg.find(">2^3"), std::string::npos);  // y ticks labelled as powers of two
}

std::string find_on_path(const std::string& name) {
  const char* path = std::getenv("PATH");
  std::istringstream dirs(path ? path : "/usr/bin:/bin");
  for (std::string dir; std::getline(dirs, dir, ':');) {
    std::string candidate = (dir.empty() ? "." : dir) + "/" + name;
    if (access(candidate.c_str(), X_OK) == 0) return candidate;
  }
  return "";
}

TEST(HtmlReport, HeadlessBrowserKeepsThePlots) {
  std::string browser = find_on_path("chromium");
  if (browser.empty()) {
    GTEST_SKIP() << "chromium not found on PATH; install Debian's chromium to run the browser "
                    "check of the HTML report";
  }
  std::string page = ::testing::TempDir() + "thetagate_report.html";
  std::string dom = page + ".dom";
  {
    std::ofstream out(page, std::ios::binary);
    out << render_html(sample_run());
  }
  std::string command = browser + " --headless --disable-gpu --no-sandbox --dump-dom 'file://" +
                        page + "' >'" + dom + "' 2>/dev/null";
  int status = std::system(command.c_str());
  ASSERT_TRUE(WIFEXITED(status) && WEXITSTATUS(status) == 0) << command;
  std::ifstream in(dom);
  std::stringstream parsed;
  parsed << in.rdbuf();
  // The browser's DOM, serialised back: both plots survived parsing with their size.
  EXPECT_EQ(count_of(parsed.str(), "<svg class=\"band-plot\" width=\"640\" height=\"260\""), 2u);
  EXPECT_EQ(count_of(parsed.str(), "<polygon class=\"band\""), 2u);
}

}  // namespace
}  // namespace thetagate
