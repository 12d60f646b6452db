#include "reports/band_plot.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "reports/number_text.h"
#include "reports/xml_escape.h"

namespace thetagate::engine {

namespace {

constexpr double kLeft = 64, kRight = 72, kTop = 24, kBottom = 40;
// Labels of constant lines closer than this (in pixels) to one already drawn
// are left out; the line keeps its label as a tooltip.
constexpr double kLabelGap = 13;
constexpr size_t kMaxMarkers = 64;

// log2 of a band end: the engine's log2 where it was filled in, else from the
// ratio; NaN when neither is usable.
double end_log2(double ratio, double log2_ratio) {
  bool log2_filled = std::isfinite(log2_ratio) && (log2_ratio != 0 || ratio == 1);
  if (log2_filled) return log2_ratio;
  if (std::isfinite(ratio) && ratio > 0) return std::log2(ratio);
  return std::nan("");
}

struct Point {
  double x, low, high;
};

// A tick step of 1, 2 or 5 times a power of ten giving about `count` ticks.
double nice_step(double span, int count) {
  double raw = span / count;
  double magnitude = std::pow(10.0, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 5.0, 10.0}) {
    if (m * magnitude >= raw) return m * magnitude;
  }
  return 10 * magnitude;
}

std::string ratio_label(double log2_value) {
  if (std::fabs(log2_value) < 20) return format_ratio(std::exp2(log2_value));
  return fmt::format("2^{:.4g}", log2_value);
}

}  // namespace

std::string render_band_plot(const std::vector<BandRow>& band, const std::vector<PlotLine>& lines) {
  std::vector<Point> points;
  for (const BandRow& row : band) {
    double low = end_log2(row.low, row.low_log2);
    double high = end_log2(row.high, row.high_log2);
    if (std::isnan(low) && std::isnan(high)) continue;
    if (std::isnan(low)) low = high;
    if (std::isnan(high)) high = low;
    // x: bits of n (a size at scale k has k + 1 bits).
    points.push_back(
        {static_cast<double>(row.scale + 1), std::min(low, high), std::max(low, high)});
  }
  if (points.empty()) return "";

  double x_min = points.front().x, x_max = points.front().x;
  double y_min = points.front().low, y_max = points.front().high;
  for (const Point& p : points) {
    x_min = std::min(x_min, p.x);
    x_max = std::max(x_max, p.x);
    y_min = std::min(y_min, p.low);
    y_max = std::max(y_max, p.high);
  }
  for (const PlotLine& line : lines) {
    y_min = std::min(y_min, std::log2(line.ratio));
    y_max = std::max(y_max, std::log2(line.ratio));
  }
  if (x_max == x_min) {
    x_min -= 1;
    x_max += 1;
  }
  double y_pad = std::max((y_max - y_min) * 0.08, 0.25);
  y_min -= y_pad;
  y_max += y_pad;

  const double width = kBandPlotWidth, height = kBandPlotHeight;
  const double plot_w = width - kLeft - kRight, plot_h = height - kTop - kBottom;
  auto sx = [&](double x) { return kLeft + (x - x_min) / (x_max - x_min) * plot_w; };
  auto sy = [&](double y) { return kTop + (y_max - y) / (y_max - y_min) * plot_h; };

  std::string svg = fmt::format(
      "<svg class=\"band-plot\" width=\"{0}\" height=\"{1}\" viewBox=\"0 0 {0} {1}\" "
      "role=\"img\" aria-label=\"ratio band: log2 of T(n)/g(n) against size in bits\">\n"
      "<title>ratio band: log2 of T(n)/g(n) against size in bits</title>\n",
      kBandPlotWidth, kBandPlotHeight);
  svg += fmt::format(
      "<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"{:.1f}\" height=\"{:.1f}\" "
      "class=\"frame\"/>\n",
      kLeft, kTop, plot_w, plot_h);

  // Ticks and grid.
  // Sizes in bits are whole numbers: never a fractional tick.
  double x_step = std::max(1.0, nice_step(x_max - x_min, 6));
  for (double x = std::ceil(x_min / x_step) * x_step; x <= x_max + 1e-9; x += x_step) {
    svg += fmt::format(
        "<line class=\"grid\" x1=\"{0:.1f}\" y1=\"{1:.1f}\" x2=\"{0:.1f}\" "
        "y2=\"{2:.1f}\"/><text class=\"tick\" x=\"{0:.1f}\" y=\"{3:.1f}\" "
        "text-anchor=\"middle\">{4}</text>\n",
        sx(x), kTop, kTop + plot_h, kTop + plot_h + 14, fmt::format("{:g}", x));
  }
  double y_step = nice_step(y_max - y_min, 5);
  for (double y = std::ceil(y_min / y_step) * y_step; y <= y_max + 1e-9; y += y_step) {
    svg += fmt::format(
        "<line class=\"grid\" x1=\"{0:.1f}\" y1=\"{1:.1f}\" x2=\"{2:.1f}\" "
        "y2=\"{1:.1f}\"/><text class=\"tick\" x=\"{3:.1f}\" y=\"{4:.1f}\" "
        "text-anchor=\"end\">{5}</text>\n",
        kLeft, sy(y), kLeft + plot_w, kLeft - 4, sy(y) + 4, xml_escape_text(ratio_label(y)));
  }
  svg += fmt::format(
      "<text class=\"axis\" x=\"{:.1f}\" y=\"{:.1f}\" text-anchor=\"middle\">"
      "size n in bits</text>\n",
      kLeft + plot_w / 2, height - 6);
  // Above the plot, where no tick label reaches it.
  svg += fmt::format("<text class=\"axis\" x=\"{:.1f}\" y=\"{:.1f}\">T(n)/g(n), log scale</text>\n",
                     kLeft, kTop - 9);

  // The band, then its two edges.
  std::string band_points, low_points, high_points;
  for (const Point& p : points) {
    high_points += fmt::format("{:.1f},{:.1f} ", sx(p.x), sy(p.high));
    low_points += fmt::format("{:.1f},{:.1f} ", sx(p.x), sy(p.low));
  }
  band_points = high_points;
  for (auto it = points.rbegin(); it != points.rend(); ++it) {
    band_points += fmt::format("{:.1f},{:.1f} ", sx(it->x), sy(it->low));
  }
  band_points.pop_back();
  low_points.pop_back();
  high_points.pop_back();
  svg += "<polygon class=\"band\" points=\"" + band_points + "\"/>\n";
  svg += "<polyline class=\"edge\" points=\"" + high_points + "\"/>\n";
  svg += "<polyline class=\"edge\" points=\"" + low_points + "\"/>\n";
  if (points.size() <= kMaxMarkers) {
    for (const Point& p : points) {
      svg += fmt::format(
          "<circle class=\"mark\" cx=\"{0:.1f}\" cy=\"{1:.1f}\" r=\"2.5\"/>"
          "<circle class=\"mark\" cx=\"{0:.1f}\" cy=\"{2:.1f}\" r=\"2.5\"/>\n",
          sx(p.x), sy(p.high), sy(p.low));
    }
  }

  // Constant lines, labelled in the right margin where a label fits (the
  // first lines first: ratio 1, then the ladder's lowest rungs); every line
  // keeps its label as a tooltip.
  std::vector<double> labelled;
  for (const PlotLine& line : lines) {
    double y = sy(std::log2(line.ratio));
    std::string label = xml_escape_text(line.label);
    svg += fmt::format(
        "<line class=\"constant\" x1=\"{0:.1f}\" y1=\"{1:.1f}\" x2=\"{2:.1f}\" "
        "y2=\"{1:.1f}\"><title>{3}</title></line>",
        kLeft, y, kLeft + plot_w, label);
    bool fits = std::none_of(labelled.begin(), labelled.end(),
                             [&](double other) { return std::fabs(other - y) < kLabelGap; });
    if (fits) {
      labelled.push_back(y);
      svg += fmt::format("<text class=\"constant-label\" x=\"{:.1f}\" y=\"{:.1f}\">{}</text>",
                         kLeft + plot_w + 4, y + 4, label);
    }
    svg += "\n";
  }
  svg += "</svg>";
  return svg;
}

}  // namespace thetagate::engine
