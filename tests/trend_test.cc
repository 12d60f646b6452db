// Reading the direction of a ratio band (verifier/checking/trend.h) on
// hand-built bands: one edge steady, rising, escaping past 10^6 or falling,
// an odd scale that must not tilt it, and too few scales to read at all.
#include "verifier/checking/trend.h"

#include <gtest/gtest.h>
#include <rapidcheck/gtest.h>

#include <cmath>
#include <functional>
#include <vector>

namespace thetagate::engine {
namespace {

// One row per scale in [first, last]; log2 of both edges as given.
std::vector<BandRow> band(uint64_t first, uint64_t last,
                          const std::function<double(uint64_t)>& high_log2,
                          const std::function<double(uint64_t)>& low_log2) {
  std::vector<BandRow> rows;
  for (uint64_t k = first; k <= last; ++k) {
    BandRow r;
    r.scale = k;
    r.high_log2 = high_log2(k);
    r.low_log2 = low_log2(k);
    r.high = std::exp2(r.high_log2);
    r.low = std::exp2(r.low_log2);
    r.samples = 8;
    rows.push_back(r);
  }
  return rows;
}

double flat(uint64_t) { return 0.5; }

TEST(Trend, FlatBandIsSteadyOnBothEdges) {
  // T = Θ(g): T/g stays between constants (the definition of Θ).
  TrendReading t = read_trend(band(1, 64, flat, [](uint64_t) { return -0.5; }));
  EXPECT_EQ(t.high.direction, Direction::kSteady);
  EXPECT_EQ(t.low.direction, Direction::kSteady);
  EXPECT_EQ(t.high.slope, 0.0);
  EXPECT_EQ(t.high.change_log2, 0.0);
  // Scales below 8 are base-case territory once the band reaches 16.
  EXPECT_EQ(t.high.first_scale, 8u);
  EXPECT_EQ(t.high.last_scale, 64u);
}

TEST(Trend, LogFactorRisesWithoutEscaping) {
  // T/g = lg n at n = 2^k is k: log2(T/g) = log2 k, slope 1 against
  // log2(scale), and at most log2 4096 = 12 < log2 10^6 (calc).
  auto lg_scale = [](uint64_t k) { return std::log2(static_cast<double>(k)); };
  TrendReading t = read_trend(band(8, 4096, lg_scale, lg_scale));
  EXPECT_EQ(t.high.direction, Direction::kRising);
  EXPECT_NEAR(t.high.slope, 1.0, 0.01);
  EXPECT_TRUE(t.high.monotone);
  EXPECT_LT(t.high.change_log2, escape_log2());
  // The lower edge rising is away from its escape, which is downward.
  EXPECT_EQ(t.low.direction, Direction::kRising);
}

TEST(Trend, PolynomialFactorEscapesPastTheFactor) {
  // T/g = n at n = 2^k: log2(T/g) = k moves by 56 >= log2 10^6 = 19.93 (calc).
  auto linear = [](uint64_t k) { return static_cast<double>(k); };
  TrendReading t = read_trend(band(8, 64, linear, linear));
  EXPECT_EQ(t.high.direction, Direction::kEscapes);
  EXPECT_DOUBLE_EQ(t.high.change_log2, 56.0);
  EXPECT_NEAR(escape_log2(), 6 * std::log2(10.0), 1e-12);
  // For the lower edge the same move is a rise, not an escape.
  EXPECT_EQ(t.low.direction, Direction::kRising);
}

TEST(Trend, FallingEdgesAndTheLowerEdgesEscape) {
  // T/g = 1/lg n falls; T/g = 2^-k escapes downward (calc as above).
  auto falling = [](uint64_t k) { return -std::log2(static_cast<double>(k)); };
  auto collapsing = [](uint64_t k) { return -static_cast<double>(k); };
  TrendReading t = read_trend(band(8, 4096, falling, falling));
  EXPECT_EQ(t.high.direction, Direction::kFalling);
  EXPECT_EQ(t.low.direction, Direction::kFalling);
  EXPECT_NEAR(t.low.slope, -1.0, 0.01);
  TrendReading c = read_trend(band(8, 64, collapsing, collapsing));
  EXPECT_EQ(c.low.direction, Direction::kEscapes);
  EXPECT_DOUBLE_EQ(c.low.change_log2, -56.0);
}

TEST(Trend, WobblingEdgeEscapesByItsEnvelope) {
  // Up 30 at every other scale in the upper half, back to 0 in between: the
  // last value equals the first, but the running maximum got 30 > 19.93 away.
  auto wobble = [](uint64_t k) { return k >= 36 && k % 2 == 0 ? 30.0 : 0.0; };
  TrendReading t = read_trend(band(8, 64, wobble, flat));
  EXPECT_EQ(t.high.direction, Direction::kEscapes);
  EXPECT_DOUBLE_EQ(t.high.envelope_log2, 30.0);
  EXPECT_FALSE(t.high.monotone);
  EXPECT_EQ(t.low.direction, Direction::kSteady);
}

TEST(Trend, OneOddScaleDoesNotTiltTheSlope) {
  // Theil–Sen's median of pairwise slopes ignores one outlier (common
  // practice; Sen 1968): a flat edge with one spike stays steady.
  auto spike = [](uint64_t k) { return k == 50 ? 8.0 : 0.5; };
  TrendReading t = read_trend(band(8, 64, spike, flat));
  EXPECT_EQ(t.high.direction, Direction::kSteady);
  EXPECT_EQ(t.high.slope, 0.0);
}

TEST(Trend, TooFewScalesAreUnclear) {
  TrendReading t = read_trend(band(8, 10, flat, flat));
  EXPECT_EQ(t.high.direction, Direction::kUnclear);
  EXPECT_EQ(t.low.direction, Direction::kUnclear);
  EXPECT_EQ(t.high.last_scale, 10u);
}

// Rows from scale 16 on: log2 of the upper edge values[i]/16 + shift, of the
// lower edge -values[i]/16 + shift.
std::vector<BandRow> mirrored_rows(const std::vector<int>& values, int shift) {
  std::vector<BandRow> rows;
  for (size_t i = 0; i < values.size(); ++i) {
    BandRow r;
    r.scale = 16 + i;
    r.high_log2 = values[i] / 16.0 + shift;
    r.low_log2 = -values[i] / 16.0 + shift;
    rows.push_back(r);
  }
  return rows;
}

// Multiplying T/g by a constant (adding an integer to every log2) changes no
// reading: Θ ignores constant factors. Values are multiples of 1/16 below
// 2^10, so every difference is exact in a double.
RC_GTEST_PROP(TrendProperty, ConstantFactorChangesNothing, ()) {
  const auto values = *rc::gen::container<std::vector<int>>(*rc::gen::inRange<size_t>(4, 40),
                                                            rc::gen::inRange(-640, 640));
  const int shift = *rc::gen::inRange(-100, 100);
  std::vector<BandRow> a = mirrored_rows(values, 0), b = mirrored_rows(values, shift);
  TrendReading x = read_trend(a), y = read_trend(b);
  RC_ASSERT(x.high.direction == y.high.direction);
  RC_ASSERT(x.low.direction == y.low.direction);
  RC_ASSERT(x.high.slope == y.high.slope);
  RC_ASSERT(x.high.change_log2 == y.high.change_log2);
}

// The lower edge is the upper edge mirrored: reading -y as a lower edge gives
// the negated slope and change, Rising and Falling swapped, except that a
// lower edge never escapes upward (trend.h: its escape is downward). The
// upper half of the scales is chosen to give an odd number of pairwise slopes,
// whose median is one of them: with an even number, the median taken is the
// upper middle one, and that of the negated slopes is not its negation.
RC_GTEST_PROP(TrendProperty, LowerEdgeMirrorsTheUpperEdge, ()) {
  // m scales in the upper half give m (m - 1)/2 slopes: odd for m = 2, 3 mod 4.
  const size_t m = *rc::gen::element<size_t>(2, 3, 6, 7, 10, 11, 14, 15, 18, 19);
  const size_t size = m == 2 ? 4 : 2 * m - *rc::gen::inRange<size_t>(0, 2);
  const auto values = *rc::gen::container<std::vector<int>>(size, rc::gen::inRange(-640, 640));
  TrendReading t = read_trend(mirrored_rows(values, 0));
  RC_ASSERT(t.low.slope == -t.high.slope);
  RC_ASSERT(t.low.change_log2 == -t.high.change_log2);
  RC_ASSERT(t.low.envelope_log2 == -t.high.envelope_log2);
  Direction mirrored = t.high.direction == Direction::kRising    ? Direction::kFalling
                       : t.high.direction == Direction::kFalling ? Direction::kRising
                                                                 : t.high.direction;
  if (mirrored == Direction::kEscapes && t.low.change_log2 > 0) mirrored = Direction::kRising;
  RC_ASSERT(t.low.direction == mirrored);
}

}  // namespace
}  // namespace thetagate::engine
