// Everything thetagate throws, in one place. Three kinds, one base:
//
//   InputError    the input is wrong: a claim file, a recurrence, a bound, a
//                 size, a path that cannot be read. Carries a located
//                 Diagnostic (file:line:column, the line, a hint). The
//                 caller's fault; a front end exits 2.
//   LimitReached  the input is fine but checking it needs more than the
//                 limits allow (work, steps, memory, value size, time,
//                 precision). Inside a check it becomes an `undecided`
//                 verdict with the reason; thrown only by calls outside a
//                 check (evaluating at one size).
//   InternalError a bug in thetagate: an invariant broke, or a standard
//                 exception escaped the engine. Names the claim; a front end
//                 exits 3 and asks for a report.
//
// Engine-internal signals (a precision retry, a theorem that declines) never
// leave the library.
//
// Two more are thrown inside the maintainer's own code, by the header-only
// counters of thetagate/cost.h, and are declared there so that cost.h needs
// nothing but the standard library:
//   CostOverflow  a count would pass 2^64 - 1 (a std::overflow_error, not an
//                 Error: the code under test may catch it as the standard
//                 type). The guard reports it as the run's error.
//   RunStopped    a guarded run's count passed its ceiling or its time ran
//                 out; deliberately no std::exception at all. The guard
//                 catches it; it is not an error.
#ifndef THETAGATE_ERRORS_H_
#define THETAGATE_ERRORS_H_

#include <stdexcept>
#include <string>

#include "thetagate/export.h"

namespace thetagate {

// A place in an input: a claim file, or a pseudo-file such as
// "<recurrence>", "<bound>", "<size>", "<command line>".
struct Location {
  std::string file;
  int line = 0;    // 1-based
  int column = 0;  // 1-based, counted in characters (UTF-8 code points)
};

// A located input error with a one-line hint.
struct Diagnostic {
  Location where;
  std::string message;
  std::string hint = {};         // may be empty
  std::string source_line = {};  // the offending line, may be empty
};

// "file:line:col: error: message", the line, a caret under the column, and
// "  hint: ...". No trailing newline. Never throws (except std::bad_alloc).
THETAGATE_API std::string format_diagnostic(const Diagnostic& d);

// The base of every exception thetagate throws on purpose.
class THETAGATE_API Error : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

// Bad input. what() is format_diagnostic(diagnostic()).
class THETAGATE_API InputError : public Error {
 public:
  explicit InputError(Diagnostic d);
  const Diagnostic& diagnostic() const { return diagnostic_; }

 private:
  Diagnostic diagnostic_;
};

// Which limit ran out.
enum class Limit {
  kWork,       // the deterministic search work of a check
  kSteps,      // evaluation steps (case lines evaluated)
  kMemory,     // remembered values (count or bytes)
  kValueSize,  // bits of one value or size
  kTime,       // wall time of one evaluation
  kPrecision,  // an interval stayed too wide at the largest precision
};
// "work", "steps", "memory", "value size", "time", "precision".
THETAGATE_API const char* limit_name(Limit limit);

// A limit ran out; what() says which and where.
class THETAGATE_API LimitReached : public Error {
 public:
  LimitReached(Limit limit, const std::string& what) : Error(what), limit_(limit) {}
  Limit limit() const { return limit_; }

 private:
  Limit limit_;
};

// A bug in thetagate. `claim` names the claim being checked ("" when none);
// what() says it is a bug and names the claim.
class THETAGATE_API InternalError : public Error {
 public:
  InternalError(std::string claim, const std::string& detail);
  const std::string& claim() const { return claim_; }
  const std::string& detail() const { return detail_; }

 private:
  std::string claim_;
  std::string detail_;
};

}  // namespace thetagate

#endif  // THETAGATE_ERRORS_H_
