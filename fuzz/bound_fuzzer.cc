// Fuzz target: a bound ("Theta(n lg n)", "T(n) <= 3n for n >= 2") parsed,
// printed, and its sides evaluated at a few sizes.
#include "fuzz/fuzz_common.h"
#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace thetagate::engine;
  SourceText source = SourceText::whole("<fuzz bound>", fuzz::text_of(data, size));
  try {
    Bound bound = parse_bound(source, "T");
    bound.text();
    Evaluator evaluator(recurrence_from_text("T(n) = 2T(n/2) + n; T(1) = 1"), fuzz::small_budget());
    for (const ExprPtr& side : {bound.growth, bound.lower, bound.upper}) {
      if (!side) continue;
      for (int n : {2, 17, 1000}) {
        try {
          evaluator.evaluate(*side, source, BigInt(n));
        } catch (const PrecisionShortfall&) {
        }
      }
    }
  } catch (const InputError&) {
  } catch (const BudgetExceeded&) {
  }
  return 0;
}
