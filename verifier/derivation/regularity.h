// The regularity condition of the master theorem's case 3, a f(n/b) <= c f(n)
// for some c < 1 and all large n, decided on f itself rather than on its
// growth class.
//
// Why not on the class: f = Θ(g) fixes f only up to constant factors, and
// a f(n/b)/f(n) may then have no limit, or a limit >= 1 on a residue class.
// Example: f(n) = n^2 for even n and n^2/8 for odd n is Θ(n^2), yet at every
// n = 1 (mod 4), floor(n/2) is even and f(floor(n/2)) = (n-1)^2/4 > 2 f(n)
// for n >= 9. Only where f(n) ~ C g(n) with a known C > 0 does the ratio
// tend to a/b^α, and the master theorem then concludes from the class alone.
//
// Both directions work per residue class of n (drivers defined by parity or
// residues are exact there) with the certified expansions of
// verifier/derivation/series.h, and read n/b as floor(n/b).
//   - regularity_failure_family: a residue class on which
//     a f(floor(n/b)) >= f(n) holds for every member from some size on.
//   - prove_regularity: a f(floor(n/b)) <= c f(n) on every residue class.
#ifndef THETAGATE_VERIFIER_DERIVATION_REGULARITY_H_
#define THETAGATE_VERIFIER_DERIVATION_REGULARITY_H_

#include <cstdint>
#include <optional>

#include "verifier/derivation/classify.h"
#include "verifier/numbers/number.h"
#include "verifier/syntax/expr.h"

namespace thetagate::engine {

struct RegularityFamily {
  uint64_t modulus = 1;  // every n = residue (mod modulus) with n >= from
  uint64_t residue = 0;
  BigInt from;
};

// A family of sizes where a·f(floor(n·scale)) >= f(n), or nullopt when
// none is found within `work_budget` units. `driving` is f(n) (it may call
// helpers with case lines); REQUIRES: 0 < scale < 1, a > 0.
std::optional<RegularityFamily> regularity_failure_family(const Expr& driving, const Rational& a,
                                                          const Rational& scale,
                                                          const HelperTable* helpers,
                                                          uint64_t work_budget = 2000);

// A proof that a·f(floor(n·scale)) <= c·f(n) for every integer n >= from:
// c·f(n) - a·f(floor(n·scale)) >= 0 proved on each of the `modulus` residue
// classes of n.
struct RegularityBound {
  Rational c;
  BigInt from;
  uint64_t modulus = 1;
};

// Tries c = 1/2, 3/4, 7/8, 15/16 in turn and returns the first bound proved,
// or nullopt when none is proved within `work_budget` units per try.
// REQUIRES: 0 < scale < 1, a > 0.
std::optional<RegularityBound> prove_regularity(const Expr& driving, const Rational& a,
                                                const Rational& scale, const HelperTable* helpers,
                                                uint64_t work_budget = 2000);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_REGULARITY_H_
