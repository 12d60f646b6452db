// How the verdict is reached: an explicit bound by its certified breaks and
// the derived class; an asymptotic one by the derivation, checked against the
// exact values, or failing that by the trend of the band and the witness
// ladder alone.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <utility>

#include "verifier/checking/claim_check.h"
#include "verifier/checking/trend.h"
#include "verifier/derivation/certificate.h"
#include "verifier/derivation/classify.h"
#include "verifier/derivation/induction.h"
#include "verifier/derivation/shape.h"

namespace thetagate::engine::checker_internal {

namespace {

// log2 of a growth class at n, approximately (for the consistency band).
std::optional<double> log2_of_class(const GrowthClass& g, const BigInt& n) {
  double lg_n = Value(n).log2_magnitude();
  if (lg_n <= 2.0) return std::nullopt;
  double result = g.alpha.approx() * lg_n + g.beta.approx() * std::log2(lg_n) +
                  g.gamma.approx() * std::log2(std::log2(lg_n));
  double rho = g.rho.approx();
  if (rho != 1.0) {
    if (bit_length(n) > 60) return std::nullopt;
    result += static_cast<double>(n) * std::log2(rho);
  }
  return std::isfinite(result) ? std::optional<double>(result) : std::nullopt;
}

}  // namespace

void ClaimCheck::check_explicit(const std::vector<Size>& sizes) {
  const Bound& bound = claim_.bound;
  std::vector<Target> targets;
  if (bound.upper) targets.push_back({Side::kUpper, bound.upper.get(), bound.strict_upper});
  if (bound.lower) targets.push_back({Side::kLower, bound.lower.get(), bound.strict_lower});
  if (targets.empty()) throw InternalError("", "an explicit bound without a side");
  sample_sizes(sizes, targets, true);
  // A family member may land in a narrow window at a high scale while
  // lower scales have windows of their own: search those first, so the
  // witness is the smallest scale's, then shrink within it.
  search_targets(targets, true);
  result_.band = targets.front().band.rows();
  if (result_.method.empty()) result_.method = "exact evaluation";
  for (const Target& target : targets) {
    if (target.violation) result_.witnesses.push_back(witness_for(target, *target.violation));
  }
  if (!result_.witnesses.empty()) {
    result_.verdict = Verdict::kRefuted;
    result_.basis.kind = BasisKind::kCertifiedBreak;
    return;
  }
  result_.verdict = Verdict::kUndecided;
  result_.basis.kind = BasisKind::kBudgetReached;
  // What the derivation says about the bound's class: it must fit under
  // the upper side and over the lower for a proof to be possible.
  std::optional<TheoremEvidence> theorem;
  bool tight = true;
  if (derivation_->growth) {
    const GrowthClass& derived = *derivation_->growth;
    for (const Target& target : targets) {
      Classification c = classify(*target.reference, &claim_.recurrence->helpers);
      if (!c.growth) {
        tight = false;
        continue;
      }
      int order = compare(derived, *c.growth);
      if (order != 0) tight = false;
      if ((target.side == Side::kUpper && order > 0) ||
          (target.side == Side::kLower && order < 0)) {
        result_.basis.unproved = Unproved::kDerivedOutgrowsSide;
        result_.basis.theorem = TheoremEvidence{derivation_->method,     derivation_->derived,
                                                to_string(*c.growth),    compared_with(target.side),
                                                Agreement::kContradicts, order > 0};
        return;
      }
    }
    theorem = TheoremEvidence{derivation_->method,
                              derivation_->derived,
                              "",
                              ComparedWith::kExplicit,
                              tight ? Agreement::kSame : Agreement::kLoose,
                              false};
  }
  InductionOutcome induction = try_induction(claim_.bound);
  if (induction.proof) {
    result_.verdict = Verdict::kHolds;
    result_.tight = tight;
    result_.basis.kind = BasisKind::kInduction;
    result_.basis.induction = induction.proof;
    result_.basis.certificate = induction_certificate(*induction.proof);
    result_.basis.theorem = theorem;
    return;
  }
  result_.numeric_only = !derivation_->growth;
  result_.basis.unproved = Unproved::kInductionFailed;
  result_.basis.theorem = theorem;
  result_.basis.detail = induction.failure;
}

InductionOutcome ClaimCheck::try_induction(const Bound& bound) {
  if (!claim_.recurrence->class_terms.empty()) {
    // The values are those of one member of each class term: an induction
    // on them would prove the claim for that member only.
    InductionOutcome none;
    none.failure = "no proof by induction: the growth classes in " + claim_.recurrence->main.name +
                   " stand for any function of each class, and the exact values are one member's";
    return none;
  }
  InductionRequest request;
  request.recurrence = claim_.recurrence.get();
  request.bound = &bound;
  request.work_budget = 4000 * effort_;
  const SourceText& rs = claim_.recurrence->source;
  request.check_range = [&](const ExprPtr& candidate, Side side, bool strict, const BigInt& lo,
                            const BigInt& hi) {
    try {
      for (BigInt n = lo; n <= hi; ++n) {
        std::optional<int> order = compare_at(*t_of_n_, rs, *candidate, claim_.bound.source, n);
        if (!order) return false;
        bool ok = side == Side::kUpper ? (strict ? *order < 0 : *order <= 0)
                                       : (strict ? *order > 0 : *order >= 0);
        if (!ok) return false;
      }
      return true;
    } catch (const BudgetExceeded&) {
      return false;
    }
  };
  return prove_by_induction(request);
}

void ClaimCheck::check_asymptotic(const std::vector<Size>& sizes) {
  const Bound& bound = claim_.bound;
  BoundKind kind = bound.kind;
  std::vector<Target> targets;
  if (kind == BoundKind::kTheta || kind == BoundKind::kBigO) {
    targets.push_back({Side::kUpper, bound.growth.get()});
  }
  if (kind == BoundKind::kTheta || kind == BoundKind::kOmega) {
    targets.push_back({Side::kLower, bound.growth.get()});
  }
  sample_sizes(sizes, targets, false);
  search_targets(targets, false);
  // One band for the report: both sides saw the same sizes.
  BandBuilder merged;
  for (const Target& target : targets) {
    for (const Sample& s : target.samples) merged.add(s.n, s.log2_ratio);
  }
  result_.band = merged.rows();
  for (const Target& target : targets) climb_ladder(target);

  ClaimComparison cmp = compare_with_derivation(*derivation_, bound);
  // Every side's samples: local search pushed each side's edge apart.
  std::vector<Sample> all;
  for (const Target& target : targets)
    all.insert(all.end(), target.samples.begin(), target.samples.end());
  switch (cmp.agreement) {
    case ClaimAgreement::kAgree:
    case ClaimAgreement::kHoldsLoosely:
    case ClaimAgreement::kContradicts: {
      TheoremEvidence evidence{derivation_->method,
                               to_string(*cmp.derived),
                               to_string(*cmp.claimed),
                               compared_with(bound.kind),
                               cmp.agreement == ClaimAgreement::kAgree ? Agreement::kSame
                               : cmp.agreement == ClaimAgreement::kHoldsLoosely
                                   ? Agreement::kLoose
                                   : Agreement::kContradicts,
                               cmp.claimed_below};
      evidence.relation = cmp.relation;
      result_.basis.theorem = evidence;
      std::vector<EdgeDisagreement> disagreement = consistency(all);
      if (!disagreement.empty()) {
        // A theorem whose hypotheses were verified cannot disagree with the
        // exact values: one of the two is a bug. It is reported as one
        // (verdict error, exit 3), never as an ordinary undecided claim.
        result_.verdict = Verdict::kError;
        result_.internal_error = derivation_->method + " derives Θ(" + derivation_->derived +
                                 "), but the exact values disagree (an internal inconsistency)";
        result_.basis.kind = BasisKind::kInternalInconsistency;
        result_.basis.disagreement = std::move(disagreement);
        return;
      }
      if (cmp.agreement == ClaimAgreement::kContradicts) {
        result_.verdict = Verdict::kRefuted;
        result_.basis.kind = BasisKind::kDerivationContradicts;
        return;
      }
      result_.verdict = Verdict::kHolds;
      result_.basis.kind = BasisKind::kDerivationAgrees;
      result_.basis.certificate =
          theorem_certificate(*claim_.recurrence, *derivation_, options_.clock_limit);
      result_.tight = cmp.agreement == ClaimAgreement::kAgree;
      result_.witnesses.clear();
      return;
    }
    case ClaimAgreement::kCannotClassifyClaim:
      result_.basis.detail = cmp.detail;
      break;
    case ClaimAgreement::kNoDerivation:
      // No theorem: a direct bound c·g(n) proved by induction still proves
      // the claim (and says so).
      if (try_direct_bound()) return;
      break;
    default:
      break;
  }
  decide_numerically(targets, cmp.agreement == ClaimAgreement::kCannotClassifyClaim);
}

bool ClaimCheck::try_direct_bound() {
  const Bound& bound = claim_.bound;
  std::vector<BandRow> rows = complete_scales(result_.band);
  if (rows.empty()) return false;
  double high = rows.front().high_log2, low = rows.front().low_log2;
  for (const BandRow& r : rows) {
    high = std::max(high, r.high_log2);
    low = std::min(low, r.low_log2);
  }
  bool upper = bound.kind == BoundKind::kTheta || bound.kind == BoundKind::kBigO;
  bool lower = bound.kind == BoundKind::kTheta || bound.kind == BoundKind::kOmega;
  if (upper && (!std::isfinite(high) || high > 60)) return false;
  if (lower && (!std::isfinite(low) || low < -60)) return false;
  // Constants with room beyond the band: powers of two.
  Bound direct;
  direct.kind = BoundKind::kExplicit;
  direct.source = bound.source;
  direct.n0 = 16;
  if (upper) {
    Rational c = Rational(BigInt(1) << static_cast<unsigned>(std::ceil(high) + 1 + 64)) /
                 Rational(BigInt(1) << 64);
    direct.upper = make_binary(ExprKind::kMul, make_number(c), bound.growth);
  }
  if (lower) {
    Rational c = Rational(BigInt(1) << static_cast<unsigned>(std::floor(low) - 1 + 64)) /
                 Rational(BigInt(1) << 64);
    direct.lower = make_binary(ExprKind::kMul, make_number(c), bound.growth);
  }
  InductionOutcome induction = try_induction(direct);
  if (!induction.proof) {
    result_.basis.detail = "no direct bound c·g(n) was proved by induction: " + induction.failure;
    return false;
  }
  result_.verdict = Verdict::kHolds;
  result_.method = "induction";
  result_.basis.kind = BasisKind::kInduction;
  result_.basis.induction = induction.proof;
  result_.basis.certificate = induction_certificate(*induction.proof);
  result_.witnesses.clear();
  return true;
}

void ClaimCheck::climb_ladder(const Target& target) {
  const Bound& bound = claim_.bound;
  const SourceText& rs = claim_.recurrence->source;
  std::vector<Sample> ordered = target.samples;
  std::sort(ordered.begin(), ordered.end(),
            [](const Sample& a, const Sample& b) { return a.n < b.n; });
  // Rungs up to c = 10^12: past the escape factor 10^6 with room to show
  // the trend, without listing hundreds of sizes.
  for (int j = 1; j <= 12; ++j) {
    double c_log2 = j * std::log2(10.0);
    bool found = false;
    for (const Sample& s : ordered) {
      bool beyond = target.side == Side::kUpper ? s.log2_ratio > c_log2 : s.log2_ratio < -c_log2;
      if (!beyond) continue;
      BigInt c = boost::multiprecision::pow(BigInt(10), static_cast<unsigned>(j));
      ExprPtr scaled_g = make_binary(ExprKind::kMul, make_number(Rational(c)), bound.growth);
      ExprPtr scaled_t = make_binary(ExprKind::kMul, make_number(Rational(c)), t_of_n_);
      std::optional<int> order = target.side == Side::kUpper
                                     ? compare_at(*t_of_n_, rs, *scaled_g, bound.source, s.n)
                                     : compare_at(*scaled_t, rs, *bound.growth, bound.source, s.n);
      bool certified = order && (target.side == Side::kUpper ? *order > 0 : *order < 0);
      if (!certified) continue;
      result_.witnesses.push_back(witness_for(target, s, c.str()));
      found = true;
      break;
    }
    if (!found) break;
  }
}

std::vector<EdgeDisagreement> ClaimCheck::consistency(const std::vector<Sample>& samples) {
  if (!derivation_->growth) return {};
  BandBuilder band;
  for (const Sample& s : samples) {
    Value t = known_value(s.n);
    std::optional<double> lg = log2_of_class(*derivation_->growth, s.n);
    if (!lg || sign_of(t) <= 0) continue;
    band.add(s.n, t.log2_magnitude() - *lg);
  }
  if (band.empty()) return {};
  TrendReading trend = read_trend(complete_scales(band.rows()));
  // Θ promises T(n)/g(n) between two constants, not a flat ratio: with
  // floors, the sizes n and n + 1 can sit a whole recursion level apart, and
  // T(n)/g(n) then steps by up to the level's factor (the sum of the
  // coefficients) before it comes back. Over a few scales such a step looks
  // like a slope (7 T(floor(sqrt(n))) moves a level only where lg n doubles;
  // 10^4000 T(n/2) steps by 10^4000 between n = 2^k - 1 and 2^k). Only a
  // movement beyond that allowance contradicts the derived class.
  double allowance = oscillation_allowance_log2();
  std::vector<EdgeDisagreement> moving;
  for (const auto& [edge, side] :
       {std::pair{trend.high, Side::kUpper}, std::pair{trend.low, Side::kLower}}) {
    bool moves = edge.direction == Direction::kRising || edge.direction == Direction::kFalling;
    bool beyond = std::max(std::fabs(edge.change_log2), std::fabs(edge.envelope_log2)) > allowance;
    if (beyond &&
        (edge.direction == Direction::kEscapes || (moves && std::fabs(edge.slope) > 0.5))) {
      moving.push_back({side, edge});
    }
  }
  return moving;
}

double ClaimCheck::oscillation_allowance_log2() const {
  // log2 of the sum of the recursive terms' coefficients, at least 1.
  Shape shape = extract_shape(*claim_.recurrence);
  // log2 of the sum, from the largest term's log2 and the count of terms
  // (10^4000 does not fit a double).
  double largest = 1.0;
  size_t terms = 0;
  auto add = [&](const Rational& a) {
    if (a != 0) largest = std::max(largest, Value(a).log2_magnitude());
    ++terms;
  };
  for (const ScaledTerm& t : shape.scaled) add(t.a);
  for (const RootTerm& t : shape.roots) add(t.a);
  for (const SubtractiveTerm& t : shape.subtractive) add(t.a);
  // Plus a margin for a ratio that still converges over the sizes checked
  // (T(n/2) + T(n/3) + T(n/7) + n climbs to 42 n from below: 5.4 bits when
  // only small scales fit the memory): 8 bits. A lg n factor over 4096 bits
  // (12 bits) is still caught; a lg lg n factor only by the proof itself.
  return largest + std::log2(static_cast<double>(std::max<size_t>(terms, 1))) + 8.0;
}

void ClaimCheck::decide_numerically(const std::vector<Target>& targets, bool claim_unclassified) {
  BoundKind kind = claim_.bound.kind;
  bool upper_matters = kind == BoundKind::kTheta || kind == BoundKind::kBigO;
  bool lower_matters = kind == BoundKind::kTheta || kind == BoundKind::kOmega;
  TrendReading trend = read_trend(complete_scales(result_.band));
  result_.method = "numeric";
  result_.numeric_only = true;
  result_.basis.kind = BasisKind::kNumericTrend;
  TrendEvidence evidence;
  evidence.upper_matters = upper_matters;
  evidence.lower_matters = lower_matters;
  evidence.upper = trend.high;
  evidence.lower = trend.low;

  // The ladder must have certified rungs up to the escape factor: T(n) >
  // c·g(n) checked exactly at sizes found for growing c.
  auto reached_escape = [&](Side side) {
    for (const Witness& w : result_.witnesses) {
      if (w.side == side && !w.factor.empty() && BigInt(w.factor) >= 1000000) return true;
    }
    return false;
  };
  // An escape may be read with the last, partly searched scale too (see
  // scales_for_escape): where the work budget ran out is often where the
  // ratio has just climbed past the escape factor.
  TrendReading with_last = read_trend(scales_for_escape(result_.band));
  auto escapes = [](const EdgeReading& complete, const EdgeReading& last) -> const EdgeReading* {
    if (complete.direction == Direction::kEscapes) return &complete;
    if (last.direction == Direction::kEscapes) return &last;
    return nullptr;
  };
  const EdgeReading* upper_escape = escapes(trend.high, with_last.high);
  const EdgeReading* lower_escape = escapes(trend.low, with_last.low);
  bool upper_escapes = upper_matters && upper_escape && reached_escape(Side::kUpper);
  bool lower_escapes = lower_matters && lower_escape && reached_escape(Side::kLower);
  if (upper_escapes || lower_escapes) {
    evidence.escapes = upper_escapes ? Side::kUpper : Side::kLower;
    if (upper_escapes) evidence.upper = *upper_escape;
    if (lower_escapes) evidence.lower = *lower_escape;
    result_.verdict = Verdict::kRefuted;
    result_.basis.trend = evidence;
    return;
  }
  bool upper_ok = !upper_matters || trend.high.direction == Direction::kSteady ||
                  (kind == BoundKind::kBigO && trend.high.direction == Direction::kFalling);
  bool lower_ok = !lower_matters || trend.low.direction == Direction::kSteady ||
                  (kind == BoundKind::kOmega && trend.low.direction == Direction::kRising);
  bool any = false;
  for (const Target& t : targets) any |= !t.samples.empty();
  result_.verdict = Verdict::kUndecided;
  result_.basis.trend = evidence;
  // A steady band is evidence, not a proof: without a theorem the claim
  // stays undecided however well the numbers agree.
  if (upper_ok && lower_ok && any) {
    result_.basis.unproved =
        claim_unclassified ? Unproved::kClaimUnclassified : Unproved::kNumbersOnly;
    result_.witnesses.clear();
    return;
  }
  result_.basis.unproved =
      claim_unclassified ? Unproved::kClaimUnclassified : Unproved::kTrendUnsettled;
}

}  // namespace thetagate::engine::checker_internal
