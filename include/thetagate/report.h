// Reports of a check, and comparison with an earlier run (a baseline).
// Formats and their layouts: docs/json-schema.md (JSON), README (text).
#ifndef THETAGATE_REPORT_H_
#define THETAGATE_REPORT_H_

#include <cstddef>
#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "thetagate/check.h"
#include "thetagate/export.h"

namespace thetagate {

namespace detail {
struct Access;
}

enum class Format {
  kText,      // for a person; one line per claim, detail for those that did not hold
  kJson,      // for programs (docs/json-schema.md)
  kJunit,     // JUnit XML for CI systems
  kHtml,      // one self-contained page with SVG band plots
  kBrief,     // for a person in a hurry: one line per claim (proof or first witness), the summary
  kMarkdown,  // for a pull-request comment: a summary table, details per claim that did not hold
};

struct RenderOptions {
  bool colour = false;           // text: ANSI colour (see want_colour)
  bool undecided_fails = false;  // JUnit: undecided claims as failures, not skipped
  // JUnit, with `changes`: drifted claims as failures (type "drift") and lost
  // claims as failing test cases, as --fail-on drift fails the run.
  bool drift_fails = false;
};

// What changed between a baseline run and this one: verdicts, new and lost
// claims and witnesses, band moves, derived classes. Cheap to copy.
class THETAGATE_API Drift {
 public:
  bool any() const;                                 // some claim changed
  size_t compared() const;                          // claims present in both runs
  std::vector<std::string> changed_claims() const;  // names, this run's order, then lost ones

 private:
  struct Impl;
  explicit Drift(std::shared_ptr<const Impl> impl);
  std::shared_ptr<const Impl> impl_;
  friend struct detail::Access;
};

// The report in `format`, ending with a newline. Deterministic: the same
// report gives the same bytes. With `changes`, the text report gains a
// section, the JSON report a "drift" key, and the JUnit report (with
// RenderOptions::drift_fails) a failure per drifted or lost claim.
THETAGATE_API std::string render(const Report& report, Format format,
                                 const RenderOptions& options = {}, const Drift* changes = nullptr);

// The Report a JSON report (schema_version 1 to 3) was rendered from; reads
// render(report, Format::kJson) back exactly. Throws InputError, located in
// `display_name`, for text that is not such a report.
THETAGATE_API Report read_json_report(const std::string& json_text,
                                      const std::string& display_name = "<baseline>");

// read_json_report of the file at `path`. Throws InputError located at
// `path` when it is missing, unreadable, too large (256 MiB) or not a report.
THETAGATE_API Report read_json_report_file(const std::string& path);

// Joins the JSON reports of the shards of one run (check with shard_count
// N, read from `paths`) into the report one unsharded run gives. Throws
// InputError for a file that is not a shard report, shards of different
// runs (seed, options, claim set, version), or a shard missing or twice.
THETAGATE_API Report merge_shards(const std::vector<std::string>& paths);

// Checks, before any work is done, that reports can be written at `out`:
// into a folder (created when missing) when `folder`, else as one file whose
// folder exists. Throws InputError located at `out` with the reason.
THETAGATE_API void check_output_location(const std::string& out, bool folder);

// Writes each (path, text) whole: to a temporary name first, renamed into
// place only when all are complete, so a reader never sees a cut file. A
// path that is not a regular file (/dev/stdout, a pipe) is written directly.
// Returns "" on success, else "cannot write PATH: REASON" (nothing replaced).
// Temporary files are removed on every way out, exceptions included. A file
// size limit (ulimit -f) gives "File too large" only in a process that
// ignores SIGXFSZ (the command line does); otherwise the system ends it.
THETAGATE_API std::string write_files_whole(
    const std::vector<std::pair<std::string, std::string>>& files);

// Removes the temporary files of every write_files_whole in progress.
// Async-signal-safe: for a handler of SIGTERM, SIGHUP or SIGINT that then
// ends the process.
THETAGATE_API void remove_unfinished_reports() noexcept;

// Every change from `baseline` to `current`. Never throws.
THETAGATE_API Drift drift_from_baseline(const Report& baseline, const Report& current);

// True when text written to file descriptor `fd` should be coloured: a
// terminal, and NO_COLOR unset or empty. Never throws.
THETAGATE_API bool want_colour(int fd);

}  // namespace thetagate

#endif  // THETAGATE_REPORT_H_
