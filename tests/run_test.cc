// A whole run (verifier/checking/run.h, checker.h): bad claims and bugs stay
// on their own claim, and nothing a run meets ends the process.
#include "verifier/checking/run.h"

#include <gtest/gtest.h>

#include <stdexcept>
#include <string>

#include "reports/verdict_text.h"
#include "tests/support/claim_texts.h"
#include "verifier/checking/checker.h"
#include "verifier/model/claim.h"

namespace thetagate::engine {
namespace {

const std::string kTwoClaims =
    std::string(test_support::kHeapSiftDownsClaim) + "\n" + test_support::kHeapBuildClaim;

TEST(Run, ABugInOneClaimIsReportedOnThatClaimOnly) {
  std::vector<ClaimEntry> entries = load_claim_text(kTwoClaims, "heap.toml");
  ASSERT_EQ(entries.size(), 2u);
  entries[0].internal_error = "vector::_M_range_check: __n (which is 3) >= this->size()";
  for (unsigned jobs : {1u, 2u}) {
    RunResult run = check_in_parallel(entries, CheckOptions{}, jobs, nullptr);
    ASSERT_EQ(run.claims.size(), 2u);
    EXPECT_EQ(run.claims[0].verdict, Verdict::kError);
    EXPECT_EQ(run.claims[0].internal_error, entries[0].internal_error);
    EXPECT_EQ(run.claims[0].basis.kind, BasisKind::kInternalError);
    std::string message = verdict_message(run.claims[0]);
    EXPECT_NE(message.find("bug"), std::string::npos) << message;
    EXPECT_EQ(run.claims[0].name, "orchard::heap / sift-downs");
    // The other claim is checked as usual.
    EXPECT_EQ(run.claims[1].verdict, Verdict::kHolds) << verdict_message(run.claims[1]);
    EXPECT_TRUE(run.claims[1].internal_error.empty());
  }
}

TEST(Run, AnInputErrorIsNotAnInternalError) {
  std::vector<ClaimEntry> entries = load_claim_text(
      "[[claim]]\nname = \"orchard::x\"\nrecurrence = \"T(n) = \"\nbound = \"O(n)\"\n", "x.toml");
  ASSERT_EQ(entries.size(), 1u);
  ClaimResult r = check_entry(entries[0], CheckOptions{});
  EXPECT_EQ(r.verdict, Verdict::kError);
  ASSERT_TRUE(r.error.has_value());
  EXPECT_EQ(r.error->where.line, 3);
  EXPECT_TRUE(r.internal_error.empty());
}

TEST(Run, AThrowingProgressCallbackIsRethrownNotTerminated) {
  std::vector<ClaimEntry> entries = load_claim_text(kTwoClaims, "heap.toml");
  for (unsigned jobs : {1u, 2u}) {
    auto progress = [](size_t, size_t, const std::string&) {
      throw std::logic_error("the caller's own bug");
    };
    EXPECT_THROW(check_in_parallel(entries, CheckOptions{}, jobs, progress), std::logic_error);
  }
}

TEST(Run, UnknownClaimNameSuggestsTheClosest) {
  try {
    select_names({"orchard::heap / build", "orchard::heap / sift-downs"},
                 {"orchard::heap / biuld"});
    ADD_FAILURE() << "no InputError";
  } catch (const InputError& e) {
    EXPECT_EQ(e.diagnostic().hint, "the closest name is 'orchard::heap / build'");
  }
  EXPECT_EQ(select_names({"a", "b", "a"}, {"a"}), (std::vector<size_t>{0, 2}));
}

}  // namespace
}  // namespace thetagate::engine
