// Reading a JSON report back: yesterday's `--format json` output becomes the
// baseline that reports/drift.h compares today's run with.
#ifndef THETAGATE_REPORTS_BASELINE_H_
#define THETAGATE_REPORTS_BASELINE_H_

#include <string>

#include "verifier/checking/result.h"

namespace thetagate::engine {

// The RunResult a report of schema_version 1, 2 or 3 (docs/json-schema.md) was
// rendered from. `display_name` (the baseline's path) locates errors.
//
// Required keys: top level `schema_version` (1 to 3), `seed`, `claims`;
// per claim the docs/design.md §6 keys `name`, `file`, `line`, `verdict`,
// `claimed`, `derived`, `method`, `tight`, `witnesses`, `band`, `message`;
// per witness `n`, `ratio`, `side`; per band row `scale`, `low`, `high`.
// The other documented keys are read when present and default to "nothing
// here" when absent, so a hand-trimmed baseline still reads. Unknown keys
// (a later release's, or a report's own "drift") are ignored.
//
// What JSON cannot carry comes back as: a null ratio as NaN, a null band end
// as +inf when its log2 is positive (an overflow), NaN otherwise; an
// error's source line is recovered from its "text". So for every run,
// render_json(read_json_report(render_json(run))) == render_json(run).
//
// Throws InputError for text that is not JSON (located at the bad byte), a
// missing key, a value of the wrong type, an unknown verdict, side, relation or
// theorem kind, or
// another schema_version; the message names the key by its path, e.g.
// `claims[2].witnesses[0].n`, and the location points at the value (or at
// the object that lacks the key).
RunResult read_json_report(const std::string& json_text,
                           const std::string& display_name = "<baseline>");

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_BASELINE_H_
