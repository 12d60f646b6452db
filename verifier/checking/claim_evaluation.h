// Exact evaluation for the check of one claim: T(n) and the bound's sides at
// a size, their certified comparison, and the work account that ends the
// search. Every stage of the check (claim_check.h) evaluates through one
// ClaimEvaluation, so each T(n) is computed once and all work is counted in
// one place. Internal to verifier/checking.
#ifndef THETAGATE_VERIFIER_CHECKING_CLAIM_EVALUATION_H_
#define THETAGATE_VERIFIER_CHECKING_CLAIM_EVALUATION_H_

#include <cstdint>
#include <optional>
#include <string>
#include <unordered_map>
#include <vector>

#include "verifier/checking/checker.h"
#include "verifier/checking/result.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine::checker_internal {

// How one reading of a claim spends its work budget (CheckOptions::
// work_budget times the effort), stage by stage. Each stage stops when the
// work used so far reaches its mark, so what a cheap stage leaves, the next
// one gets. Work is deterministic (subproblems weighted by their bits, see
// ClaimEvaluation::value_at), so a run replays exactly under any load.
//
//   stage (file)                             stops at            split
//   size families (witness_search.cc)        60% of the budget   -
//   local search (witness_search.cc)         85%                 equally per side
//   carried sizes (witness_search.cc)        100%                equally per side
//   induction (claim_proof.cc)               its own count:      per attempt
//                                            kInductionWork x effort
//
// The ladder, shrinking, the consistency check and the witnesses' exact
// values use sizes evaluated before, or a few more: they are not budgeted.
// The evaluator's own limits (reading_budget) bound every stage besides.
struct WorkShares {
  static constexpr double kSizeFamilies = 0.60;
  static constexpr uint64_t kLocalSearchPercent = 85;
  // Candidate steps of one induction attempt (verifier/derivation/induction.h).
  static constexpr uint64_t kInductionWork = 4000;
};

// n in decimal, or its first and last ten digits and its length when it has
// more than 24 digits.
std::string short_number(const BigInt& n);

// --effort times the claim's own effort, each at least 1.
uint64_t effort_of(const Claim& claim, const CheckOptions& options);

// The evaluator's budget for one reading of a claim at `effort` (--effort
// times the claim's own): the step limits times the effort; the clock as
// options.clock_limit gives it, else the default clock times the effort.
Budget reading_budget(const CheckOptions& options, uint64_t effort);

// REQUIRES: claim.recurrence is set; claim, options and the counters'
// result outlive the ClaimEvaluation.
class ClaimEvaluation {
 public:
  // Sizes evaluated with `count` are added to result.sizes_checked and
  // result.largest_bits: the only fields of the result it writes, kept there
  // as they grow so that a check a limit ends still reports how far it got.
  ClaimEvaluation(const Claim& claim, const CheckOptions& options, ClaimResult& counters);

  const Claim& claim() const { return claim_; }
  const CheckOptions& options() const { return options_; }
  uint64_t effort() const { return effort_; }
  // The expression T(n), for comparisons with a bound's side.
  const ExprPtr& t_of_n() const { return t_of_n_; }
  // The smallest size the claim is about ([claim.sizes] min_n, an explicit
  // bound's n0); set by the check once its sizes are planned.
  const BigInt& min_n() const { return min_n_; }
  void set_min_n(const BigInt& n) { min_n_ = n; }

  // The work spent, the whole budget, and the share of it used.
  uint64_t work() const { return work_; }
  uint64_t work_budget() const;
  double work_used() const;

  // T(n), or nullopt when an evaluator limit ran out (the search stops
  // there; the first such stop is noted). `count`: n counts toward the
  // sizes checked.
  std::optional<Value> value_at(const BigInt& n, bool count);
  // T(n) for a size evaluated before. Kept here because the evaluator's
  // memo may have been cleared since, and one large size alone can need
  // more subproblems than the per-size limit allows.
  Value known_value(const BigInt& n);
  // Any expression of n, exactly (the witnesses' bound values).
  Value evaluate(const Expr& e, const SourceText& source, const BigInt& n);
  // -1, 0, +1, or nullopt when even the highest precision cannot decide or
  // a limit stopped the comparison (both are counted for the notes).
  std::optional<int> compare_at(const Expr& a, const SourceText& sa, const Expr& b,
                                const SourceText& sb, const BigInt& n);
  // log2(t / reference(n)), t = T(n), or nullopt where either side is not
  // positive or the reference is undefined at a small n. InputErrors at
  // larger n propagate: the claim is malformed.
  std::optional<double> log2_ratio(const Value& t, const Expr& reference, const BigInt& n);
  // Does T(n) break the side `reference` of the bound, exactly? nullopt when
  // the comparison could not be decided.
  std::optional<bool> breaks(Side side, const Expr& reference, bool strict, const BigInt& n);
  // Whether a log2 ratio is too close to (or past) a side for the double to
  // decide: only then is the exact comparison run.
  static bool suspicious(Side side, std::optional<double> log2_ratio);
  // The sign of v, 0 where its precision cannot tell.
  static int sign_of(const Value& v);

  // Notes the first stop of the search (a limit, or a stage's share of the
  // work) unless one was noted before.
  void note_stop(const std::string& why);
  // For the reader: where the search stopped, and the comparisons that
  // stayed undecided or were skipped.
  std::vector<std::string> notes() const;

 private:
  // The work of `steps` subproblems of about `bits` bits (the size's or the
  // value's, whichever is larger: exponential recurrences have small n and
  // huge values). Calibrated on time (bench/check_bench.cc): a step costs
  // about the same up to a few thousand bits, memo traffic dominating the
  // arithmetic; on the general path (intervals, logarithms) a step costs
  // about 16 kernel steps.
  uint64_t work_of(uint64_t steps, uint64_t bits) const;

  const Claim& claim_;
  const CheckOptions& options_;
  ClaimResult& counters_;
  uint64_t effort_;
  Evaluator evaluator_;
  ExprPtr t_of_n_;
  BigInt min_n_ = 1;
  uint64_t work_ = 0;
  std::unordered_map<BigInt, Value, BigIntHash> values_;  // every T(n) value_at() gave
  std::string stopped_;
  uint64_t undecidable_ = 0;          // comparisons precision could not decide
  uint64_t skipped_comparisons_ = 0;  // comparisons another budget stopped
  std::string first_skip_reason_;
};

}  // namespace thetagate::engine::checker_internal

#endif  // THETAGATE_VERIFIER_CHECKING_CLAIM_EVALUATION_H_
