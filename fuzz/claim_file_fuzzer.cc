// Fuzz target: a whole claim file (TOML) read into claims. Never throws:
// every problem is an error entry.
#include "fuzz/fuzz_common.h"
#include "verifier/model/claim.h"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace thetagate::engine;
  for (const ClaimEntry& entry : load_claim_text(fuzz::text_of(data, size), "<fuzz>.toml")) {
    if (entry.error) format_diagnostic(*entry.error);
  }
  return 0;
}
