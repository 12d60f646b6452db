// What a certificate must establish, re-derived from the claim itself
// (docs/design.md, "The re-checker"). Each rule takes the claim's recurrence
// and bound and the certificate's data, builds the obligations the method
// needs, and checks every one with the re-checker's own expansions and
// evaluator. A certificate's statements are for reading; the rules never
// take a statement's word for anything.
#ifndef THETAGATE_VERIFIER_RECHECK_RULES_H_
#define THETAGATE_VERIFIER_RECHECK_RULES_H_

#include <string>
#include <vector>

#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"

namespace thetagate::engine::recheck {

// The data of one certificate, as the report carries it (strings in the
// claim language, numbers as decimal text).
struct CertificateData {
  std::string method;  // "divide", "subtract", "change-of-variables", "linear", ...
  std::string proof;   // "master theorem, case 2", ...
  std::string driver_class, driver_low, driver_high, driver_from;
  std::string driver_class_low;  // a comparison: the lower driver's class
  std::string regularity_c, regularity_from;
  std::vector<std::string> root_polynomial;  // linear: x^0 first
  std::string root_low, root_high;
  std::string bound_class, bound_low, bound_high, bound_from;  // full-history
  // Induction: the report's `induction` object.
  std::vector<std::string> sides;  // "upper", "lower"
  std::string hypothesis;          // "<= 2n*lg(n)", "= n", ">= a and <= b"
  std::string checked_to;          // M
  std::string modulus;
  std::string checked_from;  // where the exact range starts
  std::string closed_form;   // dyadic-induction: T's closed form F, "" when B was carried
};

enum class RuleStatus { kRechecked, kRejected, kNotRechecked };

struct RuleOutcome {
  RuleStatus status = RuleStatus::kNotRechecked;
  std::string detail;   // rejected: the first obligation that fails, with numbers;
                        // not re-checked: what the checker cannot follow
  int obligations = 0;  // obligations checked
};

RuleOutcome check_certificate(const Recurrence& recurrence, const Bound& bound,
                              const CertificateData& certificate);

}  // namespace thetagate::engine::recheck

#endif  // THETAGATE_VERIFIER_RECHECK_RULES_H_
