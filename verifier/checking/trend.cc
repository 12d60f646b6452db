#include "verifier/checking/trend.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace thetagate::engine {

namespace {

// Scales below this are dominated by base cases, not by growth.
constexpr uint64_t kFirstTrendScale = 8;
// |slope| below this against lg(scale) is no trend: a lg lg n factor has
// slope about 0.14 at 1000 bits, a convergent one like 1 - c/lg n far less.
constexpr double kSteadySlope = 0.05;

EdgeReading read_edge(const std::vector<BandRow>& band, bool upper) {
  EdgeReading r;
  std::vector<double> x, y;
  for (const BandRow& row : band) {
    if (row.scale < kFirstTrendScale && band.back().scale >= 2 * kFirstTrendScale) continue;
    double v = upper ? row.high_log2 : row.low_log2;
    if (!std::isfinite(v)) continue;
    x.push_back(std::log2(static_cast<double>(row.scale) + 1.0));
    y.push_back(v);
    if (r.first_scale == 0 && x.size() == 1) r.first_scale = row.scale;
    r.last_scale = row.scale;
  }
  if (x.size() < 4) return r;
  r.change_log2 = y.back() - y.front();

  // Monotone steps, with a little slack for oscillation inside a scale.
  size_t with = 0, against = 0;
  for (size_t i = 1; i < y.size(); ++i) {
    double step = y[i] - y[i - 1];
    bool forward = upper ? step >= -0.05 : step <= 0.05;
    (forward ? with : against) += 1;
  }
  double monotone = static_cast<double>(with) / static_cast<double>(with + against);

  // Theil–Sen slope (the median of pairwise slopes) over the upper half of
  // the scales, in lg(scale): one odd scale cannot tilt it, as it can a
  // least-squares fit.
  size_t from = x.size() / 2;
  std::vector<double> slopes;
  for (size_t i = from; i < x.size(); ++i) {
    for (size_t j = i + 1; j < x.size(); ++j) {
      if (x[j] - x[i] > 1e-12) slopes.push_back((y[j] - y[i]) / (x[j] - x[i]));
    }
  }
  if (!slopes.empty()) {
    std::nth_element(slopes.begin(), slopes.begin() + static_cast<long>(slopes.size() / 2),
                     slopes.end());
    r.slope = slopes[slopes.size() / 2];
  }

  double escape = escape_log2();
  bool away = upper ? r.change_log2 >= escape : r.change_log2 <= -escape;
  if (away && monotone >= 0.8) {
    r.drift = Drift::kEscapes;
  } else if (std::fabs(r.slope) < kSteadySlope) {
    r.drift = Drift::kSteady;
  } else if (r.slope > 0 && monotone >= 0.7) {
    r.drift = upper ? Drift::kRising : Drift::kRising;
  } else if (r.slope < 0 && (upper ? monotone <= 0.3 : monotone >= 0.7)) {
    r.drift = Drift::kFalling;
  } else {
    r.drift = r.slope > 0 ? Drift::kRising : Drift::kFalling;
  }
  return r;
}

}  // namespace

double escape_log2() { return 6.0 * std::log2(10.0); }

const char* drift_name(Drift d) {
  switch (d) {
    case Drift::kSteady:
      return "steady";
    case Drift::kRising:
      return "rising";
    case Drift::kFalling:
      return "falling";
    case Drift::kEscapes:
      return "escaping";
    case Drift::kUnclear:
      return "unclear";
  }
  return "?";
}

TrendReading read_trend(const std::vector<BandRow>& band) {
  TrendReading t;
  t.high = read_edge(band, true);
  t.low = read_edge(band, false);
  if (t.low.drift == Drift::kEscapes && t.low.change_log2 > 0) t.low.drift = Drift::kRising;
  return t;
}

std::string describe_edge(const EdgeReading& e, const char* edge_name) {
  if (e.drift == Drift::kUnclear) {
    return fmt::format("the {} edge of T(n)/g(n) has too few scales to read a trend", edge_name);
  }
  double factor = std::exp2(e.change_log2);
  std::string change = std::fabs(e.change_log2) < 60 ? fmt::format("×{:.3g}", factor)
                                                     : fmt::format("×2^{:.0f}", e.change_log2);
  std::string like;
  if (e.drift != Drift::kSteady) {
    if (std::fabs(e.slope - 1) < 0.25)
      like = ": like a factor lg n";
    else if (std::fabs(e.slope + 1) < 0.25)
      like = ": like a factor 1/lg n";
    else if (std::fabs(e.slope) < 0.35)
      like = ": like a factor lg lg n or a slowly converging term";
    else if (e.slope > 3)
      like = ": faster than any power of lg n";
  }
  return fmt::format(
      "the {} edge of T(n)/g(n) is {} ({} from 2^{} to 2^{}; slope {:.2f} against lg n){}",
      edge_name, drift_name(e.drift), change, e.first_scale, e.last_scale, e.slope, like);
}

}  // namespace thetagate::engine
