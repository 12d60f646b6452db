// The runner side of guarding code: run the code under test at the claim's
// adversarial sizes, on inputs from the maintainer's RapidCheck generator, on
// the maintainer's seeds, on the usual shapes and orders built up from
// smaller sizes (vectors of numbers), and on inputs an input search makes
// costlier; count its cost, compare every count with T(n) exactly, and shrink
// an input that breaks the model.
//
//   thetagate::guard::Runner<std::vector<int>> runner;
//   runner.name = "stable_sort";
//   runner.inputs = [](uint64_t n) {
//     return rc::gen::container<std::vector<int>>(n, rc::gen::inRange(0, 100));
//   };
//   runner.run = [](uint64_t n, const std::vector<int>& input, thetagate::CostCounter& cost) {
//     auto v = input;
//     orchard::stable_sort(v, thetagate::counting(cost));
//   };
//   GuardResult r = thetagate::guard::check_code(model, runner);
//
// Also: thetagate::guard::gen::adversarial_size(), a RapidCheck generator of the
// sizes the size families produce, for maintainers' own properties.
//
// Determinism: every input comes from (seed, n, index) alone, so setting the
// seed (GuardOptions::seed, or THETAGATE_GUARD_SEED) and the size
// (THETAGATE_GUARD_N) replays a failure exactly, provided the runner counts
// the same cost for the same input (the guard re-runs a witness to check).
#ifndef THETAGATE_TESTING_RAPIDCHECK_H_
#define THETAGATE_TESTING_RAPIDCHECK_H_

#include <rapidcheck.h>
#include <rapidcheck/shrink/Shrink.h>
#include <unistd.h>

#include <algorithm>
#include <atomic>
#include <chrono>
#include <condition_variable>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <exception>
#include <functional>
#include <limits>
#include <map>
#include <mutex>
#include <optional>
#include <random>
#include <sstream>
#include <string>
#include <thread>
#include <type_traits>
#include <utility>
#include <vector>

#include "thetagate/cost.h"
#include "thetagate/guard.h"

namespace thetagate::guard {

// What to run: the maintainer's generator of inputs of size n, and the code
// under test counting its cost. `mutate` and `shrink` are optional for
// std::vector of integers and of floating-point numbers (defaults below);
// for other input types without them the search only samples and a mutated
// input is reported unshrunk.
template <class Input>
struct Runner {
  std::string name;
  // REQUIRED. Inputs of size n.
  std::function<rc::Gen<Input>(uint64_t n)> inputs;
  // REQUIRED. Runs the code under test on `input` (of size n), adding its
  // cost to `cost`. Must count the same cost for the same input. May throw:
  // that is reported as an error naming n and the input. `cost.add()` may
  // throw RunStopped to end a run early (its count passed T(n), or its time
  // limit): let it through.
  std::function<void(uint64_t n, const Input& input, CostCounter& cost)> run;
  // A small random change of an input of size n (the result must be an input
  // of size n too).
  std::function<Input(const Input& input, uint64_t n, std::mt19937_64& random)> mutate;
  // Smaller candidates of a failing input (RapidCheck's shrinking), all of
  // size n.
  std::function<rc::Seq<Input>(const Input& input)> shrink;
  // How an input is shown in a report; default rc::toString.
  std::function<std::string(const Input& input)> show;
  // Inputs of size n the maintainer knows to be hard (a worst-case order, a
  // degenerate case): every one runs at every size, before the random ones.
  // A failing one is shrunk with `shrink` (or the vector default).
  std::function<std::vector<Input>(uint64_t n)> seeds;
};

struct GuardOptions {
  // Every random choice comes from this. Default: THETAGATE_GUARD_SEED when
  // set, else 1.
  std::optional<uint64_t> seed;
  // Largest size run; default: the claim's [claim.code] max_n (65536).
  std::optional<uint64_t> max_n;
  // Only this size (replaying a failure); default: THETAGATE_GUARD_N when set.
  // The sizes below it run too, unreported: the orders built up from smaller
  // sizes come from them.
  std::optional<uint64_t> only_n;
  // How the runs are spent at a size n: `inputs_per_size` random inputs and
  // `search_steps` mutations while n * count stays within `size_work` input
  // elements, fewer above (never fewer than `min_inputs` and
  // `min_search_steps`): small sizes densely, the largest with a few random
  // inputs, the shapes and the orders built up from smaller sizes. Half the
  // search steps where the costliest input is under half of T(n) (the
  // search goes where the model is tightest).
  uint64_t inputs_per_size = 50;  // random inputs at a size, at most
  uint64_t search_steps = 50;     // mutations of the costliest inputs, at most
  uint64_t size_work = 1u << 15;  // input elements per size (random inputs; as many searched)
  uint64_t min_inputs = 2;        // random inputs at every size, at least
  uint64_t min_search_steps = 2;  // search steps at every size, at least
  // Random inputs drawn from the runner's generator (with RapidCheck's shrink
  // information) at a size, at most `generated_work` elements' worth, at
  // least one; the other random inputs of a vector of numbers are fresh
  // random orders of the first (cheap, with no shrink tree), whose shrinkable
  // form is rebuilt from its seed only when one fails.
  uint64_t generated_work = 1u << 14;
  // Vectors of numbers also run the usual shapes of a generated input's own
  // values (sorted, reversed, all equal, few distinct keys, organ pipe,
  // rotated) and orders built up from the costliest orders of smaller sizes.
  bool shapes = true;
  uint64_t small_limit = 32;        // every n up to this is run ("small" family)
  uint64_t max_shrink_runs = 4000;  // runs spent shrinking a failing input
  bool check_bound = true;          // also model -> bound
  // Wall-clock limit of one run, in seconds (0: none; at most 10^6). A run
  // past it is stopped at its next CostCounter::add() and ends the check with
  // an error naming n and the input. A run that does not add for as long
  // again cannot be stopped (a thread cannot be ended safely): the guard
  // prints n, the claim and the replay command to stderr and calls
  // std::abort(), so a hung test fails at once, and says where.
  double run_time_limit = 60;
  // Wall-clock budget of the whole guard, in seconds (0: none; at most 10^6),
  // times the effort. Past it, the remaining sizes run only one random input,
  // their seeds, its shapes and the built-up orders (no search), and the
  // result says where the budget ran out (GuardResult::budget_reached_at).
  double time_budget = 30;
  // Multiplies inputs_per_size, search_steps, size_work, generated_work and
  // time_budget (a nightly run: THETAGATE_GUARD_EFFORT=10). Default:
  // THETAGATE_GUARD_EFFORT when set, else 1. From 1 to 1000.
  std::optional<uint64_t> effort;
  // Print a line of progress to stderr while the guard runs longer than a
  // second. Default: when stderr is a terminal.
  std::optional<bool> progress;
  // Prefix of the replay command: the test binary and its filter (gtest.h
  // fills it in); the seed and size are prepended as environment variables.
  std::string replay_command = "<your test command>";
};

namespace detail {

// A replay setting from the environment: unset or empty (nullopt), a whole
// number from 0 to 2^64 − 1 in decimal digits, or an error saying why not
// (a sign, a space, any other character, or more than 2^64 − 1).
struct EnvSetting {
  std::optional<uint64_t> value;
  std::optional<std::string> error;
};
inline EnvSetting env_number(const char* name) {
  const char* text = std::getenv(name);
  if (text == nullptr || *text == '\0') return {};
  uint64_t v = 0;
  for (const char* p = text; *p != '\0'; ++p) {
    if (*p < '0' || *p > '9' || __builtin_mul_overflow(v, uint64_t{10}, &v) ||
        __builtin_add_overflow(v, static_cast<uint64_t>(*p - '0'), &v)) {
      std::string shown = text;
      if (shown.size() > 40) shown = shown.substr(0, 40) + "...";
      return {std::nullopt, std::string(name) + "='" + shown +
                                "' is not a whole number from 0 to 18446744073709551615 "
                                "(decimal digits only): unset it, or copy the replay command "
                                "of a guard failure"};
    }
  }
  return {v, std::nullopt};
}

// Seconds as a person writes them: "60", "0.05".
inline std::string seconds_text(double seconds) {
  std::ostringstream out;
  out << seconds;
  return out.str();
}

// The text of the exception being handled. REQUIRES: inside a catch block.
inline std::string current_what() {
  try {
    throw;
  } catch (const std::exception& e) {
    return e.what();
  } catch (...) {
    return "a non-standard exception";
  }
}

// How one run of the runner ended.
struct RunOutcome {
  enum Kind {
    kCounted,        // finished; `cost` is its count
    kPassedCeiling,  // stopped (or finished) past ModelValue::allowed_max
    kTimedOut,       // past the run time limit
    kOverflow,       // CostOverflow
    kThrew,          // any other exception
  };
  Kind kind = kCounted;
  uint64_t cost = 0;
  std::string what;      // the exception's text
  bool standard = true;  // kThrew: a std::exception
  bool counted() const { return kind == kCounted || kind == kPassedCeiling; }
};

// The time limit of runs: a thread that sets the counter's stop flag when a
// run passes the limit, and aborts the process with `message` when the run
// goes on for as long again (it never counts, so nothing can stop it). Runs
// are armed and disarmed by the guard's thread; no thread for a limit of 0.
class Watchdog {
 public:
  explicit Watchdog(double seconds)
      : limit_(std::chrono::duration_cast<std::chrono::steady_clock::duration>(
            std::chrono::duration<double>(seconds))) {
    if (seconds > 0) thread_ = std::thread([this] { watch(); });
  }
  ~Watchdog() {
    if (!thread_.joinable()) return;
    {
      std::lock_guard<std::mutex> lock(mutex_);
      quit_ = true;
    }
    wake_.notify_one();
    thread_.join();
  }
  Watchdog(const Watchdog&) = delete;
  Watchdog& operator=(const Watchdog&) = delete;

  const std::atomic<bool>& stop_flag() const { return stop_; }
  // What to print before aborting (the size, the replay command).
  void set_message(std::string message) {
    std::lock_guard<std::mutex> lock(mutex_);
    message_ = std::move(message);
  }
  // A run starts.
  void arm() {
    if (!thread_.joinable()) return;
    std::lock_guard<std::mutex> lock(mutex_);
    ++run_;
    armed_ = true;
    deadline_ = std::chrono::steady_clock::now() + limit_;
    stop_.store(false, std::memory_order_relaxed);
    if (idle_) wake_.notify_one();  // else the watcher wakes at the old deadline
  }
  // The run ended; whether it passed the limit.
  bool disarm() {
    if (!thread_.joinable()) return false;
    std::lock_guard<std::mutex> lock(mutex_);
    ++run_;
    armed_ = false;
    return stop_.load(std::memory_order_relaxed);
  }

 private:
  void watch() {
    std::unique_lock<std::mutex> lock(mutex_);
    while (!quit_) {
      if (!armed_) {
        idle_ = true;
        wake_.wait(lock);
        idle_ = false;
        continue;
      }
      const uint64_t run = run_;
      auto over = [&] { return quit_ || run_ != run; };
      if (wake_.wait_until(lock, deadline_, over)) continue;
      stop_.store(true, std::memory_order_relaxed);  // the next add() throws RunStopped
      if (wake_.wait_until(lock, deadline_ + limit_, over)) continue;
      std::fputs(message_.c_str(), stderr);
      std::fflush(stderr);
      std::abort();
    }
  }

  const std::chrono::steady_clock::duration limit_;
  std::atomic<bool> stop_{false};
  std::mutex mutex_;
  std::condition_variable wake_;
  std::string message_;
  uint64_t run_ = 0;  // changes at every arm() and disarm()
  bool armed_ = false;
  bool idle_ = false;
  bool quit_ = false;
  std::chrono::steady_clock::time_point deadline_;
  std::thread thread_;  // last: starts after the members it reads
};

inline bool stderr_is_terminal() { return ::isatty(::fileno(stderr)) != 0; }

// A line of progress on stderr, rewritten in place, once the guard has run
// for a second; erased at the end.
class Progress {
 public:
  Progress(bool on, std::string title) : on_(on), title_(std::move(title)) {}
  ~Progress() {
    if (!shown_) return;
    std::fputs("\r\033[K", stderr);
    std::fflush(stderr);
  }
  Progress(const Progress&) = delete;
  Progress& operator=(const Progress&) = delete;
  void show(uint64_t n, size_t index, size_t count, double seconds) {
    if (!on_ || seconds < 1 || (shown_ && seconds - last_ < 0.2)) return;
    shown_ = true;
    last_ = seconds;
    std::fprintf(stderr, "\r\033[K%s: n = %llu, size %zu of %zu, %.1f s", title_.c_str(),
                 static_cast<unsigned long long>(n), index + 1, count, seconds);
    std::fflush(stderr);
  }

 private:
  bool on_;
  std::string title_;
  bool shown_ = false;
  double last_ = 0;
};

// splitmix64: the per-(seed, n, index) streams.
inline uint64_t mix(uint64_t x) {
  x += 0x9e3779b97f4a7c15ull;
  x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9ull;
  x = (x ^ (x >> 27)) * 0x94d049bb133111ebull;
  return x ^ (x >> 31);
}
inline uint64_t stream(uint64_t seed, uint64_t n, uint64_t index) {
  return mix(mix(mix(seed) ^ n) ^ index);
}

// Vectors of numbers (not bool) get default mutations and shrinking.
template <class T>
struct DefaultVector : std::false_type {};
template <class T, class A>
struct DefaultVector<std::vector<T, A>>
    : std::bool_constant<std::is_arithmetic_v<T> && !std::is_same_v<T, bool>> {};
template <class Input>
inline constexpr bool kDefaultVector = DefaultVector<Input>::value;

// Default mutations of a vector: swap two elements, reverse or rotate a
// stretch, copy one element over another, or nudge one by ±1. Sizes stay.
template <class Input>
Input mutate_vector(const Input& input, std::mt19937_64& random) {
  Input v = input;
  if (v.size() < 2) {
    if (!v.empty()) v[0] += (random() & 1) ? 1 : -1;
    return v;
  }
  std::uniform_int_distribution<size_t> at(0, v.size() - 1);
  size_t i = at(random), j = at(random);
  if (i > j) std::swap(i, j);
  switch (random() % 5) {
    case 0:
      std::swap(v[i], v[j]);
      break;
    case 1:
      std::reverse(v.begin() + i, v.begin() + j + 1);
      break;
    case 2:
      if (j > i) std::rotate(v.begin() + i, v.begin() + i + 1, v.begin() + j + 1);
      break;
    case 3:
      v[j] = v[i];
      break;
    default:
      v[i] += (random() & 1) ? 1 : -1;
      break;
  }
  return v;
}

template <class Input>
rc::Seq<Input> shrink_vector(const Input& v) {
  using T = typename Input::value_type;
  if constexpr (std::is_integral_v<T>) {
    return rc::shrink::eachElement(v, [](T x) { return rc::shrink::integral(x); });
  } else {
    return rc::shrink::eachElement(v, [](T x) { return rc::shrink::real(x); });
  }
}

// The usual shapes of a sequence, built from a generated input's own values
// (so a runner that needs, say, digits still gets digits) and of its length.
enum class Shape { kSorted, kReversed, kAllEqual, kFewDistinct, kOrganPipe, kRotated };
inline constexpr Shape kShapes[] = {Shape::kSorted,      Shape::kReversed,  Shape::kAllEqual,
                                    Shape::kFewDistinct, Shape::kOrganPipe, Shape::kRotated};
inline const char* shape_name(Shape s) {
  switch (s) {
    case Shape::kSorted:
      return "sorted";
    case Shape::kReversed:
      return "reversed";
    case Shape::kAllEqual:
      return "all equal";
    case Shape::kFewDistinct:
      return "few distinct keys";
    case Shape::kOrganPipe:
      return "organ pipe";
    case Shape::kRotated:
      return "rotated";
  }
  return "";
}

// `sorted`: x's values in ascending order.
template <class Input>
Input shaped(const Input& x, const Input& sorted, Shape shape) {
  Input s = sorted;
  const size_t size = s.size();
  if (size == 0) return s;
  switch (shape) {
    case Shape::kSorted:
      return s;
    case Shape::kReversed:
      std::reverse(s.begin(), s.end());
      return s;
    case Shape::kAllEqual: {
      const auto middle = s[size / 2];
      std::fill(s.begin(), s.end(), middle);
      return s;
    }
    case Shape::kFewDistinct: {
      // Each element replaced by the least value of its quarter, in x's order.
      const size_t quarter = (size + 3) / 4;
      Input out = x;
      for (auto& v : out) {
        size_t rank = static_cast<size_t>(std::lower_bound(s.begin(), s.end(), v) - s.begin());
        v = s[rank / quarter * quarter];
      }
      return out;
    }
    case Shape::kOrganPipe: {
      // Ascending through every other value, then descending through the rest.
      Input out, rest;
      for (size_t i = 0; i < size; ++i) (i % 2 == 0 ? out : rest).push_back(s[i]);
      out.insert(out.end(), rest.rbegin(), rest.rend());
      return out;
    }
    case Shape::kRotated:
      std::rotate(s.begin(), s.begin() + 1, s.end());  // sorted, the least last
      return s;
  }
  return s;
}

template <class Input>
Input sorted_copy(const Input& x) {
  Input s = x;
  std::sort(s.begin(), s.end());
  return s;
}

template <class Input>
Input shaped(const Input& x, Shape shape) {
  return shaped(x, sorted_copy(x), shape);
}

// An order: order[i] is the rank of element i (ties broken by position).
using Order = std::vector<uint32_t>;

template <class Input>
Order order_of(const Input& x) {
  std::vector<uint32_t> by_rank(x.size());
  for (uint32_t i = 0; i < by_rank.size(); ++i) by_rank[i] = i;
  std::stable_sort(by_rank.begin(), by_rank.end(),
                   [&](uint32_t a, uint32_t b) { return x[a] < x[b]; });
  Order order(x.size());
  for (uint32_t r = 0; r < by_rank.size(); ++r) order[by_rank[r]] = r;
  return order;
}

// The values of `sorted` (ascending) placed in `order`; `sorted` itself
// when the lengths differ.
template <class Input>
Input arranged_sorted(const Input& sorted, const Order& order) {
  if (order.size() != sorted.size()) return sorted;
  Input out = sorted;
  for (size_t i = 0; i < order.size(); ++i) out[i] = sorted[order[i]];
  return out;
}

// x's values placed in `order`.
template <class Input>
Input arranged(const Input& x, const Order& order) {
  return arranged_sorted(sorted_copy(x), order);
}

// How two orders (a left part and a right part) make one: the ranks
// interleaved (every merge of the two parts runs to its last element; the
// longer part takes the even ranks, or the left part when they are as long),
// the same with the parts' roles exchanged, or one part wholly below the other.
enum class Join { kInterleave, kInterleaveSwapped, kLeftLow, kLeftHigh };
// The orders tried at a size: whether the left part is the larger half of an
// odd size, and the join, at every level. The interleaved orders both ways
// round (the worst cases of merging); the others one way only.
inline constexpr std::pair<bool, Join> kBuilds[] = {
    {true, Join::kInterleave},         {false, Join::kInterleave}, {true, Join::kInterleaveSwapped},
    {false, Join::kInterleaveSwapped}, {true, Join::kLeftLow},     {true, Join::kLeftHigh}};

inline Order joined(const Order& a, const Order& b, Join join) {
  const uint32_t p = static_cast<uint32_t>(a.size()), q = static_cast<uint32_t>(b.size());
  Order out;
  out.reserve(p + q);
  const bool left_even = p > q || (p == q && join == Join::kInterleave);
  if (join == Join::kInterleave || join == Join::kInterleaveSwapped) {
    const uint32_t shared = std::min(p, q);
    // Below 2 * shared the ranks alternate; the longer part's rest comes last.
    auto rank = [&](uint32_t r, bool even) {
      return r < shared ? 2 * r + (even ? 0 : 1) : shared + r;
    };
    for (uint32_t r : a) out.push_back(rank(r, left_even));
    for (uint32_t r : b) out.push_back(rank(r, !left_even));
  } else {
    const bool low = join == Join::kLeftLow;
    for (uint32_t r : a) out.push_back(low ? r : q + r);
    for (uint32_t r : b) out.push_back(low ? p + r : r);
  }
  return out;
}

// Orders of size n built from the costliest orders found at smaller sizes
// (`found`, by size): the left part is ceil(n/2) or floor(n/2) long, and a
// part whose size was not run is built the same way from its own halves.
// Only for inputs as long as their size.
class OrderBuilder {
 public:
  explicit OrderBuilder(const std::vector<std::pair<uint64_t, Order>>* found) : found_(found) {}
  std::optional<Order> build(uint64_t n, bool left_larger, Join join) {
    memo_.clear();
    if (n < 2) return std::nullopt;
    return order(n, left_larger, join);
  }

 private:
  const Order* known(uint64_t m) const {
    auto it = std::lower_bound(found_->begin(), found_->end(), m,
                               [](const auto& e, uint64_t v) { return e.first < v; });
    return it != found_->end() && it->first == m ? &it->second : nullptr;
  }
  Order order(uint64_t m, bool left_larger, Join join) {
    if (m <= 1) return Order(m, 0);
    uint64_t a = left_larger ? m - m / 2 : m / 2;
    auto part = [&](uint64_t k) -> Order {
      if (const Order* o = known(k)) return *o;
      auto it = memo_.find(k);
      if (it != memo_.end()) return it->second;
      Order built = order(k, left_larger, join);
      memo_.emplace(k, built);
      return built;
    };
    return joined(part(a), part(m - a), join);
  }
  const std::vector<std::pair<uint64_t, Order>>* found_;
  std::map<uint64_t, Order> memo_;
};

// A fresh random order of x (std::shuffle's result is not the same on every
// standard library; this is).
template <class Input>
Input shuffled(const Input& x, uint64_t stream_seed) {
  Input out = x;
  std::mt19937_64 random(stream_seed);
  for (size_t i = out.size(); i > 1; --i) {
    size_t j = static_cast<size_t>(random() % i);
    std::swap(out[i - 1], out[j]);
  }
  return out;
}

// T(n) as a double (for the tightness ratio only): the integer, else the
// model's approximation.
inline double model_double(const ModelValue& v) {
  return v.integer ? static_cast<double>(*v.integer) : v.approx;
}

}  // namespace detail

// Guards `model` with `runner`: sizes from the claim's families up to max_n,
// ascending; at each, the runner's seeds, random inputs (see GuardOptions for
// how many), for vectors of numbers the usual shapes and orders built up from
// the costliest orders of smaller sizes, then an input search that mutates
// the costliest (cheapest, for a lower-bound model) inputs so far; every
// count compared with T(n) under the model's relation. Stops at the first
// violation (the smallest failing size), shrinks its input and re-runs the
// shrunk witness (a runner whose re-run differs is reported as not
// deterministic). Every run is bounded: for an upper-bound or exact model the
// run's counter stops it as soon as its count passes T(n) (a violation), and
// GuardOptions::run_time_limit bounds its time; GuardOptions::time_budget
// bounds the whole. Any failure of the maintainer's callbacks (a throw from
// run, inputs or its generator, seeds, mutate, shrink or show, a counter
// overflow, a run past its time limit), a runner without `inputs` or `run`,
// and a refused setting (THETAGATE_GUARD_N above max_n, an unparsable
// THETAGATE_GUARD_N, THETAGATE_GUARD_SEED or THETAGATE_GUARD_EFFORT, a bad
// run_time_limit or time_budget) end the check with GuardResult::error naming
// n and the input where there is one; none of them escapes. Throws only what
// Model throws: InputError where T has no value at a size, LimitReached. With
// check_bound, also checks model -> bound.
template <class Input>
GuardResult check_code(Model& model, const Runner<Input>& runner, GuardOptions options = {}) {
  using detail::RunOutcome;
  using Clock = std::chrono::steady_clock;
  const Clock::time_point started = Clock::now();
  GuardResult result;
  result.claim = model.name();
  result.runner = runner.name;
  result.relation = model.relation();
  auto seconds_since_start = [&] {
    return std::chrono::duration<double>(Clock::now() - started).count();
  };
  auto stop = [&](std::string why) -> GuardResult {
    result.error = std::move(why);
    result.seconds = seconds_since_start();
    return std::move(result);
  };

  // Settings first: a refused one runs nothing.
  if (!options.seed) {
    detail::EnvSetting env = detail::env_number("THETAGATE_GUARD_SEED");
    if (env.error) return stop(*env.error);
    options.seed = env.value.value_or(1);
  }
  result.seed = *options.seed;
  const uint64_t seed = result.seed;
  std::string only_n_from = "GuardOptions::only_n = ";
  if (!options.only_n) {
    detail::EnvSetting env = detail::env_number("THETAGATE_GUARD_N");
    if (env.error) return stop(*env.error);
    options.only_n = env.value;
    only_n_from = "THETAGATE_GUARD_N=";
  }
  const std::optional<uint64_t> only_n = options.only_n;
  const uint64_t max_n = options.max_n.value_or(model.max_n());
  if (only_n && (*only_n < 1 || *only_n > max_n)) {
    return stop(only_n_from + std::to_string(*only_n) +
                " is outside the sizes this guard runs, 1 to max_n = " + std::to_string(max_n) +
                ": replay a size the guard reported, or raise max_n (the claim's [claim.code] "
                "max_n, or GuardOptions::max_n)");
  }
  if (!(options.run_time_limit >= 0 && options.run_time_limit <= 1e6)) {
    return stop(
        "GuardOptions::run_time_limit must be a number of seconds from 0 to 1000000 "
        "(0: no limit), found " +
        detail::seconds_text(options.run_time_limit));
  }
  if (!(options.time_budget >= 0 && options.time_budget <= 1e6)) {
    return stop(
        "GuardOptions::time_budget must be a number of seconds from 0 to 1000000 "
        "(0: no budget), found " +
        detail::seconds_text(options.time_budget));
  }
  std::string effort_from = "GuardOptions::effort = ";
  if (!options.effort) {
    detail::EnvSetting env = detail::env_number("THETAGATE_GUARD_EFFORT");
    if (env.error) return stop(*env.error);
    options.effort = env.value.value_or(1);
    effort_from = "THETAGATE_GUARD_EFFORT=";
  }
  if (*options.effort < 1 || *options.effort > 1000) {
    return stop(effort_from + std::to_string(*options.effort) +
                " is outside 1 to 1000: it multiplies the guard's runs and time budget "
                "(1 for a unit test, 10 for a nightly run)");
  }
  const uint64_t effort = *options.effort;
  result.effort = effort;
  auto scaled = [&](uint64_t v) {
    return v > std::numeric_limits<uint64_t>::max() / effort ? std::numeric_limits<uint64_t>::max()
                                                             : v * effort;
  };
  const uint64_t inputs_most = scaled(options.inputs_per_size);
  const uint64_t search_most = scaled(options.search_steps);
  const uint64_t size_work = scaled(options.size_work);
  const uint64_t generated_work = scaled(options.generated_work);
  const double time_budget = options.time_budget * static_cast<double>(effort);
  const std::string runner_name =
      runner.name.empty() ? "the runner" : "runner '" + runner.name + "'";
  if (!runner.inputs) return stop(runner_name + " has no `inputs`: it is required");
  if (!runner.run) return stop(runner_name + " has no `run`: it is required");
  if (options.check_bound) result.bound = model.check_bound(seed);

  auto show = [&](const Input& x) -> std::string {
    try {
      return runner.show ? runner.show(x) : rc::toString(x);
    } catch (...) {
      return "<runner.show threw: " + detail::current_what() + ">";
    }
  };
  auto mutate = [&](const Input& x, uint64_t n, std::mt19937_64& random) -> std::optional<Input> {
    if (runner.mutate) return runner.mutate(x, n, random);
    if constexpr (detail::kDefaultVector<Input>) return detail::mutate_vector(x, random);
    return std::nullopt;
  };
  auto shrinks_of = [&](const Input& x) -> rc::Seq<Input> {
    if (runner.shrink) return runner.shrink(x);
    if constexpr (detail::kDefaultVector<Input>) return detail::shrink_vector(x);
    return rc::Seq<Input>();
  };
  // Lower-bound models search for the cheapest input, the others for the
  // costliest.
  const bool minimise = result.relation == Relation::kLowerBound;
  auto further = [&](uint64_t a, uint64_t b) { return minimise ? a < b : a > b; };
  // Shapes and built-up orders: vectors of numbers.
  const bool shapes = detail::kDefaultVector<Input> && options.shapes;

  // A replay runs the sizes below its own too, unreported, when orders are
  // built up from them: its inputs are then those of the full run.
  std::vector<SizeSample> sizes;
  if (only_n) {
    if (shapes) {
      for (const SizeSample& s : model.sizes(*only_n, seed, options.small_limit)) {
        if (s.n < *only_n) sizes.push_back(s);
      }
    }
    sizes.push_back({*only_n, "replay"});
  } else {
    sizes = model.sizes(max_n, seed, options.small_limit);
  }

  detail::Progress progress(options.progress.value_or(detail::stderr_is_terminal()),
                            "thetagate guard: '" + result.claim + "'");
  detail::Watchdog watchdog(options.run_time_limit);
  const std::string limit_text = detail::seconds_text(options.run_time_limit);
  // The costliest (cheapest) order found at each size run so far, ascending.
  std::vector<std::pair<uint64_t, detail::Order>> found_orders;
  bool budget_left = true;
  for (size_t size_index = 0; size_index < sizes.size(); ++size_index) {
    const SizeSample& size = sizes[size_index];
    const uint64_t n = size.n;
    const bool reported = !only_n || n == *only_n;
    progress.show(n, size_index, sizes.size(), seconds_since_start());
    if (budget_left && time_budget > 0 && seconds_since_start() > time_budget) {
      budget_left = false;
      result.budget_reached_at = n;
    }
    const std::string at_n = " at n = " + std::to_string(n);
    const std::string replay = "THETAGATE_GUARD_SEED=" + std::to_string(seed) +
                               " THETAGATE_GUARD_N=" + std::to_string(n) + " " +
                               options.replay_command;
    ModelValue value = model.value_at(n);
    const double model_approx = detail::model_double(value);
    auto sign_of = [&](uint64_t cost) -> int {
      if (value.integer) return cost < *value.integer ? -1 : cost > *value.integer ? 1 : 0;
      return model.compare(n, cost);
    };
    watchdog.set_message("thetagate guard: " + runner_name + " of '" + result.claim + "' is hung" +
                         at_n + ": it ran past its time limit of " + limit_text +
                         " s and then as long again without adding to its cost counter, so "
                         "it cannot be stopped; aborting the test process.\n  replay: " +
                         replay + "\n");

    // One bounded run: stopped by its counter past allowed_max (a violation)
    // or past the time limit; never throws.
    auto run = [&](const Input& x) -> RunOutcome {
      CostCounter cost;
      if (value.allowed_max) cost.set_ceiling(*value.allowed_max);
      cost.stop_when(watchdog.stop_flag());
      RunOutcome out;
      watchdog.arm();
      try {
        runner.run(n, x, cost);
      } catch (const RunStopped&) {
        // The counter says why, below.
      } catch (const CostOverflow& e) {
        out.kind = RunOutcome::kOverflow;
        out.what = e.what();
      } catch (const std::exception& e) {
        out.kind = RunOutcome::kThrew;
        out.what = e.what();
      } catch (...) {
        out.kind = RunOutcome::kThrew;
        out.standard = false;
      }
      const bool late = watchdog.disarm();
      out.cost = cost.count();
      // A count past the ceiling decides the run, whatever the code did after
      // the stop (swallowed it, threw, ran late).
      if (value.allowed_max && out.cost > *value.allowed_max) {
        out.kind = RunOutcome::kPassedCeiling;
      } else if (late) {
        out.kind = RunOutcome::kTimedOut;
      }
      return out;
    };
    auto breaks = [&](const RunOutcome& o) {
      return o.counted() && model.violates(sign_of(o.cost));
    };
    // Why a run gave no cost, as GuardResult::error.
    auto no_cost = [&](const RunOutcome& o, const Input& x) -> std::string {
      switch (o.kind) {
        case RunOutcome::kOverflow:
          return "the cost overflowed" + at_n + " on input " + show(x) + ": " + o.what;
        case RunOutcome::kTimedOut:
          return "the run" + at_n + " on input " + show(x) + " passed its time limit of " +
                 limit_text + " s (GuardOptions::run_time_limit) and was stopped at a count of " +
                 std::to_string(o.cost);
        default:
          if (!o.standard) {
            return "the runner threw a non-standard exception" + at_n + " on input " + show(x);
          }
          return "the runner threw" + at_n + " on input " + show(x) + ": " + o.what;
      }
    };
    auto rerun_text = [&](const RunOutcome& o) -> std::string {
      switch (o.kind) {
        case RunOutcome::kCounted:
        case RunOutcome::kPassedCeiling:
          return "counted " + std::to_string(o.cost);
        case RunOutcome::kOverflow:
          return "overflowed its cost counter";
        case RunOutcome::kTimedOut:
          return "passed its time limit";
        default:
          return o.standard ? "threw: " + o.what : "threw a non-standard exception";
      }
    };

    CostRow row;
    row.n = n;
    row.model = value.text;
    row.family = size.family;
    bool have_row = false;
    auto note = [&](uint64_t cost) {
      ++row.runs;
      if (reported) ++result.runs;
      if (!have_row || further(cost, row.cost)) {
        row.cost = cost;
        row.sign = sign_of(cost);
        row.ratio = model_approx > 0 ? static_cast<double>(cost) / model_approx : 0;
        have_row = true;
      }
    };
    auto push_row = [&] {
      if (have_row && reported) result.rows.push_back(row);
    };
    // A failing input: rebuild its shrinkable form, shrink it (within
    // max_shrink_runs), re-run the witness, record, stop.
    auto fail_with = [&](const std::function<rc::Shrinkable<Input>()>& rebuild, const Input& input,
                         const RunOutcome& found) {
      Input smallest = input;
      RunOutcome seen = found;  // the outcome that made `smallest` the witness
      uint64_t steps = 0;
      uint64_t budget = options.max_shrink_runs;
      std::optional<std::string> shrink_error;
      try {
        rc::Seq<rc::Shrinkable<Input>> shrinks = rebuild().shrinks();
        rc::Maybe<rc::Shrinkable<Input>> next;
        // Shrink toward the same failure: a candidate that throws is not one.
        while (budget > 0 && (next = shrinks.next())) {
          --budget;
          Input candidate = next->value();
          RunOutcome o = run(candidate);
          if (!breaks(o)) continue;
          smallest = std::move(candidate);
          seen = o;
          shrinks = next->shrinks();
          ++steps;
        }
      } catch (...) {
        shrink_error = "shrinking the failing input threw" + at_n + ": " + detail::current_what() +
                       "; the input shown is the smallest found before";
      }
      // The witness once more: a deterministic runner counts the same again.
      RunOutcome again = run(smallest);
      if (!again.counted() || again.cost != seen.cost) {
        result.error = "the runner is not deterministic" + at_n + ": on input " + show(smallest) +
                       " it counted " + std::to_string(seen.cost) + " (T(n) = " + value.text +
                       "), then " + rerun_text(again) +
                       " on a re-run of the same input; a guarded runner must count the same "
                       "cost for the same input (seed any randomness of its own from the input)";
      } else if (shrink_error) {
        result.error = shrink_error;
      }
      if (!breaks(again)) {
        if (have_row) result.rows.push_back(row);
        return;
      }
      Violation v;
      v.n = n;
      v.cost = again.cost;
      v.stopped = again.kind == RunOutcome::kPassedCeiling;
      v.model = value.text;
      v.input = show(smallest);
      v.shrinks = steps;
      v.replay = replay;
      result.violation = v;
      note(v.cost);
      result.rows.push_back(row);
    };

    // The few costliest inputs, for the search.
    constexpr size_t kKeep = 4;
    std::vector<std::pair<uint64_t, Input>> best;
    auto keep = [&](uint64_t cost, const Input& x) {
      if (best.size() < kKeep) {
        best.emplace_back(cost, x);
      } else {
        auto worst = std::min_element(best.begin(), best.end(), [&](const auto& a, const auto& b) {
          return further(b.first, a.first);
        });
        if (!further(cost, worst->first)) return;
        *worst = {cost, x};
      }
    };
    // Runs one input; true when the check ends here (a violation or an error).
    // `rebuild` gives its shrinkable form, called only when it fails.
    auto try_input = [&](const Input& x, const std::function<rc::Shrinkable<Input>()>& rebuild) {
      RunOutcome outcome = run(x);
      if (!outcome.counted()) {
        result.error = no_cost(outcome, x);
        return true;
      }
      if (breaks(outcome)) {
        if (reported) ++result.runs;
        fail_with(rebuild, x, outcome);
        return true;
      }
      note(outcome.cost);
      keep(outcome.cost, x);
      return false;
    };
    auto finish = [&]() -> GuardResult {
      result.seconds = seconds_since_start();
      return std::move(result);
    };
    auto own_shrinks = [&](const Input& x) {
      return [&shrinks_of, x] { return rc::shrinkable::shrinkRecur(x, shrinks_of); };
    };

    std::optional<rc::Gen<Input>> gen;
    try {
      gen.emplace(runner.inputs(n));
    } catch (...) {
      return stop("`inputs` of " + runner_name + " threw" + at_n + ": " + detail::current_what());
    }
    auto generated = [&](uint64_t i) {
      return (*gen)(rc::Random(detail::stream(seed, n, i)), 100);
    };
    auto generate_value = [&](uint64_t i, std::optional<Input>& into) -> bool {
      try {
        into.emplace(generated(i).value());
        return true;
      } catch (...) {
        result.error = "generating input " + std::to_string(i) + at_n + " failed (`inputs` of " +
                       runner_name + "): " + detail::current_what();
        return false;
      }
    };

    // Random inputs: the first from the generator always (the base of the
    // shapes); the rest while within the work of this size.
    const uint64_t per_size = std::max<uint64_t>(1, size_work / std::max<uint64_t>(n, 1));
    const uint64_t randoms =
        budget_left ? std::min(inputs_most, std::max(options.min_inputs, per_size)) : 1;
    const uint64_t from_generator =
        detail::kDefaultVector<Input>
            ? std::max<uint64_t>(1, std::min(randoms, generated_work / std::max<uint64_t>(n, 1)))
            : randoms;
    std::optional<Input> base;
    if (!generate_value(0, base)) return finish();
    if (try_input(*base, [&] { return generated(0); })) return finish();
    for (uint64_t i = 1; i < randoms; ++i) {
      if (i < from_generator) {
        std::optional<Input> x;
        if (!generate_value(i, x)) return finish();
        if (try_input(*x, [&generated, i] { return generated(i); })) return finish();
      } else if constexpr (detail::kDefaultVector<Input>) {
        // A fresh random order of the base: no generation, no shrink tree.
        const uint64_t order_seed = detail::stream(seed, n, i);
        auto reorder = [order_seed](const Input& x) { return detail::shuffled(x, order_seed); };
        Input x = reorder(*base);
        if (try_input(
                x, [&generated, reorder] { return rc::shrinkable::map(generated(0), reorder); })) {
          return finish();
        }
      }
    }

    // The runner's own seeds.
    if (runner.seeds) {
      std::vector<Input> seeds;
      try {
        seeds = runner.seeds(n);
      } catch (...) {
        return stop("`seeds` of " + runner_name + " threw" + at_n + ": " + detail::current_what());
      }
      for (const Input& x : seeds) {
        if (try_input(x, own_shrinks(x))) return finish();
      }
    }

    // The usual shapes of the base, and orders built up from smaller sizes.
    if constexpr (detail::kDefaultVector<Input>) {
      if (shapes) {
        const Input sorted_base = detail::sorted_copy(*base);
        for (detail::Shape shape : detail::kShapes) {
          auto reshape = [shape](const Input& x) { return detail::shaped(x, shape); };
          if (try_input(detail::shaped(*base, sorted_base, shape), [&generated, reshape] {
                return rc::shrinkable::map(generated(0), reshape);
              })) {
            return finish();
          }
        }
        if (base->size() == n && !found_orders.empty()) {
          detail::OrderBuilder builder(&found_orders);
          std::vector<detail::Order> tried;
          for (auto [left_larger, join] : detail::kBuilds) {
            std::optional<detail::Order> order = builder.build(n, left_larger, join);
            if (!order || std::find(tried.begin(), tried.end(), *order) != tried.end()) continue;
            tried.push_back(*order);
            auto arrange = [o = *order](const Input& x) { return detail::arranged(x, o); };
            if (try_input(detail::arranged_sorted(sorted_base, *order), [&generated, arrange] {
                  return rc::shrinkable::map(generated(0), arrange);
                })) {
              return finish();
            }
          }
        }
      }
    }

    // Input search: mutate the costliest inputs found so far, with fewer
    // steps where the model is loose (under half of T(n), or over twice it
    // for a lower bound).
    uint64_t steps =
        budget_left ? std::min(search_most, std::max(options.min_search_steps, per_size)) : 0;
    const bool loose = have_row && model_approx > 0 && (minimise ? row.ratio > 2 : row.ratio < 0.5);
    if (loose) steps = std::max(options.min_search_steps, steps / 2);
    if (!budget_left) steps = 0;
    std::mt19937_64 random(detail::stream(seed, n, ~uint64_t{0}));
    for (uint64_t step = 0; step < steps && !best.empty(); ++step) {
      const Input& parent = best[random() % best.size()].second;
      std::optional<Input> child;
      try {
        child = mutate(parent, n, random);
      } catch (...) {
        return stop("`mutate` of " + runner_name + " threw" + at_n + " on input " + show(parent) +
                    ": " + detail::current_what());
      }
      if (!child) break;
      if (try_input(*child, own_shrinks(*child))) return finish();
    }
    push_row();
    // The order of the costliest input here, for the sizes above.
    if (shapes && !best.empty()) {
      auto furthest = std::max_element(best.begin(), best.end(), [&](const auto& a, const auto& b) {
        return further(b.first, a.first);
      });
      if (furthest->second.size() == n)
        found_orders.emplace_back(n, detail::order_of(furthest->second));
    }
  }
  return [&] {
    result.seconds = seconds_since_start();
    return std::move(result);
  }();
}

namespace gen {

// Sizes the size families produce (powers, 2^k ± 1, all-odd halving chains,
// 3·2^k, random per scale, ...) for a recurrence with the given divisors,
// every n in [1, max_n]; each equally likely. REQUIRES: max_n >= 1.
inline rc::Gen<uint64_t> adversarial_size(uint64_t max_n,
                                          const std::vector<uint64_t>& divisors = {2},
                                          uint64_t seed = 1) {
  std::string recurrence = "T(n) = n";
  for (uint64_t b : divisors) recurrence += " + T(n/" + std::to_string(b < 2 ? 2 : b) + ")";
  Model model = Model::from_text("adversarial sizes", recurrence + "; T(1) = 1", "O(n^2)");
  std::vector<uint64_t> sizes;
  for (const SizeSample& s : model.sizes(max_n, seed, 16)) sizes.push_back(s.n);
  return rc::gen::elementOf(sizes);
}

}  // namespace gen

}  // namespace thetagate::guard

#endif  // THETAGATE_TESTING_RAPIDCHECK_H_
