// Guarding code with its claim: the recurrence of a claim as a cost model
// that counted costs from real runs are compared with, exactly.
//
// Two links are checked: model -> bound (the recurrence meets its claimed
// bound, as `thetagate check` decides) and code -> model (the code's counted
// cost at runnable sizes keeps to T(n) under the claim's relation). This
// header holds the model side, with standard types only; the runner side is
// thetagate/testing/rapidcheck.h, and the one-include GoogleTest assertion is
// thetagate/testing/gtest.h (docs/guard.md). Those two need RapidCheck and
// GoogleTest, which the consumer links; this header and cost.h need neither.
//
// Sizes and costs are uint64_t: runnable sizes are far below 2^64, and a cost
// counter throws before it wraps (thetagate/cost.h). Exact values of T(n)
// are decimal strings, so no arbitrary-precision type leaks into this header.
#ifndef THETAGATE_GUARD_H_
#define THETAGATE_GUARD_H_

#include <cstdint>
#include <memory>
#include <optional>
#include <ostream>
#include <stdexcept>
#include <string>
#include <vector>

#include "thetagate/check.h"
#include "thetagate/errors.h"
#include "thetagate/export.h"

namespace thetagate::guard {

// How the recurrence relates to the code: every counted cost is at most T(n)
// (a worst-case model), exactly T(n), or at least T(n).
enum class Relation { kUpperBound, kExact, kLowerBound };
THETAGATE_API const char* relation_name(Relation r);  // "upper bound", "exact", "lower bound"

// One size to run, and the size family that produced it.
struct SizeSample {
  uint64_t n = 0;
  std::string family;
};

// T(n) at one size: exact text, and the integer when T(n) is a whole number
// that fits in 64 bits (the fast path of a comparison).
struct ModelValue {
  std::string text;
  std::optional<uint64_t> integer;
  bool exact_integer = false;  // T(n) is a whole number (perhaps beyond 64 bits)
  // Upper-bound and exact models: a count every larger count breaks the
  // relation beyond doubt (floor T(n), or at most the floor of the upper end
  // of an irrational value's enclosure; 0 for a negative T(n)), when it fits
  // in 64 bits. The guard stops a run whose count passes it. Lower-bound
  // models allow any larger count: nullopt.
  std::optional<uint64_t> allowed_max;
  double approx = 0;  // T(n) as a double, for tightness ratios only
};

// The verdict of model -> bound, as `thetagate check` gives it.
struct BoundOutcome {
  std::optional<Verdict> verdict;  // nullopt: not checked
  std::string report;              // the claim's text report (witnesses, derivation)
  bool failed() const {
    return verdict && (*verdict == Verdict::kRefuted || *verdict == Verdict::kError);
  }
};

// One counted cost held against T(n): what a property prints when it fails.
// Inside a RapidCheck property, `RC_ASSERT(model.check_cost(n, cost.count()))`
// fails with this text ("n = 3: counted cost 4 > T(n) = 3 (model: upper
// bound, broken)") instead of "false".
struct CostCheck {
  uint64_t n = 0;
  uint64_t cost = 0;
  std::string model;  // T(n), exact
  Relation relation = Relation::kUpperBound;
  int sign = 0;      // sign of cost − T(n)
  bool kept = true;  // the relation holds
  explicit operator bool() const { return kept; }
};
THETAGATE_API std::string to_string(const CostCheck& check);
inline std::ostream& operator<<(std::ostream& out, const CostCheck& check) {
  return out << to_string(check);
}

// A claim's recurrence as a cost model. Not thread-safe (T(n) is memoised
// across sizes); use one Model per thread.
class THETAGATE_API Model {
 public:
  // Loads the claim named `claim_name` from a TOML claim file. Throws
  // InputError (thetagate/errors.h) for an unreadable file, a claim with an
  // error, or no claim of that name (the hint names the closest one).
  static Model from_file(const std::string& path, const std::string& claim_name);
  // Builds a claim in code, as a claim file would ("T(n) = 2T(n/2) + n;
  // T(1) = 0", "Theta(n lg n)"). Throws InputError, located in <recurrence>
  // or <bound>, or at <claim> for a blank name or one with a line break or
  // another control character (a tab is fine).
  static Model from_text(const std::string& name, const std::string& recurrence,
                         const std::string& bound, Relation relation = Relation::kUpperBound,
                         uint64_t max_n = 65536);

  Model(Model&&) noexcept;
  Model& operator=(Model&&) noexcept;
  ~Model();

  const std::string& name() const;
  // Where the claim is, "file:line" ("" for a claim built in code).
  std::string where() const;
  // From the claim's [claim.code] table: `model` (default upper bound) and
  // `max_n` (default 65536).
  Relation relation() const;
  uint64_t max_n() const;

  // The claim's size families (its `sizes` table: families, min_n) with
  // 1 <= n <= max_n, ascending, each with its family. "small" covers every n
  // up to `small_limit`. Deterministic in `seed`. REQUIRES: max_n >= 1.
  std::vector<SizeSample> sizes(uint64_t max_n, uint64_t seed, uint64_t small_limit = 32) const;

  // T(n), exactly. Throws InputError where the recurrence has no value (lg 0,
  // no case line), LimitReached when evaluating it exceeds the limits. The
  // evaluation limits (steps, time) apply to each call of value_at() and
  // compare() on its own, however long the Model lives.
  ModelValue value_at(uint64_t n);
  // Sign of cost − T(n), exactly. Throws as value_at.
  int compare(uint64_t n, uint64_t cost);
  // Whether sign(cost − T(n)) breaks the relation.
  bool violates(int sign) const;
  // `cost` at size n held against T(n) under the relation. Throws as
  // value_at.
  CostCheck check_cost(uint64_t n, uint64_t cost);

  // model -> bound: checks the claim as `thetagate check --seed seed` would.
  BoundOutcome check_bound(uint64_t seed) const;

 private:
  struct Impl;
  explicit Model(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

// code -> model, per size: the counted cost furthest toward breaking the
// model (largest for an upper bound, smallest for a lower bound).
struct CostRow {
  uint64_t n = 0;
  uint64_t cost = 0;
  std::string model;  // T(n), exact
  int sign = 0;       // sign of cost − T(n)
  uint64_t runs = 0;
  std::string family;
  double ratio = 0;  // cost / T(n), approximately (0 where T(n) <= 0)
};

// A counted cost on the wrong side of T(n), with the input that caused it.
struct Violation {
  uint64_t n = 0;
  uint64_t cost = 0;
  std::string model;
  std::string input;     // shrunk, as text
  uint64_t shrinks = 0;  // shrinking steps taken
  std::string replay;    // the command that replays it
  // The run was stopped as soon as its count passed T(n) (ModelValue::
  // allowed_max): `cost` is the count then, and the full cost is at least that.
  bool stopped = false;
};

// The outcome of guarding one claim with one runner.
struct THETAGATE_API GuardResult {
  std::string claim;
  std::string runner;
  Relation relation = Relation::kUpperBound;
  uint64_t seed = 0;
  BoundOutcome bound;         // model -> bound (no verdict: not checked)
  std::vector<CostRow> rows;  // code -> model, ascending n
  uint64_t runs = 0;
  std::optional<Violation> violation;  // the first (smallest n) found
  // Why the check could not finish, naming the size (and the input, where
  // there is one): the runner threw or ran past its time limit, a cost
  // overflowed, the runner's inputs/mutate/shrink/show threw, the runner is
  // not deterministic (a witness re-run no longer breaks the model), or a
  // replay setting (THETAGATE_GUARD_N, THETAGATE_GUARD_SEED, GuardOptions) is
  // refused. The check stops there.
  std::optional<std::string> error;
  uint64_t effort = 1;  // GuardOptions::effort as used
  // The first size reached after the time budget ran out (GuardOptions::
  // time_budget): it and the sizes above ran no random inputs and no search.
  std::optional<uint64_t> budget_reached_at;
  double seconds = 0;  // wall time of the check

  bool passed() const { return !bound.failed() && !violation && !error; }
  // Both links in words: the failure (witness, input, replay) first, then
  // the per-size tightness table. Ends with a newline.
  std::string report() const;
  // What a check covered, for a passing guard too: sizes, runs and time,
  // then per scale (2^k <= n < 2^(k+1)) the sizes and runs and the tightest
  // cost/T(n) (largest; smallest for a lower bound) with its n. Ends with a
  // newline.
  std::string coverage() const;
};

}  // namespace thetagate::guard

#endif  // THETAGATE_GUARD_H_
