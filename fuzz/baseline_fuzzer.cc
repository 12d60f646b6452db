// Fuzz target: the baseline reader (a JSON report read back), and drift
// against the report it read.
#include "fuzz/fuzz_common.h"
#include "reports/baseline.h"
#include "reports/drift.h"
#include "reports/json_report.h"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace thetagate::engine;
  try {
    RunResult run = read_json_report(fuzz::text_of(data, size), "<fuzz>.json");
    render_json(run);
    compare_runs(run, run);
  } catch (const InputError&) {
  }
  return 0;
}
