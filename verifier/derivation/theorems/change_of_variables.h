// Change of variables for T(n) = a T(n^(1/k)) + f(n): with m = lg n and
// S(m) = T(2^m), S(m) = a S(m/k) + f(2^m), which the master theorem solves;
// the answer is translated back (m^x -> lg^x n, lg m -> lg lg n).
#ifndef THETAGATE_VERIFIER_DERIVATION_THEOREMS_CHANGE_OF_VARIABLES_H_
#define THETAGATE_VERIFIER_DERIVATION_THEOREMS_CHANGE_OF_VARIABLES_H_

#include "verifier/derivation/theorems/outcome.h"

namespace thetagate::engine {

TheoremOutcome change_of_variables(const DerivationInput& input);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_THEOREMS_CHANGE_OF_VARIABLES_H_
