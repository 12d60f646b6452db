// What a proof by induction establishes (induction.h proves it; a verdict's
// basis carries it, checking/result.h).
#ifndef THETAGATE_VERIFIER_DERIVATION_INDUCTION_PROOF_H_
#define THETAGATE_VERIFIER_DERIVATION_INDUCTION_PROOF_H_

#include <cstdint>
#include <string>
#include <vector>

#include "verifier/model/bound.h"
#include "verifier/numbers/number.h"

namespace thetagate::engine {

// One side of such a proof, as its certificate lists it (not in the JSON
// report's `induction` object, which carries the proof's totals).
struct InductionSideProof {
  Side side = Side::kUpper;
  std::string relation;   // "<=", "<", ">=" or ">"
  std::string claimed;    // the claim's side B, printed
  std::string carried;    // B' carried through the step, printed (B itself when not strengthened)
  BigInt claimed_from;    // T(n) checked against B for claimed_from <= n <= to
  BigInt carried_from;    // and against B' for carried_from <= n <= to, when strengthened
  BigInt to;              // M of this side: the step is proved for every n > to
  uint64_t modulus = 1;   // the step was proved per residue of n mod this
  bool identity = false;  // the step's slack vanishes identically
  bool strengthened() const { return carried != claimed; }
};

// A proof of an explicit bound by induction on n (the substitution method).
struct InductionProof {
  std::vector<Side> sides;    // the sides proved
  std::string bound;          // the bound carried through the step, as printed
  std::string strengthening;  // the term the claim's bound was strengthened by, "" if none
  BigInt checked_from;        // T(n) checked exactly against it for checked_from <= n <= checked_to
  BigInt checked_to;          // M: the step is proved for every n > M
  uint64_t modulus = 1;       // the step was proved per residue of n mod this
  uint64_t tail_log2 = 0;     // beyond 2^tail_log2 the leading term of the slack dominates
  uint64_t blocks = 0;        // interval blocks between M and 2^tail_log2
  bool identity = false;      // the step's slack vanishes identically
  std::vector<InductionSideProof> side_proofs;  // per side, in `sides` order
  // Induction on dyadic blocks (dyadic.h): the step is an identity on every
  // block [2^k, 2^(k+1)) past checked_to; tail_log2 is then the k from which
  // the comparison with closed_form needs no block-by-block check, blocks
  // the blocks checked one by one before it.
  bool dyadic = false;
  // Dyadic: T's closed form, proved equal to T by that induction, that the
  // claim's bound was compared with on every block ("" when the claim's
  // bound was carried itself).
  std::string closed_form;
  // "" for the substitution step above; a proof over a sum of earlier
  // values names its own step (sum_induction.h: "sum-difference",
  // "sum-step"), which is also its certificate's method, and lists that
  // certificate's obligations here.
  std::string method;
  // Dyadic, sum-difference or sum-step: the certificate's obligations, one
  // statement each.
  std::vector<std::string> obligations;
  // The recurrence's function as the claim names it (C in C(n) = ...), for
  // the proof's name.
  std::string function = "T";
};

// The proof as reports name it: "induction from n = 65: T(n) <= 3*(n - 1)^lg(3)
// (the claim strengthened by the shift n -> n - 1)".
std::string induction_proof_name(const InductionProof& proof);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_INDUCTION_PROOF_H_
