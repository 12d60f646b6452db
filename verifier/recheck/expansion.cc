#include "verifier/recheck/expansion.h"

#include <algorithm>
#include <cmath>
#include <sstream>

#include "verifier/numbers/value.h"

namespace thetagate::engine::recheck {
namespace {

Interval point(const Rational& q) { return Interval(q, kPrecision); }

// The smallest interval holding both.
Interval span(const Interval& a, const Interval& b) {
  Interval out(kPrecision);
  mpfi_union(out.raw(), a.raw(), b.raw());
  return out;
}

Interval enclose(const RealNumber& x) { return x.enclose(kPrecision); }

Coef coef_of(const RealNumber& x) {
  if (x.is_rational()) return Coef::of(x.rational());
  return Coef::of(enclose(x));
}

Coef coef_add(const Coef& a, const Coef& b) {
  if (a.exact && b.exact) return Coef::of(*a.exact + *b.exact);
  return Coef::of(a.enclose() + b.enclose());
}

Coef coef_mul(const Coef& a, const Coef& b) {
  if (a.is_zero() || b.is_zero()) return Coef::of(Rational(0));
  if (a.exact && b.exact) return Coef::of(*a.exact * *b.exact);
  return Coef::of(a.enclose() * b.enclose());
}

Coef coef_inverse(const Coef& a) {
  if (a.exact) {
    if (*a.exact == 0) throw Unsupported("a division by zero");
    return Coef::of(1 / *a.exact);
  }
  if (a.range->contains_zero()) throw Unsupported("a division by a coefficient near zero");
  return Coef::of(point(1) / *a.range);
}

Coef power_coef(const Coef& c, const RealNumber& k) {
  if (c.exact) return rational_power(*c.exact, k);
  if (!c.range->certainly_positive()) throw Unsupported("a real power of a coefficient near zero");
  return Coef::of(c.range->pow(enclose(k)));
}

Key key_mul(const Key& a, const Key& b) {
  return {a.rho * b.rho, a.alpha + b.alpha, a.beta + b.beta};
}

Expansion single(Key key, Coef c) {
  Expansion e;
  if (!c.is_zero()) e.terms.push_back({std::move(key), std::move(c)});
  return e;
}

Key unit_key() { return Key{1, RealNumber(0L), 0}; }
Key n_key(const RealNumber& alpha, int beta = 0) { return Key{1, alpha, beta}; }

bool is_constant(const Expansion& e) {
  for (const Term& t : e.terms)
    if (compare_keys(t.key, unit_key()) != 0) return false;
  return true;
}

Coef constant_part(const Expansion& e) {
  for (const Term& t : e.terms)
    if (compare_keys(t.key, unit_key()) == 0) return t.coef;
  return Coef::of(Rational(0));
}

// |t/s| / from, the largest |u| in 1 + u for n >= from; at most 1/2.
Rational small_ratio(const Rational& s, const Rational& t, const BigInt& from) {
  Rational delta = abs(t / s) / Rational(from);
  if (delta > Rational(1, 2)) throw Unsupported("n too small for the expansion of an argument");
  return delta;
}

Expansion lg_of(const Expansion& y, const Context& ctx) {
  Interval ln2 = point(2).log();
  if (is_constant(y)) {
    Coef c = constant_part(y);
    if (c.exact) {
      if (*c.exact <= 0) throw Unsupported("lg of a number that is not positive");
      return single(unit_key(), coef_of(RealNumber::log(Rational(2), *c.exact)));
    }
    if (!c.range->certainly_positive()) throw Unsupported("lg of a number near zero");
    return single(unit_key(), Coef::of(c.range->log2()));
  }
  if (y.terms.size() == 1) {
    const Term& term = y.terms[0];
    if (term.key.beta != 0) throw Unsupported("lg lg n");
    Expansion out = lg_of(single(unit_key(), term.coef), ctx);
    out = add(out, single(n_key(RealNumber(0L), 1), coef_of(term.key.alpha)));
    if (term.key.rho != 1)
      out = add(out,
                single(n_key(RealNumber(1L)), coef_of(RealNumber::log(Rational(2), term.key.rho))));
    return out;
  }
  auto aff = as_affine(y);
  if (!aff || aff->first <= 0) throw Unsupported("lg of a sum that is not s n + t");
  auto [s, t] = *aff;
  // lg(s n + t) = lg s + lg n + lg(1 + u), u = (t/s)/n, and for u > -1
  // u - u^2/(1 + u) <= ln(1 + u) <= u.
  Rational r = t / s;
  Rational delta = small_ratio(s, t, ctx.from);
  Expansion out = lg_of(single(n_key(RealNumber(1L)), Coef::of(s)), ctx);
  out = add(out, single(n_key(RealNumber(-1L)), Coef::of(point(r) / ln2)));
  Interval low = -(point(r * r) / (point(1 - delta) * ln2));
  return add(out, single(n_key(RealNumber(-2L)), Coef::of(span(low, point(0)))));
}

Expansion power_of(const Expansion& y, const RealNumber& k, const Context& ctx) {
  if (k.is_integer() && k >= RealNumber(0L) && k <= RealNumber(64L)) {
    Expansion out = constant(Coef::of(Rational(1)));
    for (BigInt i = 0; i < numerator(k.rational()); ++i) out = multiply(out, y);
    return out;
  }
  if (y.terms.size() == 1) {
    const Term& term = y.terms[0];
    Key key = term.key;
    if (key.rho != 1) throw Unsupported("a non-integer power of an exponential");
    RealNumber beta = RealNumber(static_cast<long>(key.beta)) * k;
    if (!beta.is_integer()) throw Unsupported("a fractional power of lg n");
    return single(Key{1, key.alpha * k, static_cast<int>(numerator(beta.rational()))},
                  power_coef(term.coef, k));
  }
  auto aff = as_affine(y);
  if (!aff || aff->first <= 0) throw Unsupported("a real power of a sum that is not s n + t");
  auto [s, t] = *aff;
  // (s n + t)^k = s^k n^k (1 + u)^k, u = (t/s)/n: 1 + k u + R with
  // |R| <= |k (k - 1)| / 2 · max (1 + xi)^(k - 2) · u^2 over |xi| <= delta.
  Rational r = t / s;
  Rational delta = small_ratio(s, t, ctx.from);
  Coef lead = rational_power(s, k);
  Expansion out = single(n_key(k), lead);
  out = add(out,
            single(n_key(k - RealNumber(1L)), coef_mul(lead, coef_mul(coef_of(k), Coef::of(r)))));
  Interval kk = enclose(k);
  Interval km2 = kk - point(2);
  Interval worst = Interval::max(point(1 - delta).pow(km2), point(1 + delta).pow(km2));
  Interval e = kk * (kk - point(1)) * worst * point(r * r) / point(2);
  Interval mag = Interval::max(e, -e);
  return add(out, single(n_key(k - RealNumber(2L)), coef_mul(lead, Coef::of(span(-mag, mag)))));
}

// The value of y on the class as s_y m + c: its constant part on the
// residue, when y is affine with s_y · modulus an integer multiple of `period`.
std::optional<Rational> class_constant(const Expansion& y, const Context& ctx,
                                       const BigInt& period) {
  auto aff = as_affine(y);
  if (!aff) return std::nullopt;
  auto [s, t] = *aff;
  Rational step = s * Rational(BigInt(ctx.modulus));
  if (denominator(step) != 1 || floor_mod(numerator(step), period) != 0) return std::nullopt;
  return s * Rational(BigInt(ctx.residue)) + t;
}

Expansion rounded(const Expansion& y, const Context& ctx, bool up) {
  if (auto c = class_constant(y, ctx, BigInt(1))) {
    // On the class, y = (integer) + c, so floor(y) = y - frac(c).
    Rational shift = up ? Rational(ceil_of(*c)) - *c : Rational(floor_of(*c)) - *c;
    return add(y, constant(Coef::of(shift)));
  }
  // Otherwise only the relaxation y - 1 < floor(y) <= y.
  Interval iv = up ? span(point(0), point(1)) : span(point(-1), point(0));
  return add(y, constant(Coef::of(iv)));
}

// The smallest n >= from on the class.
BigInt first_on_class(const Context& ctx) {
  BigInt n = ctx.from;
  BigInt m(ctx.modulus);
  BigInt shift = floor_mod(BigInt(ctx.residue) - n, m);
  return n + shift;
}

}  // namespace

// s^k for a rational s > 0: exact when it is rational, which is checked by
// exact logarithms ((1/2)^(lg 3) = 1/3 because lg(1/3) = -lg 3 exactly).
Coef rational_power(const Rational& s, const RealNumber& k) {
  if (s <= 0) throw Unsupported("a power of a non-positive number");
  if (s == 1) return Coef::of(Rational(1));
  if (k.is_integer()) {
    BigInt e = numerator(k.rational());
    if (abs(e) > 4096) throw Unsupported("an integer power too large");
    Rational r = 1, base = e < 0 ? 1 / s : s;
    for (BigInt i = 0; i < abs(e); ++i) r *= base;
    return Coef::of(r);
  }
  RealNumber direct = pow(RealNumber(s), k);
  if (direct.is_rational()) return Coef::of(direct.rational());
  Interval v = enclose(direct);
  // Continued-fraction guesses with small denominators, each verified exactly.
  double x = v.approx();
  if (std::isfinite(x) && x > 0 && x < 1e15) {
    BigInt h0 = 0, h1 = 1, k0 = 1, k1 = 0;
    double rest = x;
    for (int i = 0; i < 24; ++i) {
      double a = std::floor(rest);
      BigInt ai(static_cast<long long>(a));
      BigInt h2 = ai * h1 + h0, k2 = ai * k1 + k0;
      h0 = h1, h1 = h2, k0 = k1, k1 = k2;
      if (k1 > BigInt(1000000)) break;
      Rational guess(h1, k1);
      // s^k = guess exactly iff log_s(guess) = k, both exact logarithms.
      try {
        if (guess > 0 && RealNumber::log(s, guess) == k) return Coef::of(guess);
      } catch (const PrecisionShortfall&) {
        // Not decidable exactly: keep the enclosure.
      } catch (const DomainError&) {
      }
      if (rest - a < 1e-12) break;
      rest = 1 / (rest - a);
    }
  }
  return Coef::of(v);
}

Interval Coef::enclose() const { return exact ? point(*exact) : *range; }

int compare_keys(const Key& a, const Key& b) {
  if (a.rho != b.rho) return a.rho < b.rho ? -1 : 1;
  int c = compare(a.alpha, b.alpha);
  if (c != 0) return c;
  return a.beta == b.beta ? 0 : (a.beta < b.beta ? -1 : 1);
}

Expansion constant(const Coef& c) { return single(unit_key(), c); }

Expansion add(const Expansion& a, const Expansion& b) {
  Expansion out = a;
  for (const Term& t : b.terms) {
    auto it = std::find_if(out.terms.begin(), out.terms.end(),
                           [&](const Term& o) { return compare_keys(o.key, t.key) == 0; });
    if (it == out.terms.end()) {
      out.terms.push_back(t);
    } else {
      it->coef = coef_add(it->coef, t.coef);
      if (it->coef.is_zero()) out.terms.erase(it);
    }
  }
  return out;
}

Expansion scale(const Expansion& a, const Coef& c) {
  Expansion out;
  for (const Term& t : a.terms) out = add(out, single(t.key, coef_mul(t.coef, c)));
  return out;
}

Expansion negate(const Expansion& a) { return scale(a, Coef::of(Rational(-1))); }

Expansion multiply(const Expansion& a, const Expansion& b) {
  Expansion out;
  for (const Term& x : a.terms)
    for (const Term& y : b.terms)
      out = add(out, single(key_mul(x.key, y.key), coef_mul(x.coef, y.coef)));
  return out;
}

std::optional<std::pair<Rational, Rational>> as_affine(const Expansion& e) {
  Rational s = 0, t = 0;
  for (const Term& term : e.terms) {
    if (!term.coef.exact) return std::nullopt;
    if (compare_keys(term.key, unit_key()) == 0) {
      t = *term.coef.exact;
    } else if (compare_keys(term.key, n_key(RealNumber(1L))) == 0) {
      s = *term.coef.exact;
    } else {
      return std::nullopt;
    }
  }
  return std::make_pair(s, t);
}

RealNumber constant_value(const Expr& e) {
  auto arg = [&](size_t i) { return constant_value(*e.args[i]); };
  switch (e.kind) {
    case ExprKind::kNumber:
      return RealNumber(e.number);
    case ExprKind::kAdd:
      return arg(0) + arg(1);
    case ExprKind::kSub:
      return arg(0) - arg(1);
    case ExprKind::kMul:
      return arg(0) * arg(1);
    case ExprKind::kDiv: {
      RealNumber d = arg(1);
      if (d.sign() == 0) throw Unsupported("a division by zero");
      return arg(0) / d;
    }
    case ExprKind::kNeg:
      return -arg(0);
    case ExprKind::kPow: {
      RealNumber b = arg(0), k = arg(1);
      if (b.sign() <= 0) throw Unsupported("a power of a number that is not positive");
      return pow(b, k);
    }
    case ExprKind::kCall: {
      if (e.name == "lg" || e.name == "log2") return log2_of(arg(0));
      if (e.name == "sqrt") return pow(arg(0), RealNumber(Rational(1, 2)));
      if (e.name == "log") {
        RealNumber b = arg(0);
        if (!b.is_rational()) throw Unsupported("a logarithm to an irrational base");
        RealNumber x = arg(1);
        if (!x.is_rational()) throw Unsupported("a logarithm of an irrational number");
        return RealNumber::log(b.rational(), x.rational());
      }
      break;
    }
    default:
      break;
  }
  throw Unsupported("the constant " + print(e));
}

Expansion expand(const Expr& e, const Context& ctx, const Rational& s, const Rational& t) {
  auto sub = [&](size_t i) { return expand(*e.args[i], ctx, s, t); };
  switch (e.kind) {
    case ExprKind::kNumber:
      return constant(Coef::of(e.number));
    case ExprKind::kVariable:
      return add(single(n_key(RealNumber(1L)), Coef::of(s)), constant(Coef::of(t)));
    case ExprKind::kAdd:
      return add(sub(0), sub(1));
    case ExprKind::kSub:
      return add(sub(0), negate(sub(1)));
    case ExprKind::kNeg:
      return negate(sub(0));
    case ExprKind::kMul:
      return multiply(sub(0), sub(1));
    case ExprKind::kDiv: {
      Expansion d = sub(1);
      if (d.terms.size() != 1) throw Unsupported("a division by a sum: " + print(*e.args[1]));
      const Term& term = d.terms[0];
      Key inverse{1 / term.key.rho, -term.key.alpha, -term.key.beta};
      return multiply(sub(0), single(inverse, coef_inverse(term.coef)));
    }
    case ExprKind::kPow: {
      const Expr& exponent = *e.args[1];
      if (!mentions_n(exponent)) return power_of(sub(0), constant_value(exponent), ctx);
      if (mentions_n(*e.args[0])) throw Unsupported("n in both base and exponent");
      RealNumber base = constant_value(*e.args[0]);
      if (!base.is_rational() || base.sign() <= 0)
        throw Unsupported("an exponential whose base is not a positive rational");
      auto aff = as_affine(expand(exponent, ctx, s, t));
      if (!aff || denominator(aff->first) != 1 || aff->first <= 0)
        throw Unsupported("an exponent that is not k n + t with a whole k > 0");
      Rational rho = base.rational();
      Coef shift = rational_power(rho, RealNumber(aff->second));
      Coef step = rational_power(rho, RealNumber(aff->first));
      if (!step.exact) throw Unsupported("an exponential base that is not rational");
      return single(Key{*step.exact, RealNumber(0L), 0}, shift);
    }
    case ExprKind::kCall:
      break;
    default:
      throw Unsupported("the expression " + print(e));
  }
  const std::string& name = e.name;
  if (name == "lg" || name == "log2") return lg_of(sub(0), ctx);
  if (name == "ln") return scale(lg_of(sub(0), ctx), Coef::of(point(2).log()));
  if (name == "log") {
    RealNumber base = constant_value(*e.args[0]);
    if (!base.is_rational()) throw Unsupported("a logarithm to an irrational base");
    RealNumber lgb = RealNumber::log(Rational(2), base.rational());
    if (lgb.sign() == 0) throw Unsupported("a logarithm to base 1");
    return scale(lg_of(sub(1), ctx), coef_of(RealNumber(1L) / lgb));
  }
  if (name == "sqrt") return power_of(sub(0), RealNumber(Rational(1, 2)), ctx);
  if (name == "floor" || name == "ceil") return rounded(sub(0), ctx, name == "ceil");
  if (name == "mod") {
    RealNumber k = constant_value(*e.args[1]);
    if (!k.is_integer() || k.sign() <= 0) throw Unsupported("mod by a number that is not whole");
    BigInt period = numerator(k.rational());
    auto c = class_constant(sub(0), ctx, period);
    if (!c || denominator(*c) != 1) throw Unsupported("mod that is not constant on the class");
    return constant(Coef::of(Rational(floor_mod(numerator(*c), period))));
  }
  if (ctx.helpers) {
    auto it = ctx.helpers->find(name);
    if (it != ctx.helpers->end()) {
      auto aff = as_affine(sub(0));
      if (!aff) throw Unsupported("a helper called at an argument that is not s n + t");
      const CaseLine& line = line_on_class(it->second, ctx, aff->first, aff->second);
      return expand(*line.body, ctx, aff->first, aff->second);
    }
  }
  throw Unsupported("the function " + name);
}

bool decide(const Expr& c, const Context& ctx, const Rational& s, const Rational& t) {
  switch (c.kind) {
    case ExprKind::kAnd:
      return decide(*c.args[0], ctx, s, t) && decide(*c.args[1], ctx, s, t);
    case ExprKind::kOr:
      return decide(*c.args[0], ctx, s, t) || decide(*c.args[1], ctx, s, t);
    case ExprKind::kNot:
      return !decide(*c.args[0], ctx, s, t);
    case ExprKind::kEven:
    case ExprKind::kOdd: {
      auto k = class_constant(expand(*c.args[0], ctx, s, t), ctx, BigInt(2));
      if (!k || denominator(*k) != 1) throw Unsupported("a parity that changes on the class");
      bool even = floor_mod(numerator(*k), BigInt(2)) == 0;
      return c.kind == ExprKind::kEven ? even : !even;
    }
    case ExprKind::kEq:
    case ExprKind::kNe:
    case ExprKind::kLt:
    case ExprKind::kLe:
    case ExprKind::kGt:
    case ExprKind::kGe: {
      Expansion d = add(expand(*c.args[0], ctx, s, t), negate(expand(*c.args[1], ctx, s, t)));
      auto aff = as_affine(d);
      if (!aff) throw Unsupported("the condition " + print(c));
      auto [ds, dt] = *aff;
      Rational at = ds * Rational(first_on_class(ctx)) + dt;
      int sign;
      if (ds == 0) {
        sign = dt == 0 ? 0 : (dt > 0 ? 1 : -1);
      } else if (ds > 0 && at > 0) {
        sign = 1;
      } else if (ds < 0 && at < 0) {
        sign = -1;
      } else {
        throw Unsupported("the condition " + print(c) + " changes beyond n = " + ctx.from.str());
      }
      return comparison_holds(c.kind, sign);
    }
    default:
      throw Unsupported("the condition " + print(c));
  }
}

const CaseLine& line_on_class(const Function& f, const Context& ctx, const Rational& s,
                              const Rational& t) {
  Rational lowest = s * Rational(first_on_class(ctx)) + t;
  for (const CaseLine& p : f.points) {
    if (s <= 0 || Rational(*p.point) >= lowest)
      throw Unsupported("the point case " + f.name + "(" + p.point->str() +
                        ") lies beyond n = " + ctx.from.str());
  }
  for (const CaseLine& line : f.conditional)
    if (decide(*line.condition, ctx, s, t)) return line;
  if (!f.fallback) throw Unsupported("no line of " + f.name + " applies on the class");
  return *f.fallback;
}

namespace {

// The key at every real n in [lo, hi] (lo >= 2).
Interval key_on(const Key& k, const Interval& n) {
  Interval v = point(1);
  if (k.rho != 1) v = v * (n * point(k.rho).log()).exp();
  if (k.alpha.sign() != 0) v = v * (enclose(k.alpha) * n.log()).exp();
  if (k.beta != 0) v = v * (point(k.beta) * n.log2().log()).exp();
  return v;
}

Interval hull(const Rational& lo, const Rational& hi) { return span(point(lo), point(hi)); }

Interval value_on(const Expansion& e, const Interval& n) {
  Interval sum = point(0);
  for (const Term& t : e.terms) sum = sum + t.coef.enclose() * key_on(t.key, n);
  return sum;
}

// The smallest integer >= lo on the class, if it is at most hi.
std::optional<BigInt> integer_in(const Rational& lo, const Rational& hi, uint64_t modulus,
                                 uint64_t residue) {
  BigInt n = ceil_of(lo);
  n += floor_mod(BigInt(residue) - n, BigInt(modulus));
  if (Rational(n) > hi) return std::nullopt;
  return n;
}

struct BlockWalk {
  const Expansion& e;
  uint64_t modulus, residue;
  uint64_t budget = 400000;
  ProofOutcome failure;

  bool block(const Rational& lo, const Rational& hi, int depth) {
    if (budget == 0) {
      failure = {Proof::kUnproved, "the block budget ran out near n = " + to_string(lo)};
      return false;
    }
    --budget;
    Interval sum = value_on(e, hull(lo, hi));
    if (sum.certainly_nonnegative()) return true;
    if (depth >= 40 || sum.certainly_negative()) {
      if (auto n = integer_in(lo, hi, modulus, residue)) {
        Interval at = value_on(e, point(Rational(*n)));
        if (at.certainly_negative()) {
          failure = {Proof::kFalse, "it is negative at n = " + n->str() + " (" + at.str(6) + ")"};
          return false;
        }
      }
      if (depth >= 40) {
        failure = {Proof::kUnproved,
                   "the enclosure is too wide to decide near n = " + point(lo).str(8)};
        return false;
      }
    }
    Rational mid = (lo + hi) / 2;
    return block(lo, mid, depth + 1) && block(mid, hi, depth + 1);
  }
};

}  // namespace

ProofOutcome prove_nonnegative(const Expansion& input, const BigInt& from, uint64_t modulus,
                               uint64_t residue) {
  if (from < 2) return {Proof::kUnproved, "the range starts below n = 2"};
  Expansion e;
  for (const Term& t : input.terms)
    if (!t.coef.is_zero()) e.terms.push_back(t);
  if (e.terms.empty()) return {};  // identically zero
  auto lead = std::max_element(e.terms.begin(), e.terms.end(), [](const Term& a, const Term& b) {
    return compare_keys(a.key, b.key) < 0;
  });
  Interval c0 = lead->coef.enclose();
  if (c0.certainly_negative())
    return {Proof::kFalse,
            "its leading term is negative, so it is negative for every large n: " + describe(e)};
  if (!c0.certainly_positive())
    return {Proof::kUnproved, "the sign of its leading term is not decided: " + describe(e)};
  Interval ln2 = point(2).log();
  // Beyond 2^K each other term's ratio to the leading term decreases and
  // the ratios add up to less than the leading coefficient.
  auto tail_holds = [&](uint64_t K) {
    Interval X = (point(Rational(static_cast<long>(K))) * ln2).exp();
    Interval lnX = point(Rational(static_cast<long>(K))) * ln2;
    Interval total = point(0);
    for (const Term& t : e.terms) {
      if (&t == &*lead) continue;
      Interval rho = point(t.key.rho / lead->key.rho).log();
      Interval da = enclose(t.key.alpha - lead->key.alpha);
      Interval db = point(t.key.beta - lead->key.beta);
      Interval zero = point(0);
      // Whether the ratio t(n)/lead(n) decreases for every n >= X: its
      // logarithmic derivative is ln(rho_t/rho_0) + da/n + db/(n ln n).
      bool decreasing;
      if (t.key.rho < lead->key.rho) {
        Interval slope = rho + Interval::max(da, zero) / X + Interval::max(db, zero) / (X * lnX);
        decreasing = slope.certainly_negative();
      } else if (t.key.alpha < lead->key.alpha) {
        decreasing = (da + Interval::max(db, zero) / lnX).certainly_negative();
      } else {
        decreasing = t.key.beta < lead->key.beta;
      }
      if (!decreasing) return false;
      Interval log_ratio = X * rho + da * lnX + db * point(Rational(static_cast<long>(K))).log();
      Interval c = t.coef.enclose();
      Interval mag = Interval::max(c, -c);
      total = total + mag * log_ratio.exp();
    }
    return (c0 - total).certainly_positive();
  };
  uint64_t k0 = std::max<uint64_t>(1, bit_length(from));
  uint64_t K = k0;
  while (!tail_holds(K)) {
    if (++K > k0 + 20000)
      return {Proof::kUnproved, "its leading term does not outweigh the rest: " + describe(e)};
  }
  BlockWalk walk{e, modulus, residue, 400000, {}};
  Rational lo(from);
  Rational top = Rational(BigInt(1) << K);
  while (lo < top) {
    Rational hi = Rational(BigInt(1) << bit_length(floor_of(lo)));
    if (hi <= lo) hi = lo * 2;
    hi = std::min(hi, top);
    if (!walk.block(lo, hi, 0)) return {walk.failure.proof, walk.failure.why + ": " + describe(e)};
    lo = hi;
  }
  return {};
}

std::string describe(const Expansion& e) {
  std::vector<Term> terms = e.terms;
  std::sort(terms.begin(), terms.end(),
            [](const Term& a, const Term& b) { return compare_keys(a.key, b.key) > 0; });
  std::ostringstream out;
  bool first = true;
  for (const Term& t : terms) {
    if (!first) out << " + ";
    first = false;
    if (t.coef.exact) {
      out << "(" << to_string(*t.coef.exact) << ")";
    } else {
      out << t.coef.range->str(6);
    }
    if (t.key.rho != 1) out << " " << to_string(t.key.rho) << "^n";
    if (t.key.alpha.sign() != 0) out << " n^" << t.key.alpha.str();
    if (t.key.beta != 0) out << " lg^" << t.key.beta << " n";
  }
  return first ? "0" : out.str();
}

}  // namespace thetagate::engine::recheck
