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
};

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_INDUCTION_PROOF_H_
