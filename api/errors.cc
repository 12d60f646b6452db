// The public error types not defined beside the diagnostics
// (verifier/syntax/source.cc renders those), and the version.
#include "thetagate/errors.h"

#include "thetagate/version.h"

namespace thetagate {

const char* limit_name(Limit limit) {
  switch (limit) {
    case Limit::kWork:
      return "work";
    case Limit::kSteps:
      return "steps";
    case Limit::kMemory:
      return "memory";
    case Limit::kValueSize:
      return "value size";
    case Limit::kTime:
      return "time";
    case Limit::kPrecision:
      return "precision";
  }
  return "?";
}

InternalError::InternalError(std::string claim, const std::string& detail)
    : Error("internal error (a bug in thetagate" +
            (claim.empty() ? std::string() : ", while checking '" + claim + "'") + "): " + detail),
      claim_(std::move(claim)),
      detail_(detail) {}

const char* version() { return THETAGATE_VERSION_STRING; }

}  // namespace thetagate
