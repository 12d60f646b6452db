// Reading the ratio band across scales: does T(n)/g(n) stay in a band, or
// drift up or down? This is the numeric evidence a verdict rests on when no
// theorem applies, and the cross-check when one does.
#ifndef THETAGATE_VERIFIER_CHECKING_TREND_H_
#define THETAGATE_VERIFIER_CHECKING_TREND_H_

#include <string>
#include <vector>

#include "verifier/checking/result.h"

namespace thetagate::engine {

enum class Drift {
  kSteady,   // no trend over the upper half of the scales
  kRising,   // grows, but not (yet) past the escape factor
  kFalling,  // shrinks, but not (yet) past the escape factor
  kEscapes,  // moves monotonically past the escape factor (10^6)
  kUnclear,  // too few scales, or no consistent direction
};
const char* drift_name(Drift d);

struct EdgeReading {
  Drift drift = Drift::kUnclear;
  double slope = 0;        // d log2(edge) / d log2(scale) over the upper half
  double change_log2 = 0;  // log2(edge at largest scale / edge at first scale >= 8)
  uint64_t first_scale = 0;
  uint64_t last_scale = 0;
};

struct TrendReading {
  EdgeReading high;  // the band's upper edge (largest T/g per scale)
  EdgeReading low;   // the band's lower edge; its "escape" is downward
};

// REQUIRES: band rows sorted by scale, with finite *_log2 fields.
TrendReading read_trend(const std::vector<BandRow>& band);

// A sentence for reports: "T(n)/g(n) rises steadily, ×12.0 from 2^8 to
// 2^4095 (slope 1.00 against lg n: like a factor lg n)".
std::string describe_edge(const EdgeReading& e, const char* edge_name);

// log2 of the escape factor: 10^6.
double escape_log2();

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_TREND_H_
