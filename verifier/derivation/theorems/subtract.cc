#include "verifier/derivation/theorems/subtract.h"

#include "verifier/derivation/theorems/akra_bazzi.h"
#include "verifier/derivation/theorems/comparison.h"

namespace thetagate::engine {

// Unrolling n = q b + r (q = floor(n/b) levels, then a base value T_r > 0):
//   T(n) = a^q T_r + sum_{j<q} a^j f(n - j b).
// a < 1: the summands with j <= q/2 have n - j b >= n/2, so f(n - j b) = Θ(f(n))
//        (polynomial growth or decay) and they add up to Θ(f(n)) against the
//        geometric weights; those with j > q/2 carry a^j <= a^(q/2), exponentially
//        small against any power of n. So T = Θ(f) (for f = Θ(1) and f = 1/n too).
// a = 1: T(n) = T_r + sum_{j<q} f(n - j b), the driver summed, which is Θ(∫_1^n f)
//        for f regularly varying: Θ(n f(n)) when k > -1, lg^(β+1) n when f =
//        Θ(lg^β n / n) (the harmonic numbers for f = 1/n), Θ(1) below.
// a > 1: T(n) = a^q (T_r + sum_{j<q} f(n - j b) a^(j - q)); the sum in brackets
//        converges (f polynomial against a geometric decay), so T = Θ(a^q)
//        = Θ(a^(n/b)) -- tight, not merely O(n^k a^(n/b)).
namespace {

// The theorem on the term a T(n - b) (a > 0) with the driver `driving`.
TheoremOutcome subtract_on(const SubtractiveTerm& t, const Classification& driving,
                           const DerivationInput& input) {
  TheoremOutcome out;
  out.theorem = "subtract-and-conquer";
  GrowthClass f = GrowthClass::constant();
  if (driving.growth) {
    f = *driving.growth;
  } else if (!driving.zero) {
    out.failure = "f(n) has no growth class: " + driving.reason;
    return out;
  }
  if (driving.zero && t.a >= 1 && !input.leaves_positive) {
    out.failure = input.leaves_failure();
    return out;
  }
  std::string a = to_string(t.a), b = t.c.str();
  if (!f.is_subexponential()) {
    // f = rho^n g(n), g polynomial: the unrolled sum weighs f(n - j b) by a^j, so
    // with r = a^(1/b) the terms go like (r/rho)^(j b): rho > r, f dominates;
    // rho < r, the leaves do (Θ(r^n)); rho = r, every level costs about r^n g and
    // T = Θ(r^n ∫ g).
    RealNumber r = RealNumber::root(t.a, static_cast<unsigned long>(t.c));
    GrowthClass g = f.over(GrowthClass::exponential(f.rho));
    int order = compare(f.rho, r);
    out.steps.push_back("T(n) = a T(n - b) + f(n) with a = " + a + ", b = " + b + ", f(n) = Θ(" +
                        to_string(f) + ") (common practice; derived by unrolling the recursion)");
    GrowthClass result;
    if (order > 0) {
      out.steps.push_back("the driver's base " + f.rho.str() + " exceeds a^(1/b) = " + r.str() +
                          ": the unrolled sum is dominated by f(n)");
      result = f;
    } else if (order < 0) {
      out.steps.push_back("the driver's base " + f.rho.str() + " is below a^(1/b) = " + r.str() +
                          ": the leaves dominate, Θ(a^(n/b))");
      result = GrowthClass::exponential(r);
    } else {
      auto integral = akra_bazzi_integral(g.times(GrowthClass::polylog(1)), RealNumber());
      if (!integral) {
        out.failure = "the driver's polynomial part sums to lg lg lg n, outside the normal form";
        return out;
      }
      out.steps.push_back("the driver's base equals a^(1/b) = " + r.str() +
                          ": every level costs about a^(n/b) g, so T(n) = Θ(a^(n/b) sum g) = Θ(" +
                          to_string(GrowthClass::exponential(r)) + " " + to_string(*integral) +
                          ")");
      result = GrowthClass::exponential(r).times(*integral);
    }
    out.method = "subtract-and-conquer, exponential driver";
    out.steps.push_back("T(n) = Θ(" + to_string(result) + ")");
    out.growth = result;
    return out;
  }
  out.steps.push_back("T(n) = a T(n - b) + f(n) with a = " + a + ", b = " + b +
                      ", f(n) = " + (driving.zero ? std::string("0") : "Θ(" + to_string(f) + ")") +
                      " (common practice; derived by unrolling the recursion)");
  GrowthClass result;
  if (t.a < 1) {
    if (driving.zero) {
      out.failure = "with a < 1 and f = 0, T(n) tends to 0 and has no class of the normal form";
      return out;
    }
    out.steps.push_back(
        "a < 1: the unrolled sum is a decreasing geometric series dominated by f(n)");
    result = f;
    out.method = "subtract-and-conquer, a < 1";
  } else if (t.a == 1) {
    out.method = "subtract-and-conquer, a = 1";
    if (driving.zero) {
      result = GrowthClass::constant();
    } else {
      // T(n) = T_r + sum_{j<q} f(n - j b): the driver summed, Θ(∫ f) (as in
      // Akra–Bazzi's integral with p = 0): n f(n) when k > -1; the harmonic
      // lg^(j+1) n when k = -1; bounded when k < -1 (T_r > 0 keeps it Θ(1)).
      auto integral = akra_bazzi_integral(f.times(GrowthClass::polylog(1)), RealNumber());
      if (!integral) {
        out.failure = "a = 1 sums f(n) = Θ(" + to_string(f) +
                      "), which grows like lg lg lg n, outside the normal form";
        return out;
      }
      result = *integral;
      int k = compare(f.alpha, RealNumber(-1L));
      if (k > 0) {
        out.steps.push_back(
            "a = 1: T(n) = T_r + sum_{j<n/b} f(n - j b), the driver summed: "
            "Θ(n f(n)) since k > -1");
      } else {
        out.steps.push_back(std::string("a = 1: T(n) = T_r + sum_{j<n/b} f(n - j b), the driver "
                                        "summed: ") +
                            (k == 0 ? "k = -1, a harmonic sum" : "k < -1, a convergent sum") +
                            ", Θ(" + to_string(result) + ")");
      }
      // The leading constant, where f's is exact: sum of A m^k lg^j m over
      // m <= n (every b-th m) ~ A/(b (k+1)) n^(k+1) lg^j n, or for k = -1
      // A ln 2/(b (j+1)) lg^(j+1) n = A/(b (j+1)) lg^j n ln n.
      if (driving.coefficient_known && k >= 0 && f.gamma.sign() == 0) {
        RealNumber A = driving.coefficient / RealNumber(Rational(t.c));
        std::string leading;
        if (k > 0) {
          RealNumber c = A / (f.alpha + RealNumber(1L));
          leading = (c == RealNumber(1L) ? "" : c.str() + " ") + to_string(result);
        } else if (f.beta > RealNumber(-1L)) {
          RealNumber c = A / (f.beta + RealNumber(1L));
          GrowthClass rest = GrowthClass::polylog(0, f.beta);
          leading = (c == RealNumber(1L) ? "" : c.str() + " ") +
                    (rest.is_constant() ? "" : to_string(rest) + " ") + "ln n";
        }
        if (!leading.empty()) out.steps.push_back("leading term: T(n) ~ " + leading);
      }
    }
  } else {
    RealNumber rho = RealNumber::root(t.a, static_cast<unsigned long>(t.c));
    out.steps.push_back("a > 1: the leaves dominate, a^(n/b) = (" + a + "^(1/" + b + "))^n");
    result = GrowthClass::exponential(rho);
    out.method = "subtract-and-conquer, a > 1";
  }
  out.steps.push_back("T(n) = Θ(" + to_string(result) + ")");
  out.growth = result;
  return out;
}

}  // namespace

TheoremOutcome subtract_and_conquer(const DerivationInput& input) {
  TheoremOutcome out;
  out.theorem = "subtract-and-conquer";
  const Shape& s = *input.shape;
  if (s.subtractive.size() != 1 || !s.scaled.empty() || !s.roots.empty()) {
    out.failure = "subtract-and-conquer needs exactly one term a T(n - b)";
    return out;
  }
  const SubtractiveTerm& t = s.subtractive[0];
  if (t.a <= 0) {
    out.failure = "subtract-and-conquer needs a > 0; here a = " + to_string(t.a);
    return out;
  }
  out = subtract_on(t, input.driving, input);
  // f with an O or Ω term has no class, but T lies between the solutions
  // driven by its bounds (comparison.h).
  if (!out.applies() && input.driving_one_sided) {
    bound_by_comparison(
        input, "subtract-and-conquer",
        [&](const GrowthClass* g) {
          Classification c;
          if (g) {
            c.growth = *g;
            c.coefficient_known = false;  // any function of the class
          } else {
            c.zero = true;
          }
          return subtract_on(t, c, input);
        },
        out);
  }
  return out;
}

}  // namespace thetagate::engine
