// The Akra–Bazzi theorem (Akra, Bazzi 1998) with Leighton's perturbations
// (Leighton 1996): T(n) = sum a_i T(b_i n + h_i(n)) + g(n), a_i > 0,
// 0 < b_i < 1, |h_i(n)| = O(n/lg^2 n), g of polynomial growth, gives
// T(n) = Θ(n^p (1 + ∫_1^n g(u)/u^(p+1) du)) with sum a_i b_i^p = 1.
#ifndef THETAGATE_VERIFIER_DERIVATION_THEOREMS_AKRA_BAZZI_H_
#define THETAGATE_VERIFIER_DERIVATION_THEOREMS_AKRA_BAZZI_H_

#include <utility>
#include <vector>

#include "verifier/derivation/theorems/outcome.h"

namespace thetagate::engine {

// The p with sum a_i b_i^p = 1, certified: exact (a rational, or log_{1/b} of
// sum a_i when all b_i agree) where possible, otherwise a bracket from
// Boost.Math's TOMS 748 on doubles refined by MPFI bisection on demand.
// REQUIRES: every a_i > 0 and 0 < b_i < 1 (throws std::invalid_argument).
RealNumber critical_exponent(const std::vector<std::pair<Rational, Rational>>& terms);

// Θ of ∫_1^n g(u)/u^(p+1) du for g = Θ(g_class) without an exponential
// factor; empty when the result leaves the normal form (lg lg lg n).
std::optional<GrowthClass> akra_bazzi_integral(const GrowthClass& g_class, const RealNumber& p);

TheoremOutcome akra_bazzi(const DerivationInput& input);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_THEOREMS_AKRA_BAZZI_H_
