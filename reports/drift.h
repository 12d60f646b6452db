// Writing drift (verifier/checking/run_comparison.h: what changed between a
// baseline run and this one) as text and JSON. The exit policy is the front
// end's (cli/exit_policy.h).
#ifndef THETAGATE_REPORTS_DRIFT_H_
#define THETAGATE_REPORTS_DRIFT_H_

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "reports/text_report.h"
#include "verifier/checking/result.h"
#include "verifier/checking/run_comparison.h"

namespace thetagate::engine {

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

// One claim's part of that section, without colour: its heading line and the
// indented changes ("verdict holds → refuted", witnesses, band moves).
std::string render_claim_drift_text(const ClaimDrift& d);

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

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_DRIFT_H_
