// Fuzz target: the independent re-checker on arbitrary JSON reports,
// against a fixed set of orchard claims. Whatever the certificate says, the
// re-checker must answer (re-checked, rejected or not re-checked) or refuse
// the report as input: no crash, no hang.
#include <map>

#include "fuzz/fuzz_common.h"
#include "verifier/model/claim.h"
#include "verifier/recheck/recheck.h"

namespace {

const std::multimap<std::string, thetagate::engine::Claim>& claims() {
  static const auto* table = [] {
    auto* out = new std::multimap<std::string, thetagate::engine::Claim>;
    const char* text = R"toml([[claim]]
name = "merge"
recurrence = """
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
"""
bound = "Theta(n lg n)"

[[claim]]
name = "merge, explicit"
recurrence = """
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
"""
bound = "T(n) <= 2 n lg n for n >= 2"

[[claim]]
name = "parity"
recurrence = """
T(n) = T(n/2) + f(n)
T(1) = 1
f(n) = n^2 if n even
f(n) = n^2/8
"""
bound = "Theta(n^2)"

[[claim]]
name = "scan"
recurrence = """
T(n) = T(n - 1) + n - 1
T(1) = 0
"""
bound = "T(n) = n(n - 1)/2"

[[claim]]
name = "rope"
recurrence = """
T(n) = T(n - 1) + T(n - 2) + 1
T(1) = 1
T(0) = 1
"""
bound = "Theta(((1 + sqrt(5))/2)^n)"

[[claim]]
name = "quick"
recurrence = """
C(n) = n - 1 + (2/n) sum(k, 0, n - 1, C(k))
C(0) = 0
"""
bound = "Theta(n lg n)"

[[claim]]
name = "levels"
recurrence = """
T(n) = 1 if n <= 2
T(n) = T(floor(sqrt(n))) + 1
"""
bound = "Theta(lg lg n)"

[[claim]]
name = "probes"
recurrence = """
T(n) = T(floor(n/2)) + 1
T(1) = 1
"""
bound = "T(n) = floor(lg n) + 1 for n >= 1"

[[claim]]
name = "merge, tight"
recurrence = """
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
"""
bound = "T(n) <= n lg n - 0.9139286 n + 1 for n >= 10^8"
)toml";
    for (auto& entry : thetagate::engine::load_claim_text(text, "orchard.toml"))
      if (entry.claim) out->emplace(entry.name, *entry.claim);
    return out;
  }();
  return *table;
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  using namespace thetagate::engine;
  try {
    recheck::recheck_report(fuzz::text_of(data, size), "<fuzz>.json", claims());
  } catch (const InputError&) {
  }
  return 0;
}
