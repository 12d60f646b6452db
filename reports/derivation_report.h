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

// {"derived", "method", "reasons": [...], "steps": [...], "not_applied": [...],
//  "notes": [...]}: `reasons` holds the steps followed by the failed
// hypotheses (docs/design.md §6); the other arrays split them. Ends with a newline.
std::string render_derivation_json(const Derivation& d);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_DERIVATION_REPORT_H_
