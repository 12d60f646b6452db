// The master theorem for T(n) = a T(n/b) + f(n) (Bentley, Haken, Saxe 1980),
// with the polylog extension of case 2 (f = Θ(n^p lg^k n): k > -1, k = -1,
// k < -1; machine-checked in Eberl's Archive of Formal Proofs entry, lemmas
// master2_1..3) and a (lg lg n)^g factor carried along.
#ifndef THETAGATE_VERIFIER_DERIVATION_THEOREMS_MASTER_H_
#define THETAGATE_VERIFIER_DERIVATION_THEOREMS_MASTER_H_

#include "verifier/derivation/theorems/outcome.h"

namespace thetagate::engine {

// What is known about f beyond its class, for case 3's regularity condition
// (verifier/derivation/regularity.h says why the class alone is not enough).
struct RegularityFacts {
  // f(n) ~ C·g(n) for a known constant C > 0 (3n^2 + n, floor(n/2)^2):
  // a f(n/b)/f(n) then tends to a/b^α, which is < 1 in case 3.
  bool equivalent = true;
  // When not equivalent: a regularity bound proved on f itself
  // ("a f(floor(n/2)) <= (3/4) f(n) for every n >= 64, ..."), or empty.
  std::string proved;
  // The bound `proved` states, as data.
  std::optional<RegularityBound> bound;
  // When not equivalent and not proved: the infinite family on which
  // regularity fails, as a sentence, or empty when none was found.
  std::string fails;
};

// The theorem on classes: T(n) = a T(n/divisor) + f(n) with f = Θ(f_class).
// REQUIRES: a >= 1 ... checked: a failure is reported, not assumed.
// Cases 1 and 2 need only the class. Case 3 needs regularity: concluded from
// the limit a/b^α where f ~ C g, taken from `facts.proved` otherwise, and
// failing both, T is compared with the recurrences whose drivers are c₁ g
// and c₂ g (f = Θ(g) bounds f between them for large n; a > 0, so T is
// monotone in f): both are Θ(g) by case 3 on g itself, and so is T. The
// method then reads "comparison with the driver g: master theorem, case 3".
TheoremOutcome master_on_class(const Rational& a, const Rational& divisor,
                               const GrowthClass& f_class, const std::string& f_text,
                               const RegularityFacts& facts = {});

// The master theorem on a recurrence's shape. Where f has no class because
// its cases differ, case 3's regularity condition a f(n/b) <= c f(n) is
// checked on size families (2^k, 2^k +- 1, 3*2^k, b^k, ...) and the sizes
// where a f(floor(n/b)) >= f(n) are reported.
TheoremOutcome master_theorem(const DerivationInput& input);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_THEOREMS_MASTER_H_
