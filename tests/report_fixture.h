// A hand-built RunResult that exercises every part of every report: claims
// that hold (tight and loose), a refutation with ladder witnesses at huge
// sizes, an undecided numeric-only claim with a long ratio band, an input
// error with its diagnostic, and names that need escaping. Shared by the
// text, JSON and JUnit report tests and their golden files.
#ifndef THETAGATE_TESTS_REPORT_FIXTURE_H_
#define THETAGATE_TESTS_REPORT_FIXTURE_H_

#include "verifier/result.h"

namespace thetagate::test_support {

// Claims, in order: 0 holds, 1 refuted, 2 holds (not tight), 3 undecided,
// 4 error, 5 holds (name with XML specials). Seed 20240611.
RunResult sample_run();

}  // namespace thetagate::test_support

#endif  // THETAGATE_TESTS_REPORT_FIXTURE_H_
