// Drift: what changed between a baseline run (a JSON report read back with
// reports/baseline.h) and this run, per claim, as plain values.
// reports/drift.h writes them.
#ifndef THETAGATE_VERIFIER_CHECKING_RUN_COMPARISON_H_
#define THETAGATE_VERIFIER_CHECKING_RUN_COMPARISON_H_

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "verifier/checking/result.h"

namespace thetagate::engine {

// A band end moves when it changes by more than a factor 2^0.5 (about 1.41)
// either way, i.e. by more than 0.5 in log2. Ends found at random sizes
// wobble by less between runs with the same seed and claims; a change in the
// recurrence or in how sizes are chosen moves them by more. Only scales
// present in both runs are compared (a changed max_bits adds or drops whole
// scales, which is not a move).
inline constexpr double kBandMoveLog2 = 0.5;

// One scale whose low or high end moved.
struct BandMove {
  BandRow before;
  BandRow after;
  bool low_moved = false;
  bool high_moved = false;
};

// One claim that drifted. Claims are matched by name and file, the file
// taken relative to its run's root (the deepest folder holding every file of
// the run, after "./" and ".." are resolved by their spelling): `check
// claims` and `check ./claims`, or the tree checked from another folder,
// match. A claim left unmatched then pairs with a baseline claim of the same
// name (its file moved), and then with one of the same recurrence and bound
// in the same file (it was renamed). `file` is this run's path, or the
// baseline's for a lost claim.
struct ClaimDrift {
  std::string name;
  std::string renamed_from;  // the baseline's name of a renamed claim, else ""
  std::string file;
  int line = 0;                   // this run's line; the baseline's for a lost claim
  std::optional<Verdict> before;  // nullopt: a new claim (not in the baseline)
  std::optional<Verdict> after;   // nullopt: a lost claim (not in this run)
  // The claim as written in each run: an edit is the first cause of drift.
  // "" where a run did not record it (a baseline from before reports
  // carried the recurrence): then no edit is reported.
  std::string recurrence_before, recurrence_after;
  std::string claimed_before, claimed_after;
  std::string sizes_before, sizes_after;        // [claim.sizes] as written
  std::string rounding_before, rounding_after;  // the claim's rounding key
  std::string derived_before;                   // "" when none was derived
  std::string derived_after;
  std::vector<Witness> new_witnesses;   // in this run only, matched by n and side
  std::vector<Witness> lost_witnesses;  // in the baseline only
  // In scale order; only when the claim was not edited and g(n) is the
  // same (a new bound or recurrence moves the band by itself).
  std::vector<BandMove> band_moves;

  // How a holds was proved in each run: the theorem ("master theorem, case
  // 2", "comparison with the driver n^2: ..."), or "induction"; "" when the
  // claim did not hold.
  std::string proof_before, proof_after;

  bool is_new() const { return !before; }
  bool is_lost() const { return !after; }
  bool verdict_changed() const { return before && after && *before != *after; }
  bool derived_changed() const { return before && after && derived_before != derived_after; }
  // A claim that held by one proof now holds by another, or no longer has
  // one (a lost proof with a changed verdict is still a proof change).
  bool proof_changed() const {
    return before && after && !proof_before.empty() && proof_before != proof_after;
  }
  bool recurrence_edited() const {
    return before && after && !recurrence_before.empty() && !recurrence_after.empty() &&
           recurrence_before != recurrence_after;
  }
  bool bound_edited() const { return before && after && claimed_before != claimed_after; }
  // Sizes and rounding: only between reports that both carry them (schema 3).
  bool sizes_edited() const {
    return before && after && has_settings && sizes_before != sizes_after;
  }
  bool rounding_edited() const {
    return before && after && has_settings && rounding_before != rounding_after;
  }
  bool has_settings = false;  // both runs' reports say what the claim set
  bool edited() const {
    return recurrence_edited() || bound_edited() || sizes_edited() || rounding_edited();
  }
  bool renamed() const { return !renamed_from.empty(); }
};

struct DriftReport {
  uint64_t baseline_seed = 0;
  uint64_t current_seed = 0;
  size_t compared = 0;             // claims present in both runs
  std::vector<ClaimDrift> claims;  // only claims with a change: this run's order, then lost ones

  bool any() const { return !claims.empty(); }
};

// Every change from `baseline` to `current` (claims matched as ClaimDrift
// says; a repeated copy of a baseline claim is ignored): edits of a claim's
// recurrence or bound, renames, verdicts, new and lost claims,
// new and lost witnesses (by n and side), band moves (kBandMoveLog2) and
// changes of the derived class. Witnesses of a new or lost claim are not
// listed again. With different seeds, witnesses and band ends found at
// random sizes can move for that reason alone; the renderers say so.
DriftReport compare_runs(const RunResult& baseline, const RunResult& current);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_RUN_COMPARISON_H_
