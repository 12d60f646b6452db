// Precision retries, in one place.
//
// An irrational value (lg 3, sqrt(n), 1.5^n) is held as a certified interval
// at a working precision (verifier/numbers/interval.h). When an operation
// cannot be settled by the interval it has (the sign of an interval around
// 0, the floor of one that straddles an integer, two overlapping intervals
// compared) it throws PrecisionShortfall rather than guess. The cure is
// always the same: redo the whole computation with every interval made at
// twice the precision. The whole computation, because an interval carries
// the rounding of every operation that made it: only recomputing its inputs
// narrows it. Twice, because an attempt costs at least linearly in the bits,
// so all the attempts together cost a small constant factor of the last one.
//
// Two outcomes are honest: decided (the value), or undecided at the top of
// the ladder (the two sides agree to more bits than the budget allows; they
// may be equal). run_at_increasing_precision() returns which one it was;
// what "undecided" becomes is the caller's business (the Evaluator raises
// PrecisionExhausted, a limit like any other).
#ifndef THETAGATE_VERIFIER_EVALUATION_PRECISION_H_
#define THETAGATE_VERIFIER_EVALUATION_PRECISION_H_

#include <optional>
#include <string>
#include <type_traits>
#include <utility>

#include "verifier/numbers/value.h"

namespace thetagate::engine {

// What a computation run up the precision ladder came to.
template <class T>
struct PrecisionOutcome {
  std::optional<T> value;  // set when decided
  std::string shortfall;   // undecided: what the last attempt could not settle
  long bits = 0;           // the precision of the last attempt
  bool decided() const { return value.has_value(); }
};

// Runs compute() at ctx.precision_bits. After each PrecisionShortfall, if
// doubling the precision stays within max_bits, doubles ctx.precision_bits,
// calls on_raise() (the place to drop intervals made at the old precision:
// they are correct but too wide) and runs compute() again; otherwise returns
// undecided. Any other exception passes through.
//
// The precision is read from ctx at each shortfall, not counted here, so a
// compute() that itself changes ctx.precision_bits (the Evaluator's nested
// value_at() starts each size low) is followed, not overridden. ctx is left
// at the last attempt's precision. REQUIRES: ctx.precision_bits > 0.
template <class F, class OnRaise>
auto run_at_increasing_precision(NumericContext& ctx, long max_bits, F&& compute,
                                 OnRaise&& on_raise) -> PrecisionOutcome<decltype(compute())> {
  using T = decltype(compute());
  static_assert(!std::is_void_v<T>, "compute() returns the value it decided");
  PrecisionOutcome<T> outcome;
  while (true) {
    try {
      outcome.value.emplace(compute());
      outcome.bits = ctx.precision_bits;
      return outcome;
    } catch (const PrecisionShortfall& shortfall) {
      if (ctx.precision_bits * 2 > max_bits) {
        outcome.shortfall = shortfall.what();
        outcome.bits = ctx.precision_bits;
        return outcome;
      }
      ctx.precision_bits *= 2;
      on_raise();
    }
  }
}

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_EVALUATION_PRECISION_H_
