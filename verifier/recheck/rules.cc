#include "verifier/recheck/rules.h"

#include <map>

#include "verifier/recheck/rule_support.h"

namespace thetagate::engine::recheck {

RuleOutcome check_certificate(const Recurrence& recurrence, const Bound& bound,
                              const CertificateData& certificate) {
  try {
    // Each method's rule, and whether it proves explicit bounds (an
    // induction) or classes (a theorem).
    struct Entry {
      Rule rule;
      bool explicit_bounds;
    };
    static const std::map<std::string, Entry> kRules = {
        {"divide", {divide, false}},
        {"subtract", {subtract, false}},
        {"linear", {linear, false}},
        {"full-history", {full_history, false}},
        {"change-of-variables", {change_of_variables, false}},
        {"induction", {induction, true}},
        {"sum-difference", {sum_difference, true}},
        {"sum-step", {sum_step, true}},
        {"dyadic-induction", {dyadic_induction, true}},
    };
    auto rule = kRules.find(certificate.method);
    if (rule == kRules.end())
      return {RuleStatus::kNotRechecked,
              "the method '" + certificate.method + "' has no rule in the re-checker", 0};
    if (!rule->second.explicit_bounds && !bound.is_asymptotic())
      throw Unsupported("an explicit bound proved by a theorem");
    RuleOutcome out{RuleStatus::kRechecked, "", 0};
    rule->second.rule(recurrence, bound, certificate, out.obligations);
    return out;
  } catch (const Rejected& r) {
    return {RuleStatus::kRejected, r.why, 0};
  } catch (const Unsupported& u) {
    return {RuleStatus::kNotRechecked, u.what(), 0};
  } catch (const PrecisionShortfall& e) {
    // A comparison the exact reals cannot decide, a domain error, a budget:
    // the re-checker cannot follow, which is never an acceptance.
    return {RuleStatus::kNotRechecked, std::string("the re-checker could not decide: ") + e.what(),
            0};
  } catch (const DomainError& e) {
    return {RuleStatus::kNotRechecked, std::string("the re-checker met: ") + e.what(), 0};
  } catch (const LimitReached& e) {
    return {RuleStatus::kNotRechecked, std::string("the re-checker ran out: ") + e.what(), 0};
  }
}

}  // namespace thetagate::engine::recheck
