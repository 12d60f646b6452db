// Change of variables for a root term whose coefficient depends on n:
// T(n) = a(n) T(s(n)) + f(n), s(n) = n^(1/k) or its floor or ceiling, and
// a(n) = c · n^u · (floor or ceil of roots of n)^v. Dividing T by g(n) = n^q,
// q chosen so that r(n) = a(n) g(s(n))/g(n) tends to c, gives
// U(n) = r(n) U(s(n)) + f(n)/g(n); the range of r(n) follows from the
// definition of floor and ceil, and its product along one chain of sizes
// stays between two certified positive constants, so U = Θ(V) with
// V(n) = c V(s(n)) + f(n)/g(n), which the change of variables m = lg n
// solves (docs/design.md, "Change of variables after dividing by a power of n").
#ifndef THETAGATE_VERIFIER_DERIVATION_THEOREMS_NORMALISED_ROOTS_H_
#define THETAGATE_VERIFIER_DERIVATION_THEOREMS_NORMALISED_ROOTS_H_

#include "verifier/derivation/theorems/outcome.h"

namespace thetagate::engine {

// The theorem's name in reports and in Derivation::theorem.
inline constexpr const char* kNormalisedRootsTheorem =
    "change of variables after dividing by a power of n";

// REQUIRES: input.shape has one root term (the others are a failure, not an
// assumption). Where the coefficient is rounded (or the argument is), needs
// input.recursive_from. Sets TheoremOutcome::normalisation when it applies.
TheoremOutcome normalised_change_of_variables(const DerivationInput& input);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_THEOREMS_NORMALISED_ROOTS_H_
