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

}  // namespace
}  // namespace thetagate::engine
