// The report as one self-contained HTML page: inline CSS and SVG, no script,
// no network. Per claim: the verdict, claimed and derived bounds, the
// message, the derivation steps, assumptions, the located error, a witness
// table and a plot of the ratio band across scales (reports/band_plot.h).
#ifndef THETAGATE_REPORTS_HTML_REPORT_H_
#define THETAGATE_REPORTS_HTML_REPORT_H_

#include <string>

#include "verifier/checking/result.h"

namespace thetagate::engine {

// A complete HTML5 document (UTF-8) ending with a newline. Every claim gets a
// <section id="claim-N"> (N from 1, in run order); a claim with a ratio band
// gets one <svg class="band-plot">. Deterministic: no dates, no host names.
std::string render_html(const RunResult& run);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_HTML_REPORT_H_
