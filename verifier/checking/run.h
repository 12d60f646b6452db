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
  // The memory all workers may hold together (memo tables and pending sizes,
  // as the evaluators account for them). Each claim may use up to its
  // budget's max_memo_bytes, lowered to memory_limit when that is smaller, so
  // at most memory_limit / max_memo_bytes claims (and at least one) are
  // checked at once, whatever `jobs` says. Only the number of threads
  // depends on `jobs`: the report is the same.
  uint64_t memory_limit = uint64_t{2} << 30;
  // Called after each claim finishes, from the thread that checked it,
  // serialised: (claims done, claims in total, the claim's name).
  std::function<void(size_t, size_t, const std::string&)> progress;
};

// Throws InputError for a path that does not exist, or a --claim name that
// no file defines (with the closest names as a hint). Bad claims become
// `error` results; the others are checked. load_entries, select_names and
// check_in_parallel in turn.
RunResult run_check(const RunRequest& request);

// The number of claims run_check checks at once for `claims` claims.
unsigned workers_for(const RunRequest& request, size_t claims);

// Every claim of the files and folders in `paths` (find_claim_files), in
// order; an unreadable entry below a folder becomes an error entry of its
// own, and a second claim with a name already used becomes an error that
// points at the first. Throws InputError as find_claim_files.
std::vector<ClaimEntry> load_entries(const std::vector<std::string>& paths);

// The indices into `all` of the entries named `names` (exact names, in the
// order of `names`; every index of a name `all` repeats; each index once,
// however often its name is given). Throws InputError for a
// name that is not in `all`, with the names containing it or the closest
// one as a hint.
std::vector<size_t> select_names(const std::vector<std::string>& all,
                                 const std::vector<std::string>& names);

// Checks the entries with check_entry, each with max_memo_bytes at most
// memory_limit, at most `jobs` at once (fewer when memory_limit / the
// budget's max_memo_bytes is smaller): the result is the
// same as a serial run, claim for claim, and a bug in one claim stays on
// that claim. `progress` may be empty; if it throws, no further claims are
// started and its exception is rethrown here once the workers stop.
// A reproducible run: SOURCE_DATE_EPOCH (seconds since 1970, common practice
// for reproducible builds) set to a whole number. Its report then carries
// that time as the run's start and 0 as every claim's wall time, so the
// same claims and seed give the same bytes; nullopt when not set.
std::optional<int64_t> reproducible_epoch();
// "2026-12-05T07:32:04Z" for a time in seconds since 1970.
std::string utc_text(int64_t seconds);

RunResult check_in_parallel(const std::vector<ClaimEntry>& entries, const CheckOptions& options,
                            unsigned jobs,
                            const std::function<void(size_t, size_t, const std::string&)>& progress,
                            uint64_t memory_limit = uint64_t{2} << 30);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_RUN_H_
