// Counting what a claim counts, inside the code under test, without changing
// that code: a counter, a comparator that counts its calls, a wrapper that
// counts the calls of any callable, and a manual add(k) for everything else
// (digit products, probes, node visits).
//
//   thetagate::CostCounter comparisons;
//   std::sort(v.begin(), v.end(), thetagate::counting(comparisons));
//   EXPECT_LE(comparisons.count(), ...);
//
// Overflow is an error, never a wrap: a count that would pass 2^64 − 1 throws
// CostOverflow and leaves the count unchanged, so a runaway loop cannot come
// back as a small, plausible cost.
//
// Stopping a guarded run. The guard (thetagate/testing/rapidcheck.h) gives the
// counter of each run a ceiling (the most the claim's relation allows at that
// size) and a stop flag (the run's time limit): add() throws RunStopped once
// the count passes the ceiling or the flag is set, so code that counts cannot
// run on after its cost is decided. A plain counter has neither and never
// throws RunStopped.
//
// Thread safety. CostCounter is a plain value like std::vector: any number of
// threads may read one concurrently, but an add() concurrent with any other
// access to the same counter is a data race. Give each thread its own counter
// and sum them (sum() below checks the sum), or use SharedCostCounter, whose
// add() may be called from many threads at once (an atomic compare-and-swap,
// a few times slower). The adapters hold a pointer to their counter: the
// counter must outlive them, and copies of an adapter count into the same
// counter (std algorithms copy comparators freely).
//
// Header-only; depends on the standard library alone.
#ifndef THETAGATE_COST_H_
#define THETAGATE_COST_H_

#include <atomic>
#include <cstdint>
#include <functional>
#include <initializer_list>
#include <stdexcept>
#include <string>
#include <type_traits>
#include <utility>

namespace thetagate {

// Thrown when a count would exceed 2^64 − 1.
class CostOverflow : public std::overflow_error {
 public:
  CostOverflow(uint64_t count, uint64_t added)
      : std::overflow_error("cost counter overflow: " + std::to_string(count) + " + " +
                            std::to_string(added) + " exceeds 2^64 - 1"),
        count_(count),
        added_(added) {}
  uint64_t count() const noexcept { return count_; }  // the count before the add
  uint64_t added() const noexcept { return added_; }

 private:
  uint64_t count_;
  uint64_t added_;
};

// Thrown by CostCounter::add() to stop a guarded run: the count passed the
// counter's ceiling, or its stop flag was set. Deliberately not derived from
// std::exception, so code under test that recovers from its own errors with
// `catch (const std::exception&)` lets it through; code that catches
// everything (`catch (...)`) should rethrow it. If it does not, the count
// still shows the passed ceiling and every later add() throws again.
class RunStopped {
 public:
  enum class Reason {
    kCeiling,  // the count passed the ceiling
    kStopped,  // the stop flag was set (the guard: the run's time limit passed)
  };
  RunStopped(Reason reason, uint64_t count) noexcept : reason_(reason), count_(count) {}
  Reason reason() const noexcept { return reason_; }
  uint64_t count() const noexcept { return count_; }  // the count after the add

 private:
  Reason reason_;
  uint64_t count_;
};

namespace detail {
// The stop flag of a counter that has none: never set.
inline const std::atomic<bool> kNeverStop{false};
}  // namespace detail

// A count of operations. Starts at 0.
class CostCounter {
 public:
  CostCounter() = default;
  explicit CostCounter(uint64_t start) noexcept : count_(start) {}

  // Adds k. Throws CostOverflow (count unchanged) if the sum exceeds 2^64 − 1;
  // RunStopped (count includes k) if the sum passes the ceiling or the stop
  // flag is set.
  void add(uint64_t k = 1) {
    uint64_t sum;
    if (__builtin_add_overflow(count_, k, &sum)) [[unlikely]]
      throw CostOverflow(count_, k);
    count_ = sum;
    if ((sum > ceiling_) | stop_->load(std::memory_order_relaxed)) [[unlikely]] {
      throw RunStopped(sum > ceiling_ ? RunStopped::Reason::kCeiling : RunStopped::Reason::kStopped,
                       sum);
    }
  }
  uint64_t count() const noexcept { return count_; }
  // Sets the count to 0; the ceiling and the stop flag stay.
  void reset() noexcept { count_ = 0; }

  // The largest count add() accepts without throwing RunStopped; default
  // 2^64 − 1 (none).
  void set_ceiling(uint64_t ceiling) noexcept { ceiling_ = ceiling; }
  uint64_t ceiling() const noexcept { return ceiling_; }
  // add() throws RunStopped once `flag` is true; another thread may set it.
  // REQUIRES: `flag` outlives every add() on this counter and its copies.
  void stop_when(const std::atomic<bool>& flag) noexcept { stop_ = &flag; }

 private:
  uint64_t count_ = 0;
  uint64_t ceiling_ = ~uint64_t{0};
  const std::atomic<bool>* stop_ = &detail::kNeverStop;
};

// The sum of several counters' counts (one per thread). Throws CostOverflow.
inline uint64_t sum(std::initializer_list<const CostCounter*> counters) {
  CostCounter total;
  for (const CostCounter* c : counters) total.add(c->count());
  return total.count();
}

// A counter that many threads may add to at once. Same overflow contract.
class SharedCostCounter {
 public:
  void add(uint64_t k = 1) {
    uint64_t seen = count_.load(std::memory_order_relaxed);
    uint64_t sum;
    do {
      if (__builtin_add_overflow(seen, k, &sum)) throw CostOverflow(seen, k);
    } while (!count_.compare_exchange_weak(seen, sum, std::memory_order_relaxed));
  }
  uint64_t count() const noexcept { return count_.load(std::memory_order_relaxed); }
  void reset() noexcept { count_.store(0, std::memory_order_relaxed); }

 private:
  std::atomic<uint64_t> count_{0};
};

// A comparator that adds 1 to its counter per call, then asks `Compare`.
// Works with any counter type that has add(uint64_t).
template <class Compare = std::less<>, class Counter = CostCounter>
class CountingCompare {
 public:
  explicit CountingCompare(Counter& counter, Compare compare = Compare())
      : counter_(&counter), compare_(std::move(compare)) {}

  template <class A, class B>
  bool operator()(A&& a, B&& b) const {
    counter_->add(1);
    return static_cast<bool>(std::invoke(compare_, std::forward<A>(a), std::forward<B>(b)));
  }

  Counter& counter() const noexcept { return *counter_; }

 private:
  Counter* counter_;
  Compare compare_;
};

// counting(c) counts std::less<>; counting(c, cmp) counts calls of cmp.
template <class Counter, class Compare = std::less<>>
CountingCompare<Compare, Counter> counting(Counter& counter, Compare compare = Compare()) {
  return CountingCompare<Compare, Counter>(counter, std::move(compare));
}

// Any callable, counted: each call adds `weight` (default 1), then forwards.
template <class F, class Counter = CostCounter>
class Counted {
 public:
  Counted(Counter& counter, F f, uint64_t weight = 1)
      : counter_(&counter), f_(std::move(f)), weight_(weight) {}

  template <class... Args>
  decltype(auto) operator()(Args&&... args) const {
    counter_->add(weight_);
    return std::invoke(f_, std::forward<Args>(args)...);
  }

  Counter& counter() const noexcept { return *counter_; }

 private:
  Counter* counter_;
  F f_;
  uint64_t weight_;
};

template <class Counter, class F>
Counted<std::decay_t<F>, Counter> counted(Counter& counter, F&& f, uint64_t weight = 1) {
  return Counted<std::decay_t<F>, Counter>(counter, std::forward<F>(f), weight);
}

}  // namespace thetagate

#endif  // THETAGATE_COST_H_
