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
  std::vector<std::string> failed_hypotheses;
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
  // The applying theorem divided T by a power of n first (a root term whose
  // coefficient depends on n): what it proved about the factor left over.
  std::optional<RootNormalisation> normalisation;
  // Growth classes written as terms, and no Θ class: the Θ class of the one
  // member that puts each class's own g in its place ("n for O(n)"), with
  // the theorem that derived it. A claim this member breaks is false, as a
  // claim speaks of every function of its classes.
  std::optional<GrowthClass> member_growth;
  std::string member_method;  // "n for O(n): master theorem, case 2"

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

// How a claim's class compares with a derived one: the same class, a looser
// bound that the derived class still proves (O(g) with g above it, Ω(g) with
// g below), or a class the derived one excludes.
enum class Agreement { kSame, kLoose, kContradicts };
const char* agreement_name(Agreement a);  // "same", "loose", "contradicts"

struct ClaimComparison {
  // Unset when the two could not be compared: no theorem derives a class
  // (or a one-sided one that does not settle the claim), or the claim's
  // class has no normal form (claim_unclassified).
  std::optional<Agreement> agreement;
  bool claim_unclassified = false;
  std::optional<GrowthClass> claimed;
  // The derived class the claim was measured against and how it bounds T:
  // "Θ" for a derived class, "O" or "Ω" for a one-sided derivation.
  std::optional<GrowthClass> derived;
  BoundKind relation = BoundKind::kTheta;
  // claim_unclassified: why the claimed class has no normal form (or could
  // not be ordered); empty otherwise. reports/ composes the sentences.
  std::string detail;
  bool claimed_below = false;  // kContradicts: the claimed class is the smaller one
  // The method that settled it, when not the derivation's own (a member of
  // the class terms breaks the claim); "" otherwise.
  std::string method;
};

// Compares an asymptotic bound Theta/O/Omega(g) with the derivation exactly
// (lg 7 is not 2.807; a lg lg n factor counts). An explicit bound is not
// compared (agreement unset).
ClaimComparison compare_with_derivation(const Derivation& derivation, const Bound& bound);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_DERIVE_H_
