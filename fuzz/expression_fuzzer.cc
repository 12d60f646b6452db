// Fuzz target for the expression and recurrence grammar. Any input must end
// in a value, an InputError or a BudgetExceeded: never a crash, a hang, or
// another exception. Built with libFuzzer when THETAGATE_FUZZ=ON (clang);
// replay_main.cc runs saved inputs through the same function without it.
#include <cstddef>
#include <cstdint>
#include <string>

#include "verifier/evaluation/evaluator.h"
#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace thetagate::engine;
  std::string text(reinterpret_cast<const char*>(data), size);
  // A line "---" splits the input into a recurrence and a bound.
  std::string bound_text;
  if (size_t split = text.find("\n---\n"); split != std::string::npos) {
    bound_text = text.substr(split + 5);
    text.resize(split);
  }
  try {
    auto recurrence = recurrence_from_text(text, "<fuzz>");
    if (!bound_text.empty()) parse_bound(SourceText::whole("<fuzz bound>", bound_text));
    Budget budget;
    budget.max_steps = 20'000;
    budget.max_memo_entries = 20'000;
    budget.max_value_bits = 1 << 14;
    budget.max_seconds = 1.0;
    budget.max_precision_bits = 1 << 10;
    Evaluator evaluator(recurrence, budget);
    for (int n = 0; n < 40; ++n) evaluator.value_at(BigInt(n));
    evaluator.value_at(BigInt(1) << 70);
  } catch (const InputError&) {
  } catch (const BudgetExceeded&) {
  }
  return 0;
}
