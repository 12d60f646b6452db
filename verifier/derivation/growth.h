// Growth classes in normal form: rho^n * n^alpha * (lg n)^beta * (lg lg n)^gamma
// with exact real exponents (rationals, logarithms such as lg 7, algebraic
// numbers, certified critical exponents). Two classes are ordered exactly,
// lexicographically on (rho, alpha, beta, gamma): f = o(g) iff f < g.
#ifndef THETAGATE_VERIFIER_DERIVATION_GROWTH_H_
#define THETAGATE_VERIFIER_DERIVATION_GROWTH_H_

#include <string>

#include "verifier/numbers/real_number.h"

namespace thetagate::engine {

struct GrowthClass {
  RealNumber rho = RealNumber(1L);  // the base of the exponential factor; > 0
  RealNumber alpha;                 // n^alpha
  RealNumber beta;                  // (lg n)^beta
  RealNumber gamma;                 // (lg lg n)^gamma

  static GrowthClass constant() { return {}; }
  // n^alpha (lg n)^beta (lg lg n)^gamma.
  static GrowthClass polylog(RealNumber alpha, RealNumber beta = RealNumber(),
                             RealNumber gamma = RealNumber());
  static GrowthClass exponential(RealNumber rho);

  bool is_constant() const;
  // rho == 1: no exponential factor.
  bool is_subexponential() const;

  // The class of f*g, f/g, f^r. REQUIRES for power: rho > 0 (always true).
  GrowthClass times(const GrowthClass& other) const;
  GrowthClass over(const GrowthClass& other) const;
  GrowthClass power(const RealNumber& r) const;
};

// Exact order: -1 when a = o(b), 0 when a = Θ(b), +1 when b = o(a).
// Throws PrecisionShortfall only if an exponent comparison cannot be decided.
int compare(const GrowthClass& a, const GrowthClass& b);
inline bool same_class(const GrowthClass& a, const GrowthClass& b) { return compare(a, b) == 0; }

// Text in the expression language where the exponents are exact: "n lg n",
// "n^(lg 7)", "n/lg^2 n", "lg n lg lg n", "2^n n^2", "((1 + sqrt(5))/2)^n",
// "1"; certified digits otherwise: "n^0.839780…", "1.324718…^n".
std::string to_string(const GrowthClass& g);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_GROWTH_H_
