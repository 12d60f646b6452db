// Claims and claim files: one recurrence + one asserted bound, with a name.
#ifndef THETAGATE_VERIFIER_MODEL_CLAIM_H_
#define THETAGATE_VERIFIER_MODEL_CLAIM_H_

#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {

// The optional [claim.sizes] table: narrows or widens the search.
struct SizeOptions {
  std::optional<uint64_t> max_bits;   // largest size, in bits
  std::vector<std::string> families;  // names of size families; empty = all
  std::optional<BigInt> min_n;        // smallest size checked
  Diagnostic min_n_where;             // where min_n is written (file, line, source line)
  uint64_t effort = 1;                // search work, a multiple of the default (times --effort)
};

// How a quotient inside T(...) that is not a whole number is read: as its
// floor (the default), its ceiling, or both (the claim must hold for both).
enum class Rounding { kFloor, kCeil, kBoth };
const char* rounding_name(Rounding r);  // "floor", "ceil", "both"

// How the recurrence relates to the code it models: every counted cost is at
// most T(n) (the usual worst-case model), exactly T(n), or at least T(n).
enum class ModelRelation { kUpperBound, kExact, kLowerBound };
const char* relation_name(ModelRelation r);  // "upper bound", "exact", "lower bound"
// Whether a counted cost with sign(cost − T(n)) = `sign` breaks relation `r`.
bool relation_broken(ModelRelation r, int sign);

// The optional [claim.code] table: the link from the recurrence to the code
// (docs/language.md, "Linking a claim to code").
struct CodeLink {
  Location where;  // the table
  ModelRelation model = ModelRelation::kUpperBound;
  // `costs`: a file of measured "size cost" lines, as written and resolved
  // against the claim file's folder; empty when the claim has none.
  std::string costs_as_written;
  std::string costs_path;
  Location costs_where;  // the value of `costs`
  // The claim file's folder: the tree a costs file must lie in, unless the
  // run widens it (CheckOptions::costs_root). A claim file may come from an
  // outside contribution; it must not read, and echo into reports, a file
  // elsewhere on the machine (/proc/self/environ holds a CI job's secrets).
  std::string claim_folder;
  // `max_n`: the largest size a runner is given (runnable sizes).
  uint64_t max_n = 65536;
};

struct Claim {
  std::string name;
  Location where;  // the [[claim]] header
  std::shared_ptr<const Recurrence> recurrence;
  Bound bound;
  std::string note;
  SizeOptions sizes;
  std::optional<Rounding> rounding;  // the claim's own `rounding` key
  std::optional<CodeLink> code;      // the claim's [claim.code] table
};

// One entry of a claim file: a claim, or the error that stopped it. A claim
// with an error gets verdict `error`; the others go on.
struct ClaimEntry {
  std::string name;  // may be empty when the error is in the name itself
  Location where;
  std::optional<Claim> claim;
  std::optional<Diagnostic> error;
  std::string internal_error;  // a bug met while reading it: what broke
};

// The keys a [[claim]] table accepts, and those of its [claim.sizes] table.
// docs/language.md's key table lists exactly these (a test checks).
const std::vector<std::string>& claim_keys();
const std::vector<std::string>& size_keys();
const std::vector<std::string>& code_keys();  // of a claim's [claim.code] table

// Reads one TOML claim file. Never throws for bad content: a file that is
// not valid TOML yields one entry with the error; each malformed claim
// yields an entry with its error. `display_name` is the path shown in
// messages.
std::vector<ClaimEntry> load_claim_file(const std::string& path);
std::vector<ClaimEntry> load_claim_text(const std::string& text, const std::string& display_name);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_MODEL_CLAIM_H_
