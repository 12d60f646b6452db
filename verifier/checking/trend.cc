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

  // The envelope: how far the running extreme got from the first value,
  // reached in the upper half of the scales (a wobbling edge escapes by its
  // envelope even when half its steps go back).
  size_t extreme = 0;
  for (size_t i = 1; i < y.size(); ++i) {
    if (upper ? y[i] > y[extreme] : y[i] < y[extreme]) extreme = i;
  }
  r.envelope_log2 = y[extreme] - y.front();
  bool envelope_late = extreme >= y.size() / 2;
  r.monotone = monotone >= 0.8;

  double escape = escape_log2();
  bool away = upper ? r.change_log2 >= escape : r.change_log2 <= -escape;
  bool envelope_away =
      envelope_late && (upper ? r.envelope_log2 >= escape : r.envelope_log2 <= -escape);
  if ((away && r.monotone) || envelope_away) {
    r.direction = Direction::kEscapes;
  } else if (std::fabs(r.slope) < kSteadySlope) {
    r.direction = Direction::kSteady;
  } else {
    // Not steady: the slope's sign says which way. (How consistently the
    // steps go that way matters only for an escape, above.)
    r.direction = r.slope > 0 ? Direction::kRising : Direction::kFalling;
  }
  return r;
}

}  // namespace

double escape_log2() { return 6.0 * std::log2(10.0); }

TrendReading read_trend(const std::vector<BandRow>& band) {
  TrendReading t;
  t.high = read_edge(band, true);
  t.low = read_edge(band, false);
  if (t.low.direction == Direction::kEscapes && t.low.change_log2 > 0)
    t.low.direction = Direction::kRising;
  return t;
}

std::vector<BandRow> complete_scales(const std::vector<BandRow>& rows,
                                     std::optional<uint64_t> partial_scale) {
  std::vector<BandRow> out;
  for (const BandRow& row : rows) {
    if ((!partial_scale || row.scale < *partial_scale) && row.samples >= 3) out.push_back(row);
  }
  return out;
}

std::vector<BandRow> scales_for_escape(const std::vector<BandRow>& rows,
                                       std::optional<uint64_t> partial_scale) {
  std::vector<BandRow> out;
  for (const BandRow& row : rows) {
    if ((!partial_scale || row.scale <= *partial_scale) && row.samples >= 3) out.push_back(row);
  }
  return out;
}

}  // namespace thetagate::engine
