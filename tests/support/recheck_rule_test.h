// Running one re-checker rule on a claim written as text, and the
// assertions on its answer, for the tests of the rules
// (tests/recheck_rules_test.cc, tests/recheck_sums_test.cc).
#ifndef THETAGATE_TESTS_SUPPORT_RECHECK_RULE_TEST_H_
#define THETAGATE_TESTS_SUPPORT_RECHECK_RULE_TEST_H_

#include <gtest/gtest.h>

#include <string>

#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"
#include "verifier/recheck/rules.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine::test_support {

// The certificate checked against the recurrence and bound (the bound
// written with the recurrence's own function name).
inline recheck::RuleOutcome run_rule(const std::string& recurrence, const std::string& bound,
                                     const recheck::CertificateData& c) {
  auto r = recurrence_from_text(recurrence);
  Bound b = parse_bound(SourceText::whole("<bound>", bound), r->main.name);
  return recheck::check_certificate(*r, b, c);
}

}  // namespace thetagate::engine::test_support

#define EXPECT_RECHECKED(outcome)                                                            \
  do {                                                                                       \
    ::thetagate::engine::recheck::RuleOutcome o_ = (outcome);                                \
    EXPECT_EQ(o_.status, ::thetagate::engine::recheck::RuleStatus::kRechecked) << o_.detail; \
    EXPECT_GT(o_.obligations, 0);                                                            \
  } while (0)

#define EXPECT_RECHECK_ANSWER(outcome, expected, fragment)                                 \
  do {                                                                                     \
    ::thetagate::engine::recheck::RuleOutcome o_ = (outcome);                              \
    EXPECT_EQ(o_.status, ::thetagate::engine::recheck::RuleStatus::expected) << o_.detail; \
    EXPECT_NE(o_.detail.find(fragment), std::string::npos) << o_.detail;                   \
  } while (0)

#define EXPECT_REJECTED(outcome, fragment) EXPECT_RECHECK_ANSWER(outcome, kRejected, fragment)
#define EXPECT_NOT_RECHECKED(outcome, fragment) \
  EXPECT_RECHECK_ANSWER(outcome, kNotRechecked, fragment)

#endif  // THETAGATE_TESTS_SUPPORT_RECHECK_RULE_TEST_H_
