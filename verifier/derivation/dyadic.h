// Proofs of explicit bounds by induction on dyadic blocks (docs/design.md,
// "Induction on dyadic blocks"): for recurrences whose recursive calls halve
// n (T(floor(n/2)), T(ceil(n/2))) and bounds written with floor(lg n),
// ceil(lg n), 2^floor(lg n), 2^ceil(lg n) and polynomials in n, which the
// substitution method of induction.h cannot carry (floor(lg floor(n/2)) is
// a floor of a logarithm).
//
// On a block 2^k <= m < 2^(k+1), floor(lg m) = k; writing n = 2m + r
// (r = 0, 1), floor(n/2) = m and ceil(n/2) = m + r, and every floor and
// ceiling of a logarithm of n, m or m + 1 is k or k + 1 or k + 2, except at
// a few sizes next to the block's edges, which are taken one by one. The
// inductive step then becomes an identity between polynomials in m, 2^k
// and k, checked exactly.
//
// - An exact claim T(n) = B(n) is carried itself: T(n) = B(n) checked
//   exactly below 2^(k0+1), the step an identity on every block beyond.
// - Any other explicit bound is compared with T's own closed form E:
//   E is fitted to T's exact values in a basis n^a k^b 2^(ck)
//   (k = floor(lg n)) and proved equal to T as above; then B - E (or
//   E - B) >= 0 on each block is proved in x = n/2^k in [1, 2], B's lg n
//   written k + lg x, by certified interval arithmetic on a subdivision of
//   [1, 2] (mean-value enclosures), for every k from the claim's n0 on: the
//   leading power of 2^k and k dominates beyond a computed k1, and the
//   blocks below k1 are checked one by one.
#ifndef THETAGATE_VERIFIER_DERIVATION_DYADIC_H_
#define THETAGATE_VERIFIER_DERIVATION_DYADIC_H_

#include <cstdint>
#include <functional>
#include <optional>

#include "verifier/derivation/induction.h"

namespace thetagate::engine {

struct DyadicRequest {
  const Recurrence* recurrence = nullptr;
  const Bound* bound = nullptr;  // REQUIRES: an explicit bound
  // As InductionRequest::check_range: T(n) against `candidate` on [lo, hi].
  std::function<bool(const ExprPtr& candidate, Side side, bool strict, const BigInt& lo,
                     const BigInt& hi)>
      check_range;
  // T(n) exactly, or nullopt (irrational, or a limit ran out).
  std::function<std::optional<Rational>(const BigInt& n)> value_at;
  // Deterministic work: interval evaluations, each one unit.
  uint64_t work_budget = 20000;
};

// The proof (InductionProof::dyadic set), or the reason there is none; no
// reason ("") when some call of T does not halve n (T(n - 1), T(n/3)), a
// recurrence the method is not for. Never throws for a valid claim.
InductionOutcome prove_on_dyadic_blocks(const DyadicRequest& request);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_DYADIC_H_
