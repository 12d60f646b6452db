// The theorems' rules: each re-derives a theorem's hypotheses from the
// claim's own lines (the driver's bounds, the shape of every call, the
// critical exponent) and checks that its conclusion establishes the claim.
#include <algorithm>
#include <map>
#include <optional>

#include "verifier/numbers/polynomial.h"
#include "verifier/recheck/rule_support.h"

namespace thetagate::engine::recheck {
namespace {

// The driver bounds low·g <= f <= high·g from `from` on, for every line.
struct DriverFacts {
  ExprPtr g;      // bounds f from above (and from below, unless g_low differs)
  ExprPtr g_low;  // bounds f from below
  Rational low, high;
  BigInt from;
  Key key, key_low;
  bool two_classes = false;  // a comparison: g_low is another class than g
};

DriverFacts driver_facts(const CertificateData& c, bool exponential = false) {
  DriverFacts d;
  d.g = parse_text(c.driver_class, "driver class");
  d.low = parse_rational(c.driver_low, "driver constant");
  d.high = parse_rational(c.driver_high, "driver constant");
  d.from = std::max(parse_size(c.driver_from, "driver start"), BigInt(4));
  d.two_classes = !c.driver_class_low.empty();
  if (d.low <= 0 || d.high <= 0 || (!d.two_classes && d.high < d.low))
    throw Rejected{"the driver constants are not 0 < low <= high"};
  d.key = growth_key(*d.g, "the driver class");
  d.g_low = d.two_classes ? parse_text(c.driver_class_low, "lower driver class") : d.g;
  d.key_low = growth_key(*d.g_low, "the driver class");
  if (d.two_classes && compare_keys(d.key_low, d.key) > 0)
    throw Rejected{"the lower driver class grows faster than the upper one"};
  if (!exponential && (d.key.rho != 1 || d.key_low.rho != 1))
    throw Unsupported("an exponential driver class");
  return d;
}

void require_driver_bounds(const Recurrence& r, const Structure& st, const DriverFacts& d,
                           int& count) {
  for (const CaseLine* line : st.recursive) {
    Linear lin;
    linearize(line->body, 1, r.main.name, lin);
    on_some_modulus(
        [&](const Context& ctx, int& here) {
          Expansion f = driver_of(lin, ctx);
          Expansion g = expand(*d.g, ctx);
          Expansion g_low = d.two_classes ? expand(*d.g_low, ctx) : g;
          std::string where = " for every n >= " + d.from.str() + class_name(ctx);
          require(add(f, negate(scale(g_low, Coef::of(d.low)))), ctx,
                  "f(n) >= " + to_string(d.low) + (d.two_classes ? " g_low(n)" : " g(n)") + where,
                  here);
          require(add(scale(g, Coef::of(d.high)), negate(f)), ctx,
                  "f(n) <= " + to_string(d.high) + " g(n)" + where, here);
        },
        d.from, &r.helpers, count);
  }
}

// Leighton's form: every argument is s n + h(n) with 0 < s < 1 and h bounded.
struct Split {
  Rational a;
  Rational s;
  Rational t_low, t_high;  // h(n) in [t_low, t_high]
};

Split split_of(const Call& call, const Recurrence& r) {
  Expansion e = expand(*make_call("floor", {call.arg}), Context{BigInt(4), 1, 0, &r.helpers});
  Split sp{call.a, 0, 0, 0};
  bool linear = false;
  for (const Term& t : e.terms) {
    Interval c = t.coef.enclose();
    if (compare_keys(t.key, Key{1, RealNumber(0L), 0}) == 0) {
      sp.t_low = c.lower();
      sp.t_high = c.upper();
    } else if (compare_keys(t.key, Key{1, RealNumber(1L), 0}) == 0 && t.coef.exact) {
      sp.s = *t.coef.exact;
      linear = true;
    } else {
      throw Unsupported("the argument " + print(*call.arg) + " is not s n + O(1)");
    }
  }
  if (!linear) throw Unsupported("the argument " + print(*call.arg) + " does not grow with n");
  return sp;
}

// The sign of sum a_i s_i^x - 1, exactly, where x = q + c·log_g(alpha) with
// alpha algebraic: each s_i = g^m (m rational) gives s_i^x = g^(m q)·alpha^(m c),
// so with m q and m c whole the sum is R(alpha) for a polynomial R (after a
// power of alpha > 0 clears negative exponents). R(alpha) = 0 exactly when
// gcd(R, P) keeps alpha, P alpha's polynomial with alpha its only root in the
// enclosure; otherwise enclosures decide the sign. nullopt: not of this form.
std::optional<int> sign_in_field(const std::vector<Split>& splits, const RealNumber& x) {
  std::optional<LogAlgebraicForm> form = log_algebraic_form(x);
  const Polynomial* p = form ? form->alpha.polynomial() : nullptr;
  if (!p) return std::nullopt;
  std::map<BigInt, Rational> by_power{{BigInt(0), Rational(-1)}};  // alpha^e -> coefficient
  for (const Split& sp : splits) {
    RealNumber m = RealNumber::log(form->g, sp.s);
    if (!m.is_rational()) return std::nullopt;
    Rational e = m.rational() * form->c, gq = m.rational() * form->q;
    if (denominator(e) != 1 || abs(numerator(e)) > 64) return std::nullopt;
    Coef factor = rational_power(form->g, RealNumber(gq));
    if (!factor.exact) return std::nullopt;
    by_power[numerator(e)] += sp.a * *factor.exact;
  }
  BigInt low = std::min(by_power.begin()->first, BigInt(0));
  std::vector<Rational> coefficients(static_cast<size_t>(by_power.rbegin()->first - low) + 1);
  for (const auto& [e, a] : by_power) coefficients[static_cast<size_t>(e - low)] = a;
  Polynomial r(coefficients);
  Interval box = form->alpha.enclose(kPrecision);
  if (!(box.lower() < box.upper()) || p->sign_at(box.lower()) == 0 ||
      p->count_real_roots(box.lower(), box.upper()) != 1)
    return std::nullopt;
  if (Polynomial::gcd(r, *p).count_real_roots(box.lower(), box.upper()) == 1) return 0;
  for (long bits = kPrecision; bits <= 1 << 14; bits *= 2) {
    Interval v = r(form->alpha.enclose(bits));
    if (v.certainly_positive()) return 1;
    if (v.certainly_negative()) return -1;
  }
  return std::nullopt;
}

// Akra–Bazzi's conclusion for the splits and the driver classes against the
// claimed class (in the same variable): a named master-theorem case must be
// the one q against p gives, and the class must establish the bound.
void akra_bazzi_conclusion(const std::vector<Split>& splits, const DriverFacts& d,
                           const Key& claimed, const Bound& bound, const std::string& proof,
                           int& count) {
  // The conclusion (Akra–Bazzi): p solves sum a_i s_i^p = 1, and with
  // f = Θ(n^q lg^k n), T = Θ(n^p) if q < p; Θ(n^p lg^(k+1) n) if q = p and
  // k > -1; Θ(n^q lg^k n) if q > p.
  auto S_minus_1 = [&](const RealNumber& x) {
    Coef sum = Coef::of(Rational(-1));
    for (const Split& sp : splits) {
      Coef term = rational_power(sp.s, x);
      Coef scaled = term.exact ? Coef::of(*term.exact * sp.a)
                               : Coef::of(term.enclose() * Interval(sp.a, kPrecision));
      sum = sum.exact && scaled.exact ? Coef::of(*sum.exact + *scaled.exact)
                                      : Coef::of(sum.enclose() + scaled.enclose());
    }
    if (sum.exact) return *sum.exact == 0 ? 0 : (*sum.exact > 0 ? 1 : -1);
    if (sum.range->certainly_positive()) return 1;
    if (sum.range->certainly_negative()) return -1;
    if (auto sign = sign_in_field(splits, x)) return *sign;
    throw Unsupported("whether the critical exponent equals " + x.str() +
                      " cannot be decided exactly");
  };
  // Compares the solution driven by g = n^q lg^k n with the claimed class:
  // -1, 0, +1 as it is below, equal to, above it; `text` names it.
  auto order_of = [&](const Key& g, std::string& text) {
    int q_vs_p = -S_minus_1(g.alpha);  // sign(S(x) - 1) > 0 means x < p
    if (q_vs_p > 0 || (q_vs_p == 0 && g.beta >= 0)) {
      Key t{1, g.alpha, q_vs_p > 0 ? g.beta : g.beta + 1};
      text = key_text(t);
      return compare_keys(t, claimed);
    }
    if (q_vs_p == 0 && g.beta == -1) throw Unsupported("a conclusion with lg lg n");
    // Θ(n^p), p known through S: compare p with the claimed exponent.
    text = "n^p";
    if (claimed.rho != 1) return claimed.rho > 1 ? -1 : 1;
    int c_vs_p = -S_minus_1(claimed.alpha);
    return c_vs_p != 0 ? -c_vs_p : (claimed.beta == 0 ? 0 : (claimed.beta > 0 ? -1 : 1));
  };
  if (!d.two_classes) {
    int q_vs_p = -S_minus_1(d.key.alpha);  // -1: q < p, 0: q = p, +1: q > p
    int named_case = 0;
    if (proof.rfind("master theorem, case ", 0) == 0) named_case = proof[21] - '0';
    int actual_case = q_vs_p < 0 ? 1 : (q_vs_p == 0 ? 2 : 3);
    if (named_case != 0 && named_case != actual_case)
      throw Rejected{"the certificate names case " + std::to_string(named_case) +
                     ", but the driver n^" + d.key.alpha.str() +
                     (q_vs_p < 0    ? " grows slower than"
                      : q_vs_p == 0 ? " matches"
                                    : " grows faster than") +
                     " n^p (case " + std::to_string(actual_case) + ")"};
  }
  ++count;
  // T lies between the solutions driven by low·g_low and high·g (a > 0: T is
  // monotone in f); Akra–Bazzi gives each. An O claim needs the upper one
  // at most the claim, an Ω claim the lower one at least, Θ both equal.
  std::string upper_text, lower_text;
  int upper = order_of(d.key, upper_text);
  int lower = d.two_classes ? order_of(d.key_low, lower_text) : upper;
  if (!d.two_classes) lower_text = upper_text;
  require_establishes(
      bound, upper, lower,
      "Akra–Bazzi gives " + (d.two_classes ? "O(" + upper_text + ") and Ω(" + lower_text + ")"
                                           : "Θ(" + upper_text + ")"));
  ++count;
}

// The claim's class against Θ(rho^n): -1, 0, +1 as rho^n is below, equal
// to, above it. An algebraic base (((1 + sqrt(5))/2)^n) is compared exactly.
int order_of_exponential(const RealNumber& rho, const Bound& bound) {
  const Expr& g = *bound.growth;
  if (g.kind == ExprKind::kPow && g.args[1]->kind == ExprKind::kVariable && !mentions_n(*g.args[0]))
    return compare(rho, constant_value(*g.args[0]));
  Key claimed = growth_key(g, "the claimed bound");
  int base = compare(rho, RealNumber(claimed.rho));
  return base != 0 ? base : compare_keys(Key{claimed.rho, RealNumber(0L), 0}, claimed);
}

// `e` with n replaced by `by`.
ExprPtr with_n(const ExprPtr& e, const ExprPtr& by) {
  if (e->kind == ExprKind::kVariable) return by;
  if (!mentions_n(*e)) return e;
  auto copy = std::make_shared<Expr>(*e);
  for (ExprPtr& a : copy->args) a = with_n(a, by);
  update_depth(*copy);
  return copy;
}

}  // namespace

void divide(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count) {
  Structure st = structure_of(r);
  std::vector<Split> splits;
  for (const Call& call : st.calls) splits.push_back(split_of(call, r));
  for (const CaseLine* line : st.recursive) {
    Linear lin;
    linearize(line->body, 1, r.main.name, lin);
    bool same = lin.calls.size() == splits.size();
    for (size_t i = 0; same && i < lin.calls.size(); ++i) {
      Split sp = split_of(lin.calls[i], r);
      same = sp.a == splits[i].a && sp.s == splits[i].s;
    }
    if (!same) throw Unsupported("case lines that recurse differently");
  }
  Rational total = 0;
  BigInt threshold = st.threshold;
  for (const Split& sp : splits) {
    if (sp.a <= 0 || sp.s <= 0 || sp.s >= 1)
      throw Rejected{"Akra–Bazzi needs a_i > 0 and 0 < b_i < 1; the recurrence has a = " +
                     to_string(sp.a) + ", b = " + to_string(sp.s)};
    total += sp.a;
    // From here on every argument lies in [1, n - 1].
    Rational need =
        std::max(Rational((2 - sp.t_low) / sp.s), Rational((sp.t_high + 1) / (1 - sp.s)));
    threshold = std::max(threshold, ceil_of(need) + 1);
  }
  ++count;  // the recurrence has Leighton's form
  DriverFacts d = driver_facts(c);
  require_driver_bounds(r, st, d, count);
  // Leighton's base: T is positive on the window the recursion bottoms out
  // in from every n beyond base_end (sizes below it are never reached).
  SmallEvaluator eval(r);
  BigInt base_end = std::max(threshold, d.from);
  Rational reach = Rational(base_end + 1);
  for (const Split& sp : splits) reach = std::min(reach, sp.s * Rational(base_end + 1) + sp.t_low);
  require_positive(eval, std::max(BigInt(1), floor_of(reach)), base_end, true, count);

  if (!c.regularity_c.empty()) {
    // a f(n/b) <= c f(n): checked whenever a certificate states it, though
    // the conclusion below does not depend on it.
    Rational rc = parse_rational(c.regularity_c, "regularity constant");
    BigInt from = std::max(parse_size(c.regularity_from, "regularity start"), BigInt(4));
    if (rc >= 1) throw Rejected{"the regularity constant " + to_string(rc) + " is not below 1"};
    for (const CaseLine* line : st.recursive) {
      Linear lin;
      linearize(line->body, 1, r.main.name, lin);
      on_some_modulus(
          [&](const Context& ctx, int& here) {
            Expansion lhs = constant(Coef::of(Rational(0)));
            for (const Call& call : lin.calls) {
              auto aff = as_affine(expand(*make_call("floor", {call.arg}), ctx));
              if (!aff) throw Unsupported("an argument not exact on the class");
              const CaseLine& at_arg = line_on_class(r.main, ctx, aff->first, aff->second);
              Linear inner;
              linearize(at_arg.body, 1, r.main.name, inner);
              lhs =
                  add(lhs, scale(driver_of(inner, ctx, aff->first, aff->second), Coef::of(call.a)));
            }
            Expansion slack = add(scale(driver_of(lin, ctx), Coef::of(rc)), negate(lhs));
            require(slack, ctx,
                    "regularity: a f(n/b) <= " + to_string(rc) +
                        " f(n) for every n >= " + from.str() + class_name(ctx),
                    here);
          },
          from, &r.helpers, count);
    }
  }

  Key claimed = growth_key(*bound.growth, "the claimed bound");
  akra_bazzi_conclusion(splits, d, claimed, bound, c.proof, count);
}

void subtract(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count) {
  // T(n) = a T(n - b) + f(n), the same a and b on every recursive line.
  Structure st = structure_of(r);
  std::optional<Split> sp;
  for (const CaseLine* line : st.recursive) {
    Linear lin;
    linearize(line->body, 1, r.main.name, lin);
    std::optional<Split> here;
    if (lin.calls.size() == 1) here = split_of(lin.calls[0], r);
    if (!here || here->a <= 0 || here->s != 1 || here->t_low != here->t_high || here->t_low >= 0 ||
        denominator(here->t_low) != 1 || (sp && (sp->a != here->a || sp->t_low != here->t_low)))
      throw Unsupported("subtract-and-conquer other than T(n) = a T(n - b) + f(n), a > 0");
    sp = here;
  }
  const Rational a = sp->a, b = -sp->t_low;
  ++count;
  DriverFacts d = driver_facts(c, true);
  if (d.two_classes) throw Unsupported("a comparison with two drivers in subtract-and-conquer");
  // Unrolled, T(n) = a^j T(n - j b) + sum_{i<j} a^i f(n - i b), and with
  // g = r^n n^q lg^k n the sum is r^n sum_i theta^i (n - i b)^q lg^k(n - i b),
  // theta = a / r^b (common practice: geometric and polynomial sums). theta = 1:
  // r^n times the sum of n^q lg^k n, Θ(r^n n g) for q > -1, Θ(r^n lg^(k+1) n)
  // for q = -1, k > -1. theta < 1: the first term dominates, Θ(g). theta > 1:
  // a^(n/b) dominates, Θ(a^(n/b)) when T > 0 on the base.
  Rational theta = a / *rational_power(d.key.rho, RealNumber(b)).exact;
  const RealNumber minus_one(-1L);
  Key t = d.key;
  if (theta == 1) {
    if (d.key.alpha < minus_one || (d.key.alpha == minus_one && d.key.beta <= -1))
      throw Unsupported("a driver whose sum converges or grows like lg lg n");
    t = d.key.alpha == minus_one ? Key{d.key.rho, RealNumber(0L), d.key.beta + 1}
                                 : Key{d.key.rho, d.key.alpha + RealNumber(1L), d.key.beta};
  } else if (theta > 1) {
    Coef root = rational_power(a, RealNumber(1 / b));
    if (!root.exact) throw Unsupported("a^(1/b) is irrational");
    t = Key{*root.exact, RealNumber(0L), 0};
  }
  require_driver_bounds(r, st, d, count);
  SmallEvaluator eval(r);
  BigInt base_end = std::max(BigInt(st.threshold + numerator(b)), d.from);
  require_positive(eval, BigInt(1), base_end, false, count);
  // a^(n/b) T(w) is the lower bound when theta > 1: w in the last b sizes.
  if (theta > 1) require_positive(eval, base_end - numerator(b) + 1, base_end, true, count);
  int order = compare_keys(t, growth_key(*bound.growth, "the claimed bound"));
  require_establishes(bound, order, order, "the sum gives Θ(" + key_text(t) + ")");
  ++count;
}

// T(n) = sum c_i T(n - i) + F(n), every c_i >= 0, F a polynomial, rho > 1 the
// root of x^k - sum c_i x^(k - i) the certificate names. A polynomial Q with
// Q(n) - sum c_i Q(n - i) = -F(n) exists (1 is no root: rho is the only
// positive root, Descartes' rule of signs), and S = T + Q satisfies the
// homogeneous recurrence. With S > 0 on k consecutive sizes, S lies between
// L rho^n and U rho^n there, and induction carries both (every c_i >= 0 and
// rho^k = sum c_i rho^(k - i)) to every later n: T = S - Q = Θ(rho^n).
// Roots of equal or larger modulus do not matter to this argument.
void linear(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count) {
  Structure st = structure_of(r);
  if (st.recursive.size() != 1) throw Unsupported("a linear recurrence with several lines");
  Linear lin;
  linearize(st.recursive[0]->body, 1, r.main.name, lin);
  std::map<int, Rational> lags;  // i -> c_i
  for (const Call& call : lin.calls) {
    Split sp = split_of(call, r);
    if (sp.s != 1 || sp.t_low != sp.t_high || sp.t_low >= 0 || sp.t_low < -64 ||
        denominator(sp.t_low) != 1)
      throw Unsupported("a call other than T(n - i), 1 <= i <= 64");
    lags[static_cast<int>(-numerator(sp.t_low))] += call.a;
  }
  const int k = lags.rbegin()->first;
  std::vector<Rational> pc(k + 1);
  pc[k] = 1;
  for (const auto& [i, a] : lags) {
    if (a < 0) throw Unsupported("a negative coefficient c_" + std::to_string(i));
    pc[k - i] -= a;
  }
  Polynomial p(pc);
  ++count;
  // The root: the only root of the certificate's polynomial in (low, high],
  // a root of p (their gcd keeps it), and > 1.
  if (c.root_polynomial.size() > 65) throw Unsupported("a root polynomial of degree above 64");
  std::vector<Rational> rc;
  for (const std::string& x : c.root_polynomial) rc.push_back(parse_rational(x, "coefficient"));
  Polynomial root_p(rc);
  Rational lo = parse_rational(c.root_low, "root interval"),
           hi = parse_rational(c.root_high, "root interval");
  if (root_p.degree() < 1 || !(lo < hi) || root_p.count_real_roots(lo, hi) != 1)
    throw Rejected{"(" + c.root_low + ", " + c.root_high + "] does not isolate one root of " +
                   root_p.str()};
  if (Polynomial::gcd(root_p, p).count_real_roots(lo, hi) != 1)
    throw Rejected{"the root of " + root_p.str() + " in (" + c.root_low + ", " + c.root_high +
                   "] is no root of the characteristic polynomial " + p.str()};
  RealNumber rho =
      root_p.sign_at(hi) == 0 ? RealNumber(hi) : RealNumber::algebraic(root_p.squarefree(), lo, hi);
  if (compare(rho, RealNumber(1L)) <= 0)
    throw Rejected{"the root " + rho.str() + " of " + p.str() + " is not > 1"};
  ++count;
  // F, and Q solved from the top degree down (the operator keeps degrees and
  // scales the top coefficient by p(1) != 0), then checked exactly.
  BigInt from = std::max(st.threshold, BigInt(2));
  std::vector<Rational> fc;
  for (const Term& t : driver_of(lin, Context{from, 1, 0, &r.helpers}).terms) {
    if (t.key.rho != 1 || t.key.beta != 0 || !t.key.alpha.is_integer() || t.key.alpha.sign() < 0 ||
        !t.coef.exact || t.key.alpha.rational() > 64)
      throw Unsupported("a driver that is not a polynomial in n");
    size_t d = static_cast<size_t>(numerator(t.key.alpha.rational()));
    fc.resize(std::max(fc.size(), d + 1));
    fc[d] += *t.coef.exact;
  }
  Polynomial f(fc);
  auto op = [&](const Polynomial& q) {
    Polynomial o = q;
    for (const auto& [i, a] : lags) o = o - Polynomial({a}) * q.shifted(Rational(-i));
    return o;
  };
  Polynomial q;
  for (int j = f.degree(); j >= 0; --j)
    q = q + Polynomial::monomial((Polynomial() - f - op(q)).coefficient(j) / p(Rational(1)), j);
  if (!(op(q) == Polynomial() - f)) throw Unsupported("no polynomial particular solution");
  ++count;
  // A window of k consecutive sizes from which the recursive line applies.
  SmallEvaluator eval(r);
  BigInt w = std::max(BigInt(0), BigInt(from - k));
  for (int run = 0; run < k; ++w) {
    if (w > from + 256)
      throw Unsupported("S = T + Q is not positive on " + std::to_string(k) +
                        " consecutive sizes up to " + w.str());
    run = eval.at_least(eval.at(w), Value(-q(Rational(w))), true) ? run + 1 : 0;
  }
  ++count;
  int order = order_of_exponential(rho, bound);
  require_establishes(bound, order, order, "the recurrence grows like " + rho.str() + "^n");
  ++count;
}

// T(n) = f(n) + (c/n) sum(k, k0, n - 1, T(k)) for every n >= M: differencing
// n T(n) - (n - 1) T(n - 1) leaves, for n > M,
//   T(n) = (1 + (c - 1)/n) T(n - 1) + f(n) - (1 - 1/n) f(n - 1),
// re-derived here from the claim's line. With a positive coefficient of
// T(n - 1), bounds A g <= T <= B g at M carry to every n > M when both
// steps' slacks are >= 0 for every real n > M (the induction's expansions).
void full_history(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count) {
  if (!r.class_terms.empty()) throw Unsupported("a growth class written inside the recurrence");
  BigInt m = parse_size(c.bound_from, "start");
  if (m < 4) throw Rejected{"the start must be at least 4"};
  Context at_m{m, 1, 0, &r.helpers};
  SumLine line = sum_line_of(line_on_class(r.main, at_m).body, r.main.name);
  ExprPtr f = line.a, factor = line.w;
  const Expr* sum = line.sum;
  const Expr& lo = *sum->args[0];
  auto top = as_affine(expand(*sum->args[1], at_m));
  if (mentions_n(lo) || contains_sum(lo) || !top || *top != std::pair{Rational(1), Rational(-1)})
    throw Unsupported("a sum other than sum(k, k0, n - 1, T(k))");
  if (constant_value(lo) > RealNumber(Rational(m))) throw Unsupported("a sum that starts past M");
  Expansion fe = expand(*factor, at_m);
  if (fe.terms.size() != 1 || !fe.terms[0].coef.exact ||
      compare_keys(fe.terms[0].key, Key{1, RealNumber(-1L), 0}) != 0)
    throw Unsupported("a sum not multiplied by c/n");
  Rational cf = *fe.terms[0].coef.exact;
  if (Rational(m) + cf <= 0) throw Unsupported("T(n - 1)'s coefficient is not positive");
  ++count;
  // The bounds at M, then the two steps.
  ExprPtr g = parse_text(c.bound_class, "bound class");
  Rational a = parse_rational(c.bound_low, "bound constant"),
           b = parse_rational(c.bound_high, "bound constant");
  if (a <= 0 || b < a) throw Rejected{"the bound constants are not 0 < low <= high"};
  SmallEvaluator eval(r);
  Value tm = eval.at(m), gm = eval.value(*g, m);
  if (!eval.at_least(tm, mul(Value(a), gm, NumericContext{}), false) ||
      !eval.at_least(mul(Value(b), gm, NumericContext{}), tm, false))
    throw Rejected{"T(" + m.str() + ") = " + tm.str() + " is not between " + to_string(a) +
                   " g and " + to_string(b) + " g, g = " + print(*g)};
  ++count;
  // H(n) - (1 + (c - 1)/n) H(n - 1) - f(n) + (1 - 1/n) f(n - 1), H = k g.
  ExprPtr over_n = parse_text("1/n", "1/n");
  for (bool upper : {true, false}) {
    const Rational& k = upper ? b : a;
    auto slack = [&](const Context& ctx, const Rational& shift) {
      auto x = [&](const ExprPtr& e, int back) { return expand(*e, ctx, 1, -back - shift); };
      Expansion one = constant(Coef::of(Rational(1))), inv = x(over_n, 0);
      Expansion e = add(
          add(scale(x(g, 0), Coef::of(k)), negate(multiply(add(one, scale(inv, Coef::of(cf - 1))),
                                                           scale(x(g, 1), Coef::of(k))))),
          add(negate(x(f, 0)), multiply(add(one, negate(inv)), x(f, 1))));
      return upper ? e : negate(e);
    };
    require_shifted(slack, Context{m + 1, 1, 0, &r.helpers},
                    std::string("step: T(n) ") + (upper ? "<= " : ">= ") + to_string(k) + " " +
                        print(*g) + " carried to every n > " + m.str(),
                    count);
  }
  int order = compare_keys(growth_key(*g, "the bound class"),
                           growth_key(*bound.growth, "the claimed bound"));
  require_establishes(bound, order, order, "T = Θ(" + print(*g) + ")");
  ++count;
}

// T(n) = sum a_i T(r_i(n)) + f(n), every argument kappa_i n^(s_i) + O(1) with
// 0 < s_i < 1. With m = lg n and S(m) = T(2^m): S(m) = sum a_i S(s_i m +
// h_i(m)) + f(2^m), h_i bounded, Akra–Bazzi with Leighton's h (whose
// induction runs over the sizes the recursion reaches, here the lg n). The
// driver bounds with g = lg^k n give G(m) = m^k; the claim is read at n = 2^m.
void change_of_variables(const Recurrence& r, const Bound& bound, const CertificateData& c,
                         int& count) {
  Structure st = structure_of(r);
  DriverFacts d = driver_facts(c);
  if (d.two_classes || d.key.alpha.sign() != 0)
    throw Unsupported("a driver that is not a power of lg n");
  BigInt from = std::max(st.threshold, d.from);
  Context ctx{from, 1, 0, &r.helpers};
  std::vector<Split> splits;
  Rational reach = Rational(from);
  for (const CaseLine* line : st.recursive) {
    Linear lin;
    linearize(line->body, 1, r.main.name, lin);
    std::vector<Split> here;
    for (const Call& call : lin.calls) {
      Expansion arg = expand(*make_call("floor", {call.arg}), ctx);
      std::optional<Term> power;
      Interval t(Rational(0), kPrecision);
      for (const Term& term : arg.terms) {
        const Key& key = term.key;
        if (compare_keys(key, Key{1, RealNumber(0L), 0}) == 0) {
          t = term.coef.enclose();
        } else if (!power && key.rho == 1 && key.beta == 0 && key.alpha.is_rational() &&
                   key.alpha.sign() > 0 && key.alpha < RealNumber(1L) && term.coef.exact &&
                   *term.coef.exact > 0) {
          power = term;
        } else {
          throw Unsupported("the argument " + print(*call.arg) + " is not c n^s + O(1)");
        }
      }
      if (!power) throw Unsupported("the argument " + print(*call.arg) + " does not grow");
      Rational s = power->key.alpha.rational();
      if (call.a <= 0) throw Rejected{"a recursive term with a coefficient <= 0"};
      here.push_back({call.a, s, 0, 0});
      std::string at = " for every n >= " + from.str() + ", the argument " + print(*call.arg);
      require(add(arg, constant(Coef::of(Rational(-1)))), ctx, "1 <= " + print(*call.arg) + at,
              count);
      require(add(expand(*make_variable(), ctx), negate(add(arg, constant(Coef::of(Rational(1)))))),
              ctx, print(*call.arg) + " <= n - 1" + at, count);
      Interval low = Interval(*power->coef.exact, kPrecision) *
                         Interval(Rational(from), kPrecision).pow(Interval(s, kPrecision)) +
                     t;
      reach = std::min(reach, low.lower());
    }
    if (!splits.empty() &&
        (here.size() != splits.size() ||
         !std::equal(here.begin(), here.end(), splits.begin(),
                     [](const Split& x, const Split& y) { return x.a == y.a && x.s == y.s; })))
      throw Unsupported("case lines that recurse differently");
    splits = here;
  }
  ++count;  // S has Leighton's form
  require_driver_bounds(r, st, d, count);
  SmallEvaluator eval(r);
  require_positive(eval, std::max(BigInt(1), floor_of(reach)), from - 1, true, count);
  DriverFacts in_m = d;
  in_m.key = in_m.key_low = Key{1, RealNumber(Rational(d.key.beta)), 0};
  ExprPtr two_to_m = make_binary(ExprKind::kPow, make_number(Rational(2)), make_variable());
  Key claimed = growth_key(*with_n(bound.growth, two_to_m), "the claimed bound at n = 2^m");
  const std::string then = "change of variables, then ";
  akra_bazzi_conclusion(splits, in_m, claimed, bound,
                        c.proof.rfind(then, 0) == 0 ? c.proof.substr(then.size()) : "", count);
}

}  // namespace thetagate::engine::recheck
