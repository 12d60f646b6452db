// Subtract-and-conquer: T(n) = a T(n - b) + f(n) with a > 0, b >= 1 and
// f = Θ(n^k (lg n)^β ...) non-decreasing of polynomial growth (k >= 0):
// a < 1 -> Θ(f); a = 1 -> Θ(n f(n)); a > 1 -> Θ(a^(n/b)). Common practice;
// no peer-reviewed source: the derivation is in subtract.cc.
#ifndef THETAGATE_VERIFIER_DERIVATION_THEOREMS_SUBTRACT_H_
#define THETAGATE_VERIFIER_DERIVATION_THEOREMS_SUBTRACT_H_

#include "verifier/derivation/theorems/outcome.h"

namespace thetagate::engine {

TheoremOutcome subtract_and_conquer(const DerivationInput& input);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_THEOREMS_SUBTRACT_H_
