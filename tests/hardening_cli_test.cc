// Adversarial input, end to end: exit codes, what is still reported, and
// where output goes when something is wrong (issue "Hardening").
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

namespace fs = std::filesystem;

namespace support = thetagate::engine::test_support;
using Outcome = support::CommandResult;

// Runs a shell command line; "$TG" in it is the thetagate binary.
Outcome shell(const std::string& line) { return support::run_thetagate_shell(line); }

class HardeningCli : public support::ScratchTest {
 protected:
  HardeningCli() : ScratchTest("hcli") {}
};

const char* const kHolds = support::kHalvingClaim;

const char* kBroken = R"toml([[claim]]
name = "broken"
recurrence = "T(n) = T(n/2 +"
bound = "O(lg n)"
)toml";

// 10. Input errors show in the exit code even beside a refutation.
TEST_F(HardeningCli, InputErrorsWinOverARefutation) {
  std::string file =
      write("mixed.toml", std::string(support::kTooTightMergeClaim) + "\n" + kBroken);
  Outcome r = shell("$TG check --max-bits 64 --clock-limit 0 --format json " + file);
  EXPECT_EQ(r.status, 2) << r.out;
  auto json = nlohmann::json::parse(r.out.substr(0, r.out.rfind('}') + 1));
  ASSERT_EQ(json["claims"].size(), 2u);
  EXPECT_EQ(json["claims"][0]["verdict"], "refuted");
  EXPECT_EQ(json["claims"][1]["verdict"], "error");
}

// 11. A link loop below a folder is one error; the other claims are checked.
TEST_F(HardeningCli, ALinkLoopInAFolderCostsOnlyItself) {
  write("claims/good.toml", kHolds);
  fs::create_symlink("loop.toml", dir_ / "claims" / "loop.toml");
  Outcome r =
      shell("$TG check --max-bits 64 --clock-limit 0 --format json " + (dir_ / "claims").string());
  EXPECT_EQ(r.status, 2) << r.out;
  auto json = nlohmann::json::parse(r.out.substr(0, r.out.rfind('}') + 1));
  ASSERT_EQ(json["claims"].size(), 2u) << r.out;
  EXPECT_EQ(json["claims"][0]["name"], "orchard::halving");
  EXPECT_EQ(json["claims"][0]["verdict"], "holds");
  EXPECT_EQ(json["claims"][1]["verdict"], "error");
  EXPECT_EQ(json["claims"][1]["file"], (dir_ / "claims" / "loop.toml").string());
}

// 13. An empty folder is an error, not "0 claims".
TEST_F(HardeningCli, AnEmptyFolderIsAnError) {
  fs::create_directories(dir_ / "none");
  Outcome r = shell("$TG check " + (dir_ / "none").string());
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("no claim files (*.toml) in the folder"), std::string::npos) << r.out;
}

// 12. derive validates like eval and check.
TEST_F(HardeningCli, DeriveRejectsCallsThatDoNotShrink) {
  for (const char* recurrence : {"T(n) = T(n) + 1", "T(n) = T(n+1) + 1; T(1) = 1"}) {
    Outcome d = shell(std::string("$TG derive '") + recurrence + "'");
    Outcome e = shell(std::string("$TG eval '") + recurrence + "' 10");
    EXPECT_EQ(d.status, 2) << d.out;
    EXPECT_EQ(e.status, 2) << e.out;
    EXPECT_NE(d.out.find("which does not shrink"), std::string::npos) << d.out;
  }
}

// 3. A bad --out is found before any claim is checked, and does not abort.
TEST_F(HardeningCli, BadOutputLocationsAreFoundFirst) {
  std::string claims = write("ok.toml", kHolds);
  std::string plain = write("plain.txt", "x");
  for (const std::string& out : {plain + "/report.json", plain + "/reports/"}) {
    Outcome r = shell("$TG check --clock-limit 0 --out " + out + " " + claims);
    EXPECT_EQ(r.status, 2) << r.out;
    EXPECT_EQ(r.out.find("terminate"), std::string::npos) << r.out;
    EXPECT_EQ(r.out.rfind(out + ":1:1: error: ", 0), 0u) << r.out;
  }
}

// 14. A write that fails midway (here: a file size limit) leaves the old
// report whole and says why.
TEST_F(HardeningCli, AFailedWriteKeepsTheOldReportAndGivesTheReason) {
  std::string claims = write("ok.toml", kHolds);
  std::string old_report = R"({"old": "complete"})";
  write("out/report.json", old_report);
  // ulimit -f counts 512-byte blocks: 4 KiB, less than any JSON report.
  Outcome r = shell("trap '' XFSZ; ulimit -f 8; $TG check --max-bits 64 --clock-limit 0 --out " +
                    (dir_ / "out").string() + "/ " + claims);
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("File too large"), std::string::npos) << r.out;
  EXPECT_EQ(read("out/report.json"), old_report);
  for (const auto& e : fs::directory_iterator(dir_ / "out")) {
    EXPECT_EQ(e.path().filename(), "report.json");  // no temporary files left behind
  }
}

// 15. Messages.
TEST_F(HardeningCli, MessagesNameTheRealProblem) {
  Outcome typo = shell("$TG chekc claims");
  EXPECT_EQ(typo.status, 2);
  EXPECT_NE(typo.out.find("unknown command 'chekc'"), std::string::npos) << typo.out;
  EXPECT_NE(typo.out.find("did you mean 'check'?"), std::string::npos) << typo.out;

  std::string claims = write("ok.toml", kHolds);
  Outcome baseline = shell("$TG check --baseline " + dir_.string() + " " + claims);
  EXPECT_EQ(baseline.status, 2);
  EXPECT_NE(baseline.out.find("is a folder, not a baseline report"), std::string::npos)
      << baseline.out;

  // A path that cannot be reached is not "no such file".
  fs::create_symlink("loop", dir_ / "loop");
  Outcome unreachable = shell("$TG check " + (dir_ / "loop" / "x.toml").string());
  EXPECT_EQ(unreachable.status, 2);
  EXPECT_NE(unreachable.out.find("cannot reach"), std::string::npos) << unreachable.out;

  // A budget that runs out names the size that asked for too much.
  Outcome budget = shell("$TG eval 'T(n) = T(n-1) + 1; T(0) = 0' 10 10^12");
  EXPECT_EQ(budget.status, 2);
  EXPECT_NE(budget.out.find("<size>:1:1: error: T(10^12) is out of budget"), std::string::npos)
      << budget.out;
}

}  // namespace
