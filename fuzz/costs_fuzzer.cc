// Fuzz target: a costs file (one "size cost" per line) checked against a
// merge-sort claim. Lines may be long, unsorted, commented, malformed; every
// input ends in a result or a located InputError / BudgetExceeded, in time
// about linear in its length.
#include "fuzz/fuzz_common.h"
#include "verifier/checking/code_check.h"
#include "verifier/model/claim.h"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace thetagate::engine;
  static const std::vector<ClaimEntry> entries = load_claim_text(
      "[[claim]]\nname = \"orchard::stable_sort\"\n"
      "recurrence = \"T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0\"\n"
      "bound = \"Theta(n lg n)\"\n[claim.code]\ncosts = \"costs.txt\"\n",
      "fuzz.toml");
  try {
    CodeResult r = check_costs_text(*entries.at(0).claim, fuzz::text_of(data, size));
    (void)r;
  } catch (const InputError& e) {
    (void)format_diagnostic(e.diagnostic());
  } catch (const BudgetExceeded&) {
  }
  return 0;
}
