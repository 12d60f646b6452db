// The re-checker's rules for proofs over a sum of earlier values (issue
// 19): certificates of the methods sum-difference and sum-step, written by
// hand and as the prover writes them, are re-checked when true; mutants (a
// wrong coefficient, a closed form that agrees only up to M, M below the
// line's start, a constant too small, a weight that turns negative) are
// rejected or not re-checked, never re-checked.
#include <gtest/gtest.h>

#include <algorithm>
#include <map>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "reports/json_report.h"
#include "tests/support/recheck_rule_test.h"
#include "verifier/checking/checker.h"
#include "verifier/model/bound.h"
#include "verifier/model/claim.h"
#include "verifier/model/recurrence.h"
#include "verifier/recheck/recheck.h"
#include "verifier/recheck/rules.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine::recheck {
namespace {

// The certificate against the claim written as text.
constexpr auto* run = &test_support::run_rule;

CertificateData over_sums(const std::string& method, const std::string& hypothesis,
                          const std::string& m, const std::string& modulus = "1") {
  CertificateData c;
  c.method = method;
  c.proof = "induction";
  c.sides = {"upper"};
  c.hypothesis = hypothesis;
  c.checked_to = m;
  c.modulus = modulus;
  return c;
}

// --- sum-difference -------------------------------------------------------

const char* kQuickSort = "C(n) = n - 1 + (2/n) sum(k, 0, n - 1, C(k))\nC(0) = 0";
// D. E. Knuth, The Art of Computer Programming, vol. 3, §5.2.2: quicksort's
// average comparisons are 2(n + 1)H_n - 4n.
const char* kKnuth = "C(n) = 2(n + 1) sum(j, 1, n, 1/j) - 4n for n >= 0";

CertificateData differenced(const std::string& closed, const std::string& m) {
  return over_sums("sum-difference", "= " + closed, m);
}

TEST(RecheckSumDifference, QuickSortsAverageIsAnIdentity) {
  EXPECT_RECHECKED(run(kQuickSort, kKnuth, differenced("2(n + 1) sum(j, 1, n, 1/j) - 4n", "2")));
  // Any M from the line's start on: the exact range grows, the step is the same.
  EXPECT_RECHECKED(run(kQuickSort, kKnuth, differenced("2(n + 1) sum(j, 1, n, 1/j) - 4n", "40")));
  // One side of the closed form is carried by the closed form itself.
  EXPECT_RECHECKED(run(kQuickSort, "C(n) <= 2(n + 1) sum(j, 1, n, 1/j) - 4n for n >= 0",
                       differenced("2(n + 1) sum(j, 1, n, 1/j) - 4n", "2")));
}

TEST(RecheckSumDifference, OtherWeightsSumsFromTwoAndCaseLines) {
  // From memory: selecting the smallest key by random pivots averages
  // 2(n - H_n) comparisons.
  EXPECT_RECHECKED(run("C(n) = n - 1 + (1/n) sum(k, 0, n - 1, C(k))\nC(0) = 0",
                       "C(n) = 2n - 2 sum(j, 1, n, 1/j) for n >= 0",
                       differenced("2n - 2 sum(j, 1, n, 1/j)", "2")));
  // Knuth, TAOCP vol. 3, §6.2.2: the total depth of a random search tree is
  // 2(n + 1)H_n - 3n, here with the sum starting at 2 and a case line.
  const char* depth = "D(n) = n + (2/n) sum(k, 0, n - 1, D(k)) if n >= 1\nD(n) = 0 otherwise";
  EXPECT_RECHECKED(run(depth, "D(n) = 2(n + 1)(1 + sum(i, 2, n, 1/i)) - 3n for n >= 1",
                       differenced("2(n + 1)(1 + sum(i, 2, n, 1/i)) - 3n", "3")));
  // The sum's upper limit n - 1 and n + 1 as well as n: H_(n-1) + 1/n = H_n.
  EXPECT_RECHECKED(run(kQuickSort,
                       "C(n) = 2(n + 1) sum(j, 1, n - 1, 1/j) + 2(n + 1)/n - 4n for n >= 1",
                       differenced("2(n + 1) sum(j, 1, n - 1, 1/j) + 2(n + 1)/n - 4n", "2")));
  EXPECT_RECHECKED(run(kQuickSort, "C(n) = 2(n + 1) sum(j, 1, n + 1, 1/j) - 2 - 4n for n >= 0",
                       differenced("2(n + 1) sum(j, 1, n + 1, 1/j) - 2 - 4n", "2")));
}

TEST(RecheckSumDifference, WrongClosedFormsAreRejectedWithTheirNumbers) {
  // A wrong constant and a wrong coefficient fail in the exact range.
  EXPECT_REJECTED(run(kQuickSort, "C(n) = 2(n + 1) sum(j, 1, n, 1/j) - 4n + 1 for n >= 0",
                      differenced("2(n + 1) sum(j, 1, n, 1/j) - 4n + 1", "2")),
                  "fails at n = 0");
  EXPECT_REJECTED(run(kQuickSort, "C(n) = 2(n + 2) sum(j, 1, n, 1/j) - 4n for n >= 0",
                      differenced("2(n + 2) sum(j, 1, n, 1/j) - 4n", "2")),
                  "fails at n = 1");
  // Equal to the true form for n <= 3 only: the step's identity fails, and
  // n = 4 differs.
  const char* near =
      "C(n) = 2(n + 1) sum(j, 1, n, 1/j) - 4n + n(n - 1)(n - 2)(n - 3)/1000 for n >= 0";
  EXPECT_REJECTED(run(kQuickSort, near, differenced("x", "3")), "fails at n = 4");
  // The same one-sided: the closed form is what the step carries.
  EXPECT_REJECTED(
      run(kQuickSort,
          "C(n) <= 2(n + 1) sum(j, 1, n, 1/j) - 4n + n(n - 1)(n - 2)(n - 3)/1000 for n >= 0",
          differenced("x", "3")),
      "fails at n = 4");
}

TEST(RecheckSumDifference, ARangeThatEndsBeforeTheLineAppliesIsRejected) {
  // At M = 0 the step n = 1 would use the line at n - 1 = 0, where C(0) = 0
  // applies instead.
  EXPECT_REJECTED(run(kQuickSort, kKnuth, differenced("2(n + 1) sum(j, 1, n, 1/j) - 4n", "0")),
                  "point case C(0)");
  // The sum over earlier values from k = 5: at M = 3 the sum at n - 1 is
  // no plain range, and U(n) = U(n - 1) + C(n - 1) fails.
  EXPECT_REJECTED(run("C(n) = n - 1 + (2/n) sum(k, 5, n - 1, C(k))", "C(n) = n - 1 for n >= 1",
                      differenced("n - 1", "3")),
                  "past M");
}

TEST(RecheckSumDifference, ADivisorWithAWholeRootPastMIsRejected) {
  // Knuth's closed form plus (n - 10)/(n - 10) - 1: the same values and the
  // same identity, except that it divides by zero at n = 10.
  const char* holed = "2(n + 1) sum(j, 1, n, 1/j) - 4n + (n - 10)/(n - 10) - 1";
  EXPECT_REJECTED(
      run(kQuickSort, std::string("C(n) = ") + holed + " for n >= 0", differenced(holed, "2")),
      "vanishes at n = 10");
}

TEST(RecheckSumDifference, ShapesBeyondTheRuleAreNotReChecked) {
  // A product that would grow past the algebra's limits.
  EXPECT_NOT_RECHECKED(run(kQuickSort, "C(n) = ((n + 1)^64)^64 for n >= 0", differenced("x", "2")),
                       "grows past");
  // lg n is no rational function of n and closed sums.
  EXPECT_NOT_RECHECKED(run(kQuickSort, "C(n) = 2 n lg(n) for n >= 1", differenced("x", "2")),
                       "no rational function");
  // A sum over T that does not end at n - 1.
  EXPECT_NOT_RECHECKED(run("C(n) = n - 1 + (2/n) sum(k, floor(n/2), n - 1, C(k)) if n >= 2\n"
                           "C(n) = 0 otherwise",
                           "C(n) = n for n >= 0", differenced("n", "4")),
                       "a sum other than");
  // An asymptotic bound.
  EXPECT_NOT_RECHECKED(run(kQuickSort, "Theta(n lg n)", differenced("x", "2")), "asymptotic");
}

// --- sum-step -------------------------------------------------------------

const char* kLargerSide =
    "T(n) = n - 1 + (2/n) sum(k, floor(n/2), n - 1, T(k)) if n >= 2\nT(n) = 0 otherwise";

TEST(RecheckSumStep, LargerSideOfSelectIsAtMostFourN) {
  // Common practice: always continuing in the larger part costs at most 4n
  // comparisons; per parity the slack is 3 (n even) or 3 + ... (n odd).
  EXPECT_RECHECKED(
      run(kLargerSide, "T(n) <= 4n for n >= 0", over_sums("sum-step", "<= 4n", "64", "2")));
  EXPECT_RECHECKED(
      run(kLargerSide, "T(n) <= 4n for n >= 0", over_sums("sum-step", "<= 4n", "128", "4")));
  // The lower side: T(n) >= n - 1 from n = 1 (the line's own n - 1).
  CertificateData lower = over_sums("sum-step", ">= n - 1", "64", "2");
  lower.sides = {"lower"};
  EXPECT_RECHECKED(run(kLargerSide, "T(n) >= n - 1 for n >= 1", lower));
  // Both sides at once.
  EXPECT_RECHECKED(run(kLargerSide, "n - 1 <= T(n) <= 4n for n >= 1",
                       over_sums("sum-step", ">= n - 1 and <= 4n", "64", "2")));
}

TEST(RecheckSumStep, TooSmallAConstantIsRejectedInTheStep) {
  // T(n)/n tends to 4 (from memory: 4n - T(n) is about 58 at n = 3000), so
  // 3.9n holds up to 64 but its slack 3.9n - (n - 1) - (2/n) sum 3.9k ~
  // -n/40 is negative.
  EXPECT_REJECTED(
      run(kLargerSide, "T(n) <= 39n/10 for n >= 0", over_sums("sum-step", "<= 39n/10", "64", "2")),
      "step");
  // 3n already fails in the exact range.
  EXPECT_REJECTED(
      run(kLargerSide, "T(n) <= 3n for n >= 0", over_sums("sum-step", "<= 3n", "64", "2")),
      "fails at n = ");
}

TEST(RecheckSumStep, ALimitsModulusOrRangeTheCertificateGetsWrongIsRejected) {
  // floor(n/2) is not affine on all n: modulus 1 is too small.
  EXPECT_REJECTED(
      run(kLargerSide, "T(n) <= 4n for n >= 0", over_sums("sum-step", "<= 4n", "64", "1")),
      "not exact modulo 1");
  // From n0 = 40 the sum reaches floor(65/2) = 32 < 40, outside the bound.
  EXPECT_REJECTED(
      run(kLargerSide, "T(n) <= 4n for n >= 40", over_sums("sum-step", "<= 4n", "64", "2")),
      "40 <= floor(n/2) fails at n = 66: lo = 33");
  // M = 0: the step from n = 1 needs the line at n = 1, where T(n) = 0
  // applies instead; the rule cannot decide one line from n = 1 on.
  RuleOutcome low =
      run(kLargerSide, "T(n) <= 4n for n >= 0", over_sums("sum-step", "<= 4n", "0", "2"));
  EXPECT_NE(low.status, RuleStatus::kRechecked) << low.detail;
}

TEST(RecheckSumStep, AWeightThatTurnsNegativeIsRejected) {
  // W(n) = (2 - n/1000)/n < 0 for n > 2000: the sum's bound cannot be
  // carried through it, even though T <= 4n may still be true.
  EXPECT_REJECTED(run("T(n) = n - 1 + ((2 - n/1000)/n) sum(k, floor(n/2), n - 1, T(k)) if n >= 2\n"
                      "T(n) = 0 otherwise",
                      "T(n) <= 4n for n >= 0", over_sums("sum-step", "<= 4n", "64", "2")),
                  "W(n)");
}

TEST(RecheckSumStep, ABoundThatIsNoPolynomialIsNotReChecked) {
  EXPECT_NOT_RECHECKED(run(kLargerSide, "T(n) <= 4n + lg(n + 1) for n >= 0",
                           over_sums("sum-step", "<= 4n + lg(n + 1)", "64", "2")),
                       "not a polynomial");
}

// --- As the prover writes them --------------------------------------------

// The named claims checked by the prover: its JSON report and the claims
// by name, for the re-checker.
struct Proved {
  nlohmann::json report;
  std::multimap<std::string, Claim> table;
};

Proved prove(const std::vector<ClaimEntry>& entries, const std::vector<std::string>& names) {
  Proved out;
  RunResult run;
  CheckOptions options;
  options.seed = 5;
  for (const ClaimEntry& e : entries) {
    if (!e.claim || std::find(names.begin(), names.end(), e.name) == names.end()) continue;
    out.table.emplace(e.name, *e.claim);
    ClaimResult r = check_claim(*e.claim, options);
    EXPECT_EQ(r.verdict, Verdict::kHolds) << e.name;
    run.claims.push_back(r);
  }
  out.report = nlohmann::json::parse(render_json(run));
  return out;
}

// The re-checker's answers by claim name.
std::map<std::string, RecheckedClaim> recheck(const nlohmann::json& report,
                                              const std::multimap<std::string, Claim>& table) {
  std::map<std::string, RecheckedClaim> out;
  for (const RecheckedClaim& c : recheck_report(report.dump(), "sums.json", table).claims)
    out[c.name] = c;
  return out;
}

TEST(RecheckSumProofs, TheDemoSumClaimsAreReCheckedAndDoctoredCopiesAreNot) {
  std::string path = std::string(THETAGATE_SOURCE_DIR) + "/claims/average.toml";
  const std::vector<std::string> names = {
      "orchard::quick_sort / comparisons, average, exact",
      "orchard::ordered_map / total key depth, random insertion order",
      "orchard::select / comparisons, larger side"};
  Proved proved = prove(load_claim_file(path), names);
  auto out = recheck(proved.report, proved.table);
  ASSERT_EQ(out.size(), names.size());
  for (const std::string& name : names)
    EXPECT_EQ(out[name].status, RuleStatus::kRechecked) << name << ": " << out[name].detail;
  // The same report with M moved to 0 (below where the line applies) and
  // select's modulus 1 (too small for floor(n/2)).
  nlohmann::json doctored = proved.report;
  for (nlohmann::json& c : doctored["claims"]) {
    nlohmann::json& induction = c["basis"]["induction"];
    if (c["basis"]["certificate"]["method"] == "sum-difference") induction["checked_to"] = "0";
    if (c["basis"]["certificate"]["method"] == "sum-step") induction["modulus"] = 1;
  }
  out = recheck(doctored, proved.table);
  ASSERT_EQ(out.size(), names.size());
  EXPECT_EQ(out[names[0]].status, RuleStatus::kRejected) << out[names[0]].detail;
  EXPECT_NE(out[names[0]].detail.find("point case C(0)"), std::string::npos)
      << out[names[0]].detail;
  EXPECT_EQ(out[names[1]].status, RuleStatus::kRejected) << out[names[1]].detail;
  EXPECT_EQ(out[names[2]].status, RuleStatus::kRejected) << out[names[2]].detail;
  EXPECT_NE(out[names[2]].detail.find("not exact modulo 1"), std::string::npos)
      << out[names[2]].detail;
}

TEST(RecheckSumProofs, TheProversOtherSumHoldsAreReChecked) {
  // tests/sum_induction_test.cc's closed forms and bounds (the sources are
  // named there).
  std::string toml;
  int i = 0;
  for (auto [recurrence, bound] : std::vector<std::pair<const char*, const char*>>{
           {"C(n) = n - 1 + (1/n) sum(k, 0, n - 1, C(k))\nC(0) = 0",
            "C(n) = 2n - 2 sum(j, 1, n, 1/j) for n >= 0"},
           {"D(n) = n + (2/n) sum(k, 0, n - 1, D(k)) if n >= 1\nD(n) = 0 otherwise",
            "D(n) = 2(n + 1)(1 + sum(i, 2, n, 1/i)) - 3n for n >= 1"},
           {kLargerSide, "T(n) >= n - 1 for n >= 1"}})
    toml += "[[claim]]\nname = \"orchard::sums " + std::to_string(i++) +
            "\"\nrecurrence = \"\"\"\n" + recurrence + "\n\"\"\"\nbound = \"" + bound + "\"\n\n";
  Proved proved = prove(load_claim_text(toml, "sums.toml"),
                        {"orchard::sums 0", "orchard::sums 1", "orchard::sums 2"});
  auto out = recheck(proved.report, proved.table);
  ASSERT_EQ(out.size(), 3u);
  for (const auto& [name, c] : out)
    EXPECT_EQ(c.status, RuleStatus::kRechecked) << name << ": " << c.detail;
}

}  // namespace
}  // namespace thetagate::engine::recheck
