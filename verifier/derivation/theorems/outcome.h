// What each theorem returns, and what it is given. Plain values: the
// engine never prints; reports/ and the CLI render these.
#ifndef THETAGATE_VERIFIER_DERIVATION_THEOREMS_OUTCOME_H_
#define THETAGATE_VERIFIER_DERIVATION_THEOREMS_OUTCOME_H_

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "verifier/derivation/classify.h"
#include "verifier/derivation/growth.h"
#include "verifier/derivation/regularity.h"
#include "verifier/derivation/shape.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine {

// What the change of variables after dividing T by n^power proved about the
// factor r(n) = a(n) s(n)^power / n^power (s(n) the root term's argument):
// factor_low <= r(n) <= factor_high at every size n >= from where the
// recursive line applies, and the product of r(n_i)/limit over the sizes of
// one chain n, s(n), s(s(n)), ... lies in [chain_low, chain_high].
struct RootNormalisation {
  Rational power;  // q: T is divided by n^q
  Rational limit;  // a0, the limit of r(n)
  Rational factor_low, factor_high;
  BigInt from;
  Rational chain_low, chain_high;
  std::string factor;      // r(n) as text: "2 floor(sqrt(n))^2/n"
  std::string normaliser;  // n^q in the claim language: "n", "n^(1/2)"
};

struct TheoremOutcome {
  std::string theorem;                // "master theorem", "Akra–Bazzi", ...
  std::string method;                 // when it applies: "master theorem, case 2"
  std::optional<GrowthClass> growth;  // T(n) = Θ(growth) when it applies
  std::vector<std::string> steps;     // a reviewer's steps, in order (unnumbered)
  std::string failure;                // when it does not apply: the failing hypothesis
  // When no Θ class follows but T is bounded on one side or both by
  // comparison with drivers that bound f: T(n) = O(*upper), T(n) = Ω(*lower),
  // with the method and the steps that show it.
  std::optional<GrowthClass> upper, lower;
  std::string bounds_method;
  std::vector<std::string> bounds_steps;
  // Case 3 concluded through a regularity bound proved on f itself (not
  // from the limit, not by comparison): that bound, for the certificate.
  std::optional<RegularityBound> regularity;
  // A root term whose coefficient depends on n: the normalisation it rests on.
  std::optional<RootNormalisation> normalisation;

  bool applies() const { return growth.has_value(); }
};

// Everything the theorems read: the shape, the driving function's class,
// and (when a theorem must look at numbers) exact values of f.
struct DerivationInput {
  const Shape* shape = nullptr;
  const HelperTable* helpers = nullptr;
  // f's class; when the case lines of T give f different classes this is
  // unset, driving.reason says why, and lower/upper hold the extremes.
  Classification driving;
  std::optional<GrowthClass> driving_lower, driving_upper;
  // f holds growth classes written as terms (2T(n/2) + Θ(n)): f is any
  // function of that form, so nothing is proved on its representative.
  bool driving_is_class = false;
  // An O(g) term bounds f above only (driving_lower then stands for the rest
  // of f, or is empty with driving_lower_zero when nothing else is there);
  // an Ω(g) term bounds it below only (driving_upper empty).
  bool driving_one_sided = false;
  bool driving_lower_zero = false;
  // Every value T takes on a line without a recursive call is a positive
  // constant (a number, or a Θ or Ω class of one). Where f may be 0 (f = 0,
  // or only an O term bounds it), T is a sum over its leaves, and only then
  // does it grow like them; otherwise `leaves_reason` says which base value
  // may be 0 or negative, and no theorem concludes from the leaves alone.
  bool leaves_positive = false;
  std::string leaves_reason;
  // A theorem's failure where it would conclude from the leaves alone.
  std::string leaves_failure(const std::string& f = "f") const {
    return "with " + f + "(n) = 0, T(n) is a sum of base values over its leaves, and " +
           leaves_reason;
  }
  // f(n) exactly, or empty when it cannot be evaluated at n (may be null).
  std::function<std::optional<Value>(const BigInt& n)> driving_at;
  // T(n) exactly (may be null): for linear recurrences' initial values.
  std::function<std::optional<Value>(const BigInt& n)> value_at;
  // The smallest n >= 1 at which no point case and no line for bounded n
  // applies (decided exactly for n <= 4096); unset when none was found there.
  std::optional<BigInt> recursive_from;
};

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_THEOREMS_OUTCOME_H_
