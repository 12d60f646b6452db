#include "verifier/checking/run.h"

#include <mpfr.h>

#include <algorithm>
#include <atomic>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstdlib>
#include <ctime>
#include <exception>
#include <map>
#include <mutex>
#include <thread>

#include "verifier/model/claim.h"
#include "verifier/model/claim_discovery.h"
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

}  // namespace

unsigned workers_for(const RunRequest& request, size_t claims) {
  uint64_t per_claim = std::max<uint64_t>(1, request.options.budget.max_memo_bytes);
  uint64_t by_memory = std::max<uint64_t>(1, request.memory_limit / per_claim);
  uint64_t jobs = std::min<uint64_t>({request.jobs, claims, by_memory});
  return static_cast<unsigned>(std::max<uint64_t>(1, jobs));
}

std::vector<ClaimEntry> load_entries(const std::vector<std::string>& paths) {
  std::vector<ClaimEntry> entries;
  // An unreadable entry below a folder is an error of its own; the rest is checked.
  std::vector<ClaimEntry> unreadable;
  for (const std::string& file : find_claim_files(paths, &unreadable)) {
    std::vector<ClaimEntry> loaded = load_claim_file(file);
    entries.insert(entries.end(), loaded.begin(), loaded.end());
  }
  entries.insert(entries.end(), unreadable.begin(), unreadable.end());
  mark_duplicate_names(entries);
  return entries;
}

std::vector<size_t> select_names(const std::vector<std::string>& all,
                                 const std::vector<std::string>& names) {
  std::vector<size_t> picked;
  std::vector<bool> taken(all.size(), false);  // a name given twice picks its claims once
  for (const std::string& name : names) {
    bool found = false;
    for (size_t i = 0; i < all.size(); ++i) {
      if (all[i] == name) {
        if (!taken[i]) picked.push_back(i);
        taken[i] = true;
        found = true;
      }
    }
    if (found) continue;
    // Names that contain the text are the likeliest meaning; else the
    // nearest by edit distance.
    std::vector<std::string> containing;
    std::string closest;
    size_t best = SIZE_MAX;
    for (const std::string& candidate : all) {
      if (candidate.find(name) != std::string::npos) containing.push_back(candidate);
      size_t d = edit_distance(name, candidate);
      if (d < best) {
        best = d;
        closest = candidate;
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

std::optional<int64_t> reproducible_epoch() {
  const char* text = std::getenv("SOURCE_DATE_EPOCH");
  if (text == nullptr || *text == '\0') return std::nullopt;
  char* end = nullptr;
  errno = 0;
  long long value = std::strtoll(text, &end, 10);
  if (errno != 0 || *end != '\0' || value < 0) return std::nullopt;
  return value;
}

std::string utc_text(int64_t seconds) {
  std::time_t t = static_cast<std::time_t>(seconds);
  std::tm parts{};
  gmtime_r(&t, &parts);
  char text[32];
  std::strftime(text, sizeof text, "%Y-%m-%dT%H:%M:%SZ", &parts);
  return text;
}

RunResult check_in_parallel(const std::vector<ClaimEntry>& entries, const CheckOptions& requested,
                            unsigned jobs,
                            const std::function<void(size_t, size_t, const std::string&)>& progress,
                            uint64_t memory_limit) {
  // A memory limit below one claim's budget lowers that budget. It never
  // depends on `jobs`, so neither does the report.
  CheckOptions options = requested;
  options.budget.max_memo_bytes =
      std::max<uint64_t>(1, std::min(options.budget.max_memo_bytes, memory_limit));
  RunResult run;
  run.seed = options.seed;
  std::optional<int64_t> epoch = reproducible_epoch();
  run.started = utc_text(epoch ? *epoch
                               : std::chrono::duration_cast<std::chrono::seconds>(
                                     std::chrono::system_clock::now().time_since_epoch())
                                     .count());
  run.max_bits = options.max_bits;
  if (options.effort != 1) run.effort = options.effort;
  run.claims.resize(entries.size());
  std::atomic<size_t> next{0};
  std::mutex progress_lock;
  size_t done = 0;
  std::exception_ptr progress_failure;  // the caller's callback threw: rethrown here
  auto worker = [&] {
    while (true) {
      size_t i = next.fetch_add(1);
      if (i >= entries.size()) break;
      // check_entry keeps every exception of the claim on the claim.
      auto begin = std::chrono::steady_clock::now();
      run.claims[i] = check_entry(entries[i], options);
      if (!epoch) {
        std::chrono::duration<double> spent = std::chrono::steady_clock::now() - begin;
        run.claims[i].seconds = std::round(spent.count() * 1000) / 1000;  // milliseconds
      }
      if (progress) {
        std::lock_guard<std::mutex> lock(progress_lock);
        if (progress_failure) break;
        try {
          progress(++done, entries.size(), entries[i].name);
        } catch (...) {
          // Not ours to judge, and it must not end the process from a worker
          // thread: stop handing out claims and rethrow in the caller.
          progress_failure = std::current_exception();
          next.store(entries.size());
          break;
        }
      }
    }
    // MPFR keeps per-thread caches (constants such as log 2); a worker
    // thread that ends without freeing them leaks them.
    mpfr_free_cache();
  };
  RunRequest sizing;
  sizing.options = options;
  sizing.jobs = jobs;
  sizing.memory_limit = memory_limit;
  unsigned workers = workers_for(sizing, entries.size());
  std::vector<std::thread> threads;
  for (unsigned j = 1; j < workers; ++j) threads.emplace_back(worker);
  worker();
  for (auto& t : threads) t.join();
  if (progress_failure) std::rethrow_exception(progress_failure);
  return run;
}

RunResult run_check(const RunRequest& request) {
  std::vector<std::string> paths =
      request.paths.empty() ? std::vector<std::string>{"claims"} : request.paths;
  std::vector<ClaimEntry> entries = load_entries(paths);
  if (!request.claim_names.empty()) {
    std::vector<std::string> all;
    for (const ClaimEntry& entry : entries) all.push_back(entry.name);
    std::vector<ClaimEntry> picked;
    for (size_t i : select_names(all, request.claim_names)) picked.push_back(entries[i]);
    entries = std::move(picked);
  }
  return check_in_parallel(entries, request.options, request.jobs, request.progress,
                           request.memory_limit);
}

}  // namespace thetagate::engine
