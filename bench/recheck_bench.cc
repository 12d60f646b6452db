// Benchmarks of the re-checker's rule for induction on dyadic blocks
// (verifier/recheck/dyadic_rule.cc), on the certificates the prover writes
// for the demo's two exact counts and for merge sort's tight constant.
// Target (2-core machine): each well under 100 ms, so that `check --recheck`
// costs nothing next to the check itself (about 1.3 s per claim file).
#include <benchmark/benchmark.h>

#include <string>
#include <vector>

#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"
#include "verifier/recheck/rules.h"
#include "verifier/syntax/parser.h"

namespace {

using thetagate::engine::Bound;
using thetagate::engine::parse_bound;
using thetagate::engine::recurrence_from_text;
using thetagate::engine::SourceText;
using thetagate::engine::recheck::CertificateData;
using thetagate::engine::recheck::check_certificate;
using thetagate::engine::recheck::RuleStatus;

void recheck_dyadic(benchmark::State& state, const char* recurrence, const char* bound,
                    const char* hypothesis, const char* closed_form) {
  auto r = recurrence_from_text(recurrence);
  Bound b = parse_bound(SourceText::whole("<bound>", bound));
  CertificateData c;
  c.method = "dyadic-induction";
  c.sides = closed_form[0] ? std::vector<std::string>{"upper"}
                           : std::vector<std::string>{"upper", "lower"};
  c.hypothesis = hypothesis;
  c.checked_from = "1";
  c.checked_to = "63";
  c.closed_form = closed_form;
  for (auto _ : state) {
    auto out = check_certificate(*r, b, c);
    if (out.status != RuleStatus::kRechecked) state.SkipWithError(out.detail.c_str());
    benchmark::DoNotOptimize(out);
  }
}

void BM_RecheckDyadicFindSortedProbes(benchmark::State& state) {
  recheck_dyadic(state, "T(n) = T(floor(n/2)) + 1; T(1) = 1", "T(n) = floor(lg n) + 1 for n >= 1",
                 "= floor(lg(n)) + 1", "");
}
BENCHMARK(BM_RecheckDyadicFindSortedProbes)->Unit(benchmark::kMillisecond);

void BM_RecheckDyadicStableSortWorstCase(benchmark::State& state) {
  recheck_dyadic(state, "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0",
                 "T(n) = n ceil(lg n) - 2^ceil(lg n) + 1 for n >= 1",
                 "= n*ceil(lg(n)) - 2^ceil(lg(n)) + 1", "");
}
BENCHMARK(BM_RecheckDyadicStableSortWorstCase)->Unit(benchmark::kMillisecond);

void BM_RecheckDyadicMergeSortTightConstant(benchmark::State& state) {
  recheck_dyadic(state, "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0",
                 "T(n) <= n lg n - 0.9139286 n + 1 for n >= 10^8", "<= n*lg(n) - 0.9139286*n + 1",
                 "n*floor(lg(n)) + n - 2*2^floor(lg(n)) + 1");
}
BENCHMARK(BM_RecheckDyadicMergeSortTightConstant)->Unit(benchmark::kMillisecond);

}  // namespace
