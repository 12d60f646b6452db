// Proofs of explicit bounds by induction on n (the substitution method;
// docs/design.md, "Proofs"). For a bound B on T from n0: T(n) is checked
// exactly against a bound B' (B itself, or B strengthened) for the sizes
// the inductive step reaches, and against B up to M; then for every n > M
// and each recursive line, sum a_i B'(arg_i(n)) + f(n) <= B'(n) (>= on the
// lower side) is proved for every real n > M, floors and ceilings exact on
// each residue class of n: by the leading term of the slack's certified
// expansion beyond a threshold, and by interval arithmetic on blocks
// [2^k, 2^(k+1)] below it. The step is pure mathematics; the exact checks
// are the caller's (the evaluator's) part.
#ifndef THETAGATE_VERIFIER_DERIVATION_INDUCTION_H_
#define THETAGATE_VERIFIER_DERIVATION_INDUCTION_H_

#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "verifier/derivation/induction_proof.h"
#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"

namespace thetagate::engine {

struct InductionRequest {
  const Recurrence* recurrence = nullptr;
  const Bound* bound = nullptr;  // REQUIRES: an explicit bound
  // Whether T(n) satisfies `candidate` on `side` (strictly when `strict`)
  // at every n in [lo, hi], checked exactly. False at a break, or when the
  // caller's budget cannot finish the range.
  std::function<bool(const ExprPtr& candidate, Side side, bool strict, const BigInt& lo,
                     const BigInt& hi)>
      check_range;
  // Deterministic work: series expansions and interval blocks, each one unit.
  uint64_t work_budget = 20000;
};

struct InductionOutcome {
  std::optional<InductionProof> proof;
  std::string failure;  // when no proof: the reason of the most promising attempt
  uint64_t work = 0;
};

InductionOutcome prove_by_induction(const InductionRequest& request);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_INDUCTION_H_
