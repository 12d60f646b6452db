// Full-history recurrences: T(n) = f(n) + (c/n) sum(k, k0, n - 1, T(k)), the
// average-case form of randomised divide and conquer (quicksort's
// comparisons: c = 2, f(n) = n - 1). Differencing n T(n) - (n-1) T(n-1) gives
// the first-order recurrence n T(n) = (n - 1 + c) T(n-1) + g(n) with
// g(n) = n f(n) - (n-1) f(n-1), solved with the summation factor
// pi(n) = prod (j - 1 + c)/j = Θ(n^(c-1)):
//   T(n)/pi(n) = T(n0)/pi(n0) + sum_{j=n0+1..n} g(j)/(j pi(j)).
// With g ~ A n^γ L(n) (L a power of lg n): γ > c - 1 gives T ~ A/(γ - c + 1) n^γ L;
// γ = c - 1 gives T ~ A/(δ+1) n^γ lg^δ n ln n for L = lg^δ n. Knuth, TAOCP
// vol. 3, §5.2.2; Sedgewick & Flajolet, An Introduction to the Analysis of
// Algorithms, ch. 1 and 3.
#ifndef THETAGATE_VERIFIER_DERIVATION_THEOREMS_FULL_HISTORY_H_
#define THETAGATE_VERIFIER_DERIVATION_THEOREMS_FULL_HISTORY_H_

#include "verifier/derivation/theorems/outcome.h"

namespace thetagate::engine {

TheoremOutcome full_history(const DerivationInput& input);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_THEOREMS_FULL_HISTORY_H_
