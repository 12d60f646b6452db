// The checking of one claim, shared by the files that carry it out:
// claim_check.cc evaluates T(n), compares it with the bound and keeps the
// work accounts; witness_search.cc samples the size families, pushes each
// scale's band edge outward by local search and turns breaks into
// witnesses; claim_verdict.cc reaches the verdict from the derivation, the
// band and the witness ladder. checker.cc builds a ClaimCheck per reading of
// a claim. Internal to the verifier: nothing outside these files includes it.
#ifndef THETAGATE_VERIFIER_CHECKING_CLAIM_CHECK_H_
#define THETAGATE_VERIFIER_CHECKING_CLAIM_CHECK_H_

#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <unordered_map>
#include <vector>

#include "generators/size_family.h"
#include "verifier/checking/checker.h"
#include "verifier/checking/result.h"
#include "verifier/derivation/derive.h"
#include "verifier/derivation/induction.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine::checker_internal {

// n in decimal, or its first and last ten digits and its length when it has
// more than 24 digits.
std::string short_number(const BigInt& n);

// Per-scale minimum and maximum of log2(T/g).
class BandBuilder {
 public:
  // Widens the row of n's scale (floor(lg n)) to take in log2_ratio.
  void add(const BigInt& n, double log2_ratio);
  // The rows in increasing scale, with low and high filled from their logs.
  std::vector<BandRow> rows() const;
  bool empty() const { return rows_.empty(); }

 private:
  std::map<uint64_t, BandRow> rows_;
};

struct Sample {
  BigInt n;
  std::string family;
  double log2_ratio = 0;
};

// One side of a bound being hunted: the reference function (g, or an
// explicit side) and what breaking it means.
struct Target {
  Target(Side s, const Expr* r, bool strict_side = false)
      : side(s), reference(r), strict(strict_side) {}
  Side side;
  const Expr* reference;
  bool strict = false;
  BandBuilder band;
  std::vector<Sample> samples;
  std::optional<Sample> violation;  // explicit bounds: the first certified break
};

// The evaluator's budget for one reading of a claim at `effort` (--effort
// times the claim's own): the step limits times the effort; the clock as
// options.clock_limit gives it, else the default clock times the effort.
Budget reading_budget(const CheckOptions& options, uint64_t effort);

// Checks one claim under one reading of its quotients and fills `result`.
// REQUIRES: claim.recurrence is set; claim, options and result outlive the
// ClaimCheck.
class ClaimCheck {
 public:
  ClaimCheck(const Claim& claim, const CheckOptions& options, ClaimResult& result);

  // Derives the class, evaluates the size families and sets the verdict,
  // message, band and witnesses. Throws InputError for a malformed claim and
  // BudgetExceeded when the evaluator's own limits end the run.
  void run();

 private:
  // claim_check.cc: the derivation, the sizes, the work accounts and exact
  // evaluation.
  void derive_bound();
  std::vector<Size> plan_sizes();

  // The work of `steps` subproblems of about `bits` bits (the size's or the
  // value's, whichever is larger: exponential recurrences have small n and
  // huge values). Calibrated on time (bench/check_bench.cc): a step costs
  // about the same up to a few thousand bits, memo traffic dominating the
  // arithmetic; on the general path (intervals, logarithms) a step costs
  // about 16 kernel steps.
  uint64_t work_of(uint64_t steps, uint64_t bits) const;
  // The default budget times --effort times the claim's own `effort`.
  uint64_t work_budget() const;
  // The share of the work budget used so far.
  double work_used() const;

  // T(n), or nullopt when the budget ran out (the search stops there).
  // `count`: the size counts toward sizes_checked and largest_bits.
  std::optional<Value> value_at(const BigInt& n, bool count);
  // T(n) for a size evaluated before. Kept here because the evaluator's
  // memo may have been cleared since, and one large size alone can need
  // more subproblems than the per-size limit allows.
  Value known_value(const BigInt& n);
  // -1, 0, +1, or nullopt when even the highest precision cannot decide.
  std::optional<int> compare_at(const Expr& a, const SourceText& sa, const Expr& b,
                                const SourceText& sb, const BigInt& n);
  // log2(T(n)/reference(n)), or nullopt where either side is not positive
  // or the reference is undefined at a small n. InputErrors at larger n
  // propagate: the claim is malformed.
  std::optional<double> log2_ratio(const Value& t, const Target& target, const BigInt& n);
  // The sign of v, 0 where its precision cannot tell.
  static int sign_of(const Value& v);
  // Explicit bounds: does T(n) break the target's side, exactly?
  std::optional<bool> breaks(const Target& target, const BigInt& n);
  // Whether a ratio is too close to (or past) the target's side for the
  // double to decide: only then is the exact comparison run.
  bool suspicious(const Target& target, std::optional<double> l) const;
  // The rows a trend may be read through: scales the size families
  // covered, with at least three samples. Where the families stopped, and
  // in the scales c·2^k spills into, a row holds one or two shapes (often
  // only even sizes), and its edges would bend the trend.
  std::vector<BandRow> complete_scales(const std::vector<BandRow>& rows) const;
  // complete_scales plus the scale where the search stopped, when it holds
  // at least 3 samples. Sound for reading an escape only: a partly sampled
  // scale's highest ratio can only be below the scale's true highest (and
  // its lowest above the true lowest), so an edge that escapes with it
  // escapes without the cut too; a steady reading would not be sound.
  std::vector<BandRow> scales_for_escape(const std::vector<BandRow>& rows) const;

  // witness_search.cc: the hunt for witnesses.

  // Samples every size; for explicit bounds, stops a side at its first
  // certified break.
  void sample_sizes(const std::vector<Size>& sizes, std::vector<Target>& targets, bool is_explicit);
  // Local search for every target, each with an equal share of the work
  // left below 85% of the budget, and of the whole budget for carrying.
  void search_targets(std::vector<Target>& targets, bool is_explicit);
  // Pushes each scale's band edge outward by local search from its extreme
  // sample, until the work reaches work_end. Each scale gets an equal share
  // of what is left when it starts, so cheap scales pass their work on.
  // Past work_end, each remaining scale still evaluates the size carried up
  // from the scale below, until carry_end.
  void search_locally(Target& target, bool is_explicit, uint64_t work_end, uint64_t carry_end);
  // Moves a certified violation toward the smallest size that still breaks
  // the bound: halve the distance to min_n while that keeps it broken, then
  // single steps (the shrinking RapidCheck does, on one integer).
  // REQUIRES: target.violation is set.
  void shrink(Target& target);
  // The witness for sample s of target; `factor` is the ladder rung's c
  // ("10", "100", ...), empty for an explicit side's break.
  // REQUIRES: T(s.n) was evaluated before (known_value).
  Witness witness_for(const Target& target, const Sample& s, const std::string& factor = "");

  // claim_verdict.cc: how the verdict is reached.

  // Explicit bounds: a certified break refutes; otherwise the derived class
  // must fit between the sides for the claim to hold.
  void check_explicit(const std::vector<Size>& sizes);
  // An explicit bound without a certified break: a proof by induction, the
  // exact checks of its ranges done here (docs/design.md, "Proofs").
  InductionOutcome try_induction(const Bound& bound);
  // Theta/O/Omega without a theorem: a direct bound c·g(n) (upper) and
  // g(n)/c (lower), c a power of two past the band, proved by induction from
  // n = 16. True (and the verdict set) when it is.
  bool try_direct_bound();
  // Theta/O/Omega: a derived class decides when the exact values agree with
  // it (and a drift between them is reported as an internal inconsistency);
  // without a derivation, or when g has no class, the numbers alone decide.
  void check_asymptotic(const std::vector<Size>& sizes);
  // Rungs of the witness ladder: for c = 10, 100, ..., the smallest sampled
  // n with T(n) > c·g(n) (upper) or T(n) < g(n)/c (lower), certified exactly.
  void climb_ladder(const Target& target);
  // The exact numbers must agree with the derivation: T(n)/derived(n) stays
  // in a band that does not move. Returns the edges that move (empty when
  // they agree).
  std::vector<EdgeDisagreement> consistency(const std::vector<Sample>& samples);
  // How far (log2) T(n)/g(n) may move under a correct Θ(g) with floors:
  // one recursion level's factor (see consistency).
  double oscillation_allowance_log2() const;
  // The verdict from the trend of the band and the ladder alone: refuted
  // when an edge escapes with certified rungs, otherwise undecided (numbers
  // are evidence, not a proof). `claim_unclassified`: g has no normal form.
  void decide_numerically(const std::vector<Target>& targets, bool claim_unclassified);

  const Claim& claim_;
  const CheckOptions& options_;
  ClaimResult& result_;
  Evaluator evaluator_;
  ExprPtr t_of_n_;
  uint64_t work_ = 0;
  uint64_t effort_ = 1;
  std::optional<uint64_t> partial_scale_;  // where the size families stopped, if they did
  std::unordered_map<BigInt, Value, BigIntHash> values_;  // every T(n) value_at() gave
  std::optional<Derivation> derivation_;
  BigInt min_n_ = 1;
  std::string stopped_;
  uint64_t undecidable_ = 0;          // comparisons precision could not decide
  uint64_t skipped_comparisons_ = 0;  // comparisons another budget stopped
  std::string first_skip_reason_;
};

}  // namespace thetagate::engine::checker_internal

#endif  // THETAGATE_VERIFIER_CHECKING_CLAIM_CHECK_H_
