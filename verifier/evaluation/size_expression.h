// Sizes written as constant expressions ("2^4096 + 7", "3*2^50"): on the
// command line, in a claim's min_n, through the public API.
#ifndef THETAGATE_VERIFIER_EVALUATION_SIZE_EXPRESSION_H_
#define THETAGATE_VERIFIER_EVALUATION_SIZE_EXPRESSION_H_

#include <string>

#include "verifier/numbers/number.h"

namespace thetagate::engine {

// The value of a constant expression, exactly. Throws InputError, located
// in `origin`, for a non-integer, negative, or n-dependent expression.
BigInt evaluate_size(const std::string& text, const std::string& origin = "<size>");

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_EVALUATION_SIZE_EXPRESSION_H_
