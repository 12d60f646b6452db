// RapidCheck generators of sizes drawn from the size families, shrinking
// toward the smallest allowed n so that a failing explicit bound is reported
// at a small witness. Test-only: the library proper does not depend on
// RapidCheck.
#ifndef THETAGATE_TESTS_BIG_INT_GEN_H_
#define THETAGATE_TESTS_BIG_INT_GEN_H_

#include <rapidcheck.h>

#include <algorithm>
#include <utility>
#include <vector>

#include "generators/size_family.h"
#include "verifier/numbers/number.h"

namespace thetagate::engine {

// Shrink candidates of n toward `target`, most aggressive first: target, then
// n − d/2, n − d/4, …, n − 1 with d = n − target (RapidCheck's own order for
// integers, so the boundary of a failing range is reached in O(lg² d) tries).
// Empty when n <= target.
inline std::vector<BigInt> shrinks_toward(const BigInt& n, const BigInt& target) {
  std::vector<BigInt> out;
  if (n <= target) return out;
  out.push_back(target);
  for (BigInt d = (n - target) / 2; d > 0; d /= 2) {
    BigInt candidate = n - d;
    if (candidate != out.back()) out.push_back(std::move(candidate));
  }
  return out;
}

// A generator over `sizes` (sorted ascending), each value shrinking toward
// `min_n` by shrinks_toward. RapidCheck's size parameter (0..100) limits the
// draw to the smallest (size+1)/101 of the list, so early cases are cheap.
// REQUIRES: sizes non-empty, every element >= min_n.
inline rc::Gen<BigInt> gen_size_from(std::vector<BigInt> sizes, BigInt min_n) {
  return rc::Gen<BigInt>(
      [sizes = std::move(sizes), min_n = std::move(min_n)](const rc::Random& random, int size) {
        uint64_t scale = static_cast<uint64_t>(std::clamp(size, 0, rc::kNominalSize));
        uint64_t reach = std::max<uint64_t>(1, sizes.size() * (scale + 1) / (rc::kNominalSize + 1));
        uint64_t index = rc::Random(random).next() % reach;
        return rc::shrinkable::shrinkRecur(sizes[index], [min_n](const BigInt& n) {
          return rc::seq::fromContainer(shrinks_toward(n, min_n));
        });
      });
}

// A generator over generate_sizes(plan). Throws as generate_sizes does.
inline rc::Gen<BigInt> gen_size(const SizePlan& plan) {
  std::vector<BigInt> sizes;
  for (Size& s : generate_sizes(plan)) sizes.push_back(std::move(s.n));
  BigInt min_n = plan.min_n < 0 ? BigInt(0) : plan.min_n;
  return gen_size_from(std::move(sizes), std::move(min_n));
}

}  // namespace thetagate::engine

#endif  // THETAGATE_TESTS_BIG_INT_GEN_H_
