// Drift: what changed between a baseline run (read back with
// reports/baseline.h) and this run, per claim, and whether the exit code
// should say so. Plain values; the render_* functions write them.
#ifndef THETAGATE_REPORTS_DRIFT_H_
#define THETAGATE_REPORTS_DRIFT_H_

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "reports/text_report.h"
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

// One claim that drifted. Claims are matched by name and file (the path as
// given on the command line, so run nightly jobs from the same folder).
struct ClaimDrift {
  std::string name;
  std::string file;
  int line = 0;                   // this run's line; the baseline's for a lost claim
  std::optional<Verdict> before;  // nullopt: a new claim (not in the baseline)
  std::optional<Verdict> after;   // nullopt: a lost claim (not in this run)
  std::string derived_before;     // "" when none was derived
  std::string derived_after;
  std::vector<Witness> new_witnesses;   // in this run only, matched by n and side
  std::vector<Witness> lost_witnesses;  // in the baseline only
  std::vector<BandMove> band_moves;     // in scale order

  bool is_new() const { return !before; }
  bool is_lost() const { return !after; }
  bool verdict_changed() const { return before && after && *before != *after; }
  bool derived_changed() const { return before && after && derived_before != derived_after; }
};

struct DriftReport {
  uint64_t baseline_seed = 0;
  uint64_t current_seed = 0;
  size_t compared = 0;             // claims present in both runs
  std::vector<ClaimDrift> claims;  // only claims with a change: this run's order, then lost ones

  bool any() const { return !claims.empty(); }
};

// Every change from `baseline` to `current`: verdicts, new and lost claims,
// new and lost witnesses (by n and side), band moves (kBandMoveLog2) and
// changes of the derived class. Witnesses of a new or lost claim are not
// listed again. With different seeds, witnesses and band ends found at
// random sizes can move for that reason alone; the renderers say so.
DriftReport compare_runs(const RunResult& baseline, const RunResult& current);

// A section to append to render_text's output: it starts with a blank line,
// ends with a newline, and is one line when nothing drifted:
//
//   drift against the baseline: 2 of 6 claims changed, 1 new, 0 lost
//   changed    orchard::rope_concat / rotations   claims/ropes.toml:5
//       verdict holds → refuted
//       new witness n = 2048 (upper, ratio 12)
//       band at scale 10: high 1.5 → 3.2
//   new        orchard::sort / merges   claims/sorting.toml:30   refuted
std::string render_drift_text(const DriftReport& drift, const TextStyle& style);

// render_json(run) with one more top-level key, "drift", after "claims":
//   {"baseline_seed", "claims_compared", "band_move_log2", "changed" (bool),
//    "claims": [{"name", "file", "line", "change": "changed"|"new"|"lost",
//                "verdict_before", "verdict_after" ("" when absent),
//                "derived_before", "derived_after",
//                "new_witnesses", "lost_witnesses" (witness objects as in
//                the claims), "band_moves": [{"scale", "before", "after"
//                (band rows as in the claims), "low_moved", "high_moved"}]}]}
// Every key is always present. read_json_report ignores "drift", so today's
// report serves as tomorrow's baseline.
std::string render_json_with_drift(const RunResult& run, const DriftReport& drift);

// What gives a non-zero exit (`--fail-on`). Only the kinds listed count:
// `--fail-on drift` alone lets known refuted claims pass while anything that
// changes fails.
struct FailOn {
  bool refuted = true;
  bool undecided = false;
  bool drift = false;
};

// Parses `--fail-on` values: each is one of refuted, undecided, drift, or a
// comma-separated list of them ("refuted,drift"). REQUIRES: !words.empty().
// Throws InputError naming the bad word (file "--fail-on").
FailOn parse_fail_on(const std::vector<std::string>& words);

// True when the run should exit non-zero (1): a refuted claim with
// on.refuted, an undecided one with on.undecided, any drift with on.drift and
// a non-null `drift`. Claims with verdict error are not counted here: the
// front end exits 2 for them before asking.
bool should_fail(const RunResult& run, const DriftReport* drift, const FailOn& on);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_DRIFT_H_
