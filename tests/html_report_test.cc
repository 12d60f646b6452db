// HTML report tests: self-contained page, one section per claim, one sized
// SVG band plot per claim with a band. The browser checks run Debian's
// `chromium` headless (a fresh profile, no network) and skip with a message
// where it is absent. THETAGATE_KEEP_SCREENSHOT=FILE.png keeps the screenshot.
#include "reports/html_report.h"

#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "reports/band_plot.h"
#include "reports/cost_plot.h"
#include "tests/support/report_fixture.h"
#include "tests/support/test_support.h"

namespace thetagate::engine {
namespace {

using test_support::sample_run;

using test_support::count_of;

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

std::string read_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream buffer;
  buffer << in.rdbuf();
  return buffer.str();
}

// Headless Chromium with a fresh profile and nothing that reaches the
// network; the profile folder is removed afterwards.
class HtmlReportBrowser : public ::testing::Test {
 protected:
  void SetUp() override {
    browser_ = find_on_path("chromium");
    if (browser_.empty()) {
      GTEST_SKIP() << "chromium not found on PATH; install Debian's chromium to run the browser "
                      "check of the HTML report";
    }
    std::string pattern = ::testing::TempDir() + "thetagate_browser_XXXXXX";
    ASSERT_NE(mkdtemp(pattern.data()), nullptr) << pattern;
    dir_ = pattern;
  }

  void TearDown() override {
    if (!dir_.empty()) std::filesystem::remove_all(dir_);
  }

  // Runs the browser on `page` (written to a file) with `action`, e.g.
  // "--dump-dom"; returns stdout. A failed or hung browser fails the test.
  std::string run(const std::string& page, const std::string& action,
                  const std::string& window = "1280,2400") {
    std::string file = dir_ + "/page.html";
    std::ofstream(file, std::ios::binary) << page;
    std::string out = dir_ + "/stdout";
    std::string command =
        "timeout 120 '" + browser_ +
        "' --headless --no-sandbox --disable-gpu --disable-quic "
        "--no-first-run --disable-background-networking --disable-component-update --disable-sync "
        "--hide-scrollbars --window-size=" +
        window + " --user-data-dir='" + dir_ + "/profile' " + action + " 'file://" + file + "' >'" +
        out + "' 2>'" + dir_ + "/stderr'";
    int status = std::system(command.c_str());
    EXPECT_TRUE(WIFEXITED(status) && WEXITSTATUS(status) == 0) << command << "\n"
                                                               << read_file(dir_ + "/stderr");
    return read_file(out);
  }

  std::string browser_;
  std::string dir_;
};

// The page needs no script; the test adds one to a copy of it, after the
// page, only to ask the browser's layout what it drew: per band plot the
// rendered size of the <svg> and the box of its filled band, written into
// the DOM that --dump-dom serialises.
const char* const kMeasure = R"js(<script>
const lines = [];
for (const svg of document.querySelectorAll('svg.band-plot')) {
  const box = svg.getBoundingClientRect();
  const band = svg.querySelector('polygon.band').getBBox();
  lines.push(`plot ${Math.round(box.width)}x${Math.round(box.height)} ` +
             `band ${Math.round(band.width)}x${Math.round(band.height)}`);
}
const out = document.createElement('pre');
out.id = 'measured';
out.textContent = lines.join('\n');
document.body.appendChild(out);
</script>
)js";

TEST_F(HtmlReportBrowser, HtmlReportDrawsSizedPlots) {
  std::string html = render_html(sample_run());
  size_t body_end = html.rfind("</body>");
  ASSERT_NE(body_end, std::string::npos);
  std::string dom = run(html.substr(0, body_end) + kMeasure + html.substr(body_end), "--dump-dom");
  size_t start = dom.find("<pre id=\"measured\">");
  ASSERT_NE(start, std::string::npos) << "the measuring script did not run:\n"
                                      << dom.substr(0, 400);
  start += std::string("<pre id=\"measured\">").size();
  std::string measured = dom.substr(start, dom.find("</pre>", start) - start);
  std::istringstream lines(measured);
  int plots = 0;
  for (std::string line; std::getline(lines, line);) {
    ++plots;
    int width = 0, height = 0, band_width = 0, band_height = 0;
    ASSERT_EQ(std::sscanf(line.c_str(), "plot %dx%d band %dx%d", &width, &height, &band_width,
                          &band_height),
              4)
        << line;
    // Laid out at the size band_plot.h promises (the 1280-pixel window is
    // wider than the page's column, so max-width does not shrink it) ...
    EXPECT_EQ(width, kBandPlotWidth) << line;
    EXPECT_EQ(height, kBandPlotHeight) << line;
    // ... with a band that covers part of the plot, not a point or a line.
    EXPECT_GT(band_width, kBandPlotWidth / 4) << line;
    EXPECT_GT(band_height, 2) << line;
    EXPECT_LE(band_width, kBandPlotWidth) << line;
    EXPECT_LE(band_height, kBandPlotHeight) << line;
  }
  EXPECT_EQ(plots, 2) << measured;  // the refuted and the undecided claim
}

// A screenshot of the page as it is (no script added): a PNG of the window's
// size. The header is read by hand (the test links no image library); look
// at the file itself after changing the page's layout or style.
TEST_F(HtmlReportBrowser, HtmlReportScreenshotIsAFullWindowPng) {
  std::string shot = dir_ + "/report.png";
  run(render_html(sample_run()), "--screenshot='" + shot + "'");
  std::string png = read_file(shot);
  ASSERT_GT(png.size(), 24u) << "no screenshot written";
  EXPECT_EQ(png.substr(0, 8), std::string("\x89PNG\r\n\x1a\n", 8));
  EXPECT_EQ(png.substr(12, 4), "IHDR");
  auto be32 = [&](size_t at) {
    return (static_cast<unsigned char>(png[at]) << 24) |
           (static_cast<unsigned char>(png[at + 1]) << 16) |
           (static_cast<unsigned char>(png[at + 2]) << 8) | static_cast<unsigned char>(png[at + 3]);
  };
  EXPECT_EQ(be32(16), 1280);
  EXPECT_EQ(be32(20), 2400);
  if (const char* keep = std::getenv("THETAGATE_KEEP_SCREENSHOT")) {
    std::filesystem::copy_file(shot, keep, std::filesystem::copy_options::overwrite_existing);
  }
}

// The layout of a whole report, measured by the browser (issue 18, §4): with
// every <details> opened, no element sticks out of its claim's card, and no
// two labels of a plot overlap. Written into the DOM as "ok" or the problems.
const char* const kLayout = R"js(<script>
const problems = [];
for (const card of document.querySelectorAll('section.claim')) {
  for (const d of card.querySelectorAll('details')) d.open = true;
}
for (const card of document.querySelectorAll('section.claim')) {
  const c = card.getBoundingClientRect();
  for (const el of card.querySelectorAll('*')) {
    const r = el.getBoundingClientRect();
    if (r.width === 0) continue;
    if (r.right > c.right + 1 || r.left < c.left - 1)
      problems.push(`wider than its card: ${card.id} ${el.tagName}.${el.className && el.className.baseVal !== undefined ? el.className.baseVal : el.className} ${Math.round(r.left)}..${Math.round(r.right)} card ${Math.round(c.left)}..${Math.round(c.right)}`);
  }
}
for (const svg of document.querySelectorAll('svg')) {
  const texts = [...svg.querySelectorAll('text')].map(t => [t, t.getBoundingClientRect()]).filter(x => x[1].width > 0);
  for (let i = 0; i < texts.length; ++i)
    for (let j = i + 1; j < texts.length; ++j) {
      const a = texts[i][1], b = texts[j][1];
      if (a.left < b.right - 0.5 && b.left < a.right - 0.5 && a.top < b.bottom - 0.5 && b.top < a.bottom - 0.5)
        problems.push(`overlapping labels in ${svg.closest('section') ? svg.closest('section').id : '?'}: "${texts[i][0].textContent}" and "${texts[j][0].textContent}"`);
    }
}
const out = document.createElement('pre');
out.id = 'measured';
out.textContent = problems.length ? problems.join('\n') : 'ok';
document.body.appendChild(out);
</script>
)js";

// The demo report at 1400 pixels: long witness values and ladders of many
// rungs (c = 10 ... 10^12) are what broke it before.
TEST_F(HtmlReportBrowser, DemoReportFitsItsCardsAndItsLabelsDoNotOverlap) {
  std::string report = dir_ + "/demo.html";
  test_support::CommandResult r = test_support::run_shell(
      std::string("cd '") + THETAGATE_SOURCE_DIR + "' && '" + THETAGATE_BINARY +
      "' check claims --jobs 2 --format html --out '" + report + "'");
  ASSERT_LE(r.status, 1) << r.out;
  std::string html = read_file(report);
  size_t body_end = html.rfind("</body>");
  ASSERT_NE(body_end, std::string::npos);
  std::string dom =
      run(html.substr(0, body_end) + kLayout + html.substr(body_end), "--dump-dom", "1400,2400");
  size_t start = dom.find("<pre id=\"measured\">");
  ASSERT_NE(start, std::string::npos) << "the measuring script did not run";
  start += std::string("<pre id=\"measured\">").size();
  EXPECT_EQ(dom.substr(start, dom.find("</pre>", start) - start), "ok");
}

}  // namespace
}  // namespace thetagate::engine

namespace thetagate::engine {
namespace {

// The counted-cost plot shows cost / T(n) on a linear scale (issue 18, §4):
// a cost 2% past the model sits well clear of the model's line.
TEST(CostPlot, AFewPercentPastTheModelIsVisible) {
  CodeResult code;
  code.relation = ModelRelation::kUpperBound;
  for (int k = 4; k <= 12; ++k) {
    CostRow row;
    row.n = BigInt(1) << k;
    BigInt t = BigInt(k) << k;  // T(n) = n lg n
    bool over = k == 10;
    row.model = t.str();
    row.cost = over ? BigInt(t * 102 / 100).str() : t.str();
    row.sign = over ? 1 : 0;
    code.rows.push_back(row);
  }
  std::string svg = render_cost_plot(code);
  auto number_after = [&](const std::string& key, size_t from) {
    size_t at = svg.find(key, from);
    EXPECT_NE(at, std::string::npos) << key;
    return std::stod(svg.substr(at + key.size()));
  };
  double model_y = number_after("<line class=\"model\" x1=\"", 0);
  model_y = number_after("y1=\"", svg.find("<line class=\"model\""));
  double broken_y = number_after("cy=\"", svg.find("class=\"counted broken\""));
  double fine_y = number_after("cy=\"", svg.find("class=\"counted\""));
  EXPECT_NEAR(fine_y, model_y, 0.5);
  EXPECT_GT(model_y - broken_y, 20) << svg;  // pixels: visibly above the line
}

}  // namespace
}  // namespace thetagate::engine
