// The arithmetic of asymptotic expansions (classify_expansion.h): merging
// terms by growth class, products and powers by leading terms, and lg of an
// expansion, each folding what it cannot keep exactly into the remainder.
//
// Unlike series.cc (certified bounds for a proof), these expansions only
// decide a growth class and, where it is known, the leading constant C in
// f ~ C g (docs/design.md, "Proofs": the master theorem's case 3 uses C).
// The soundness argument is the usual one for O-terms: every operation
// returns terms that are exact plus a remainder R = O(E) whose class E is an
// upper bound of everything dropped, so the leading term of the result is
// exact whenever it lies strictly above E. A sign is attached to E only when
// R is known to be Θ(E) with that sign.
#include "verifier/derivation/classify_expansion.h"

#include <algorithm>
#include <utility>

#include "verifier/numbers/value.h"

namespace thetagate::engine::classify_internal {

namespace {

// Terms kept before the rest is folded into the remainder. Products of
// k-term expansions have k^2 terms. What is read exactly is a driver's
// leading term and an exponent's terms down to its constant (c^(n + lg n + 1)),
// a few terms each, so 24 loses nothing in practice and bounds the work.
constexpr size_t kMaxTerms = 24;

// The class just below the leading term: the second term or the remainder.
// It is the relative error of keeping only the leading term: x = c G (1 +
// O(next / G)), which powers and lg carry through.
std::optional<GrowthClass> next_class(const Expansion& x) {
  std::optional<GrowthClass> next;
  if (x.terms.size() >= 2) next = x.terms[1].g;
  if (x.error && (!next || compare(*x.error, *next) > 0)) next = x.error;
  return next;
}

}  // namespace

const GrowthClass& n_class() {
  static const GrowthClass g = GrowthClass::polylog(RealNumber(1L));
  return g;
}

bool is_class(const GrowthClass& g, long alpha, long beta, long gamma) {
  return g.is_subexponential() && g.alpha == RealNumber(alpha) && g.beta == RealNumber(beta) &&
         g.gamma == RealNumber(gamma);
}

Expansion constant_expansion(const RealNumber& c) {
  Expansion x;
  if (c.sign() != 0) x.terms.push_back({c, GrowthClass::constant()});
  return x;
}

Expansion term_expansion(const RealNumber& c, const GrowthClass& g) {
  Expansion x;
  if (c.sign() != 0) x.terms.push_back({c, g});
  return x;
}

Expansion pure_expansion(const GrowthClass& g, int sign) {
  Expansion x;
  x.error = g;
  x.error_sign = sign;
  return x;
}

// O(E1) + O(E2) = O(max(E1, E2)); equal classes with opposite or unknown
// signs may cancel to anything below, so only the O() survives (sign 0).
void absorb(Expansion& x, const GrowthClass& g, int sign) {
  if (!x.error || compare(g, *x.error) > 0) {
    x.error = g;
    x.error_sign = sign;
  } else if (compare(g, *x.error) == 0 && x.error_sign != sign) {
    x.error_sign = 0;
  }
}

void normalize(Expansion& x) {
  std::stable_sort(x.terms.begin(), x.terms.end(),
                   [](const Term& a, const Term& b) { return compare(a.g, b.g) > 0; });
  std::vector<Term> merged;
  for (auto& t : x.terms) {
    if (!merged.empty() && compare(merged.back().g, t.g) == 0) {
      merged.back().c = merged.back().c + t.c;
    } else {
      merged.push_back(t);
    }
  }
  // A term at or below the remainder's class is not exact information any
  // more: c E + O(E) is O(E). One below disappears into it; one of the same
  // class leaves the remainder's sign only when the signs agree.
  std::vector<Term> kept;
  for (auto& t : merged) {
    int s = t.c.sign();
    if (s == 0) continue;
    if (x.error && compare(t.g, *x.error) <= 0) {
      if (compare(t.g, *x.error) == 0 && x.error_sign != s) x.error_sign = 0;
      continue;
    }
    kept.push_back(t);
  }
  if (kept.size() > kMaxTerms) {
    // The first dropped term dominates everything after it: its sign is the remainder's.
    absorb(x, kept[kMaxTerms].g, kept[kMaxTerms].c.sign());
    kept.resize(kMaxTerms);
  }
  x.terms = std::move(kept);
}

// With no exact term the remainder leads only when its sign is known
// (R = Θ(E)); O(E) alone could be 0 or o(E), so the class is not known.
Lead lead_of(const Expansion& x) {
  if (!x.terms.empty()) return {x.terms[0].g, x.terms[0].c, true, x.terms[0].c.sign()};
  if (x.error && x.error_sign != 0)
    return {*x.error, RealNumber(static_cast<long>(x.error_sign)), false, x.error_sign};
  if (x.error) {
    throw Refusal{"the leading terms cancel, leaving a remainder known only as O(" +
                  to_string(*x.error) + ")"};
  }
  throw Refusal{"the expression is zero"};
}

Expansion add(Expansion x, const Expansion& y) {
  for (const auto& t : y.terms) x.terms.push_back(t);
  if (y.error) absorb(x, *y.error, y.error_sign);
  normalize(x);
  return x;
}

Expansion negate(Expansion x) {
  for (auto& t : x.terms) t.c = -t.c;
  x.error_sign = -x.error_sign;
  return x;
}

// (sum s_i + O(E)) (sum t_j + O(F)) = sum s_i t_j + O(t_0 E) + O(s_0 F)
// (+ O(E F), smaller than both): the error of each factor times the other's
// leading term. When a factor is only Θ(E) with a sign, the product is
// Θ(lead x · lead y) with the product of the signs, and no constant.
Expansion multiply(const Expansion& x, const Expansion& y) {
  if (x.is_zero() || y.is_zero()) return {};
  if (x.is_pure() || y.is_pure()) {
    Lead a = lead_of(x), b = lead_of(y);
    return pure_expansion(a.g.times(b.g), a.sign * b.sign);
  }
  Expansion r;
  for (const auto& s : x.terms) {
    for (const auto& t : y.terms) r.terms.push_back({s.c * t.c, s.g.times(t.g)});
  }
  if (x.error) absorb(r, y.terms[0].g.times(*x.error), 0);
  if (y.error) absorb(r, x.terms[0].g.times(*y.error), 0);
  r.error_sign = 0;
  normalize(r);
  return r;
}

// x^r by its leading term: c^r G^r (1 + O(next/G)).
Expansion approximate_power(const Expansion& x, const RealNumber& r, const std::string& what) {
  if (x.is_zero()) throw Refusal{"'" + what + "' takes a power of zero"};
  // A negative base to a fractional power is not real. To a whole power it
  // is, but only integer_power (0 ... 12) multiplies the signs out; this
  // path does not track them, so it refuses.
  Lead l = lead_of(x);
  if (l.sign < 0)
    throw Refusal{"'" + what + "' takes a fractional or negative power of a negative quantity"};
  GrowthClass g = l.g.power(r);
  if (!l.known) return pure_expansion(g, 1);
  // (c G (1 + O(e)))^r = c^r G^r (1 + O(e)) for e = next/G -> 0 (binomial
  // series), so the error is G^r · next/G.
  Expansion out = term_expansion(pow(l.c, r), g);
  if (auto next = next_class(x)) out.error = g.times(next->over(l.g));
  return out;
}

// Repeated products keep the lower terms exact (n + 1)^2 = n^2 + 2n + 1;
// past 12 factors the term count (and work) grows too fast for the gain.
Expansion integer_power(const Expansion& x, long k, const std::string& what) {
  if (k > 12) return approximate_power(x, RealNumber(k), what);
  Expansion r = constant_expansion(RealNumber(1L));
  for (long i = 0; i < k; ++i) r = multiply(r, x);
  return r;
}

// lg(c G (1 + O(e))) = lg G + lg c + O(e), since lg(1 + O(e)) = O(e); and
// lg G for G = rho^n n^alpha lg^beta n (lg lg n)^gamma is
// n lg rho + alpha lg n + beta lg lg n + gamma lg lg lg n.
Expansion lg_of(const Expansion& x, const std::string& what) {
  if (x.is_zero()) throw Refusal{"'" + what + "' takes lg of zero"};
  Lead l = lead_of(x);
  if (l.sign < 0) throw Refusal{"'" + what + "' takes lg of a negative quantity"};
  if (l.g.is_constant()) {
    // lg of a bounded quantity is a constant only if the constant is known,
    // and tends to lg 1 = 0 (no class) when it is 1.
    if (!l.known)
      throw Refusal{"'" + what + "' takes lg of a bounded quantity with unknown constant"};
    if (l.c == RealNumber(1L)) throw Refusal{"'" + what + "' takes lg of a quantity tending to 1"};
    Expansion out = constant_expansion(log2_of(l.c));
    if (auto next = next_class(x)) absorb(out, next->over(l.g), 0);
    return out;
  }
  Expansion out;
  if (!l.g.is_subexponential()) out.terms.push_back({log2_of(l.g.rho), n_class()});
  if (l.g.alpha.sign() != 0) out.terms.push_back({l.g.alpha, GrowthClass::polylog(0, 1)});
  if (l.g.beta.sign() != 0) out.terms.push_back({l.g.beta, GrowthClass::polylog(0, 0, 1)});
  if (l.g.gamma.sign() != 0) {
    if (out.terms.empty())
      throw Refusal{"'" + what + "' grows like lg lg lg n, outside the normal form"};
    absorb(out, GrowthClass::polylog(0, 0, Rational(1, 2)), 0);  // lg lg lg n = o(sqrt(lg lg n))
  }
  if (l.known) {
    if (l.c != RealNumber(1L)) out.terms.push_back({log2_of(l.c), GrowthClass::constant()});
  } else {
    absorb(out, GrowthClass::constant(), 0);
  }
  if (auto next = next_class(x)) absorb(out, next->over(l.g), 0);
  normalize(out);
  return out;
}

}  // namespace thetagate::engine::classify_internal
