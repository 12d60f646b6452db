#include "verifier/checking/run.h"

#include <mpfr.h>

#include <atomic>
#include <map>
#include <mutex>
#include <thread>

#include "verifier/model/claim.h"
#include "verifier/syntax/spelling.h"

namespace thetagate::engine {

namespace {

// Names must be unique within a run: a second claim with a name already
// used (in any file) becomes an error that points at the first.
void mark_duplicate_names(std::vector<ClaimEntry>& entries) {
  std::map<std::string, Location> seen;
  for (ClaimEntry& entry : entries) {
    if (!entry.claim) continue;
    auto [it, fresh] = seen.emplace(entry.name, entry.where);
    if (fresh) continue;
    Diagnostic d;
    d.where = entry.where;
    d.message = "the claim name '" + entry.name + "' is already used at " + it->second.file + ":" +
                std::to_string(it->second.line);
    d.hint = "names must be unique within a run; rename one of the claims";
    entry.error = d;
    entry.claim.reset();
  }
}

std::vector<ClaimEntry> select_claims(const std::vector<ClaimEntry>& entries,
                                      const std::vector<std::string>& names) {
  if (names.empty()) return entries;
  std::vector<ClaimEntry> picked;
  for (const std::string& name : names) {
    bool found = false;
    for (const ClaimEntry& entry : entries) {
      if (entry.name == name) {
        picked.push_back(entry);
        found = true;
      }
    }
    if (found) continue;
    // Names that contain the text are the likeliest meaning; else the
    // nearest by edit distance.
    std::vector<std::string> containing;
    std::string closest;
    size_t best = SIZE_MAX;
    for (const ClaimEntry& entry : entries) {
      if (entry.name.find(name) != std::string::npos) containing.push_back(entry.name);
      size_t d = edit_distance(name, entry.name);
      if (d < best) {
        best = d;
        closest = entry.name;
      }
    }
    Diagnostic d;
    d.where.file = "<command line>";
    d.where.line = 1;
    d.where.column = 1;
    d.message = "no claim is named '" + name + "' (--claim takes a whole name)";
    if (!containing.empty()) {
      d.hint = "names containing it: ";
      for (size_t i = 0; i < containing.size() && i < 3; ++i) {
        d.hint += (i ? ", '" : "'") + containing[i] + "'";
      }
      if (containing.size() > 3)
        d.hint += " and " + std::to_string(containing.size() - 3) + " more";
    } else {
      d.hint =
          closest.empty() ? "the files hold no claims" : "the closest name is '" + closest + "'";
    }
    throw InputError(d);
  }
  return picked;
}

ClaimResult check_entry(const ClaimEntry& entry, const CheckOptions& options) {
  // check_entries handles an entry that failed to load.
  return check_entries({entry}, options).claims.front();
}

}  // namespace

unsigned workers_for(const RunRequest& request, size_t claims) {
  uint64_t per_claim = std::max<uint64_t>(1, request.options.budget.max_memo_bytes);
  uint64_t by_memory = std::max<uint64_t>(1, request.memory_limit / per_claim);
  uint64_t jobs = std::min<uint64_t>({request.jobs, claims, by_memory});
  return static_cast<unsigned>(std::max<uint64_t>(1, jobs));
}

RunResult run_check(const RunRequest& request) {
  std::vector<std::string> paths =
      request.paths.empty() ? std::vector<std::string>{"claims"} : request.paths;
  std::vector<ClaimEntry> entries;
  // An unreadable entry below a folder is an error of its own; the rest is checked.
  std::vector<ClaimEntry> unreadable;
  for (const std::string& file : find_claim_files(paths, &unreadable)) {
    std::vector<ClaimEntry> loaded = load_claim_file(file);
    entries.insert(entries.end(), loaded.begin(), loaded.end());
  }
  entries.insert(entries.end(), unreadable.begin(), unreadable.end());
  mark_duplicate_names(entries);
  entries = select_claims(entries, request.claim_names);

  RunResult run;
  run.seed = request.options.seed;
  run.max_bits = request.options.max_bits;
  if (request.options.effort != 1) run.effort = request.options.effort;
  run.claims.resize(entries.size());
  std::atomic<size_t> next{0};
  std::mutex progress_lock;
  size_t done = 0;
  auto worker = [&] {
    while (true) {
      size_t i = next.fetch_add(1);
      if (i >= entries.size()) break;
      run.claims[i] = check_entry(entries[i], request.options);
      if (request.progress) {
        std::lock_guard<std::mutex> lock(progress_lock);
        request.progress(++done, entries.size(), entries[i].name);
      }
    }
    // MPFR keeps per-thread caches (constants such as log 2); a worker
    // thread that ends without freeing them leaks them.
    mpfr_free_cache();
  };
  unsigned jobs = workers_for(request, entries.size());
  std::vector<std::thread> threads;
  for (unsigned j = 1; j < jobs; ++j) threads.emplace_back(worker);
  worker();
  for (auto& t : threads) t.join();
  return run;
}

}  // namespace thetagate::engine
