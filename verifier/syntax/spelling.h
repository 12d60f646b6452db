// Spelling distance for "did you mean" hints (unknown keys, claim names).
#ifndef THETAGATE_VERIFIER_SYNTAX_SPELLING_H_
#define THETAGATE_VERIFIER_SYNTAX_SPELLING_H_

#include <cstddef>
#include <string>

namespace thetagate::engine {

// Levenshtein distance: insertions, deletions and substitutions cost 1.
size_t edit_distance(const std::string& a, const std::string& b);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_SYNTAX_SPELLING_H_
