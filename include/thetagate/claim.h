// Claims: a name, a recurrence and a claimed bound, built from strings or
// loaded from TOML claim files (docs/language.md). A Claim is a cheap,
// immutable value (copies share the parsed recurrence).
#ifndef THETAGATE_CLAIM_H_
#define THETAGATE_CLAIM_H_

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "thetagate/errors.h"
#include "thetagate/export.h"

namespace thetagate {

namespace detail {
struct Access;
}

// How a quotient inside T(...) that is not a whole number is read: as its
// floor (the default), its ceiling, or both (the claim must hold for both).
enum class Rounding { kFloor, kCeil, kBoth };
// "floor", "ceil", "both".
THETAGATE_API const char* rounding_name(Rounding r);

// The optional settings of a claim, as the [claim.sizes] table and the
// `rounding` and `note` keys of a claim file give them.
struct ClaimSettings {
  std::optional<uint64_t> max_bits;   // largest size, in bits (1..65536)
  std::vector<std::string> families;  // size families to search (size_families()); empty = all
  std::string min_n;                  // smallest size, an exact expression ("2^20"); "" = none
  uint64_t effort = 1;                // search work, a multiple of the default (1..10000)
  std::optional<Rounding> rounding;   // the reading of n/b inside T(...); default floor
  std::string note;                   // free text, copied into reports
};

class THETAGATE_API Claim {
 public:
  // A claim from strings. `recurrence` may separate its lines with ';' or
  // newlines; `bound` is asymptotic ("Theta(n lg n)") or explicit
  // ("T(n) <= 2 n lg n for n >= 2"). Throws InputError, located in
  // "<recurrence>", "<bound>" or "<claim>", for any bad part.
  static Claim from_text(const std::string& name, const std::string& recurrence,
                         const std::string& bound, const ClaimSettings& settings = {});

  const std::string& name() const;  // may be empty for a claim whose name failed to load
  Location where() const;           // the [[claim]] header, or <claim>:1:1 for from_text
  // Set when this claim came from a file and could not be read; checking it
  // gives verdict kError with this diagnostic. Other claims are unaffected.
  const std::optional<Diagnostic>& error() const;

 private:
  struct Impl;
  explicit Claim(std::shared_ptr<const Impl> impl);
  std::shared_ptr<const Impl> impl_;
  friend struct detail::Access;
};

// Every claim of the TOML claim files in `paths` (files, or folders searched
// for *.toml recursively, in sorted order), in order. Never throws for bad
// file content: a malformed claim (or a file that is not TOML) becomes a
// Claim with error(); a second claim with a name already used becomes an
// error pointing at the first. A file named twice (a.toml ./a.toml, or inside
// a folder also given) is read once. Throws InputError for a path that does
// not exist or a folder that cannot be listed.
THETAGATE_API std::vector<Claim> load_claims(const std::vector<std::string>& paths);

// The claims of one TOML document; `display_name` is the file name shown in
// diagnostics. Never throws for bad content (as load_claims).
THETAGATE_API std::vector<Claim> load_claims_from_text(const std::string& toml,
                                                       const std::string& display_name);

// The claims whose name is exactly one of `names`, in the order of `names`,
// each once however often its name is given; all of them when `names` is empty. Throws InputError
// naming an unknown name, with the closest names as a hint.
THETAGATE_API std::vector<Claim> select_claims(const std::vector<Claim>& claims,
                                               const std::vector<std::string>& names);

// A size family: a way of choosing sizes to evaluate (powers, odd sizes
// below powers, random sizes, ...).
struct SizeFamily {
  std::string name;
  std::string description;  // one line
};
// Every size family, in search priority order. Never throws.
THETAGATE_API std::vector<SizeFamily> size_families();

// A size at which to measure the code behind a claim, and its family.
struct SizeToMeasure {
  std::string n;  // decimal
  std::string family;
};

// The sizes a harness in any language should measure the code behind
// `claim` at, so that its costs file covers what the check covers: every n
// from the claim's smallest size to `small`, then each of the claim's size
// families (powers, one off a power, small multiples of powers, odd halving
// chains, random) at every scale up to `max_n`. Ascending. `max_n` and
// `small` are constant expressions ("2^16"). Throws InputError for a claim
// with error(), a bad expression, or max_n below the claim's smallest size.
THETAGATE_API std::vector<SizeToMeasure> sizes_to_measure(const Claim& claim,
                                                          const std::string& max_n = "2^16",
                                                          const std::string& small = "64",
                                                          uint64_t seed = 1);

}  // namespace thetagate

#endif  // THETAGATE_CLAIM_H_
