#include "verifier/derivation/theorems/change_of_variables.h"

#include "verifier/derivation/theorems/master.h"

namespace thetagate::engine {

TheoremOutcome change_of_variables(const DerivationInput& input) {
  TheoremOutcome out;
  out.theorem = "change of variables";
  const Shape& s = *input.shape;
  if (s.roots.size() != 1 || !s.scaled.empty() || !s.subtractive.empty()) {
    out.failure = "change of variables needs exactly one term a T(n^(1/k))";
    return out;
  }
  const RootTerm& t = s.roots[0];
  if (t.coefficient.varies()) {
    out.failure = "the coefficient " + t.coefficient.text + " of T(" + t.argument +
                  ") depends on n; change of variables needs a constant one";
    return out;
  }
  GrowthClass f = GrowthClass::polylog(-1);  // f = 0 acts as any decaying term
  if (input.driving.growth) {
    f = *input.driving.growth;
  } else if (!input.driving.zero) {
    out.failure = "f(n) has no growth class: " + input.driving.reason;
    return out;
  } else if (!input.leaves_positive) {
    out.failure = input.leaves_failure();
    return out;
  }
  if (!f.is_subexponential()) {
    out.failure = "f(n) = Θ(" + to_string(f) +
                  ") is exponential in n; the substitution m = lg n gives a doubly "
                  "exponential driving function";
    return out;
  }
  std::string k = std::to_string(t.k);
  out.steps.push_back("substitute m = lg n, S(m) = T(2^m): S(m) = " + to_string(t.a) + " S(m/" + k +
                      ") + f(2^m)" +
                      (t.rounded ? " (the rounding in " + t.argument + " changes m by O(1))" : ""));
  // f(2^m) = 2^(alpha m) m^beta (lg m)^gamma.
  GrowthClass g;
  if (f.alpha.sign() != 0) g.rho = pow(RealNumber(2L), f.alpha);
  g.alpha = f.beta;
  g.beta = f.gamma;
  std::string in_m = to_string(g);
  for (auto& ch : in_m) {
    if (ch == 'n') ch = 'm';  // class text only has n as the variable
  }
  out.steps.push_back("f(2^m) = Θ(" + in_m + ")");
  // f(2^m) ~ C·g(m) only where f ~ C·(its class); otherwise case 3 on S
  // compares with the drivers c₁ g and c₂ g instead of claiming regularity.
  RegularityFacts facts;
  facts.equivalent = input.driving.zero || input.driving.coefficient_known;
  TheoremOutcome inner = master_on_class(t.a, Rational(static_cast<long>(t.k)), g, "f(2^m)", facts);
  if (!inner.applies()) {
    out.failure = "the master theorem on S(m) does not apply: " + inner.failure;
    return out;
  }
  for (const auto& step : inner.steps) out.steps.push_back("for S (read n as m): " + step);
  const GrowthClass& r = *inner.growth;
  if (r.gamma.sign() != 0) {
    out.failure =
        "S(m) = Θ(" + to_string(r) + ") translates to a lg lg lg n factor, outside the normal form";
    return out;
  }
  GrowthClass result;
  if (!r.is_subexponential()) {
    // S = Θ(rho^m m^x ...) = Θ(f(n)) when case 3 returned f(2^m) itself.
    result = f;
  } else {
    result = GrowthClass::polylog(0, r.alpha, r.beta);
  }
  out.steps.push_back("back to n (m = lg n): T(n) = Θ(" + to_string(result) + ")");
  out.method = "change of variables, then " + inner.method;
  out.growth = result;
  return out;
}

}  // namespace thetagate::engine
