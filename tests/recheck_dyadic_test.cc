// The re-checker's rule for induction on dyadic blocks (issue 19): exact
// closed forms with floors and ceilings of lg n are re-proved from the claim
// and the certificate's numbers, and mutants (a form off at one parity or
// past the exact range, an M too small, a hypothesis that is not the claim,
// a call that does not halve n, a plain lg n) are rejected or not
// re-checked, never re-checked.
#include <gtest/gtest.h>

#include <string>

#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"
#include "verifier/recheck/rules.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine::recheck {
namespace {

const char* kBinarySearch = "T(n) = T(floor(n/2)) + 1; T(1) = 1";
const char* kMergeSort = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0";

RuleOutcome run(const std::string& recurrence, const std::string& bound, const CertificateData& c) {
  auto r = recurrence_from_text(recurrence);
  Bound b = parse_bound(SourceText::whole("<bound>", bound));
  return check_certificate(*r, b, c);
}

// The certificate the prover writes for an exact claim: the exact range
// [from, to] (to = 2^(k0+1) - 1) and the hypothesis "= B".
CertificateData dyadic(const std::string& hypothesis, const std::string& to,
                       const std::string& from = "1", const std::string& closed_form = "") {
  CertificateData c;
  c.method = "dyadic-induction";
  c.proof = "induction on dyadic blocks";
  c.sides = {"upper", "lower"};
  c.hypothesis = hypothesis;
  c.checked_from = from;
  c.checked_to = to;
  c.closed_form = closed_form;
  return c;
}

// An exact claim T(n) = B(n) for n >= n0 with the certificate the prover
// writes for it (the exact range from n0 to M).
RuleOutcome exact(const std::string& recurrence, const std::string& form, const std::string& m,
                  const std::string& n0 = "1") {
  return run(recurrence, "T(n) = " + form + " for n >= " + n0, dyadic("= " + form, m, n0));
}

#define EXPECT_STATUS(outcome, status_, fragment)                        \
  do {                                                                   \
    RuleOutcome o_ = (outcome);                                          \
    EXPECT_EQ(o_.status, status_) << o_.detail;                          \
    EXPECT_NE(o_.detail.find(fragment), std::string::npos) << o_.detail; \
  } while (0)

TEST(RecheckDyadic, BinarySearchProbesAreFloorLgPlusOne) {
  // Binary search over n keys probes floor(lg n) + 1 times in the worst case
  // (docs/sources.md: from memory; calc).
  RuleOutcome o = exact(kBinarySearch, "floor(lg(n)) + 1", "63");
  EXPECT_EQ(o.status, RuleStatus::kRechecked) << o.detail;
  // The exact range, then the interior and two sizes at each edge, each parity.
  EXPECT_EQ(o.obligations, 1 + 2 * (1 + 2 * 2));
}

TEST(RecheckDyadic, MergeSortWorstCaseIsSucheneksClosedForm) {
  // M. A. Suchenek, "Elementary yet precise worst-case analysis of
  // MergeSort", arXiv:1702.08443, 2017: n ceil(lg n) - 2^ceil(lg n) + 1.
  EXPECT_STATUS(exact(kMergeSort, "n*ceil(lg(n)) - 2^ceil(lg(n)) + 1", "63"),
                RuleStatus::kRechecked, "");
  // With floors: ceil(lg n) = floor(lg n) + 1 except at powers of two, where
  // both agree (common practice).
  EXPECT_STATUS(exact(kMergeSort, "n*floor(lg(n)) + n - 2^(floor(lg(n)) + 1) + 1", "63"),
                RuleStatus::kRechecked, "");
}

TEST(RecheckDyadic, CeilingsOfLgAndPowersOfTwo) {
  // From memory: ceil(lg(n + 1)) = floor(lg n) + 1 for n >= 1; halving up to
  // 1 takes ceil(lg n) steps; 2T(floor(n/2)) + 1 counts the 2^(floor(lg n)
  // + 1) - 1 nodes of a complete binary tree over n heap positions.
  EXPECT_STATUS(exact(kBinarySearch, "ceil(lg(n + 1))", "63"), RuleStatus::kRechecked, "");
  EXPECT_STATUS(exact("T(n) = T(ceil(n/2)) + 1; T(1) = 0", "ceil(lg(n))", "63"),
                RuleStatus::kRechecked, "");
  EXPECT_STATUS(exact("T(n) = 2T(floor(n/2)) + 1; T(1) = 1", "2^(floor(lg(n)) + 1) - 1", "63"),
                RuleStatus::kRechecked, "");
  // The exact range starts at the claim's n0 (the certificate's start is
  // later: the claim's own start is used).
  EXPECT_STATUS(exact(kBinarySearch, "floor(lg(n)) + 1", "255", "100"), RuleStatus::kRechecked, "");
}

TEST(RecheckDyadic, LinearDriversAndBothReadingsOfTheQuotient) {
  // a W(n) + (a + b + c) n - (a + b), W merge sort's worst case (Suchenek,
  // above), solves T(ceil(n/2)) + T(floor(n/2)) + a n + b, T(1) = c (calc).
  for (int a : {1, 3}) {
    for (int b : {-1, 2}) {
      for (int c : {0, 5}) {
        std::string rec = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + " + std::to_string(a) + "n + (" +
                          std::to_string(b) + "); T(1) = " + std::to_string(c);
        std::string form = std::to_string(a) + "*(n*ceil(lg(n)) - 2^ceil(lg(n)) + 1) + " +
                           std::to_string(a + b + c) + "*n - " + std::to_string(a + b);
        SCOPED_TRACE(rec);
        EXPECT_STATUS(run(rec, "T(n) = " + form + " for n >= 1", dyadic("= " + form, "63")),
                      RuleStatus::kRechecked, "");
        // One more everywhere: the exact range says so at n = 1.
        EXPECT_STATUS(
            run(rec, "T(n) = " + form + " + 1 for n >= 1", dyadic("= " + form + " + 1", "63")),
            RuleStatus::kRejected, "fails at n = 1");
      }
    }
  }
  // T(n/2) reads floor(n/2) inside T(...).
  EXPECT_STATUS(exact("T(n) = T(n/2) + 1; T(1) = 1", "floor(lg(n)) + 1", "63"),
                RuleStatus::kRechecked, "");
}

TEST(RecheckDyadic, AFormOffByOneAtOneParityIsRejected) {
  // One more at every n: the exact range fails at once.
  EXPECT_STATUS(exact(kMergeSort, "n*ceil(lg(n)) - 2^ceil(lg(n)) + 2", "63"), RuleStatus::kRejected,
                "fails at n = 1: T(n) = 0");
  // floor(lg n) + 1 for even n, floor(lg n) + 2 for odd n.
  EXPECT_STATUS(exact(kBinarySearch, "floor(lg(n)) + 1 + n - 2*floor(n/2)", "63"),
                RuleStatus::kRejected, "fails at n = 1: T(n) = 1");
  // The same only for odd n from 65 on (the product vanishes for
  // floor(lg n) <= 5): a parity is no polynomial in m at the calls' sizes,
  // so the rule cannot follow it; it never re-checks it.
  std::string product =
      "floor(lg(n))*(floor(lg(n)) - 1)*(floor(lg(n)) - 2)*(floor(lg(n)) - 3)*"
      "(floor(lg(n)) - 4)*(floor(lg(n)) - 5)";
  std::string odd = "floor(lg(n)) + 1 + (n - 2*floor(n/2))*" + product;
  EXPECT_STATUS(run(kBinarySearch, "T(n) = " + odd + " for n >= 1", dyadic("= " + odd, "63")),
                RuleStatus::kNotRechecked, "not affine in n");
  // Off only past the exact range, at every n from 65 on that is not a power
  // of two: the step finds it and names a size where it fails.
  std::string late = "floor(lg(n)) + 1 + (ceil(lg(n)) - floor(lg(n)))*" + product;
  RuleOutcome o = run(kBinarySearch, "T(n) = " + late + " for n >= 1", dyadic("= " + late, "63"));
  EXPECT_EQ(o.status, RuleStatus::kRejected) << o.detail;
  EXPECT_NE(o.detail.find("step: B(n) - (the right side of T's line with B) is"), std::string::npos)
      << o.detail;
  EXPECT_NE(o.detail.find("not 0: at n = 68 it is 720"), std::string::npos) << o.detail;
  // With the exact range past 64 the evaluator says so first.
  EXPECT_STATUS(run(kBinarySearch, "T(n) = " + late + " for n >= 1", dyadic("= " + late, "127")),
                RuleStatus::kRejected, "fails at n = 65");
}

TEST(RecheckDyadic, AnExactRangeTooShortIsRejected) {
  // The rule's pieces need, for merge sort, ceil(lg(4·2^k - 4)) = k + 2 on
  // the piece m = 2^(k+1) - 2, n = 2m: 4·2^k - 4 > 2·2^k from k = 2 on, so
  // blocks of m from 4 and M >= 7 (the prover checks to 63).
  for (const char* m : {"2", "3", "6"})
    EXPECT_STATUS(exact(kMergeSort, "n*ceil(lg(n)) - 2^ceil(lg(n)) + 1", m), RuleStatus::kRejected,
                  "M must be at least 7");
  EXPECT_STATUS(exact(kMergeSort, "n*ceil(lg(n)) - 2^ceil(lg(n)) + 1", "7"), RuleStatus::kRechecked,
                "");
  // From n0 = 100 the calls must land at sizes >= 100: m >= 2^k >= 100.
  EXPECT_STATUS(exact(kBinarySearch, "floor(lg(n)) + 1", "200", "100"), RuleStatus::kRejected,
                "M must be at least 255");
  EXPECT_STATUS(exact(kMergeSort, "n*ceil(lg(n)) - 2^ceil(lg(n)) + 1", "0"), RuleStatus::kRejected,
                "before any block");
  EXPECT_STATUS(run(kMergeSort, "T(n) = n ceil(lg n) - 2^ceil(lg n) + 1 for n >= 1",
                    dyadic("= n*ceil(lg(n)) - 2^ceil(lg(n)) + 1", "-5")),
                RuleStatus::kRejected, "is not a size");
}

TEST(RecheckDyadic, AHypothesisThatIsNotTheClaimIsRejected) {
  // The claim is true; the certificate's hypothesis is another form.
  EXPECT_STATUS(
      run(kBinarySearch, "T(n) = floor(lg n) + 1 for n >= 1", dyadic("= floor(lg(n)) + 2", "63")),
      RuleStatus::kRejected, "is not the claim's bound");
  CertificateData one_side = dyadic("<= floor(lg(n)) + 1", "63");
  one_side.sides = {"upper"};
  EXPECT_STATUS(run(kBinarySearch, "T(n) = floor(lg n) + 1 for n >= 1", one_side),
                RuleStatus::kRejected, "does not cover every side");
}

TEST(RecheckDyadic, WhatTheRuleCannotFollowIsNotReChecked) {
  // A call of T that does not halve n.
  EXPECT_STATUS(exact("T(n) = T(n - 1) + 1; T(1) = 1", "n", "63"), RuleStatus::kNotRechecked,
                "does not halve n");
  EXPECT_STATUS(exact("T(n) = T(n - 1) + T(floor(n/2)) + 1; T(1) = 1", "floor(lg(n)) + 1", "63"),
                RuleStatus::kRejected, "fails at n = 2");
  // A plain lg n is no polynomial on a piece.
  EXPECT_STATUS(exact(kMergeSort, "n*lg(n) - n + 1", "63"), RuleStatus::kRejected,
                "fails at n = 3");
  EXPECT_STATUS(exact("T(n) = 2T(n/2) + n; T(1) = 1", "n*lg(n) + n", "1"),
                RuleStatus::kNotRechecked, "lg without a floor or ceiling");
  // floor(n/4): not affine in m.
  EXPECT_STATUS(
      exact("T(n) = T(floor(n/4)) + 1; T(1) = 1; T(2) = 1; T(3) = 1", "floor(lg(n)/2) + 1", "63"),
      RuleStatus::kNotRechecked, "");
  // An exact range the small evaluator does not reach.
  EXPECT_STATUS(
      run(kBinarySearch, "T(n) = floor(lg n) + 1 for n >= 1", dyadic("= floor(lg(n)) + 1", "10^9")),
      RuleStatus::kNotRechecked, "too long");
}

// The merge-sort closed form the prover fits in n, floor(lg n) and
// 2^floor(lg n): n ceil(lg n) - 2^ceil(lg n) + 1 with ceil(lg n) = floor(lg n)
// + 1 off the powers of two (Suchenek, above; common practice).
const char* kMergeSortForm = "n*floor(lg(n)) + n - 2*2^floor(lg(n)) + 1";

// T(n) REL B for n >= n0 (REL <= or >=) against merge sort's closed form
// (or `form`), with the certificate the prover writes for it.
RuleOutcome compared(const std::string& rel, const std::string& b, const std::string& n0,
                     const std::string& form = kMergeSortForm) {
  CertificateData c = dyadic(rel + " " + b, "63", "1", form);
  c.sides = {rel == "<=" ? "upper" : "lower"};
  return run(kMergeSort, "T(n) " + rel + " " + b + " for n >= " + n0, c);
}

TEST(RecheckDyadic, MergeSortTightConstantAgainstTheClosedForm) {
  // P. Flajolet, M. Golin, "Mellin transforms and asymptotics: the mergesort
  // recurrence", 1994: the worst case is n lg n - theta n + 1 with theta
  // down to (1 + ln ln 2)/ln 2 = 0.91392866794... (calc); 0.9139286 lies
  // 6.8e-8 below it, so B - F = 2^k (x lg x - 1.9139286 x + 2) has a minimum
  // of about 1e-7 times 2^k near x = 2 ln 2.
  RuleOutcome o = compared("<=", "n*lg(n) - 0.9139286*n + 1", "10^8");
  EXPECT_EQ(o.status, RuleStatus::kRechecked) << o.detail;
  EXPECT_STATUS(compared("<=", "n*lg(n) - 0.9139286*n + 1", "1"), RuleStatus::kRechecked, "");
  // theta <= 1 (same source): both sides with room.
  EXPECT_STATUS(compared("<=", "n*lg(n) - 0.9*n + 1", "1"), RuleStatus::kRechecked, "");
  EXPECT_STATUS(compared(">=", "n*lg(n) - 1.01*n + 1", "2"), RuleStatus::kRechecked, "");
  // Bounds with room in floor(lg n) and n (the prover's own tests).
  EXPECT_STATUS(compared("<=", "n*ceil(lg(n)) - 2^ceil(lg(n)) + 1 + floor(lg(n))", "1"),
                RuleStatus::kRechecked, "");
  EXPECT_STATUS(compared(">=", "n*ceil(lg(n)) - 2^ceil(lg(n)) + 1 - n", "1"),
                RuleStatus::kRechecked, "");
}

TEST(RecheckDyadic, BoundsPastTheTruthAreNeverReChecked) {
  // 2e-9 past the least theta (Flajolet and Golin, above): false near
  // n/2^ceil(lg n) = ln 2 at every scale; the leading coefficient is not
  // positive on [1, 2], so the rule cannot follow (it does not search).
  EXPECT_STATUS(compared("<=", "n*lg(n) - 0.91392867*n + 1", "10^8"), RuleStatus::kNotRechecked,
                "could not prove B(n) - F(n) >= 0");
  // Below theta's largest value 1, reached at powers of two: false there
  // for sure (the exact range sees it first from n = 1; from n = 64 the
  // comparison at n = 2^k does).
  EXPECT_STATUS(compared(">=", "n*lg(n) - 0.999*n + 1", "1"), RuleStatus::kRejected,
                "fails at n = 1");
  EXPECT_STATUS(compared(">=", "n*lg(n) - 0.999*n + 1", "64"), RuleStatus::kRejected,
                "fails at n = 2^6");
  // One less than T at every n, on the upper side: F - 1.
  EXPECT_STATUS(compared("<=", "n*ceil(lg(n)) - 2^ceil(lg(n))", "1"), RuleStatus::kRejected,
                "fails at n = 1");
  // T's closed form must be one: a wrong one fails the exact range.
  EXPECT_STATUS(
      compared("<=", "n*lg(n) - 0.9*n + 1", "1", "n*floor(lg(n)) + n - 2*2^floor(lg(n)) + 2"),
      RuleStatus::kRejected, "fails at n = 1");
  EXPECT_STATUS(compared("<=", "n*lg(n) - 0.9*n + 1", "1", ""), RuleStatus::kRejected,
                "needs T's closed form");
}

}  // namespace
}  // namespace thetagate::engine::recheck
