// Linear recurrences with constant coefficients, T(n) = sum_j c_j T(n - j) +
// P(n) with P a polynomial (Neapolitan, Naimipour, Foundations of
// Algorithms, appendix B). The answer depends on the initial values: the
// roots whose coefficient is zero for them are removed exactly (the
// generating function N/Q reduced by gcd(N, Q)), then the dominant root of
// what is left decides: Θ(n^(m-1) r^n) for a positive real r of
// multiplicity m, no Θ of that form when roots of equal modulus oscillate.
#ifndef THETAGATE_VERIFIER_DERIVATION_THEOREMS_LINEAR_H_
#define THETAGATE_VERIFIER_DERIVATION_THEOREMS_LINEAR_H_

#include <vector>

#include "verifier/derivation/theorems/outcome.h"
#include "verifier/numbers/polynomial.h"

namespace thetagate::engine {

// The characteristic polynomial of the part of `values` that really occurs:
// values[i] satisfy the recurrence with characteristic polynomial `c` for
// i >= deg c. REQUIRES: values.size() >= deg c.
Polynomial active_polynomial(const Polynomial& c, const std::vector<Rational>& values);

TheoremOutcome linear_recurrence(const DerivationInput& input);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_THEOREMS_LINEAR_H_
