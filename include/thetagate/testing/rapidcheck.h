// The runner side of guarding code: run the code under test at the claim's
// adversarial sizes, on inputs from the maintainer's RapidCheck generator and
// on inputs an input search makes costlier, count its cost, compare every
// count with T(n) exactly, and shrink an input that breaks the model.
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

#include <algorithm>
#include <atomic>
#include <chrono>
#include <condition_variable>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <exception>
#include <functional>
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
};

struct GuardOptions {
  // Every random choice comes from this. Default: THETAGATE_GUARD_SEED when
  // set, else 1.
  std::optional<uint64_t> seed;
  // Largest size run; default: the claim's [claim.code] max_n (65536).
  std::optional<uint64_t> max_n;
  // Only this size (replaying a failure); default: THETAGATE_GUARD_N when set.
  std::optional<uint64_t> only_n;
  uint64_t inputs_per_size = 50;    // generated inputs at every size
  uint64_t search_steps = 50;       // mutations of the costliest inputs, per size
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

}  // namespace detail

// Guards `model` with `runner`: sizes from the claim's families up to max_n;
// at each, `inputs_per_size` generated inputs and `search_steps` mutations
// of the costliest (cheapest, for a lower-bound model) inputs so far; every
// count compared with T(n) under the model's relation. Stops at the first
// violation (the smallest failing size), shrinks its input and re-runs the
// shrunk witness (a runner whose re-run differs is reported as not
// deterministic). Every run is bounded: for an upper-bound or exact model the
// run's counter stops it as soon as its count passes T(n) (a violation), and
// GuardOptions::run_time_limit bounds its time. Any failure of the
// maintainer's callbacks (a throw from run, inputs or its generator, mutate,
// shrink or show, a counter overflow, a run past its time limit), a runner
// without `inputs` or `run`, and a refused setting (THETAGATE_GUARD_N above
// max_n, an unparsable THETAGATE_GUARD_N or THETAGATE_GUARD_SEED, a bad
// run_time_limit) end the check with GuardResult::error naming n and the
// input where there is one; none of them escapes. Throws only what Model
// throws: InputError where T has no value at a size, LimitReached. With
// check_bound, also checks model -> bound.
template <class Input>
GuardResult check_code(Model& model, const Runner<Input>& runner, GuardOptions options = {}) {
  using detail::RunOutcome;
  GuardResult result;
  result.claim = model.name();
  result.runner = runner.name;
  result.relation = model.relation();
  auto stop = [&](std::string why) -> GuardResult {
    result.error = std::move(why);
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

  std::vector<SizeSample> sizes;
  if (only_n) {
    sizes.push_back({*only_n, "replay"});
  } else {
    sizes = model.sizes(max_n, seed, options.small_limit);
  }

  detail::Watchdog watchdog(options.run_time_limit);
  const std::string limit_text = detail::seconds_text(options.run_time_limit);
  for (const SizeSample& size : sizes) {
    const uint64_t n = size.n;
    const std::string at_n = " at n = " + std::to_string(n);
    const std::string replay = "THETAGATE_GUARD_SEED=" + std::to_string(seed) +
                               " THETAGATE_GUARD_N=" + std::to_string(n) + " " +
                               options.replay_command;
    ModelValue value = model.value_at(n);
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
      if (!have_row || further(cost, row.cost)) {
        row.cost = cost;
        row.sign = sign_of(cost);
        have_row = true;
      }
    };
    // A failing input: shrink it (within max_shrink_runs), re-run the
    // witness, record, stop.
    auto fail_with = [&](const rc::Shrinkable<Input>& failing, const Input& input,
                         const RunOutcome& found) {
      Input smallest = input;
      RunOutcome seen = found;  // the outcome that made `smallest` the witness
      uint64_t steps = 0;
      uint64_t budget = options.max_shrink_runs;
      std::optional<std::string> shrink_error;
      try {
        rc::Seq<rc::Shrinkable<Input>> shrinks = failing.shrinks();
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

    // Generated inputs, keeping the few costliest for the search.
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
    std::optional<rc::Gen<Input>> gen;
    try {
      gen.emplace(runner.inputs(n));
    } catch (...) {
      return stop("`inputs` of " + runner_name + " threw" + at_n + ": " + detail::current_what());
    }
    for (uint64_t i = 0; i < options.inputs_per_size; ++i) {
      std::optional<rc::Shrinkable<Input>> shrinkable;
      std::optional<Input> x;
      try {
        shrinkable.emplace((*gen)(rc::Random(detail::stream(seed, n, i)), 100));
        x.emplace(shrinkable->value());
      } catch (...) {
        return stop("generating input " + std::to_string(i) + at_n + " failed (`inputs` of " +
                    runner_name + "): " + detail::current_what());
      }
      RunOutcome outcome = run(*x);
      if (!outcome.counted()) return stop(no_cost(outcome, *x));
      ++result.runs;
      if (breaks(outcome)) {
        fail_with(*shrinkable, *x, outcome);
        return result;
      }
      note(outcome.cost);
      keep(outcome.cost, *x);
    }
    // Input search: mutate the costliest inputs found so far.
    std::mt19937_64 random(detail::stream(seed, n, ~uint64_t{0}));
    for (uint64_t step = 0; step < options.search_steps && !best.empty(); ++step) {
      const Input& parent = best[random() % best.size()].second;
      std::optional<Input> child;
      try {
        child = mutate(parent, n, random);
      } catch (...) {
        return stop("`mutate` of " + runner_name + " threw" + at_n + " on input " + show(parent) +
                    ": " + detail::current_what());
      }
      if (!child) break;
      RunOutcome outcome = run(*child);
      if (!outcome.counted()) return stop(no_cost(outcome, *child));
      ++result.runs;
      if (breaks(outcome)) {
        Input failing = *child;
        fail_with(rc::shrinkable::shrinkRecur(std::move(failing), shrinks_of), *child, outcome);
        return result;
      }
      note(outcome.cost);
      keep(outcome.cost, *child);
    }
    if (have_row) result.rows.push_back(row);
  }
  return result;
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
