#include "verifier/derivation/theorems/normalised_roots.h"

#include <utility>
#include <vector>

#include "verifier/derivation/theorems/change_of_variables.h"
#include "verifier/numbers/interval.h"

namespace thetagate::engine {

namespace {

constexpr long kBits = 128;
// Roots up to n^(1/16): the bound on the chain's tail below needs it.
constexpr unsigned long kLargestRoot = 16;
// The chain's factors are enclosed one by one while its sizes stay below
// 2^kHeadBits; the rest is bounded as a whole.
constexpr unsigned kHeadBits = 64;

// One factor of r(n)/c: (R(n)/n^(1/k))^e with R(n) the floor or the ceiling
// of n^(1/k). With t = n^(-1/k), a floor puts R/n^(1/k) in (1 - t, 1], a
// ceiling in [1, 1 + t).
struct Factor {
  bool ceiling = false;
  unsigned long k = 2;
  Rational e;
};

std::string exponent_text(const std::string& base, const Rational& e) {
  if (e == 1) return base;
  if (denominator(e) == 1) return base + "^" + to_string(e);
  return base + "^(" + to_string(e) + ")";
}

std::string root_text(unsigned long k) {
  return k == 2 ? "sqrt(n)" : "n^(1/" + std::to_string(k) + ")";
}

std::string rounded_text(bool ceiling, unsigned long k) {
  return std::string(ceiling ? "ceil(" : "floor(") + root_text(k) + ")";
}

// c · Π base^e, the negative exponents below a fraction bar.
std::string product_text(const Rational& c,
                         const std::vector<std::pair<std::string, Rational>>& parts) {
  std::string top, bottom;
  int below = 0;
  for (const auto& [base, e] : parts) {
    if (e == 0) continue;
    std::string& side = e > 0 ? top : bottom;
    side += (side.empty() ? "" : " ") + exponent_text(base, e > 0 ? e : Rational(-e));
    if (e < 0) ++below;
  }
  std::string text = top.empty() ? to_string(c) : c == 1 ? top : to_string(c) + " " + top;
  if (below == 1) text += "/" + bottom;
  if (below > 1) text += "/(" + bottom + ")";
  return text;
}

// n^q in the claim language ("n", "n^(1/2)", "1/n").
std::string power_of_n(const Rational& q) {
  if (q == 0) return "1";
  if (q < 0) return "1/" + exponent_text("n", Rational(-q));
  return exponent_text("n", q);
}

// x > 0 rounded to three significant decimal digits, down or up.
Rational three_digits(const Rational& x, bool down) {
  Rational scale = 1;
  while (x * scale < 100) scale *= 10;
  while (x * scale >= 1000) scale /= 10;
  BigInt r = down ? floor_of(x * scale) : ceil_of(x * scale);
  return Rational(r) / scale;
}

// A bound readable at a glance: x itself when it is a short rational.
Rational readable(const Interval& x, bool down) {
  Rational end = down ? x.lower() : x.upper();
  if (x.lower() == x.upper() && bit_length(numerator(end)) <= 16 &&
      bit_length(denominator(end)) <= 16)
    return end;
  return three_digits(end, down);
}

// t = b^(-1/k), exactly when b is a k-th power.
Interval t_at(const BigInt& b, unsigned long k) {
  BigInt root = iroot(b, k);
  BigInt power = 1;
  for (unsigned long i = 0; i < k; ++i) power *= root;
  if (power == b) return Interval(Rational(BigInt(1), root), kBits);
  return Interval(b, kBits).pow(Interval(Rational(-1, static_cast<long>(k)), kBits));
}

// x^e for an interval x > 0: exact steps for a whole e.
Interval power(const Interval& x, const Rational& e) {
  if (denominator(e) == 1 && abs(numerator(e)) <= 64) {
    long j = numerator(e).convert_to<long>();
    Interval out(Rational(1), kBits);
    for (long i = 0; i < (j < 0 ? -j : j); ++i) out = out * x;
    return j < 0 ? Interval(Rational(1), kBits) / out : out;
  }
  return x.pow(Interval(e, kBits));
}

// The lower and upper ends of r(n)/c for every n >= b (each factor is
// monotone in n: the lower ends rise and the upper ends fall as t shrinks).
struct Range {
  Interval low, high;
};

Range range_at(const std::vector<Factor>& factors, const BigInt& b) {
  Interval one(Rational(1), kBits);
  Range r{one, one};
  for (const Factor& f : factors) {
    Interval t = t_at(b, f.k);
    Interval base = f.ceiling ? one + t : one - t;
    Interval end = power(base, f.e);
    bool below = f.ceiling ? f.e < 0 : f.e > 0;  // this end bounds the factor from below
    (below ? r.low : r.high) = (below ? r.low : r.high) * end;
  }
  return r;
}

}  // namespace

TheoremOutcome normalised_change_of_variables(const DerivationInput& input) {
  TheoremOutcome out;
  out.theorem = kNormalisedRootsTheorem;
  const Shape& s = *input.shape;
  if (s.roots.size() != 1 || !s.scaled.empty() || !s.subtractive.empty()) {
    out.failure = "it needs exactly one term a(n) T(n^(1/k))";
    return out;
  }
  const RootTerm& term = s.roots[0];
  const RootCoefficient& coefficient = term.coefficient;
  const Rational c = term.a;
  if (c <= 0) {
    out.failure = "the coefficient of T(" + term.argument + ") is not positive, so r(n) has no " +
                  "positive limit";
    return out;
  }
  if (term.k > kLargestRoot) {
    out.failure =
        "T(" + term.argument + ") takes a root beyond n^(1/" + std::to_string(kLargestRoot) + ")";
    return out;
  }
  for (const RoundedRoot& r : coefficient.rounded) {
    if (r.k > kLargestRoot) {
      out.failure = "the coefficient's " + rounded_text(r.ceiling, r.k) +
                    " is a root beyond n^(1/" + std::to_string(kLargestRoot) + ")";
      return out;
    }
  }
  if (!term.rounded && !coefficient.rounded.empty()) {
    out.failure = "the coefficient rounds a root but the argument " + term.argument +
                  " does not: T is then evaluated at sizes that are not whole";
    return out;
  }
  // a(n) ~ c n^P; with g = n^q, a(n) g(n^(1/k))/g(n) ~ c n^(P + q/k - q),
  // a constant exactly when q = P k/(k - 1).
  const Rational k(static_cast<long>(term.k));
  Rational growth = coefficient.n_exponent;
  for (const RoundedRoot& r : coefficient.rounded)
    growth += r.exponent / Rational(static_cast<long>(r.k));
  const Rational q = growth * k / (k - 1);
  const std::string g = power_of_n(q);

  // r(n) = c · Π (R_j/n^(1/k_j))^(v_j) · (s(n)/n^(1/k))^q.
  std::vector<Factor> factors;
  std::vector<std::pair<std::string, Rational>> r_parts;
  for (const RoundedRoot& r : coefficient.rounded) {
    factors.push_back({r.ceiling, r.k, r.exponent});
    r_parts.push_back({rounded_text(r.ceiling, r.k), r.exponent});
  }
  Rational n_power = coefficient.n_exponent;
  if (term.rounded && q != 0) {
    bool merged = false;
    for (auto& [text, e] : r_parts) {
      if (text == rounded_text(term.ceiling, term.k)) {
        e += q;
        merged = true;
      }
    }
    if (!merged) r_parts.push_back({rounded_text(term.ceiling, term.k), q});
    // The same rounded root in the coefficient: one factor, its exponents
    // added (n/floor(sqrt(n)) before T(floor(sqrt(n))) leaves r(n) = 1).
    merged = false;
    for (Factor& f : factors) {
      if (f.ceiling == term.ceiling && f.k == term.k) {
        f.e += q;
        merged = true;
      }
    }
    if (!merged) factors.push_back({term.ceiling, term.k, q});
    std::erase_if(factors, [](const Factor& f) { return f.e == 0; });
    n_power -= q;
  } else {
    n_power += q / k - q;
  }
  // What is left of n: n^(u - q) with a rounded argument (its root is in the
  // factors), n^(u + q/k - q) = n^(u - P) = n^0 with none of them.
  if (n_power != 0) r_parts.push_back({"n", n_power});
  const std::string r_text = product_text(c, r_parts);
  std::string a_text = product_text(c, [&] {
    std::vector<std::pair<std::string, Rational>> parts;
    if (coefficient.n_exponent != 0) parts.push_back({"n", coefficient.n_exponent});
    for (const RoundedRoot& r : coefficient.rounded)
      parts.push_back({rounded_text(r.ceiling, r.k), r.exponent});
    return parts;
  }());
  const std::string call = "T(" + term.argument + ")";
  out.steps.push_back("the coefficient a(n) = " + a_text + " of " + call + " grows like " +
                      product_text(c, {{"n", growth}}) + "; divide by g(n) = " + g +
                      " (q = " + to_string(q) + " = " + to_string(growth) + "·" + to_string(k) +
                      "/" + to_string(k - 1) + ", the q with a(n) g(n^(1/" + to_string(k) +
                      "))/g(n) constant): U(n) = T(n)/g(n) satisfies U(n) = r(n) U(" +
                      term.argument + ") + f(n)/g(n) with r(n) = " + r_text);

  RootNormalisation norm;
  norm.power = q;
  norm.limit = c;
  norm.factor = r_text;
  norm.normaliser = g;
  norm.from = 1;
  if (factors.empty()) {
    norm.factor_low = norm.factor_high = c;
    norm.chain_low = norm.chain_high = 1;
    out.steps.push_back("r(n) = " + to_string(c) + " at every size: no rounding to bound");
  } else {
    if (!input.recursive_from) {
      out.failure = "the first size at which " + call +
                    "'s line applies was not decided below 4096, so the range of r(n) = " + r_text +
                    " is not bounded";
      return out;
    }
    // The recursive line needs a shrinking argument: floor(n^(1/k)) < n from
    // n = 2 on, ceil(n^(1/k)) < n from n = 3 on.
    BigInt b0 = *input.recursive_from;
    BigInt shrinks = term.ceiling ? 3 : 2;
    if (b0 < shrinks) b0 = shrinks;
    norm.from = b0;
    Range first = range_at(factors, b0);
    if (!first.low.certainly_positive()) {
      out.failure = "the lower end of r(n) = " + r_text + " at n = " + b0.str() +
                    " is not certainly positive";
      return out;
    }
    Interval c_iv(c, kBits);
    norm.factor_low = readable(c_iv * first.low, true);
    norm.factor_high = readable(c_iv * first.high, false);
    std::string t_text;
    for (const Factor& f : factors) {
      std::string t = "n^(-1/" + std::to_string(f.k) + ")";
      if (t_text.find(t) == std::string::npos) t_text += (t_text.empty() ? "" : ", ") + t;
    }
    out.steps.push_back(
        "floor(x) lies in (x - 1, x] and ceil(x) in [x, x + 1), so each rounded root R of "
        "n^(1/j) is n^(1/j) times a number between 1 - t and 1 (floor) or 1 and 1 + t (ceil), "
        "t = " +
        t_text + "; r(n)/" + to_string(c) +
        " lies between the products of those ends, which approach 1 as n grows: for every n >= " +
        b0.str() + ", where " + call + "'s line first applies, " + to_string(norm.factor_low) +
        " <= r(n) <= " + to_string(norm.factor_high) + " (certified arithmetic at n = " + b0.str() +
        ")");
    // One chain n, s(n), s(s(n)), ...: the sizes where the line applies are
    // at least b0, b1, ... with b_{i+1} the least m with s(m) >= b_i.
    Interval low(Rational(1), kBits), high(Rational(1), kBits);
    BigInt b = b0;
    std::vector<std::string> sizes;
    std::string in_m = term.argument;  // floor, ceil and sqrt have no n in their names
    for (char& ch : in_m) {
      if (ch == 'n') ch = 'm';
    }
    const BigInt head = BigInt(1) << kHeadBits;
    while (b < head) {
      Range here = range_at(factors, b);
      low = low * here.low;
      high = high * here.high;
      if (sizes.size() < 4) sizes.push_back(b.str());
      BigInt base = term.ceiling ? BigInt(b - 1) : b;
      BigInt next = 1;
      for (unsigned long i = 0; i < term.k; ++i) next *= base;
      b = term.ceiling ? BigInt(next + 1) : next;
    }
    // Beyond 2^64 (b >= 2^64): t <= 2^(-64/16) <= 1/2, so |ln(1 ± t)| <= 2t,
    // and the t's of successive chain sizes fall at least by half (b_{i+1}
    // > (b_i/2)^k, so b_{i+1}/b_i > 2^48 >= 2^j): their sum is at most 2t
    // at b; each factor's exponent counts: |ln tail| <= 4 Σ |e_j| t_j(b).
    Interval d_low(Rational(0), kBits), d_high(Rational(0), kBits);
    for (const Factor& f : factors) {
      Rational e = f.e < 0 ? Rational(-f.e) : f.e;
      Interval& d = (f.ceiling ? f.e < 0 : f.e > 0) ? d_low : d_high;
      d = d + Interval(Rational(4) * e, kBits) * t_at(b, f.k);
    }
    low = low * (-d_low).exp();
    high = high * d_high.exp();
    if (!low.certainly_positive()) {
      out.failure = "the product of r(n)/" + to_string(c) +
                    " along a chain of sizes is not certainly positive";
      return out;
    }
    norm.chain_low = readable(low, true);
    norm.chain_high = readable(high, false);
    out.steps.push_back(
        "along one chain n, " + term.argument +
        ", ... the sizes where the line applies are at "
        "least " +
        sizes[0] + (sizes.size() > 1 ? ", " + sizes[1] : "") +
        (sizes.size() > 2 ? ", " + sizes[2] : "") + ", ... (each the least m whose " + in_m +
        " reaches the one before), and the ends of r(n)/" + to_string(c) +
        " are monotone in n, so the product of r(n)/" + to_string(c) + " over a chain lies in [" +
        to_string(norm.chain_low) + ", " + to_string(norm.chain_high) +
        "] (certified: the factors one by one below 2^" + std::to_string(kHeadBits) +
        ", the rest within exp(±4 Σ|e| t) at the first size beyond, the t's at least halving)");
  }
  // V(n) = c V(s(n)) + f(n)/g(n), solved by the change of variables.
  Shape inner;
  inner.ok = true;
  RootTerm plain = term;
  plain.coefficient = RootCoefficient{};
  inner.roots = {plain};
  DerivationInput v = input;
  v.shape = &inner;
  const GrowthClass gq = GrowthClass::polylog(RealNumber(q));
  if (v.driving.growth) v.driving.growth = v.driving.growth->over(gq);
  TheoremOutcome solved = change_of_variables(v);
  if (!solved.applies()) {
    out.failure = "the change of variables on V(n) = " + to_string(c) + " V(" + term.argument +
                  ") + f(n)/" + (g.find('/') == std::string::npos ? g : "(" + g + ")") +
                  " does not apply: " + solved.failure;
    return out;
  }
  std::string chain =
      factors.empty()
          ? "U = V"
          : to_string(norm.chain_low) + " V(n) <= U(n) <= " + to_string(norm.chain_high) + " V(n)";
  out.steps.push_back(
      "with V(n) = " + to_string(c) + " V(" + term.argument +
      ") + f(n)/g(n), equal to U below "
      "the size from which f(n) >= 0 (f has a positive class, so such a size exists), induction on "
      "n gives " +
      chain + ": each step multiplies the bound at the smaller size by r(n)/" + to_string(c) +
      " and adds f(n)/g(n) >= 0, at least the lower product (<= 1) and at most the upper "
      "product (>= 1) times f(n)/g(n)");
  for (const std::string& step : solved.steps)
    out.steps.push_back("for V (its f is f(n)/g(n)): " + step);
  GrowthClass result = solved.growth->times(gq);
  out.steps.push_back("back to T(n) = g(n) U(n) = Θ(" + g + " V(n)): T(n) = Θ(" +
                      to_string(result) + ")");
  std::string range = factors.empty() ? "r(n) = " + r_text
                                      : "the factor r(n) = " + r_text + " stays in [" +
                                            to_string(norm.factor_low) + ", " +
                                            to_string(norm.factor_high) + "]";
  std::string inner_method = solved.method;
  const std::string lead = "change of variables, then ";
  if (inner_method.rfind(lead, 0) == 0) inner_method = inner_method.substr(lead.size());
  out.method =
      "change of variables after dividing by " + g + " (" + range + "), then " + inner_method;
  out.growth = result;
  out.normalisation = norm;
  return out;
}

}  // namespace thetagate::engine
