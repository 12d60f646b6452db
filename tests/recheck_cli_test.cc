// The re-checker from the command line (issue 20): every holds of the demo
// and of the test suite's claim files is re-checked with none rejected;
// `thetagate recheck` on a doctored report names the obligation that fails
// and exits 3; `check --recheck` shows the answer under each holds.
#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <string>

#include "tests/support/test_support.h"

namespace {

namespace fs = std::filesystem;
using thetagate::engine::test_support::CommandResult;
using thetagate::engine::test_support::count_of;
using thetagate::engine::test_support::run_shell;

std::string tg(const std::string& args) {
  return std::string("cd '") + THETAGATE_SOURCE_DIR + "' && '" + THETAGATE_BINARY + "' " + args;
}

class RecheckCli : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() /
           ("thetagate-recheck-" + std::to_string(::getpid()) + "-" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::remove_all(dir_);
    fs::create_directories(dir_);
  }
  void TearDown() override { fs::remove_all(dir_); }
  fs::path dir_;
};

TEST_F(RecheckCli, EveryHoldsOfTheDemoAndTheTestClaimsIsReCheckedOrSaysWhyNot) {
  fs::path report = dir_ / "demo.json";
  CommandResult run = run_shell(tg(
      "check claims tests/data --recheck --jobs 2 --format json --out '" + report.string() + "'"));
  // 2: tests/data holds a claim with an input error on purpose; never 3,
  // which a rejected certificate would give.
  ASSERT_EQ(run.status, 2) << run.out;
  CommandResult again = run_shell(tg("recheck '" + report.string() + "'"));
  EXPECT_EQ(again.status, 0) << again.out;
  EXPECT_EQ(count_of(again.out, "REJECTED"), 0u) << again.out;
  // Every one of the demo's 33 holds, the two exact counts proved by
  // induction on dyadic blocks and the three proofs over sums of earlier
  // values among them, and both of tests/data's.
  EXPECT_EQ(count_of(again.out, ": re-checked ("), 35u) << again.out;
  EXPECT_EQ(count_of(again.out, "orchard::find_sorted / probes, exact: re-checked ("), 1u)
      << again.out;
  EXPECT_EQ(
      count_of(again.out, "orchard::stable_sort / comparisons, exact worst case: re-checked ("), 1u)
      << again.out;
  EXPECT_EQ(count_of(again.out, "has no rule in the re-checker"), 0u) << again.out;
  EXPECT_NE(again.out.find("35 holds: 35 re-checked, 0 rejected, 0 not re-checked"),
            std::string::npos)
      << again.out;
  EXPECT_NE(again.out.find("0 rejected"), std::string::npos) << again.out;
  // The JSON of the --recheck run carries the same answers.
  std::ifstream in(report);
  nlohmann::json j = nlohmann::json::parse(in);
  int rechecked = 0;
  for (const auto& c : j["claims"]) {
    if (c["verdict"] != "holds") {
      EXPECT_EQ(c["recheck"], "") << c["name"];
      continue;
    }
    std::string answer = c["recheck"];
    EXPECT_FALSE(answer.empty()) << c["name"];
    rechecked += answer.rfind("re-checked (", 0) == 0;
  }
  EXPECT_EQ(rechecked, 35);
}

TEST_F(RecheckCli, ADoctoredCertificateIsRejectedWithItsObligationAndExit3) {
  fs::path claims = dir_ / "orchard.toml";
  std::ofstream(claims) << R"toml([[claim]]
name = "orchard::merge_rows / comparisons"
recurrence = """
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
"""
bound = "Theta(n lg n)"
)toml";
  fs::path report = dir_ / "report.json";
  CommandResult run = run_shell(
      tg("check '" + claims.string() + "' --format json --out '" + report.string() + "'"));
  ASSERT_EQ(run.status, 0) << run.out;
  CommandResult fine = run_shell(tg("recheck '" + report.string() + "'"));
  EXPECT_EQ(fine.status, 0) << fine.out;
  EXPECT_NE(fine.out.find("1 holds: 1 re-checked, 0 rejected"), std::string::npos) << fine.out;

  // Raise the certificate's lower driver constant past the truth (n - 1 >= 2n
  // is false): the re-checker must refuse it, naming the obligation.
  nlohmann::json j;
  {
    std::ifstream in(report);
    j = nlohmann::json::parse(in);
  }
  auto& cert = j["claims"][0]["basis"]["certificate"];
  ASSERT_TRUE(cert.is_object()) << j.dump(2);
  cert["driver_low"] = "2";
  cert["driver_high"] = "4";
  std::ofstream(dir_ / "doctored.json") << j.dump(2);
  CommandResult bad = run_shell(tg("recheck '" + (dir_ / "doctored.json").string() + "'"));
  EXPECT_EQ(bad.status, 3) << bad.out;
  EXPECT_NE(bad.out.find("REJECTED: f(n) >= 2 g(n)"), std::string::npos) << bad.out;
  EXPECT_NE(bad.out.find("1 rejected"), std::string::npos) << bad.out;

  // A report about an edited claim is refused too.
  j["claims"][0]["basis"]["certificate"]["driver_low"] = "1/2";
  j["claims"][0]["claimed"] = "O(n)";
  std::ofstream(dir_ / "other.json") << j.dump(2);
  CommandResult other = run_shell(tg("recheck '" + (dir_ / "other.json").string() + "'"));
  EXPECT_EQ(other.status, 3) << other.out;
  EXPECT_NE(other.out.find("differs from the claim file"), std::string::npos) << other.out;
}

TEST_F(RecheckCli, NotAReportIsBadInput) {
  std::ofstream(dir_ / "x.json") << "{\"schema_version\": 2, \"claims\": []}";
  CommandResult r = run_shell(tg("recheck '" + (dir_ / "x.json").string() + "'"));
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("schema_version"), std::string::npos) << r.out;
  CommandResult missing = run_shell(tg("recheck '" + (dir_ / "none.json").string() + "'"));
  EXPECT_EQ(missing.status, 2) << missing.out;
}

TEST_F(RecheckCli, CheckWithRecheckShowsTheAnswerUnderEachHolds) {
  CommandResult r =
      run_shell(tg("check --recurrence 'T(n) = 2T(n/2) + n; T(1) = 1' --bound 'Theta(n lg n)' "
                   "--format text --recheck"));
  EXPECT_EQ(r.status, 0) << r.out;
  EXPECT_NE(r.out.find("certificate: "), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("; re-checked ("), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("re-check of the certificates: 1 re-checked, 0 not re-checked, 0 rejected"),
            std::string::npos)
      << r.out;
  // The one-line answer a reviewer pastes says it too.
  CommandResult brief = run_shell(
      tg("check --recurrence 'T(n) = 2T(n/2) + n; T(1) = 1' --bound 'Theta(n lg n)' --recheck"));
  EXPECT_EQ(brief.status, 0) << brief.out;
  EXPECT_NE(brief.out.find("re-check of the certificates: 1 re-checked"), std::string::npos)
      << brief.out;
  // Without --recheck, nothing is said about a re-check.
  CommandResult plain =
      run_shell(tg("check --recurrence 'T(n) = 2T(n/2) + n; T(1) = 1' --bound 'Theta(n lg n)'"));
  EXPECT_EQ(plain.out.find("re-check"), std::string::npos) << plain.out;
}

}  // namespace
