// The check of one claim under one reading of its quotients, as a sequence
// of stages that each return a value:
//
//   1. derivation   derive()                 the theorems, from the recurrence alone
//   2. sizes        claim_size_plan()        the size families up to max_bits
//   3. search       search_witnesses()       band, certified breaks, ladder rungs
//   4. proof        attempt_proof()          theorem vs claim and numbers; induction
//   5. verdict      decide_verdict()         the one place a verdict is set
//
// All evaluation goes through one ClaimEvaluation (claim_evaluation.h),
// which keeps the work account; how the work budget is shared out between
// the stages is its WorkShares table. checker.cc runs a ClaimCheck per
// reading of a claim and adds the code link. Internal to verifier/checking.
#ifndef THETAGATE_VERIFIER_CHECKING_CLAIM_CHECK_H_
#define THETAGATE_VERIFIER_CHECKING_CLAIM_CHECK_H_

#include <vector>

#include "generators/size_family.h"
#include "verifier/checking/checker.h"
#include "verifier/checking/claim_evaluation.h"
#include "verifier/checking/result.h"

namespace thetagate::engine::checker_internal {

// REQUIRES: claim.recurrence is set; claim, options and result outlive the
// ClaimCheck.
class ClaimCheck {
 public:
  ClaimCheck(const Claim& claim, const CheckOptions& options, ClaimResult& result);

  // Runs the stages and fills `result`: the derivation's facts, the
  // verdict, its basis, band, witnesses and notes. Throws InputError for a
  // malformed claim and BudgetExceeded when the evaluator's own limits end
  // the run; what was filled in by then (the derivation, the sizes checked)
  // stays in `result`.
  void run();

 private:
  // The sizes to evaluate, ascending. Throws InputError when the claim's
  // smallest size leaves none below 2^max_bits.
  std::vector<Size> plan_sizes();

  const Claim& claim_;
  const CheckOptions& options_;
  ClaimResult& result_;
  ClaimEvaluation eval_;
};

}  // namespace thetagate::engine::checker_internal

#endif  // THETAGATE_VERIFIER_CHECKING_CLAIM_CHECK_H_
