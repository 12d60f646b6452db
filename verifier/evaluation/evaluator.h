// Exact evaluation of a recurrence: memoised over the distinct arguments
// reached, iterative (an explicit work stack, never native recursion that
// grows with n), under budgets.
//
// How T(n) is computed is chosen once, when the Evaluator is built, from the
// shape of the recurrence's calls (EvaluationStrategy below): bottom-up for
// T(n - c) and for sums over earlier values, top-down otherwise, on the
// integer kernel where the recurrence stays in the integers. Whatever the
// strategy, the same work is counted the same way (charge_step, "What a
// step is" in evaluator.cc), so budgets and reports do not depend on it.
#ifndef THETAGATE_VERIFIER_EVALUATION_EVALUATOR_H_
#define THETAGATE_VERIFIER_EVALUATION_EVALUATOR_H_

#include <chrono>
#include <cstdint>
#include <map>
#include <memory>
#include <optional>
#include <unordered_map>
#include <variant>
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

// How an Evaluator computes T(n); the first that fits the recurrence, in
// this order, fixed for the evaluator's life.
enum class EvaluationStrategy {
  // A line sums over earlier values (sum(k, 0, n - 1, T(k))): every size
  // from 0 up is evaluated once, in order, and kept; a sum whose body
  // depends only on its variable is kept as a running (prefix) sum, so each
  // size costs O(1) amortised steps.
  kFullHistory,
  // Every call is T(n - c) for whole constants 1 <= c <= 10^6: sizes from 0
  // up, keeping only the last max c values (a ring), so memory does not
  // grow with n.
  kSlidingWindow,
  // Top-down over the distinct sizes reached, on the integer kernel's GMP
  // registers and limb memo. A size it declines (an error to report) is
  // redone by kTopDown's walk, which names the problem.
  kIntegerKernel,
  // Top-down over the distinct sizes reached, with general values
  // (rationals, intervals, helper functions).
  kTopDown,
};

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
  EvaluationStrategy strategy() const { return strategy_; }
  // True when sizes are evaluated from 0 up (kFullHistory, kSlidingWindow).
  bool bottom_up() const {
    return strategy_ == EvaluationStrategy::kFullHistory ||
           strategy_ == EvaluationStrategy::kSlidingWindow;
  }
  bool full_history() const { return strategy_ == EvaluationStrategy::kFullHistory; }
  bool uses_integer_kernel() const { return strategy_ == EvaluationStrategy::kIntegerKernel; }

 private:
  class Resolver;
  class KernelLink;
  struct PrefixSums;
  // What a bottom-up sweep keeps for one size: its value, or the error its
  // line raised (raised again only if a later size needs the value).
  using SweptSize = std::variant<Value, Diagnostic>;
  // A call of a size's line that does not reach a smaller size >= 0.
  struct NonShrinkingCall {
    const Expr* call;
    BigInt argument;
  };

  EvalScope scope(const SourceText& source);
  // value_at() below the precision loop: the one dispatch on strategy_.
  Value value_by_strategy(const BigInt& n);
  // The value of one of the recurrence's calls inside an expression
  // (CallResolver::resolve), answered as strategy_ keeps values.
  Value lookup(const Expr& call, const Value& n, const EvalScope& scope);

  // The precision loop (precision.h) with the evaluator's memo: intervals
  // made at a lower precision are dropped on each raise. Throws
  // PrecisionExhausted when even max_precision_bits cannot decide.
  template <class F>
  auto with_precision(F&& f) -> decltype(f());
  // A top-level computation starts at start_precision_bits. Inside a
  // running ladder (value_at() reached from an expression that evaluate()
  // or compare_at() is evaluating) it keeps the precision reached: starting
  // low again would undo every raise, and the outer ladder would never
  // climb.
  void restart_precision() {
    if (precision_depth_ == 0) ctx_.precision_bits = budget_.start_precision_bits;
  }

  // The one place work is counted ("What a step is", evaluator.cc). One
  // step: a subproblem expanded, a size swept, a sum term added, or (with
  // `helper`) a helper value computed, kept apart in stats().helper_steps.
  // `pending_bytes` are held by the sizes waiting on a work stack, counted
  // with the memo against max_memo_bytes. Throws BudgetExceeded.
  void charge_step(uint64_t pending_bytes = 0, bool helper = false);
  // Counts one remembered value against the memo budget (every memo, both
  // paths, at the same nominal cost). Throws BudgetExceeded.
  void account_memo(uint64_t key_bits, uint64_t value_bits);
  size_t memo_size() const;
  void clear_memo();
  // Returns the remembered value (stable: memo_'s elements never move).
  const Value* remember(const Value& m, const Value& v);
  const Value* remembered(const Value& m) const;  // REQUIRES: m was remembered
  // A helper's value at an argument: remembered by exact argument, and each
  // one computed is a step (budgets, the clock, the per-size limit).
  Value helper_value(const Function& f, const Value& argument, const EvalScope& scope);

  // Top-down (kIntegerKernel, kTopDown).
  std::optional<Value> kernel_value(const BigInt& n);  // nullopt: the kernel declined
  Value top_down(const Value& n);

  // Bottom-up (kSlidingWindow, kFullHistory).
  // n as a machine integer; throws BudgetExceeded past 2^62 (`how` says
  // how the sweep would proceed).
  int64_t sweep_target(const BigInt& n, const std::string& how) const;
  // Throws BudgetExceeded, before any work, when `needed` more steps would
  // pass max_steps.
  void reserve_sweep_steps(const BigInt& n, uint64_t needed) const;
  // Evaluates the sizes next_..target in order, one step each; keep(m,
  // SweptSize) stores a size and returns the bits it holds for the memory
  // budget (nullopt: storage of fixed size).
  template <class FirstNonShrinking, class Keep>
  void sweep(int64_t target, FirstNonShrinking&& first_non_shrinking, Keep&& keep);
  template <class FirstNonShrinking>
  SweptSize sweep_size(int64_t m, FirstNonShrinking&& first_non_shrinking, const EvalScope& s);
  Value sweep_up(const BigInt& n);
  Value window_lookup(const Expr& call, const Value& n) const;
  Value sweep_history(const BigInt& n);
  Value history_lookup(const Expr& call, const Value& n, const EvalScope& scope);
  Value sum_value(const Expr& sum, const Value& n, const EvalScope& scope);
  Value prefix_at(PrefixSums& p, const Expr& sum, int64_t m, const Value& n,
                  const EvalScope& scope);

  // Errors: calls that do not shrink, gaps below the base cases.
  void probe_calls();
  Value default_base_value(const BigInt& n, const Expr& call, const BigInt& m);
  [[noreturn]] void not_shrinking(const BigInt& n, const Expr& call, const BigInt& m);
  // When a small size's call fails below written base cases: throws the
  // error naming the sizes that reach it and the base case that closes the
  // gap; returns when the failure is not of that kind.
  void small_size_gap(const BigInt& n, const Expr& call, const BigInt& m, const std::string& head);

  std::shared_ptr<const Recurrence> recurrence_;
  Budget budget_;
  EvaluationStrategy strategy_ = EvaluationStrategy::kTopDown;  // set once, by the constructor
  NumericContext ctx_;
  EvaluatorStats stats_;
  std::chrono::steady_clock::time_point deadline_;
  std::unique_ptr<Resolver> resolver_;

  // The memos. Invariants: a remembered value is T at its size, computed at
  // the precision in force then (exact values are the same at every
  // precision; intervals only get narrower); memo_has_intervals_ is set
  // when any memo holds an interval, so a precision raise clears them only
  // then. memo_bytes_ and memo_size() count every memo at nominal costs.
  //
  // Top-down: keys are canonical integers (canonical_integer), shared with
  // the frames that computed them: no limb copies on insert or lookup.
  MemoTable memo_;
  std::unique_ptr<IntegerKernel> kernel_;  // kIntegerKernel only; it keeps its own memo
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
  // Bottom-up: every size below next_ has been swept. kSlidingWindow keeps
  // the last window_ of them (window_ = the largest c in T(n - c)) in
  // ring_[m mod window_]; kFullHistory keeps history_[m] for every m < next_.
  int64_t window_ = 0;
  int64_t next_ = 0;
  std::vector<SweptSize> ring_;
  std::vector<SweptSize> history_;
  bool in_sweep_ = false;  // a swept size's line is being evaluated
  // Running sums, one per sum node whose body depends only on its variable.
  std::unordered_map<const Expr*, std::unique_ptr<PrefixSums>> prefix_;
  // While a top-down frame's body is evaluated: its calls and their values
  // (pointers into memo_, whose elements never move).
  const std::vector<const Expr*>* current_calls_ = nullptr;
  const Value* const* current_values_ = nullptr;
  int precision_depth_ = 0;  // with_precision() calls running
  bool probed_ = false;
  bool large_sizes_shrink_ = false;  // probe_calls() passed
  uint64_t call_start_steps_ = 0;
  uint64_t query_start_steps_ = 0;  // steps and helper steps before the last start_query()
};

// Evaluator::probe() for a recurrence not otherwise evaluated (derive).
void check_calls_shrink(const Recurrence& recurrence);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_EVALUATION_EVALUATOR_H_
