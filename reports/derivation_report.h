// Renders a derivation (`thetagate derive`): the derived class, the steps a
// reviewer can follow, and why each other theorem did not apply.
#ifndef THETAGATE_REPORTS_DERIVATION_REPORT_H_
#define THETAGATE_REPORTS_DERIVATION_REPORT_H_

#include <string>

#include "verifier/derivation/derive.h"

namespace thetagate::engine {

// Numbered steps, then "did not apply:" with one line per theorem. Ends
// with a newline.
std::string render_derivation_text(const Derivation& d);

// {"derived", "method", "steps": [...], ["upper", "lower",]
//  "failed_hypotheses": [...], "notes": [...]}: the keys and their meaning
// are those of a claim in the JSON check report (docs/json-schema.md). Ends
// with a newline.
std::string render_derivation_json(const Derivation& d);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_DERIVATION_REPORT_H_
