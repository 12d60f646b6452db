// Classifying an expression in n (a driving function, a claimed bound's g)
// into a growth class: f(n) = Θ(rho^n n^alpha lg^beta n (lg lg n)^gamma), with
// its leading constant where that is known, or a reason why f has no such
// class (parity cases of different classes, mod, a negative leading term,
// growth between polynomial and exponential such as 2^sqrt(n)).
#ifndef THETAGATE_VERIFIER_DERIVATION_CLASSIFY_H_
#define THETAGATE_VERIFIER_DERIVATION_CLASSIFY_H_

#include <map>
#include <optional>
#include <string>

#include "verifier/derivation/growth.h"
#include "verifier/evaluation/constant_value.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/expr.h"

namespace thetagate::engine {

struct Classification {
  // Set when classified: f(n) = Θ(growth), and f(n) ~ coefficient * growth
  // when coefficient_known (the leading constant is exact, e.g. 3 for 3n^2 + n).
  std::optional<GrowthClass> growth;
  RealNumber coefficient = RealNumber(1L);
  bool coefficient_known = true;
  // f(n) = 0 for all large n (growth is empty, reason explains).
  bool zero = false;
  // Why there is no class, in a reviewer's words.
  std::string reason;

  explicit operator bool() const { return growth.has_value(); }
};

// Helper functions a driving function may call: f(n) = n if n even, ...
using HelperTable = std::map<std::string, Function>;

// REQUIRES: e is a value expression in n (no T calls; a T call is a reason).
Classification classify(const Expr& e, const HelperTable* helpers = nullptr);

// Whether a case-line condition holds for every large n (+1: "n > 4",
// "n >= 2"), only for finitely many n (-1: "n <= 1", "n == 3"), or neither
// (0: "n even", "n mod 3 == 1").
int condition_reach(const Expr& condition);

// e with every n replaced by `argument` (for f(n/2) with f a helper).
ExprPtr substitute(const ExprPtr& e, const ExprPtr& argument);
// e with the sum variable `variable` read as n (a sum's body as a function of n).
ExprPtr bound_as_n(const ExprPtr& e, const std::string& variable);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_CLASSIFY_H_
