// A whole check run: claim files in, one RunResult out. Loads files, picks
// claims by name, checks them (in parallel when asked: the result is the
// same as a serial run, claim for claim), and reports progress.
#ifndef THETAGATE_VERIFIER_CHECKING_RUN_H_
#define THETAGATE_VERIFIER_CHECKING_RUN_H_

#include <functional>
#include <string>
#include <vector>

#include "verifier/checking/checker.h"
#include "verifier/checking/result.h"

namespace thetagate::engine {

struct RunRequest {
  std::vector<std::string> paths;        // files or folders; empty means "claims"
  std::vector<std::string> claim_names;  // only these claims (exact names); empty = all
  CheckOptions options;
  unsigned jobs = 1;  // claims checked at once, at most (see memory_limit)
  // The memory all workers may hold together. Each claim may use up to its
  // budget's max_memo_bytes, so at most memory_limit / max_memo_bytes claims
  // (and at least one) are checked at once, whatever `jobs` says. Only the
  // number of threads changes: the report is the same.
  uint64_t memory_limit = uint64_t{2} << 30;
  // Called after each claim finishes, from the thread that checked it,
  // serialised: (claims done, claims in total, the claim's name).
  std::function<void(size_t, size_t, const std::string&)> progress;
};

// Throws InputError for a path that does not exist, or a --claim name that
// no file defines (with the closest names as a hint). Bad claims become
// `error` results; the others are checked.
RunResult run_check(const RunRequest& request);

// The number of claims run_check checks at once for `claims` claims.
unsigned workers_for(const RunRequest& request, size_t claims);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_RUN_H_
