// The Evaluator, top to bottom:
//   1. choosing the strategy (once, in the constructor);
//   2. the entry points: value_at(), evaluate(), compare_at(), probe();
//   3. precision (the retry loop itself is precision.h) and the budgets:
//      charge_step(), the one place work is counted, and the memo's bytes;
//   4. calls inside expressions (lookup) and helper values;
//   5. top-down: the integer kernel, then the general walk;
//   6. bottom-up: the sweep both strategies share, the window, the full
//      history and its running sums;
//   7. the errors for calls that do not shrink.
//
// What a step is. Budgets (Budget::max_steps, max_steps_per_size), the
// checker's work units and the golden reports all count steps, so a step
// must mean the same on every path. One step is charged, always before the
// work it pays for (a budget stops the work, never reports it afterwards):
//   - top-down, per subproblem expanded: a size missing from the memo whose
//     case line is selected and whose calls' arguments are computed. A memo
//     hit is free. The integer kernel walks exactly the sizes the general
//     walk would, in the same order, and charges through KernelLink into
//     the same charge_step(), so both count the same (a test pins it);
//   - bottom-up, per size swept (sweep());
//   - per term added to a sum: a running sum's new term (prefix_at) or a
//     term of a sum evaluated directly (sum_value);
//   - per helper value computed (a memo hit is free), counted apart in
//     stats().helper_steps: the checker's work units are calibrated on
//     subproblems, but helpers fall under the same limits and clock.
// Where the counts can differ: the general path redoes a size whose
// intervals could not decide (a floor of lg n that straddles an integer) at
// twice the precision, charging its steps again; the kernel is exact and
// never retries.
#include "verifier/evaluation/evaluator.h"

#include <fmt/format.h>

#include <algorithm>
#include <stdexcept>
#include <type_traits>

#include "verifier/evaluation/expression_eval.h"
#include "verifier/evaluation/precision.h"
#include "verifier/numbers/allocation.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {

namespace {

// c when the argument is exactly n - c with a whole c >= 1.
std::optional<int64_t> subtractive_step(const Expr& argument) {
  if (argument.kind != ExprKind::kSub) return std::nullopt;
  const Expr& left = *argument.args[0];
  const Expr& right = *argument.args[1];
  if (left.kind != ExprKind::kVariable || right.kind != ExprKind::kNumber || !right.has_small) {
    return std::nullopt;
  }
  if (right.small < 1 || right.small > 1'000'000) return std::nullopt;
  return right.small;
}

// The largest c when every call of every line is T(n - c); nullopt when
// some call is not, or there are no calls (T(n) = n^2 needs no sweep).
std::optional<int64_t> sliding_window(const Recurrence& r) {
  int64_t window = 0;
  for (const CaseLine* line : r.main.lines_in_order()) {
    for (const Expr* call : line->calls) {
      std::optional<int64_t> step = subtractive_step(*call->args[0]);
      if (!step) return std::nullopt;
      window = std::max(window, *step);
    }
  }
  if (window == 0) return std::nullopt;
  return window;
}

// Beyond this size, a call that does not shrink is an error even when the
// default base case applies: T(n + 1) is a mistake, not a base case.
const BigInt kDefaultBaseLimit = BigInt(1) << 16;

// Assigns `on_exit` to `slot` when the scope ends, also when an exception
// (a budget, a precision retry, an input error) leaves it: the evaluator's
// "inside a line" state must not outlive the line.
template <typename T>
class ResetOnExit {
 public:
  ResetOnExit(T& slot, std::type_identity_t<T> on_exit) : slot_(slot), on_exit_(on_exit) {}
  ~ResetOnExit() { slot_ = on_exit_; }
  ResetOnExit(const ResetOnExit&) = delete;
  ResetOnExit& operator=(const ResetOnExit&) = delete;

 private:
  T& slot_;
  T on_exit_;
};

}  // namespace

// Routes the recurrence's calls, sums and helpers met inside an expression
// back to the evaluator, which answers them from its memos.
class Evaluator::Resolver : public CallResolver {
 public:
  explicit Resolver(Evaluator& owner) : owner_(owner) {}
  Value resolve(const Expr& call, const Value& n, const EvalScope& scope) override {
    return owner_.lookup(call, n, scope);
  }
  Value sum(const Expr& sum, const Value& n, const EvalScope& scope) override {
    return owner_.sum_value(sum, n, scope);
  }
  Value helper(const Function& f, const Value& argument, const EvalScope& scope) override {
    return owner_.helper_value(f, argument, scope);
  }

 private:
  Evaluator& owner_;
};

// The kernel's budget callbacks land in the evaluator's own accounting, so
// a step or a remembered value costs the same on both top-down paths.
class Evaluator::KernelLink : public KernelHooks {
 public:
  explicit KernelLink(Evaluator& owner) : owner_(owner) {}
  void charge_step(uint64_t pending_bytes) override { owner_.charge_step(pending_bytes); }
  void remembered(uint64_t key_bits, uint64_t value_bits, size_t) override {
    owner_.account_memo(key_bits, value_bits);
  }

 private:
  Evaluator& owner_;
};

// ---------------------------------------------------------------------------
// 1. The strategy, chosen once.

Evaluator::Evaluator(std::shared_ptr<const Recurrence> recurrence, Budget budget,
                     EvaluationPath path)
    : recurrence_(std::move(recurrence)), budget_(budget) {
  install_gmp_memory_functions();  // big numbers that cannot grow throw bad_alloc
  ctx_.precision_bits = budget_.start_precision_bits;
  ctx_.max_value_bits = budget_.max_value_bits;
  start_query();
  resolver_ = std::make_unique<Resolver>(*this);
  // The first strategy that fits, in EvaluationStrategy's order. A sum over
  // earlier values needs them all, whatever the calls look like; T(n - c)
  // alone needs only the last c; everything else goes top-down, where only
  // the sizes actually reached are evaluated (lg n of them for T(n/2)).
  if (recurrence_->full_history) {
    strategy_ = EvaluationStrategy::kFullHistory;
  } else if (std::optional<int64_t> window = sliding_window(*recurrence_)) {
    strategy_ = EvaluationStrategy::kSlidingWindow;
    window_ = *window;
  } else if (path == EvaluationPath::kAuto &&
             (kernel_ = IntegerKernel::compile(*recurrence_, ctx_)) != nullptr) {
    strategy_ = EvaluationStrategy::kIntegerKernel;
    kernel_link_ = std::make_unique<KernelLink>(*this);
  } else {
    strategy_ = EvaluationStrategy::kTopDown;
  }
}

Evaluator::~Evaluator() = default;

void Evaluator::start_query() {
  query_start_steps_ = stats_.steps + stats_.helper_steps;
  // !(x > 0) also catches NaN: no clock, as for 0.
  double seconds = budget_.max_seconds > 0 ? std::min(budget_.max_seconds, 1e9) : 0.0;
  deadline_ = std::chrono::steady_clock::now() +
              std::chrono::microseconds(static_cast<int64_t>(seconds * 1e6));
}

EvalScope Evaluator::scope(const SourceText& source) {
  EvalScope s;
  s.source = &source;
  s.ctx = &ctx_;
  s.recurrence = recurrence_.get();
  s.resolver = resolver_.get();
  return s;
}

// ---------------------------------------------------------------------------
// 2. The entry points. Each starts at the lowest precision and lets
// with_precision() raise it: most values are exact and never need more.

Value Evaluator::value_at(const BigInt& n) {
  if (n < 0) throw std::invalid_argument("sizes are non-negative");
  probe();
  call_start_steps_ = stats_.steps + stats_.helper_steps;
  // Between top-level sizes, a memo past 3/4 of its budget is dropped: the
  // next size rebuilds what it needs rather than failing on what earlier
  // sizes left. A full history cannot be dropped and rebuilt larger (every
  // size needs every earlier one): its budget ends it.
  if (strategy_ != EvaluationStrategy::kFullHistory &&
      (memo_bytes_ > budget_.max_memo_bytes / 4 * 3 ||
       memo_size() > budget_.max_memo_entries / 4 * 3)) {
    clear_memo();
  }
  restart_precision();
  Value v = with_precision([&] { return value_by_strategy(n); });
  stats_.precision_bits = std::max(stats_.precision_bits, ctx_.precision_bits);
  return v;
}

Value Evaluator::value_by_strategy(const BigInt& n) {
  switch (strategy_) {
    case EvaluationStrategy::kFullHistory:
      return sweep_history(n);
    case EvaluationStrategy::kSlidingWindow:
      return sweep_up(n);
    case EvaluationStrategy::kIntegerKernel:
      if (std::optional<Value> fast = kernel_value(n)) return std::move(*fast);
      // Declined: the general walk redoes this size and names the problem.
      return top_down(canonical_integer(Value(n)));
    case EvaluationStrategy::kTopDown:
      return top_down(canonical_integer(Value(n)));
  }
  throw InternalError("", "an evaluation strategy without a dispatch");
}

Value Evaluator::evaluate(const Expr& e, const SourceText& source, const BigInt& n) {
  restart_precision();
  return with_precision([&] { return evaluate_expr(e, Value(n), scope(source)); });
}

int Evaluator::compare_at(const Expr& a, const SourceText& sa, const Expr& b, const SourceText& sb,
                          const BigInt& n) {
  restart_precision();
  // Both sides in one attempt: a raise recomputes both at the new precision.
  return with_precision([&] {
    Value va = evaluate_expr(a, Value(n), scope(sa));
    Value vb = evaluate_expr(b, Value(n), scope(sb));
    return compare(va, vb, ctx_);
  });
}

void Evaluator::probe() {
  if (probed_) return;
  with_precision([&] {
    probe_calls();
    return 0;
  });
}

void check_calls_shrink(const Recurrence& recurrence) {
  // A non-owning handle: the evaluator lives only inside this call.
  std::shared_ptr<const Recurrence> handle(&recurrence, [](const Recurrence*) {});
  Evaluator evaluator(handle, Budget{}, EvaluationPath::kGeneral);
  evaluator.probe();
}

// ---------------------------------------------------------------------------
// 3. Precision and budgets.

template <class F>
auto Evaluator::with_precision(F&& f) -> decltype(f()) {
  ResetOnExit depth_reset(precision_depth_, precision_depth_);
  ++precision_depth_;
  auto outcome = run_at_increasing_precision(ctx_, budget_.max_precision_bits, f, [this] {
    ++stats_.precision_retries;
    // Remembered intervals are still correct, but too wide; start over so
    // every interval uses the new precision. Exact values stay: they are the
    // same at every precision.
    if (memo_has_intervals_) clear_memo();
  });
  if (!outcome.decided()) {
    throw PrecisionExhausted(std::string("an interval stayed too wide to decide (") +
                             outcome.shortfall + ") even at " + std::to_string(outcome.bits) +
                             " bits of precision");
  }
  return std::move(*outcome.value);
}

void Evaluator::charge_step(uint64_t pending_bytes, bool helper) {
  // The work stack of a deep descent (T(n/2) from 10^100000) holds every
  // pending size at once: it counts against the memory budget with the memo.
  if (pending_bytes > budget_.max_memo_bytes ||
      memo_bytes_ > budget_.max_memo_bytes - pending_bytes) {
    throw BudgetExceeded(Limit::kMemory,
                         "the sizes waiting to be evaluated and the remembered values need more "
                         "than " +
                             std::to_string(budget_.max_memo_bytes >> 20) + " MiB");
  }
  // Helper values count toward every limit below, but not as subproblems
  // (stats_.steps): the checker's work units are calibrated on those.
  ++(helper ? stats_.helper_steps : stats_.steps);
  uint64_t total = stats_.steps + stats_.helper_steps;
  if (total - query_start_steps_ > budget_.max_steps) {
    throw BudgetExceeded(Limit::kSteps,
                         "more than " + std::to_string(budget_.max_steps) + " evaluation steps" +
                             (stats_.helper_steps > 0 ? " (helper values count)" : ""));
  }
  // Bottom-up sweeps continue from one size to the next, so the work done
  // during one value_at() is not that size's own: only the total applies.
  if (budget_.max_steps_per_size != 0 && !bottom_up() &&
      total - call_start_steps_ > budget_.max_steps_per_size) {
    throw BudgetExceeded(Limit::kSteps, "one size needs more than " +
                                            std::to_string(budget_.max_steps_per_size) +
                                            " subproblems and helper values");
  }
  // max_seconds <= 0: no clock at all, so only the work budgets (the same on
  // every machine) can stop an evaluation; tests run that way. The clock is
  // read every 1024 steps: often enough to stop within milliseconds, rarely
  // enough to cost nothing.
  if (budget_.max_seconds > 0 && (total & 1023) == 0 &&
      std::chrono::steady_clock::now() > deadline_) {
    throw BudgetExceeded(Limit::kTime,
                         fmt::format("the time budget of {:g} s ran out", budget_.max_seconds));
  }
}

void Evaluator::account_memo(uint64_t key_bits, uint64_t value_bits) {
  // A nominal cost per entry, the same on both paths, so the budget (and a
  // report) does not depend on which path evaluated.
  memo_bytes_ += (key_bits + value_bits) / 8 + kMemoEntryBytes;
  size_t size = memo_size();
  stats_.memo_entries = size;
  if (size > budget_.max_memo_entries || memo_bytes_ > budget_.max_memo_bytes) {
    throw BudgetExceeded(Limit::kMemory, "one evaluation needs more than " + std::to_string(size) +
                                             " remembered values (" +
                                             std::to_string(memo_bytes_ >> 20) + " MiB)");
  }
}

size_t Evaluator::memo_size() const {
  return memo_.size() + (kernel_ ? kernel_->memo_size() : 0) + history_.size() + helper_entries_;
}

void Evaluator::clear_memo() {
  memo_.clear();
  helper_memo_.clear();
  helper_entries_ = 0;
  if (kernel_) kernel_->clear_memo();
  memo_bytes_ = 0;
  memo_has_intervals_ = false;
  ring_.clear();
  history_.clear();
  prefix_.clear();
  next_ = 0;
  ++stats_.memo_clears;
}

const Value* Evaluator::remember(const Value& m, const Value& v) {
  auto [stored, inserted] = memo_.insert(m, v);
  if (!inserted) return stored;
  if (!v.is_exact()) memo_has_intervals_ = true;
  account_memo(m.magnitude_bits(), v.magnitude_bits());
  return stored;
}

const Value* Evaluator::remembered(const Value& m) const {
  const Value* value = memo_.find(m);
  if (value == nullptr) throw InternalError("", "a finished subproblem is not remembered");
  return value;
}

// ---------------------------------------------------------------------------
// 4. Calls met inside an expression, and helper values.

Value Evaluator::lookup(const Expr& call, const Value& n, const EvalScope& scope) {
  switch (strategy_) {
    case EvaluationStrategy::kFullHistory:
      return history_lookup(call, n, scope);
    case EvaluationStrategy::kSlidingWindow:
      if (in_sweep_) return window_lookup(call, n);
      break;  // an expression outside the recurrence (a bound side): below
    case EvaluationStrategy::kIntegerKernel:
    case EvaluationStrategy::kTopDown:
      if (current_calls_ != nullptr) {
        // Evaluating a frame's body: its arguments were computed on expansion.
        for (size_t i = 0; i < current_calls_->size(); ++i) {
          if ((*current_calls_)[i] == &call) return *current_values_[i];
        }
      }
      break;
  }
  Value m = call_argument_value(call, n, scope);
  if (const Value* value = memo_.find(m)) return *value;
  if (strategy_ == EvaluationStrategy::kIntegerKernel) {
    // Straight to the kernel (exact: no precision involved), without
    // value_at()'s top-level bookkeeping. The per-size step limit still
    // counts from here, as for a size of its own.
    call_start_steps_ = stats_.steps + stats_.helper_steps;
    if (std::optional<Value> fast = kernel_value(m.integer())) return std::move(*fast);
  }
  // Only reachable from evaluate() on an expression that calls T directly.
  return value_at(m.integer());
}

Value Evaluator::helper_value(const Function& f, const Value& argument, const EvalScope& scope) {
  // Helpers that fan out (f(n) = g(n) + g(n), forty levels deep) repeat
  // their arguments: remembered, each distinct value is computed once.
  HelperMemo& memo = helper_memo_[&f];
  Value key;
  if (argument.is_integer()) {
    key = canonical_integer(argument);
    if (const Value* known = memo.integers.find(key)) return *known;
  } else if (argument.is_exact()) {
    auto it = memo.fractions.find(argument.exact());
    if (it != memo.fractions.end()) return it->second;
  }
  charge_step(0, /*helper=*/true);
  Value v = evaluate_helper(f, argument, scope);
  if (!v.is_exact()) memo_has_intervals_ = true;
  if (argument.is_integer()) {
    memo.integers.insert(key, v);
  } else if (argument.is_exact()) {
    memo.fractions.emplace(argument.exact(), v);
  } else {
    return v;
  }
  ++helper_entries_;
  account_memo(argument.magnitude_bits(), v.magnitude_bits());
  return v;
}

// ---------------------------------------------------------------------------
// 5. Top-down.

std::optional<Value> Evaluator::kernel_value(const BigInt& n) {
  try {
    BigInt out;
    kernel_->value_at(n.backend().data(), out.backend().data(), *kernel_link_);
    return canonical_integer(std::move(out));
  } catch (const KernelDeclines&) {
    // The general path redoes this size and names the problem. What the
    // kernel remembered on the way stays: those values are exact.
    return std::nullopt;
  }
}

Value Evaluator::top_down(const Value& n) {
  // Depth-first over the sizes n reaches, with an explicit stack: T(n - 1)
  // from n = 10^6 must not recurse a million native frames. A frame is
  // visited twice: first it is expanded (its line selected, its calls'
  // arguments computed, the unknown ones pushed), then, once every child is
  // remembered, its body is evaluated and the value remembered. Children
  // are pushed in call order and popped in reverse, the order the integer
  // kernel follows too (step counts and memo accounting match).
  if (const Value* known_value = memo_.find(n)) return *known_value;
  const Recurrence& r = *recurrence_;
  EvalScope s = scope(r.source);
  constexpr size_t kRoot = ~size_t{0};
  struct Frame {
    Value m;
    size_t parent_slot = kRoot;  // known[parent_slot] receives this frame's value
    const CaseLine* line = nullptr;
    size_t first_arg = 0;  // its arguments are args[first_arg, ...)
  };
  // The arguments of expanded frames, stacked like the frames: a child's
  // arguments are appended after its parent's and dropped when it is done.
  // known[i] is args[i]'s remembered value once it is known.
  std::vector<Frame> stack;
  std::vector<Value> args;
  std::vector<const Value*> known;
  // Bytes held by args (a frame's size shares its argument's storage).
  uint64_t pending_bytes = 0;
  auto bytes_of = [](const Value& v) { return v.magnitude_bits() / 8 + kPendingSizeBytes; };
  auto drop_args = [&](size_t from) {
    for (size_t i = from; i < args.size(); ++i) pending_bytes -= bytes_of(args[i]);
    args.resize(from);
  };
  const Value* result = nullptr;
  auto deliver = [&](size_t slot, const Value* value) {
    if (slot == kRoot)
      result = value;
    else
      known[slot] = value;
  };
  stack.push_back({n});
  while (!stack.empty()) {
    Frame& frame = stack.back();
    if (frame.line == nullptr) {
      // A size pushed twice (by two parents) is evaluated once.
      if (const Value* value = memo_.find(frame.m)) {
        deliver(frame.parent_slot, value);
        stack.pop_back();
        continue;
      }
      charge_step(pending_bytes + stack.size() * sizeof(Frame));
      const CaseLine& line = select_case(r.main, frame.m, s);
      frame.line = &line;
      frame.first_arg = args.size();
      bool base = false;
      for (const Expr* call : line.calls) {
        Value arg = call_argument_value(*call, frame.m, s);
        if (arg.sign() < 0 || compare(arg, frame.m, ctx_) >= 0) {
          BigInt m = frame.m.integer();
          if (!r.default_base) not_shrinking(m, *call, arg.integer());
          deliver(frame.parent_slot,
                  remember(frame.m, default_base_value(m, *call, arg.integer())));
          base = true;
          break;
        }
        pending_bytes += bytes_of(arg);
        args.push_back(std::move(arg));
      }
      if (base) {
        drop_args(stack.back().first_arg);
        stack.pop_back();
        continue;
      }
      // Push children after reading everything from `frame`: push_back
      // may move the stack.
      size_t first = frame.first_arg;
      size_t end = args.size();
      known.resize(end);
      for (size_t i = first; i < end; ++i) known[i] = memo_.find(args[i]);
      for (size_t i = first; i < end; ++i) {
        if (known[i] == nullptr) stack.push_back({args[i], i});
      }
      continue;
    }
    Frame done = std::move(frame);
    stack.pop_back();
    // A child pushed by another frame too may have been finished there:
    // every argument is remembered by now.
    for (size_t i = done.first_arg; i < args.size(); ++i) {
      if (known[i] == nullptr) known[i] = remembered(args[i]);
    }
    Value value;
    {
      current_calls_ = &done.line->calls;
      current_values_ = known.data() + done.first_arg;
      ResetOnExit calls_reset(current_calls_, nullptr);
      ResetOnExit values_reset(current_values_, nullptr);
      value = evaluate_expr(*done.line->body, done.m, s);
    }
    drop_args(done.first_arg);
    known.resize(done.first_arg);
    deliver(done.parent_slot, remember(done.m, value));
  }
  return result != nullptr ? *result : *remembered(n);
}

// ---------------------------------------------------------------------------
// 6. Bottom-up. Both strategies sweep the sizes next_, next_ + 1, ... up to
// the size asked for, each once and in order, so every call of a size's line
// lands on a size already swept: no stack, no memo lookups. They differ only
// in which calls a line may make and in what they keep (sweep()'s two
// callbacks).

namespace {

// The value kept for a swept size, or its error, raised now that it is needed.
const Value& kept_value(const std::variant<Value, Diagnostic>& kept) {
  if (const Diagnostic* error = std::get_if<Diagnostic>(&kept)) throw InputError(*error);
  return std::get<Value>(kept);
}

}  // namespace

int64_t Evaluator::sweep_target(const BigInt& n, const std::string& how) const {
  // 2^62 sizes one by one is out of reach of any budget; refusing here keeps
  // the sweep's arithmetic in machine integers.
  if (!n.is_zero() && bit_length(n) > 62) {
    throw BudgetExceeded(Limit::kSteps, "reaching n = " + n.str() + " " + how + " is out of reach");
  }
  return static_cast<int64_t>(n);
}

void Evaluator::reserve_sweep_steps(const BigInt& n, uint64_t needed) const {
  // A sweep's cost is known before it starts (one step per size): a size
  // beyond the budget fails at once instead of after max_steps of work.
  if (stats_.steps + stats_.helper_steps - query_start_steps_ + needed > budget_.max_steps) {
    throw BudgetExceeded(
        Limit::kSteps, "reaching n = " + n.str() + " bottom-up needs " + std::to_string(needed) +
                           " more steps, over the budget of " + std::to_string(budget_.max_steps));
  }
}

template <class FirstNonShrinking, class Keep>
void Evaluator::sweep(int64_t target, FirstNonShrinking&& first_non_shrinking, Keep&& keep) {
  EvalScope s = scope(recurrence_->source);
  while (next_ <= target) {
    charge_step();
    int64_t m = next_;
    std::optional<uint64_t> held_bits = keep(m, sweep_size(m, first_non_shrinking, s));
    // next_ moves before the memory is counted: if that throws, the size
    // stays kept and is not swept again.
    ++next_;
    if (held_bits) account_memo(bit_length(BigInt(m)), *held_bits);
  }
}

template <class FirstNonShrinking>
Evaluator::SweptSize Evaluator::sweep_size(int64_t m, FirstNonShrinking&& first_non_shrinking,
                                           const EvalScope& s) {
  const Recurrence& r = *recurrence_;
  Value mv(m);
  // A size below the first base case may be undefined (T(0) when only T(1)
  // is given): its error is kept, raised only if a later size needs it.
  try {
    const CaseLine& line = select_case(r.main, mv, s);
    if (std::optional<NonShrinkingCall> bad = first_non_shrinking(line, mv, m, s)) {
      if (!r.default_base) not_shrinking(BigInt(m), *bad->call, bad->argument);
      return default_base_value(BigInt(m), *bad->call, bad->argument);
    }
    in_sweep_ = true;
    ResetOnExit sweep_reset(in_sweep_, false);
    return evaluate_expr(*line.body, mv, s);
  } catch (const InputError& error) {
    return error.diagnostic();
  }
}

Value Evaluator::sweep_up(const BigInt& n) {
  const Recurrence& r = *recurrence_;
  int64_t target = sweep_target(n, "one step at a time (calls " + r.main.name + "(n - c))");
  // The ring holds sizes next_ - window_ .. next_ - 1; a smaller target
  // starts over from 0.
  if (ring_.empty() || target < next_ - window_) {
    ring_.assign(static_cast<size_t>(window_), Value(int64_t{0}));
    next_ = 0;
  }
  reserve_sweep_steps(n, static_cast<uint64_t>(std::max<int64_t>(0, target - next_ + 1)));
  // Every call is T(m - c) with a constant c: machine arithmetic suffices,
  // and only m - c < 0 fails to shrink.
  auto first_non_shrinking = [](const CaseLine& line, const Value&, int64_t m,
                                const EvalScope&) -> std::optional<NonShrinkingCall> {
    for (const Expr* call : line.calls) {
      int64_t arg = m - call->args[0]->args[1]->small;
      if (arg < 0) return NonShrinkingCall{call, BigInt(arg)};
    }
    return std::nullopt;
  };
  // The ring is the window's memory whatever n: not counted as memo. An
  // interval in it is dropped on a precision raise like any remembered one.
  sweep(target, first_non_shrinking, [this](int64_t m, SweptSize kept) -> std::optional<uint64_t> {
    const Value* value = std::get_if<Value>(&kept);
    if (value != nullptr && !value->is_exact()) memo_has_intervals_ = true;
    ring_[static_cast<size_t>(m % window_)] = std::move(kept);
    return std::nullopt;
  });
  return kept_value(ring_[static_cast<size_t>(target % window_)]);
}

Value Evaluator::window_lookup(const Expr& call, const Value& n) const {
  // Every call is T(n - c) and n is the sweep's current size.
  int64_t m = *n.small() - call.args[0]->args[1]->small;
  if (m < 0 || m >= next_ || m < next_ - window_) {
    throw InternalError("", "bottom-up window miss");
  }
  return kept_value(ring_[static_cast<size_t>(m % window_)]);
}

Value Evaluator::sweep_history(const BigInt& n) {
  const Recurrence& r = *recurrence_;
  int64_t target =
      sweep_target(n, "one size at a time (" + r.main.name + " sums over earlier values)");
  if (target < next_) return kept_value(history_[static_cast<size_t>(target)]);
  reserve_sweep_steps(n, static_cast<uint64_t>(target - next_ + 1));
  // A call may be any expression (T(floor(n/2)) beside the sum): it must
  // land on a size already swept.
  auto first_non_shrinking = [](const CaseLine& line, const Value& mv, int64_t m,
                                const EvalScope& s) -> std::optional<NonShrinkingCall> {
    for (const Expr* call : line.calls) {
      BigInt arg = call_argument(*call, mv, s);
      if (arg < 0 || arg >= m) return NonShrinkingCall{call, std::move(arg)};
    }
    return std::nullopt;
  };
  sweep(target, first_non_shrinking, [this](int64_t, SweptSize kept) -> std::optional<uint64_t> {
    const Value* value = std::get_if<Value>(&kept);
    if (value != nullptr && !value->is_exact()) memo_has_intervals_ = true;
    uint64_t bits = value != nullptr ? value->magnitude_bits() : 0;
    history_.push_back(std::move(kept));
    return bits;
  });
  return kept_value(history_[static_cast<size_t>(target)]);
}

Value Evaluator::history_lookup(const Expr& call, const Value& n, const EvalScope& scope) {
  Value arg = call_argument_value(call, n, scope);
  std::optional<int64_t> m = arg.small();
  if (!in_sweep_) {
    // An expression outside the recurrence (a bound side) asks for T(m).
    if (!m || *m < 0) return value_at(arg.integer());
    if (*m >= next_) sweep_history(BigInt(*m));
  } else if (!m || *m < 0 || *m >= next_) {
    not_shrinking(n.integer(), call, arg.integer());
  }
  return kept_value(history_[static_cast<size_t>(*m)]);
}

// Running sums: F(m) = body(base) + ... + body(m), F(base - 1) = 0, kept at
// every kStride-th m (checkpoints) and at the two most recent ends asked for
// (cursors: one follows the upper limits, one the lower). A sweep's upper
// limit moves one step per size, so each size adds O(1) terms; a sum over
// [lo, hi] is F(hi) - F(lo - 1), exact because F is (or an interval that
// holds it). Checkpoints bound the cost of an end that jumps back to kStride
// terms.
struct Evaluator::PrefixSums {
  static constexpr int64_t kStride = 64;
  int64_t base = 0;
  std::vector<Value> checkpoints;  // checkpoints[i] = F(base - 1 + i kStride)
  struct Cursor {
    int64_t m = 0;
    Value f;
    uint64_t used = 0;
  };
  Cursor cursors[2];
  uint64_t clock = 0;

  explicit PrefixSums(int64_t lo) : base(lo) {
    checkpoints.push_back(Value(int64_t{0}));
    for (Cursor& c : cursors) {
      c.m = lo - 1;
      c.f = Value(int64_t{0});
    }
  }
};

Value Evaluator::prefix_at(PrefixSums& p, const Expr& sum, int64_t m, const Value& n,
                           const EvalScope& scope) {
  constexpr int64_t kStride = PrefixSums::kStride;
  // Start from the nearest known F at or below m: a checkpoint, or a cursor
  // if one is closer.
  int64_t offset = m - (p.base - 1);  // >= 0
  size_t index = std::min(static_cast<size_t>(offset / kStride), p.checkpoints.size() - 1);
  int64_t start = p.base - 1 + static_cast<int64_t>(index) * kStride;
  Value f = p.checkpoints[index];
  int from = -1;
  for (int c = 0; c < 2; ++c) {
    if (p.cursors[c].m <= m && p.cursors[c].m > start) {
      start = p.cursors[c].m;
      f = p.cursors[c].f;
      from = c;
    }
  }
  for (int64_t k = start + 1; k <= m; ++k) {
    charge_step();
    f = add(f, sum_term(sum, k, n, scope), ctx_);
    int64_t done = k - (p.base - 1);
    if (done % kStride == 0 && static_cast<size_t>(done / kStride) == p.checkpoints.size()) {
      p.checkpoints.push_back(f);
      account_memo(64, f.magnitude_bits());
    }
  }
  if (!f.is_exact()) memo_has_intervals_ = true;
  // Move the cursor we started from, else the least recently used one.
  if (from < 0) from = p.cursors[0].used <= p.cursors[1].used ? 0 : 1;
  p.cursors[from].m = m;
  p.cursors[from].f = f;
  p.cursors[from].used = ++p.clock;
  return f;
}

Value Evaluator::sum_value(const Expr& sum, const Value& n, const EvalScope& scope) {
  auto [lo, hi] = sum_limits(sum, n, scope);
  if (hi < lo) return Value(int64_t{0});
  if (!sum_body_closed(sum)) {
    // The body changes with n (or with an outer sum's variable): no running sum.
    return sum_directly(sum, n, scope, [this] { charge_step(); });
  }
  std::unique_ptr<PrefixSums>& p = prefix_[&sum];
  if (!p || lo < p->base) p = std::make_unique<PrefixSums>(lo);
  Value upper = prefix_at(*p, sum, hi, n, scope);
  if (lo == p->base) return upper;
  return sub(upper, prefix_at(*p, sum, lo - 1, n, scope), ctx_);
}

// ---------------------------------------------------------------------------
// 7. Calls that do not shrink.

Value Evaluator::default_base_value(const BigInt& n, const Expr& call, const BigInt& m) {
  if (n >= kDefaultBaseLimit) not_shrinking(n, call, m);
  return Value(int64_t{1});
}

[[noreturn]] void Evaluator::not_shrinking(const BigInt& n, const Expr& call, const BigInt& m) {
  const Recurrence& r = *recurrence_;
  std::string head =
      print(call) + " at n = " + n.str() + " calls " + r.main.name + "(" + m.str() + "), ";
  // Calls shrink at large n (probe passed) and base cases are written, so the
  // gap is below them (T(n) = 3T(n/4) + n with T(1) = 1: T(2) and T(3) call
  // T(0)). Name the sizes that fall into it and the base case that closes it.
  if (large_sizes_shrink_ && !r.default_base && n < 64) small_size_gap(n, call, m, head);
  if (m >= n) {
    fail_at(r.source, call.pos, head + "which does not shrink",
            "each call must reach a smaller size, such as " + r.main.name + "(n/2) or " +
                r.main.name + "(n-1)");
  }
  fail_at(r.source, call.pos, head + "which is not a size",
          "add a base case such as " + r.main.name + "(" + n.str() +
              ") = 1, or a line 'if n <= " + n.str() + "'");
}

void Evaluator::small_size_gap(const BigInt& n, const Expr& call, const BigInt& m,
                               const std::string& head) {
  const Recurrence& r = *recurrence_;
  EvalScope s = scope(r.source);
  constexpr int64_t kScan = 64;
  // roots: sizes whose own call does not shrink; direct: other sizes (not
  // base cases) whose call lands on a root.
  std::vector<bool> root(kScan, false);
  std::vector<int64_t> direct;
  const Expr* example_call = nullptr;
  int64_t example_size = 0, example_target = 0;
  for (int64_t k = 0; k < kScan; ++k) {
    Value kv(k);
    try {
      const CaseLine& line = select_case(r.main, kv, s);
      for (const Expr* c : line.calls) {
        BigInt target = call_argument(*c, kv, s);
        if (target < 0 || target >= k) {
          root[k] = true;
          break;
        }
        if (root[static_cast<size_t>(target)]) {
          direct.push_back(k);
          if (example_call == nullptr) {
            example_call = c;
            example_size = k;
            example_target = static_cast<int64_t>(target);
          }
          break;
        }
      }
    } catch (const InputError&) {
      continue;  // no line applies there, or a domain error: not this gap
    }
  }
  if (direct.empty() || direct.back() >= kScan - 8) return;  // not a gap at small sizes
  int64_t below = direct.back() + 1;
  for (int64_t k = 0; k < kScan; ++k) {
    if (root[k]) below = std::max(below, k + 1);
  }
  // n = 2..3, or n = 2, 5..7.
  std::string sizes;
  for (size_t i = 0; i < direct.size();) {
    size_t j = i;
    while (j + 1 < direct.size() && direct[j + 1] == direct[j] + 1) ++j;
    sizes += (sizes.empty() ? "" : ", ") + std::to_string(direct[i]);
    if (j > i) sizes += ".." + std::to_string(direct[j]);
    i = j + 1;
  }
  // The value of the smallest written point case, when it is a constant.
  std::string value = "1";
  for (const CaseLine& point : r.main.points) {
    if (!mentions_n(*point.body) && !has_free_bound(*point.body)) {
      value = print(*point.body);
      break;
    }
  }
  std::string f = r.main.name;
  std::string what = m >= n ? "which does not shrink" : "which is not a size";
  fail_at(r.source, call.pos,
          head + what + "; it is reached from n = " + sizes + " (" + print(*example_call) +
              " at n = " + std::to_string(example_size) + " is " + f + "(" +
              std::to_string(example_target) + ")), and no base case covers " +
              (direct.size() == 1 ? "that size" : "those sizes"),
          "add a base case for n < " + std::to_string(below) + ", e.g. " + f + "(n) = " + value +
              " if n < " + std::to_string(below) +
              " (once base cases are written, no other small size is assumed: see 'Base "
              "cases' in docs/language.md)");
}

void Evaluator::probe_calls() {
  // Every call must reach a smaller size at large n: T(n) = T(n) + 1 and
  // T(n + 1) are errors for every command, found here before any evaluation
  // (and before a derivation). With no base case, T(n) = 1 where a call
  // would not shrink; that is a base case only if large sizes do shrink.
  probed_ = true;
  const Recurrence& r = *recurrence_;
  EvalScope s = scope(r.source);
  // The first size whose call does not shrink, if any.
  auto offending = [&](const BigInt& n) -> std::optional<std::pair<const Expr*, BigInt>> {
    Value nv(n);
    const CaseLine& line = select_case(r.main, nv, s);
    for (const Expr* call : line.calls) {
      BigInt m = call_argument(*call, nv, s);
      if (m < 0 || m >= n) return std::pair<const Expr*, BigInt>{call, m};
    }
    return std::nullopt;
  };
  for (const BigInt& n :
       {kDefaultBaseLimit, BigInt(kDefaultBaseLimit + 1), BigInt(3 * kDefaultBaseLimit / 2)}) {
    std::optional<std::pair<const Expr*, BigInt>> bad;
    try {
      bad = offending(n);
    } catch (const InputError&) {
      continue;  // no line applies at n, or a domain error: evaluation reports it where it happens
    }
    if (!bad) continue;
    // Name the first size where the same call fails (docs/design.md §3): T(n + 1)
    // already fails at n = 0, not only at the probe.
    for (BigInt first = 0; first <= 64; ++first) {
      std::optional<std::pair<const Expr*, BigInt>> early;
      try {
        early = offending(first);
      } catch (const InputError&) {
        continue;  // no line applies there, or a domain error: not this call's fault
      }
      if (early && early->first == bad->first) not_shrinking(first, *early->first, early->second);
    }
    not_shrinking(n, *bad->first, bad->second);
  }
  large_sizes_shrink_ = true;
}

}  // namespace thetagate::engine
