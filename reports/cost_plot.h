// An inline SVG plot of counted cost / T(n) over n (n on a log scale, the
// ratio on a linear one around 1), for the HTML report's code -> model
// section: a cost a few percent past the model is visible.
#ifndef THETAGATE_REPORTS_COST_PLOT_H_
#define THETAGATE_REPORTS_COST_PLOT_H_

#include <string>

#include "verifier/checking/result.h"

namespace thetagate::engine {

// log2 of a decimal text as the reports write values: "159", "7/2", or an
// interval "[lo, hi]" (its lower end). NaN for zero, negatives and text that
// is none of these.
double log2_of_decimal_text(const std::string& text);

// The plot, or "" when no row has a positive size. The model is the line at
// ratio 1; each row's counted cost over T(n) is a dot, red where it breaks
// the model.
std::string render_cost_plot(const CodeResult& code);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_COST_PLOT_H_
