// End-to-end tests: run the built thetagate binary on claim files and check
// exit codes, JSON fields and error text. The top of the test pyramid; the
// library is tested directly elsewhere.
#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <string>

#include "tests/support/claim_texts.h"
#include "tests/support/scratch_test.h"
#include "tests/support/test_support.h"

namespace {

using thetagate::engine::test_support::CommandResult;

CommandResult run(const std::string& arguments) {
  return thetagate::engine::test_support::run_shell(std::string(THETAGATE_BINARY) + " " +
                                                    arguments);
}

class Cli : public thetagate::engine::test_support::ScratchTest {
 protected:
  Cli() : ScratchTest("cli") {}
};

const char* kMergeSortTrue = R"toml([[claim]]
name = "merge comparisons"
recurrence = """
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
"""
bound = "T(n) <= n lg n for n >= 1"
)toml";

const char* const kTooTight = thetagate::engine::test_support::kTooTightMergeClaim;

TEST(CliEval, PrintsExactValuesOneLineEach) {
  // W(37) = 159: M. A. Suchenek, "Elementary yet precise worst-case analysis of
  // MergeSort", arXiv:1702.08443 (closed form n⌈lg n⌉ − 2^⌈lg n⌉ + 1) [calc].
  CommandResult r = run("eval 'T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0' 37 2^64");
  EXPECT_EQ(r.status, 0);
  EXPECT_EQ(r.out, "37 159\n18446744073709551616 1162144876643701751809\n");
}

TEST(CliEval, PrintsRationalsAndIntervals) {
  CommandResult r = run("eval 'T(n) = 2T(n/2) + n/lg n; T(1) = 1' 16 17");
  EXPECT_EQ(r.status, 0);
  // 16 (1 + H_4) = 148/3 [calc from T(2^k) = 2^k (T(1) + H_k)].
  EXPECT_EQ(r.out.substr(0, 10), "16 148/3\n1");
  EXPECT_NE(r.out.find("17 ["), std::string::npos) << r.out;
}

TEST(CliEval, BadRecurrenceIsALocatedErrorWithExitTwo) {
  CommandResult r = run("eval 'T(n) = 2T(n/2 + n' 5");
  EXPECT_EQ(r.status, 2);
  EXPECT_EQ(r.out,
            "<recurrence>:1:18: error: expected ')' after 'n', found the end of the text\n"
            "T(n) = 2T(n/2 + n\n"
            "                 ^\n"
            "  hint: close the argument list of 'T' with ')'\n");
}

TEST_F(Cli, HoldingOrUndecidedClaimsExitZero) {
  std::string file = write("true.toml", kMergeSortTrue);
  CommandResult r = run("check --max-bits 256 --format json " + file);
  EXPECT_EQ(r.status, 0) << r.out;
  auto json = nlohmann::json::parse(r.out);
  ASSERT_EQ(json["claims"].size(), 1u);
  EXPECT_NE(json["claims"][0]["verdict"], "refuted");
  EXPECT_NE(json["claims"][0]["verdict"], "error");
}

TEST_F(Cli, RefutedClaimExitsOneWithAWitness) {
  std::string file = write("tight.toml", kTooTight);
  CommandResult r = run("check --max-bits 64 --seed 7 --format json " + file);
  EXPECT_EQ(r.status, 1) << r.out;
  auto json = nlohmann::json::parse(r.out);
  EXPECT_EQ(json["seed"], 7);
  const auto& claim = json["claims"][0];
  EXPECT_EQ(claim["name"], "too tight");
  EXPECT_EQ(claim["verdict"], "refuted");
  EXPECT_EQ(claim["line"], 1);
  ASSERT_FALSE(claim["witnesses"].empty());
  // W(3) = 3 > 3 lg 3 − 3 ≈ 1.75; n = 2 gives W(2) = 1 = 2 lg 2 − 2 + 1 > 0.
  EXPECT_EQ(claim["witnesses"][0]["n"], "2");
  EXPECT_EQ(claim["witnesses"][0]["side"], "upper");
  for (const char* key : {"name", "file", "line", "verdict", "claimed", "derived", "method",
                          "tight", "witnesses", "band", "message"}) {
    EXPECT_TRUE(claim.contains(key)) << key;
  }
}

TEST_F(Cli, ABadClaimDoesNotHideTheOthers) {
  std::string file = write("mixed.toml", std::string(kTooTight) + R"toml(
[[claim]]
name = "broken"
recurrence = "T(n) = T(n/2 +"
bound = "O(lg n)"
)toml");
  CommandResult r = run("check --max-bits 64 --format json " + file);
  // The error shows in the exit code even beside a refutation.
  EXPECT_EQ(r.status, 2) << r.out;
  auto json = nlohmann::json::parse(r.out);
  ASSERT_EQ(json["claims"].size(), 2u);
  EXPECT_EQ(json["claims"][0]["verdict"], "refuted");
  EXPECT_EQ(json["claims"][1]["verdict"], "error");
  EXPECT_EQ(json["claims"][1]["name"], "broken");
}

TEST_F(Cli, OnlyErrorsExitTwo) {
  std::string file = write("bad.toml",
                           "[[claim]]\nname = \"x\"\nrecurrence = \"T(n) = T(n/2) + "
                           "1\"\nbound = \"O(lg n)\"\nbounds = \"typo\"\n");
  CommandResult r = run("check " + file);
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("bad.toml:5:1"), std::string::npos) << r.out;
}

TEST_F(Cli, MeasuredCostsAreCheckedLineByLine) {
  // Costs written by a test in another language: T(5) = 8 for the merge-sort
  // worst case (Suchenek's closed form n ceil(lg n) - 2^ceil(lg n) + 1).
  std::filesystem::create_directories(dir_ / "costs");
  write("costs/merge.txt", "# n comparisons\n4 5\n5 9\n");
  std::string file = write(
      "measured.toml", std::string(kMergeSortTrue) + "[claim.code]\ncosts = \"costs/merge.txt\"\n");
  CommandResult r = run("check --max-bits 64 " + file);
  EXPECT_EQ(r.status, 1) << r.out;
  EXPECT_NE(r.out.find("the code breaks its model: at n = 5"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("merge.txt:3): counted cost 9 > T(n) = 8"), std::string::npos) << r.out;
  write("costs/merge.txt", "4 5\n5 eight\n");
  CommandResult bad = run("check --max-bits 64 " + file);
  EXPECT_EQ(bad.status, 2) << bad.out;
  EXPECT_NE(bad.out.find("merge.txt:2:3: error: the cost must be a non-negative whole number"),
            std::string::npos)
      << bad.out;
}

TEST_F(Cli, MissingPathIsUsageError) {
  CommandResult r = run("check /nonexistent/claims.toml");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("/nonexistent/claims.toml"), std::string::npos) << r.out;
}

TEST_F(Cli, EffortBuysReachAndIsPartOfTheReplay) {
  // Two terms whose floors never collapse: each larger size costs more
  // subproblems, so the work budget, not --max-bits, sets the reach.
  const std::string claim = R"toml([[claim]]
name = "select"
recurrence = """
T(n) = 1 if n <= 4
T(n) = T(n/5) + T(7n/10) + n
"""
bound = "Theta(n)"
)toml";
  std::string file = write("select.toml", claim);
  CommandResult base = run("check --max-bits 256 --format json " + file);
  CommandResult deep = run("check --max-bits 256 --effort 4 --format json " + file);
  ASSERT_EQ(base.status, 0) << base.out;
  ASSERT_EQ(deep.status, 0) << deep.out;
  auto b = nlohmann::json::parse(base.out);
  auto d = nlohmann::json::parse(deep.out);
  EXPECT_FALSE(b.contains("effort"));
  EXPECT_EQ(b["max_bits"], 256);
  EXPECT_EQ(d["effort"], 4);
  EXPECT_GT(d["claims"][0]["largest_bits"].get<int>(), b["claims"][0]["largest_bits"].get<int>());
  EXPECT_GT(d["claims"][0]["sizes_checked"].get<int>(), b["claims"][0]["sizes_checked"].get<int>());

  CommandResult text = run("check --max-bits 256 --effort 4 " + file);
  EXPECT_NE(text.out.find("rerun with --seed 1 --max-bits 256 --effort 4 to replay"),
            std::string::npos)
      << text.out;
  EXPECT_EQ(run("check --effort 0 " + file).status, 2);

  // The claim's own effort multiplies the same budget.
  std::string own = write("select-own.toml", claim + "sizes = { effort = 4 }\n");
  auto o = nlohmann::json::parse(run("check --max-bits 256 --format json " + own).out);
  EXPECT_EQ(o["claims"][0]["largest_bits"], d["claims"][0]["largest_bits"]);
  EXPECT_EQ(o["claims"][0]["sizes_checked"], d["claims"][0]["sizes_checked"]);
}

TEST_F(Cli, SameSeedSameReportByteForByte) {
  std::string file = write("true.toml", kMergeSortTrue);
  CommandResult a = run("check --max-bits 128 --seed 42 --format json " + file);
  CommandResult b = run("check --max-bits 128 --seed 42 --format json " + file);
  EXPECT_EQ(a.out, b.out);
}

TEST_F(Cli, DemoLibraryRefutesExactlyItsDeliberatelyWrongClaims) {
  // The bundled demo as the README runs it (default sizes, both cores):
  // every claim named "deliberately wrong" is refuted, every other is not.
  CommandResult r = run(std::string("check --jobs 2 --clock-limit 0 --format json ") +
                        THETAGATE_SOURCE_DIR + "/claims");
  EXPECT_EQ(r.status, 1) << r.out;
  auto json = nlohmann::json::parse(r.out);
  int wrong = 0;
  for (const auto& c : json["claims"]) {
    std::string name = c["name"];
    bool deliberately_wrong = name.find("deliberately wrong") != std::string::npos;
    wrong += deliberately_wrong;
    EXPECT_EQ(c["verdict"] == "refuted", deliberately_wrong) << name << ": " << c["message"];
    EXPECT_NE(c["verdict"], "error") << name;
  }
  EXPECT_GE(wrong, 10);
}

TEST_F(Cli, DemoClaimsRunAndIncludeARefutation) {
  CommandResult r = run(std::string("check --max-bits 256 --clock-limit 0 --format json ") +
                        THETAGATE_SOURCE_DIR + "/claims");
  EXPECT_EQ(r.status, 1) << r.out;
  auto json = nlohmann::json::parse(r.out);
  EXPECT_GE(json["claims"].size(), 12u);
  int refuted = 0, errors = 0;
  for (const auto& c : json["claims"]) {
    refuted += c["verdict"] == "refuted";
    errors += c["verdict"] == "error";
  }
  EXPECT_GE(refuted, 1);
  EXPECT_EQ(errors, 0) << r.out;
}

}  // namespace

namespace {

TEST_F(Cli, ParallelRunPrintsWhatASerialRunPrints) {
  std::string claims = std::string(THETAGATE_SOURCE_DIR) + "/tests/data/golden_claims.toml";
  CommandResult serial = run("check --seed 5 --format json --jobs 1 " + claims);
  CommandResult parallel = run("check --seed 5 --format json --jobs 2 " + claims);
  EXPECT_EQ(serial.status, parallel.status);
  EXPECT_EQ(serial.out, parallel.out);
}

TEST_F(Cli, OutFolderGetsEveryFormatAndABaselineGatesOnDrift) {
  std::string file = write("tight.toml", kTooTight);
  std::string folder = (dir_ / "nightly").string() + "/";
  CommandResult first = run("check --max-bits 64 --seed 3 --out " + folder + " " + file);
  EXPECT_EQ(first.status, 1) << first.out;
  for (const char* name :
       {"report.txt", "report.json", "report.junit.xml", "report.html", "report.md"}) {
    EXPECT_TRUE(std::filesystem::exists(dir_ / "nightly" / name)) << name;
  }
  // Same claims, same seed: nothing drifted, so --fail-on drift passes.
  CommandResult again = run("check --max-bits 64 --seed 3 --fail-on drift --baseline " + folder +
                            "report.json " + file);
  EXPECT_EQ(again.status, 0) << again.out;
  // The claim is fixed: its verdict changes from refuted, which is drift.
  std::string fixed = write("tight.toml", R"toml([[claim]]
name = "too tight"
recurrence = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0"
bound = "T(n) <= n lg n for n >= 2"
)toml");
  CommandResult drifted = run("check --max-bits 64 --seed 3 --fail-on drift --baseline " + folder +
                              "report.json " + fixed);
  EXPECT_EQ(drifted.status, 1) << drifted.out;
  EXPECT_NE(drifted.out.find("refuted"), std::string::npos) << drifted.out;
  CommandResult usage = run("check --fail-on drift " + fixed);
  EXPECT_EQ(usage.status, 2) << usage.out;
}

}  // namespace
