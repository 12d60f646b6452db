// Golden files for report tests: expected output kept in tests/golden/ and
// compared byte for byte. To regenerate every golden file after an intended
// change, run the test binary with THETAGATE_UPDATE_GOLDEN=1, e.g.
//   THETAGATE_UPDATE_GOLDEN=1 build/thetagate_tests \
//       --gtest_filter='TextReport*:JsonReport*:JunitReport*'
// and review the diff before committing.
#ifndef THETAGATE_TESTS_GOLDEN_H_
#define THETAGATE_TESTS_GOLDEN_H_

#include <string>

namespace thetagate::engine::test_support {

// Path of tests/golden/<name> in the source tree.
std::string golden_path(const std::string& name);

// Adds a test failure unless `actual` equals tests/golden/<name> exactly; the
// failure shows the first differing line. With THETAGATE_UPDATE_GOLDEN=1,
// writes `actual` to the file instead and passes.
void expect_matches_golden(const std::string& name, const std::string& actual);

}  // namespace thetagate::engine::test_support

#endif  // THETAGATE_TESTS_GOLDEN_H_
