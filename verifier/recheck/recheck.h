// The independent re-checker (docs/design.md, "The re-checker"): reads a
// JSON report and the claim files it names, and re-verifies the
// certificate of every `holds` with its own rules, expansions and
// evaluator. It trusts the claim files' reading (syntax, model) and the
// numbers library, and nothing of the prover: not its derivation, its
// series, its evaluator or its verdicts.
#ifndef THETAGATE_VERIFIER_RECHECK_RECHECK_H_
#define THETAGATE_VERIFIER_RECHECK_RECHECK_H_

#include <map>
#include <string>
#include <vector>

#include "verifier/model/claim.h"
#include "verifier/recheck/rules.h"

namespace thetagate::engine::recheck {

struct RecheckedClaim {
  std::string name;
  std::string file;
  RuleStatus status = RuleStatus::kNotRechecked;
  std::string detail;
  int obligations = 0;
};

struct RecheckResult {
  std::vector<RecheckedClaim> claims;  // every `holds` of the report, in report order
  int rechecked() const;
  int rejected() const;
  int not_rechecked() const;
};

// Re-checks every `holds` in `report_text` (a JSON report, schema 3). The
// claims are read from `claim_paths` (files or folders) when given, else
// from the files the report names. Throws InputError when the report is
// not a JSON report or a claim file cannot be read.
RecheckResult recheck_report(const std::string& report_text, const std::string& report_name,
                             const std::vector<std::string>& claim_paths);

// The same with the claims given (a run re-checking its own report): by
// name, several per name when files repeat one.
RecheckResult recheck_report(const std::string& report_text, const std::string& report_name,
                             const std::multimap<std::string, Claim>& claims);

// "re-checked (5 checks)", "REJECTED: ...", "not re-checked: ...".
std::string status_line(const RecheckedClaim& claim);

}  // namespace thetagate::engine::recheck

#endif  // THETAGATE_VERIFIER_RECHECK_RECHECK_H_
