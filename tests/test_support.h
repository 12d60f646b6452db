// Moved to tests/support/test_support.h. This forwarding header stays only
// for tests/recheck_cli_test.cc, which is being edited elsewhere and moves to
// the new path with its next change; then this file goes.
#ifndef THETAGATE_TESTS_TEST_SUPPORT_H_
#define THETAGATE_TESTS_TEST_SUPPORT_H_

#include "tests/support/test_support.h"

#endif  // THETAGATE_TESTS_TEST_SUPPORT_H_
