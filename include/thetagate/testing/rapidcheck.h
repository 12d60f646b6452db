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
// (THETAGATE_GUARD_N) replays a failure exactly.
#ifndef THETAGATE_TESTING_RAPIDCHECK_H_
#define THETAGATE_TESTING_RAPIDCHECK_H_

#include <rapidcheck.h>
#include <rapidcheck/shrink/Shrink.h>

#include <algorithm>
#include <cstdint>
#include <cstdlib>
#include <exception>
#include <functional>
#include <optional>
#include <random>
#include <string>
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
  // cost to `cost`. May throw: that is reported as an error naming n and the
  // input.
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
  // Prefix of the replay command: the test binary and its filter (gtest.h
  // fills it in); the seed and size are prepended as environment variables.
  std::string replay_command = "<your test command>";
};

namespace detail {

inline std::optional<uint64_t> env_number(const char* name) {
  const char* text = std::getenv(name);
  if (text == nullptr || *text == '\0') return std::nullopt;
  char* end = nullptr;
  unsigned long long v = std::strtoull(text, &end, 10);
  if (end == text || *end != '\0') return std::nullopt;
  return static_cast<uint64_t>(v);
}

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
// violation (the smallest failing size) and shrinks its input, or at the
// first runner exception or counter overflow (an error naming n and the
// input). With check_bound, also checks model -> bound.
template <class Input>
GuardResult check_code(Model& model, const Runner<Input>& runner, GuardOptions options = {}) {
  GuardResult result;
  result.claim = model.name();
  result.runner = runner.name;
  result.relation = model.relation();
  result.seed = options.seed.value_or(detail::env_number("THETAGATE_GUARD_SEED").value_or(1));
  const uint64_t seed = result.seed;
  std::optional<uint64_t> only_n = options.only_n;
  if (!only_n) only_n = detail::env_number("THETAGATE_GUARD_N");
  if (options.check_bound) result.bound = model.check_bound(seed);

  auto show = [&](const Input& x) { return runner.show ? runner.show(x) : rc::toString(x); };
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
  uint64_t max_n = options.max_n.value_or(model.max_n());
  if (only_n) {
    sizes.push_back({*only_n, "replay"});
  } else {
    sizes = model.sizes(max_n, seed, options.small_limit);
  }

  for (const SizeSample& size : sizes) {
    const uint64_t n = size.n;
    ModelValue value = model.value_at(n);
    auto sign_of = [&](uint64_t cost) -> int {
      if (value.integer) return cost < *value.integer ? -1 : cost > *value.integer ? 1 : 0;
      return model.compare(n, cost);
    };
    // One run; nullopt after recording an error.
    auto run_once = [&](const Input& x) -> std::optional<uint64_t> {
      CostCounter cost;
      try {
        runner.run(n, x, cost);
      } catch (const CostOverflow& e) {
        result.error = "the cost overflowed at n = " + std::to_string(n) + " on input " + show(x) +
                       ": " + e.what();
        return std::nullopt;
      } catch (const std::exception& e) {
        result.error = "the runner threw at n = " + std::to_string(n) + " on input " + show(x) +
                       ": " + e.what();
        return std::nullopt;
      } catch (...) {
        result.error = "the runner threw a non-standard exception at n = " + std::to_string(n) +
                       " on input " + show(x);
        return std::nullopt;
      }
      ++result.runs;
      return cost.count();
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
    // A failing input: shrink it (within max_shrink_runs), record, stop.
    auto fail_with = [&](const rc::Shrinkable<Input>& failing, uint64_t cost) {
      uint64_t budget = options.max_shrink_runs;
      auto still_fails = [&](const Input& x) {
        if (budget == 0) return false;
        --budget;
        CostCounter c;
        try {
          runner.run(n, x, c);
        } catch (...) {
          return false;  // shrink toward the same failure, not another one
        }
        return model.violates(sign_of(c.count()));
      };
      auto [smallest, steps] = rc::shrinkable::findLocalMin(failing, still_fails);
      CostCounter c;
      runner.run(n, smallest, c);
      Violation v;
      v.n = n;
      v.cost = steps > 0 ? c.count() : cost;
      v.model = value.text;
      v.input = show(smallest);
      v.shrinks = steps;
      v.replay = "THETAGATE_GUARD_SEED=" + std::to_string(seed) +
                 " THETAGATE_GUARD_N=" + std::to_string(n) + " " + options.replay_command;
      result.violation = v;
      note(v.cost);
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
    rc::Gen<Input> gen = runner.inputs(n);
    for (uint64_t i = 0; i < options.inputs_per_size; ++i) {
      rc::Shrinkable<Input> shrinkable = gen(rc::Random(detail::stream(seed, n, i)), 100);
      Input x = shrinkable.value();
      std::optional<uint64_t> cost = run_once(x);
      if (!cost) return result;
      if (model.violates(sign_of(*cost))) {
        fail_with(shrinkable, *cost);
        result.rows.push_back(row);
        return result;
      }
      note(*cost);
      keep(*cost, x);
    }
    // Input search: mutate the costliest inputs found so far.
    std::mt19937_64 random(detail::stream(seed, n, ~uint64_t{0}));
    for (uint64_t step = 0; step < options.search_steps && !best.empty(); ++step) {
      const Input& parent = best[random() % best.size()].second;
      std::optional<Input> child = mutate(parent, n, random);
      if (!child) break;
      std::optional<uint64_t> cost = run_once(*child);
      if (!cost) return result;
      if (model.violates(sign_of(*cost))) {
        Input failing = *child;
        fail_with(rc::shrinkable::shrinkRecur(std::move(failing), shrinks_of), *cost);
        result.rows.push_back(row);
        return result;
      }
      note(*cost);
      keep(*cost, *child);
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
