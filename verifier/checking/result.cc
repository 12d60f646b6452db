#include "verifier/checking/result.h"

namespace thetagate::engine {

const char* verdict_name(Verdict v) {
  switch (v) {
    case Verdict::kHolds:
      return "holds";
    case Verdict::kRefuted:
      return "refuted";
    case Verdict::kUndecided:
      return "undecided";
    case Verdict::kError:
      return "error";
  }
  return "?";
}

const char* side_name(Side s) { return s == Side::kUpper ? "upper" : "lower"; }

bool RunResult::any_refuted() const {
  for (const auto& c : claims) {
    if (c.verdict == Verdict::kRefuted) return true;
  }
  return false;
}

}  // namespace thetagate::engine
