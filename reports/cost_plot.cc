#include "reports/cost_plot.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <vector>

namespace thetagate::engine {

namespace {

constexpr double kWidth = 640, kHeight = 300;
constexpr double kLeft = 64, kRight = 20, kTop = 14, kBottom = 40;

// log2 of a run of decimal digits: the leading 17 digits and the rest as a
// power of ten, so thousands of digits stay finite.
double log2_digits(const std::string& digits) {
  size_t start = digits.find_first_not_of('0');
  if (start == std::string::npos) return std::nan("");
  std::string d = digits.substr(start);
  size_t lead = std::min<size_t>(d.size(), 17);
  double mantissa = std::stod(d.substr(0, lead));
  return std::log2(mantissa) + static_cast<double>(d.size() - lead) * std::log2(10.0);
}

bool all_digits(const std::string& s) {
  return !s.empty() && s.find_first_not_of("0123456789") == std::string::npos;
}

}  // namespace

double log2_of_decimal_text(const std::string& text) {
  std::string t = text;
  if (!t.empty() && t.front() == '[') {
    size_t comma = t.find(',');
    if (comma == std::string::npos) return std::nan("");
    t = t.substr(1, comma - 1);
  }
  size_t slash = t.find('/');
  if (slash != std::string::npos) {
    std::string num = t.substr(0, slash), den = t.substr(slash + 1);
    if (!all_digits(num) || !all_digits(den)) return std::nan("");
    return log2_digits(num) - log2_digits(den);
  }
  // An interval end may carry a fraction or an exponent ("1.5e3"): read as a double.
  if (!all_digits(t)) {
    char* end = nullptr;
    double v = std::strtod(t.c_str(), &end);
    if (end == t.c_str() || !(v > 0) || !std::isfinite(v)) return std::nan("");
    return std::log2(v);
  }
  return log2_digits(t);
}

std::string render_cost_plot(const CodeResult& code) {
  struct Point {
    double x, model, cost;
    bool broken;
  };
  std::vector<Point> points;
  for (const CostRow& r : code.rows) {
    double x = log2_of_decimal_text(r.n.str());
    double model = log2_of_decimal_text(r.model);
    double cost = log2_of_decimal_text(r.cost);
    if (!std::isfinite(x)) continue;
    bool broken = relation_broken(code.relation, r.sign);
    points.push_back({x, model, cost, broken});
  }
  if (points.empty()) return "";
  // y: the counted cost over T(n), on a linear scale around 1, so that a
  // cost 2% past the model stands out as clearly as one 10 times past it.
  std::vector<double> ratios;
  double x_lo = points.front().x, x_hi = points.back().x;
  double y_lo = 1, y_hi = 1;
  for (const Point& p : points) {
    double r = std::isfinite(p.model) && std::isfinite(p.cost) ? std::exp2(p.cost - p.model) : NAN;
    ratios.push_back(r);
    if (!std::isfinite(r)) continue;
    y_lo = std::min(y_lo, r);
    y_hi = std::max(y_hi, r);
  }
  if (x_hi - x_lo < 1) x_hi = x_lo + 1;
  x_lo = std::floor(x_lo);
  x_hi = std::ceil(x_hi);
  double pad = std::max((y_hi - y_lo) * 0.1, 0.02);
  y_lo = std::max(0.0, y_lo - pad);
  y_hi += pad;
  const double plot_w = kWidth - kLeft - kRight, plot_h = kHeight - kTop - kBottom;
  auto px = [&](double x) { return kLeft + (x - x_lo) / (x_hi - x_lo) * plot_w; };
  auto py = [&](double y) { return kTop + (1 - (y - y_lo) / (y_hi - y_lo)) * plot_h; };

  std::string svg = fmt::format(
      "<svg class=\"cost-plot\" width=\"{0}\" height=\"{1}\" viewBox=\"0 0 {0} {1}\" "
      "xmlns=\"http://www.w3.org/2000/svg\" role=\"img\" aria-label=\"counted cost over T(n) "
      "against n\">\n",
      kWidth, kHeight);
  svg += fmt::format("<rect class=\"frame\" x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"/>\n",
                     kLeft, kTop, plot_w, plot_h);
  int x_step = std::max(1, static_cast<int>(std::ceil((x_hi - x_lo) / 8)));
  for (double x = x_lo; x <= x_hi + 1e-9; x += x_step) {
    svg += fmt::format(
        "<line class=\"grid\" x1=\"{0:.1f}\" y1=\"{1:.1f}\" x2=\"{0:.1f}\" y2=\"{2:.1f}\"/>"
        "<text class=\"tick\" x=\"{0:.1f}\" y=\"{3:.1f}\" text-anchor=\"middle\">2^{4}</text>\n",
        px(x), kTop, kTop + plot_h, kTop + plot_h + 14, static_cast<int>(x));
  }
  // Ticks at 1, 2 or 5 times a power of ten apart, about five of them.
  double raw = (y_hi - y_lo) / 5;
  double step = std::pow(10.0, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 5.0, 10.0}) {
    if (m * step >= raw) {
      step *= m;
      break;
    }
  }
  for (double y = std::ceil(y_lo / step) * step; y <= y_hi + 1e-9; y += step) {
    svg += fmt::format(
        "<line class=\"grid\" x1=\"{0:.1f}\" y1=\"{1:.1f}\" x2=\"{2:.1f}\" y2=\"{1:.1f}\"/>"
        "<text class=\"tick\" x=\"{3:.1f}\" y=\"{4:.1f}\" text-anchor=\"end\">{5:g}</text>\n",
        kLeft, py(y), kLeft + plot_w, kLeft - 4, py(y) + 4, std::round(y * 1000) / 1000);
  }
  svg += fmt::format(
      "<text class=\"axis\" x=\"{:.1f}\" y=\"{:.1f}\" text-anchor=\"middle\">n</text>\n",
      kLeft + plot_w / 2, kHeight - 6);
  // The model itself: cost = T(n), ratio 1.
  svg += fmt::format(
      "<line class=\"model\" x1=\"{0:.1f}\" y1=\"{1:.1f}\" x2=\"{2:.1f}\" y2=\"{1:.1f}\"/>\n",
      kLeft, py(1), kLeft + plot_w);
  for (size_t i = 0; i < points.size(); ++i) {
    if (!std::isfinite(ratios[i])) continue;
    svg += fmt::format("<circle class=\"{}\" cx=\"{:.1f}\" cy=\"{:.1f}\" r=\"3\"/>\n",
                       points[i].broken ? "counted broken" : "counted", px(points[i].x),
                       py(ratios[i]));
  }
  svg += fmt::format(
      "<text class=\"legend\" x=\"{:.1f}\" y=\"{:.1f}\">dots: counted cost / T(n) ({}); "
      "line: 1, the model</text>\n",
      kLeft + 8, kTop + 14,
      code.relation == ModelRelation::kUpperBound   ? "largest per size"
      : code.relation == ModelRelation::kLowerBound ? "smallest per size"
                                                    : "per size");
  return svg + "</svg>";
}

}  // namespace thetagate::engine
