// The proof stage of a claim's check: what the theorems and induction can
// prove about the claim, given the derivation and what the search found.
//
// - Asymptotic bound: the derived class against the claim's
//   (compare_with_derivation), cross-checked with the exact values (a
//   theorem whose class the numbers contradict is a bug, not a proof); with
//   no theorem, a direct bound c·g(n) proved by induction.
// - Explicit bound: the derived class against each side (it must fit for a
//   proof to be possible), then a proof by induction, its exact base ranges
//   checked here (docs/design.md, "Proofs").
//
// Nothing here sets a verdict: verdict.h maps the attempt to one.
// Internal to verifier/checking.
#ifndef THETAGATE_VERIFIER_CHECKING_CLAIM_PROOF_H_
#define THETAGATE_VERIFIER_CHECKING_CLAIM_PROOF_H_

#include <optional>
#include <string>
#include <vector>

#include "verifier/checking/claim_evaluation.h"
#include "verifier/checking/result.h"
#include "verifier/checking/witness_search.h"
#include "verifier/derivation/certificate.h"
#include "verifier/derivation/derive.h"
#include "verifier/derivation/induction.h"

namespace thetagate::engine::checker_internal {

struct ProofAttempt {
  // How the derived class compares with the claim's class (asymptotic) or
  // with the explicit bound's sides; unset without a derived class, or when
  // the claim's class has no normal form.
  std::optional<TheoremEvidence> theorem;
  // Asymptotic, theorem set: the edges of T(n)/derived(n) that move
  // although the theorem says they cannot (empty when the numbers agree).
  std::vector<EdgeDisagreement> disagreement;
  // Explicit: the derived class lies beyond a side, so the bound must break
  // further out; no induction is tried.
  bool derived_outgrows_side = false;
  // Explicit: every side has the derived class (the bound is tight).
  bool tight = true;
  // A proof by induction: of the explicit bound, or (asymptotic, no
  // theorem) of a direct bound c·g(n).
  std::optional<InductionProof> induction;
  // The certificate of the proof (theorem or induction) where it has one
  // (verifier/derivation/certificate.h).
  std::optional<Certificate> certificate;
  // Asymptotic: the claim's class has no normal form (detail says why).
  bool claim_unclassified = false;
  // Why no proof was found, in the deciding step's words: the induction's
  // failure, the unclassified claim's reason.
  std::string detail;
};

// Attempts the proof. Explicit bounds that the search already broke are not
// attempted (an empty attempt). REQUIRES: `search` is the outcome of
// search_witnesses with `eval`.
ProofAttempt attempt_proof(ClaimEvaluation& eval, const Derivation& derivation,
                           const SearchOutcome& search);

}  // namespace thetagate::engine::checker_internal

#endif  // THETAGATE_VERIFIER_CHECKING_CLAIM_PROOF_H_
