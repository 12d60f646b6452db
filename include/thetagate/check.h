// Checking claims: verdicts as plain values. Exact integers (sizes, witness
// n) are decimal strings with every digit, "18446744073709551617": they
// carry any size without putting a big-integer library into your build, and
// convert in one step where arithmetic is wanted
// (boost::multiprecision::cpp_int(n), mpz_set_str). Exact values of T(n)
// are strings too: an integer, a fraction "7/2", or an interval "[lo, hi]"
// for an irrational value.
#ifndef THETAGATE_CHECK_H_
#define THETAGATE_CHECK_H_

#include <cstddef>
#include <cstdint>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "thetagate/claim.h"
#include "thetagate/errors.h"
#include "thetagate/export.h"

namespace thetagate {

namespace detail {
struct Access;
}

enum class Verdict {
  kHolds,      // the bound is proved: `basis` and `proof` say how
  kRefuted,    // a witness breaks the bound, checked exactly
  kUndecided,  // neither, within the limits; the message says why
  kError,      // the claim could not be checked: ClaimResult::error or ::internal_error
};
// "holds", "refuted", "undecided", "error".
THETAGATE_API const char* verdict_name(Verdict v);

// Which side of the bound a witness breaks.
enum class Side { kUpper, kLower };
// "upper", "lower".
THETAGATE_API const char* side_name(Side s);

// A size where the claimed inequality fails, checked exactly.
struct Witness {
  std::string n;  // decimal
  Side side = Side::kUpper;
  std::string value;   // exact T(n)
  std::string bound;   // the bound's value at n (c·g(n), or the explicit side)
  double ratio = 0;    // T(n)/g(n), approximate, for display
  std::string factor;  // for a ladder rung: "10", "100", ...; "" otherwise
  std::string margin;  // explicit bounds: how far past the bound, > 0
  std::string family;  // the size family that found n
};

// Per scale k (n in [2^k, 2^(k+1))): the smallest and largest T(n)/g(n).
struct BandRow {
  uint64_t scale = 0;
  double low = 0;
  double high = 0;
  std::string low_at;  // decimal n of the low end
  std::string high_at;
  double low_log2 = 0;  // log2 of low/high: finite even when the ratio overflows a double
  double high_log2 = 0;
  uint64_t samples = 0;
};

// Why a verdict is what it is (the evidence that decides it).
enum class Basis {
  kDerivationAgrees,       // holds: a theorem whose hypotheses were all verified
  kInduction,              // holds: an induction certificate for an explicit bound
  kDerivationContradicts,  // refuted: a theorem's class excludes the claim
  kCertifiedBreak,         // refuted: an exactly checked size breaks the bound
  kNumericTrend,           // from the numbers alone (refuted by an escaping ratio, else undecided)
  kBudgetReached,          // undecided: no violation where checked, and no proof
  kInternalInconsistency,  // error: a theorem and the exact values disagree (a bug, exit 3)
  kInputError,             // error: the claim is malformed
  kInternalError,          // error: a bug in thetagate while checking this claim
  kCodeBreaksModel,        // refuted: a counted cost of the code is on the wrong side of T(n)
  kCodeSizesMissed,        // undecided: the bound holds, but the costs miss adversarial sizes
};
// "derivation_agrees", "induction", ... (the JSON report's basis.kind).
THETAGATE_API const char* basis_name(Basis b);

struct ClaimResult {
  std::string name;
  std::string file;  // "" for a claim built with Claim::from_text
  int line = 0;
  Verdict verdict = Verdict::kUndecided;
  Basis basis = Basis::kBudgetReached;
  // kHolds: the proof it rests on ("master theorem, case 2", "induction from
  // n = 64: ..."); "" for every other verdict.
  std::string proof;
  std::string claimed;  // the bound as written
  std::string derived;  // the derived class, "" when no theorem applied
  std::string method;   // the theorem used, or "numeric"
  bool tight = true;    // false: an O/Omega claim that holds loosely
  bool numeric_only = false;
  std::vector<Witness> witnesses;
  std::vector<BandRow> band;
  std::string message;                         // one or two sentences: why this verdict
  std::vector<std::string> notes;              // assumptions stated for the reader
  std::vector<std::string> steps;              // the applying theorem's derivation steps
  std::vector<std::string> failed_hypotheses;  // "THEOREM: the hypothesis that fails"
  std::optional<Diagnostic> error;             // kError from bad input: where and why
  std::string internal_error;                  // kError from a bug: what broke ("" otherwise)
  // With CheckOptions::recheck, for a claim that held: "re-checked (5
  // checks)", or "not re-checked: WHY"; a certificate the re-checker
  // rejects makes the claim kError with internal_error saying why.
  std::string recheck;
  std::string note;  // the claim's own note
  uint64_t sizes_checked = 0;
  uint64_t largest_bits = 0;  // bits of the largest size evaluated
};

struct CheckOptions {
  uint64_t seed = 1;                  // the same seed replays the same report
  uint64_t effort = 1;                // multiplies each claim's search work (1..10000)
  std::optional<uint64_t> max_bits;   // overrides every claim's max_bits (1..65536)
  std::optional<Rounding> rounding;   // overrides every claim's rounding
  std::vector<std::string> families;  // overrides every claim's families; empty = keep
  unsigned jobs = 1;                  // claims checked at once (same report as 1)
  // Memory all workers may hold together in memo tables and pending sizes
  // (as the evaluators account for them, not the whole process): each claim
  // may hold the smaller of 512 MiB and this, so it also caps `jobs` (the
  // report does not depend on `jobs`).
  uint64_t memory_limit = uint64_t{2} << 30;
  // Wall-clock guard per claim against hangs, in seconds: as given, whatever
  // the effort, and shared by the claim's readings (rounding "both"); unset:
  // 60 s times the effort per reading; 0: none, so only the deterministic
  // work budgets end a search.
  // From 0 to 1e6 (the command line's range); NaN or more is an InputError.
  std::optional<double> clock_limit;
  // A folder whose files claims may name as `costs`, besides each claim
  // file's own folder tree (the only place by default: a claim file from an
  // outside contribution must not read files elsewhere). Empty: none.
  std::string costs_root;
  // Called after each claim, serialised: (claims done, claims in all, name).
  // If it throws, no further claim starts and check() rethrows it.
  std::function<void(size_t, size_t, const std::string&)> progress;
  // Check only shard `shard_index` of `shard_count` (1-based) of the claims:
  // a deterministic part, balanced by expected cost (docs/nightly.md); the
  // report is a shard report, which merge_shards() joins with the others.
  // shard_count 0: the whole run, no shard report.
  uint64_t shard_index = 1;
  uint64_t shard_count = 0;
  // Re-verify every holds's certificate with the independent re-checker
  // (thetagate/recheck.h) after the check.
  bool recheck = false;
};

// The result of checking many claims: the seed and options that replay it,
// and one ClaimResult per claim in input order. Cheap to copy.
class THETAGATE_API Report {
 public:
  uint64_t seed() const;
  const std::vector<ClaimResult>& claims() const;
  bool any_refuted() const;
  bool any_error() const;           // some claim has verdict kError
  bool any_internal_error() const;  // some claim hit a bug (internal_error set)

 private:
  struct Impl;
  explicit Report(std::shared_ptr<const Impl> impl);
  std::shared_ptr<const Impl> impl_;
  friend struct detail::Access;
};

// Checks one claim. Throws InputError for bad options (an unknown family,
// max_bits or effort out of range). Bad claim input gives verdict kError; a
// limit gives kUndecided; a bug gives kError with internal_error.
THETAGATE_API ClaimResult check(const Claim& claim, const CheckOptions& options = {});

// Checks every claim (options.jobs at once); throws as check(Claim). Each
// claim's outcome, a bug included, stays on that claim.
THETAGATE_API Report check(const std::vector<Claim>& claims, const CheckOptions& options = {});

}  // namespace thetagate

#endif  // THETAGATE_CHECK_H_
