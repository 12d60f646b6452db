// RealNumber's exact core: rationals, logarithms, roots and enclosed numbers
// as values; arithmetic that stays exact where the kinds allow; and the
// comparison that dispatches by kind. Rationals and logarithms of one base are
// compared here exactly, by integer powers; algebraic numbers and everything
// else go to real_number_algebraic.cc.
#include "verifier/numbers/real_number.h"

#include <algorithm>
#include <mutex>
#include <optional>
#include <utility>
#include <vector>

#include "verifier/numbers/real_number_node.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine {

using real_number_internal::bisect_locked;
using real_number_internal::compare_algebraic;
using real_number_internal::compare_algebraic_rational;
using real_number_internal::compare_by_intervals;
using real_number_internal::exact_value;
using real_number_internal::from_node;

namespace {

using Node = RealNumber::Node;
using Kind = RealNumber::Kind;

constexpr uint64_t kMaxExactBits = 1 << 21;

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

BigInt lcm_big(const BigInt& a, const BigInt& b) {
  return a / boost::multiprecision::gcd(a, b) * b;
}

// Sign of q + sum c_i log_g(a_i), exactly, by comparing g^Q prod a_i^C_i with 1
// (after clearing denominators). Empty when the powers would be too large.
std::optional<int> log_sum_sign(const Rational& q,
                                const std::vector<std::pair<Rational, Rational>>& terms,
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
    bits +=
        static_cast<uint64_t>(m) * (std::max(bit_length(numerator(b)), bit_length(denominator(b))));
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

}  // namespace

namespace real_number_internal {

std::optional<Rational> exact_value(const RealNumber& x) {
  const Node& n = x.node();
  if (n.kind == Kind::kRational) return n.q;
  if (n.kind == Kind::kAlgebraic) {
    std::lock_guard<std::mutex> lock(n.mutex);
    if (n.lo == n.hi) return n.lo;
  }
  return std::nullopt;
}

}  // namespace real_number_internal

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

namespace {

RealNumber make_log_algebraic(Rational q, Rational c, Rational g,
                              std::shared_ptr<const Node> alpha) {
  if (c == 0) return RealNumber(q);
  auto n = std::make_shared<Node>();
  n->kind = Kind::kLogAlgebraic;
  n->q = std::move(q);
  n->c = std::move(c);
  n->g = std::move(g);
  n->alpha = std::move(alpha);
  return from_node(n);
}

// sign(q + c log_g(alpha) - r) for c != 0, exactly: log_g(alpha) against the
// rational s = (r - q)/c is alpha against g^s, an algebraic comparison.
std::optional<int> log_algebraic_sign(const Node& x, const Rational& r) {
  Rational s = (r - x.q) / x.c;
  if (boost::multiprecision::abs(numerator(s)) >= 4096 || denominator(s) >= 4096)
    return std::nullopt;
  RealNumber gs = pow(RealNumber(x.g), RealNumber(s));
  if (gs.kind() == Kind::kEnclosed) return std::nullopt;
  int order = compare(RealNumber(x.alpha), gs);  // log_g(alpha) - s has this sign (g > 1)
  return x.c > 0 ? order : -order;
}

}  // namespace

RealNumber RealNumber::log_real(const Rational& base, const RealNumber& x) {
  if (base <= 0 || base == 1 || x.sign() <= 0)
    throw DomainError("log of a non-positive number or base 1");
  if (auto q = exact_value(x)) return log(base, *q);
  if (x.kind() != Kind::kAlgebraic) {
    RealNumber b(base);
    return make_enclosed(
        [x, b](long prec) { return x.enclose(prec + 16).log() / b.enclose(prec + 16).log(); });
  }
  Rational b = base, c = 1;
  if (b < 1) {
    b = Rational(1) / b;
    c = -c;
  }
  auto [g, k] = primitive_power(b);
  c /= Rational(static_cast<long>(k));
  return make_log_algebraic(0, c, g, x.node_);
}

std::optional<LogAlgebraicForm> log_algebraic_form(const RealNumber& x) {
  const Node& n = x.node();
  if (n.kind != Kind::kLogAlgebraic) return std::nullopt;
  return LogAlgebraicForm{n.q, n.c, n.g, RealNumber(n.alpha)};
}

RealNumber RealNumber::root(const Rational& q, unsigned long k) {
  if (q <= 0 || k == 0) throw DomainError("root of a non-positive number");
  if (k == 1) return RealNumber(q);
  BigInt rn = iroot(numerator(q), k), rd = iroot(denominator(q), k);
  if (boost::multiprecision::pow(rn, static_cast<unsigned>(k)) == numerator(q) &&
      boost::multiprecision::pow(rd, static_cast<unsigned>(k)) == denominator(q)) {
    return RealNumber(Rational(rn, rd));
  }
  // q = a/b in lowest terms has a rational k-th root only when a and b are
  // both k-th powers, which they are not: the root is irrational, so no
  // search for a rational one (by bisection from (0, q + 1), that took
  // minutes for a degree-50 root of a 9,000-bit q). rn <= a^(1/k) < rn + 1
  // and rd <= b^(1/k) < rd + 1 bracket it tightly.
  std::vector<Rational> coefficients(k + 1);
  coefficients[0] = -q;
  coefficients[k] = 1;
  Rational lo(rn, rd + 1), hi(rn + 1, rd);
  return algebraic(Polynomial(coefficients), lo, hi, /*irrational=*/true);
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

int RealNumber::sign() const { return compare(*this, RealNumber(Rational(0))); }

RealNumber operator+(const RealNumber& a, const RealNumber& b) {
  auto ea = exact_value(a), eb = exact_value(b);
  if (ea && eb) return RealNumber(*ea + *eb);
  if (eb && *eb == 0) return a;
  if (ea && *ea == 0) return b;
  const Node& x = a.node();
  const Node& y = b.node();
  if (x.kind == Kind::kLog && eb) return make_log_form(x.q + *eb, x.c, x.a, x.g);
  if (y.kind == Kind::kLog && ea) return make_log_form(y.q + *ea, y.c, y.a, y.g);
  if (x.kind == Kind::kLogAlgebraic && eb) return make_log_algebraic(x.q + *eb, x.c, x.g, x.alpha);
  if (y.kind == Kind::kLogAlgebraic && ea) return make_log_algebraic(y.q + *ea, y.c, y.g, y.alpha);
  if (x.kind == Kind::kLogAlgebraic && y.kind == Kind::kLogAlgebraic && x.alpha == y.alpha &&
      x.g == y.g) {
    return make_log_algebraic(x.q + y.q, x.c + y.c, x.g, x.alpha);
  }
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
  if (x.kind == Kind::kLogAlgebraic && eb)
    return make_log_algebraic(x.q * *eb, x.c * *eb, x.g, x.alpha);
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
    if (x.kind == Kind::kLog && x.q == 0 && x.g == y.g)
      return RealNumber::log(y.a, x.a) * RealNumber(Rational(x.c / y.c));
    if (x.kind == Kind::kLog && x.q == 0 && x.a == y.a)
      return RealNumber::log(x.g, y.g) * RealNumber(Rational(x.c / y.c));
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

RealNumber log2_of(const RealNumber& c) {
  if (c.is_rational()) return RealNumber::log(2, c.rational());
  if (c.kind() == RealNumber::Kind::kAlgebraic) return RealNumber::log_real(2, c);
  return RealNumber::enclosed([c](long prec) { return c.enclose(prec).log2(); });
}

RealNumber pow(const RealNumber& base, const RealNumber& exponent) {
  if (base.sign() <= 0) throw DomainError("power of a non-positive base");
  auto eb = exact_value(base), ee = exact_value(exponent);
  if (ee && *ee == 0) return RealNumber(Rational(1));
  if (eb && *eb == 1) return RealNumber(Rational(1));
  if (ee && *ee == 1) return base;
  // Exactly (a rational, or a root of x^v - base^u) only while base^u stays
  // small: 55555555^(5554/100) would isolate a root of degree 50 of a
  // 71,000-bit number by bisection, for minutes. Beyond, a certified enclosure.
  auto small_power = [](const Rational& b, const Rational& x) {
    uint64_t bits = bit_length(numerator(b)) + bit_length(denominator(b));
    uint64_t u = static_cast<uint64_t>(boost::multiprecision::abs(numerator(x)));
    return denominator(x) <= 64 && bits * u <= 8192;
  };
  if (eb && ee && boost::multiprecision::abs(numerator(*ee)) < 4096 && denominator(*ee) < 4096 &&
      (denominator(*ee) == 1 || small_power(*eb, *ee))) {
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
  return make_enclosed(
      [base, exponent](long prec) { return base.enclose(prec).pow(exponent.enclose(prec)); });
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
  if (x.kind == Kind::kLogAlgebraic && eb) {
    if (auto order = log_algebraic_sign(x, *eb)) return *order;
  }
  if (y.kind == Kind::kLogAlgebraic && ea) {
    if (auto order = log_algebraic_sign(y, *ea)) return -*order;
  }
  if (x.kind == Kind::kLogAlgebraic && y.kind == Kind::kLogAlgebraic && x.g == y.g) {
    // Equal arguments reduce to a rational against one log; equal
    // coefficients order like the arguments.
    int arguments = compare(RealNumber(x.alpha), RealNumber(y.alpha));
    if (arguments == 0) {
      if (x.c == y.c) return x.q < y.q ? -1 : (x.q > y.q ? 1 : 0);
      auto n = std::make_shared<Node>();
      n->kind = Kind::kLogAlgebraic;
      n->q = x.q - y.q;
      n->c = x.c - y.c;
      n->g = x.g;
      n->alpha = x.alpha;
      if (auto order = log_algebraic_sign(*n, 0)) return *order;
    } else if (x.c == y.c && x.q == y.q) {
      return x.c > 0 ? arguments : -arguments;
    }
  }
  if (x.kind == Kind::kAlgebraic && eb) return compare_algebraic_rational(x, *eb);
  if (y.kind == Kind::kAlgebraic && ea) return -compare_algebraic_rational(y, *ea);
  if (x.kind == Kind::kAlgebraic && y.kind == Kind::kAlgebraic)
    return compare_algebraic(x, y, a, b);
  return compare_by_intervals(a, b);
}

}  // namespace thetagate::engine
