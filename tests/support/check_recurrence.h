// Checks one claim given as a recurrence and a bound, as a claim file holds
// them (the recurrence in a multi-line string), with a fixed seed: the
// shape most verdict tests need.
#ifndef THETAGATE_TESTS_SUPPORT_CHECK_RECURRENCE_H_
#define THETAGATE_TESTS_SUPPORT_CHECK_RECURRENCE_H_

#include <gtest/gtest.h>

#include <cstdint>
#include <string>
#include <vector>

#include "verifier/checking/checker.h"
#include "verifier/model/claim.h"

namespace thetagate::engine::test_support {

struct RecurrenceCheck {
  uint64_t seed = 5;
  uint64_t max_bits = 256;
  std::string name = "orchard::claim";  // the claim's name, and its file's stem
};

// A claim that does not load is a test failure and a default result.
inline ClaimResult check_recurrence(const std::string& recurrence, const std::string& bound,
                                    const RecurrenceCheck& how = {}) {
  std::string toml = "[[claim]]\nname = \"" + how.name + "\"\nrecurrence = \"\"\"\n" + recurrence +
                     "\n\"\"\"\nbound = \"" + bound + "\"\n";
  std::vector<ClaimEntry> entries = load_claim_text(toml, "claim.toml");
  if (entries.size() != 1 || !entries[0].claim) {
    ADD_FAILURE() << "the claim did not load: " << recurrence;
    return ClaimResult{};
  }
  CheckOptions options;
  options.seed = how.seed;
  options.max_bits = how.max_bits;
  return check_claim(*entries[0].claim, options);
}

}  // namespace thetagate::engine::test_support

#endif  // THETAGATE_TESTS_SUPPORT_CHECK_RECURRENCE_H_
