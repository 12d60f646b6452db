#include "verifier/real_number.h"

#include <mpfi.h>

#include <algorithm>
#include <mutex>
#include <numeric>
#include <optional>
#include <stdexcept>
#include <utility>
#include <vector>

#include "verifier/value.h"

namespace thetagate {

struct RealNumber::Node {
  Kind kind = Kind::kRational;
  Rational q;        // the rational value, or the constant part of a log form
  Rational c, a, g;  // log form: q + c * log_g(a)
  Polynomial p;      // algebraic: squarefree, exactly one root in (lo, hi)
  mutable std::mutex mutex;
  mutable Rational lo, hi;  // lo == hi once bisection has hit the root exactly
  int sign_lo = 0;          // sign of p just right of lo
  std::function<Interval(long)> enclose;  // enclosed
};

namespace {

using Node = RealNumber::Node;
using Kind = RealNumber::Kind;

constexpr long kMaxPrecision = 1 << 14;
constexpr uint64_t kMaxExactBits = 1 << 21;

RealNumber from_node(std::shared_ptr<Node> n) { return RealNumber(std::move(n)); }

RealNumber make_log_form(Rational q, Rational c, Rational a, Rational g) {
  if (c == 0) return RealNumber(q);
  auto n = std::make_shared<Node>();
  n->kind = Kind::kLog;
  n->q = std::move(q);
  n->c = std::move(c);
  n->a = std::move(a);
  n->g = std::move(g);
  return from_node(n);
}

RealNumber make_enclosed(std::function<Interval(long)> f) {
  auto n = std::make_shared<Node>();
  n->kind = Kind::kEnclosed;
  n->enclose = std::move(f);
  return from_node(n);
}

Interval hull(const Rational& lo, const Rational& hi, long prec) {
  Interval r(prec);
  mpfi_interv_q(r.raw(), lo.backend().data(), hi.backend().data());
  return r;
}

// x = m^k with k as large as possible (numerator and denominator together).
std::pair<Rational, unsigned long> primitive_power(const Rational& x) {
  BigInt num = numerator(x), den = denominator(x);
  unsigned long total = 1;
  bool changed = true;
  while (changed) {
    changed = false;
    uint64_t bits = std::max(bit_length(num), bit_length(den));
    for (unsigned long k = 2; k <= bits; ++k) {
      BigInt rn = iroot(num, k), rd = iroot(den, k);
      if (boost::multiprecision::pow(rn, static_cast<unsigned>(k)) == num &&
          boost::multiprecision::pow(rd, static_cast<unsigned>(k)) == den) {
        num = rn;
        den = rd;
        total *= k;
        changed = true;
        break;
      }
    }
  }
  return {Rational(num, den), total};
}

// The value of a rational or of an algebraic number whose bisection hit it.
std::optional<Rational> exact_value(const RealNumber& x) {
  const Node& n = x.node();
  if (n.kind == Kind::kRational) return n.q;
  if (n.kind == Kind::kAlgebraic) {
    std::lock_guard<std::mutex> lock(n.mutex);
    if (n.lo == n.hi) return n.lo;
  }
  return std::nullopt;
}

// One bisection step of an algebraic number's isolating interval.
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

Rational pow_rational(const Rational& base, long k) {
  Rational r = 1;
  Rational b = k >= 0 ? base : Rational(1) / base;
  unsigned long e = static_cast<unsigned long>(k >= 0 ? k : -k);
  while (e) {
    if (e & 1) r *= b;
    e >>= 1;
    if (e) b *= b;
  }
  return r;
}

BigInt lcm_big(const BigInt& a, const BigInt& b) { return a / boost::multiprecision::gcd(a, b) * b; }

// Sign of q + sum c_i log_g(a_i), exactly, by comparing g^Q prod a_i^C_i with 1
// (after clearing denominators). Empty when the powers would be too large.
std::optional<int> log_sum_sign(const Rational& q, const std::vector<std::pair<Rational, Rational>>& terms,
                                const Rational& g) {
  BigInt d = denominator(q);
  for (const auto& [c, a] : terms) d = lcm_big(d, denominator(c));
  std::vector<std::pair<BigInt, Rational>> factors;  // (exponent, base)
  factors.emplace_back(numerator(q * Rational(d)), g);
  for (const auto& [c, a] : terms) factors.emplace_back(numerator(c * Rational(d)), a);
  uint64_t bits = 0;
  for (const auto& [e, b] : factors) {
    BigInt m = boost::multiprecision::abs(e);
    if (bit_length(m) > 40) return std::nullopt;
    bits += static_cast<uint64_t>(m) * (std::max(bit_length(numerator(b)), bit_length(denominator(b))));
    if (bits > kMaxExactBits) return std::nullopt;
  }
  BigInt top = 1, bottom = 1;
  for (const auto& [e, b] : factors) {
    unsigned m = static_cast<unsigned>(boost::multiprecision::abs(e));
    BigInt u = boost::multiprecision::pow(numerator(b), m);
    BigInt v = boost::multiprecision::pow(denominator(b), m);
    if (e > 0) {
      top *= u;
      bottom *= v;
    } else {
      top *= v;
      bottom *= u;
    }
  }
  return top > bottom ? 1 : (top < bottom ? -1 : 0);
}

int compare_by_intervals(const RealNumber& a, const RealNumber& b) {
  for (long prec = 64; prec <= kMaxPrecision; prec *= 2) {
    Interval x = a.enclose(prec), y = b.enclose(prec);
    if (x.upper() < y.lower()) return -1;
    if (x.lower() > y.upper()) return 1;
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

std::string log_text(const Rational& g, const Rational& a) {
  std::string arg = denominator(a) == 1 ? to_string(a) : "(" + to_string(a) + ")";
  if (g == 2) return "lg " + arg;
  return "log(" + to_string(g) + ", " + to_string(a) + ")";
}

}  // namespace

RealNumber::RealNumber() : RealNumber(Rational(0)) {}

RealNumber::RealNumber(long x) : RealNumber(Rational(x)) {}

RealNumber::RealNumber(const Rational& q) {
  auto n = std::make_shared<Node>();
  n->kind = Kind::kRational;
  n->q = q;
  node_ = n;
}

RealNumber RealNumber::log(const Rational& base, const Rational& x) {
  if (x <= 0 || base <= 0 || base == 1) throw DomainError("log of a non-positive number or base 1");
  Rational b = base, v = x, c = 1;
  if (b < 1) {
    b = Rational(1) / b;
    c = -c;
  }
  if (v == 1) return RealNumber(Rational(0));
  if (v < 1) {
    v = Rational(1) / v;
    c = -c;
  }
  auto [g, k] = primitive_power(b);
  auto [a, s] = primitive_power(v);
  c = c * Rational(static_cast<long>(s)) / Rational(static_cast<long>(k));
  if (a == g) return RealNumber(c);
  return make_log_form(0, c, a, g);
}

RealNumber RealNumber::algebraic(const Polynomial& p, const Rational& lo, const Rational& hi) {
  Polynomial sf = p.squarefree();
  if (sf.degree() < 1 || !(lo < hi)) throw std::invalid_argument("algebraic: no polynomial or interval");
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
  // Small rational roots are caught here so that they print as rationals.
  for (long d = 1; d <= 12; ++d) {
    BigInt k = floor_of(lo * Rational(d)) + 1;
    for (int tries = 0; tries < 4 && Rational(k, BigInt(d)) < n->hi; ++tries, ++k) {
      Rational candidate(k, BigInt(d));
      if (sf.sign_at(candidate) == 0) return RealNumber(candidate);
    }
  }
  return from_node(n);
}

RealNumber RealNumber::root(const Rational& q, unsigned long k) {
  if (q <= 0 || k == 0) throw DomainError("root of a non-positive number");
  if (k == 1) return RealNumber(q);
  BigInt rn = iroot(numerator(q), k), rd = iroot(denominator(q), k);
  if (boost::multiprecision::pow(rn, static_cast<unsigned>(k)) == numerator(q) &&
      boost::multiprecision::pow(rd, static_cast<unsigned>(k)) == denominator(q)) {
    return RealNumber(Rational(rn, rd));
  }
  std::vector<Rational> coefficients(k + 1);
  coefficients[0] = -q;
  coefficients[k] = 1;
  return algebraic(Polynomial(coefficients), 0, std::max(q, Rational(1)) + 1);
}

RealNumber RealNumber::enclosed(std::function<Interval(long)> enclose) {
  return make_enclosed(std::move(enclose));
}

RealNumber::Kind RealNumber::kind() const { return node_->kind; }

const Rational& RealNumber::rational() const { return node_->q; }

bool RealNumber::is_integer() const { return is_rational() && denominator(node_->q) == 1; }

const Polynomial* RealNumber::polynomial() const {
  return kind() == Kind::kAlgebraic ? &node_->p : nullptr;
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
  }
  return Interval(prec);
}

double RealNumber::approx() const { return enclose(64).approx(); }

int RealNumber::sign() const { return compare(*this, RealNumber(Rational(0))); }

std::string RealNumber::digits(int decimals) const {
  BigInt scale = boost::multiprecision::pow(BigInt(10), static_cast<unsigned>(decimals));
  for (long prec = 64; prec <= kMaxPrecision; prec *= 2) {
    Interval x = enclose(prec);
    BigInt lo = floor_of(x.lower() * Rational(scale) + Rational(1, 2));
    BigInt hi = floor_of(x.upper() * Rational(scale) + Rational(1, 2));
    if (lo != hi) continue;
    bool exact = x.lower() == x.upper() && x.lower() * Rational(scale) == Rational(lo);
    bool negative = lo < 0;
    BigInt m = negative ? BigInt(-lo) : lo;
    std::string s = BigInt(m / scale).str();
    std::string frac = BigInt(m % scale).str();
    if (decimals > 0) s += "." + std::string(decimals - frac.size(), '0') + frac;
    return (negative ? "-" : "") + s + (exact ? "" : "…");
  }
  return "[" + enclose(64).str(8) + "]";
}

std::string RealNumber::str() const {
  const Node& n = *node_;
  switch (n.kind) {
    case Kind::kRational:
      return to_string(n.q);
    case Kind::kLog: {
      std::string log = log_text(n.g, n.a);
      BigInt u = numerator(n.c), v = denominator(n.c);
      std::string s = u == 1 ? log : (u == -1 ? "-" + log : u.str() + " " + log);
      if (v != 1) s = "(" + s + ")/" + v.str();
      if (n.q > 0) s += " + " + to_string(n.q);
      if (n.q < 0) s += " - " + to_string(Rational(-n.q));
      return s;
    }
    case Kind::kAlgebraic: {
      if (auto q = exact_value(*this)) return to_string(*q);
      Polynomial m = n.p.monic();
      if (m.degree() == 2) {
        Rational b = m.coefficient(1), c = m.coefficient(0);
        Rational disc = b * b - 4 * c;
        Rational center = -b / 2;
        bool plus = compare(*this, RealNumber(center)) > 0;
        std::string root = "sqrt(" + to_string(disc) + ")";
        if (-b == 0) return std::string(plus ? "" : "-") + root + "/2";
        return "(" + to_string(Rational(-b)) + (plus ? " + " : " - ") + root + ")/2";
      }
      bool binomial = true;
      for (int i = 1; i < m.degree(); ++i) binomial = binomial && m.coefficient(i) == 0;
      if (binomial && m.coefficient(0) < 0) {
        std::string q = to_string(Rational(-m.coefficient(0)));
        if (denominator(m.coefficient(0)) != 1) q = "(" + q + ")";
        return q + "^(1/" + std::to_string(m.degree()) + ")";
      }
      return digits();
    }
    case Kind::kEnclosed:
      return digits();
  }
  return "?";
}

RealNumber operator+(const RealNumber& a, const RealNumber& b) {
  auto ea = exact_value(a), eb = exact_value(b);
  if (ea && eb) return RealNumber(*ea + *eb);
  if (eb && *eb == 0) return a;
  if (ea && *ea == 0) return b;
  const Node& x = a.node();
  const Node& y = b.node();
  if (x.kind == Kind::kLog && eb) return make_log_form(x.q + *eb, x.c, x.a, x.g);
  if (y.kind == Kind::kLog && ea) return make_log_form(y.q + *ea, y.c, y.a, y.g);
  if (x.kind == Kind::kLog && y.kind == Kind::kLog && x.a == y.a && x.g == y.g) {
    return make_log_form(x.q + y.q, x.c + y.c, x.a, x.g);
  }
  if (x.kind == Kind::kAlgebraic && eb) {
    std::lock_guard<std::mutex> lock(x.mutex);
    return RealNumber::algebraic(x.p.shifted(-*eb), x.lo + *eb, x.hi + *eb);
  }
  if (y.kind == Kind::kAlgebraic && ea) return b + a;
  return make_enclosed([a, b](long prec) { return a.enclose(prec) + b.enclose(prec); });
}

RealNumber operator-(const RealNumber& a) { return a * RealNumber(Rational(-1)); }

RealNumber operator-(const RealNumber& a, const RealNumber& b) { return a + (-b); }

RealNumber operator*(const RealNumber& a, const RealNumber& b) {
  auto ea = exact_value(a), eb = exact_value(b);
  if (ea && eb) return RealNumber(*ea * *eb);
  if ((ea && *ea == 0) || (eb && *eb == 0)) return RealNumber(Rational(0));
  if (eb && *eb == 1) return a;
  if (ea && *ea == 1) return b;
  const Node& x = a.node();
  if (x.kind == Kind::kLog && eb) return make_log_form(x.q * *eb, x.c * *eb, x.a, x.g);
  if (x.kind == Kind::kAlgebraic && eb) {
    std::lock_guard<std::mutex> lock(x.mutex);
    Rational lo = x.lo * *eb, hi = x.hi * *eb;
    if (lo > hi) std::swap(lo, hi);
    return RealNumber::algebraic(x.p.scaled(Rational(1) / *eb), lo, hi);
  }
  if (ea && b.node().kind != Kind::kEnclosed) return b * a;
  return make_enclosed([a, b](long prec) { return a.enclose(prec) * b.enclose(prec); });
}

RealNumber operator/(const RealNumber& a, const RealNumber& b) {
  if (b.sign() == 0) throw DomainError("division by zero");
  auto eb = exact_value(b);
  if (eb) return a * RealNumber(Rational(1) / *eb);
  const Node& x = a.node();
  const Node& y = b.node();
  if (y.kind == Kind::kLog && y.q == 0) {
    // (c1 log_g a1) / (c2 log_g a2) = (c1/c2) log_a2 a1; 1/(c log_g a) = (1/c) log_a g.
    if (x.kind == Kind::kLog && x.q == 0 && x.g == y.g) return RealNumber::log(y.a, x.a) * RealNumber(Rational(x.c / y.c));
    if (x.kind == Kind::kLog && x.q == 0 && x.a == y.a) return RealNumber::log(x.g, y.g) * RealNumber(Rational(x.c / y.c));
    RealNumber inverse = RealNumber::log(y.a, y.g) * (Rational(1) / y.c);
    if (exact_value(a)) return inverse * a;
  }
  if (y.kind == Kind::kAlgebraic && exact_value(a)) {
    Rational lo, hi;
    for (;;) {
      std::lock_guard<std::mutex> lock(y.mutex);
      if (y.lo > 0 || y.hi < 0) {
        lo = y.lo;
        hi = y.hi;
        break;
      }
      bisect_locked(y);
    }
    if (auto e = exact_value(b)) return a * RealNumber(Rational(1) / *e);
    return RealNumber::algebraic(y.p.reversed(), Rational(1) / hi, Rational(1) / lo) * a;
  }
  return make_enclosed([a, b](long prec) { return a.enclose(prec) / b.enclose(prec); });
}

RealNumber pow(const RealNumber& base, const RealNumber& exponent) {
  if (base.sign() <= 0) throw DomainError("power of a non-positive base");
  auto eb = exact_value(base), ee = exact_value(exponent);
  if (ee && *ee == 0) return RealNumber(Rational(1));
  if (eb && *eb == 1) return RealNumber(Rational(1));
  if (ee && *ee == 1) return base;
  if (eb && ee && boost::multiprecision::abs(numerator(*ee)) < 4096 && denominator(*ee) < 4096) {
    long u = static_cast<long>(numerator(*ee));
    unsigned long v = static_cast<unsigned long>(denominator(*ee));
    return RealNumber::root(pow_rational(*eb, u), v);
  }
  const Node& e = exponent.node();
  if (eb && e.kind == Kind::kLog && e.g == *eb && denominator(e.c) == 1 && denominator(e.q) == 1 &&
      boost::multiprecision::abs(e.c) < 4096 && boost::multiprecision::abs(e.q) < 4096) {
    // g^(q + c log_g a) = g^q a^c.
    return RealNumber(pow_rational(e.g, static_cast<long>(numerator(e.q))) *
                      pow_rational(e.a, static_cast<long>(numerator(e.c))));
  }
  return make_enclosed([base, exponent](long prec) {
    return base.enclose(prec).pow(exponent.enclose(prec));
  });
}

int compare(const RealNumber& a, const RealNumber& b) {
  if (a.same_node(b)) return 0;
  const Node& x = a.node();
  const Node& y = b.node();
  auto ea = exact_value(a), eb = exact_value(b);
  if (ea && eb) return *ea < *eb ? -1 : (*ea > *eb ? 1 : 0);
  bool x_log = x.kind == Kind::kLog, y_log = y.kind == Kind::kLog;
  if ((x_log || ea) && (y_log || eb) && (!x_log || !y_log || x.g == y.g)) {
    Rational q = (x_log ? x.q : *ea) - (y_log ? y.q : *eb);
    std::vector<std::pair<Rational, Rational>> terms;
    if (x_log) terms.emplace_back(x.c, x.a);
    if (y_log) terms.emplace_back(-y.c, y.a);
    if (auto s = log_sum_sign(q, terms, x_log ? x.g : y.g)) return *s;
  }
  if (x.kind == Kind::kAlgebraic && eb) return compare_algebraic_rational(x, *eb);
  if (y.kind == Kind::kAlgebraic && ea) return -compare_algebraic_rational(y, *ea);
  if (x.kind == Kind::kAlgebraic && y.kind == Kind::kAlgebraic) return compare_algebraic(x, y, a, b);
  return compare_by_intervals(a, b);
}

}  // namespace thetagate
