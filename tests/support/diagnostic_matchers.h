// Whole-diagnostic comparisons for tests of input errors. A test compares
// every field a user reads -- file, line, column, message and hint -- in one
// EXPECT_EQ, so a wrong column or a lost hint fails as surely as a wrong word.
#ifndef THETAGATE_TESTS_SUPPORT_DIAGNOSTIC_MATCHERS_H_
#define THETAGATE_TESTS_SUPPORT_DIAGNOSTIC_MATCHERS_H_

#include <optional>
#include <string>

#include "thetagate/errors.h"

namespace thetagate::engine::test_support {

// "file:line:col: message [hint: ...]" on one line. An empty hint adds
// nothing, so a diagnostic that loses its hint no longer matches.
inline std::string located(const ::thetagate::Diagnostic& d) {
  std::string out = d.where.file + ":" + std::to_string(d.where.line) + ":" +
                    std::to_string(d.where.column) + ": " + d.message;
  if (!d.hint.empty()) out += " [hint: " + d.hint + "]";
  return out;
}

// located(*d), or "(no error)" when there is none.
inline std::string located(const std::optional<::thetagate::Diagnostic>& d) {
  return d ? located(*d) : "(no error)";
}

// located() of the InputError that `f` throws, or "(no error)" when it
// returns. Any other exception escapes and fails the test.
template <typename F>
std::string located_error_of(F&& f) {
  try {
    f();
  } catch (const ::thetagate::InputError& e) {
    return located(e.diagnostic());
  }
  return "(no error)";
}

}  // namespace thetagate::engine::test_support

#endif  // THETAGATE_TESTS_SUPPORT_DIAGNOSTIC_MATCHERS_H_
