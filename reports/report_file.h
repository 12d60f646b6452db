// Writing reports to disk whole. Every file is first written to a
// temporary name in its own folder and renamed into place only when all of
// them are complete, so a reader (or a second run into the same folder)
// sees either an earlier complete file or this run's, never a cut one.
// Failures carry the system's reason ("No space left on device").
#ifndef THETAGATE_REPORTS_REPORT_FILE_H_
#define THETAGATE_REPORTS_REPORT_FILE_H_

#include <string>
#include <utility>
#include <vector>

#include "verifier/syntax/source.h"

namespace thetagate::engine {

// Checks, before any work is done, that reports can be written at `out`:
// into a folder (created when missing) when `folder`, else as one file
// whose folder exists. Throws InputError located at `out` with the reason.
void check_output_location(const std::string& out, bool folder);

// Writes each (path, text) whole, as above. A path that exists and is not a
// regular file (/dev/stdout, a pipe) is written directly. Returns "" on
// success, else "cannot write PATH: REASON"; on failure no file that was
// being replaced has changed.
// Temporary files are removed on every way out of it, exceptions included.
// A file size limit (ulimit -f) is a failure with the reason "File too
// large" only where SIGXFSZ is ignored (the command line ignores it);
// otherwise the system ends the process.
std::string write_files_whole(const std::vector<std::pair<std::string, std::string>>& files);

// Removes the temporary files of every write_files_whole in progress.
// Async-signal-safe: for a handler of SIGTERM, SIGHUP or SIGINT, which
// should then end the process (the interrupted writes cannot go on).
void remove_unfinished_reports() noexcept;

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_REPORT_FILE_H_
