// Text report tests. Golden files: tests/golden/report.txt and
// report.colour.txt. After an intended change to the layout, regenerate them
// with
//   THETAGATE_UPDATE_GOLDEN=1 <build>/thetagate_tests --gtest_filter='TextReport*'
// and review the diff.
#include "reports/text_report.h"

#include <fcntl.h>
#include <gtest/gtest.h>
#include <stdlib.h>
#include <unistd.h>

#include <cmath>
#include <optional>
#include <sstream>
#include <vector>

#include "reports/number_text.h"
#include "tests/golden.h"
#include "tests/support/report_fixture.h"

namespace thetagate::engine {
namespace {

using test_support::expect_matches_golden;
using test_support::sample_run;

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> lines;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) lines.push_back(line);
  return lines;
}

TEST(TextReport, MatchesGoldenPlain) {
  expect_matches_golden("report.txt", render_text(sample_run(), TextStyle{false}));
}

TEST(TextReport, MatchesGoldenColour) {
  expect_matches_golden("report.colour.txt", render_text(sample_run(), TextStyle{true}));
}

TEST(TextReport, PlainStyleHasNoEscapeCodes) {
  std::string text = render_text(sample_run(), TextStyle{false});
  EXPECT_EQ(text.find('\033'), std::string::npos);
}

TEST(TextReport, ColourStylePaintsVerdicts) {
  std::string text = render_text(sample_run(), TextStyle{true});
  EXPECT_NE(text.find("\033[1;31mrefuted\033[0m"), std::string::npos);
  EXPECT_NE(text.find("\033[32mholds\033[0m"), std::string::npos);
}

TEST(TextReport, HeaderNamesSeedAndHowToReplay) {
  std::vector<std::string> lines = lines_of(render_text(sample_run(), TextStyle{false}));
  ASSERT_FALSE(lines.empty());
  EXPECT_EQ(lines[0], std::string("thetagate ") + THETAGATE_VERSION_STRING +
                          " \u00b7 seed 20240611 (rerun with --seed 20240611 to replay this run)");
}

TEST(TextReport, OneLinePerClaimWithFixedWidthVerdict) {
  RunResult run = sample_run();
  std::vector<std::string> lines = lines_of(render_text(run, TextStyle{false}));
  for (const ClaimResult& c : run.claims) {
    std::string verdict = verdict_name(c.verdict);
    std::string prefix = verdict + std::string(11 - verdict.size(), ' ') + c.name;
    int matching = 0;
    for (const std::string& line : lines) matching += line.rfind(prefix, 0) == 0 ? 1 : 0;
    EXPECT_EQ(matching, 1) << prefix;
  }
}

TEST(TextReport, ClaimLineShowsClaimedAndDerived) {
  std::string text = render_text(sample_run(), TextStyle{false});
  EXPECT_NE(text.find("claimed O(n) · derived Θ(n lg n) by master theorem, case 2\n"),
            std::string::npos);
  EXPECT_NE(text.find("claimed O(n) · derived Θ(lg n) by master theorem, case 2 · not tight · "
                      "proof: master theorem, case 2\n"),
            std::string::npos);
  EXPECT_NE(text.find("claimed Θ(sqrt(n)) · derived — · numeric only\n"), std::string::npos);
}

TEST(TextReport, SummaryCountsEveryVerdict) {
  std::vector<std::string> lines = lines_of(render_text(sample_run(), TextStyle{false}));
  ASSERT_FALSE(lines.empty());
  EXPECT_EQ(lines.back(), "6 claims: 3 holds, 1 refuted, 1 undecided, 1 error");
}

TEST(TextReport, SummaryOfEmptyRun) {
  RunResult run;
  run.seed = 7;
  run.tool_version.clear();  // as read from a report written before versions were recorded
  EXPECT_EQ(render_text(run, TextStyle{false}),
            "seed 7 (rerun with --seed 7 to replay this run)\n\n"
            "0 claims: 0 holds, 0 refuted, 0 undecided, 0 errors\n");
}

TEST(TextReport, RefutationShowsWitnessesShortened) {
  std::string text = render_text(sample_run(), TextStyle{false});
  EXPECT_NE(text.find("n = 2^1000+1  (upper side, T(n)/g(n) = 1001, ladder c = 1000, "
                      "family 2^k + 1)"),
            std::string::npos);
  EXPECT_NE(text.find("n = 2048  (upper side, T(n)/g(n) = 12, ladder c = 10, family powers of 2)"),
            std::string::npos);
  // 2^4095 + 3^2000 is near no power: first and last digits and the count.
  EXPECT_NE(text.find("digits)  (upper side"), std::string::npos);
}

TEST(TextReport, ErrorShowsTheWholeDiagnostic) {
  RunResult run = sample_run();
  std::string text = render_text(run, TextStyle{false});
  EXPECT_NE(text.find("    claims/spatial.toml:14:27: error: expected ')' after 'n/4'\n"
                      "    recurrence = \"T(n) = 4T(n/4 + 1\"\n"
                      "                              ^\n"
                      "      hint: close the call: T(n/4)\n"),
            std::string::npos)
      << text;
}

TEST(TextReport, LongBandIsThinnedKeepingBothEnds) {
  std::string text = render_text(sample_run(), TextStyle{false});
  EXPECT_NE(text.find("ratio band T(n)/g(n) (12 of 40 scales):"), std::string::npos);
  // The column shows bits of n: scale k holds sizes of k + 1 bits.
  EXPECT_NE(text.find("\n           2          0.7          1.5        24\n"), std::string::npos);
  EXPECT_NE(text.find("\n        3902        0.739         1.89        24\n"), std::string::npos);
}

TEST(TextReport, HoldingClaimsHaveNoDetail) {
  RunResult run;
  run.claims.push_back(sample_run().claims[2]);  // holds, without a certificate
  std::vector<std::string> lines = lines_of(render_text(run, TextStyle{false}));
  // Header, blank, claim line, blank, summary.
  EXPECT_EQ(lines.size(), 5u);
}

TEST(TextReport, HoldingClaimsCountTheirCertificatesObligations) {
  RunResult run;
  run.claims.push_back(sample_run().claims[0]);  // holds, certificate with 4 obligations
  std::vector<std::string> lines = lines_of(render_text(run, TextStyle{false}));
  // Header, blank, claim line, the certificate under it, blank, summary.
  ASSERT_EQ(lines.size(), 6u);
  EXPECT_EQ(lines[3], "    certificate: 4 obligations");
  run.claims[0].basis.certificate->obligations.resize(1);
  EXPECT_EQ(lines_of(render_text(run, TextStyle{false}))[3], "    certificate: 1 obligation");
}

TEST(TextReport, SameInputSameBytes) {
  EXPECT_EQ(render_text(sample_run(), TextStyle{false}),
            render_text(sample_run(), TextStyle{false}));
}

// Decimal shortening.
BigInt pow2(unsigned k) { return BigInt(1) << k; }

TEST(NumberText, NearPowersOfTwoUseThePowerForm) {
  EXPECT_EQ(short_decimal(pow2(4096) + 7), "2^4096+7");
  EXPECT_EQ(short_decimal(pow2(64) - 1), "2^64-1");
  EXPECT_EQ(short_decimal(pow2(64)), "2^64");
  EXPECT_EQ(short_decimal(pow2(64) + 1), "2^64+1");
  EXPECT_EQ(short_decimal(BigInt(3) * pow2(100) - 1), "3*2^100-1");
  EXPECT_EQ(short_decimal(BigInt("1000000000000000000000000000000")), "10^30");
}

TEST(NumberText, SmallAndFarNumbersStayDecimal) {
  EXPECT_EQ(short_decimal(BigInt(0)), "0");
  EXPECT_EQ(short_decimal(BigInt(12345)), "12345");
  EXPECT_EQ(short_decimal(BigInt(2048)), "2048");  // too small to gain from 2^11
  EXPECT_EQ(short_decimal(BigInt(-5)), "-5");
  // 2^64 + 2^40 is far from any power compared with its offset: 20 digits verbatim.
  EXPECT_EQ(short_decimal(pow2(64) + pow2(40)), (pow2(64) + pow2(40)).str());
}

TEST(NumberText, HugeNumbersShowEdgesAndDigitCount) {
  BigInt n = boost::multiprecision::pow(BigInt(3), 2000);  // 955 digits
  std::string digits = n.str();
  ASSERT_EQ(digits.size(), 955u);
  EXPECT_EQ(short_decimal(n),
            digits.substr(0, 6) + "…" + digits.substr(digits.size() - 6) + " (955 digits)");
}

TEST(NumberText, ValuesShortenEveryLongRun) {
  std::string big = (pow2(200) + 3).str();
  EXPECT_EQ(short_value(big + "/" + "7"), "2^200+3/7");
  EXPECT_EQ(short_value("[" + big + ", " + big + "]"), "[2^200+3, 2^200+3]");
  EXPECT_EQ(short_value("159"), "159");
}

TEST(NumberText, RatiosHaveFourSignificantDigits) {
  EXPECT_EQ(format_ratio(1.0), "1");
  EXPECT_EQ(format_ratio(2.0 / 3.0), "0.6667");
  EXPECT_EQ(format_ratio(2048000.0), "2.048e+06");
  EXPECT_EQ(format_ratio(1.0 / 0.0), "inf");
}

TEST(NumberText, BandEndsBeyondADoubleUseTheirLog2) {
  EXPECT_EQ(format_band_ratio(1.5, std::log2(1.5)), "1.5");
  EXPECT_EQ(format_band_ratio(1.0 / 0.0, 4000.25), "2^4000");
  EXPECT_EQ(format_band_ratio(0.0, -3000.5), "2^-3000");
  EXPECT_EQ(format_band_ratio(0.0, 0.0), "0");  // log2 never filled in: the ratio itself
}

// want_colour: a pseudo-terminal stands in for a real one.
class ScopedNoColor {
 public:
  explicit ScopedNoColor(const char* value) {
    if (const char* old = getenv("NO_COLOR")) saved_ = old;
    if (value) {
      setenv("NO_COLOR", value, 1);
    } else {
      unsetenv("NO_COLOR");
    }
  }
  ~ScopedNoColor() {
    if (saved_) {
      setenv("NO_COLOR", saved_->c_str(), 1);
    } else {
      unsetenv("NO_COLOR");
    }
  }

 private:
  std::optional<std::string> saved_;
};

int open_terminal() {
  int master = posix_openpt(O_RDWR | O_NOCTTY);
  if (master < 0 || grantpt(master) != 0 || unlockpt(master) != 0) return -1;
  return master;  // the master side of a pty answers isatty() == 1
}

TEST(TextReport, WantColourOnlyOnTerminalWithoutNoColor) {
  int terminal = open_terminal();
  if (terminal < 0) GTEST_SKIP() << "no pseudo-terminal available on this machine";
  int pipe_fds[2];
  ASSERT_EQ(pipe(pipe_fds), 0);
  {
    ScopedNoColor unset(nullptr);
    EXPECT_TRUE(want_colour(terminal));
    EXPECT_FALSE(want_colour(pipe_fds[1]));
  }
  {
    ScopedNoColor set("1");
    EXPECT_FALSE(want_colour(terminal));
  }
  {
    ScopedNoColor empty("");  // no-color.org: an empty value does not disable colour
    EXPECT_TRUE(want_colour(terminal));
  }
  close(terminal);
  close(pipe_fds[0]);
  close(pipe_fds[1]);
}

}  // namespace
}  // namespace thetagate::engine
