#include "verifier/derivation/theorems/subtract.h"

namespace thetagate::engine {

// Unrolling n = q b + r (q = floor(n/b) levels, then a base value T_r > 0):
//   T(n) = a^q T_r + sum_{j<q} a^j f(n - j b).
// a < 1: f(n) <= T(n) <= a^q T_r + f(n) sum a^j = f(n)/(1 - a) + O(1), since f is
//        non-decreasing; so T = Θ(f) (for f = Θ(1) too).
// a = 1: T(n) = T_r + sum_{j<q} f(n - j b); every summand is <= f(n) and the
//        q/2 largest are >= f(n/2) = Θ(f(n)) (polynomial growth): Θ(n f(n)).
// a > 1: T(n) = a^q (T_r + sum_{j<q} f(n - j b) a^(j - q)); the sum in brackets
//        converges (f polynomial against a geometric decay), so T = Θ(a^q)
//        = Θ(a^(n/b)) -- tight, not merely O(n^k a^(n/b)).
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
  GrowthClass f = GrowthClass::constant();
  if (input.driving.growth) {
    f = *input.driving.growth;
  } else if (!input.driving.zero) {
    out.failure = "f(n) has no growth class: " + input.driving.reason;
    return out;
  }
  if (!f.is_subexponential() || f.alpha.sign() < 0) {
    out.failure = "subtract-and-conquer needs f(n) = Θ(n^k ...) with k >= 0; here f(n) = Θ(" +
                  to_string(f) + ")";
    return out;
  }
  std::string a = to_string(t.a), b = t.c.str();
  out.steps.push_back("T(n) = a T(n - b) + f(n) with a = " + a + ", b = " + b + ", f(n) = " +
                      (input.driving.zero ? std::string("0") : "Θ(" + to_string(f) + ")") +
                      " (common practice; derived by unrolling the recursion)");
  GrowthClass result;
  if (t.a < 1) {
    if (input.driving.zero) {
      out.failure = "with a < 1 and f = 0, T(n) tends to 0 and has no class of the normal form";
      return out;
    }
    out.steps.push_back(
        "a < 1: the unrolled sum is a decreasing geometric series dominated by f(n)");
    result = f;
    out.method = "subtract-and-conquer, a < 1";
  } else if (t.a == 1) {
    result = input.driving.zero ? GrowthClass::constant() : f.times(GrowthClass::polylog(1));
    out.steps.push_back("a = 1: n/b levels, each costing Θ(f(n)) for half of them: Θ(n f(n))");
    out.method = "subtract-and-conquer, a = 1";
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

}  // namespace thetagate::engine
