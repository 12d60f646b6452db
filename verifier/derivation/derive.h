// Deriving a recurrence's growth class from published theorems, with the
// steps a reviewer can follow and, for every theorem that did not apply,
// the hypothesis that failed. Pure: nothing here prints.
#ifndef THETAGATE_VERIFIER_DERIVATION_DERIVE_H_
#define THETAGATE_VERIFIER_DERIVATION_DERIVE_H_

#include <optional>
#include <string>
#include <vector>

#include "verifier/derivation/growth.h"
#include "verifier/derivation/theorems/outcome.h"
#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"

namespace thetagate::engine {

struct Derivation {
  std::optional<GrowthClass> growth;  // T(n) = Θ(growth) when a theorem applied
  std::string derived;                // to_string(*growth), or "" when none applied
  std::string method;                 // "master theorem, case 2", "Akra–Bazzi", ... or ""
  std::vector<std::string> steps;     // the applying theorem's steps, in order (unnumbered)
  // One entry per theorem that was tried and did not apply, as
  // "THEOREM: failing hypothesis"; also shape problems.
  std::vector<std::string> reasons;
  std::vector<TheoremOutcome> outcomes;  // every theorem tried, in order
  std::vector<std::string> notes;        // the model's notes (n/2 read as floor ...)
  // When no Θ class was derived but a theorem bounds T on one side or both
  // (by comparison with drivers that bound f): T(n) = O(*upper) and/or
  // Ω(*lower); method and steps are then that bound's. Empty with growth.
  std::optional<GrowthClass> upper, lower;
  // What the theorems were told about f, and which theorem derived the Θ
  // class ("master theorem", "Akra–Bazzi", ...; "" when none did): the facts
  // a proof certificate starts from (verifier/derivation/certificate.h).
  std::string theorem;
  Classification driving;
  bool driving_is_class = false;   // f holds growth classes written as terms
  bool driving_one_sided = false;  // f has O or Ω terms
  // Where f has no single class: the classes of its largest and smallest
  // case lines (the drivers a comparison bounds f by).
  std::optional<GrowthClass> driving_upper, driving_lower;
  // The applying theorem's case 3 rests on this regularity bound on f itself.
  std::optional<RegularityBound> regularity;

  bool derived_class() const { return growth.has_value(); }
  bool one_sided() const { return !growth && (upper || lower); }
  // What was derived, in the claim language: "Theta(n^2)", "O(n^3)",
  // "O(n^3) and Omega(n^2)", or "" when nothing was.
  std::string bound_text() const;
};

// REQUIRES: a model from build_recurrence. Evaluates T and f exactly where a
// theorem needs numbers (initial values, regularity on size families) under
// a small budget. Never throws for a valid model. The budget's clock is a
// hang guard of 60 s; `clock_limit` (seconds, 0 = no clock) replaces it, so a check
// run under --clock-limit derives under that limit too. Two theorems that both
// apply and derive different classes are a bug: throws InternalError.
Derivation derive(const Recurrence& recurrence, std::optional<double> clock_limit = std::nullopt);

enum class ClaimAgreement {
  kAgree,                // the claimed class equals the derived one (tight)
  kHoldsLoosely,         // O(g) with g above, or Omega(g) with g below (tight = false)
  kContradicts,          // the claim is false if the derivation is right
  kCannotClassifyClaim,  // g has no growth class; message says why
  kNoDerivation,         // no theorem applied
  kNotAsymptotic,        // an explicit bound: decided by numbers, not here
};

struct ClaimComparison {
  ClaimAgreement agreement = ClaimAgreement::kNoDerivation;
  bool tight = false;
  std::optional<GrowthClass> claimed;
  // The derived class the claim was measured against and how it bounds T:
  // "Θ" for a derived class, "O" or "Ω" for a one-sided derivation.
  std::optional<GrowthClass> derived;
  BoundKind relation = BoundKind::kTheta;
  // kCannotClassifyClaim: why the claimed class has no normal form (or could
  // not be ordered); empty otherwise. reports/ composes the sentences.
  std::string detail;
  bool claimed_below = false;  // kContradicts: the claimed class is the smaller one
};

// Compares an asymptotic bound Theta/O/Omega(g) with the derivation exactly
// (lg 7 is not 2.807; a lg lg n factor counts).
ClaimComparison compare_with_derivation(const Derivation& derivation, const Bound& bound);

const char* claim_agreement_name(ClaimAgreement a);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_DERIVE_H_
