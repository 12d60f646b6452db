// Source text, locations and input errors. This is the one place that turns
// byte offsets into file:line:column and renders an error with its line and
// a caret.
#ifndef THETAGATE_VERIFIER_SYNTAX_SOURCE_H_
#define THETAGATE_VERIFIER_SYNTAX_SOURCE_H_

#include <cstddef>
#include <memory>
#include <stdexcept>
#include <string>

#include "thetagate/errors.h"
#include "verifier/syntax/terminal_text.h"

namespace thetagate::engine {

// A whole input: a claim file, or a recurrence given on the command line.
struct SourceFile {
  std::string name;  // path as the user gave it, or "<recurrence>", "<bound>"
  std::string text;
};

// Locations, diagnostics and the error types are public (thetagate/errors.h).
using ::thetagate::Diagnostic;
using ::thetagate::format_diagnostic;
using ::thetagate::InputError;
using ::thetagate::InternalError;
using ::thetagate::Location;

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

// Builds and throws an InputError at byte `pos` of `source`.
[[noreturn]] void fail_at(const SourceText& source, size_t pos, std::string message,
                          std::string hint = "");

// The UTF-8 column helpers: every conversion between bytes and columns
// (characters) goes through these two.
// Number of UTF-8 code points in the first `bytes` bytes of `s`.
int utf8_columns(const std::string& s, size_t bytes);
// The byte offset `columns` characters after byte `at` of `s`, stopping at
// the end of `s` or at a newline. The inverse of utf8_columns on one line.
size_t utf8_advance(const std::string& s, size_t at, int columns);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_SYNTAX_SOURCE_H_
