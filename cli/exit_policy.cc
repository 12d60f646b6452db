#include "cli/exit_policy.h"

namespace thetagate::cli {

FailOn parse_fail_on(const std::vector<std::string>& words) {
  FailOn on{false, false, false};
  for (const std::string& word : words) {
    size_t start = 0;
    int column = 1;  // of `start`, in characters
    while (start <= word.size()) {
      size_t end = word.find(',', start);
      if (end == std::string::npos) end = word.size();
      std::string kind = word.substr(start, end - start);
      if (kind == "refuted") {
        on.refuted = true;
      } else if (kind == "undecided") {
        on.undecided = true;
      } else if (kind == "drift") {
        on.drift = true;
      } else {
        Diagnostic d;
        d.where = Location{"--fail-on", 1, column};
        d.message = "unknown kind '" + kind + "'";
        d.hint = "--fail-on takes refuted, undecided or drift, or a list like refuted,drift";
        d.source_line = word;
        throw InputError(std::move(d));
      }
      for (size_t i = start; i <= end && i < word.size(); ++i) {
        if ((static_cast<unsigned char>(word[i]) & 0xC0) != 0x80) ++column;
      }
      start = end + 1;
    }
  }
  return on;
}

bool should_fail(const Report& report, const Drift* changes, const FailOn& on) {
  for (const ClaimResult& c : report.claims()) {
    if (on.refuted && c.verdict == Verdict::kRefuted) return true;
    if (on.undecided && c.verdict == Verdict::kUndecided) return true;
  }
  return on.drift && changes != nullptr && changes->any();
}

int exit_code(const Report& report, const Drift* changes, const FailOn& on) {
  if (report.any_internal_error()) return kExitInternalError;
  if (report.any_error()) return kExitBadInput;
  return should_fail(report, changes, on) ? kExitFailed : kExitFine;
}

}  // namespace thetagate::cli
