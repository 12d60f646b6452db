#include "verifier/derivation/theorems/master.h"

#include "verifier/derivation/regularity.h"
#include "verifier/derivation/theorems/comparison.h"

namespace thetagate::engine {

namespace {

// "p - alpha" or "alpha - p" as a phrase about the largest epsilon.
std::string epsilon_phrase(const RealNumber& gap, bool attained) {
  if (attained)
    return "the largest ε is " + gap.str() + " (f(n) = O(n^(p - ε)) holds with ε = " + gap.str() +
           " itself)";
  return "every ε < " + gap.str() + " works (ε = " + gap.str() +
         " itself fails because of the logarithmic factor)";
}

struct Size {
  BigInt n;
  std::string label;
};

std::vector<Size> regularity_sizes(const Rational& divisor) {
  std::vector<Size> sizes;
  std::vector<BigInt> bases = {2};
  if (denominator(divisor) == 1 && numerator(divisor) != 2) bases.push_back(numerator(divisor));
  for (const BigInt& base : bases) {
    BigInt power = base;
    std::string b = base.str();
    for (int k = 1; k <= 64; ++k, power *= base) {
      std::string p = b + "^" + std::to_string(k);
      sizes.push_back({power, p});
      sizes.push_back({power - 1, p + " - 1"});
      sizes.push_back({power + 1, p + " + 1"});
      sizes.push_back({3 * power, "3*" + p});
      // Digits 1010… in base b: along the chain n, n/b, n/b^2, … the
      // remainders alternate, so drivers that depend on parity meet both.
      BigInt square_less_one = base * base - 1;
      sizes.push_back(
          {BigInt(power * base / square_less_one),
           "floor(" + b + "^" + std::to_string(k + 1) + "/" + square_less_one.str() + ")"});
    }
  }
  return sizes;
}

// "a f(floor(n/b)) >= f(n) at every n ≡ 1 (mod 4) from n = 64 (...)", with a
// few members checked exactly.
std::string family_sentence(const RegularityFamily& family, const Rational& a,
                            const Rational& scale, const DerivationInput& input) {
  std::vector<std::string> members;
  NumericContext ctx;
  for (BigInt n = family.from; members.size() < 3 && n < family.from + 4 * family.modulus + 4;
       ++n) {
    if (floor_mod(n, BigInt(family.modulus)) != BigInt(family.residue)) continue;
    auto fn = input.driving_at(n);
    auto fm = input.driving_at(floor_of(Rational(n) * scale));
    if (!fn || !fm) continue;
    try {
      if (compare(mul(Value(a), *fm, ctx), *fn, ctx) >= 0) members.push_back(n.str());
    } catch (const PrecisionShortfall&) {
    }
  }
  std::string list;
  for (const auto& m : members) list += (list.empty() ? "" : ", ") + m;
  std::string family_text = family.modulus == 1 ? "every n >= " + family.from.str()
                                                : "every n ≡ " + std::to_string(family.residue) +
                                                      " (mod " + std::to_string(family.modulus) +
                                                      ") from n = " + family.from.str();
  return "a f(floor(n/b)) >= f(n) at " + family_text +
         " (an infinite family, proved with certified expansions of f on that residue class)" +
         (list.empty() ? "" : "; checked exactly at n = " + list);
}

// What case 3 may use about f beyond its class: for f known only up to
// constant factors (case lines, 2^floor(lg n)), a regularity bound proved on f
// itself, or the family on which it fails. Skipped outside case 3.
RegularityFacts regularity_facts(const DerivationInput& input, const Rational& a,
                                 const Rational& scale) {
  RegularityFacts facts;
  facts.equivalent = input.driving.coefficient_known && !input.driving_is_class;
  const GrowthClass& f = *input.driving.growth;
  // f given as a class (2T(n/2) + Θ(n^2)) is any function of it: nothing is
  // proved on its representative, and case 3 goes by comparison.
  if (facts.equivalent || input.driving_is_class || a < 1 || !f.is_subexponential()) return facts;
  RealNumber p = RealNumber::log(Rational(1) / scale, a);
  const Shape& s = *input.shape;
  if (compare(f.alpha, p) <= 0 || !s.driving) return facts;
  if (std::optional<RegularityBound> bound =
          prove_regularity(*s.driving, a, scale, input.helpers)) {
    std::string c = to_string(bound->c);
    facts.bound = bound;
    facts.proved =
        "a f(floor(n/b)) <= (" + c + ") f(n) for every n >= " + bound->from.str() +
        ", proved for f itself with certified expansions" +
        (bound->modulus > 1 ? " on each residue class of n mod " + std::to_string(bound->modulus)
                            : std::string()) +
        ", so regularity holds with c = " + c;
  } else if (input.driving_at) {
    if (std::optional<RegularityFamily> family =
            regularity_failure_family(*s.driving, a, scale, input.helpers)) {
      facts.fails = family_sentence(*family, a, scale, input);
    }
  }
  return facts;
}

// T(n) = a T(n/b) with f = 0: only the n^p leaves cost (case 1), when every
// base value is positive (T(1) = 0 would make T = 0).
TheoremOutcome master_on_zero(const Rational& a, const Rational& divisor,
                              const DerivationInput& input) {
  if (!input.leaves_positive) {
    TheoremOutcome out;
    out.theorem = "master theorem";
    out.failure = input.leaves_failure();
    return out;
  }
  TheoremOutcome out = master_on_class(a, divisor, GrowthClass::polylog(-1), "0");
  if (out.applies()) {
    // Derived through f = Θ(1/n), whose steps speak of an ε that f = 0
    // does not have: keep p and the conclusion only.
    out.steps = {out.steps.front(), "f(n) = 0: only the n^p leaves cost, case 1", out.steps.back()};
    out.method = "master theorem, case 1";
  }
  return out;
}

// The master theorem on a driver's class, or on f = 0 (g null): one side of
// a comparison (comparison.h).
TheoremOutcome master_on(const Rational& a, const Rational& divisor, const GrowthClass* g,
                         const DerivationInput& input) {
  return g ? master_on_class(a, divisor, *g, to_string(*g)) : master_on_zero(a, divisor, input);
}

}  // namespace

TheoremOutcome master_on_class(const Rational& a, const Rational& divisor, const GrowthClass& f,
                               const std::string& f_text, const RegularityFacts& facts) {
  TheoremOutcome out;
  out.theorem = "master theorem";
  if (a < 1) {
    out.failure = "a = " + to_string(a) + " < 1: the master theorem needs a >= 1 subproblems";
    return out;
  }
  RealNumber p = RealNumber::log(divisor, a);
  GrowthClass np = GrowthClass::polylog(p);
  out.steps.push_back("a = " + to_string(a) + ", b = " + to_string(divisor) +
                      ": critical exponent p = log_b a = " + p.str() +
                      (p.is_rational() ? "" : " = " + p.digits()));
  out.steps.push_back((f_text == "f(n)" ? "f(n)" : "f(n) = " + f_text) + " = Θ(" + to_string(f) +
                      ")");
  GrowthClass result;
  if (!f.is_subexponential()) {
    if (f.rho > RealNumber(1L)) {
      out.steps.push_back("f grows exponentially, so f(n) = Ω(n^(p + ε)) for every ε > 0: case 3");
      out.steps.push_back(
          "regularity: a f(n/b)/f(n) tends to 0, so a f(n/b) <= c f(n) holds for any c in (0, 1) "
          "and large n");
      out.method = "master theorem, case 3";
      result = f;
    } else {
      out.steps.push_back("f decays exponentially, so f(n) = O(n^(p - ε)) for every ε: case 1");
      out.method = "master theorem, case 1";
      result = np;
    }
  } else if (int c = compare(f.alpha, p); c < 0) {
    bool attained = f.beta.sign() < 0 || (f.beta.sign() == 0 && f.gamma.sign() <= 0);
    out.steps.push_back("f(n) is polynomially smaller than n^p = " + to_string(np) + ": case 1; " +
                        epsilon_phrase(p - f.alpha, attained));
    out.method = "master theorem, case 1";
    result = np;
  } else if (c > 0) {
    bool attained = f.beta.sign() > 0 || (f.beta.sign() == 0 && f.gamma.sign() >= 0);
    RealNumber gap = f.alpha - p;
    out.steps.push_back("f(n) is polynomially larger than n^p = " + to_string(np) + ": case 3; " +
                        (attained ? "the largest ε is " + gap.str() +
                                        " (f(n) = Ω(n^(p + ε)) with ε = " + gap.str() + ")"
                                  : "every ε < " + gap.str() + " works"));
    RealNumber limit = RealNumber(a) / pow(RealNumber(divisor), f.alpha);
    if (limit >= RealNumber(1L)) {
      out.failure = "regularity fails: a f(n/b)/f(n) tends to " + limit.str() + " >= 1";
      return out;
    }
    // "a h(n/b)/h(n) tends to a/b^α = L < 1, so ..." for h = f or its class g.
    auto tends = [&](const std::string& h) {
      return "a " + h + "(n/b)/" + h + "(n) tends to a/b^α = " + limit.str() +
             (limit.is_rational() ? "" : " = " + limit.digits()) + " < 1, so a " + h +
             "(n/b) <= c " + h + "(n) for any c in (" + limit.str() + ", 1) and all large n";
    };
    out.method = "master theorem, case 3";
    if (facts.equivalent) {
      out.steps.push_back("regularity: f(n) ~ C·" + to_string(f) + " with C > 0, so " + tends("f"));
    } else if (!facts.proved.empty()) {
      out.steps.push_back("regularity: " + facts.proved);
      out.regularity = facts.bound;
    } else {
      // No regularity claimed for f: T is squeezed between two recurrences
      // whose drivers are constant multiples of g, each regular.
      std::string g = to_string(f);
      if (!facts.fails.empty())
        out.steps.push_back("regularity fails for f itself: " + facts.fails);
      else
        out.steps.push_back(
            "regularity is not claimed for f itself: f = Θ(" + g +
            ") fixes f only up to constant factors, and a f(n/b)/f(n) need not settle below 1");
      out.steps.push_back(
          "comparison: c₁ g(n) <= f(n) <= c₂ g(n) for all large n, with g(n) = " + g +
          "; the recursion's coefficient a is positive, so T lies between the solutions of the "
          "same recursion with drivers c₁ g and c₂ g (their base values adjusted for the "
          "finitely many smaller n)");
      out.steps.push_back("for the driver g: " + tends("g") + ": case 3 gives Θ(g) for both");
      out.method = "comparison with the driver " + g + ": master theorem, case 3";
    }
    result = f;
  } else {
    int b = f.beta.sign();
    std::string k = f.beta.str();
    if (b < 0) {
      out.steps.push_back("f(n) = Θ(n^p lg^k n) with k = " + k +
                          ": f is smaller than n^p but not by a factor n^ε: "
                          "the gap between cases 1 and 2 of the basic theorem");
    }
    if (b == 0 && f.gamma.sign() == 0) {
      out.steps.push_back("f(n) = Θ(n^p): case 2, each of the lg n levels costs Θ(n^p)");
      out.method = "master theorem, case 2";
      result = GrowthClass::polylog(p, 1);
    } else if (f.beta > RealNumber(-1L)) {
      out.steps.push_back("f(n) = Θ(n^p lg^k n) with k = " + k +
                          " > -1: the polylog extension of case 2 gives "
                          "Θ(n^p lg^(k+1) n)" +
                          (f.gamma.sign() ? ", the lg lg n factor carried along" : ""));
      out.method = "master theorem, case 2 (polylog extension, k > -1)";
      result = GrowthClass::polylog(p, f.beta + RealNumber(1L), f.gamma);
    } else if (f.beta == RealNumber(-1L)) {
      if (f.gamma > RealNumber(-1L)) {
        out.steps.push_back(
            "k = -1: the polylog extension closes the gap: the level costs sum to Θ(n^p lg lg n)" +
            std::string(f.gamma.sign() ? " (with the lg lg n factor raised by one)" : ""));
        out.method = "master theorem, case 2 (polylog extension, k = -1)";
        result = GrowthClass::polylog(p, 0, f.gamma + RealNumber(1L));
      } else if (f.gamma == RealNumber(-1L)) {
        out.failure =
            "f(n) = Θ(n^p/(lg n lg lg n)) sums to Θ(n^p lg lg lg n), outside the normal form";
        return out;
      } else {
        out.steps.push_back(
            "k = -1 with a (lg lg n)^γ factor, γ < -1: the level costs converge: Θ(n^p)");
        out.method = "master theorem, case 2 (polylog extension, k = -1)";
        result = np;
      }
    } else {
      out.steps.push_back(
          "k = " + k +
          " < -1: the polylog extension closes the gap: the level costs converge, Θ(n^p)");
      out.method = "master theorem, case 2 (polylog extension, k < -1)";
      result = np;
    }
  }
  out.steps.push_back("T(n) = Θ(" + to_string(result) + ")");
  out.growth = result;
  return out;
}

TheoremOutcome master_theorem(const DerivationInput& input) {
  TheoremOutcome out;
  out.theorem = "master theorem";
  const Shape& s = *input.shape;
  // T(ceil(n/2)) + T(floor(n/2)) is 2 T(n/2) up to perturbation: merge equal b.
  bool one_b = !s.scaled.empty();
  for (const auto& t : s.scaled) one_b = one_b && t.b == s.scaled[0].b;
  ScaledTerm merged;
  if (one_b && s.scaled.size() > 1) {
    merged = s.scaled[0];
    merged.a = 0;
    for (const auto& t : s.scaled) {
      merged.a += t.a;
      if (t.perturbation > merged.perturbation) {
        merged.perturbation = t.perturbation;
        merged.perturbation_growth = t.perturbation_growth;
      }
    }
    merged.argument = "n/" + to_string(Rational(1) / merged.b) + " (rounded)";
  }
  if (!s.subtractive.empty() || !s.roots.empty() || (s.scaled.size() != 1 && !one_b)) {
    out.failure = "the master theorem needs exactly one recursive term a T(n/b); here there are " +
                  std::to_string(s.scaled.size() + s.subtractive.size() + s.roots.size()) + " (" +
                  std::to_string(s.scaled.size()) + " of the form a T(b n))";
    if (s.scaled.empty())
      out.failure =
          "the master theorem needs a term a T(n/b); here the recursion is not of that form";
    return out;
  }
  const ScaledTerm& t = s.scaled.size() > 1 ? merged : s.scaled[0];
  std::vector<std::string> prefix;
  if (s.scaled.size() > 1)
    prefix.push_back("the " + std::to_string(s.scaled.size()) +
                     " terms share b = " + to_string(t.b) + ": a = " + to_string(t.a));
  Rational divisor = Rational(1) / t.b;
  if (t.perturbation == Perturbation::kGrowing) {
    out.failure = "the argument " + t.argument + " departs from n/b by Θ(" +
                  to_string(*t.perturbation_growth) + "), which the master theorem does not allow";
    return out;
  }
  std::string rounding = t.perturbation == Perturbation::kBounded
                             ? "the argument " + t.argument +
                                   " differs from n/b by O(1): floors, ceilings and "
                                   "constant shifts do not change the class (Leighton 1996)"
                             : "";
  // No Θ class from the theorem itself: T is still bounded on each side by
  // comparison with the extremes of f's case lines.
  auto with_bounds = [&](TheoremOutcome& o) -> TheoremOutcome& {
    bound_by_comparison(
        input, "master theorem",
        [&](const GrowthClass* g) { return master_on(t.a, divisor, g, input); }, o);
    if (!o.bounds_steps.empty()) {
      if (!rounding.empty()) o.bounds_steps.insert(o.bounds_steps.begin(), rounding);
      o.bounds_steps.insert(o.bounds_steps.begin(), prefix.begin(), prefix.end());
    }
    return o;
  };
  if (input.driving.zero) {
    out = master_on_zero(t.a, divisor, input);
  } else if (input.driving.growth) {
    // A class written in the recurrence is shown as its class, not as the
    // member the exact values use.
    std::string text = s.driving && !input.driving_is_class ? print(*s.driving) : "f(n)";
    out = master_on_class(t.a, divisor, *input.driving.growth, text,
                          regularity_facts(input, t.a, t.b));
  } else if (input.driving_one_sided) {
    out.failure = input.driving.reason + ": no case of the master theorem gives Θ";
    return with_bounds(out);
  } else if (input.driving_lower && input.driving_upper && t.a >= 1) {
    RealNumber p = RealNumber::log(divisor, t.a);
    if (input.driving_upper->is_subexponential() && input.driving_upper->alpha < p) {
      out = master_on_class(t.a, divisor, *input.driving_upper, "f(n) (at most)");
      if (out.applies())
        out.steps.insert(out.steps.begin(), "f(n) has no single class, but f(n) = O(" +
                                                to_string(*input.driving_upper) + ")");
    } else if (input.driving_lower->alpha > p) {
      out.steps.push_back("f(n) has no single class (" + input.driving.reason + "), but f(n) = Ω(" +
                          to_string(*input.driving_lower) + ") = Ω(n^(p + ε)) with p = " + p.str());
      if (!input.driving_at) {
        out.failure =
            "case 3 needs the regularity condition, which cannot be checked without values of f";
        return with_bounds(out);
      }
      // An infinite family of sizes where regularity fails, proved per residue.
      if (s.driving) {
        if (std::optional<RegularityFamily> family =
                regularity_failure_family(*s.driving, t.a, t.b, input.helpers)) {
          out.failure =
              "case 3 needs the regularity condition a f(n/b) <= c f(n) with c < 1, but " +
              family_sentence(*family, t.a, t.b, input) +
              ": case 3 is refused (its conclusion T(n) = Θ(f(n)) would be false)";
          return with_bounds(out);
        }
      }
      std::vector<std::string> failing;
      int tested = 0;
      NumericContext ctx;
      for (const Size& size : regularity_sizes(divisor)) {
        BigInt m = floor_of(Rational(size.n) * t.b);
        if (m < 1) continue;
        auto fn = input.driving_at(size.n);
        auto fm = input.driving_at(m);
        if (!fn || !fm) continue;
        ++tested;
        try {
          if (compare(mul(Value(t.a), *fm, ctx), *fn, ctx) >= 0 && failing.size() < 6)
            failing.push_back(size.label);
        } catch (const PrecisionShortfall&) {
        }
      }
      if (!failing.empty()) {
        std::string list;
        for (const auto& f : failing) list += (list.empty() ? "" : ", ") + f;
        out.failure =
            "case 3 needs the regularity condition a f(n/b) <= c f(n) with c < 1, but a "
            "f(floor(n/b)) >= f(n) "
            "at n = " +
            list + ": case 3 is refused (its conclusion T(n) = Θ(f(n)) would be false)";
      } else {
        out.failure = "f(n) has no normal form; the regularity condition held on the " +
                      std::to_string(tested) +
                      " sizes tested, which is evidence, not a proof: case 3 is not applied";
      }
      return with_bounds(out);
    } else {
      out.failure = "f(n) has no growth class: " + input.driving.reason;
      return with_bounds(out);
    }
  } else {
    out.failure = "f(n) has no growth class: " + input.driving.reason;
    return out;
  }
  if (!rounding.empty()) prefix.push_back(rounding);
  if (out.applies()) out.steps.insert(out.steps.begin(), prefix.begin(), prefix.end());
  return out;
}

}  // namespace thetagate::engine
