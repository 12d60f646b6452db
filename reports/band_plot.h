// An inline SVG plot of a ratio band: x is the size in bits (the scale k),
// y is log2 of T(n)/g(n); the band between the low and high ends is filled,
// and horizontal lines mark constants (ratio 1, witness-ladder factors).
#ifndef THETAGATE_REPORTS_BAND_PLOT_H_
#define THETAGATE_REPORTS_BAND_PLOT_H_

#include <string>
#include <vector>

#include "verifier/checking/result.h"

namespace thetagate::engine {

struct PlotLine {
  double ratio = 1;   // where: T(n)/g(n) == ratio; REQUIRES: ratio > 0
  std::string label;  // "c = 1000"
};

// A complete <svg> element with explicit width and height (no external
// references, no script), or "" when no row has a finite end. Rows whose ends
// overflow a double are placed by their log2. Deterministic.
std::string render_band_plot(const std::vector<BandRow>& band, const std::vector<PlotLine>& lines);

// Plot size in CSS pixels, for readers that check the layout.
inline constexpr int kBandPlotWidth = 640;
inline constexpr int kBandPlotHeight = 260;

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_BAND_PLOT_H_
