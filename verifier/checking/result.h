// What a check returns: plain values that reports/ renders. The engine
// never prints.
#ifndef THETAGATE_VERIFIER_CHECKING_RESULT_H_
#define THETAGATE_VERIFIER_CHECKING_RESULT_H_

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "verifier/numbers/number.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {

enum class Verdict { kHolds, kRefuted, kUndecided, kError };
const char* verdict_name(Verdict v);  // "holds", "refuted", "undecided", "error"

// Which side of the bound a witness breaks.
enum class Side { kUpper, kLower };
const char* side_name(Side s);  // "upper", "lower"

// A concrete size where the claimed inequality fails, checked exactly.
struct Witness {
  BigInt n;
  Side side = Side::kUpper;
  std::string value;   // exact T(n): "159", "7/2", or "[lo, hi]"
  std::string bound;   // the bound's value at n (c·g(n) or the explicit side)
  double ratio = 0;    // T(n)/g(n), approximate, for display
  std::string factor;  // for ladder rungs: "10", "100", ...; empty otherwise
  std::string margin;  // explicit bounds: T(n) − bound (upper side) or bound − T(n), > 0
  std::string family;  // the size family that found n
};

// Per scale k (n in [2^k, 2^(k+1))): the smallest and largest T(n)/g(n).
struct BandRow {
  uint64_t scale = 0;
  double low = 0;
  double high = 0;
  BigInt low_at;
  BigInt high_at;
  double low_log2 = 0;   // log2 of low/high: finite even where the ratio
  double high_log2 = 0;  // itself overflows a double (2^4096)
  uint64_t samples = 0;
};

struct ClaimResult {
  std::string name;
  std::string file;
  int line = 0;
  Verdict verdict = Verdict::kUndecided;
  std::string claimed;        // the bound as written
  std::string derived;        // the derived class, "" when none
  std::string method;         // theorem used, or "numeric"
  bool tight = true;          // false: an O/Omega claim that holds loosely
  bool numeric_only = false;  // decided from the numbers alone
  std::vector<Witness> witnesses;
  std::vector<BandRow> band;
  std::string message;               // one or two sentences: why this verdict
  std::vector<std::string> notes;    // assumptions stated for the reader
  std::vector<std::string> reasons;  // derivation steps, failed hypotheses
  std::optional<Diagnostic> error;   // verdict error: the located input error
  std::string internal_error;        // verdict error: a bug, what broke ("" otherwise)
  std::string note;                  // the claim's own `note`, copied
  uint64_t sizes_checked = 0;
  uint64_t largest_bits = 0;  // bits of the largest size evaluated
};

struct RunResult {
  uint64_t seed = 0;
  std::optional<uint64_t> max_bits;  // --max-bits, when given (for replay commands)
  std::optional<uint64_t> effort;    // --effort, when not 1 (for replay commands)
  std::vector<ClaimResult> claims;
  bool any_refuted() const;
};

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_RESULT_H_
