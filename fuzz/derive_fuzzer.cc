// Fuzz target: derive, as `thetagate derive` runs it (the recurrence
// validated first), with its text and JSON renderings.
#include "fuzz/fuzz_common.h"
#include "reports/derivation_report.h"
#include "verifier/derivation/derive.h"
#include "verifier/model/recurrence.h"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace thetagate::engine;
  try {
    auto recurrence = recurrence_from_text(fuzz::text_of(data, size), "<fuzz>");
    check_calls_shrink(*recurrence);
    Derivation d = derive(*recurrence);
    render_derivation_text(d);
    render_derivation_json(d);
  } catch (const InputError&) {
  } catch (const BudgetExceeded&) {
  }
  return 0;
}
