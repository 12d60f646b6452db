// Asymptotic expansions, the arithmetic classify() works in: a value as a
// finite sum of exact terms c * G in decreasing growth classes plus a
// remainder known only as O(E). Sums, products, powers and lg of expansions
// keep every term that stays exact and fold the rest into the remainder, so
// a driving function's leading term keeps its exact constant where it has
// one. What has no expansion in normal form (lg of zero, a negative base to a
// fractional power) throws Refusal carrying the reason in a reviewer's words.
#ifndef THETAGATE_VERIFIER_DERIVATION_CLASSIFY_EXPANSION_H_
#define THETAGATE_VERIFIER_DERIVATION_CLASSIFY_EXPANSION_H_

#include <optional>
#include <string>
#include <vector>

#include "verifier/derivation/growth.h"
#include "verifier/numbers/real_number.h"

namespace thetagate::engine::classify_internal {

// Thrown when an expression has no growth class; classify() reports `reason`.
struct Refusal {
  std::string reason;
};

struct Term {
  RealNumber c;
  GrowthClass g;
};

// value = sum of terms + R, with R = O(error); error_sign = +-1 when R is
// known to be Θ(error) with that sign (a leading constant we do not know).
struct Expansion {
  std::vector<Term> terms;  // decreasing classes, all above `error`
  std::optional<GrowthClass> error;
  int error_sign = 0;

  bool is_zero() const { return terms.empty() && !error; }
  bool is_pure() const { return terms.empty() && error; }
};

// The leading behaviour of an expansion: f ~ c * g when `known`, otherwise
// f = Θ(g) with sign `sign` and c = ±1.
struct Lead {
  GrowthClass g;
  RealNumber c;
  bool known;
  int sign;
};

// The class of n.
const GrowthClass& n_class();
// Whether g is exactly n^alpha lg^beta n (lg lg n)^gamma with no exponential factor.
bool is_class(const GrowthClass& g, long alpha, long beta, long gamma);

// c (empty when c = 0), c * g (empty when c = 0), and Θ(g) with sign `sign`
// and an unknown constant.
Expansion constant_expansion(const RealNumber& c);
Expansion term_expansion(const RealNumber& c, const GrowthClass& g);
Expansion pure_expansion(const GrowthClass& g, int sign);

// Folds O(g) (Θ(g) with that sign when sign != 0) into x's remainder. Terms
// now at or below the remainder stay until normalize().
void absorb(Expansion& x, const GrowthClass& g, int sign);
// Sorts and merges terms, drops zero terms and those at or below the
// remainder, and keeps at most 24 terms (the rest become remainder).
void normalize(Expansion& x);
// Throws Refusal when x is zero or its leading terms cancel to an unknown O(E).
Lead lead_of(const Expansion& x);

Expansion add(Expansion x, const Expansion& y);
Expansion negate(Expansion x);
Expansion multiply(const Expansion& x, const Expansion& y);
// x^r by its leading term: c^r G^r (1 + O(next/G)). `what` names the
// expression in a refusal. Throws Refusal when x is zero or negative.
Expansion approximate_power(const Expansion& x, const RealNumber& r, const std::string& what);
// x^k by repeated products (exact lower terms) up to k = 12, by leading term
// above. REQUIRES: k >= 0.
Expansion integer_power(const Expansion& x, long k, const std::string& what);
// lg x. Throws Refusal when x is zero, negative, tends to 1, is bounded with
// an unknown constant, or leads with a lg lg n factor alone (lg lg lg n).
Expansion lg_of(const Expansion& x, const std::string& what);

// lg c (numbers/real_number.h).
using ::thetagate::engine::log2_of;

}  // namespace thetagate::engine::classify_internal

#endif  // THETAGATE_VERIFIER_DERIVATION_CLASSIFY_EXPANSION_H_
