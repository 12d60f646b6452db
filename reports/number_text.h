// Short, human-readable text for huge numbers and ratios. Only the
// human-facing writers (text, HTML) shorten; JSON and JUnit keep every digit.
#ifndef THETAGATE_REPORTS_NUMBER_TEXT_H_
#define THETAGATE_REPORTS_NUMBER_TEXT_H_

#include <string>

#include "verifier/numbers/number.h"

namespace thetagate::engine {

// A size as a person wants to read it. Promises, in order of preference:
//   - near c*2^k (c odd, c < 16) or 10^k, with an offset tiny beside n:
//     "2^4096+7", "3*2^100-1", "10^30" — text `thetagate eval` accepts back;
//   - up to 30 digits: every digit;
//   - otherwise the first and last digits and the count:
//     "123456…789012 (1234 digits)".
std::string short_decimal(const BigInt& n);

// An exact value as the engine writes it ("159", "7/2", "[lo, hi]") with
// every run of more than 30 digits shortened as short_decimal does.
std::string short_value(const std::string& text);

// A witness value for a person: an exact fraction p/q reads as its decimal
// approximation first, then the fraction itself when short or its size
// ("≈ 6090.37 (= 48723/8)", "≈ 1.21563e+40 (exact: a fraction of 61 and
// 22 digits)"); anything else as short_value does.
std::string readable_value(const std::string& text);

// p/q to 6 significant digits ("6090.37", "-0.125", "1.21563e+40").
// REQUIRES: q > 0.
std::string approximate_fraction(const BigInt& p, const BigInt& q);

// A ratio with 4 significant digits ("1.5", "2.048e+06"); "inf", "-inf" or
// "nan" when not finite.
std::string format_ratio(double ratio);

// A ratio band end: format_ratio(ratio) while the double holds it, else
// "2^E" from its log2 (a ratio that overflows or underflows a double, as
// exponential bounds at 4096 bits do).
std::string format_band_ratio(double ratio, double log2_ratio);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_NUMBER_TEXT_H_
