// The report a reviewer pastes into a pull-request comment: Markdown as
// GitHub and other forges render it (CommonMark with the table extension).
//
//   ### thetagate: 3 claims: 1 holds, 1 refuted, 1 undecided, 0 errors
//
//   | Verdict | Claim | Claimed | Derived | Proof or witness |
//   | --- | --- | --- | --- | --- |
//   | **refuted** | orchard::x | O\(n\) | Θ\(n lg n\) by master theorem | witness n = 2^19: ... |
//
//   <details>
//   <summary>refuted: orchard::x</summary>
//   ... where, why, derivation steps, theorems that did not apply, witnesses
//   </details>
//
// One details block per claim that did not hold. Every piece of a claim's
// text (names, notes, messages) is escaped for its place: Markdown
// punctuation in table cells and lists, HTML inside <summary>, so a name
// like "a | b" or "<img src=x>" stays text. Deterministic.
#ifndef THETAGATE_REPORTS_MARKDOWN_REPORT_H_
#define THETAGATE_REPORTS_MARKDOWN_REPORT_H_

#include <string>

#include "verifier/checking/result.h"

namespace thetagate::engine {

std::string render_markdown(const RunResult& run);

// `text` as literal Markdown inline text: control characters written out
// (escape_controls), every ASCII punctuation character that Markdown or a
// forge could read as syntax there backslash-escaped, line breaks as spaces.
std::string markdown_text(const std::string& text);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_MARKDOWN_REPORT_H_
