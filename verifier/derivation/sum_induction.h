// Proofs of explicit bounds for recurrences whose line sums over earlier
// values, T(n) = A(n) + W(n) · sum(k, lo, hi, T(k)) (docs/design.md,
// "Proofs over sums of earlier values"). Two methods, each an induction on
// n whose exact base range the caller checks (InductionRequest::check_range):
//
// - Differencing ("sum-difference"): a closed form T(n) = B(n), B a
//   rational function of n and of sums sum(j, lo, n + e, h(j)) with closed
//   bodies (the harmonic numbers). The line at n and at n - 1 eliminates
//   the sum: T(n) = A(n) + W(n)((T(n-1) - A(n-1))/W(n-1) + T(n-1)); B
//   satisfies that first-order recurrence identically (rational_form.h),
//   and T = B on the checked range carries it to every n.
// - Summed step ("sum-step"): a polynomial bound B on either side, the
//   limits lo(n) and hi(n) affine in n on each residue class (floor(n/2)):
//   sum(k, lo, hi, B(k)) = Q(hi) - Q(lo - 1) in closed form, and the
//   slack B(n) - A(n) - W(n)(Q(hi) - Q(lo - 1)) >= 0 with W(n) >= 0 for
//   every real n > M (series.h), per residue class.
#ifndef THETAGATE_VERIFIER_DERIVATION_SUM_INDUCTION_H_
#define THETAGATE_VERIFIER_DERIVATION_SUM_INDUCTION_H_

#include <string>

#include "verifier/derivation/induction.h"

namespace thetagate::engine {

// A proof by differencing of T(n) = B(n) (both sides of the bound the
// same closed form, or one side that the closed form proves).
InductionOutcome prove_by_differencing(const InductionRequest& request);

// A proof by the summed step of a polynomial bound.
InductionOutcome prove_by_summed_step(const InductionRequest& request);

// Both methods, differencing first: the first proof found, else both
// failures in one reason. REQUIRES: the recurrence is full-history.
InductionOutcome prove_over_sums(const InductionRequest& request);

// What induction_proof_name adds for a proof with this method:
// " (differenced: the closed form satisfies the first-order recurrence
// identically)".
std::string sum_step_name(const std::string& method);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_SUM_INDUCTION_H_
