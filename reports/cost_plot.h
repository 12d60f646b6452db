// An inline SVG plot of counted costs against T(n) over n (log-log), for the
// HTML report's code -> model section.
#ifndef THETAGATE_REPORTS_COST_PLOT_H_
#define THETAGATE_REPORTS_COST_PLOT_H_

#include <string>

#include "verifier/checking/result.h"

namespace thetagate::engine {

// log2 of a decimal text as the reports write values: "159", "7/2", or an
// interval "[lo, hi]" (its lower end). NaN for zero, negatives and text that
// is none of these.
double log2_of_decimal_text(const std::string& text);

// The plot, or "" when fewer than one row has a positive size and cost. T(n)
// is a line through the rows; each row's counted cost is a dot, red where it
// breaks the model.
std::string render_cost_plot(const CodeResult& code);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_COST_PLOT_H_
