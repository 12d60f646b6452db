// JUnit XML report tests. Golden file: tests/golden/report.junit.xml. After an
// intended change, regenerate it with
//   THETAGATE_UPDATE_GOLDEN=1 <build>/thetagate_tests --gtest_filter='JunitReport*'
// and review the diff. The schema check needs `xmllint` (Debian package
// libxml2-utils) and skips with a message where it is absent.
#include "reports/junit_report.h"

#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdlib>
#include <fstream>
#include <sstream>

#include "reports/verdict_text.h"
#include "reports/xml_escape.h"
#include "tests/golden.h"
#include "tests/support/report_fixture.h"
#include "tests/support/test_support.h"

namespace thetagate::engine {
namespace {

using test_support::expect_matches_golden;
using test_support::sample_run;

using test_support::count_of;

std::string find_xmllint() {
  const char* path = std::getenv("PATH");
  std::istringstream dirs(path ? path : "/usr/bin:/bin");
  for (std::string dir; std::getline(dirs, dir, ':');) {
    std::string candidate = (dir.empty() ? "." : dir) + "/xmllint";
    if (access(candidate.c_str(), X_OK) == 0) return candidate;
  }
  return "";
}

// Writes `xml` to a temporary file and validates it with xmllint against
// tests/data/junit.xsd. Returns xmllint's exit status (0: valid).
int validate(const std::string& xmllint, const std::string& xml, const std::string& file_name) {
  std::string path = ::testing::TempDir() + file_name;
  {
    std::ofstream out(path, std::ios::binary);
    out << xml;
  }
  std::string schema = std::string(THETAGATE_SOURCE_DIR) + "/tests/data/junit.xsd";
  std::string command =
      xmllint + " --noout --schema '" + schema + "' '" + path + "' 2>" + path + ".log";
  int status = std::system(command.c_str());
  return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

TEST(JunitReport, MatchesGolden) {
  expect_matches_golden("report.junit.xml", render_junit(sample_run(), JunitOptions{}));
}

TEST(JunitReport, ValidatesAgainstSchema) {
  std::string xmllint = find_xmllint();
  if (xmllint.empty()) {
    GTEST_SKIP() << "xmllint not found on PATH; install Debian's libxml2-utils to run the JUnit "
                    "schema check";
  }
  EXPECT_EQ(validate(xmllint, render_junit(sample_run(), JunitOptions{}), "junit_default.xml"), 0);
  EXPECT_EQ(validate(xmllint, render_junit(sample_run(), JunitOptions{true}), "junit_strict.xml"),
            0);
  EXPECT_EQ(validate(xmllint, render_junit(RunResult{}, JunitOptions{}), "junit_empty.xml"), 0);
}

TEST(JunitReport, SchemaCheckRejectsATestcaseWithTwoOutcomes) {
  std::string xmllint = find_xmllint();
  if (xmllint.empty()) {
    GTEST_SKIP() << "xmllint not found on PATH; install Debian's libxml2-utils to run the JUnit "
                    "schema check";
  }
  // Proves the validation can fail: a case may carry one of failure/error/skipped.
  std::string bad =
      "<?xml version=\"1.0\"?>\n<testsuites><testsuite name=\"s\" tests=\"1\" failures=\"1\" "
      "errors=\"1\"><testcase name=\"c\" classname=\"s\"><failure/><error/></testcase>"
      "</testsuite></testsuites>\n";
  EXPECT_NE(validate(xmllint, bad, "junit_bad.xml"), 0);
}

TEST(JunitReport, HostileTextStaysWellFormedAndValid) {
  std::string xmllint = find_xmllint();
  if (xmllint.empty()) {
    GTEST_SKIP() << "xmllint not found on PATH; install Debian's libxml2-utils to run the JUnit "
                    "schema check";
  }
  RunResult run = sample_run();
  run.claims[1].name = "a]]><b>&amp;\"'\x01\xff\xC0\x80 end";
  run.claims[1].basis.kind = BasisKind::kBudgetReached;
  run.claims[1].basis.unproved = Unproved::kEvaluatorLimit;
  run.claims[1].basis.detail = "line one\nline two\r\n<![CDATA[ x ]]>";
  run.claims[1].file = "claims/we\"ird & <odd>.toml";
  EXPECT_EQ(validate(xmllint, render_junit(run, JunitOptions{}), "junit_hostile.xml"), 0);
}

TEST(JunitReport, OneSuitePerFileOneCasePerClaim) {
  std::string xml = render_junit(sample_run(), JunitOptions{});
  EXPECT_EQ(count_of(xml, "<testsuite "), 4u);  // sorting, ropes, spatial, bignum
  EXPECT_EQ(count_of(xml, "<testcase "), 6u);
  EXPECT_NE(xml.find("<testsuites name=\"thetagate\" tests=\"6\" failures=\"1\" errors=\"1\" "
                     "skipped=\"1\">"),
            std::string::npos);
  EXPECT_NE(xml.find("<testsuite name=\"claims/spatial.toml\" tests=\"2\" failures=\"0\" "
                     "errors=\"1\" skipped=\"1\" time=\"0.000\">"),
            std::string::npos);
  EXPECT_NE(xml.find("classname=\"claims.sorting\""), std::string::npos);
}

TEST(JunitReport, RefutationCarriesEveryDigitOfTheWitness) {
  RunResult run = sample_run();
  std::string xml = render_junit(run, JunitOptions{});
  EXPECT_NE(
      xml.find("<failure message=\"" + verdict_message(run.claims[1]) + "\" type=\"refuted\">"),
      std::string::npos);
  for (const Witness& w : run.claims[1].witnesses) {
    EXPECT_NE(xml.find("n = " + w.n.str() + " (upper side)"), std::string::npos);
    EXPECT_NE(xml.find("T(n) = " + w.value + "\n"), std::string::npos);
  }
}

TEST(JunitReport, ErrorCarriesTheDiagnostic) {
  std::string xml = render_junit(sample_run(), JunitOptions{});
  EXPECT_NE(xml.find("<error message=\"expected &apos;)&apos; after &apos;n/4&apos;\" "
                     "type=\"input\">claims/spatial.toml:14:27: error: expected ')' after 'n/4'\n"
                     "recurrence = \"T(n) = 4T(n/4 + 1\"\n"),
            std::string::npos)
      << xml;
}

TEST(JunitReport, UndecidedIsSkippedUnlessOptionSaysFail) {
  RunResult run = sample_run();
  std::string lenient = render_junit(run, JunitOptions{false});
  EXPECT_NE(lenient.find(
                "<skipped message=\"numbers only (no theorem applied), and they do not settle it:"),
            std::string::npos);
  EXPECT_EQ(lenient.find("type=\"undecided\""), std::string::npos);

  std::string strict = render_junit(run, JunitOptions{true});
  EXPECT_EQ(strict.find("<skipped"), std::string::npos);
  EXPECT_NE(strict.find(
                "<failure message=\"numbers only (no theorem applied), and they do not settle it:"),
            std::string::npos);
  EXPECT_NE(strict.find("type=\"undecided\""), std::string::npos);
  EXPECT_NE(strict.find("tests=\"6\" failures=\"2\" errors=\"1\" skipped=\"0\""),
            std::string::npos);
}

TEST(JunitReport, EscapesMarkupInNamesAndText) {
  std::string xml = render_junit(sample_run(), JunitOptions{});
  EXPECT_NE(xml.find("name=\"orchard::bignum::mul&lt;karatsuba&gt; &amp; &quot;schoolbook&quot; "
                     "fallback\""),
            std::string::npos);
  EXPECT_NE(xml.find("note: limbs, not bits; &lt;32 limbs use the schoolbook loop"),
            std::string::npos);
}

TEST(XmlEscape, AttributesEscapeQuotesAndWhitespace) {
  EXPECT_EQ(xml_escape_attribute("a<b & \"c\" 'd'\n\te\r"),
            "a&lt;b &amp; &quot;c&quot; &apos;d&apos;&#10;&#9;e&#13;");
}

TEST(XmlEscape, TextKeepsNewlinesAndQuotes) {
  EXPECT_EQ(xml_escape_text("x > y\n\"q\" ]]>"), "x &gt; y\n\"q\" ]]&gt;");
}

TEST(XmlEscape, ForbiddenCharactersBecomeReplacement) {
  const std::string fffd = "\xEF\xBF\xBD";
  EXPECT_EQ(xml_escape_text("a\x01"
                            "b"),
            "a" + fffd + "b");                                     // C0 control
  EXPECT_EQ(xml_escape_text("\xff"), fffd);                        // never valid in UTF-8
  EXPECT_EQ(xml_escape_text("\xC0\x80"), fffd + fffd);             // overlong NUL
  EXPECT_EQ(xml_escape_text("\xED\xA0\x80"), fffd + fffd + fffd);  // surrogate D800
  EXPECT_EQ(xml_escape_text("\xEF\xBF\xBE"), fffd + fffd + fffd);  // U+FFFE
  EXPECT_EQ(xml_escape_text("Θ(n lg n) ⌊n/2⌋ \xF0\x9F\x8C\xB3"),
            "Θ(n lg n) ⌊n/2⌋ \xF0\x9F\x8C\xB3");
}

}  // namespace
}  // namespace thetagate::engine
