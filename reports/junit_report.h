// The report for CI systems: JUnit XML in its common layout (the schema we
// validate against is tests/data/junit.xsd).
//   <testsuites>  one per run; the seed as a property of every suite
//   <testsuite>   one per claim file, in order of first appearance
//   <testcase>    one per claim; classname is the file path without its
//                 extension, '/' read as '.', so CI tools group claims by file
//   refuted   -> <failure type="refuted"> carrying the witnesses in full
//   error     -> <error type="input"> carrying the located diagnostic
//   undecided -> <skipped> with the reason, or <failure type="undecided">
//                when JunitOptions::undecided_fails
//   drifted   -> <failure type="drift"> when JunitOptions::drift_fails
// No timestamps and no times: the same RunResult gives the same bytes.
#ifndef THETAGATE_REPORTS_JUNIT_REPORT_H_
#define THETAGATE_REPORTS_JUNIT_REPORT_H_

#include <string>

#include "verifier/checking/result.h"
#include "verifier/checking/run_comparison.h"

namespace thetagate::engine {

struct JunitOptions {
  bool undecided_fails = false;  // report undecided claims as failures, not skips
  // With --fail-on drift: each claim that drifted from the baseline is a
  // <failure type="drift"> carrying the drift (a refuted one keeps its
  // failure, with the drift added), and each lost claim a failing test case
  // of its own, so the CI's test view agrees with the exit code. Null: none.
  const DriftReport* drift_fails = nullptr;
};

// A complete UTF-8 XML document ending with a newline. Every text and
// attribute is escaped; characters XML 1.0 forbids (most control characters,
// invalid UTF-8) become U+FFFD.
std::string render_junit(const RunResult& run, const JunitOptions& options);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_JUNIT_REPORT_H_
