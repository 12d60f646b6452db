#include "generators/random_bits.h"

namespace thetagate::engine {

uint64_t SplitMix64::next() {
  uint64_t z = (state_ += 0x9E3779B97F4A7C15ull);
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
  return z ^ (z >> 31);
}

SplitMix64 SplitMix64::stream(uint64_t seed, uint64_t label) {
  // Mix the label through one splitmix64 step of its own so that streams for
  // neighbouring labels do not start at neighbouring states.
  SplitMix64 mixer(label);
  return SplitMix64(seed ^ mixer.next());
}

BigInt random_bits(SplitMix64& rng, uint64_t bits) {
  BigInt n = 0;
  if (bits == 0) return n;
  uint64_t words = (bits + 63) / 64;
  uint64_t top_bits = bits - (words - 1) * 64;
  for (uint64_t i = 0; i < words; ++i) {
    uint64_t w = rng.next();
    if (i == 0 && top_bits < 64) w &= (uint64_t{1} << top_bits) - 1;
    n <<= 64;
    n += BigInt(static_cast<unsigned long long>(w));
  }
  return n;
}

BigInt random_below(SplitMix64& rng, const BigInt& bound) {
  uint64_t bits = bit_length(bound);
  for (;;) {
    BigInt n = random_bits(rng, bits);
    if (n < bound) return n;
  }
}

BigInt random_in_scale(SplitMix64& rng, uint64_t k) {
  BigInt low = BigInt(1) << k;
  return low + random_bits(rng, k);
}

uint64_t random_index(SplitMix64& rng, uint64_t n) {
  // Largest multiple of n that fits: draws at or above it are rejected.
  uint64_t limit = UINT64_MAX - UINT64_MAX % n;
  for (;;) {
    uint64_t w = rng.next();
    if (w < limit) return w % n;
  }
}

}  // namespace thetagate::engine
