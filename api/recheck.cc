// The independent re-checker through the public API (include/thetagate/recheck.h).
#include "thetagate/recheck.h"

#include "verifier/recheck/recheck.h"

namespace thetagate {

namespace {

RecheckStatus to_public(engine::recheck::RuleStatus s) {
  switch (s) {
    case engine::recheck::RuleStatus::kRechecked:
      return RecheckStatus::kRechecked;
    case engine::recheck::RuleStatus::kRejected:
      return RecheckStatus::kRejected;
    case engine::recheck::RuleStatus::kNotRechecked:
      break;
  }
  return RecheckStatus::kNotRechecked;
}

}  // namespace

std::vector<RecheckedClaim> recheck(const std::string& report_json, const std::string& report_name,
                                    const std::vector<std::string>& claim_paths) {
  std::vector<RecheckedClaim> out;
  for (const auto& c :
       engine::recheck::recheck_report(report_json, report_name, claim_paths).claims) {
    out.push_back({c.name, c.file, to_public(c.status), c.detail, c.obligations});
  }
  return out;
}

std::string recheck_status_line(const RecheckedClaim& claim) {
  engine::recheck::RecheckedClaim c{
      claim.name, claim.file,
      claim.status == RecheckStatus::kRechecked  ? engine::recheck::RuleStatus::kRechecked
      : claim.status == RecheckStatus::kRejected ? engine::recheck::RuleStatus::kRejected
                                                 : engine::recheck::RuleStatus::kNotRechecked,
      claim.detail, claim.obligations};
  return engine::recheck::status_line(c);
}

}  // namespace thetagate
