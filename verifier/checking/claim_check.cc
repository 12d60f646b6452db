#include "verifier/checking/claim_check.h"

#include <fmt/format.h>

#include <string>
#include <utility>

#include "verifier/checking/claim_proof.h"
#include "verifier/checking/verdict.h"
#include "verifier/checking/witness_search.h"
#include "verifier/derivation/derive.h"

namespace thetagate::engine::checker_internal {

ClaimCheck::ClaimCheck(const Claim& claim, const CheckOptions& options, ClaimResult& result)
    : claim_(claim), options_(options), result_(result), eval_(claim, options, result) {}

void ClaimCheck::run() {
  // 1. The derivation. derive() throws nothing for a valid model: what
  //    escapes is a bug, and check_entry reports it on this claim. Its facts
  //    go into the result now, so a check that a limit ends still shows them.
  Derivation derivation = derive(*claim_.recurrence, options_.clock_limit);
  result_.derived = derivation.bound_text();
  result_.method = derivation.method;
  result_.function = claim_.recurrence->main.name;
  result_.steps = derivation.steps;
  result_.failed_hypotheses = derivation.failed_hypotheses;

  // 2. The sizes; 3. the search over them; 4. the proof attempt.
  SearchOutcome search = search_witnesses(eval_, plan_sizes());
  result_.band = search.band;
  ProofAttempt proof = attempt_proof(eval_, derivation, search);

  // 5. The verdict, from those values alone.
  VerdictDecision decision = decide_verdict(claim_.bound, derivation, search, proof);
  result_.verdict = decision.verdict;
  result_.basis = std::move(decision.basis);
  if (!decision.method.empty()) result_.method = decision.method;
  result_.tight = decision.tight;
  result_.numeric_only = decision.numeric_only;
  result_.witnesses = std::move(decision.witnesses);
  result_.internal_error = decision.internal_error;
  for (std::string& note : search.notes) result_.notes.push_back(std::move(note));
  for (std::string& note : eval_.notes()) result_.notes.push_back(std::move(note));
}

std::vector<Size> ClaimCheck::plan_sizes() {
  SizePlan plan =
      claim_size_plan(claim_, options_.max_bits.value_or(claim_.sizes.max_bits.value_or(4096)),
                      options_.exhaustive_limit, options_.seed);
  eval_.set_min_n(plan.min_n);
  if (plan.min_n >= (BigInt(1) << plan.max_bits)) {
    // Sizes are below 2^max_bits: nothing would be checked. An error at the
    // smallest size, not a verdict on no evidence.
    std::string what = fmt::format(
        "the smallest size, {} bits long, is not below 2^{}: sizes checked have at most {} bits "
        "(max_bits), so no size is left to check",
        bit_length(plan.min_n), plan.max_bits, plan.max_bits);
    std::string hint = fmt::format(
        "lower it, or raise max_bits ([claim.sizes] or --max-bits, at "
        "most 65536)");
    if (claim_.sizes.min_n && *claim_.sizes.min_n == plan.min_n) {
      Diagnostic d = claim_.sizes.min_n_where;
      d.message = "'min_n': " + what;
      d.hint = hint;
      throw InputError(d);
    }
    // Else the bound's own "for n >= N0" asked for it.
    size_t at = claim_.bound.source.text.rfind(">=");
    fail_at(claim_.bound.source, at == std::string::npos ? 0 : at, "'for n >= ...': " + what, hint);
  }
  return generate_sizes(plan);
}

}  // namespace thetagate::engine::checker_internal
