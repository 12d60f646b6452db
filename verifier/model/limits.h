// The ranges of a claim's size settings, wherever they are given: a claim
// file ([claim.sizes]), the public API (ClaimSettings, CheckOptions) and the
// command line (--max-bits, --effort). Constants only, so the command line,
// which links nothing but the public library, includes it too.
#ifndef THETAGATE_VERIFIER_MODEL_LIMITS_H_
#define THETAGATE_VERIFIER_MODEL_LIMITS_H_

#include <cstdint>

namespace thetagate::engine {

// max_bits, the largest size in bits, is 1..kMaxBitsLimit (sizes up to
// 2^65536: evaluation stays exact and fast enough there).
inline constexpr int64_t kMaxBitsLimit = 65536;
// effort, a multiple of the default search work, is 1..kMaxEffort.
inline constexpr int64_t kMaxEffort = 10000;

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_MODEL_LIMITS_H_
