// Size families: named, deterministic generators of the input sizes n at
// which a claim is evaluated (docs/design.md §5). A bound that holds at powers of
// two can fail at 3·2^k, at odd chains or between two powers, so the search
// looks at each of these shapes on purpose, and names the family that
// produced every size so a report can say which one found a witness.
//
// Cost. Evaluating T at a 4096-bit n touches O(bits) memo entries per size,
// so large sizes are rationed by a scale schedule (see `scales`): every
// dyadic scale k (n in [2^k, 2^(k+1))) up to k = 64, then a sparse geometric
// selection up to max_bits − 1. Only "small" ignores the schedule. With the
// defaults (divisor 2, 4096 bits) a plan yields the 10^4 small sizes plus
// about 630 larger ones, 176 of them above 64 bits.
//
// Determinism. The list depends only on the SizePlan. The "random" family
// draws from splitmix64 (generators/random_bits.h), one sub-stream per scale
// derived from the seed, so a run replays exactly on any platform, and
// narrowing max_bits or the families keeps the draws of the remaining scales.
#ifndef THETAGATE_GENERATORS_SIZE_FAMILY_H_
#define THETAGATE_GENERATORS_SIZE_FAMILY_H_

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "verifier/numbers/number.h"

namespace thetagate::engine {

// What to generate for one claim.
struct SizePlan {
  // The b of every T(n/b) term, rounded to an integer by the caller (T(7n/10)
  // → 10, T(n/3) and T(2n/3) → 3). Each REQUIRES b >= 2. Empty means {2}.
  std::vector<BigInt> divisors;
  uint64_t max_bits = 4096;           // every n < 2^max_bits. REQUIRES: >= 1.
  BigInt min_n = 1;                   // every n >= min_n. REQUIRES: >= 0.
  BigInt exhaustive_limit = 10000;    // "small" is every n in [min_n, this]
  uint64_t seed = 0;                  // the run's seed, printed in every report
  std::vector<std::string> families;  // names from size_families(); empty = all
  uint64_t random_per_scale = 2;      // draws per scale for "random"
};

// One generated size and the name of the family that produced it.
struct Size {
  BigInt n;
  std::string family;
};

// Generates the plan's sizes: sorted ascending, without repeats, each with
// min_n <= n < 2^max_bits. A size that several families produce keeps the
// name of the first of them in size_families() order (the fixed priority).
// Throws InputError if `families` names an unknown family; callers that know
// where the names were written should call unknown_size_family() first and
// report the error at that location.
std::vector<Size> generate_sizes(const SizePlan& plan);

// The scale schedule used by every family except "small": all k in
// [0, min(64, max_bits − 1)]; then, from s = 64, s ← s + ⌈s/3⌉ while
// s < max_bits − 1 (86, 115, 154, 206, …, 3678 for 4096 bits: a factor of
// about 4/3 per step, 14 steps); then max_bits − 1. Sorted, unique.
// REQUIRES: max_bits >= 1.
std::vector<uint64_t> scales(uint64_t max_bits);

// Name and one-line description of a family, for `--list-families`.
struct FamilyInfo {
  std::string name;
  std::string description;
};

// Every family, in priority order.
const std::vector<FamilyInfo>& size_families();

// Whether `name` is one of size_families().
bool is_size_family(const std::string& name);

// The first name in `names` that is not a family, if any.
std::optional<std::string> unknown_size_family(const std::vector<std::string>& names);

// The family a measured size belongs to, by the same shapes the generators
// build, for any of the bases `divisors` (empty means {2}): "powers", "ones",
// "alternating", "power-neighbours", "power-multiples" (first in priority
// order), or "" for a size of no shape. Sizes below 8 are "": every small
// size has some shape (5 = 4 + 1, 7 = 111 in binary), so they say nothing
// about coverage.
std::string shape_family_of(const BigInt& n, const std::vector<BigInt>& divisors);

// The families a costs file must reach besides the powers: where floors and
// ceilings of n/b differ from n/b itself, and where halving chains stay odd.
const std::vector<std::string>& adversarial_families();

}  // namespace thetagate::engine

#endif  // THETAGATE_GENERATORS_SIZE_FAMILY_H_
