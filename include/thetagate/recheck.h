// The independent re-checker: re-verifies the certificate of every `holds`
// in a JSON report, from the claim files themselves, with its own small
// rules, expansions and evaluator (docs/design.md, "The re-checker").
#ifndef THETAGATE_RECHECK_H_
#define THETAGATE_RECHECK_H_

#include <string>
#include <vector>

#include "thetagate/export.h"

namespace thetagate {

enum class RecheckStatus {
  kRechecked,     // every obligation of the certificate holds
  kRejected,      // an obligation fails: the report's holds is not to be trusted
  kNotRechecked,  // no certificate, or a step beyond the re-checker's rules
};

struct RecheckedClaim {
  std::string name;
  std::string file;
  RecheckStatus status = RecheckStatus::kNotRechecked;
  std::string detail;   // rejected: the first failing obligation, with numbers; else why not
  int obligations = 0;  // re-checked: how many obligations were verified
};

// Re-checks every holds in `report_json` (the JSON report of a check,
// schema_version 3 or later), reading the claims from `claim_paths` (files
// or folders) or, when empty, from the files the report names. Throws
// InputError for a report that is not one, or a claim file that cannot be
// read.
THETAGATE_API std::vector<RecheckedClaim> recheck(const std::string& report_json,
                                                  const std::string& report_name,
                                                  const std::vector<std::string>& claim_paths = {});

// "re-checked (5 checks)", "REJECTED: ...", "not re-checked: ...".
THETAGATE_API std::string recheck_status_line(const RecheckedClaim& claim);

}  // namespace thetagate

#endif  // THETAGATE_RECHECK_H_
