// Exact evaluation of a recurrence at given sizes: big integers, rationals,
// and certified intervals where a value is irrational. Sizes and values are
// decimal strings (check.h says why).
#ifndef THETAGATE_EVALUATE_H_
#define THETAGATE_EVALUATE_H_

#include <memory>
#include <string>
#include <vector>

#include "thetagate/errors.h"
#include "thetagate/export.h"

namespace thetagate {

namespace detail {
struct Access;
}

// A parsed recurrence (docs/language.md): an immutable value, cheap to copy.
class THETAGATE_API Recurrence {
 public:
  // Lines separated by ';' or newlines, e.g. "T(n) = 2T(n/2) + n; T(1) = 1".
  // `origin` names the text in diagnostics. Throws InputError.
  static Recurrence parse(const std::string& text, const std::string& origin = "<recurrence>");
  const std::string& text() const;      // as given
  const std::string& function() const;  // the recursive function's name: "T", "W", ...

 private:
  struct Impl;
  explicit Recurrence(std::shared_ptr<const Impl> impl);
  std::shared_ptr<const Impl> impl_;
  friend struct detail::Access;
};

// Evaluates one recurrence at many sizes, remembering subproblems between
// calls. Not thread-safe: use one per thread. Move-only.
class THETAGATE_API Evaluator {
 public:
  explicit Evaluator(const Recurrence& recurrence);
  ~Evaluator();
  Evaluator(Evaluator&&) noexcept;
  Evaluator& operator=(Evaluator&&) noexcept;

  // Exact T(n): "159", "7/2", or "[lo, hi]". `n` is a constant expression
  // ("37", "2^64 + 7"). Throws InputError (a bad or negative size, a call
  // that does not shrink, lg 0, no case line for n) or LimitReached. The
  // limits on steps (30 million subproblems) and time (20 s) apply to each
  // call on its own, however many calls came before; memory (the memo of
  // earlier calls, 512 MiB) is shared, and the memo is cleared when full.
  std::string value_at(const std::string& n);

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

// The decimal value of a constant size expression ("2^4096 + 7" -> digits).
// Throws InputError, located in `origin`, for a non-integer, negative or
// n-dependent expression.
THETAGATE_API std::string exact_size(const std::string& expression,
                                     const std::string& origin = "<size>");

}  // namespace thetagate

#endif  // THETAGATE_EVALUATE_H_
