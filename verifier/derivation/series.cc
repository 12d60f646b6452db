// Certified expansions for the inductive step (series.h; the method in
// docs/design.md, "Proofs"). The mathematics this file relies on, in order:
//
// - Coefficients: exact rationals, or rational combinations of products of
//   *named* irrational constants. Two coefficients cancel only when their
//   names say they are the same number (lg 3 on both sides of a step), never
//   because two enclosures happen to overlap: that would be a guess.
// - Powers and logarithms of a sum A = L (1 + u), with L its leading term:
//   the binomial series (1 + u)^k = sum binom(k, j) u^j and the series
//   ln(1 + u) = sum (-1)^(j+1) u^j / j, cut after `order` terms, with the
//   Lagrange form of the remainder bounding what was cut. Both need
//   |u(n)| <= u0 < 1/2 for every n >= from, which relative_rest() proves.
// - Floors and ceilings: on one residue class n = M m + r, an affine
//   argument s n + t with s M whole has the same fractional part for every
//   m, so its floor is s n + t minus a constant: exact, not a bound.
// - Signs: beyond some x the leading term outweighs the others, bounded by
//   their ratios to it at x (each ratio non-increasing from x on); below x,
//   interval arithmetic on blocks [x, 2x].
#include "verifier/derivation/series.h"

#include <algorithm>
#include <atomic>

#include "verifier/model/recurrence.h"
#include "verifier/numbers/real_number_node.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine {

namespace {

Interval pinterval(const Rational& q, long p) { return Interval(q, p); }

Interval hull(const Interval& a, const Interval& b) {
  Interval r = a;
  mpfi_union(r.raw(), a.raw(), b.raw());
  return r;
}

// |x| as an interval's largest magnitude, rounded up.
Interval magnitude(const Interval& x) {
  Interval hi(x.upper(), x.precision());
  Interval lo(-x.lower(), x.precision());
  return Interval::max(hi, lo);
}

// A coefficient as monomials: name -> (rational multiplier, enclosure of
// the monomial). "" is the rational part (enclosure 1). Addition merges equal
// names, so equal constants cancel exactly; an unnamed constant gets a
// unique name ("#k", Coef::of(Interval)) and so never cancels with another.
using Monomials = std::map<std::string, std::pair<Rational, Interval>>;

Monomials monomials_of(const Coef& c, long p) {
  if (!c.exact) return c.monomials;
  Monomials m;
  if (c.q != 0) m.emplace("", std::pair{c.q, Interval(Rational(1), p)});
  return m;
}

Coef from_monomials(Monomials m) {
  for (auto it = m.begin(); it != m.end();) {
    if (it->second.first == 0) {
      it = m.erase(it);
    } else {
      ++it;
    }
  }
  if (m.empty()) return Coef::of(Rational(0));
  if (m.size() == 1 && m.begin()->first.empty()) return Coef::of(m.begin()->second.first);
  Coef c;
  c.exact = false;
  c.monomials = std::move(m);
  return c;
}

// The name of a product of two monomials: the multiset of their atoms,
// sorted, so that a*b and b*a are the same monomial and merge.
std::string monomial_product(const std::string& a, const std::string& b) {
  if (a.empty()) return b;
  if (b.empty()) return a;
  std::vector<std::string> names;
  for (const std::string* s : {&a, &b}) {
    size_t start = 0;
    for (;;) {
      size_t star = s->find('*', start);
      names.push_back(s->substr(start, star == std::string::npos ? star : star - start));
      if (star == std::string::npos) break;
      start = star + 1;
    }
  }
  std::sort(names.begin(), names.end());
  std::string out;
  for (const std::string& n : names) out += (out.empty() ? "" : "*") + n;
  return out;
}

Coef cadd(const Coef& a, const Coef& b, long p) {
  if (a.exact && b.exact) return Coef::of(a.q + b.q);
  Monomials m = monomials_of(a, p);
  for (const auto& [name, value] : monomials_of(b, p)) {
    auto it = m.find(name);
    if (it == m.end()) {
      m.emplace(name, value);
    } else {
      it->second.first += value.first;
    }
  }
  return from_monomials(std::move(m));
}

Coef cmul(const Coef& a, const Coef& b, long p) {
  if (a.exact && b.exact) return Coef::of(a.q * b.q);
  if (a.is_zero() || b.is_zero()) return Coef::of(Rational(0));
  Monomials m;
  for (const auto& [na, va] : monomials_of(a, p)) {
    for (const auto& [nb, vb] : monomials_of(b, p)) {
      std::string name = monomial_product(na, nb);
      Rational q = va.first * vb.first;
      auto it = m.find(name);
      if (it == m.end()) {
        m.emplace(name, std::pair{q, va.second * vb.second});
      } else {
        it->second.first += q;
      }
    }
  }
  return from_monomials(std::move(m));
}

Coef cneg(const Coef& a) {
  if (a.exact) return Coef::of(-a.q);
  Coef r = a;
  for (auto& [name, value] : r.monomials) value.first = -value.first;
  return r;
}

// 1/a. A combination of named constants has no named inverse, so the
// inverse of an inexact coefficient is an unnamed enclosure: it cannot take
// part in an exact cancellation, which only costs a proof, never soundness.
Coef cinverse(const Coef& a, long p) {
  if (a.exact) {
    if (a.q == 0) throw SeriesUnsupported{"division by zero"};
    return Coef::of(Rational(1) / a.q);
  }
  Interval v = a.enclose(p);
  if (v.contains_zero()) throw SeriesUnsupported{"division by a coefficient near zero"};
  return Coef::of(Interval(Rational(1), p) / v);
}

// A real constant: rationals exact, q + c log_g(a) as a multiple of the
// named constant log_g(a), anything else unnamed.
Coef coef_of_real(const RealNumber& x, long p) {
  if (x.is_rational()) return Coef::of(x.rational());
  const RealNumber::Node& node = x.node();
  if (node.kind == RealNumber::Kind::kLog) {
    RealNumber log = RealNumber::log(node.g, node.a);
    Coef atom =
        Coef::atom("log(" + to_string(node.g) + "," + to_string(node.a) + ")", log.enclose(p));
    return cadd(Coef::of(node.q), cmul(Coef::of(node.c), atom, p), p);
  }
  return Coef::of(x.enclose(p));
}

// A constant that a name describes exactly when its inputs are exact: a
// rational or q + c log_g a. Only such constants may be named, because the
// name is what decides that two of them are equal.
bool nameable(const RealNumber& k) {
  return k.kind() == RealNumber::Kind::kRational || k.kind() == RealNumber::Kind::kLog;
}

// Exponents are ordered exactly; two that intervals cannot tell apart
// (equal, or equal to 2^-16384) leave the key order unknown, and an unknown
// order is no basis for merging terms or naming the leading one.
int compare_real(const RealNumber& a, const RealNumber& b) {
  try {
    return compare(a, b);
  } catch (const PrecisionShortfall&) {
    throw SeriesUnsupported{"two exponents could not be ordered exactly"};
  }
}

// The sign of an exponent or constant, exactly; one that intervals cannot
// tell from 0 (an irrational zero such as (sqrt(2) - 2) - (sqrt(2) - 2), not
// known to be one) is, as in compare_real, no basis for a term's shape.
int sign_of_real(const RealNumber& k) {
  try {
    return k.sign();
  } catch (const PrecisionShortfall&) {
    throw SeriesUnsupported{"the sign of an exponent could not be decided exactly"};
  }
}

SeriesKey key_mul(const SeriesKey& a, const SeriesKey& b) {
  return SeriesKey{a.rho * b.rho, a.alpha + b.alpha, a.beta + b.beta};
}

SeriesKey key_div(const SeriesKey& a, const SeriesKey& b) {
  return SeriesKey{a.rho / b.rho, a.alpha - b.alpha, a.beta - b.beta};
}

SeriesKey unit_key() { return SeriesKey{Rational(1), RealNumber(0L), 0}; }

Series constant(const Coef& c) {
  Series s;
  if (!c.is_zero()) s.terms.push_back({unit_key(), c});
  return s;
}

// Adds one term, merging it into a term of the same key (and remainder).
// Two remainders with the same key but different tags are different unknown
// functions: adding their coefficients would assume they are equal.
void accumulate(Series& s, const SeriesKey& key, const Coef& c, long p, const std::string& tag = "",
                const std::optional<Interval>& bound = std::nullopt) {
  if (c.is_zero()) return;
  for (auto it = s.terms.begin(); it != s.terms.end(); ++it) {
    if (it->tag == tag && compare_keys(it->key, key) == 0) {
      it->coef = cadd(it->coef, c, p);
      if (it->coef.is_zero()) s.terms.erase(it);
      return;
    }
  }
  s.terms.push_back({key, c, tag, bound});
}

void accumulate(Series& s, const SeriesTerm& t, long p) {
  accumulate(s, t.key, t.coef, p, t.tag, t.bound);
}

// The product term by term. A remainder times an ordinary term is the same
// remainder function scaled; a product of two remainders is a new unknown
// function (named by both tags) with |R1 R2| <= b1 b2 key1 key2.
Series mul(const Series& a, const Series& b, long p) {
  Series r;
  for (const SeriesTerm& x : a.terms) {
    for (const SeriesTerm& y : b.terms) {
      std::string tag = x.tag;
      std::optional<Interval> bound = x.bound;
      if (!y.tag.empty()) {
        if (tag.empty()) {
          tag = y.tag;
          bound = y.bound;
        } else {
          tag = std::min(x.tag, y.tag) + "*" + std::max(x.tag, y.tag);
          bound = *x.bound * *y.bound;
        }
      }
      accumulate(r, key_mul(x.key, y.key), cmul(x.coef, y.coef, p), p, tag, bound);
    }
  }
  return r;
}

// A name for a remainder function: its kind and the exact series it
// depends on; unique (never shared) when that series is not exact.
// The remainder of (1 + u)^k or lg(1 + u) cut after `order` terms is a
// function of k, order and u alone: where the same exact u occurs on both
// sides of a step (f(n) = lg(n + 1) against a bound with lg(n + 1) in it),
// the two remainders are one function and cancel. With inexact coefficients
// in u two series that print alike may differ, so the name is made unique.
std::string remainder_tag(const std::string& kind, const RealNumber& k, const Series& u,
                          int order) {
  static std::atomic<uint64_t> unique{0};
  std::string tag = kind + "(" + k.str() + ";" + std::to_string(order) + ";";
  bool exact = k.kind() == RealNumber::Kind::kRational || k.kind() == RealNumber::Kind::kLog;
  std::vector<std::string> parts;
  for (const SeriesTerm& t : u.terms) {
    exact = exact && t.coef.exact && t.tag.empty() &&
            (t.key.alpha.kind() == RealNumber::Kind::kRational ||
             t.key.alpha.kind() == RealNumber::Kind::kLog);
    parts.push_back(to_string(t.key.rho) + "," + t.key.alpha.str() + "," +
                    std::to_string(t.key.beta) + ":" + (t.coef.exact ? to_string(t.coef.q) : "?"));
  }
  std::sort(parts.begin(), parts.end());
  for (const std::string& part : parts) tag += part + ";";
  if (!exact) tag += "#" + std::to_string(++unique);
  return tag + ")";
}

// The term with the fastest-growing key (the first of equals; accumulate
// keeps at most one per key and tag).
size_t leading_index(const Series& s) {
  size_t lead = 0;
  for (size_t i = 1; i < s.terms.size(); ++i) {
    if (compare_keys(s.terms[i].key, s.terms[lead].key) > 0) lead = i;
  }
  return lead;
}

// An interval for n at the real point x.
Interval point(const BigInt& x, long p) { return Interval(x, p); }

// key(n) on the interval n (every point >= 2), as exp(n ln rho) ·
// exp(alpha ln n) · exp(beta ln lg n): with n >= 2, lg n >= 1, so every
// logarithm is of a positive number and the enclosure is certified.
Interval key_value(const SeriesKey& k, const Interval& n, long p) {
  Interval v(Rational(1), p);
  if (k.rho != 1) v = v * (n * pinterval(k.rho, p).log()).exp();
  if (sign_of_real(k.alpha) != 0) v = v * (k.alpha.enclose(p) * n.log()).exp();
  if (k.beta != 0) v = v * (Interval(Rational(k.beta), p) * n.log2().log()).exp();
  return v;
}

// The supremum of a(n)/b(n) over n >= x, when a/b does not increase from x
// on (b dominates a, or a = b); nullopt otherwise.
// With d = a/b = rho^n n^alpha lg^beta n, ln d(n) = n ln rho + alpha ln n +
// beta ln lg n, whose derivative is ln rho + (alpha + beta / ln n) / n. When
// it is <= 0 on [x, oo), d is non-increasing there and sup d = d(x).
std::optional<Interval> sup_ratio(const SeriesKey& a, const SeriesKey& b, const BigInt& x, long p) {
  SeriesKey d = key_div(a, b);
  Interval X = point(x, p);
  Interval lnx = X.log();
  int rho = compare(d.rho, Rational(1));
  if (rho > 0) return std::nullopt;
  int alpha = sign_of_real(d.alpha);
  if (rho == 0) {
    // No exponential factor: alpha > 0, or alpha = 0 with beta > 0, grows.
    if (alpha > 0) return std::nullopt;
    if (alpha == 0 && d.beta > 0) return std::nullopt;
    if (alpha < 0 && d.beta > 0) {
      // n^(-a) lg^b n decreases once ln n >= b / a.
      Interval need = Interval(Rational(d.beta), p) / (-d.alpha.enclose(p));
      if (!(lnx - need).certainly_nonnegative()) return std::nullopt;
    }
  } else {
    // d/dn ln(ratio) = ln(rho) + (alpha + beta/ln n)/n: at most its value's
    // bound at x, each positive part decreasing.
    Interval slope = d.alpha.enclose(p);
    if (d.beta > 0) slope = slope + Interval(Rational(d.beta), p) / lnx;
    Interval zero(Rational(0), p);
    Interval derivative = pinterval(d.rho, p).log() + Interval::max(slope, zero) / X;
    if (!(-derivative).certainly_nonnegative()) return std::nullopt;
  }
  return key_value(d, X, p);
}

// Binomial coefficient binom(k, j) = k (k - 1) ... (k - j + 1) / j! for
// real k. For a nameable k it is named, so binom(lg 3, 2) on both sides of
// a step cancels exactly.
Coef binomial(const RealNumber& k, int j, long p) {
  if (k.is_rational()) {
    Rational r = 1;
    for (int i = 0; i < j; ++i) r = r * (k.rational() - i) / (i + 1);
    return Coef::of(r);
  }
  Interval r(Rational(1), p);
  Interval kk = k.enclose(p);
  for (int i = 0; i < j; ++i)
    r = r * (kk - Interval(Rational(i), p)) / Interval(Rational(i + 1), p);
  if (nameable(k)) return Coef::atom("binom(" + k.str() + "," + std::to_string(j) + ")", r);
  return Coef::of(r);
}

// lead^k for a single term, exactly where the rationals allow: c^k with c a
// rational power of the logarithm's base stays rational ((1/2)^(lg 3) = 1/3).
// Why: with k = q + c' log_g a and c = g^e, c^k = g^(e q) · g^(e c' log_g a)
// = g^(e q) · a^(e c'). A step's coefficients are powers of its divisors
// ((1/2)^k for n/2), so |e| <= 64 covers the divisors 2^-64 ... 2^64 that
// share the logarithm's base; any other c gets a named power, which still
// cancels against itself.
Coef coef_power(const Coef& c, const RealNumber& k, long p) {
  if (c.exact) {
    if (c.q <= 0) throw SeriesUnsupported{"a power of a non-positive coefficient"};
    if (k.is_rational()) return coef_of_real(pow(RealNumber(c.q), k), p);
    const RealNumber::Node& node = k.node();
    if (c.q == 1) return Coef::of(Rational(1));
    if (node.kind == RealNumber::Kind::kLog) {
      // k = q + c' log_g(a); c = g^e for an integer e gives g^(e q) a^(e c').
      for (int e = -64; e <= 64; ++e) {
        if (e == 0) continue;
        Rational ge = 1;
        for (int i = 0; i < std::abs(e); ++i) ge *= node.g;
        if (e < 0) ge = Rational(1) / ge;
        if (ge != c.q) continue;
        RealNumber part1 = pow(RealNumber(node.g), RealNumber(node.q * e));
        RealNumber part2 = pow(RealNumber(node.a), RealNumber(node.c * e));
        return coef_of_real(part1 * part2, p);
      }
    }
    Interval v = pinterval(c.q, p).pow(k.enclose(p));
    if (nameable(k)) return Coef::atom("pow(" + to_string(c.q) + "," + k.str() + ")", v);
    return Coef::of(v);
  }
  Interval v = c.enclose(p);
  if (!v.certainly_positive()) throw SeriesUnsupported{"a power of a coefficient near zero"};
  return Coef::of(v.pow(k.enclose(p)));
}

// The expansion of A around its leading term L: A = L (1 + u). Every bound
// on the Taylor remainders below rests on |u(n)| <= u0 for all n >= from.
struct Relative {
  Series u;         // A / lead - 1
  SeriesKey kappa;  // u's largest key
  Interval U;       // |u(n)| <= U kappa(n) for n >= from
  Interval u0;      // |u(n)| <= u0 for n >= from
};

// A = lead · (1 + u): the relative rest and its bounds.
// |u(n)| = |sum c_t t(n)| <= kappa(n) · sum |c_t| sup_{m >= from} t(m)/kappa(m)
// = U kappa(n), each ratio non-increasing (sup_ratio); kappa itself decays
// (its key is below 1), so kappa(n) <= kappa(from) and |u| <= u0 = U
// kappa(from). Requiring u0 < 1/2 keeps the series convergent and the
// remainder factors (1 +- u0)^(k - order) and 1/(1 - u0) below 2^|k - order|
// and 2, so the remainder bounds stay useful.
Relative relative_rest(const Series& a, size_t lead, const SeriesContext& ctx) {
  long p = ctx.precision;
  const SeriesTerm& l = a.terms[lead];
  Coef inv = cinverse(l.coef, p);
  Relative r{Series{}, unit_key(), Interval(Rational(0), p), Interval(Rational(0), p)};
  if (!l.tag.empty()) throw SeriesUnsupported{"an expansion around a remainder term"};
  for (size_t i = 0; i < a.terms.size(); ++i) {
    if (i == lead) continue;
    const SeriesTerm& t = a.terms[i];
    accumulate(r.u, key_div(t.key, l.key), cmul(t.coef, inv, p), p, t.tag, t.bound);
  }
  if (r.u.terms.empty()) return r;
  r.kappa = r.u.terms[leading_index(r.u)].key;
  for (const SeriesTerm& t : r.u.terms) {
    std::optional<Interval> ratio = sup_ratio(t.key, r.kappa, ctx.from, p);
    if (!ratio) throw SeriesUnsupported{"a ratio of terms that does not decrease"};
    r.U = r.U + magnitude(t.effective(p)) * *ratio;
  }
  std::optional<Interval> k0 = sup_ratio(r.kappa, unit_key(), ctx.from, p);
  if (!k0 || compare_keys(r.kappa, unit_key()) >= 0)
    throw SeriesUnsupported{"an expansion around a term that does not dominate"};
  r.u0 = r.U * *k0;
  if (!(Interval(Rational(1, 2), p) - r.u0).certainly_positive())
    throw SeriesUnsupported{"n too small for the expansion to converge"};
  return r;
}

// A^k. Small whole powers are multiplied out exactly (no remainder). Else
// A^k = L^k (1 + u)^k with (1 + u)^k = sum_{j < order} binom(k, j) u^j + R and,
// by Lagrange's form of the remainder, R = binom(k, order) (1 + xi)^(k - order)
// u^order for some |xi| <= |u| <= u0; (1 + xi)^(k - order) is monotone in xi,
// so its largest value on [-u0, u0] is at an end:
// |R| <= |binom(k, order)| max((1 - u0)^(k - order), (1 + u0)^(k - order))
//        · U^order · kappa(n)^order.
Series power(const Series& a, const RealNumber& k, const SeriesContext& ctx) {
  long p = ctx.precision;
  if (a.terms.empty()) {
    if (sign_of_real(k) > 0) return a;
    throw SeriesUnsupported{"a non-positive power of zero"};
  }
  bool small_integer =
      k.is_rational() && k.rational() >= 0 && denominator(k.rational()) == 1 && k.rational() <= 16;
  if (small_integer && a.terms.size() > 1) {
    Series r = constant(Coef::of(Rational(1)));
    for (int i = 0; i < static_cast<int>(numerator(k.rational())); ++i) r = mul(r, a, p);
    return r;
  }
  size_t lead = leading_index(a);
  const SeriesTerm& l = a.terms[lead];
  SeriesKey key = l.key;
  if (key.rho != 1) {
    // (rho^n)^k = (rho^k)^n needs rho^k rational: a whole k.
    if (!k.is_rational() || denominator(k.rational()) != 1)
      throw SeriesUnsupported{"a non-integer power of an exponential"};
    Rational rho = 1;
    BigInt e = numerator(k.rational());
    for (BigInt i = 0; i < abs(e); ++i) rho *= key.rho;
    key.rho = e < 0 ? Rational(1) / rho : rho;
  }
  key.alpha = key.alpha * k;
  if (l.key.beta != 0) {
    // Keys carry whole powers of lg n only: (lg n)^(1/2) has no key.
    RealNumber b = RealNumber(static_cast<long>(l.key.beta)) * k;
    if (!b.is_integer()) throw SeriesUnsupported{"a fractional power of lg n"};
    key.beta = static_cast<int>(numerator(b.rational()));
  }
  Coef c = coef_power(l.coef, k, p);
  Series lead_power;
  lead_power.terms.push_back({key, c});
  if (a.terms.size() == 1) return lead_power;
  Relative rel = relative_rest(a, lead, ctx);
  int order = ctx.order;
  Series sum = constant(Coef::of(Rational(1)));
  Series u_power = constant(Coef::of(Rational(1)));
  for (int j = 1; j < order; ++j) {
    u_power = mul(u_power, rel.u, p);
    sum = add(sum, scale(u_power, binomial(k, j, p), p), p);
  }
  // binom(k, order) = 0 when k is a whole number below order: the series
  // ends, the sum is exact and no remainder is added.
  Coef bj = binomial(k, order, p);
  if (!bj.is_zero()) {
    Interval kk = k.enclose(p) - Interval(Rational(order), p);
    Interval one(Rational(1), p);
    Interval factor = Interval::max((one - rel.u0).pow(kk), (one + rel.u0).pow(kk));
    Interval e = magnitude(bj.enclose(p)) * factor;
    for (int j = 0; j < order; ++j) e = e * rel.U;
    SeriesKey rk = unit_key();
    for (int j = 0; j < order; ++j) rk = key_mul(rk, rel.kappa);
    Series rem;
    rem.terms.push_back({rk, Coef::of(Rational(1)), remainder_tag("pow", k, rel.u, order), e});
    sum = add(sum, rem, p);
  }
  return mul(lead_power, sum, p);
}

// lg A with A = c n^alpha (1 + u): lg c + alpha lg n + ln(1 + u) / ln 2, and
// ln(1 + u) = sum_{j < order} (-1)^(j+1) u^j / j + R. The order-th derivative
// of ln(1 + x) is (-1)^(order+1) (order - 1)! / (1 + x)^order, so Lagrange's
// form gives |R| <= |u|^order / (order (1 - u0)^order)
//               <= (U / (1 - u0))^order kappa(n)^order / order.
// A leading lg^beta n would give lg lg n, which has no key; a leading rho^n
// (n lg rho) occurs in no step we prove and is refused as well.
Series log2_series(const Series& a, const SeriesContext& ctx) {
  long p = ctx.precision;
  if (a.terms.empty()) throw SeriesUnsupported{"lg of zero"};
  size_t lead = leading_index(a);
  const SeriesTerm& l = a.terms[lead];
  if (l.key.rho != 1 || l.key.beta != 0)
    throw SeriesUnsupported{"lg of a term with an exponential or logarithmic factor"};
  if (!l.tag.empty()) throw SeriesUnsupported{"lg around a remainder term"};
  Interval c0 = l.coef.enclose(p);
  if (!c0.certainly_positive()) throw SeriesUnsupported{"lg of a term that is not positive"};
  // lg c: a whole number for c a power of two, else the named log_2 c, so
  // that lg 3 from the two sides of a step cancels.
  Series r;
  if (l.coef.exact && exact_log2(l.coef.q)) {
    accumulate(r, unit_key(), Coef::of(Rational(*exact_log2(l.coef.q))), p);
  } else if (l.coef.exact) {
    accumulate(r, unit_key(), coef_of_real(RealNumber::log(2, l.coef.q), p), p);
  } else {
    accumulate(r, unit_key(), Coef::of(c0.log2()), p);
  }
  accumulate(r, SeriesKey{Rational(1), RealNumber(0L), 1}, coef_of_real(l.key.alpha, p), p);
  if (a.terms.size() == 1) return r;
  Relative rel = relative_rest(a, lead, ctx);
  Interval ln2 = Interval(Rational(2), p).log();
  Coef inverse_ln2 = Coef::atom("1/ln2", Interval(Rational(1), p) / ln2);
  Series u_power = constant(Coef::of(Rational(1)));
  for (int j = 1; j < ctx.order; ++j) {
    u_power = mul(u_power, rel.u, p);
    Coef c = cmul(Coef::of(Rational(j % 2 == 1 ? 1 : -1, j)), inverse_ln2, p);
    r = add(r, scale(u_power, c, p), p);
  }
  Interval one(Rational(1), p);
  Interval e = one / (Interval(Rational(ctx.order), p) * ln2);
  for (int j = 0; j < ctx.order; ++j) e = e * rel.U / (one - rel.u0);
  SeriesKey rk = unit_key();
  for (int j = 0; j < ctx.order; ++j) rk = key_mul(rk, rel.kappa);
  Series rem;
  rem.terms.push_back(
      {rk, Coef::of(Rational(1)), remainder_tag("lg", RealNumber(0L), rel.u, ctx.order), e});
  return add(r, rem, p);
}

// The value of a subtree without n, exactly where constant_value can
// (lg 3, 3/2): constants become one coefficient, not a product of series.
std::optional<RealNumber> constant_of(const Expr& e) {
  if (mentions_n(e)) return std::nullopt;
  std::string reason;
  return constant_value(e, &reason);
}

// floor or ceil of an affine x = s n + t on the class n = M m + r:
// x = (s M) m + (s r + t). When s M is whole, x - (s r + t) is whole for
// every m, so floor(x) = x + (floor(v) - v) with v = s r + t: exact on the
// whole class. When it is not, the class is too coarse: NeedModulus asks the
// caller to split n further by the denominator of s M.
Series rounded(const Series& x, bool ceiling, const SeriesContext& ctx) {
  std::optional<std::pair<Rational, Rational>> aff = as_affine(x);
  if (!aff) throw SeriesUnsupported{"a floor or ceiling of a non-affine argument"};
  auto [s, t] = *aff;
  Rational sl = s * Rational(ctx.modulus);
  if (denominator(sl) != 1) {
    throw NeedModulus{static_cast<uint64_t>(denominator(sl))};
  }
  Rational v = s * Rational(ctx.residue) + t;
  Rational shift = ceiling ? Rational(ceil_of(v)) - v : Rational(floor_of(v)) - v;
  Series r;
  accumulate(r, SeriesKey{Rational(1), RealNumber(1L), 0}, Coef::of(s), ctx.precision);
  accumulate(r, unit_key(), Coef::of(t + shift), ctx.precision);
  return r;
}

// The value of a helper f(x) for x = `argument`: the line that applies on
// this residue class for every n >= from, expanded.
// A point line (f(3) = 7) has no expansion: it must be out of reach, which
// holds when the argument is increasing (slope > 0) and already past the
// point at n = from.
Series expand_helper(const Function& f, const Series& argument, const SeriesContext& ctx) {
  if (f.inlined_size > kMaxInlinedHelperSize) {
    throw SeriesUnsupported{"helper " + f.name + " expands to too many terms"};
  }
  std::optional<std::pair<Rational, Rational>> aff = as_affine(argument);
  for (const CaseLine& p : f.points) {
    if (!aff || aff->first <= 0 ||
        aff->first * Rational(ctx.from) + aff->second <= Rational(*p.point))
      throw SeriesUnsupported{"helper " + f.name + " has a point case its argument may reach"};
  }
  for (const CaseLine& line : f.conditional) {
    std::optional<bool> holds = decide_condition(*line.condition, argument, ctx);
    if (!holds)
      throw SeriesUnsupported{"helper " + f.name + ": the condition '" + print(*line.condition) +
                              "' is not decided by n's residue"};
    if (*holds) return expand(*line.body, argument, ctx);
  }
  if (!f.fallback) throw SeriesUnsupported{"helper " + f.name + " has no line for large n"};
  return expand(*f.fallback->body, argument, ctx);
}

// The affine value s n + t of an operand, or nullopt.
std::optional<std::pair<Rational, Rational>> affine_operand(const Expr& e, const Series& value,
                                                            const SeriesContext& ctx) {
  try {
    return as_affine(expand(e, value, ctx));
  } catch (const SeriesUnsupported&) {
    return std::nullopt;
  }
}

// For x = s n + t with n = modulus·m + residue: x = (s·modulus) m + (s·residue + t).
// The residue of x modulo k, when the class decides it: x mod k is the same
// for every m iff k divides s·modulus; otherwise the class must be split
// (NeedModulus). A base that is not whole means x is never an integer: no
// residue.
std::optional<BigInt> residue_of(const std::pair<Rational, Rational>& x, uint64_t k,
                                 const SeriesContext& ctx) {
  Rational step = x.first * Rational(ctx.modulus);
  if (denominator(step) != 1) throw NeedModulus{static_cast<uint64_t>(denominator(step))};
  if (numerator(step) % k != 0) throw NeedModulus{k};
  Rational base = x.first * Rational(ctx.residue) + x.second;
  if (denominator(base) != 1) return std::nullopt;
  return floor_mod(numerator(base), BigInt(k));
}

}  // namespace

// Three-valued: a conjunction is false when either side is, whatever the
// other; a disjunction is true when either side is.
std::optional<bool> decide_condition(const Expr& c, const Series& value, const SeriesContext& ctx) {
  switch (c.kind) {
    case ExprKind::kAnd:
    case ExprKind::kOr: {
      std::optional<bool> a = decide_condition(*c.args[0], value, ctx);
      std::optional<bool> b = decide_condition(*c.args[1], value, ctx);
      if (c.kind == ExprKind::kAnd) {
        if ((a && !*a) || (b && !*b)) return false;
        if (a && b) return true;
      } else {
        if ((a && *a) || (b && *b)) return true;
        if (a && b) return false;
      }
      return std::nullopt;
    }
    case ExprKind::kNot: {
      std::optional<bool> a = decide_condition(*c.args[0], value, ctx);
      if (!a) return std::nullopt;
      return !*a;
    }
    case ExprKind::kEven:
    case ExprKind::kOdd: {
      std::optional<std::pair<Rational, Rational>> x = affine_operand(*c.args[0], value, ctx);
      if (!x) return std::nullopt;
      std::optional<BigInt> r = residue_of(*x, 2, ctx);
      if (!r) return std::nullopt;
      return (*r == 0) == (c.kind == ExprKind::kEven);
    }
    case ExprKind::kEq:
    case ExprKind::kNe:
    case ExprKind::kLt:
    case ExprKind::kLe:
    case ExprKind::kGt:
    case ExprKind::kGe: {
      const Expr& l = *c.args[0];
      const Expr& r = *c.args[1];
      // x mod k == j
      if ((c.kind == ExprKind::kEq || c.kind == ExprKind::kNe) && l.kind == ExprKind::kCall &&
          l.name == "mod" && l.args.size() == 2 && !mentions_n(r) && !mentions_n(*l.args[1])) {
        std::optional<RealNumber> k = constant_value(*l.args[1]);
        std::optional<RealNumber> j = constant_value(r);
        std::optional<std::pair<Rational, Rational>> x = affine_operand(*l.args[0], value, ctx);
        if (!k || !j || !x || !k->is_integer() || !j->is_rational()) return std::nullopt;
        BigInt kk = numerator(k->rational());
        if (kk < 1 || kk > 1000) return std::nullopt;
        std::optional<BigInt> res = residue_of(*x, static_cast<uint64_t>(kk), ctx);
        if (!res) return std::nullopt;
        bool eq = Rational(*res) == j->rational();
        return c.kind == ExprKind::kEq ? eq : !eq;
      }
      std::optional<std::pair<Rational, Rational>> a = affine_operand(l, value, ctx);
      std::optional<std::pair<Rational, Rational>> b = affine_operand(r, value, ctx);
      if (!a || !b) return std::nullopt;
      Rational s = a->first - b->first, t = a->second - b->second;
      // l - r = s n + t is monotone in n: its sign is fixed on [from, oo)
      // when it is constant, or already has the sign of its slope at from.
      Rational at_from = s * Rational(ctx.from) + t;
      int sign;  // of l - r for every n >= from, when fixed
      if (s == 0) {
        sign = t > 0 ? 1 : t < 0 ? -1 : 0;
      } else if (s > 0 && at_from > 0) {
        sign = 1;
      } else if (s < 0 && at_from < 0) {
        sign = -1;
      } else {
        return std::nullopt;
      }
      return comparison_holds(c.kind, sign);
    }
    default:
      return std::nullopt;
  }
}

NonnegativeProof prove_nonnegative(const std::function<Series(const SeriesContext&)>& build,
                                   SeriesContext ctx, uint64_t& work, uint64_t budget) {
  // Blocks [x, 2x] too wide for one enclosure are split this many times.
  constexpr int kSubBlocks = 16;
  // The highest scale the blocks go to before giving up.
  constexpr uint64_t kMaxBlockScale = 8192;
  auto spend = [&](uint64_t units) {
    work += units;
    if (work > budget) throw SeriesUnsupported{"the proof's work budget ran out"};
  };
  NonnegativeProof proof;
  BigInt lo = ctx.from;
  for (;;) {
    spend(1);
    // Expanded afresh from lo: a larger `from` makes u0 smaller and every
    // remainder bound tighter, so a tail that does not dominate at 64 may
    // at 2^k.
    ctx.from = lo;
    Series s = build(ctx);
    if (is_identically_zero(s)) return proof;
    proof.identity = false;
    if (dominates_from(s, ctx)) {
      proof.tail_log2 = bit_length(lo) - 1;
      return proof;
    }
    // Hopeless cases end here rather than after 8192 doublings: a negative
    // leading term makes the slack negative for all large n (this bound's
    // step fails there; no block can help), and a leading coefficient of
    // unknown sign stays unknown at every larger `from` (it does not depend
    // on `from`).
    if (eventually_negative(s, ctx.precision))
      throw SeriesUnsupported{"the slack has a negative leading term"};
    if (leading_sign_unknown(s, ctx.precision))
      throw SeriesUnsupported{"the expansion does not settle the sign of the slack's leading term"};
    if (bit_length(lo) > kMaxBlockScale)
      throw SeriesUnsupported{"the slack's leading term does not dominate by 2^8192"};
    // The block [lo, 2 lo]: one enclosure on the whole block, else 16 pieces.
    // Interval evaluation loses to dependency (n^2 - 300 n on a wide block),
    // so narrower pieces succeed where the whole block does not.
    BigInt hi = 2 * lo;
    spend(1);
    if (!enclose_on(s, lo, hi, ctx.precision).certainly_nonnegative()) {
      BigInt step = (hi - lo) / kSubBlocks;
      if (step < 1) step = 1;
      for (BigInt a = lo; a < hi; a += step) {
        spend(1);
        BigInt b = std::min<BigInt>(a + step, hi);
        if (!enclose_on(s, a, b, ctx.precision).certainly_nonnegative())
          throw SeriesUnsupported{"the slack is not certainly non-negative near n = " + a.str()};
      }
    }
    ++proof.blocks;
    lo = hi;
  }
}

int compare_keys(const SeriesKey& a, const SeriesKey& b) {
  int c = compare(a.rho, b.rho);
  if (c != 0) return c;
  c = compare_real(a.alpha, b.alpha);
  if (c != 0) return c;
  return a.beta < b.beta ? -1 : a.beta > b.beta ? 1 : 0;
}

Interval SeriesTerm::effective(long precision) const {
  Interval c = coef.enclose(precision);
  if (tag.empty()) return c;
  return c * hull(-*bound, *bound);
}

Coef Coef::of(const Rational& q) {
  Coef c;
  c.exact = true;
  c.q = q;
  return c;
}

// An unnamed constant: a fresh name, so it never cancels with another
// (two enclosures that overlap need not be the same number).
Coef Coef::of(const Interval& iv) {
  // A point interval encloses exactly one number: that number, exactly.
  if (mpfr_equal_p(&iv.raw()->left, &iv.raw()->right) && mpfr_number_p(&iv.raw()->left))
    return Coef::of(iv.lower());
  static std::atomic<uint64_t> unnamed{0};
  return atom("#" + std::to_string(++unnamed), iv);
}

Coef Coef::atom(const std::string& name, const Interval& value) {
  Coef c;
  c.exact = false;
  c.monomials.emplace(name, std::pair{Rational(1), value});
  return c;
}

Interval Coef::enclose(long precision) const {
  if (exact) return Interval(q, precision);
  Interval sum(Rational(0), precision);
  for (const auto& [name, value] : monomials)
    sum = sum + Interval(value.first, precision) * value.second;
  return sum;
}

Series variable_series() {
  Series s;
  s.terms.push_back({SeriesKey{Rational(1), RealNumber(1L), 0}, Coef::of(Rational(1))});
  return s;
}

Series add(const Series& a, const Series& b, long precision) {
  Series r = a;
  for (const SeriesTerm& t : b.terms) accumulate(r, t, precision);
  return r;
}

Series negate(const Series& a) {
  Series r = a;
  for (SeriesTerm& t : r.terms) t.coef = cneg(t.coef);
  return r;
}

Series scale(const Series& a, const Coef& c, long precision) {
  Series r;
  for (const SeriesTerm& t : a.terms)
    accumulate(r, t.key, cmul(t.coef, c, precision), precision, t.tag, t.bound);
  return r;
}

// Affine means exact, with no remainder and no rho^n or lg n factor: only
// then is floor(s n + t) exact per residue (rounded()).
std::optional<std::pair<Rational, Rational>> as_affine(const Series& s) {
  Rational slope = 0, shift = 0;
  for (const SeriesTerm& t : s.terms) {
    if (!t.coef.exact || !t.tag.empty() || t.key.rho != 1 || t.key.beta != 0) return std::nullopt;
    // An exponent whose order is unknown is not affine (as_affine promises
    // nullopt, not a refusal).
    int order = 0, sign = 0;
    try {
      order = compare_real(t.key.alpha, RealNumber(1L));
      sign = sign_of_real(t.key.alpha);
    } catch (const SeriesUnsupported&) {
      return std::nullopt;
    }
    if (order == 0) {
      slope = t.coef.q;
    } else if (sign == 0) {
      shift = t.coef.q;
    } else {
      return std::nullopt;
    }
  }
  return std::pair{slope, shift};
}

Series expand(const Expr& e, const Series& n_value, const SeriesContext& ctx) {
  long p = ctx.precision;
  if (std::optional<RealNumber> c = constant_of(e)) return constant(coef_of_real(*c, p));
  auto arg = [&](size_t i) { return expand(*e.args[i], n_value, ctx); };
  switch (e.kind) {
    case ExprKind::kNumber:
      return constant(Coef::of(e.number));
    case ExprKind::kVariable:
      return n_value;
    case ExprKind::kAdd:
      return add(arg(0), arg(1), p);
    case ExprKind::kSub:
      return add(arg(0), negate(arg(1)), p);
    case ExprKind::kNeg:
      return negate(arg(0));
    case ExprKind::kMul:
      return mul(arg(0), arg(1), p);
    case ExprKind::kDiv:
      return mul(arg(0), power(arg(1), RealNumber(-1L), ctx), p);
    case ExprKind::kPow: {
      // x^k with k constant, or b^(s n + t) = (b^s)^n · b^t with whole s, t:
      // an exponential key with a rational rho, exact.
      if (std::optional<RealNumber> k = constant_of(*e.args[1])) return power(arg(0), *k, ctx);
      std::optional<RealNumber> base = constant_of(*e.args[0]);
      if (!base || !base->is_rational() || base->rational() <= 0)
        throw SeriesUnsupported{"a power whose exponent grows with n: " + print(e)};
      std::optional<std::pair<Rational, Rational>> exponent = as_affine(arg(1));
      if (!exponent || denominator(exponent->first) != 1 || denominator(exponent->second) != 1)
        throw SeriesUnsupported{"an exponential whose exponent is not s n + t: " + print(e)};
      Rational rho = 1, shift = 1;
      BigInt s = numerator(exponent->first), t = numerator(exponent->second);
      for (BigInt i = 0; i < abs(s); ++i) rho *= base->rational();
      if (s < 0) rho = Rational(1) / rho;
      for (BigInt i = 0; i < abs(t); ++i) shift *= base->rational();
      if (t < 0) shift = Rational(1) / shift;
      Series r;
      accumulate(r, SeriesKey{rho, RealNumber(0L), 0}, Coef::of(shift), p);
      return r;
    }
    case ExprKind::kCall: {
      const std::string& name = e.name;
      if (name == "floor" || name == "ceil") return rounded(arg(0), name == "ceil", ctx);
      if (name == "lg" || name == "log2") return log2_series(arg(0), ctx);
      // ln x = ln 2 · lg x and log_b x = lg x / lg b: named constants, so
      // they cancel across the step like lg does.
      if (name == "ln") {
        Coef ln2 = Coef::atom("ln2", Interval(Rational(2), p).log());
        return scale(log2_series(arg(0), ctx), ln2, p);
      }
      if (name == "log" && e.args.size() == 2) {
        std::optional<RealNumber> base = constant_of(*e.args[0]);
        if (!base || !base->is_rational() || base->rational() <= 1)
          throw SeriesUnsupported{"a logarithm whose base is not a constant > 1"};
        RealNumber lgb = RealNumber::log(2, base->rational());
        return scale(log2_series(arg(1), ctx), cinverse(coef_of_real(lgb, p), p), p);
      }
      if (name == "sqrt") return power(arg(0), RealNumber(Rational(1, 2)), ctx);
      if (ctx.helpers && e.args.size() == 1) {
        auto it = ctx.helpers->find(name);
        if (it != ctx.helpers->end()) return expand_helper(it->second, arg(0), ctx);
      }
      throw SeriesUnsupported{"the function " + name + " has no expansion here"};
    }
    default:
      throw SeriesUnsupported{"a condition inside an expression"};
  }
}

bool is_identically_zero(const Series& s) {
  for (const SeriesTerm& t : s.terms) {
    if (!t.coef.is_zero()) return false;
  }
  return true;
}

// Used only to give up early (prove_nonnegative): every term of a smaller
// key is o() of the leading one, so a certainly negative leading coefficient
// makes the series negative from some n on. A remainder of the same key
// could outweigh it; then giving up costs a proof, never a false holds.
bool eventually_negative(const Series& s, long precision) {
  if (is_identically_zero(s)) return false;
  return s.terms[leading_index(s)].effective(precision).certainly_negative();
}

// A remainder leading has no sign at all: |R| <= b key is all we know.
bool leading_sign_unknown(const Series& s, long precision) {
  if (is_identically_zero(s)) return false;
  const SeriesTerm& lead = s.terms[leading_index(s)];
  Interval c = lead.effective(precision);
  return !lead.tag.empty() || (!c.certainly_positive() && !c.certainly_negative());
}

// For n >= from: s(n) = c0 L(n) + sum c_i t_i(n)
//   >= L(n) (c0 - sum |c_i| sup_{m >= from} t_i(m)/L(m)),
// non-negative when the bracket is, with the lower end of c0 (remainders
// count with their full [-b, b]).
bool dominates_from(const Series& s, const SeriesContext& ctx) {
  if (is_identically_zero(s)) return true;
  long p = ctx.precision;
  size_t lead = leading_index(s);
  Interval c0 = s.terms[lead].effective(p);
  if (!c0.certainly_positive()) return false;
  Interval rest(Rational(0), p);
  for (size_t i = 0; i < s.terms.size(); ++i) {
    if (i == lead) continue;
    std::optional<Interval> ratio = sup_ratio(s.terms[i].key, s.terms[lead].key, ctx.from, p);
    if (!ratio) return false;
    rest = rest + magnitude(s.terms[i].effective(p)) * *ratio;
  }
  return (Interval(c0.lower(), p) - rest).certainly_positive();
}

// Every term enclosed on the hull [lo, hi] at once: certified but not tight
// (the terms' extremes need not fall at the same n), which is why blocks are
// split when it fails.
Interval enclose_on(const Series& s, const BigInt& lo, const BigInt& hi, long precision) {
  Interval n = hull(point(lo, precision), point(hi, precision));
  Interval sum(Rational(0), precision);
  for (const SeriesTerm& t : s.terms) {
    sum = sum + t.effective(precision) * key_value(t.key, n, precision);
  }
  return sum;
}

}  // namespace thetagate::engine
