// Claim files are untrusted input: one may come from an outside contribution
// to a CI job. It must not read a file outside its own folder tree and echo
// it into a report, and nothing it holds may act on the terminal that shows a
// report (issue "Hardening, second round", cases 1, 2, 7 and 8).
#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "reports/drift.h"
#include "reports/json_report.h"
#include "reports/junit_report.h"
#include "reports/text_report.h"
#include "reports/xml_escape.h"
#include "tests/support/diagnostic_matchers.h"
#include "tests/support/test_support.h"
#include "verifier/checking/checker.h"
#include "verifier/checking/code_check.h"
#include "verifier/checking/run_comparison.h"
#include "verifier/model/claim.h"
#include "verifier/syntax/source.h"
#include "verifier/syntax/terminal_text.h"

namespace thetagate::engine {
namespace {

namespace fs = std::filesystem;
using test_support::CommandResult;
using test_support::run_shell;

using test_support::located;

// A line no report may ever show: it stands for a CI job's secrets.
const char* const kSecret = "CI_TOKEN=tg-secret-7f3a91 CLOUD_SECRET=tg-secret-c04e";
const char* const kSecretMark = "tg-secret";

// Merge sort's worst-case comparisons, measured at 4 and 5 (T(4) = 5,
// T(5) = 8): a costs file that keeps to its model.
// Exact merge-sort worst-case counts; 8 to 15 reach every size family
// (powers 8, power-neighbours 9, alternating 10, power-multiples 12, ones 15),
// so a passing check is not held back for sizes it never measured.
const char* const kGoodCosts = "4 5\n5 8\n8 17\n9 21\n10 25\n12 33\n15 45\n";

class UntrustedInput : public ::testing::Test {
 protected:
  void SetUp() override {
    root_ = fs::temp_directory_path() /
            ("thetagate-untrusted-" + std::to_string(::getpid()) + "-" +
             ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::remove_all(root_);
    fs::create_directories(root_ / "repo" / "claims" / "costs");
    fs::create_directories(root_ / "outside");
    write("outside/secret.txt", std::string(kSecret) + "\n");
    write("repo/claims/costs/good.txt", kGoodCosts);
  }
  void TearDown() override { fs::remove_all(root_); }

  void write(const std::string& name, const std::string& text) {
    std::ofstream(root_ / name, std::ios::binary) << text;
  }
  std::string read(const fs::path& path) {
    std::ifstream in(path, std::ios::binary);
    return std::string(std::istreambuf_iterator<char>(in), {});
  }

  // A claim file in repo/claims whose one claim names `costs` (TOML basic
  // string text, escapes allowed).
  std::string claim_file(const std::string& costs) {
    write("repo/claims/merge.toml",
          "[[claim]]\nname = \"merge\"\n"
          "recurrence = \"T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0\"\n"
          "bound = \"Theta(n lg n)\"\n[claim.code]\ncosts = \"" +
              costs + "\"\n");
    return (root_ / "repo" / "claims" / "merge.toml").string();
  }

  ClaimResult check_one(const std::string& file, const std::string& costs_root = "") {
    CheckOptions options;
    options.max_bits = 64;
    options.costs_root = costs_root;
    RunResult run = check_entries(load_claim_file(file), options);
    EXPECT_EQ(run.claims.size(), 1u);
    return run.claims.front();
  }

  // Every report format of a CLI run over `file`, with stdout and stderr.
  struct Reports {
    CommandResult run;
    std::string text, json, junit, html;
  };
  Reports cli_reports(const std::string& file, const std::string& extra = "") {
    fs::path out = root_ / "reports";
    fs::remove_all(out);
    Reports r;
    r.run =
        run_shell(std::string("'") + THETAGATE_BINARY + "' check --max-bits 64 --clock-limit 0 " +
                  extra + " --out '" + out.string() + "/' '" + file + "'");
    r.text = read(out / "report.txt");
    r.json = read(out / "report.json");
    r.junit = read(out / "report.junit.xml");
    r.html = read(out / "report.html");
    return r;
  }

  fs::path root_;
};

// Case 1: every way out of the claim file's folder is refused at the
// `costs` key, and the file's content reaches no report, in any format.
TEST_F(UntrustedInput, CostsFilesOutsideTheClaimFolderAreRefusedInEveryFormat) {
  fs::create_symlink(root_ / "outside" / "secret.txt", root_ / "repo/claims/costs/link.txt");
  fs::create_directory_symlink(root_ / "outside", root_ / "repo/claims/costs/linkdir");
  struct Case {
    std::string costs;
    std::string message;  // what is wrong with the path
  };
  const std::string kLinked = "leads, through a symbolic link, out of the claim file's folder";
  const std::vector<Case> cases = {
      {(root_ / "outside" / "secret.txt").string(), "is absolute"},
      {"/proc/self/environ", "is absolute"},
      {"/etc/passwd", "is absolute"},
      {"../../outside/secret.txt", "leaves the claim file's folder"},
      {"costs/../../../outside/secret.txt", "leaves the claim file's folder"},
      {"costs/link.txt", kLinked},
      {"costs/linkdir/secret.txt", kLinked},
  };
  for (const Case& c : cases) {
    SCOPED_TRACE(c.costs);
    std::string file = claim_file(c.costs);
    ClaimResult r = check_one(file);
    ASSERT_EQ(r.verdict, Verdict::kError);
    ASSERT_TRUE(r.error.has_value());
    // At the costs key. The claim file lies in a fresh temporary folder, and
    // the message quotes the path as written: both vary, so are spliced in.
    EXPECT_EQ(located(r.error),
              file + ":6:9: the costs path '" + c.costs + "' " + c.message +
                  "; a claim file may only name files in its own folder tree [hint: name a file "
                  "under the claim file's folder (relative to the claim file, e.g. costs = "
                  "\"costs/stable_sort.txt\"), or let the run read another folder with "
                  "--costs-root DIR]");

    Reports reports = cli_reports(file);
    EXPECT_EQ(reports.run.status, 2) << reports.run.out;
    for (const std::string* out :
         {&reports.run.out, &reports.text, &reports.json, &reports.junit, &reports.html}) {
      EXPECT_TRUE(out == &reports.run.out || !out->empty());  // every format was written
      EXPECT_EQ(out->find(kSecretMark), std::string::npos) << *out;
      EXPECT_EQ(out->find("root:"), std::string::npos) << *out;  // /etc/passwd's first line
      EXPECT_EQ(out->find("PATH="), std::string::npos) << *out;  // the environment
    }
    EXPECT_NE(reports.text.find(c.message), std::string::npos) << reports.text;
  }
}

TEST_F(UntrustedInput, ANulInTheCostsPathIsAnErrorNotATruncatedPath) {
  // "costs/good.txt\0evil" would open costs/good.txt if the NUL ended it.
  std::string file = claim_file("costs/good.txt\\u0000evil");
  ClaimResult r = check_one(file);
  ASSERT_EQ(r.verdict, Verdict::kError);
  // The claim file's path is a fresh temporary folder.
  EXPECT_EQ(located(r.error), file +
                                  ":6:9: the costs path 'costs/good.txt\\x00evil' holds a "
                                  "control character (a NUL would end the path early) [hint: "
                                  "write the path with printable characters only]");
}

TEST_F(UntrustedInput, FilesInsideTheTreeAreReadAndAWiderRootIsExplicit) {
  ClaimResult inside = check_one(claim_file("costs/good.txt"));
  EXPECT_EQ(inside.verdict, Verdict::kHolds) << (inside.error ? inside.error->message : "");
  ASSERT_TRUE(inside.code.has_value());
  EXPECT_EQ(inside.code->measurements, 7u);
  EXPECT_TRUE(inside.code->families_missed.empty());
  // A link that stays inside the tree is fine.
  fs::create_symlink("good.txt", root_ / "repo/claims/costs/alias.txt");
  EXPECT_EQ(check_one(claim_file("costs/alias.txt")).verdict, Verdict::kHolds);

  // Widened to a shared measurements folder, an absolute path there is read.
  fs::create_directories(root_ / "measured");
  write("measured/merge.txt", kGoodCosts);
  std::string file = claim_file((root_ / "measured" / "merge.txt").string());
  EXPECT_EQ(check_one(file).verdict, Verdict::kError);
  ClaimResult widened = check_one(file, (root_ / "measured").string());
  EXPECT_EQ(widened.verdict, Verdict::kHolds) << (widened.error ? widened.error->message : "");
  // ... and a relative path may climb into it.
  file = claim_file("../../measured/merge.txt");
  EXPECT_EQ(check_one(file, (root_ / "measured").string()).verdict, Verdict::kHolds);
  // The wider root is no licence for anything else.
  file = claim_file((root_ / "outside" / "secret.txt").string());
  EXPECT_EQ(check_one(file, (root_ / "measured").string()).verdict, Verdict::kError);

  Reports cli = cli_reports(file, "--costs-root '" + (root_ / "measured").string() + "'");
  EXPECT_EQ(cli.run.status, 2) << cli.run.out;
  cli = cli_reports(claim_file((root_ / "measured" / "merge.txt").string()),
                    "--costs-root '" + (root_ / "measured").string() + "'");
  EXPECT_EQ(cli.run.status, 0) << cli.run.out;
}

TEST_F(UntrustedInput, ABadLineInAWidenedFileShowsOnlyAShortExcerpt) {
  // The user let the run read `outside/`, and a claim names a secret there:
  // the error says which line and what was expected, never the long line.
  std::string file = claim_file((root_ / "outside" / "secret.txt").string());
  ClaimResult r = check_one(file, (root_ / "outside").string());
  ASSERT_EQ(r.verdict, Verdict::kError);
  EXPECT_EQ(r.error->source_line, "");
  // The costs file's path is a fresh temporary folder.
  EXPECT_EQ(located(r.error), (root_ / "outside" / "secret.txt").string() +
                                  ":1:1: the size must be a non-negative whole number, found a "
                                  "25-byte word [hint: each line holds a size and its counted "
                                  "cost: \"1024 9217\"]");
  EXPECT_EQ(format_diagnostic(*r.error).find(kSecretMark), std::string::npos);
  // A short line is shown (a typo is plain to see), escaped.
  write("repo/claims/costs/typo.txt", "4 5\n5 8e0\n");
  r = check_one(claim_file("costs/typo.txt"));
  ASSERT_EQ(r.verdict, Verdict::kError);
  EXPECT_EQ(r.error->source_line, "5 8e0");
  EXPECT_EQ(located(r.error), (root_ / "repo/claims/costs/typo.txt").string() +
                                  ":2:4: the cost must be a non-negative whole number, found "
                                  "'8e0' [hint: write the cost as a whole number in decimal "
                                  "digits (no 1e6, no 2.5)]");
}

// Case 2: control characters from a claim file, in every text a terminal
// may show.
const std::string kEvilName =
    "ok\x1b]0;pwned\x07 then\x1b[2J clear \xc2\x9b"
    "31m csi \xe2\x80\xae reversed";

bool has_raw_control(const std::string& text, bool allow_colour) {
  for (size_t i = 0; i < text.size(); ++i) {
    unsigned char c = static_cast<unsigned char>(text[i]);
    if (c == '\n' || c == '\t') continue;
    if (c == 0x1b && allow_colour && i + 1 < text.size() && text[i + 1] == '[') {
      size_t k = i + 2;
      while (k < text.size() &&
             (std::isdigit(static_cast<unsigned char>(text[k])) || text[k] == ';'))
        ++k;
      if (k < text.size() && text[k] == 'm') continue;
    }
    if (c < 0x20 || c == 0x7f) return true;
    if (c == 0xc2 && i + 1 < text.size() && static_cast<unsigned char>(text[i + 1]) >= 0x80 &&
        static_cast<unsigned char>(text[i + 1]) <= 0x9f)
      return true;
    if (text.compare(i, 3, "\xe2\x80\xae") == 0) return true;
  }
  return false;
}

TEST(TerminalText, EscapesEveryKindOfControl) {
  EXPECT_EQ(escape_controls("plain Θ(n lg n) …"), "plain Θ(n lg n) …");
  EXPECT_EQ(escape_controls(kEvilName),
            "ok\\x1b]0;pwned\\x07 then\\x1b[2J clear \\u009b31m csi \\u202e reversed");
  EXPECT_EQ(escape_controls(std::string("a\0b\n", 4)), "a\\x00b\\x0a");
  EXPECT_EQ(escape_controls("\x9b bare byte"), "\\x9b bare byte");  // not UTF-8
  EXPECT_EQ(escape_controls("\xe2\x81\xa6isolate"), "\\u2066isolate");
  EXPECT_TRUE(is_plain_text("Θ(n) — fine"));
  EXPECT_FALSE(is_plain_text("\xc2\x85"));  // NEL, a C1 control
}

TEST(TerminalText, WholeTextsKeepLinesAndOnlyOurColours) {
  EXPECT_EQ(terminal_safe("a\n\tb\x1b[1;31mred\x1b[0m\n"), "a\n\tb\\x1b[1;31mred\\x1b[0m\n");
  EXPECT_EQ(terminal_safe("a\x1b[1;31mred\x1b[0m\x1b[2J", /*keep_colour=*/true),
            "a\x1b[1;31mred\x1b[0m\\x1b[2J");
  EXPECT_EQ(terminal_safe("x\x1b]0;t\x07"), "x\\x1b]0;t\\x07");
  EXPECT_EQ(terminal_safe("\r\n"), "\\x0d\n");
  // The source line under a message: one '?' per character, so the caret
  // under a later column stays in place.
  EXPECT_EQ(masked_line("a\x1b[2Jb\xc2\x9b"
                        "c\td"),
            "a?[2Jb?c\td");
  EXPECT_EQ(json_escape_controls("{\"n\": \"a\xc2\x9b\xe2\x80\xae\"}"),
            "{\"n\": \"a\\u009b\\u202e\"}");
  EXPECT_EQ(xml_escape_text("a\xc2\x9b\xe2\x80\xae"), "a&#x9b;&#x202e;");
}

TEST_F(UntrustedInput, ControlCharactersInNamesReachNoReportRaw) {
  // The name goes in as TOML escapes, so the claim file itself is clean text.
  write("repo/claims/evil.toml",
        "[[claim]]\nname = \"ok\\u001b]0;pwned\\u0007 then\\u001b[2J clear \\u009b31m csi "
        "\\u202e reversed\"\nrecurrence = \"T(n) = T(n/2) + 1; T(1) = 1\"\nbound = \"O(1)\"\n"
        "note = \"note \\u001b[2J\"\n");
  std::string file = (root_ / "repo/claims/evil.toml").string();
  std::vector<ClaimEntry> entries = load_claim_file(file);
  ASSERT_EQ(entries.size(), 1u);
  ASSERT_TRUE(entries[0].claim.has_value());
  EXPECT_EQ(entries[0].name, kEvilName);
  CheckOptions options;
  options.max_bits = 64;
  RunResult run = check_entries(entries, options);
  ASSERT_EQ(run.claims[0].verdict, Verdict::kRefuted);

  for (bool colour : {false, true}) {
    TextStyle style;
    style.colour = colour;
    std::string text = render_text(run, style);
    EXPECT_FALSE(has_raw_control(text, colour)) << text;
    EXPECT_NE(text.find("\\x1b]0;pwned\\x07"), std::string::npos) << text;
    EXPECT_NE(text.find("\\u009b31m"), std::string::npos) << text;
  }
  // Drift: the same claim as a baseline with another verdict.
  RunResult before = run;
  before.claims[0].verdict = Verdict::kHolds;
  DriftReport drift = compare_runs(before, run);
  ASSERT_TRUE(drift.any());
  for (bool colour : {false, true}) {
    TextStyle style;
    style.colour = colour;
    std::string text = render_drift_text(drift, style);
    EXPECT_FALSE(has_raw_control(text, colour)) << text;
    EXPECT_NE(text.find("\\x1b[2J"), std::string::npos) << text;
  }
  std::string json = render_json_with_drift(run, drift);
  EXPECT_FALSE(has_raw_control(json, false));
  EXPECT_EQ(nlohmann::json::parse(json)["claims"][0]["name"], kEvilName);  // data kept exact
  EXPECT_FALSE(has_raw_control(render_junit(run, JunitOptions{}), false));

  // The command line: stdout, stderr and every file it writes.
  Reports reports = cli_reports(file);
  EXPECT_EQ(reports.run.status, 1) << reports.run.out;
  for (const std::string* out :
       {&reports.run.out, &reports.text, &reports.json, &reports.junit, &reports.html}) {
    EXPECT_FALSE(has_raw_control(*out, false)) << *out;
  }
  CommandResult plain = run_shell(std::string("'") + THETAGATE_BINARY +
                                  "' check --max-bits 64 --clock-limit 0 '" + file + "'");
  EXPECT_FALSE(has_raw_control(plain.out, false)) << plain.out;
  // As a baseline read back from JSON: the drift section too.
  fs::path old = root_ / "old.json";
  std::string old_json = reports.json;
  size_t at = old_json.find("\"verdict\": \"refuted\"");
  ASSERT_NE(at, std::string::npos);
  old_json.replace(at, 20, "\"verdict\": \"holds\"");
  std::ofstream(old, std::ios::binary) << old_json;
  CommandResult drifted =
      run_shell(std::string("'") + THETAGATE_BINARY + "' check --max-bits 64 --clock-limit 0 " +
                "--baseline '" + old.string() + "' '" + file + "'");
  EXPECT_NE(drifted.out.find("drift against the baseline"), std::string::npos) << drifted.out;
  EXPECT_FALSE(has_raw_control(drifted.out, false)) << drifted.out;
}

// Cases 7 and 8: a comment is looked for within its line only, and sizes
// in any order give the same rows (the order no longer costs time: see
// bench/check_bench.cc, CostsFile*).
TEST_F(UntrustedInput, CommentsAndSizeOrderDoNotChangeTheRows) {
  std::string ascending, descending;
  for (int n = 1; n <= 300; ++n) {
    ascending += std::to_string(n) + " 0" + (n % 7 == 0 ? " # a comment\n" : "\n");
  }
  for (int n = 300; n >= 1; --n) descending += std::to_string(n) + " 0\n";
  descending += "# the last line is a comment with no newline";
  write("repo/claims/costs/up.txt", ascending);
  write("repo/claims/costs/down.txt", descending);
  ClaimResult up = check_one(claim_file("costs/up.txt"));
  ClaimResult down = check_one(claim_file("costs/down.txt"));
  ASSERT_TRUE(up.code && down.code);
  EXPECT_EQ(up.code->measurements, 300u);
  EXPECT_EQ(down.code->measurements, 300u);
  ASSERT_EQ(up.code->rows.size(), 300u);
  ASSERT_EQ(down.code->rows.size(), 300u);
  for (size_t i = 0; i < 300; ++i) {
    EXPECT_EQ(up.code->rows[i].n, BigInt(i + 1));
    EXPECT_EQ(down.code->rows[i].n, BigInt(i + 1));
    EXPECT_EQ(up.code->rows[i].model, down.code->rows[i].model);
  }
}

TEST_F(UntrustedInput, ACommaSeparatesSizeAndCostAsInACsvExport) {
  write("repo/claims/costs/csv.txt", "n,comparisons\n");  // a header is not a measurement
  ClaimResult header = check_one(claim_file("costs/csv.txt"));
  ASSERT_EQ(header.verdict, Verdict::kError);
  // The costs file's path is a fresh temporary folder.
  const std::string csv = (root_ / "repo/claims/costs/csv.txt").string();
  EXPECT_EQ(located(header.error), csv +
                                       ":1:1: the size must be a non-negative whole number, found "
                                       "'n' [hint: a header line? start it with '#' to make it a "
                                       "comment: \"# size cost\"]");
  write("repo/claims/costs/csv.txt", "# n,comparisons\n4,5\n5, 8\n5 ,7\n");
  ClaimResult r = check_one(claim_file("costs/csv.txt"));
  // Read without error and without a violation; sizes 4 and 5 alone reach no
  // adversarial family, so the code link stays undecided.
  EXPECT_EQ(r.verdict, Verdict::kUndecided) << (r.error ? r.error->message : "");
  EXPECT_EQ(r.basis.kind, BasisKind::kCodeSizesMissed);
  ASSERT_TRUE(r.code.has_value());
  EXPECT_EQ(r.code->measurements, 3u);
  // A thousands separator is not a comma between fields: three fields.
  write("repo/claims/costs/csv.txt", "1,024 9217\n");
  ClaimResult thousands = check_one(claim_file("costs/csv.txt"));
  ASSERT_EQ(thousands.verdict, Verdict::kError);
  EXPECT_EQ(located(thousands.error),
            csv +
                ":1:7: more than two fields on a line [hint: each line holds a size and its "
                "counted cost: \"1024 9217\" (or \"1024,9217\"); no thousands separators; "
                "comments start with '#']");
  write("repo/claims/costs/csv.txt", "4,,5\n");
  EXPECT_EQ(check_one(claim_file("costs/csv.txt")).verdict, Verdict::kError);
}

}  // namespace
}  // namespace thetagate::engine
