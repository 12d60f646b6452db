// Local search within one dyadic scale: from a starting size, move to nearby
// sizes of the same scale [2^k, 2^(k+1)) to push a score (typically
// T(n)/g(n)) up, or down for lower bounds. Family members land on a fixed
// grid of shapes; a bound set just below a peak can fail only inside a window
// a few parts per thousand wide between two powers, and this is what finds
// such windows.
//
// Method (common practice: pattern search followed by hill climbing with
// random restarts of the neighbourhood), deterministic for a given seed and
// score:
//   1. coarse to fine: for i = k−1 down to max(0, k−62), move by ±2^i while
//      that improves the score (the score is a double, so steps below
//      2^(k−62) cannot change it for a smooth ratio);
//   2. fine: first-improvement hill climbing over n ± 1..max_step and every
//      single flip of the lowest 64 bits (parity and residue effects), until
//      a full pass gains nothing;
//   3. kicks: while evaluations remain, flip one or two uniformly chosen bits
//      below the leading one (splitmix64 from the seed) and keep improvements.
// Every evaluated n stays in the starting scale; the leading bit never moves.
#ifndef THETAGATE_GENERATORS_LOCAL_SEARCH_H_
#define THETAGATE_GENERATORS_LOCAL_SEARCH_H_

#include <cstdint>
#include <functional>
#include <optional>

#include "verifier/numbers/number.h"

namespace thetagate::engine {

// The score of a size, or nullopt where it cannot be evaluated (outside the
// recurrence's domain, over budget). Called at most max_evaluations times.
// It may throw StopSearch when the caller's work allowance is spent: the
// search ends there and keeps its best size.
using SizeScore = std::function<std::optional<double>(const BigInt&)>;
struct StopSearch {};

struct LocalSearchOptions {
  uint64_t seed = 0;
  uint64_t max_evaluations = 256;  // per call, that is per scale
  uint64_t max_step = 16;          // the ±1..±max_step moves of phase 2
  bool maximise = true;            // false: push the score down
};

struct LocalSearchResult {
  BigInt n;                  // the best size found (the start if nothing beat it)
  double score = 0;          // its score, as the callback returned it
  uint64_t evaluations = 0;  // callback calls made
};

// Searches the scale of `start`. Returns nullopt if no evaluated size had a
// score. Ties never move, so the start is kept unless strictly beaten.
// REQUIRES: start >= 1, max_evaluations >= 1.
std::optional<LocalSearchResult> local_search(const BigInt& start, const SizeScore& score,
                                              const LocalSearchOptions& options);

}  // namespace thetagate::engine

#endif  // THETAGATE_GENERATORS_LOCAL_SEARCH_H_
