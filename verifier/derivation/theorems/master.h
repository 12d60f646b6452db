// The master theorem for T(n) = a T(n/b) + f(n) (Bentley, Haken, Saxe 1980),
// with the polylog extension of case 2 (f = Θ(n^p lg^k n): k > -1, k = -1,
// k < -1; machine-checked in Eberl's Archive of Formal Proofs entry, lemmas
// master2_1..3) and a (lg lg n)^g factor carried along.
#ifndef THETAGATE_VERIFIER_DERIVATION_THEOREMS_MASTER_H_
#define THETAGATE_VERIFIER_DERIVATION_THEOREMS_MASTER_H_

#include "verifier/derivation/theorems/outcome.h"

namespace thetagate::engine {

// The theorem on classes alone: T(n) = a T(n/divisor) + f(n) with f = Θ(f_class).
// REQUIRES: a >= 1 ... checked: a failure is reported, not assumed.
// Regularity in case 3 is decided symbolically (a b^-alpha < 1 follows from
// alpha > p for normal-form f).
TheoremOutcome master_on_class(const Rational& a, const Rational& divisor,
                               const GrowthClass& f_class, const std::string& f_text);

// The master theorem on a recurrence's shape. Where f has no class because
// its cases differ, case 3's regularity condition a f(n/b) <= c f(n) is
// checked on size families (2^k, 2^k +- 1, 3*2^k, b^k, ...) and the sizes
// where a f(floor(n/b)) >= f(n) are reported.
TheoremOutcome master_theorem(const DerivationInput& input);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_THEOREMS_MASTER_H_
