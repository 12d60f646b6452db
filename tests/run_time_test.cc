// Reports a person reads in the morning (issue 18, §4) say when the run
// started and how long each claim took (JSON, JUnit, text), unless the run
// is reproducible (SOURCE_DATE_EPOCH, common practice for reproducible
// builds): then the start is that time and every wall time is 0, and the
// same claims and seed give the same bytes.
#include <gtest/gtest.h>

#include <cstdlib>
#include <nlohmann/json.hpp>
#include <regex>
#include <string>

#include "tests/support/test_support.h"
#include "verifier/checking/run.h"

namespace {

// Every test in this binary, and every thetagate it starts, writes its
// reports as a reproducible run, so that reports compare byte for byte.
// The tests of the timing itself unset it for their own commands.
constexpr const char* kTestEpoch = "1780000000";  // 2026-05-28T20:26:40Z
const bool kReproducible = [] {
  ::setenv("SOURCE_DATE_EPOCH", kTestEpoch, /*overwrite=*/0);
  return true;
}();

using thetagate::engine::test_support::CommandResult;
using thetagate::engine::test_support::run_shell;

std::string tg(const std::string& environment, const std::string& args) {
  return std::string("cd '") + THETAGATE_SOURCE_DIR + "' && " + environment + " '" +
         THETAGATE_BINARY + "' " + args;
}

const char* kClaim =
    "check --recurrence 'T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0' "
    "--bound 'Theta(n lg n)' --name 'orchard::merge_rows / comparisons' ";

TEST(RunTime, AReportSaysWhenTheRunStartedAndHowLongEachClaimTook) {
  CommandResult r =
      run_shell(tg("env -u SOURCE_DATE_EPOCH", std::string(kClaim) + "--format json"));
  ASSERT_EQ(r.status, 0) << r.out;
  nlohmann::json j = nlohmann::json::parse(r.out);
  std::string started = j["started"];
  EXPECT_TRUE(std::regex_match(started, std::regex(R"(20\d\d-\d\d-\d\dT\d\d:\d\d:\d\dZ)")))
      << started;
  EXPECT_NE(started, "2026-05-28T20:26:40Z");  // not the reproducible time
  double seconds = j["claims"][0]["seconds"];
  EXPECT_GT(seconds, 0.0);
  EXPECT_LT(seconds, 600.0);

  CommandResult junit =
      run_shell(tg("env -u SOURCE_DATE_EPOCH", std::string(kClaim) + "--format junit"));
  EXPECT_TRUE(std::regex_search(junit.out, std::regex(R"(<testcase [^>]*time="\d+\.\d{3}")")))
      << junit.out;
  EXPECT_TRUE(std::regex_search(junit.out, std::regex(R"(timestamp="20\d\d-\d\d-\d\dT)")))
      << junit.out;

  CommandResult text =
      run_shell(tg("env -u SOURCE_DATE_EPOCH", std::string(kClaim) + "--format text"));
  EXPECT_TRUE(std::regex_search(text.out, std::regex(R"(\d\d:\d\d UTC)"))) << text.out;
}

TEST(RunTime, TheTestBinaryRunsReproducibly) {
  ASSERT_TRUE(kReproducible);
  // Set before main, so also in every command a test starts.
  const char* epoch = std::getenv("SOURCE_DATE_EPOCH");
  ASSERT_NE(epoch, nullptr);
  EXPECT_STREQ(epoch, kTestEpoch);
  ASSERT_TRUE(thetagate::engine::reproducible_epoch().has_value());
  EXPECT_EQ(thetagate::engine::utc_text(*thetagate::engine::reproducible_epoch()),
            "2026-05-28T20:26:40Z");
  CommandResult r = run_shell(tg("", std::string(kClaim) + "--format json"));
  ASSERT_EQ(r.status, 0) << r.out;
  nlohmann::json j = nlohmann::json::parse(r.out);
  EXPECT_EQ(j["started"], "2026-05-28T20:26:40Z");
  EXPECT_EQ(j["claims"][0]["seconds"], 0.0);
}

TEST(RunTime, AReproducibleRunGivesTheSameBytes) {
  std::string env = "SOURCE_DATE_EPOCH=0";
  CommandResult a = run_shell(tg(env, std::string(kClaim) + "--format json"));
  CommandResult b = run_shell(tg(env, std::string(kClaim) + "--format json"));
  ASSERT_EQ(a.status, 0) << a.out;
  EXPECT_EQ(a.out, b.out);
  nlohmann::json j = nlohmann::json::parse(a.out);
  EXPECT_EQ(j["started"], "1970-01-01T00:00:00Z");
  EXPECT_EQ(j["claims"][0]["seconds"], 0.0);
}

}  // namespace
