// The exact value of an expression without n: a coefficient, a logarithm's
// base, an exponent such as lg 7 or 1/2. The evaluator uses it for exact
// powers (4^(lg 3) = 9); the derivation for every constant it reasons with.
#ifndef THETAGATE_VERIFIER_EVALUATION_CONSTANT_VALUE_H_
#define THETAGATE_VERIFIER_EVALUATION_CONSTANT_VALUE_H_

#include <optional>
#include <string>

#include "verifier/numbers/real_number.h"
#include "verifier/syntax/expr.h"

namespace thetagate::engine {

// The value of an expression without n, exactly where possible ("lg 7",
// "(1+sqrt(5))/2", "3/2"); empty with `reason` set when it is not a real
// number (lg 0, a negative square root).
std::optional<RealNumber> constant_value(const Expr& e, std::string* reason = nullptr);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_EVALUATION_CONSTANT_VALUE_H_
