// The command line's exit policy: which outcomes of a check end in which exit
// code. Lives beside main because only main maps outcomes to exit codes:
//   0  nothing that --fail-on names
//   1  a refuted claim (or what --fail-on names: undecided claims, drift)
//   2  bad input or usage; a claim with an input error wins over 1
//   3  an internal error: a bug in thetagate; the message names the claim
#ifndef THETAGATE_CLI_EXIT_POLICY_H_
#define THETAGATE_CLI_EXIT_POLICY_H_

#include <string>
#include <vector>

#include "thetagate/check.h"
#include "thetagate/report.h"

namespace thetagate::cli {

inline constexpr int kExitFine = 0;
inline constexpr int kExitFailed = 1;
inline constexpr int kExitBadInput = 2;
inline constexpr int kExitInternalError = 3;

// What gives exit code 1 (`--fail-on`). Only the kinds listed count:
// `--fail-on drift` alone lets known refuted claims pass while anything that
// changes fails.
struct FailOn {
  bool refuted = true;
  bool undecided = false;
  bool drift = false;
};

// Parses `--fail-on` values: each is one of refuted, undecided, drift, or a
// comma-separated list of them ("refuted,drift"). REQUIRES: !words.empty().
// Throws InputError naming the bad word (file "--fail-on", its column).
FailOn parse_fail_on(const std::vector<std::string>& words);

// True when the run should exit 1: a refuted claim with on.refuted, an
// undecided one with on.undecided, any change with on.drift and non-null
// `changes`. Claims with verdict error are not counted here (exit_code).
bool should_fail(const Report& report, const Drift* changes, const FailOn& on);

// The exit code of a finished check: 3 if a claim hit a bug, else 2 if a
// claim has an input error (the others are still in the report), else 1 if
// should_fail, else 0.
int exit_code(const Report& report, const Drift* changes, const FailOn& on);

}  // namespace thetagate::cli

#endif  // THETAGATE_CLI_EXIT_POLICY_H_
