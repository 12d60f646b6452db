// Subtract-and-conquer: T(n) = a T(n - b) + f(n) with a > 0, b >= 1 and
// f = Θ(n^k (lg n)^β ...) of polynomial growth or decay (any real k):
// a < 1 -> Θ(f); a = 1 -> the driver summed, Θ(∫ f): Θ(n f(n)) for k > -1,
// Θ(lg n) for f = 1/n (the harmonic numbers), Θ(1) for k < -1;
// a > 1 -> Θ(a^(n/b)). Common practice; no peer-reviewed source: the
// derivation is in subtract.cc.
#ifndef THETAGATE_VERIFIER_DERIVATION_THEOREMS_SUBTRACT_H_
#define THETAGATE_VERIFIER_DERIVATION_THEOREMS_SUBTRACT_H_

#include "verifier/derivation/theorems/outcome.h"

namespace thetagate::engine {

TheoremOutcome subtract_and_conquer(const DerivationInput& input);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_THEOREMS_SUBTRACT_H_
