// Fuzz target: a whole check of the claims in one claim file, at a small
// effort and small sizes, rendered as text and JSON. check_entries never
// throws for bad input.
#include "fuzz/fuzz_common.h"
#include "reports/json_report.h"
#include "reports/text_report.h"
#include "verifier/checking/checker.h"
#include "verifier/model/claim.h"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace thetagate::engine;
  std::vector<ClaimEntry> entries = load_claim_text(fuzz::text_of(data, size), "<fuzz>.toml");
  if (entries.size() > 2) entries.resize(2);
  CheckOptions options;
  options.max_bits = 96;
  options.exhaustive_limit = 200;
  options.work_budget = 20'000;
  options.budget = fuzz::small_budget();
  RunResult run = check_entries(entries, options);
  render_text(run, TextStyle{});
  render_json(run);
  return 0;
}
