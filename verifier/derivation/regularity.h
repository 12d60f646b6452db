// The regularity condition of the master theorem's case 3, a f(n/b) <= c f(n)
// for some c < 1 and all large n, shown to fail on an infinite family of
// sizes: a residue class of n on which a f(floor(n/b)) >= f(n) is proved
// for every member from some size on (certified expansions, per residue;
// verifier/derivation/series.h). Driving functions defined by cases (parity,
// residues) are where a class-based argument cannot decide.
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

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_REGULARITY_H_
