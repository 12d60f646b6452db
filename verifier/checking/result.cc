#include "verifier/checking/result.h"

namespace thetagate::engine {

const char* verdict_name(Verdict v) {
  switch (v) {
    case Verdict::kHolds:
      return "holds";
    case Verdict::kRefuted:
      return "refuted";
    case Verdict::kUndecided:
      return "undecided";
    case Verdict::kError:
      return "error";
  }
  return "?";
}

const char* compared_with_name(ComparedWith c) {
  switch (c) {
    case ComparedWith::kTheta:
      return bound_kind_name(BoundKind::kTheta);
    case ComparedWith::kBigO:
      return bound_kind_name(BoundKind::kBigO);
    case ComparedWith::kOmega:
      return bound_kind_name(BoundKind::kOmega);
    case ComparedWith::kExplicit:
      return bound_kind_name(BoundKind::kExplicit);
    case ComparedWith::kUpperSide:
      return side_name(Side::kUpper);
    case ComparedWith::kLowerSide:
      return side_name(Side::kLower);
  }
  return "?";
}

ComparedWith compared_with(BoundKind kind) {
  switch (kind) {
    case BoundKind::kTheta:
      return ComparedWith::kTheta;
    case BoundKind::kBigO:
      return ComparedWith::kBigO;
    case BoundKind::kOmega:
      return ComparedWith::kOmega;
    case BoundKind::kExplicit:
      return ComparedWith::kExplicit;
  }
  throw InternalError("", "a bound kind with no comparison");
}

ComparedWith compared_with(Side side) {
  return side == Side::kUpper ? ComparedWith::kUpperSide : ComparedWith::kLowerSide;
}

const char* direction_name(Direction d) {
  switch (d) {
    case Direction::kSteady:
      return "steady";
    case Direction::kRising:
      return "rising";
    case Direction::kFalling:
      return "falling";
    case Direction::kEscapes:
      return "escaping";
    case Direction::kUnclear:
      return "unclear";
  }
  return "?";
}

const char* basis_name(BasisKind k) {
  switch (k) {
    case BasisKind::kDerivationAgrees:
      return "derivation_agrees";
    case BasisKind::kInduction:
      return "induction";
    case BasisKind::kDerivationContradicts:
      return "derivation_contradicts";
    case BasisKind::kCertifiedBreak:
      return "certified_break";
    case BasisKind::kNumericTrend:
      return "numeric_trend";
    case BasisKind::kBudgetReached:
      return "budget_reached";
    case BasisKind::kInternalInconsistency:
      return "internal_inconsistency";
    case BasisKind::kInputError:
      return "input_error";
    case BasisKind::kInternalError:
      return "internal_error";
    case BasisKind::kCodeBreaksModel:
      return "code_breaks_model";
    case BasisKind::kCodeSizesMissed:
      return "code_sizes_missed";
  }
  return "?";
}

const char* unproved_name(Unproved u) {
  switch (u) {
    case Unproved::kNone:
      return "";
    case Unproved::kDerivedOutgrowsSide:
      return "derived_outgrows_side";
    case Unproved::kInductionFailed:
      return "induction_failed";
    case Unproved::kNumbersOnly:
      return "numbers_only";
    case Unproved::kTrendUnsettled:
      return "trend_unsettled";
    case Unproved::kClaimUnclassified:
      return "claim_unclassified";
    case Unproved::kEvaluatorLimit:
      return "evaluator_limit";
  }
  return "?";
}

bool RunResult::any_refuted() const {
  for (const auto& c : claims) {
    if (c.verdict == Verdict::kRefuted) return true;
  }
  return false;
}

}  // namespace thetagate::engine
