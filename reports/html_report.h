// The report as one self-contained HTML page: inline CSS and SVG, no script,
// no network. Per claim: the verdict, claimed and derived bounds, the
// message, the derivation steps, assumptions, the located error, a witness
// table and a plot of the ratio band across scales (reports/band_plot.h).
#ifndef THETAGATE_REPORTS_HTML_REPORT_H_
#define THETAGATE_REPORTS_HTML_REPORT_H_

#include <string>

#include "verifier/checking/result.h"
#include "verifier/checking/run_comparison.h"

namespace thetagate::engine {

// A complete HTML5 document (UTF-8) ending with a newline. Every claim gets a
// <section id="claim-N"> (N from 1, in run order); a claim with a ratio band
// gets one <svg class="band-plot">. Deterministic: no dates, no host names.
// With `drift` (a run compared with its baseline), a "Changes since the
// baseline" section comes first after the header: one <details> per drifted
// claim, its changes as the text report words them, edits first.
std::string render_html(const RunResult& run, const DriftReport* drift = nullptr);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_HTML_REPORT_H_
