// Checks claims: evaluates the recurrence exactly over the size families,
// tests explicit bounds at every size, builds the ratio band and witness
// ladder for asymptotic bounds, and decides the verdict.
#ifndef THETAGATE_VERIFIER_CHECKING_CHECKER_H_
#define THETAGATE_VERIFIER_CHECKING_CHECKER_H_

#include <cstdint>
#include <optional>
#include <vector>

#include "generators/size_family.h"
#include "verifier/checking/result.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/claim.h"

namespace thetagate::engine {

struct CheckOptions {
  uint64_t seed = 1;
  std::optional<uint64_t> max_bits;  // overrides every claim's sizes.max_bits
  BigInt exhaustive_limit = 10000;   // every n up to this is checked
  std::optional<Rounding> rounding;  // overrides every claim's `rounding`
  Budget budget = default_check_budget();
  // Work per claim, in subproblems weighted by their bits and by the
  // evaluation path (claim_evaluation.cc, work_of). Deterministic, unlike
  // time: its split between the stages is WorkShares there, so a run replays
  // exactly under any load. The default is about 200 ms on one core of the
  // reference machine (DEVELOPERS.md); --effort multiplies it.
  uint64_t work_budget = kDefaultWorkBudget;
  static constexpr uint64_t kDefaultWorkBudget = 400'000;
  // Multiplies work_budget (--effort): nightly runs search deeper.
  uint64_t effort = 1;
  // The folder costs files may lie in, besides each claim file's own
  // folder tree (empty: only that tree). See confined_costs_path.
  std::string costs_root;
  // The wall-clock guard per claim in seconds, as given (--clock-limit): all
  // readings of the claim share it, and the effort does not scale it; 0: no
  // clock. Unset: budget.max_seconds times the effort, per reading.
  std::optional<double> clock_limit;

  static Budget default_check_budget();
};

// Checks one claim. Never throws for bad input: an input error gives
// verdict `error` with its Diagnostic; a budget that runs out gives
// `undecided` (or stops the search early) with the reason.
ClaimResult check_claim(const Claim& claim, const CheckOptions& options);

// Checks one entry: an entry that failed to load gets verdict `error` with
// its diagnostic. Never throws: an exception that escapes the check is a
// bug (or memory ran out) and stays on this claim: verdict `error` with
// `internal_error` set (for std::bad_alloc: `undecided`, out of memory).
ClaimResult check_entry(const ClaimEntry& entry, const CheckOptions& options);

// Checks every entry in order, with check_entry.
RunResult check_entries(const std::vector<ClaimEntry>& entries, const CheckOptions& options);

// The divisors b of the recurrence's T(n/b)-style calls and its mod
// conditions: the bases the size families build on. Always contains 2.
std::vector<BigInt> recurrence_divisors(const Recurrence& r);

// The size plan of `claim`, as the check and `thetagate sizes` both build
// it: the recurrence's divisors, the claim's families, and its smallest size
// (its [claim.sizes] min_n, raised to an explicit bound's n0).
SizePlan claim_size_plan(const Claim& claim, uint64_t max_bits, const BigInt& exhaustive_limit,
                         uint64_t seed);

// The sizes a harness should measure the code behind `claim` at, for costs
// files written by code in any language (`thetagate sizes`): every n from the
// claim's min_n to `small`, then every size family of the claim (its
// [claim.sizes] families, else all) at every scale up to max_n, the way the
// check chooses them. Ascending, each with its family. Throws InputError
// when max_n is below the claim's smallest size.
std::vector<Size> harness_sizes(const Claim& claim, const BigInt& max_n, const BigInt& small,
                                uint64_t seed);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_CHECKER_H_
