// A reviewer checks a pasted bound in one command (issue "Each user's first
// ten minutes", §1): a claim given on the command line, a claim file on
// standard input, and the brief one-line-per-claim report.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>
#include <string>

#include "tests/support/test_support.h"
#include "thetagate/version.h"

namespace {

using thetagate::engine::test_support::CommandResult;
using thetagate::engine::test_support::run_shell;

CommandResult tg(const std::string& arguments) {
  return run_shell(std::string("'") + THETAGATE_BINARY + "' " + arguments);
}

TEST(ReviewCli, AClaimOnTheCommandLineGetsOneLine) {
  // 2T(n/2) + n lg n is Θ(n lg² n) (master theorem with the polylog
  // extension, case 2; common practice): O(n lg n) is refuted.
  CommandResult r = tg("check --recurrence '2T(n/2) + n lg n; T(1) = 1' --bound 'O(n lg n)'");
  EXPECT_EQ(r.status, 1) << r.out;
  EXPECT_EQ(r.out.rfind("refuted    claim  claimed O(n lg n) · derived Theta(n lg^2 n) by master "
                        "theorem, case 2",
                        0),
            0u)
      << r.out;
  EXPECT_NE(r.out.find(" · witness n = "), std::string::npos) << r.out;
  EXPECT_NE(r.out.find(": T(n)/g(n) = "), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("\n1 claim: 0 holds, 1 refuted, 0 undecided, 0 errors\n"), std::string::npos)
      << r.out;
  EXPECT_EQ(r.out.find("ratio band"), std::string::npos) << r.out;  // brief: no detail

  CommandResult holds =
      tg("check --recurrence 'T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0' "
         "--bound 'Theta(n lg n)' --name 'orchard::stable_sort'");
  EXPECT_EQ(holds.status, 0) << holds.out;
  EXPECT_EQ(holds.out,
            "holds      orchard::stable_sort  claimed Theta(n lg n) · derived Theta(n lg n) by "
            "master theorem, case 2 · proof: master theorem, case 2\n"
            "1 claim: 1 holds, 0 refuted, 0 undecided, 0 errors\n");
}

TEST(ReviewCli, EveryFormatAndExitCodeOfAFileRunApplies) {
  CommandResult json =
      tg("check --recurrence 'T(n) = 2T(n/2) + n; T(1) = 0' --bound 'O(n)' --format json "
         "--clock-limit 0");
  EXPECT_EQ(json.status, 1);
  auto j = nlohmann::json::parse(json.out);
  ASSERT_EQ(j["claims"].size(), 1u);
  EXPECT_EQ(j["claims"][0]["name"], "claim");
  EXPECT_EQ(j["claims"][0]["verdict"], "refuted");
  CommandResult text =
      tg("check --recurrence 'T(n) = 2T(n/2) + n; T(1) = 0' --bound 'O(n)' "
         "--format text");
  EXPECT_NE(text.out.find("seed 1"), std::string::npos) << text.out;  // the full report
}

TEST(ReviewCli, MistakesAreUsageErrors) {
  CommandResult alone = tg("check --recurrence 'T(n) = T(n/2) + 1'");
  EXPECT_EQ(alone.status, 2);
  EXPECT_NE(alone.out.find("--recurrence and --bound go together"), std::string::npos);
  CommandResult both = tg("check claims --recurrence 'T(n) = T(n/2) + 1' --bound 'O(lg n)'");
  EXPECT_EQ(both.status, 2);
  EXPECT_NE(both.out.find("checked alone"), std::string::npos) << both.out;
  CommandResult bad = tg("check --recurrence 'T(n) = T(n/2) + 1' --bound 'Theta(lg n'");
  EXPECT_EQ(bad.status, 2);
  EXPECT_NE(bad.out.find("<bound>:1:"), std::string::npos) << bad.out;
  CommandResult brief_json =
      tg("check --recurrence 'T(n) = T(n/2) + 1' --bound 'O(lg n)' --brief "
         "--format json");
  EXPECT_EQ(brief_json.status, 2) << brief_json.out;
}

TEST(ReviewCli, AClaimFileOnStandardInput) {
  CommandResult r = run_shell(
      "printf '[[claim]]\\nname = \"orchard::find_sorted\"\\nrecurrence = \"T(n) = T(n/2) + 1; "
      "T(1) = 1\"\\nbound = \"Theta(lg n)\"\\n' | '" +
      std::string(THETAGATE_BINARY) + "' check - --brief");
  EXPECT_EQ(r.status, 0) << r.out;
  EXPECT_EQ(r.out.rfind("holds      orchard::find_sorted  claimed Theta(lg n)", 0), 0u) << r.out;
  // Errors are located in <stdin>.
  CommandResult bad = run_shell("printf '[[claim]]\\nname = 1\\n' | '" +
                                std::string(THETAGATE_BINARY) + "' check -");
  EXPECT_EQ(bad.status, 2) << bad.out;
  EXPECT_NE(bad.out.find("<stdin>:2:"), std::string::npos) << bad.out;
}

TEST(ReviewCli, VersionPrintsTheLibrarysVersion) {
  CommandResult r = tg("--version");
  EXPECT_EQ(r.status, 0);
  EXPECT_EQ(r.out, std::string("thetagate ") + THETAGATE_VERSION_STRING + "\n");
}

}  // namespace
