// The representation behind RealNumber, shared by its three source files:
// real_number.cc (exact values, arithmetic, comparison), real_number_algebraic.cc
// (algebraic numbers and certified enclosures) and real_number_text.cc (text).
// Callers outside those files use verifier/numbers/real_number.h only.
#ifndef THETAGATE_VERIFIER_NUMBERS_REAL_NUMBER_NODE_H_
#define THETAGATE_VERIFIER_NUMBERS_REAL_NUMBER_NODE_H_

#include <functional>
#include <memory>
#include <mutex>
#include <optional>
#include <utility>

#include "verifier/numbers/interval.h"
#include "verifier/numbers/number.h"
#include "verifier/numbers/polynomial.h"
#include "verifier/numbers/real_number.h"

namespace thetagate::engine {

struct RealNumber::Node {
  Kind kind = Kind::kRational;
  Rational q;        // the rational value, or the constant part of a log form
  Rational c, a, g;  // log form: q + c * log_g(a)
  Polynomial p;      // algebraic: squarefree, exactly one root in (lo, hi)
  mutable std::mutex mutex;
  mutable Rational lo, hi;                // lo == hi once bisection has hit the root exactly
  int sign_lo = 0;                        // sign of p just right of lo
  std::function<Interval(long)> enclose;  // enclosed
};

namespace real_number_internal {

using Node = RealNumber::Node;
using Kind = RealNumber::Kind;

// The most bits an enclosure is refined to before a comparison gives up
// (PrecisionShortfall) or digits fall back to an interval.
constexpr long kMaxPrecision = 1 << 14;

inline RealNumber from_node(std::shared_ptr<Node> n) { return RealNumber(std::move(n)); }

// The value of a rational or of an algebraic number whose bisection hit it;
// empty for every other number. Takes the node's lock.
std::optional<Rational> exact_value(const RealNumber& x);

// One bisection step of an algebraic number's isolating interval; no-op once
// lo == hi. REQUIRES: n is algebraic and the caller holds n.mutex.
void bisect_locked(const Node& n);

// Exact order of an algebraic number against a rational, narrowing the
// isolating interval to r as a side effect. REQUIRES: n is algebraic; the
// caller does not hold n.mutex.
int compare_algebraic_rational(const Node& n, const Rational& r);

// Exact order of two algebraic numbers (x is a's node, y is b's), by
// bisecting both; a common factor of their polynomials proves equality.
// Falls back to compare_by_intervals after 4096 steps.
int compare_algebraic(const Node& x, const Node& y, const RealNumber& a, const RealNumber& b);

// Order by enclosures of doubling precision up to kMaxPrecision bits; throws
// PrecisionShortfall when the two still overlap there (equal numbers that no
// exact rule caught, or numbers closer than 2^-16384).
int compare_by_intervals(const RealNumber& a, const RealNumber& b);

}  // namespace real_number_internal
}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_NUMBERS_REAL_NUMBER_NODE_H_
