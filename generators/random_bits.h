// The one random source of the size search: splitmix64, and uniform big
// integers drawn from it bit by bit. No std:: distribution is used, because
// their output is implementation-defined; these draws are identical on every
// platform and compiler, so a printed seed replays a run exactly.
#ifndef THETAGATE_GENERATORS_RANDOM_BITS_H_
#define THETAGATE_GENERATORS_RANDOM_BITS_H_

#include <cstdint>

#include "verifier/numbers/number.h"

namespace thetagate::engine {

// splitmix64 (G. L. Steele, D. Lea, C. H. Flood, "Fast splittable
// pseudorandom number generators", OOPSLA 2014; the 64-bit finaliser
// constants of S. Vigna's public-domain splitmix64.c). Small state, full
// 2^64 period, and cheap to derive independent streams from (seed, label).
class SplitMix64 {
 public:
  explicit SplitMix64(uint64_t seed) : state_(seed) {}

  // The next 64 random bits.
  uint64_t next();

  // A generator for the sub-stream named `label` of `seed`: the stream
  // depends only on (seed, label), so adding or removing other streams (other
  // scales, other families) never changes this one.
  static SplitMix64 stream(uint64_t seed, uint64_t label);

 private:
  uint64_t state_;
};

// A uniform integer in [0, 2^bits): ceil(bits/64) words drawn most
// significant first, the first word masked down to the leftover bits.
BigInt random_bits(SplitMix64& rng, uint64_t bits);

// A uniform integer in [0, bound) by rejection on bit_length(bound) bits
// (fewer than two draws expected). REQUIRES: bound >= 1.
BigInt random_below(SplitMix64& rng, const BigInt& bound);

// A uniform integer in the dyadic scale k: [2^k, 2^(k+1)).
BigInt random_in_scale(SplitMix64& rng, uint64_t k);

// A uniform integer in [0, n) for small n, by rejection (no modulo bias).
// REQUIRES: n >= 1.
uint64_t random_index(SplitMix64& rng, uint64_t n);

}  // namespace thetagate::engine

#endif  // THETAGATE_GENERATORS_RANDOM_BITS_H_
