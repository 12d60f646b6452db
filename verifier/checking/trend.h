// Reading the ratio band across scales: does T(n)/g(n) stay in a band, or
// move up or down (its Direction)? This is the numeric evidence a verdict rests on when no
// theorem applies, and the cross-check when one does.
#ifndef THETAGATE_VERIFIER_CHECKING_TREND_H_
#define THETAGATE_VERIFIER_CHECKING_TREND_H_

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "verifier/checking/result.h"

namespace thetagate::engine {

struct TrendReading {
  EdgeReading high;  // the band's upper edge (largest T/g per scale)
  EdgeReading low;   // the band's lower edge; its "escape" is downward
};

// REQUIRES: band rows sorted by scale, with finite *_log2 fields.
TrendReading read_trend(const std::vector<BandRow>& band);

// log2 of the escape factor: 10^6.
double escape_log2();

// The rows a trend may be read through: scales the size families covered
// (below `partial_scale`, where they stopped, if they did), with at least
// three samples. Where the families stopped, and in the scales c·2^k spills
// into, a row holds one or two shapes (often only even sizes), and its edges
// would bend the trend.
std::vector<BandRow> complete_scales(const std::vector<BandRow>& rows,
                                     std::optional<uint64_t> partial_scale);

// complete_scales plus the scale where the search stopped, when it holds at
// least three samples. Sound for reading an escape only: a partly sampled
// scale's highest ratio can only be below the scale's true highest (and its
// lowest above the true lowest), so an edge that escapes with it escapes
// without the cut too; a steady reading would not be sound.
std::vector<BandRow> scales_for_escape(const std::vector<BandRow>& rows,
                                       std::optional<uint64_t> partial_scale);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_TREND_H_
