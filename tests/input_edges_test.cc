// Inputs at the edges (issue "Hardening, second round", items 12, 16 and
// 17): columns read back from a report, huge exponents in a bound, a
// smallest size above every checked size, claims named twice, and what
// --clock-limit means with --effort.
#include <gtest/gtest.h>
#include <unistd.h>

#include <climits>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>

#include "reports/baseline.h"
#include "reports/json_report.h"
#include "reports/text_report.h"
#include "tests/support/claim_texts.h"
#include "tests/support/diagnostic_matchers.h"
#include "tests/support/report_fixture.h"
#include "verifier/checking/checker.h"
#include "verifier/checking/claim_evaluation.h"
#include "verifier/checking/run.h"
#include "verifier/model/claim.h"
#include "verifier/model/claim_discovery.h"

namespace thetagate::engine {
namespace {

namespace fs = std::filesystem;

using test_support::located;
using test_support::located_error_of;

ClaimResult check_text(const std::string& toml, std::optional<uint64_t> max_bits = 64) {
  std::vector<ClaimEntry> entries = load_claim_text(toml, "edges.toml");
  EXPECT_EQ(entries.size(), 1u);
  CheckOptions options;
  options.max_bits = max_bits;
  options.budget.max_seconds = 0;  // only work budgets: the same on a loaded machine
  return check_entry(entries.at(0), options);
}

// 12. A caret stays on its line whatever the column says.
TEST(InputEdges, TheCaretStaysOnTheLine) {
  Diagnostic d{Location{"orchard.toml", 3, INT_MAX}, "bad", "", "bound = \"O(n)\""};
  std::string text = format_diagnostic(d);
  EXPECT_LT(text.size(), 200u) << text;
  EXPECT_NE(text.find("\nbound = \"O(n)\"\n" + std::string(14, ' ') + "^"), std::string::npos)
      << text;
  d.where.column = -5;
  EXPECT_NE(format_diagnostic(d).find("\n^"), std::string::npos);
}

// 12. A baseline whose error column is 2^31 - 1 renders a short report; one
// past any int is a located error, not a wrapped number.
TEST(InputEdges, ABaselineColumnCannotBlowUpTheReport) {
  RunResult run = test_support::sample_run();
  ASSERT_TRUE(run.claims[4].error.has_value());
  nlohmann::ordered_json json = nlohmann::ordered_json::parse(render_json(run));
  json["claims"][4]["error"]["column"] = 2147483647u;
  RunResult back = read_json_report(json.dump(), "old.json");
  std::string text = render_text(back, TextStyle{});
  EXPECT_LT(text.size(), 2 * render_text(run, TextStyle{}).size());

  json["claims"][4]["error"]["column"] = 2147483648u;
  EXPECT_EQ(
      located_error_of([&] { read_json_report(json.dump(), "old.json"); }),
      "old.json:1:63842: 'claims[4].error.column' is 2147483648, more than any line or column "
      "(2147483647) [hint: a baseline is a report written by `thetagate check --format json`]");
}

// 17. A bound whose exponent no value can hold (n^(10^10) needs 10^10 bits
// at n = 2) is still proved by the derived class: Theta(n^2) is within it.
TEST(InputEdges, AHugeExponentInTheBoundIsDecidedByTheDerivation) {
  ClaimResult r = check_text(R"toml([[claim]]
name = "orchard::pairwise graft"
recurrence = "T(n) = 4T(n/2) + n; T(1) = 1"
bound = "O(n^(10^10))"
)toml");
  EXPECT_EQ(r.verdict, Verdict::kHolds) << verdict_name(r.verdict);
  EXPECT_FALSE(r.tight);
}

// 17. A smallest size at or above 2^max_bits leaves nothing to check: an
// error at min_n, not a verdict on no sizes.
TEST(InputEdges, ASmallestSizeAboveEveryCheckedSizeIsAnError) {
  struct Case {
    const char* min_n;
    const char* bits;  // the size's length, which the message states
  };
  for (const Case& c : {Case{"\"2^70000\"", "70001"}, Case{"\"2^64\"", "65"}}) {
    ClaimResult r = check_text(std::string(test_support::kHalvingClaim) +
                               "[claim.sizes]\nmin_n = " + c.min_n + "\n");
    ASSERT_EQ(r.verdict, Verdict::kError) << c.min_n;
    EXPECT_EQ(located(r.error),
              std::string("edges.toml:6:9: 'min_n': the smallest size, ") + c.bits +
                  " bits long, is not below 2^64: sizes checked have at most 64 bits "
                  "(max_bits), so no size is left to check [hint: lower it, or raise max_bits "
                  "([claim.sizes] or "
                  "--max-bits, at most 65536)]");
    EXPECT_EQ(r.sizes_checked, 0u);
  }
  // Just below 2^max_bits is fine.
  ClaimResult fine =
      check_text(std::string(test_support::kHalvingClaim) + "sizes = { min_n = \"2^63\" }\n");
  EXPECT_EQ(fine.verdict, Verdict::kHolds);
  EXPECT_GT(fine.sizes_checked, 0u);
  // The same through an explicit bound's own "for n >= N0".
  ClaimResult explicit_bound = check_text(R"toml([[claim]]
name = "orchard::halving"
recurrence = "T(n) = T(n/2) + 1; T(1) = 1"
bound = "T(n) <= 2 lg n for n >= 2^64"
)toml");
  ASSERT_EQ(explicit_bound.verdict, Verdict::kError);
  EXPECT_EQ(located(explicit_bound.error),
            "edges.toml:4:31: 'for n >= ...': the smallest size, 65 bits long, is not below 2^64: "
            "sizes checked have at most 64 bits (max_bits), so no size is left to check [hint: "
            "lower it, or "
            "raise max_bits ([claim.sizes] or --max-bits, at most 65536)]");
}

// 17. --claim X --claim X checks X once.
TEST(InputEdges, ANameGivenTwiceIsCheckedOnce) {
  std::vector<size_t> picked = select_names({"a", "b", "a"}, {"a", "b", "a"});
  EXPECT_EQ(picked, (std::vector<size_t>{0, 2, 1}));
}

// 17. check a.toml ./a.toml (or a folder and a file in it) reads the file once.
TEST(InputEdges, AFileNamedTwiceIsReadOnce) {
  fs::path dir = fs::temp_directory_path() / ("thetagate-edges-" + std::to_string(::getpid()));
  fs::remove_all(dir);
  fs::create_directories(dir);
  std::ofstream(dir / "a.toml") << "[[claim]]\nname = \"a\"\nrecurrence = \"T(n) = T(n/2) + 1; "
                                   "T(1) = 1\"\nbound = \"Theta(lg n)\"\n";
  fs::create_symlink("a.toml", dir / "link.toml");
  std::string a = (dir / "a.toml").string();
  std::string dotted = (dir / "." / "a.toml").string();
  EXPECT_EQ(find_claim_files({a, dotted}).size(), 1u);
  EXPECT_EQ(find_claim_files({a, dir.string()}).size(), 1u);
  std::vector<ClaimEntry> entries = load_entries({dotted, a});
  ASSERT_EQ(entries.size(), 1u);
  EXPECT_TRUE(entries[0].claim.has_value());
  EXPECT_EQ(entries[0].where.file, dotted);
  fs::remove_all(dir);
}

// 16. --clock-limit is seconds per claim, whatever --effort says; without
// it the default guard grows with the effort.
TEST(InputEdges, AClockLimitIsNotScaledByTheEffort) {
  CheckOptions options;
  options.clock_limit = 5;
  EXPECT_EQ(checker_internal::reading_budget(options, 4).max_seconds, 5.0);
  EXPECT_EQ(checker_internal::reading_budget(options, 4).max_steps, 4 * options.budget.max_steps);
  options.clock_limit.reset();
  EXPECT_EQ(checker_internal::reading_budget(options, 4).max_seconds,
            4 * options.budget.max_seconds);
  options.clock_limit = 0;  // no clock
  EXPECT_EQ(checker_internal::reading_budget(options, 4).max_seconds, 0.0);
}

}  // namespace
}  // namespace thetagate::engine
