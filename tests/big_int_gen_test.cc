#include "tests/big_int_gen.h"

#include <gtest/gtest.h>
#include <rapidcheck/gtest.h>

#include <algorithm>

namespace thetagate::engine {
namespace {

BigInt pow2(uint64_t k) { return BigInt(1) << k; }

// Walks the shrink tree the way RapidCheck minimises: take the first shrink
// that still fails, until none does.
template <typename Fails>
BigInt minimise(rc::Shrinkable<BigInt> s, Fails fails) {
  for (;;) {
    auto shrinks = s.shrinks();
    bool moved = false;
    while (auto next = shrinks.next()) {
      if (fails(next->value())) {
        s = *next;
        moved = true;
        break;
      }
    }
    if (!moved) return s.value();
  }
}

TEST(BigIntGen, ShrinksToTheBoundaryOfAFailingRange) {
  // A bound that fails for every n >= 2^100 + 777 shrinks to exactly that n.
  const BigInt first_bad = pow2(100) + 777;
  auto fails = [&](const BigInt& n) { return n >= first_bad; };
  SizePlan plan;
  plan.max_bits = 300;
  plan.families = {"powers"};
  auto gen = gen_size(plan);
  bool checked = false;
  for (uint64_t seed = 0; seed < 50 && !checked; ++seed) {
    auto s = gen(rc::Random(seed), rc::kNominalSize);
    if (!fails(s.value())) continue;
    EXPECT_EQ(minimise(s, fails), first_bad) << s.value();
    checked = true;
  }
  EXPECT_TRUE(checked);
}

TEST(BigIntGen, ShrinksNeverGoBelowTheTarget) {
  for (const BigInt& c : shrinks_toward(pow2(64) + 1, BigInt(10))) {
    EXPECT_GE(c, 10);
    EXPECT_LT(c, pow2(64) + 1);
  }
  EXPECT_EQ(shrinks_toward(BigInt(10), BigInt(10)).size(), 0u);
  EXPECT_EQ(shrinks_toward(BigInt(11), BigInt(10)), std::vector<BigInt>{10});
}

RC_GTEST_PROP(BigIntGen, DrawsOnlyPlanMembers, ()) {
  static const SizePlan plan = [] {
    SizePlan p;
    p.max_bits = 128;
    p.min_n = 3;
    p.seed = 2;
    p.divisors = {2, 3};
    return p;
  }();
  static const std::vector<Size> sizes = generate_sizes(plan);
  static const rc::Gen<BigInt> gen = gen_size(plan);
  const BigInt n = *gen;
  RC_ASSERT(n >= 3);
  RC_ASSERT(n < pow2(128));
  RC_ASSERT(std::any_of(sizes.begin(), sizes.end(), [&](const Size& s) { return s.n == n; }));
}

}  // namespace
}  // namespace thetagate::engine
