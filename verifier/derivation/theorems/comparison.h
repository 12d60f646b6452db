// Bounds by comparison: f lies between c₁·lower and c₂·upper for large n
// (every case line of f is of a class between the two, or f has O/Ω terms),
// and T's recursion has positive coefficients, so T is monotone in f and lies
// between the solutions of the same recursion driven by those bounds (their
// base values adjusted for the finitely many smaller n). A theorem solves
// each side on its class.
#ifndef THETAGATE_VERIFIER_DERIVATION_THEOREMS_COMPARISON_H_
#define THETAGATE_VERIFIER_DERIVATION_THEOREMS_COMPARISON_H_

#include <functional>
#include <string>

#include "verifier/derivation/theorems/outcome.h"

namespace thetagate::engine {

// Sets the one-sided bounds of `out` (which stays without a Θ class), its
// bounds_steps and bounds_method ("comparison with the drivers 0 and n:
// <theorem>"). `solve(g)` is the theorem on the driver class g, or on f = 0
// when g is null; an outcome that does not apply gives no bound on its side.
// A missing upper driver (an Ω term) gives a lower bound only; a zero lower
// driver (f is only O(g)) leaves the lower side to the leaves, which `solve`
// concludes only where every base value is positive.
void bound_by_comparison(const DerivationInput& input, const std::string& theorem,
                         const std::function<TheoremOutcome(const GrowthClass*)>& solve,
                         TheoremOutcome& out);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_THEOREMS_COMPARISON_H_
