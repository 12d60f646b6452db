// Source text, locations and input errors. This is the one place that turns
// byte offsets into file:line:column and renders an error with its line and
// a caret.
#ifndef THETAGATE_VERIFIER_SYNTAX_SOURCE_H_
#define THETAGATE_VERIFIER_SYNTAX_SOURCE_H_

#include <cstddef>
#include <memory>
#include <stdexcept>
#include <string>

namespace thetagate::engine {

// A whole input: a claim file, or a recurrence given on the command line.
struct SourceFile {
  std::string name;  // path as the user gave it, or "<recurrence>", "<bound>"
  std::string text;
};

struct Location {
  std::string file;
  int line = 0;    // 1-based
  int column = 0;  // 1-based, counted in characters (UTF-8 code points)
};

// A piece of a SourceFile that a parser reads: for a claim file, the
// decoded value of one TOML string. When the decoded text equals the raw
// bytes at `offset` (no escape sequences), positions map exactly; otherwise
// every position maps to the start of the string.
struct SourceText {
  std::shared_ptr<const SourceFile> file;
  size_t offset = 0;
  bool exact = true;
  std::string text;

  // A whole file (or command-line argument) as its own text.
  static SourceText whole(std::string name, std::string text);

  // The location of byte `pos` of `text`.
  Location locate(size_t pos) const;
  // The full line of the file containing byte `pos` of `text`, without the
  // newline; for command-line text, the whole argument.
  std::string line_at(size_t pos) const;
};

// A located input error with a one-line hint.
struct Diagnostic {
  Location where;
  std::string message;
  std::string hint;         // may be empty
  std::string source_line;  // the offending line, may be empty
};

// "file:line:col: error: message", the line, a caret under the column, and
// "  hint: ...". Ends without a trailing newline.
std::string format_diagnostic(const Diagnostic& d);

// One error style for the whole library: bad input throws InputError
// carrying a located Diagnostic. Only main() turns it into an exit code.
class InputError : public std::runtime_error {
 public:
  explicit InputError(Diagnostic d);
  const Diagnostic& diagnostic() const { return diagnostic_; }

 private:
  Diagnostic diagnostic_;
};

// Builds and throws an InputError at byte `pos` of `source`.
[[noreturn]] void fail_at(const SourceText& source, size_t pos, std::string message,
                          std::string hint = "");

// `s` with control bytes (escape sequences, NUL, line breaks) written as
// \xNN, for text that reaches a terminal.
std::string escape_controls(const std::string& s);

// Number of UTF-8 code points in the first `bytes` bytes of `s`.
int utf8_columns(const std::string& s, size_t bytes);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_SYNTAX_SOURCE_H_
