// Claim files (TOML) that several tests check, each a claim of the fictional
// "orchard" library, so that a test says which claim it uses by name rather
// than by a copy of its text. A test that needs a variant appends to one
// (`sizes = ...`) or writes its own.
#ifndef THETAGATE_TESTS_SUPPORT_CLAIM_TEXTS_H_
#define THETAGATE_TESTS_SUPPORT_CLAIM_TEXTS_H_

namespace thetagate::engine::test_support {

// Holds: halving search is Θ(lg n) (master theorem, case 2 with a = 1,
// b = 2; Bentley, Haken & Saxe 1980). Ends with its table open, so keys
// appended belong to this claim.
inline constexpr const char* kHalvingClaim = R"toml([[claim]]
name = "orchard::halving"
recurrence = "T(n) = T(n/2) + 1; T(1) = 1"
bound = "Theta(lg n)"
)toml";

// Refuted at n = 2 already: merge sort's worst case T(2) = 1 exceeds
// 2 lg 2 - 2 = 0 (Suchenek 2017 for the recurrence).
inline constexpr const char* kTooTightMergeClaim = R"toml([[claim]]
name = "too tight"
recurrence = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0"
bound = "T(n) <= n lg n - n for n >= 2"
)toml";

// Holds: a heap's sift-down follows one path to a leaf, Θ(lg n) (master
// theorem, case 2 with a = 1, b = 2; Bentley, Haken & Saxe 1980).
inline constexpr const char* kHeapSiftDownsClaim = R"toml([[claim]]
name = "orchard::heap / sift-downs"
recurrence = "T(n) = T(floor(n/2)) + 1; T(1) = 0"
bound = "Theta(lg n)"
)toml";

// Holds: building a heap bottom-up is O(n); f = lg n is polynomially below
// n^(log_2 2) = n (master theorem, case 1; Bentley, Haken & Saxe 1980).
inline constexpr const char* kHeapBuildClaim = R"toml([[claim]]
name = "orchard::heap / build"
recurrence = "T(n) = 2T(floor(n/2)) + lg n; T(1) = 0"
bound = "O(n)"
)toml";

}  // namespace thetagate::engine::test_support

#endif  // THETAGATE_TESTS_SUPPORT_CLAIM_TEXTS_H_
