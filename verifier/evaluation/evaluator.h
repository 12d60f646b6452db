// Exact evaluation of a recurrence: memoised over the distinct arguments
// reached, iterative (an explicit work stack, never native recursion that
// grows with n), with budgets. Recurrences whose calls are all T(n - c) are
// evaluated bottom-up with a sliding window, so memory does not grow with n.
#ifndef THETAGATE_VERIFIER_EVALUATION_EVALUATOR_H_
#define THETAGATE_VERIFIER_EVALUATION_EVALUATOR_H_

#include <chrono>
#include <cstdint>
#include <map>
#include <memory>
#include <optional>
#include <unordered_map>
#include <vector>

#include "verifier/evaluation/expression_eval.h"
#include "verifier/evaluation/integer_kernel.h"
#include "verifier/evaluation/memo_table.h"
#include "verifier/model/recurrence.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine {

// Per-claim limits. Running out throws BudgetExceeded with the reason.
struct Budget {
  uint64_t max_memo_entries = 2'000'000;
  uint64_t max_memo_bytes = 512ull << 20;
  uint64_t max_value_bits = 1u << 20;
  // max_steps and max_seconds count from the evaluator's creation, or from
  // its last start_query().
  uint64_t max_steps = 30'000'000;  // case lines and helper values evaluated, in total
  uint64_t max_steps_per_size = 0;  // for one value_at(); 0: no separate limit
  double max_seconds = 20.0;        // wall time; 0 (or NaN): no clock
  // max_memo_bytes also bounds the sizes waiting on the work stack.
  long start_precision_bits = 128;  // intervals; doubled on a shortfall
  long max_precision_bits = 1 << 16;
};

struct EvaluatorStats {
  uint64_t steps = 0;         // subproblems: what the checker's work units count
  uint64_t helper_steps = 0;  // helper values computed; with steps, under max_steps
  uint64_t memo_entries = 0;
  uint64_t memo_clears = 0;
  uint64_t precision_retries = 0;
  long precision_bits = 0;
};

// kAuto uses the integer kernel (verifier/evaluation/integer_kernel.h) wherever the
// recurrence compiles to it; kGeneral never does (tests compare the two).
enum class EvaluationPath { kAuto, kGeneral };

class Evaluator {
 public:
  explicit Evaluator(std::shared_ptr<const Recurrence> recurrence, Budget budget = {},
                     EvaluationPath path = EvaluationPath::kAuto);
  ~Evaluator();
  Evaluator(const Evaluator&) = delete;
  Evaluator& operator=(const Evaluator&) = delete;

  // Renews the step and time budgets: max_steps and max_seconds count from
  // here. For evaluators that answer independent queries over a long life
  // (the public Evaluator, the guard's model); a check's search does not
  // call it, so its budgets cover the whole claim.
  void start_query();

  // T(n). REQUIRES: n >= 0. Throws InputError (a call that does not shrink,
  // a domain error such as lg 0, no case line for n), BudgetExceeded.
  Value value_at(const BigInt& n);

  // An expression in n (a bound side, a growth function); T(...) calls in it
  // are evaluated with this recurrence. `source` locates errors.
  Value evaluate(const Expr& e, const SourceText& source, const BigInt& n);

  // Compares a(n) with b(n) exactly, raising precision until decided.
  // Returns -1, 0, +1. Throws BudgetExceeded if even the maximum precision
  // cannot decide.
  int compare_at(const Expr& a, const SourceText& sa, const Expr& b, const SourceText& sb,
                 const BigInt& n);

  // The check every command runs before evaluating or deriving: each call
  // of the recurrence reaches a smaller size at large n. Throws InputError
  // at the call (T(n) = T(n) + 1, T(n + 1)). value_at() runs it once.
  void probe();

  const EvaluatorStats& stats() const { return stats_; }
  const Recurrence& recurrence() const { return *recurrence_; }
  // True when every recursive call is T(n - c), or a line sums over earlier
  // values: evaluated bottom-up.
  bool bottom_up() const { return window_ > 0 || history_; }
  // True when a line sums over earlier values: every size from 0 up is
  // evaluated once and kept, and sums whose body depends only on their
  // variable are kept as running (prefix) sums: O(1) amortised per size.
  bool full_history() const { return history_; }
  // True when top-down sizes go through the integer kernel.
  bool uses_integer_kernel() const { return kernel_ != nullptr; }

 private:
  class Resolver;
  class KernelLink;
  EvalScope scope(const SourceText& source);
  Value top_down(const Value& n);
  std::optional<Value> kernel_value(const BigInt& n);
  Value sweep_up(const BigInt& n);
  Value sweep_history(const BigInt& n);
  Value history_lookup(const Expr& call, const Value& n, const EvalScope& scope);
  struct PrefixSums;
  Value sum_value(const Expr& sum, const Value& n, const EvalScope& scope);
  Value prefix_at(PrefixSums& p, const Expr& sum, int64_t m, const Value& n,
                  const EvalScope& scope);
  Value lookup(const Expr& call, const Value& n, const EvalScope& scope);
  // A helper's value at an argument: remembered by exact argument, and each
  // one computed is a step (budgets, the clock, the per-size limit).
  Value helper_value(const Function& f, const Value& argument, const EvalScope& scope);
  void probe_calls();
  Value default_base_value(const BigInt& n, const Expr& call, const BigInt& m);
  [[noreturn]] void not_shrinking(const BigInt& n, const Expr& call, const BigInt& m);
  // When a small size's call fails below written base cases: throws the
  // error naming the sizes that reach it and the base case that closes the
  // gap; returns when the failure is not of that kind.
  void small_size_gap(const BigInt& n, const Expr& call, const BigInt& m, const std::string& head);
  // One subproblem expanded; `pending_bytes` are held by the sizes waiting
  // on a work stack, counted with the memo against max_memo_bytes.
  // A helper's value (`helper`) counts toward the same limits, kept apart
  // in stats().helper_steps.
  void charge_step(uint64_t pending_bytes = 0, bool helper = false);
  // Returns the remembered value (stable: memo_'s elements never move).
  const Value* remember(const Value& m, const Value& v);
  const Value* remembered(const Value& m) const;  // REQUIRES: m was remembered
  // Counts one remembered value against the memo budget (both memos).
  void account_memo(uint64_t key_bits, uint64_t value_bits);
  size_t memo_size() const;
  void clear_memo();
  template <class F>
  auto with_precision(F&& f) -> decltype(f());

  std::shared_ptr<const Recurrence> recurrence_;
  Budget budget_;
  NumericContext ctx_;
  EvaluatorStats stats_;
  std::chrono::steady_clock::time_point deadline_;
  std::unique_ptr<Resolver> resolver_;
  // Keys are canonical integers (canonical_integer), shared with the frames
  // that computed them: no limb copies on insert or lookup.
  MemoTable memo_;
  std::unique_ptr<IntegerKernel> kernel_;  // null: the general path only
  std::unique_ptr<KernelLink> kernel_link_;
  // Helper values by argument: whole numbers in a MemoTable, other exact
  // arguments (f(n/2) at odd n) in a map; interval arguments are not kept.
  struct HelperMemo {
    MemoTable integers;
    std::map<Rational, Value> fractions;
  };
  std::unordered_map<const Function*, HelperMemo> helper_memo_;
  size_t helper_entries_ = 0;
  uint64_t memo_bytes_ = 0;
  bool memo_has_intervals_ = false;
  // Bottom-up state: window_ = largest c in T(n - c); the ring holds the
  // values (or the errors) of the window_ sizes just below next_.
  int64_t window_ = 0;
  int64_t next_ = 0;
  std::vector<std::optional<Value>> ring_;
  std::vector<std::optional<Diagnostic>> ring_errors_;
  bool in_sweep_ = false;
  // Full-history state: history_values_[m] is T(m) (or its error) for m < next_.
  bool history_ = false;
  std::vector<std::optional<Value>> history_values_;
  std::vector<std::optional<Diagnostic>> history_errors_;
  // Running sums, one per sum node whose body depends only on its variable.
  std::unordered_map<const Expr*, std::unique_ptr<PrefixSums>> prefix_;
  // While a top-down frame's body is evaluated: its calls and their values
  // (pointers into memo_, whose elements never move).
  const std::vector<const Expr*>* current_calls_ = nullptr;
  const Value* const* current_values_ = nullptr;
  bool probed_ = false;
  bool large_sizes_shrink_ = false;  // probe_calls() passed
  uint64_t call_start_steps_ = 0;
  uint64_t query_start_steps_ = 0;  // steps and helper steps before the last start_query()
};

// Evaluator::probe() for a recurrence not otherwise evaluated (derive).
void check_calls_shrink(const Recurrence& recurrence);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_EVALUATION_EVALUATOR_H_
