// Deriving a recurrence's growth class from the published theorems, with
// the steps a reviewer can follow and the hypothesis each other theorem
// failed.
#ifndef THETAGATE_DERIVE_H_
#define THETAGATE_DERIVE_H_

#include <memory>
#include <string>
#include <vector>

#include "thetagate/errors.h"
#include "thetagate/evaluate.h"
#include "thetagate/export.h"

namespace thetagate {

namespace detail {
struct Access;
}

// A derivation: a value, cheap to copy.
class THETAGATE_API Derivation {
 public:
  bool derived() const;                           // some theorem applied
  const std::string& bound() const;               // "Θ(n lg n)"; "" when none applied
  const std::string& method() const;              // "master theorem, case 2"; "" when none
  const std::vector<std::string>& steps() const;  // the applying theorem's steps, in order
  // One line per theorem that did not apply ("THEOREM: failing hypothesis").
  const std::vector<std::string>& failed_hypotheses() const;
  const std::vector<std::string>& notes() const;  // assumptions (n/2 read as floor, ...)
  std::string to_text() const;  // numbered steps, then "did not apply:"; ends with a newline
  // {"derived", "method", "steps", "failed_hypotheses", ...}; ends with '\n'.
  std::string to_json() const;

 private:
  struct Impl;
  explicit Derivation(std::shared_ptr<const Impl> impl);
  std::shared_ptr<const Impl> impl_;
  friend struct detail::Access;
};

// Derives the growth class of `recurrence`. Throws InputError for a call
// that does not shrink (T(n) calling T(n + 1)), as evaluating would; a
// theorem that cannot decide says so in failed_hypotheses(). Two theorems that
// apply and derive different classes are a bug: throws InternalError.
THETAGATE_API Derivation derive(const Recurrence& recurrence);
// As derive(Recurrence::parse(text)): throws InputError for bad text.
THETAGATE_API Derivation derive(const std::string& recurrence_text);

}  // namespace thetagate

#endif  // THETAGATE_DERIVE_H_
