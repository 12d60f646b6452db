// Shared by the fuzz targets: small budgets, so that one input runs in
// milliseconds, and the rule every target enforces: an input ends in a
// result, an InputError or a BudgetExceeded; anything else (a crash, a
// hang, another exception) is a finding.
#ifndef THETAGATE_FUZZ_FUZZ_COMMON_H_
#define THETAGATE_FUZZ_FUZZ_COMMON_H_

#include <cstddef>
#include <cstdint>
#include <string>

#include "verifier/evaluation/evaluator.h"

namespace thetagate::engine::fuzz {

inline std::string text_of(const uint8_t* data, size_t size) {
  return std::string(reinterpret_cast<const char*>(data), size);
}

inline Budget small_budget() {
  Budget budget;
  budget.max_steps = 20'000;
  budget.max_memo_entries = 20'000;
  budget.max_memo_bytes = 64 << 20;
  budget.max_value_bits = 1 << 14;
  budget.max_seconds = 1.0;  // a guard only; the work limits end evaluations
  budget.max_precision_bits = 1 << 10;
  return budget;
}

}  // namespace thetagate::engine::fuzz

#endif  // THETAGATE_FUZZ_FUZZ_COMMON_H_
