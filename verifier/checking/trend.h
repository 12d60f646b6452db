// Reading the ratio band across scales: does T(n)/g(n) stay in a band, or
// move up or down (its Direction)? This is the numeric evidence a verdict rests on when no
// theorem applies, and the cross-check when one does.
#ifndef THETAGATE_VERIFIER_CHECKING_TREND_H_
#define THETAGATE_VERIFIER_CHECKING_TREND_H_

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

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_TREND_H_
