// The verdict path stage by stage (verifier/checking/claim_check.h): the
// search and the proof attempt on small claims whose values are worked out
// by hand beside each check, and decide_verdict's rules on hand-built stage
// values, each rule with the one that would win were it not first.
#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "verifier/checking/claim_check.h"
#include "verifier/checking/claim_evaluation.h"
#include "verifier/checking/claim_proof.h"
#include "verifier/checking/verdict.h"
#include "verifier/checking/witness_search.h"
#include "verifier/derivation/derive.h"
#include "verifier/model/claim.h"

namespace thetagate::engine::checker_internal {
namespace {

Claim claim_from(const std::string& recurrence, const std::string& bound) {
  std::string text = "[[claim]]\nname = \"orchard::stage / test\"\nrecurrence = \"\"\"\n" +
                     recurrence + "\n\"\"\"\nbound = \"" + bound + "\"\n";
  std::vector<ClaimEntry> entries = load_claim_text(text, "stage.toml");
  EXPECT_EQ(entries.size(), 1u);
  EXPECT_TRUE(entries.at(0).claim) << (entries.at(0).error ? entries.at(0).error->message : "");
  return *entries.at(0).claim;
}

CheckOptions small_options() {
  CheckOptions options;
  options.max_bits = 64;
  options.exhaustive_limit = 200;
  return options;
}

// The stages as ClaimCheck::run runs them, kept apart to look at each.
struct Stages {
  Stages(const std::string& recurrence, const std::string& bound)
      : claim(claim_from(recurrence, bound)), eval(claim, options, counters) {
    derivation = derive(*claim.recurrence);
    SizePlan plan = claim_size_plan(claim, 64, options.exhaustive_limit, options.seed);
    eval.set_min_n(plan.min_n);
    search = search_witnesses(eval, generate_sizes(plan));
    proof = attempt_proof(eval, derivation, search);
  }
  Claim claim;
  CheckOptions options = small_options();
  ClaimResult counters;
  ClaimEvaluation eval;
  Derivation derivation;
  SearchOutcome search;
  ProofAttempt proof;
};

const char* kMergeSort = "T(n) = 2T(n/2) + n\nT(1) = 1";

TEST(WitnessSearchStage, ExplicitBreakIsShrunkToTheSmallestSize) {
  // T(1) = 1, T(2) = 2·1 + 2 = 4, T(3) = 2·1 + 3 = 5 (by hand): T(n) <= n
  // first fails at n = 2.
  Stages s(kMergeSort, "T(n) <= n for n >= 1");
  ASSERT_EQ(s.search.breaks.size(), 1u);
  EXPECT_EQ(s.search.breaks[0].n, 2);
  EXPECT_EQ(s.search.breaks[0].value, "4");
  EXPECT_EQ(s.search.breaks[0].side, Side::kUpper);
  EXPECT_TRUE(s.search.rungs.empty());
  // Nothing is attempted once the search broke the bound.
  EXPECT_FALSE(s.proof.induction);
  EXPECT_FALSE(s.proof.theorem);
}

TEST(WitnessSearchStage, AsymptoticLadderRungsAreCertifiedAndIncreasing) {
  // T(n)/n = lg n + 1 at powers of two (by hand: T(2^k) = 2^k (k + 1)), so
  // T(n) > 10 n from n = 2^10 and > 100 n only past 2^99: at 64 bits the
  // ladder certifies c = 10 and stops.
  Stages s(kMergeSort, "O(n)");
  ASSERT_EQ(s.search.rungs.size(), 1u);
  EXPECT_EQ(s.search.rungs[0].factor, "10");
  EXPECT_EQ(s.search.rungs[0].side, Side::kUpper);
  EXPECT_GE(s.search.rungs[0].n, 512);
  EXPECT_TRUE(s.search.breaks.empty());
  EXPECT_FALSE(s.search.band.empty());
  EXPECT_GT(s.counters.sizes_checked, 200u);  // every n up to the exhaustive limit
  EXPECT_LE(s.counters.largest_bits, 64u);
}

TEST(WitnessSearchStage, SizeFamiliesStopAtTheirShareOfTheWork) {
  // A work budget of 1 is spent by the first size: the families stop at the
  // next one, and the note names their share (WorkShares::kSizeFamilies).
  Claim claim = claim_from(kMergeSort, "O(n)");
  CheckOptions options = small_options();
  options.work_budget = 1;
  ClaimResult counters;
  ClaimEvaluation eval(claim, options, counters);
  SizePlan plan = claim_size_plan(claim, 64, options.exhaustive_limit, options.seed);
  SearchOutcome search = search_witnesses(eval, generate_sizes(plan));
  EXPECT_EQ(counters.sizes_checked, 1u);
  EXPECT_TRUE(search.partial_scale);
  ASSERT_FALSE(eval.notes().empty());
  EXPECT_EQ(eval.notes().front(),
            "the search stopped before n = 2: 60% of the work budget went to the size families");
}

TEST(ProofStage, TheoremContradictionIsCrossCheckedWithTheNumbers) {
  // Master theorem, case 2: Θ(n lg n) excludes O(n) (common practice).
  Stages s(kMergeSort, "O(n)");
  ASSERT_TRUE(s.proof.theorem);
  EXPECT_EQ(s.proof.theorem->agreement, Agreement::kContradicts);
  EXPECT_TRUE(s.proof.disagreement.empty()) << "exact values agree with Θ(n lg n)";
  EXPECT_FALSE(s.proof.certificate) << "a refutation carries no certificate";
}

TEST(ProofStage, AgreeingTheoremCarriesItsCertificate) {
  Stages s(kMergeSort, "Theta(n lg n)");
  ASSERT_TRUE(s.proof.theorem);
  EXPECT_EQ(s.proof.theorem->agreement, Agreement::kSame);
  EXPECT_TRUE(s.proof.certificate);
}

TEST(ProofStage, ExplicitBoundIsProvedByInduction) {
  // T(n) <= 2 n lg n + n for n >= 1 at every n: T(1) = 1 <= 1 and the step
  // 2(2(n/2) lg(n/2) + n/2) + n = 2 n lg n, at most the bound (by hand; floors
  // only lower the left side).
  Stages s(kMergeSort, "T(n) <= 2 n lg n + n for n >= 1");
  EXPECT_TRUE(s.search.breaks.empty());
  ASSERT_TRUE(s.proof.induction) << s.proof.detail;
  EXPECT_TRUE(s.proof.certificate);
  EXPECT_FALSE(s.proof.derived_outgrows_side);
  EXPECT_TRUE(s.proof.tight) << "the side has the derived class n lg n";
}

TEST(ProofStage, ASideBelowTheDerivedClassIsNotAttempted) {
  // 100 n outgrows nothing at 64 bits (T(n)/n = lg n + 1 < 65), yet Θ(n lg n)
  // lies beyond it: the bound must break further out.
  Stages s(kMergeSort, "T(n) <= 100 n for n >= 1");
  EXPECT_TRUE(s.search.breaks.empty());
  EXPECT_TRUE(s.proof.derived_outgrows_side);
  EXPECT_FALSE(s.proof.induction);
  ASSERT_TRUE(s.proof.theorem);
  EXPECT_EQ(s.proof.theorem->kind, ComparedWith::kUpperSide);
}

TEST(ProofStage, WithoutATheoremADirectBoundIsProvedByInduction) {
  // Case lines of two shapes keep every theorem out. By hand: an even n
  // costs n plus T(n/2), an odd one 1 plus the even n - 1 below it, so
  // n/2 <= T(n) <= 2n + 2 lg n + 1, and Θ(n) has a direct bound.
  Stages s("T(n) = T(n/2) + n if n even\nT(n) = T(n - 1) + 1 otherwise\nT(1) = 1", "Theta(n)");
  EXPECT_FALSE(s.proof.theorem);
  ASSERT_TRUE(s.proof.induction) << s.proof.detail;
  EXPECT_TRUE(s.proof.certificate);
}

// decide_verdict on hand-built stage values.

Bound bound_of(const std::string& text) { return parse_bound(SourceText::whole("<b>", text)); }

Witness witness(Side side, const std::string& factor) {
  Witness w;
  w.n = 1024;
  w.side = side;
  w.factor = factor;
  return w;
}

// Three samples per scale from 8 to 40, the upper edge at high_log2(scale).
std::vector<BandRow> band(double (*high_log2)(uint64_t)) {
  std::vector<BandRow> rows;
  for (uint64_t k = 8; k <= 40; ++k) {
    BandRow r;
    r.scale = k;
    r.high_log2 = high_log2(k);
    r.low_log2 = 0;
    r.samples = 3;
    rows.push_back(r);
  }
  return rows;
}

Derivation theorem_derivation() {
  Derivation d;
  d.method = "master theorem, case 2";
  d.derived = "n lg n";
  d.growth = GrowthClass{};
  return d;
}

// A search that certified one ladder rung, c = 10.
SearchOutcome one_rung() {
  SearchOutcome search;
  search.rungs.push_back(witness(Side::kUpper, "10"));
  return search;
}

TheoremEvidence evidence(Agreement a) {
  TheoremEvidence t;
  t.method = "master theorem, case 2";
  t.agreement = a;
  return t;
}

TEST(DecideVerdict, ExplicitBreakRefutesBeforeAnyProof) {
  SearchOutcome search;
  search.breaks.push_back(witness(Side::kUpper, ""));
  ProofAttempt proof;
  proof.induction = InductionProof{};  // would prove it, were the break not first
  VerdictDecision d = decide_verdict(bound_of("T(n) <= n for n >= 1"), Derivation{}, search, proof);
  EXPECT_EQ(d.verdict, Verdict::kRefuted);
  EXPECT_EQ(d.basis.kind, BasisKind::kCertifiedBreak);
  ASSERT_EQ(d.witnesses.size(), 1u);
  EXPECT_EQ(d.method, "exact evaluation") << "no theorem derived a class";
}

TEST(DecideVerdict, ExplicitOutgrownSideStaysUndecidedEvenWithAProof) {
  ProofAttempt proof;
  proof.derived_outgrows_side = true;
  proof.theorem = evidence(Agreement::kContradicts);
  proof.induction = InductionProof{};
  VerdictDecision d = decide_verdict(bound_of("T(n) <= 100 n for n >= 1"), theorem_derivation(),
                                     SearchOutcome{}, proof);
  EXPECT_EQ(d.verdict, Verdict::kUndecided);
  EXPECT_EQ(d.basis.unproved, Unproved::kDerivedOutgrowsSide);
  EXPECT_TRUE(d.basis.theorem);
  EXPECT_EQ(d.method, "") << "the derivation's method is kept";
}

TEST(DecideVerdict, ExplicitInductionHolds) {
  ProofAttempt proof;
  proof.induction = InductionProof{};
  proof.certificate = Certificate{};
  proof.tight = false;
  VerdictDecision d = decide_verdict(bound_of("T(n) <= 2 n^2 for n >= 1"), theorem_derivation(),
                                     SearchOutcome{}, proof);
  EXPECT_EQ(d.verdict, Verdict::kHolds);
  EXPECT_EQ(d.basis.kind, BasisKind::kInduction);
  EXPECT_TRUE(d.basis.certificate);
  EXPECT_FALSE(d.tight);
}

TEST(DecideVerdict, ExplicitWithoutProofSaysWhy) {
  ProofAttempt proof;
  proof.detail = "no strengthening worked";
  VerdictDecision d =
      decide_verdict(bound_of("T(n) <= 2 n^2 for n >= 1"), Derivation{}, SearchOutcome{}, proof);
  EXPECT_EQ(d.verdict, Verdict::kUndecided);
  EXPECT_EQ(d.basis.kind, BasisKind::kBudgetReached);
  EXPECT_EQ(d.basis.unproved, Unproved::kInductionFailed);
  EXPECT_EQ(d.basis.detail, "no strengthening worked");
  EXPECT_TRUE(d.numeric_only) << "no derived class either";
}

TEST(DecideVerdict, TheoremAgainstTheNumbersIsAnInternalInconsistency) {
  SearchOutcome search = one_rung();
  ProofAttempt proof;
  proof.theorem = evidence(Agreement::kSame);  // would hold, were the numbers not checked first
  proof.disagreement.push_back(EdgeDisagreement{});
  VerdictDecision d =
      decide_verdict(bound_of("Theta(n lg n)"), theorem_derivation(), search, proof);
  EXPECT_EQ(d.verdict, Verdict::kError);
  EXPECT_EQ(d.basis.kind, BasisKind::kInternalInconsistency);
  EXPECT_EQ(d.internal_error,
            "master theorem, case 2 derives Θ(n lg n), but the exact values disagree (an "
            "internal inconsistency)");
  EXPECT_EQ(d.witnesses.size(), 1u);
}

TEST(DecideVerdict, TheoremContradictsRefutesWithTheLadder) {
  SearchOutcome search = one_rung();
  ProofAttempt proof;
  proof.theorem = evidence(Agreement::kContradicts);
  VerdictDecision d = decide_verdict(bound_of("O(n)"), theorem_derivation(), search, proof);
  EXPECT_EQ(d.verdict, Verdict::kRefuted);
  EXPECT_EQ(d.basis.kind, BasisKind::kDerivationContradicts);
  EXPECT_EQ(d.witnesses.size(), 1u);
}

TEST(DecideVerdict, TheoremHoldsTightOrLoose) {
  SearchOutcome search = one_rung();
  ProofAttempt proof;
  proof.theorem = evidence(Agreement::kLoose);
  proof.certificate = Certificate{};
  VerdictDecision d = decide_verdict(bound_of("O(n^2)"), theorem_derivation(), search, proof);
  EXPECT_EQ(d.verdict, Verdict::kHolds);
  EXPECT_EQ(d.basis.kind, BasisKind::kDerivationAgrees);
  EXPECT_FALSE(d.tight);
  EXPECT_TRUE(d.witnesses.empty()) << "a proved claim shows no ladder";
  EXPECT_TRUE(d.basis.certificate);
  proof.theorem = evidence(Agreement::kSame);
  EXPECT_TRUE(decide_verdict(bound_of("Theta(n lg n)"), theorem_derivation(), search, proof).tight);
}

TEST(DecideVerdict, DirectBoundHoldsByInduction) {
  ProofAttempt proof;
  proof.induction = InductionProof{};
  VerdictDecision d = decide_verdict(bound_of("Theta(n)"), Derivation{}, SearchOutcome{}, proof);
  EXPECT_EQ(d.verdict, Verdict::kHolds);
  EXPECT_EQ(d.method, "induction");
  EXPECT_EQ(d.basis.kind, BasisKind::kInduction);
}

TEST(DecideVerdict, EscapingEdgeRefutesOnlyWithRungsPastTheEscapeFactor) {
  SearchOutcome search;
  search.band = band([](uint64_t k) { return static_cast<double>(k); });  // T/g grows like n
  search.any_samples = true;
  search.rungs.push_back(witness(Side::kUpper, "100000"));
  VerdictDecision short_ladder =
      decide_verdict(bound_of("O(n)"), Derivation{}, search, ProofAttempt{});
  EXPECT_EQ(short_ladder.verdict, Verdict::kUndecided);
  EXPECT_EQ(short_ladder.basis.unproved, Unproved::kTrendUnsettled);
  EXPECT_EQ(short_ladder.witnesses.size(), 1u) << "the rungs found are shown";
  search.rungs.push_back(witness(Side::kUpper, "1000000"));
  VerdictDecision d = decide_verdict(bound_of("O(n)"), Derivation{}, search, ProofAttempt{});
  EXPECT_EQ(d.verdict, Verdict::kRefuted);
  EXPECT_EQ(d.basis.kind, BasisKind::kNumericTrend);
  ASSERT_TRUE(d.basis.trend);
  EXPECT_EQ(d.basis.trend->escapes, Side::kUpper);
  EXPECT_EQ(d.method, "numeric");
  // The lower edge does not matter to an O claim: Ω(n) with the same band
  // stays open (the band is steady below).
  VerdictDecision omega =
      decide_verdict(bound_of("Omega(n)"), Derivation{}, search, ProofAttempt{});
  EXPECT_EQ(omega.verdict, Verdict::kUndecided);
}

TEST(DecideVerdict, SteadyBandIsEvidenceNotProof) {
  SearchOutcome search;
  search.band = band([](uint64_t) { return 1.0; });
  search.any_samples = true;
  search.rungs.push_back(witness(Side::kUpper, "10"));
  ProofAttempt proof;
  proof.detail = "no direct bound c·g(n) was proved by induction: the step fails";
  VerdictDecision d = decide_verdict(bound_of("Theta(n)"), Derivation{}, search, proof);
  EXPECT_EQ(d.verdict, Verdict::kUndecided);
  EXPECT_EQ(d.basis.unproved, Unproved::kNumbersOnly);
  EXPECT_EQ(d.basis.detail, proof.detail);
  EXPECT_TRUE(d.witnesses.empty());
  EXPECT_TRUE(d.numeric_only);
  proof.claim_unclassified = true;
  EXPECT_EQ(decide_verdict(bound_of("Theta(n)"), Derivation{}, search, proof).basis.unproved,
            Unproved::kClaimUnclassified);
}

TEST(ApplyCodeResult, AViolationRefutesAndKeepsTheModelsVerdict) {
  ClaimResult r;
  r.verdict = Verdict::kHolds;
  r.basis.kind = BasisKind::kDerivationAgrees;
  CodeResult code;
  code.violations.push_back(CostViolation{});
  apply_code_result(r, code);
  EXPECT_EQ(r.verdict, Verdict::kRefuted);
  EXPECT_EQ(r.basis.kind, BasisKind::kCodeBreaksModel);
  ASSERT_TRUE(r.code);
  EXPECT_EQ(r.code->model_verdict, Verdict::kHolds);
  EXPECT_EQ(r.code->model_basis.kind, BasisKind::kDerivationAgrees);
}

TEST(ApplyCodeResult, MissedFamiliesOnlyHoldBackAHolds) {
  CodeResult code;
  code.families_missed.push_back("odd");
  ClaimResult holds;
  holds.verdict = Verdict::kHolds;
  apply_code_result(holds, code);
  EXPECT_EQ(holds.verdict, Verdict::kUndecided);
  EXPECT_EQ(holds.basis.kind, BasisKind::kCodeSizesMissed);
  ClaimResult refuted;
  refuted.verdict = Verdict::kRefuted;
  apply_code_result(refuted, code);
  EXPECT_EQ(refuted.verdict, Verdict::kRefuted);
  EXPECT_FALSE(refuted.code->model_verdict);
}

}  // namespace
}  // namespace thetagate::engine::checker_internal
