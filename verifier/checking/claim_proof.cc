#include "verifier/checking/claim_proof.h"

#include <algorithm>
#include <cmath>
#include <utility>

#include "verifier/checking/trend.h"
#include "verifier/derivation/classify.h"
#include "verifier/derivation/dyadic.h"
#include "verifier/derivation/shape.h"
#include "verifier/derivation/sum_induction.h"

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

// How far (log2) T(n)/g(n) may move under a correct Θ(g) with floors: one
// recursion level's factor, the sum of the recursive terms' coefficients
// (at least 1), plus a margin.
double oscillation_allowance_log2(const Recurrence& recurrence) {
  Shape shape = extract_shape(recurrence);
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

class ProofStage {
 public:
  ProofStage(ClaimEvaluation& eval, const Derivation& derivation, const SearchOutcome& search)
      : eval_(eval), claim_(eval.claim()), derivation_(derivation), search_(search) {}

  ProofAttempt run() {
    if (claim_.bound.is_asymptotic()) {
      prove_asymptotic();
    } else if (search_.breaks.empty()) {
      prove_explicit();
    }
    return std::move(attempt_);
  }

 private:
  // The derived class against each side: a side below it must break further
  // out; otherwise induction, with the comparison kept as evidence.
  void prove_explicit();
  void prove_asymptotic();
  // A proof by induction of `bound`, its exact ranges checked with the
  // evaluator (verifier/derivation/induction.h).
  InductionOutcome try_induction(const Bound& bound);
  // Theta/O/Omega without a theorem: a direct bound c·g(n) (upper) and
  // g(n)/c (lower), c a power of two past the band, proved by induction
  // from n = 16. True (and the attempt holds the proof) when it is.
  bool try_direct_bound();
  // The exact numbers must agree with the derivation: T(n)/derived(n) stays
  // in a band that does not move. Returns the edges that move.
  std::vector<EdgeDisagreement> consistency();

  ClaimEvaluation& eval_;
  const Claim& claim_;
  const Derivation& derivation_;
  const SearchOutcome& search_;
  ProofAttempt attempt_;
};

void ProofStage::prove_explicit() {
  if (derivation_.growth) {
    const GrowthClass& derived = *derivation_.growth;
    for (auto [side, reference] : {std::pair{Side::kUpper, claim_.bound.upper.get()},
                                   std::pair{Side::kLower, claim_.bound.lower.get()}}) {
      if (reference == nullptr) continue;
      Classification c = classify(*reference, &claim_.recurrence->helpers);
      if (!c.growth) {
        attempt_.tight = false;
        continue;
      }
      int order = compare(derived, *c.growth);
      if (order != 0) attempt_.tight = false;
      if ((side == Side::kUpper && order > 0) || (side == Side::kLower && order < 0)) {
        attempt_.derived_outgrows_side = true;
        attempt_.theorem =
            TheoremEvidence{derivation_.method,  derivation_.derived,     to_string(*c.growth),
                            compared_with(side), Agreement::kContradicts, order > 0};
        return;
      }
    }
    attempt_.theorem = TheoremEvidence{derivation_.method,
                                       derivation_.derived,
                                       "",
                                       ComparedWith::kExplicit,
                                       attempt_.tight ? Agreement::kSame : Agreement::kLoose,
                                       false};
  }
  InductionOutcome induction = try_induction(claim_.bound);
  if (induction.proof) {
    attempt_.certificate = induction_certificate(*induction.proof);
    attempt_.induction = std::move(induction.proof);
  } else {
    attempt_.detail = induction.failure;
  }
}

void ProofStage::prove_asymptotic() {
  const Bound& bound = claim_.bound;
  ClaimComparison cmp = compare_with_derivation(derivation_, bound);
  if (cmp.agreement) {
    TheoremEvidence evidence{cmp.method.empty() ? derivation_.method : cmp.method,
                             to_string(*cmp.derived),
                             to_string(*cmp.claimed),
                             compared_with(bound.kind),
                             *cmp.agreement,
                             cmp.claimed_below};
    evidence.relation = cmp.relation;
    attempt_.theorem = evidence;
    attempt_.disagreement = consistency();
    if (attempt_.disagreement.empty() && *cmp.agreement != Agreement::kContradicts) {
      attempt_.certificate =
          theorem_certificate(*claim_.recurrence, derivation_, eval_.options().clock_limit);
    }
    return;
  }
  if (cmp.claim_unclassified) {
    attempt_.claim_unclassified = true;
    attempt_.detail = cmp.detail;
    return;
  }
  // No theorem: a direct bound c·g(n) proved by induction still proves the
  // claim (and says so).
  try_direct_bound();
}

InductionOutcome ProofStage::try_induction(const Bound& bound) {
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
  request.work_budget = WorkShares::kInductionWork * eval_.effort();
  const SourceText& rs = claim_.recurrence->source;
  request.check_range = [&](const ExprPtr& candidate, Side side, bool strict, const BigInt& lo,
                            const BigInt& hi) {
    try {
      for (BigInt n = lo; n <= hi; ++n) {
        std::optional<int> order =
            eval_.compare_at(*eval_.t_of_n(), rs, *candidate, claim_.bound.source, n);
        if (!order) return false;
        if (!on_side(side, strict, *order)) return false;
      }
      return true;
    } catch (const BudgetExceeded&) {
      return false;
    }
  };
  // A proof is named in the claim's own terms: C(n) = ..., not T(n).
  auto named = [&](InductionOutcome found) {
    if (found.proof) found.proof->function = claim_.recurrence->main.name;
    return found;
  };
  InductionOutcome outcome = prove_by_induction(request);
  if (!outcome.proof && claim_.recurrence->full_history) {
    // A line that sums over earlier values: its own two methods.
    InductionOutcome over_sums = prove_over_sums(request);
    if (over_sums.proof) return named(over_sums);
    outcome.failure += "; " + over_sums.failure;
  }
  if (outcome.proof || &bound != &claim_.bound) return named(outcome);
  // Floors and ceilings of lg n: induction on dyadic blocks (dyadic.h).
  DyadicRequest dyadic{request.recurrence, request.bound, request.check_range,
                       [&](const BigInt& n) -> std::optional<Rational> {
                         std::optional<Value> v = eval_.value_at(n, false);
                         if (!v || !v->is_exact()) return std::nullopt;
                         return v->exact();
                       },
                       request.work_budget};
  InductionOutcome blocks = prove_on_dyadic_blocks(dyadic);
  if (blocks.proof) return named(blocks);
  if (!blocks.failure.empty()) outcome.failure += "; " + blocks.failure;
  return outcome;
}

bool ProofStage::try_direct_bound() {
  const Bound& bound = claim_.bound;
  std::vector<BandRow> rows = complete_scales(search_.band, search_.partial_scale);
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
    attempt_.detail = "no direct bound c·g(n) was proved by induction: " + induction.failure;
    return false;
  }
  attempt_.certificate = induction_certificate(*induction.proof);
  attempt_.induction = std::move(induction.proof);
  return true;
}

std::vector<EdgeDisagreement> ProofStage::consistency() {
  if (!derivation_.growth) return {};
  BandBuilder band;
  for (const Sample& s : search_.samples) {
    Value t = eval_.known_value(s.n);
    std::optional<double> lg = log2_of_class(*derivation_.growth, s.n);
    if (!lg || ClaimEvaluation::sign_of(t) <= 0) continue;
    band.add(s.n, t.log2_magnitude() - *lg);
  }
  if (band.empty()) return {};
  TrendReading trend = read_trend(complete_scales(band.rows(), search_.partial_scale));
  // Θ promises T(n)/g(n) between two constants, not a flat ratio: with
  // floors, the sizes n and n + 1 can sit a whole recursion level apart, and
  // T(n)/g(n) then steps by up to the level's factor (the sum of the
  // coefficients) before it comes back. Over a few scales such a step looks
  // like a slope (7 T(floor(sqrt(n))) moves a level only where lg n doubles;
  // 10^4000 T(n/2) steps by 10^4000 between n = 2^k - 1 and 2^k). Only a
  // movement beyond that allowance contradicts the derived class.
  double allowance = oscillation_allowance_log2(*claim_.recurrence);
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

}  // namespace

ProofAttempt attempt_proof(ClaimEvaluation& eval, const Derivation& derivation,
                           const SearchOutcome& search) {
  return ProofStage(eval, derivation, search).run();
}

}  // namespace thetagate::engine::checker_internal
