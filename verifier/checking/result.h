// What a check returns: plain values that reports/ renders. The engine
// never prints.
#ifndef THETAGATE_VERIFIER_CHECKING_RESULT_H_
#define THETAGATE_VERIFIER_CHECKING_RESULT_H_

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "thetagate/version.h"
#include "verifier/derivation/certificate.h"
#include "verifier/derivation/derive.h"
#include "verifier/derivation/induction_proof.h"
#include "verifier/model/bound.h"
#include "verifier/model/claim.h"
#include "verifier/numbers/number.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {

enum class Verdict { kHolds, kRefuted, kUndecided, kError };
const char* verdict_name(Verdict v);  // "holds", "refuted", "undecided", "error"

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

// Which way one edge of the ratio band T(n)/g(n) moves across scales.
enum class Direction {
  kSteady,   // no trend over the upper half of the scales
  kRising,   // grows, but not (yet) past the escape factor
  kFalling,  // shrinks, but not (yet) past the escape factor
  kEscapes,  // moves past the escape factor (10^6), monotonically or by its running extreme
  kUnclear,  // too few scales, or no consistent direction
};
const char* direction_name(Direction d);  // "steady", "rising", ...

// One edge of the band read across scales (verifier/checking/trend.h).
struct EdgeReading {
  Direction direction = Direction::kUnclear;
  double slope = 0;        // d log2(edge) / d log2(scale) over the upper half
  double change_log2 = 0;  // log2(edge at largest scale / edge at first scale >= 8)
  // log2 of how far the running extreme (maximum of the upper edge, minimum
  // of the lower) got from the first scale's value: the envelope, whatever
  // the edge does in between.
  double envelope_log2 = 0;
  bool monotone = false;  // most steps go the same way
  uint64_t first_scale = 0;
  uint64_t last_scale = 0;
};

// Why a verdict is what it is. Every kind names the evidence that decides.
enum class BasisKind {
  kDerivationAgrees,       // holds: proof by theorem, all its hypotheses verified
  kInduction,              // holds: induction certificate for an explicit bound
  kDerivationContradicts,  // refuted: a theorem's class excludes the claim
  kCertifiedBreak,         // refuted: an exactly checked size breaks the bound
  kNumericTrend,           // the numbers alone: refuted by an escaping edge, else undecided
  kBudgetReached,          // undecided: no violation where checked, and no proof
  kInternalInconsistency,  // error: a theorem and the exact values disagree (a bug, exit 3)
  kInputError,             // error: the claim is malformed
  kInternalError,          // error: a bug in thetagate while checking this claim (detail)
  kCodeBreaksModel,        // refuted: a counted cost of the code is on the wrong side of T(n)
  kCodeSizesMissed,        // undecided: the bound holds, but the costs miss adversarial sizes
};
const char* basis_name(BasisKind k);  // "derivation_agrees", "induction", ...

// Why no proof was found, when none was.
enum class Unproved {
  kNone,
  kDerivedOutgrowsSide,  // the derived class lies beyond a side: it must break further out
  kInductionFailed,      // the class fits, but no induction certificate was found (detail)
  kNumbersOnly,          // only numbers: a steady band is evidence, not a proof
  kTrendUnsettled,       // only numbers, and they do not settle it
  kClaimUnclassified,    // the claimed class has no normal form (detail)
  kEvaluatorLimit,       // an evaluator limit ended the run (detail: which)
};
const char* unproved_name(Unproved u);

// What a derived class was set against: the claim's class (Θ, O, Ω), an
// explicit bound's classes, or one side of an explicit bound.
enum class ComparedWith { kTheta, kBigO, kOmega, kExplicit, kUpperSide, kLowerSide };
// "Theta", "O", "Omega", "explicit", "upper", "lower": bound_kind_name and
// side_name, as reports print them.
const char* compared_with_name(ComparedWith c);
ComparedWith compared_with(BoundKind kind);
ComparedWith compared_with(Side side);

struct TheoremEvidence {
  std::string method;   // "master theorem, case 2"
  std::string derived;  // the derived class, "n lg n"
  std::string claimed;  // the claim's class in normal form
  ComparedWith kind = ComparedWith::kTheta;
  Agreement agreement = Agreement::kSame;
  bool claimed_below = false;  // for kContradicts: the claimed class is the smaller one
  // How the derivation bounds T: kTheta (its class), or kBigO / kOmega for a
  // one-sided derivation.
  BoundKind relation = BoundKind::kTheta;
};

// The trend evidence of a numbers-only verdict.
struct TrendEvidence {
  bool upper_matters = false, lower_matters = false;
  EdgeReading upper, lower;
  std::optional<Side> escapes;  // the side whose edge escaped (refutations)
};

// One edge of T(n)/derived(n) that moves although a theorem says it should not.
struct EdgeDisagreement {
  Side edge = Side::kUpper;
  EdgeReading reading;
};

struct VerdictBasis {
  BasisKind kind = BasisKind::kBudgetReached;
  Unproved unproved = Unproved::kNone;
  std::string
      detail;  // the decisive fact in the deciding stage's words (a failed hypothesis, a limit)
  std::optional<TheoremEvidence> theorem;
  std::optional<InductionProof> induction;
  // For holds by the master theorem, Akra–Bazzi, subtract-and-conquer with
  // a = 1 or induction: the data an independent checker re-verifies the
  // proof from; unset for every other verdict and proof, and where the
  // driver is not between constant multiples of one class
  // (verifier/derivation/certificate.h says which).
  std::optional<Certificate> certificate;
  std::optional<TrendEvidence> trend;
  std::vector<EdgeDisagreement> disagreement;  // kInternalInconsistency
  // rounding = both: the reading the verdict comes from ("floor", "ceil",
  // "floor and ceil"), and the other reading's verdict when only one is reported.
  std::string reading;
  std::optional<Verdict> other_reading;
};

// The link from the recurrence to the code (a claim's [claim.code] table):
// counted costs, from a costs file or from a runner, against T(n).
//
// Per size, the counted cost furthest toward breaking the model (the largest
// for an upper-bound model, the smallest for a lower bound, any differing one
// for an exact model, else the first): how tight the model is.
struct CostRow {
  BigInt n;
  std::string cost;   // counted, decimal
  std::string model;  // T(n), exact ("159", "7/2", or "[lo, hi]")
  int sign = 0;       // sign of cost − T(n)
  uint64_t runs = 0;  // measurements at this n
  std::string from;   // "costs.txt:12", or the family that produced n
};

// A counted cost on the wrong side of T(n).
struct CostViolation {
  BigInt n;
  std::string cost;
  std::string model;
  std::string file;  // costs files: the file and line of the measurement
  int line = 0;
  std::string input;   // runners: the input, shrunk, as text
  std::string replay;  // runners: how to replay it
};

struct CodeResult {
  // The recurrence's own verdict and basis before a violation refuted the
  // claim (reports show both links); unset when no violation changed it.
  std::optional<Verdict> model_verdict;
  VerdictBasis model_basis;
  ModelRelation relation = ModelRelation::kUpperBound;
  std::string source;         // the costs file as written, or the runner's name
  uint64_t measurements = 0;  // costs counted (lines, or runs)
  std::vector<CostRow> rows;  // ascending n
  std::vector<CostViolation> violations;
  // Costs files only: the size families (generators/size_family.h) the
  // measured sizes from 8 on belong to, and the adversarial families none of
  // them reaches. Empty for a runner, which draws its own sizes.
  std::vector<std::string> families_measured;
  std::vector<std::string> families_missed;
};

struct ClaimResult {
  std::string name;
  std::string file;
  int line = 0;
  std::string function = "T";  // the recursive function's name
  Verdict verdict = Verdict::kUndecided;
  VerdictBasis basis;
  std::string recurrence;  // the recurrence as written ("" when it could not be read)
  std::string claimed;     // the bound as written
  // The claim's own [claim.sizes] and `rounding`, as written ("max_bits = 64,
  // min_n = 2^10"; "both"), "" where the claim does not set them: so drift can
  // say that they changed.
  std::string sizes;
  std::string rounding;
  bool settings_known = true;  // false for a baseline whose report predates `sizes`
  std::string derived;         // the derived class, "" when none
  std::string method;          // theorem used, or "numeric"
  bool tight = true;           // false: an O/Omega claim that holds loosely
  bool numeric_only = false;   // decided from the numbers alone
  std::vector<Witness> witnesses;
  std::vector<BandRow> band;
  std::vector<std::string> notes;              // assumptions stated for the reader
  std::vector<std::string> steps;              // the applying theorem's derivation steps
  std::vector<std::string> failed_hypotheses;  // "THEOREM: the hypothesis that fails"
  std::optional<Diagnostic> error;             // verdict error: the located input error
  std::string internal_error;                  // verdict error: a bug, what broke ("" otherwise)
  // The independent re-check of a holds's certificate, when one was asked
  // for: "re-checked (5 checks)", "not re-checked: WHY" ("" otherwise).
  std::string recheck;
  std::string note;  // the claim's own `note`, copied
  uint64_t sizes_checked = 0;
  uint64_t largest_bits = 0;       // bits of the largest size evaluated
  uint64_t position = 0;           // the claim's place in the whole run (a shard keeps it)
  double seconds = 0;              // wall time of the claim's check (0 in a reproducible run)
  std::optional<CodeResult> code;  // the claim's link to code, when it has one
};

// A run that checked one shard of the claims (--shard K/N).
struct ShardInfo {
  uint64_t index = 1;   // K, from 1
  uint64_t count = 1;   // N
  std::string digest;   // of the whole run's claim set and options (shard.h)
  uint64_t claims = 0;  // claims in the whole run
};

struct RunResult {
  // The thetagate that checked the claims ("0.1.0"); "" for a baseline
  // report written before reports carried it.
  std::string tool_version = THETAGATE_VERSION_STRING;
  uint64_t seed = 0;
  // When the run started, UTC, "2026-12-05T07:32:04Z" (SOURCE_DATE_EPOCH's
  // time in a reproducible run, run.h); "" for a report written before.
  std::string started;
  std::optional<uint64_t> max_bits;  // --max-bits, when given (for replay commands)
  std::optional<uint64_t> effort;    // --effort, when not 1 (for replay commands)
  std::vector<ClaimResult> claims;
  std::optional<ShardInfo> shard;  // set for one shard of a run
  bool any_refuted() const;
};

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_RESULT_H_
