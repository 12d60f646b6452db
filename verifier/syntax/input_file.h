// Reading input files whole, under caps: a claim file or a baseline report
// is a regular file of bounded size. A FIFO, a device such as /dev/zero or
// a folder is refused with a located error instead of blocking or growing
// without end.
#ifndef THETAGATE_VERIFIER_SYNTAX_INPUT_FILE_H_
#define THETAGATE_VERIFIER_SYNTAX_INPUT_FILE_H_

#include <cstddef>
#include <string>

#include "verifier/syntax/source.h"

namespace thetagate::engine {

// Claim files hold a few dozen claims; 16 MiB is far above any real one.
inline constexpr size_t kMaxClaimFileBytes = size_t{16} << 20;
// A JSON report of a large run (thousands of claims with witnesses).
inline constexpr size_t kMaxReportFileBytes = size_t{256} << 20;

// The bytes of the regular file at `path`. Throws InputError located at
// `path`:1:1 when it is missing, not a regular file, unreadable (with the
// system's reason), or larger than `max_bytes`. `what` names the file in
// messages ("claim file", "baseline report"); `hint` is the hint for a
// path that cannot be read.
std::string read_input_file(const std::string& path, size_t max_bytes, const std::string& what,
                            const std::string& hint);

// Limits that keep a TOML parser's recursion shallow, checked on the raw
// text before parsing: at most kMaxTomlKeyParts parts in one dotted key or
// table header, and at most kMaxTomlNesting nested arrays and inline tables.
// Throws a located InputError at the first part over a limit.
inline constexpr int kMaxTomlKeyParts = 64;
inline constexpr int kMaxTomlNesting = 64;
void check_toml_limits(const SourceText& toml_text);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_SYNTAX_INPUT_FILE_H_
