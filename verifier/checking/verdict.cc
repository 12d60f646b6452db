// The verdict rules, in the order they are applied. Read decide_explicit or
// decide_asymptotic top to bottom: the first rule that matches decides.
#include "verifier/checking/verdict.h"

#include <utility>

#include "verifier/checking/trend.h"

namespace thetagate::engine::checker_internal {

namespace {

// The ladder must have certified rungs up to the escape factor (10^6):
// T(n) > c·g(n) checked exactly at sizes found for growing c.
bool ladder_reaches_escape(const std::vector<Witness>& rungs, Side side) {
  for (const Witness& w : rungs) {
    if (w.side == side && !w.factor.empty() && BigInt(w.factor) >= 1000000) return true;
  }
  return false;
}

VerdictDecision decide_explicit(const Derivation& derivation, const SearchOutcome& search,
                                const ProofAttempt& proof) {
  VerdictDecision d;
  if (derivation.method.empty()) d.method = "exact evaluation";
  // 1. A size where T(n) breaks a side, checked exactly, refutes.
  if (!search.breaks.empty()) {
    d.verdict = Verdict::kRefuted;
    d.basis.kind = BasisKind::kCertifiedBreak;
    d.witnesses = search.breaks;
    return d;
  }
  d.basis.theorem = proof.theorem;
  // 2. The derived class outgrows a side: the bound must break beyond the
  //    sizes checked, and nothing here can prove it.
  if (proof.derived_outgrows_side) {
    d.verdict = Verdict::kUndecided;
    d.basis.kind = BasisKind::kBudgetReached;
    d.basis.unproved = Unproved::kDerivedOutgrowsSide;
    return d;
  }
  // 3. An induction certificate proves it.
  if (proof.induction) {
    d.verdict = Verdict::kHolds;
    d.tight = proof.tight;
    d.basis.kind = BasisKind::kInduction;
    d.basis.induction = proof.induction;
    d.basis.certificate = proof.certificate;
    return d;
  }
  // 4. No break where checked, and no proof.
  d.verdict = Verdict::kUndecided;
  d.basis.kind = BasisKind::kBudgetReached;
  d.basis.unproved = Unproved::kInductionFailed;
  d.basis.detail = proof.detail;
  d.numeric_only = !derivation.growth;
  return d;
}

// The numbers alone (no theorem, no direct bound): refuted when a band edge
// escapes past 10^6 with certified rungs that far; otherwise undecided, the
// numbers being evidence, not a proof.
VerdictDecision decide_numerically(const Bound& bound, const SearchOutcome& search,
                                   const ProofAttempt& proof) {
  BoundKind kind = bound.kind;
  bool upper_matters = kind == BoundKind::kTheta || kind == BoundKind::kBigO;
  bool lower_matters = kind == BoundKind::kTheta || kind == BoundKind::kOmega;
  TrendReading trend = read_trend(complete_scales(search.band, search.partial_scale));
  VerdictDecision d;
  d.method = "numeric";
  d.numeric_only = true;
  d.basis.kind = BasisKind::kNumericTrend;
  d.basis.detail = proof.detail;
  d.witnesses = search.rungs;
  TrendEvidence evidence;
  evidence.upper_matters = upper_matters;
  evidence.lower_matters = lower_matters;
  evidence.upper = trend.high;
  evidence.lower = trend.low;

  // An escape may be read with the last, partly searched scale too (see
  // scales_for_escape): where the work budget ran out is often where the
  // ratio has just climbed past the escape factor.
  TrendReading with_last = read_trend(scales_for_escape(search.band, search.partial_scale));
  auto escapes = [](const EdgeReading& complete, const EdgeReading& last) -> const EdgeReading* {
    if (complete.direction == Direction::kEscapes) return &complete;
    if (last.direction == Direction::kEscapes) return &last;
    return nullptr;
  };
  const EdgeReading* upper_escape = escapes(trend.high, with_last.high);
  const EdgeReading* lower_escape = escapes(trend.low, with_last.low);
  bool upper_escapes =
      upper_matters && upper_escape && ladder_reaches_escape(search.rungs, Side::kUpper);
  bool lower_escapes =
      lower_matters && lower_escape && ladder_reaches_escape(search.rungs, Side::kLower);
  if (upper_escapes || lower_escapes) {
    evidence.escapes = upper_escapes ? Side::kUpper : Side::kLower;
    if (upper_escapes) evidence.upper = *upper_escape;
    if (lower_escapes) evidence.lower = *lower_escape;
    d.verdict = Verdict::kRefuted;
    d.basis.trend = evidence;
    return d;
  }
  bool upper_ok = !upper_matters || trend.high.direction == Direction::kSteady ||
                  (kind == BoundKind::kBigO && trend.high.direction == Direction::kFalling);
  bool lower_ok = !lower_matters || trend.low.direction == Direction::kSteady ||
                  (kind == BoundKind::kOmega && trend.low.direction == Direction::kRising);
  d.verdict = Verdict::kUndecided;
  d.basis.trend = evidence;
  // A steady band is evidence, not a proof: without a theorem the claim
  // stays undecided however well the numbers agree.
  if (upper_ok && lower_ok && search.any_samples) {
    d.basis.unproved =
        proof.claim_unclassified ? Unproved::kClaimUnclassified : Unproved::kNumbersOnly;
    d.witnesses.clear();
    return d;
  }
  d.basis.unproved =
      proof.claim_unclassified ? Unproved::kClaimUnclassified : Unproved::kTrendUnsettled;
  return d;
}

VerdictDecision decide_asymptotic(const Bound& bound, const Derivation& derivation,
                                  const SearchOutcome& search, const ProofAttempt& proof) {
  VerdictDecision d;
  d.witnesses = search.rungs;
  if (proof.theorem) {
    d.basis.theorem = proof.theorem;
    // 1. A theorem whose hypotheses were verified cannot disagree with the
    //    exact values: one of the two is a bug. It is reported as one
    //    (verdict error, exit 3), never as an ordinary undecided claim.
    if (!proof.disagreement.empty()) {
      d.verdict = Verdict::kError;
      d.internal_error = derivation.method + " derives Θ(" + derivation.derived +
                         "), but the exact values disagree (an internal inconsistency)";
      d.basis.kind = BasisKind::kInternalInconsistency;
      d.basis.disagreement = proof.disagreement;
      return d;
    }
    // 2. The theorem's class excludes the claim.
    if (proof.theorem->agreement == Agreement::kContradicts) {
      d.verdict = Verdict::kRefuted;
      d.basis.kind = BasisKind::kDerivationContradicts;
      return d;
    }
    // 3. The theorem's class is the claim's, or inside it.
    d.verdict = Verdict::kHolds;
    d.basis.kind = BasisKind::kDerivationAgrees;
    d.basis.certificate = proof.certificate;
    d.tight = proof.theorem->agreement == Agreement::kSame;
    d.witnesses.clear();
    return d;
  }
  // 4. No theorem, but a direct bound c·g(n) proved by induction.
  if (proof.induction) {
    d.verdict = Verdict::kHolds;
    d.method = "induction";
    d.basis.kind = BasisKind::kInduction;
    d.basis.induction = proof.induction;
    d.basis.certificate = proof.certificate;
    d.witnesses.clear();
    return d;
  }
  // 5. The numbers alone.
  return decide_numerically(bound, search, proof);
}

}  // namespace

VerdictDecision decide_verdict(const Bound& bound, const Derivation& derivation,
                               const SearchOutcome& search, const ProofAttempt& proof) {
  return bound.is_asymptotic() ? decide_asymptotic(bound, derivation, search, proof)
                               : decide_explicit(derivation, search, proof);
}

}  // namespace thetagate::engine::checker_internal

namespace thetagate::engine {

void apply_code_result(ClaimResult& result, CodeResult code) {
  if (!code.violations.empty()) {
    code.model_verdict = result.verdict;
    code.model_basis = result.basis;
    result.verdict = Verdict::kRefuted;
    result.basis = VerdictBasis{};
    result.basis.kind = BasisKind::kCodeBreaksModel;
  } else if (!code.families_missed.empty() && result.verdict == Verdict::kHolds) {
    // The bound holds, but the code was never measured where floors and
    // ceilings bite: the code link is not shown green.
    code.model_verdict = result.verdict;
    code.model_basis = result.basis;
    result.verdict = Verdict::kUndecided;
    result.basis = VerdictBasis{};
    result.basis.kind = BasisKind::kCodeSizesMissed;
  }
  result.code = std::move(code);
}

}  // namespace thetagate::engine
