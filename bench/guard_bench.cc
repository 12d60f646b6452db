// The guard's targets (docs/guard.md): the orchard merge sort guarded at every
// family size up to 2^16 at the default options (random inputs and search steps
// by size, shapes, built-up orders) on one core, and its parts (generation,
// runs).
#include <benchmark/benchmark.h>

#include <algorithm>
#include <vector>

#include "examples/orchard/include/orchard/sort.h"
#include "thetagate/testing/rapidcheck.h"

namespace {

using thetagate::CostCounter;
using thetagate::guard::Model;
using thetagate::guard::Runner;

const char* kMerge = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0";

Runner<std::vector<int>> sort_runner() {
  Runner<std::vector<int>> runner;
  runner.name = "orchard::stable_sort";
  runner.inputs = [](uint64_t n) {
    return rc::gen::container<std::vector<int>>(n, rc::gen::inRange<int>(0, 1 + n / 2));
  };
  runner.run = [](uint64_t, const std::vector<int>& input, CostCounter& cost) {
    std::vector<int> v = input;
    orchard::stable_sort(v, thetagate::counting(cost));
  };
  return runner;
}

// The target: at most 2 s on one core (CPU time), with the model -> bound
// check (argument 1) and without it (0).
void BM_GuardMergeSortTo2e16(benchmark::State& state) {
  Model model = Model::from_text("merge", kMerge, "Theta(n lg n)");
  thetagate::guard::GuardOptions options;
  options.seed = 1;
  options.max_n = 65536;
  options.check_bound = state.range(0) != 0;
  uint64_t runs = 0, sizes = 0;
  for (auto _ : state) {
    auto result = thetagate::guard::check_code(model, sort_runner(), options);
    if (!result.passed()) state.SkipWithError("the guard failed");
    runs = result.runs;
    sizes = result.rows.size();
  }
  state.counters["runs"] = static_cast<double>(runs);
  state.counters["sizes"] = static_cast<double>(sizes);
}
BENCHMARK(BM_GuardMergeSortTo2e16)->Arg(0)->Arg(1)->Unit(benchmark::kSecond)->Iterations(1);

// Where the time goes at the largest size: generating one input of 2^16
// elements with RapidCheck, against sorting it with counting.
void BM_GenerateInput2e16(benchmark::State& state) {
  auto gen = sort_runner().inputs(65536);
  uint64_t i = 0;
  for (auto _ : state) {
    auto v = gen(rc::Random(++i), 100).value();
    benchmark::DoNotOptimize(v.data());
  }
}
BENCHMARK(BM_GenerateInput2e16)->Unit(benchmark::kMillisecond);

void BM_CountedSort2e16(benchmark::State& state) {
  auto input = sort_runner().inputs(65536)(rc::Random(1), 100).value();
  auto runner = sort_runner();
  for (auto _ : state) {
    CostCounter cost;
    runner.run(65536, input, cost);
    benchmark::DoNotOptimize(cost.count());
  }
}
BENCHMARK(BM_CountedSort2e16)->Unit(benchmark::kMillisecond);

}  // namespace
