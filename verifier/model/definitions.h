// The recurrence grammar: one definition per line ("T(n) = 2T(n/2) + n",
// "T(1) = 0", "f(n) = n^2 if n odd", "T(n) = n otherwise"). Lines are split
// by line breaks or ';'. Meaning (which function recurses, base cases,
// well-formedness) is recurrence.h's job.
#ifndef THETAGATE_VERIFIER_MODEL_DEFINITIONS_H_
#define THETAGATE_VERIFIER_MODEL_DEFINITIONS_H_

#include <optional>
#include <string>
#include <vector>

#include "verifier/syntax/expr.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {

struct Definition {
  std::string function;         // "T", "f", ...
  size_t name_pos = 0;          // byte offset of the function name
  std::optional<BigInt> point;  // T(1) = 0: the point 1; empty for T(n)
  ExprPtr body;
  ExprPtr condition;       // after 'if'; null when absent
  bool otherwise = false;  // written with 'otherwise'
};

// REQUIRES: nothing. Throws InputError with the position of the first
// malformed line.
std::vector<Definition> parse_definitions(const SourceText& source);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_MODEL_DEFINITIONS_H_
