// Double-precision evaluation of an expression in n, for ratio bands only:
// tens of thousands of sizes need log2 g(n) to a few digits, and MPFR
// logarithms dominated that cost. Every verdict-deciding comparison stays
// exact (Evaluator::compare_at).
#ifndef THETAGATE_VERIFIER_EVALUATION_APPROXIMATE_H_
#define THETAGATE_VERIFIER_EVALUATION_APPROXIMATE_H_

#include <cstdint>
#include <optional>

#include "verifier/numbers/number.h"
#include "verifier/syntax/expr.h"

namespace thetagate::engine {

// The value of `e` at n to about double precision, or nullopt where a double
// cannot be trusted: n >= 2^50, calls other than builtins, a floor or
// ceiling of an irrational value close to a whole number, mod of
// non-integers, a domain error, or a result that is not finite.
std::optional<double> approximate(const Expr& e, int64_t n);

// log2 e(n) for any n, computed on logarithms (sign and log2 of the
// magnitude), so sizes of thousands of bits cost no big arithmetic. Accurate
// to about 1e-12 in log2, or nullopt where that cannot be promised: e(n) not
// positive, a difference of nearly equal terms, mod, a floor or ceiling of a
// small irrational value, calls other than builtins, or a domain error.
std::optional<double> approximate_log2(const Expr& e, const BigInt& n);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_EVALUATION_APPROXIMATE_H_
