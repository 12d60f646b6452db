// The search stage of a claim's check: evaluate T(n) at every size the
// families give, push each scale's band edge outward by local search, and
// turn what breaks the bound into witnesses certified exactly: an explicit
// bound's first break on each side (shrunk toward the smallest such n), an
// asymptotic bound's ladder rungs (T(n) > c·g(n) for c = 10, 100, ...).
// The search decides nothing: claim_proof.h and verdict.h read its outcome.
// Internal to verifier/checking.
#ifndef THETAGATE_VERIFIER_CHECKING_WITNESS_SEARCH_H_
#define THETAGATE_VERIFIER_CHECKING_WITNESS_SEARCH_H_

#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "generators/size_family.h"
#include "verifier/checking/claim_evaluation.h"
#include "verifier/checking/result.h"

namespace thetagate::engine::checker_internal {

// One evaluated size and its ratio log2(T(n)/reference(n)).
struct Sample {
  BigInt n;
  std::string family;  // the size family that gave n, or "local-search"
  double log2_ratio = 0;
};

// Per-scale minimum and maximum of log2(T/g).
class BandBuilder {
 public:
  // Widens the row of n's scale (floor(lg n)) to take in log2_ratio.
  void add(const BigInt& n, double log2_ratio);
  // The rows in increasing scale, with low and high filled from their logs.
  std::vector<BandRow> rows() const;
  bool empty() const { return rows_.empty(); }

 private:
  std::map<uint64_t, BandRow> rows_;
};

struct SearchOutcome {
  // The ratio band for the report: an asymptotic bound's over every side's
  // samples, an explicit bound's over its first side's.
  std::vector<BandRow> band;
  // Every side's samples, local search's included (asymptotic bounds; the
  // consistency check reads them).
  std::vector<Sample> samples;
  // Explicit bounds: each side's first certified break, shrunk.
  std::vector<Witness> breaks;
  // Asymptotic bounds: each side's certified ladder rungs, c = 10, 100, ...
  std::vector<Witness> rungs;
  // The scale where the size families stopped (work or a limit), if they did.
  std::optional<uint64_t> partial_scale;
  bool any_samples = false;
  std::vector<std::string> notes;  // "local search stopped at 812 bits: work budget"
};

// Runs the search over `sizes` (ascending) for the claim `eval` evaluates:
// the sides its bound has (Θ: both), with the work shares of WorkShares.
// Throws InputError where the bound is malformed at a size (a class that is
// not positive for large n).
SearchOutcome search_witnesses(ClaimEvaluation& eval, const std::vector<Size>& sizes);

}  // namespace thetagate::engine::checker_internal

#endif  // THETAGATE_VERIFIER_CHECKING_WITNESS_SEARCH_H_
