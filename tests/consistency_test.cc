// The cross-check between a derived Θ and the exact values (issue
// "Hardening, second round", case 15): a correct Θ(g) with floors lets
// T(n)/g(n) step by a recursion level's factor, which is no inconsistency;
// a real one is a bug and is reported as one.
#include <gtest/gtest.h>

#include "verifier/checking/checker.h"
#include "verifier/model/claim.h"

namespace thetagate::engine {
namespace {

ClaimResult check_text(const std::string& toml, uint64_t max_bits) {
  std::vector<ClaimEntry> entries = load_claim_text(toml, "consistency.toml");
  EXPECT_EQ(entries.size(), 1u);
  CheckOptions options;
  options.max_bits = max_bits;
  return check_entry(entries.front(), options);
}

TEST(Consistency, ALevelStepOfARootRecurrenceIsNoInconsistency) {
  // T(n) = 7 T(floor(sqrt(n))) + 3 is Θ(lg^(lg 7) n) (change of variables,
  // then the master theorem's case 1; common practice). Up to 16 bits the
  // recursion depth moves only where lg n doubles, so T(n)/g(n) falls by up
  // to a factor 7 between two steps: that looked like a falling edge.
  for (uint64_t bits : {8, 16, 32}) {
    SCOPED_TRACE(bits);
    ClaimResult r = check_text(
        "[[claim]]\nname = \"orchard::vantage / probes\"\n"
        "recurrence = \"T(n) = 7T(floor(sqrt(n))) + 3; T(1) = 1\"\nbound = \"Omega(1)\"\n",
        bits);
    EXPECT_EQ(r.verdict, Verdict::kHolds) << r.internal_error;
    EXPECT_NE(r.basis.kind, BasisKind::kInternalInconsistency);
    EXPECT_EQ(r.derived, "Theta(lg^(lg 7) n)");
  }
}

TEST(Consistency, AHugeCoefficientStepsTheRatioByItself) {
  // 10^40 T(n/2): between n = 2^k - 1 and 2^k the level count changes by
  // one, and T(n)/n^(lg 10^40) by up to 10^40 (133 bits) with it.
  ClaimResult r = check_text(
      "[[claim]]\nname = \"orchard::fanout\"\n"
      "recurrence = \"T(n) = 10^40 T(n/2) + n; T(1) = 1\"\n"
      "bound = \"Theta(n^(lg(10^40)))\"\n",
      64);
  EXPECT_EQ(r.verdict, Verdict::kHolds) << r.internal_error;
  EXPECT_EQ(r.basis.kind, BasisKind::kDerivationAgrees);
}

TEST(Consistency, ASlowlyConvergingRatioIsNoInconsistency) {
  // T(n) = T(n/2) + T(n/3) + T(n/7) + n: 1/2 + 1/3 + 1/7 < 1, so Θ(n)
  // (Akra–Bazzi with p < 1; common practice), with T(n)/n climbing towards
  // 1/(1 - 1/2 - 1/3 - 1/7) = 42 from below. With little memory only small
  // scales are seen, where the climb looked like a trend.
  std::vector<ClaimEntry> entries = load_claim_text(
      "[[claim]]\nname = \"orchard::split3\"\n"
      "recurrence = \"T(n) = T(n/2) + T(n/3) + T(n/7) + n; T(n) = 1 for n < 7\"\n"
      "bound = \"Theta(n)\"\n",
      "consistency.toml");
  ASSERT_EQ(entries.size(), 1u);
  for (uint64_t memo_bytes : {uint64_t{1} << 20, uint64_t{4} << 20, uint64_t{512} << 20}) {
    SCOPED_TRACE(memo_bytes);
    CheckOptions options;
    options.budget.max_memo_bytes = memo_bytes;
    ClaimResult r = check_entry(entries.front(), options);
    EXPECT_EQ(r.verdict, Verdict::kHolds) << r.internal_error;
  }
}

TEST(TrendReading, TheLastPartlySearchedScaleCountsForAnEscape) {
  // Catalan numbers, C(n) = sum C(k) C(n-1-k), grow like 4^n / n^(3/2)
  // (from memory; common practice): O(3.5^n) is false. The ladder holds a
  // certified rung at c = 10^6 (n = 166), in the scale where the search
  // stopped; without that scale the band "only" rose 10^5 and the claim
  // stayed undecided.
  std::vector<ClaimEntry> entries = load_claim_text(
      "[[claim]]\nname = \"orchard::shapes / count\"\n"
      "recurrence = \"T(n) = sum(k, 0, n - 1, T(k) T(n - 1 - k)); T(0) = 1\"\n"
      "bound = \"O(3.5^n)\"\n",
      "catalan.toml");
  ASSERT_EQ(entries.size(), 1u);
  ClaimResult r = check_entry(entries.front(), CheckOptions{});
  EXPECT_EQ(r.verdict, Verdict::kRefuted);
  EXPECT_EQ(r.basis.kind, BasisKind::kNumericTrend);
  ASSERT_FALSE(r.witnesses.empty());
  EXPECT_EQ(r.witnesses.back().factor, "1000000");
}

}  // namespace
}  // namespace thetagate::engine
