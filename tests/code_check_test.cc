// Measured-cost files: a claim's [claim.code] table names a file of "size
// cost" lines, checked exactly against T(n) under the claim's relation.
#include "verifier/checking/code_check.h"

#include <gtest/gtest.h>
#include <sys/stat.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <vector>

#include "reports/baseline.h"
#include "reports/html_report.h"
#include "reports/json_report.h"
#include "reports/junit_report.h"
#include "reports/text_report.h"
#include "reports/verdict_text.h"
#include "tests/support/diagnostic_matchers.h"
#include "thetagate/cost.h"
#include "verifier/checking/checker.h"
#include "verifier/model/claim.h"

namespace thetagate::engine {
namespace {

using test_support::located;

// A top-down merge sort written the common way (split at n/2, merge until one
// run is empty, copy the rest), counting its comparisons.
void merge_sort(std::vector<int>& v, size_t lo, size_t hi, std::vector<int>& scratch,
                CostCounter& comparisons) {
  if (hi - lo < 2) return;
  size_t mid = lo + (hi - lo) / 2;
  merge_sort(v, lo, mid, scratch, comparisons);
  merge_sort(v, mid, hi, scratch, comparisons);
  auto less = counting(comparisons);
  size_t i = lo, j = mid, k = lo;
  while (i < mid && j < hi) scratch[k++] = less(v[j], v[i]) ? v[j++] : v[i++];
  while (i < mid) scratch[k++] = v[i++];
  while (j < hi) scratch[k++] = v[j++];
  std::copy(scratch.begin() + lo, scratch.begin() + hi, v.begin() + lo);
}

uint64_t merge_sort_comparisons(std::vector<int> v) {
  std::vector<int> scratch(v.size());
  CostCounter c;
  merge_sort(v, 0, v.size(), scratch, c);
  return c.count();
}

const char* kMergeRecurrence = R"(
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
)";

class CostsFile : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = std::filesystem::temp_directory_path() /
           ("thetagate-costs-" + std::to_string(::getpid()) + "-" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    std::filesystem::create_directories(dir_ / "costs");
  }
  void TearDown() override { std::filesystem::remove_all(dir_); }

  void write(const std::string& name, const std::string& text) {
    std::ofstream(dir_ / name, std::ios::binary) << text;
  }

  // A claim file with one merge-sort claim whose code table says `code`.
  ClaimResult check(const std::string& code_table) {
    std::string toml = std::string("[[claim]]\nname = \"merge\"\nrecurrence = \"\"\"") +
                       kMergeRecurrence + "\"\"\"\nbound = \"Theta(n lg n)\"\n" + code_table;
    write("claims.toml", toml);
    std::vector<ClaimEntry> entries = load_claim_file((dir_ / "claims.toml").string());
    EXPECT_EQ(entries.size(), 1u);
    CheckOptions options;
    options.max_bits = 64;
    RunResult run = check_entries(entries, options);
    run_ = run;
    return run.claims.front();
  }

  std::filesystem::path dir_;
  RunResult run_;
};

TEST_F(CostsFile, CountedMergeSortCostsKeepToTheWorstCaseModel) {
  // Reversed, sorted and interleaved inputs of a common top-down merge sort:
  // every count is at most the worst case T(n) (Suchenek, "Elementary yet
  // precise worst-case analysis of MergeSort", 2017: the worst case is T).
  std::string lines = "# size cost, written by a test of the sort\n";
  for (int n = 1; n <= 70; ++n) {
    std::vector<int> reversed(n), interleaved(n);
    for (int i = 0; i < n; ++i) reversed[i] = n - i;
    for (int i = 0; i < n; ++i) interleaved[i] = (i % 2) ? i : n + i;
    lines += std::to_string(n) + " " + std::to_string(merge_sort_comparisons(reversed)) + "\n";
    lines += std::to_string(n) + "\t" + std::to_string(merge_sort_comparisons(interleaved)) +
             "   # interleaved\n";
  }
  write("costs/merge.txt", lines);
  ClaimResult r = check("[claim.code]\nmodel = \"upper bound\"\ncosts = \"costs/merge.txt\"\n");
  ASSERT_EQ(r.verdict, Verdict::kHolds) << verdict_message(r);
  ASSERT_TRUE(r.code.has_value());
  EXPECT_EQ(r.code->relation, ModelRelation::kUpperBound);
  EXPECT_EQ(r.code->measurements, 140u);
  EXPECT_EQ(r.code->rows.size(), 70u);
  EXPECT_TRUE(r.code->violations.empty());
  // Reversed input costs n/2-ish per merge: strictly below T at n = 64.
  EXPECT_EQ(r.code->rows[63].n, 64);
  EXPECT_EQ(r.code->rows[63].model, "321");  // 64·6 − 64 + 1 (Suchenek's closed form)
  EXPECT_EQ(r.code->rows[63].sign, -1);
}

TEST_F(CostsFile, ExactModelAcceptsTheClosedFormAndLocatesADifferentLine) {
  // Suchenek's closed form n⌈lg n⌉ − 2^⌈lg n⌉ + 1: T(5) = 8, T(6) = 11, T(7) = 14.
  write("costs/exact.txt", "5 8\n6 11\n\n7 15\n");
  ClaimResult r = check("[claim.code]\nmodel = \"exact\"\ncosts = \"costs/exact.txt\"\n");
  EXPECT_EQ(r.verdict, Verdict::kRefuted);
  ASSERT_TRUE(r.code.has_value());
  ASSERT_EQ(r.code->violations.size(), 1u);
  const CostViolation& v = r.code->violations.front();
  EXPECT_EQ(v.n, 7);
  EXPECT_EQ(v.cost, "15");
  EXPECT_EQ(v.model, "14");
  EXPECT_EQ(v.line, 4);
  EXPECT_NE(v.file.find("exact.txt"), std::string::npos);
  EXPECT_EQ(r.basis.kind, BasisKind::kCodeBreaksModel);
  // The recurrence itself holds (master theorem, case 2): both links are kept.
  ASSERT_TRUE(r.code->model_verdict.has_value());
  EXPECT_EQ(*r.code->model_verdict, Verdict::kHolds);
  std::string message = verdict_message(r);
  EXPECT_NE(message.find("the code breaks its model: at n = 7"), std::string::npos) << message;
  EXPECT_NE(message.find("exact.txt:4"), std::string::npos) << message;
  EXPECT_NE(message.find("The recurrence itself holds"), std::string::npos) << message;
}

TEST_F(CostsFile, LowerBoundModelIsBrokenByACheaperRun) {
  write("costs/low.txt", "8 17\n8 16\n");  // T(8) = 17: 16 is below it
  ClaimResult r = check("[claim.code]\nmodel = \"lower bound\"\ncosts = \"costs/low.txt\"\n");
  EXPECT_EQ(r.verdict, Verdict::kRefuted);
  ASSERT_EQ(r.code->violations.size(), 1u);
  EXPECT_EQ(r.code->violations[0].line, 2);
  ASSERT_EQ(r.code->rows.size(), 1u);
  EXPECT_EQ(r.code->rows[0].cost, "16");  // the smallest is the row's cost
  EXPECT_EQ(r.code->rows[0].runs, 2u);
}

TEST_F(CostsFile, UpperBoundModelIsBrokenByACostlierRunWhateverTheBound) {
  write("costs/up.txt", "3 3\n4 6\n");                                // T(4) = 5
  ClaimResult r = check("[claim.code]\ncosts = \"costs/up.txt\"\n");  // upper bound: default
  EXPECT_EQ(r.verdict, Verdict::kRefuted);
  ASSERT_EQ(r.code->violations.size(), 1u);
  EXPECT_EQ(r.code->violations[0].n, 4);
  // The bound itself held: the result keeps its verdict and the message says so.
  ASSERT_TRUE(r.code->model_verdict.has_value());
  EXPECT_EQ(*r.code->model_verdict, Verdict::kHolds);
  EXPECT_NE(verdict_message(r).find("The recurrence itself holds"), std::string::npos)
      << verdict_message(r);
}

struct MalformedCase {
  const char* text;
  const char* diagnostic;  // located(), after the costs file's path
};

TEST_F(CostsFile, MalformedLinesAreLocatedInputErrors) {
  const MalformedCase cases[] = {
      {"4 5\n12 x\n",
       ":2:4: the cost must be a non-negative whole number, found 'x' [hint: each line holds a "
       "size and its counted cost: \"1024 9217\"]"},
      {"4 5\n  12\n",
       ":2:5: a size without a cost [hint: each line holds a size and its counted cost: \"1024 "
       "9217\"]"},
      {"4 5 6\n",
       ":1:5: more than two fields on a line [hint: each line holds a size and its counted cost: "
       "\"1024 9217\" (or \"1024,9217\"); no thousands separators; comments start with '#']"},
      {"-3 4\n",
       ":1:1: the size must be a non-negative whole number, found '-3' [hint: a size is never "
       "negative]"},
      {"1e3 5\n",
       ":1:2: the size must be a non-negative whole number, found '1e3' [hint: write the size as a "
       "whole number in decimal digits (no 1e6, no 2.5)]"},
      // A spreadsheet export's header row, and the same words after a measurement.
      {"size,cost\n1 0\n",
       ":1:1: the size must be a non-negative whole number, found 'size' [hint: a header line? "
       "start it with '#' to make it a comment: \"# size cost\"]"},
      {"2 3\nsize cost\n",
       ":2:1: the size must be a non-negative whole number, found 'size' [hint: each line holds a "
       "size and its counted cost: \"1024 9217\"]"},
      {"0 0\n",
       ":1:1: the model has no value at n = 0: T(ceil(n/2)) at n = 0 calls T(0), which does not "
       "shrink [hint: measure only sizes the recurrence defines (see its base cases)]"},
  };
  for (const MalformedCase& c : cases) {
    write("costs/bad.txt", c.text);
    ClaimResult r = check("[claim.code]\ncosts = \"costs/bad.txt\"\n");
    ASSERT_EQ(r.verdict, Verdict::kError) << c.text;
    // The path is the test's temporary folder, different on each run.
    EXPECT_EQ(located(r.error), (dir_ / "costs/bad.txt").string() + c.diagnostic) << c.text;
  }
}

TEST_F(CostsFile, MissingOrEmptyFileIsAnErrorAtTheKey) {
  ClaimResult missing = check("[claim.code]\ncosts = \"costs/none.txt\"\n");
  ASSERT_EQ(missing.verdict, Verdict::kError);
  // At the costs key; the path is the test's temporary folder.
  const std::string claims = (dir_ / "claims.toml").string();
  EXPECT_EQ(located(missing.error),
            claims + ":9:9: cannot read the costs file: No such file or directory ('" +
                (dir_ / "costs/none.txt").string() +
                "') [hint: 'costs' is relative to the claim file's folder; the file holds lines "
                "\"size cost\"]");
  write("costs/empty.txt", "# nothing measured yet\n\n");
  ClaimResult empty = check("[claim.code]\ncosts = \"costs/empty.txt\"\n");
  ASSERT_EQ(empty.verdict, Verdict::kError);
  EXPECT_EQ(located(empty.error), claims + ":9:9: the costs file '" +
                                      (dir_ / "costs/empty.txt").string() +
                                      "' holds no measurements [hint: each line holds a size and "
                                      "its counted cost: \"1024 9217\"]");
  // A pipe would block a reader: refused, not read (common practice for inputs).
  ASSERT_EQ(::mkfifo((dir_ / "costs" / "pipe.txt").c_str(), 0600), 0);
  ClaimResult pipe = check("[claim.code]\ncosts = \"costs/pipe.txt\"\n");
  ASSERT_EQ(pipe.verdict, Verdict::kError);
  EXPECT_EQ(located(pipe.error),
            claims + ":9:9: '" + (dir_ / "costs/pipe.txt").string() +
                "' is not a regular file (a pipe, socket or device) [hint: save "
                "the costs file to a file first and give its path]");
}

TEST_F(CostsFile, BadCodeTableIsAnErrorOnThatClaimOnly) {
  ClaimResult r = check("[claim.code]\nmodel = \"upper\"\n");
  ASSERT_EQ(r.verdict, Verdict::kError);
  // At the model key.
  const std::string claims = (dir_ / "claims.toml").string();
  EXPECT_EQ(located(r.error),
            claims +
                ":9:9: 'model' must be \"upper bound\", \"exact\" or \"lower bound\" [hint: "
                "\"upper bound\": every counted cost is at most T(n) (a worst-case model)]");
  ClaimResult typo = check("[claim.code]\ncost = \"x.txt\"\n");
  ASSERT_EQ(typo.verdict, Verdict::kError);
  EXPECT_EQ(located(typo.error), claims +
                                     ":9:1: unknown key 'cost' in code [hint: did you mean "
                                     "'costs'? allowed keys: model, costs, max_n]");
}

TEST_F(CostsFile, EveryReportShowsTheMeasuredLink) {
  write("costs/m.txt", "4 5\n5 9\n");  // T(5) = 8
  ClaimResult r = check("[claim.code]\ncosts = \"costs/m.txt\"\n");
  ASSERT_EQ(r.verdict, Verdict::kRefuted);
  TextStyle style;
  std::string text = render_text(run_, style);
  EXPECT_NE(text.find("code -> model: costs/m.txt (2 measurements at 2 sizes)"), std::string::npos)
      << text;
  EXPECT_NE(text.find("m.txt:2): counted cost 9 > T(n) = 8"), std::string::npos) << text;
  auto json = nlohmann::json::parse(render_json(run_));
  EXPECT_EQ(json["schema_version"], 3);
  const auto& code = json["claims"][0]["code"];
  EXPECT_EQ(code["relation"], "upper bound");
  EXPECT_EQ(code["violations"][0]["line"], 2);
  EXPECT_EQ(code["rows"][1]["model"], "8");
  std::string junit = render_junit(run_, JunitOptions{});
  EXPECT_NE(junit.find("counted cost 9 &gt; T(n) = 8"), std::string::npos) << junit;
  // A baseline reads the link back: the JSON round-trips byte for byte.
  EXPECT_EQ(render_json(read_json_report(render_json(run_))), render_json(run_));
  std::string html = render_html(run_);
  EXPECT_NE(html.find("<svg class=\"cost-plot\""), std::string::npos);
  EXPECT_NE(html.find("class=\"counted broken\""), std::string::npos);
}

// Issue 22, case 16: a clock limit holds for the costs file too (its own
// hang guard of 600 s applies only when no limit is given).
TEST_F(CostsFile, AClockLimitHoldsForTheCostsFile) {
  write("costs/long.txt", "3000000 3000000\n");
  write("claims.toml",
        "[[claim]]\nname = \"walk\"\nrecurrence = \"T(n) = T(n - 1) + 1; T(0) = 0\"\n"
        "bound = \"Theta(n)\"\n[claim.code]\nmodel = \"exact\"\ncosts = \"costs/long.txt\"\n");
  std::vector<ClaimEntry> entries = load_claim_file((dir_ / "claims.toml").string());
  ASSERT_EQ(entries.size(), 1u);
  ASSERT_TRUE(entries[0].claim.has_value());
  try {
    check_costs_file(*entries[0].claim, "", 1e-4);
    ADD_FAILURE() << "three million steps finished within 0.1 ms";
  } catch (const BudgetExceeded& e) {
    EXPECT_NE(std::string(e.what()).find("time budget of 0.0001 s"), std::string::npos) << e.what();
  }
  // Without a clock (0), only the work budgets apply: the same file passes.
  EXPECT_TRUE(check_costs_file(*entries[0].claim, "", 0.0).violations.empty());
}

}  // namespace
}  // namespace thetagate::engine
