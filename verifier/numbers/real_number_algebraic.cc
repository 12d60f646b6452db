// Where exactness runs out: real algebraic numbers, held as a squarefree
// polynomial with an isolating interval that bisection narrows on demand, and
// certified enclosures of every kind of RealNumber. Comparisons that the exact
// rules in real_number.cc cannot settle end here: an algebraic number against
// a rational evaluates the polynomial's sign exactly; two algebraic numbers
// bisect together; anything else is refined with intervals until decided.
#include <mpfi.h>
#include <mpfr.h>

#include <algorithm>
#include <mutex>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

#include "verifier/numbers/real_number.h"
#include "verifier/numbers/real_number_node.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine {

using real_number_internal::bisect_locked;
using real_number_internal::from_node;
using real_number_internal::kMaxPrecision;

namespace {

using Kind = RealNumber::Kind;

// The fraction with the smallest denominator in [a, b], by continued
// fractions (common practice: the Stern–Brocot descent). REQUIRES: a <= b.
Rational simplest_between(const Rational& a, const Rational& b) {
  BigInt whole = floor_of(a);
  if (Rational(whole) == a) return a;
  if (Rational(whole + 1) <= b) return Rational(whole + 1);
  // a and b share the integer part: recurse on the reciprocals of the rest.
  Rational inner = simplest_between(1 / (b - Rational(whole)), 1 / (a - Rational(whole)));
  return Rational(whole) + 1 / inner;
}

// The root of sf in (lo, hi) when it is rational. Narrowing the interval
// below 1/q^2 leaves p/q as the simplest fraction in it (two fractions with
// denominators at most q are 1/q^2 apart), so denominators up to 2^64 are
// found. REQUIRES: sf has exactly one root in (lo, hi), signs at both ends.
//
// The search is an optimisation (a rational prints as a fraction and
// compares at once); an algebraic node for a rational value is still exact.
// So it is skipped where it would be slow: bisection takes about
// log2(hi - lo) + 128 steps, each evaluating sf at a fraction whose size
// grows with the step, and with coefficients of many thousands of bits
// (products of roots of huge constants) that ran for minutes.
std::optional<Rational> rational_root(const Polynomial& sf, Rational lo, Rational hi) {
  uint64_t coefficient_bits = 0;
  for (const Rational& c : sf.coefficients()) {
    coefficient_bits += bit_length(numerator(c)) + bit_length(denominator(c));
  }
  Rational width = hi - lo;
  uint64_t width_bits = bit_length(numerator(width)) -
                        std::min(bit_length(numerator(width)), bit_length(denominator(width)));
  constexpr uint64_t kMaxSearchCost = uint64_t{1} << 20;
  if (width_bits > 1024 ||
      coefficient_bits * static_cast<uint64_t>(sf.degree()) * (width_bits + 128) > kMaxSearchCost) {
    return std::nullopt;
  }
  int sign_lo = sf.sign_at(lo);
  for (int bits : {8, 32, 128}) {
    Rational width = Rational(1, BigInt(1) << bits);
    while (hi - lo > width) {
      Rational mid = (lo + hi) / 2;
      int s = sf.sign_at(mid);
      if (s == 0) return mid;
      (s == sign_lo ? lo : hi) = mid;
    }
    Rational candidate = simplest_between(lo, hi);
    if (sf.sign_at(candidate) == 0) return candidate;
  }
  return std::nullopt;
}

// Positive divisors of |x| for |x| <= 10^12 (trial division); empty otherwise.
std::vector<BigInt> small_divisors(const BigInt& x) {
  BigInt m = boost::multiprecision::abs(x);
  std::vector<BigInt> out;
  if (m == 0 || m > BigInt(1000000000000LL)) return out;
  uint64_t v = static_cast<uint64_t>(m);
  for (uint64_t d = 1; d * d <= v; ++d) {
    if (v % d != 0) continue;
    out.push_back(BigInt(d));
    if (d != v / d) out.push_back(BigInt(v / d));
  }
  return out;
}

// p without its rational roots outside (lo, hi) (rational root theorem on the
// integer multiple of p), so that (x - 1)(x^2 - x - 1) prints and compares as
// the golden ratio's quadratic. Only for small coefficients; p otherwise.
Polynomial without_other_rational_roots(Polynomial p, const Rational& lo, const Rational& hi) {
  while (p.degree() >= 3) {
    BigInt scale = 1;
    for (const Rational& c : p.coefficients()) {
      BigInt d = denominator(c);
      scale = scale / boost::multiprecision::gcd(scale, d) * d;
    }
    if (p.coefficient(0) == 0) {
      if (lo < 0 && hi > 0) return p;
      Polynomial q, r;
      Polynomial::divide(p, Polynomial({Rational(0), Rational(1)}), q, r);
      p = q;
      continue;
    }
    BigInt a0 = numerator(p.coefficient(0) * Rational(scale));
    BigInt an = numerator(p.leading() * Rational(scale));
    std::vector<BigInt> tops = small_divisors(a0), bottoms = small_divisors(an);
    if (tops.empty() || bottoms.empty() || tops.size() * bottoms.size() > 4096) return p;
    bool found = false;
    for (const BigInt& top : tops) {
      for (const BigInt& bottom : bottoms) {
        for (int sign : {1, -1}) {
          Rational r(BigInt(top * sign), bottom);
          if ((lo < r && r < hi) || p.sign_at(r) != 0) continue;
          Polynomial q, rest;
          Polynomial::divide(p, Polynomial({Rational(-r), Rational(1)}), q, rest);
          p = q;
          found = true;
          break;
        }
        if (found) break;
      }
      if (found) break;
    }
    if (!found) return p;
  }
  return p;
}

Interval hull(const Rational& lo, const Rational& hi, long prec) {
  Interval r(prec);
  mpfi_interv_q(r.raw(), lo.backend().data(), hi.backend().data());
  return r;
}

}  // namespace

namespace real_number_internal {

void bisect_locked(const Node& n) {
  if (n.lo == n.hi) return;
  Rational mid = (n.lo + n.hi) / 2;
  int s = n.p.sign_at(mid);
  if (s == 0) {
    n.lo = n.hi = mid;
  } else if (s == n.sign_lo) {
    n.lo = mid;
  } else {
    n.hi = mid;
  }
}

int compare_by_intervals(const RealNumber& a, const RealNumber& b) {
  for (long prec = 64; prec <= kMaxPrecision; prec *= 2) {
    Interval x = a.enclose(prec), y = b.enclose(prec);
    // On the endpoints themselves: exact, and no rational of 2^(10^10).
    if (mpfr_cmp(&x.raw()->right, &y.raw()->left) < 0) return -1;
    if (mpfr_cmp(&x.raw()->left, &y.raw()->right) > 0) return 1;
  }
  throw PrecisionShortfall("two real numbers agree to " + std::to_string(kMaxPrecision) +
                           " bits and cannot be told apart: " + a.str() + " and " + b.str());
}

int compare_algebraic_rational(const Node& n, const Rational& r) {
  std::lock_guard<std::mutex> lock(n.mutex);
  if (n.lo == n.hi) return n.lo < r ? -1 : (n.lo > r ? 1 : 0);
  if (r <= n.lo) return 1;
  if (r >= n.hi) return -1;
  int s = n.p.sign_at(r);
  if (s == 0) {
    n.lo = n.hi = r;
    return 0;
  }
  if (s == n.sign_lo) {
    n.lo = r;  // no sign change in (lo, r]: the root lies right of r
    return 1;
  }
  n.hi = r;
  return -1;
}

int compare_algebraic(const Node& x, const Node& y, const RealNumber& a, const RealNumber& b) {
  Polynomial common = Polynomial::gcd(x.p, y.p);
  for (int step = 0; step < 4096; ++step) {
    Rational xl, xh, yl, yh;
    {
      std::lock_guard<std::mutex> lock(x.mutex);
      xl = x.lo;
      xh = x.hi;
    }
    {
      std::lock_guard<std::mutex> lock(y.mutex);
      yl = y.lo;
      yh = y.hi;
    }
    if (xh < yl || (xh == yl && !(xl == xh && yl == yh))) return -1;
    if (yh < xl || (yh == xl && !(xl == xh && yl == yh))) return 1;
    if (xl == xh && yl == yh) return 0;
    if (common.degree() >= 1) {
      // A root of the common factor inside both isolating intervals is the
      // root of both polynomials there: the numbers are equal.
      Rational lo = std::max(xl, yl), hi = std::min(xh, yh);
      if (lo < hi && common.sign_at(lo) * common.sign_at(hi) < 0) return 0;
    }
    {
      std::lock_guard<std::mutex> lock(x.mutex);
      bisect_locked(x);
    }
    {
      std::lock_guard<std::mutex> lock(y.mutex);
      bisect_locked(y);
    }
  }
  return compare_by_intervals(a, b);
}

}  // namespace real_number_internal

RealNumber RealNumber::algebraic(const Polynomial& p, const Rational& lo, const Rational& hi,
                                 bool irrational) {
  Polynomial sf = p.squarefree();
  if (sf.degree() < 1 || !(lo < hi))
    throw std::invalid_argument("algebraic: no polynomial or interval");
  sf = without_other_rational_roots(sf, lo, hi);
  if (sf.degree() == 1) return RealNumber(-sf.coefficient(0) / sf.coefficient(1));
  int hi_sign = sf.sign_at(hi);
  int count = sf.count_real_roots(lo, hi) - (hi_sign == 0 ? 1 : 0);
  if (count != 1 || sf.sign_at(lo) == 0) {
    throw std::invalid_argument("algebraic: " + sf.str() + " has " + std::to_string(count) +
                                " roots in (" + to_string(lo) + ", " + to_string(hi) + ")");
  }
  auto n = std::make_shared<Node>();
  n->kind = Kind::kAlgebraic;
  n->p = sf;
  n->lo = lo;
  n->hi = hi;
  n->sign_lo = sf.sign_at(lo);
  if (hi_sign == 0) {
    // The root in (lo, hi) is not hi itself: move hi left of it and inside.
    Rational step = (hi - lo) / 2, h = hi - step;
    while (sf.sign_at(h) == 0 || sf.count_real_roots(lo, h) != 1) {
      step /= 2;
      h = hi - step;
    }
    n->hi = h;
  }
  // A rational root prints as a fraction and compares without bisection.
  if (irrational) return from_node(n);
  if (std::optional<Rational> q = rational_root(sf, n->lo, n->hi)) return RealNumber(*q);
  return from_node(n);
}

Interval RealNumber::enclose(long prec) const {
  const Node& n = *node_;
  switch (n.kind) {
    case Kind::kRational:
      return Interval(n.q, prec);
    case Kind::kLog: {
      long p = prec + 32;
      Interval ratio = Interval(n.a, p).log() / Interval(n.g, p).log();
      return Interval(n.q, p) + Interval(n.c, p) * ratio;
    }
    case Kind::kAlgebraic: {
      std::lock_guard<std::mutex> lock(n.mutex);
      Rational width = Rational(1) / Rational(BigInt(1) << static_cast<unsigned>(prec));
      Rational scale = std::max(Rational(1), Rational(boost::multiprecision::abs(n.lo)));
      for (long i = 0; i < 4 * prec + 64 && n.hi - n.lo > width * scale; ++i) bisect_locked(n);
      return hull(n.lo, n.hi, prec + 8);
    }
    case Kind::kEnclosed:
      return n.enclose(prec);
    case Kind::kLogAlgebraic: {
      long p = prec + 32;
      Interval ratio = RealNumber(n.alpha).enclose(p).log() / Interval(n.g, p).log();
      return Interval(n.q, p) + Interval(n.c, p) * ratio;
    }
  }
  return Interval(prec);
}

double RealNumber::approx() const { return enclose(64).approx(); }

}  // namespace thetagate::engine
