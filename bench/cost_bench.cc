// Overhead of counting: the same sort with a plain comparator and with a
// counted one (include/thetagate/cost.h). The difference per comparison is the
// price of one counted comparison.
#include <benchmark/benchmark.h>

#include <algorithm>
#include <cstdint>
#include <vector>

#include "generators/random_bits.h"
#include "thetagate/cost.h"

namespace {

std::vector<uint32_t> shuffled(size_t n) {
  thetagate::engine::SplitMix64 bits(12345);
  std::vector<uint32_t> v(n);
  for (auto& x : v) x = static_cast<uint32_t>(bits.next());
  return v;
}

constexpr size_t kSortN = 1 << 14;

void BM_SortPlain(benchmark::State& state) {
  const auto input = shuffled(kSortN);
  uint64_t comparisons = 0;
  for (auto _ : state) {
    auto v = input;
    std::sort(v.begin(), v.end(), [](uint32_t a, uint32_t b) { return a < b; });
    benchmark::DoNotOptimize(v.data());
  }
  {  // the comparison count, outside the timed loop, for the per-item rate
    auto v = input;
    thetagate::CostCounter c;
    std::sort(v.begin(), v.end(), thetagate::counting(c));
    comparisons = c.count();
  }
  state.SetItemsProcessed(static_cast<int64_t>(state.iterations() * comparisons));
}
BENCHMARK(BM_SortPlain);

void BM_SortCounted(benchmark::State& state) {
  const auto input = shuffled(kSortN);
  uint64_t comparisons = 0;
  for (auto _ : state) {
    auto v = input;
    thetagate::CostCounter c;
    std::sort(v.begin(), v.end(), thetagate::counting(c));
    comparisons = c.count();
    benchmark::DoNotOptimize(comparisons);
  }
  state.SetItemsProcessed(static_cast<int64_t>(state.iterations() * comparisons));
}
BENCHMARK(BM_SortCounted);

void BM_SortCountedShared(benchmark::State& state) {
  const auto input = shuffled(kSortN);
  uint64_t comparisons = 0;
  for (auto _ : state) {
    auto v = input;
    thetagate::SharedCostCounter c;
    std::sort(v.begin(), v.end(), thetagate::counting(c));
    comparisons = c.count();
  }
  state.SetItemsProcessed(static_cast<int64_t>(state.iterations() * comparisons));
}
BENCHMARK(BM_SortCountedShared);

// The bare add(): a loop of counted adds against a loop of plain adds.
void BM_CounterAdd(benchmark::State& state) {
  for (auto _ : state) {
    thetagate::CostCounter c;
    for (int i = 0; i < 1024; ++i) {
      c.add(1);
      benchmark::ClobberMemory();
    }
    benchmark::DoNotOptimize(c.count());
  }
  state.SetItemsProcessed(state.iterations() * 1024);
}
BENCHMARK(BM_CounterAdd);

}  // namespace
