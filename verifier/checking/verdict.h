// Which code decided this verdict: the one place where a claim's verdict and
// its basis are set. A claim's check (claim_check.h) runs its stages, each
// returning a value, and hands them here:
//
//   derivation      verifier/derivation/derive.h   the theorems, from the recurrence alone
//   search outcome  witness_search.h               band, certified breaks, ladder rungs
//   proof attempt   claim_proof.h                  theorem vs claim and numbers; induction
//   code link       code_check.h                   counted costs against T(n)
//
// decide_verdict maps the first three to a verdict; apply_code_result then
// lets the code link override it (after both roundings are combined,
// checker.cc). Both are pure: they evaluate nothing.
// Internal to verifier/checking.
#ifndef THETAGATE_VERIFIER_CHECKING_VERDICT_H_
#define THETAGATE_VERIFIER_CHECKING_VERDICT_H_

#include <string>
#include <vector>

#include "verifier/checking/claim_proof.h"
#include "verifier/checking/result.h"
#include "verifier/checking/witness_search.h"
#include "verifier/derivation/derive.h"
#include "verifier/model/bound.h"

namespace thetagate::engine::checker_internal {

// The verdict and everything that goes with it in the ClaimResult.
struct VerdictDecision {
  Verdict verdict = Verdict::kUndecided;
  VerdictBasis basis;
  // The method the report names when it is not the derivation's own:
  // "exact evaluation" (explicit bound, no theorem), "induction" (a direct
  // bound), "numeric" (the numbers alone); "" to keep the derivation's.
  std::string method;
  bool tight = true;          // false: holds loosely
  bool numeric_only = false;  // decided, or left undecided, by numbers alone
  std::vector<Witness> witnesses;
  std::string internal_error;  // verdict error: what is inconsistent
};

// The verdict of a claim with bound `bound` from its stages' values.
VerdictDecision decide_verdict(const Bound& bound, const Derivation& derivation,
                               const SearchOutcome& search, const ProofAttempt& proof);

}  // namespace thetagate::engine::checker_internal

namespace thetagate::engine {

// The code link: a measured cost on the wrong side of T(n) refutes the
// claim (basis code_breaks_model); a bound that holds while the costs miss
// the adversarial size families is undecided (code_sizes_missed). Either
// way the recurrence's own verdict and basis are kept in `code`.
void apply_code_result(ClaimResult& result, CodeResult code);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_VERDICT_H_
