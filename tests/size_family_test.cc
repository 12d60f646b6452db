#include "generators/size_family.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <map>
#include <set>

#include "generators/random_bits.h"
#include "tests/support/diagnostic_matchers.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {
namespace {

using test_support::located_error_of;

BigInt pow2(uint64_t k) { return BigInt(1) << k; }

// Base-b digits of n, least significant first.
std::vector<BigInt> digits(BigInt n, const BigInt& b) {
  std::vector<BigInt> out;
  while (n > 0) {
    out.push_back(n % b);
    n /= b;
  }
  return out;
}

std::map<std::string, std::vector<BigInt>> by_family(const std::vector<Size>& sizes) {
  std::map<std::string, std::vector<BigInt>> out;
  for (const Size& s : sizes) out[s.family].push_back(s.n);
  return out;
}

bool contains(const std::vector<Size>& sizes, const BigInt& n) {
  return std::any_of(sizes.begin(), sizes.end(), [&](const Size& s) { return s.n == n; });
}

TEST(SplitMix64, MatchesReferenceOutputForSeedZero) {
  // First output of splitmix64 from state 0, from memory (the value seeding
  // code for xoshiro generators is commonly tested against).
  SplitMix64 rng(0);
  EXPECT_EQ(rng.next(), 0xE220A8397B1DCDAFull);
}

TEST(SplitMix64, RandomBitsStayBelowTheirBound) {
  SplitMix64 rng(7);
  for (uint64_t bits : {1, 5, 63, 64, 65, 128, 200}) {
    for (int i = 0; i < 50; ++i) {
      BigInt n = random_bits(rng, bits);
      EXPECT_GE(n, 0);
      EXPECT_LT(n, pow2(bits)) << bits;
    }
  }
  EXPECT_EQ(random_bits(rng, 0), 0);
  for (int i = 0; i < 100; ++i) EXPECT_LT(random_below(rng, BigInt(37)), 37);
}

TEST(SizeFamily, ScaleScheduleIsDenseThenGeometric) {
  std::vector<uint64_t> s = scales(4096);
  for (uint64_t k = 0; k <= 64; ++k) EXPECT_EQ(s[k], k);
  // s ← s + ⌈s/3⌉ from 64, as the header documents.
  EXPECT_EQ(std::vector<uint64_t>(s.begin() + 65, s.end()),
            (std::vector<uint64_t>{86, 115, 154, 206, 275, 367, 490, 654, 872, 1163, 1551, 2068,
                                   2758, 3678, 4095}));
  EXPECT_EQ(s.back(), 4095u);
  EXPECT_TRUE(std::is_sorted(s.begin(), s.end()));
  EXPECT_EQ(std::adjacent_find(s.begin(), s.end()), s.end());
  EXPECT_EQ(scales(1), (std::vector<uint64_t>{0}));
  EXPECT_EQ(scales(10).back(), 9u);
  EXPECT_EQ(scales(65).back(), 64u);
  EXPECT_EQ(scales(66).back(), 65u);
}

TEST(SizeFamily, DefaultPlanIsSortedUniqueAndWithinBudget) {
  SizePlan plan;
  plan.seed = 1;
  std::vector<Size> sizes = generate_sizes(plan);
  for (size_t i = 1; i < sizes.size(); ++i) ASSERT_LT(sizes[i - 1].n, sizes[i].n);
  size_t small = 0;
  for (const Size& s : sizes) {
    EXPECT_GE(s.n, 1);
    EXPECT_LT(s.n, pow2(4096));
    small += s.family == "small";
  }
  EXPECT_EQ(small, 10000u);
  // The cost budget promised in the header: about 600 sizes above 10^4.
  EXPECT_LE(sizes.size() - small, 650u);
  EXPECT_GE(sizes.size() - small, 400u);
}

TEST(SizeFamily, WordEdgesArePresentForDivisorTwo) {
  std::vector<Size> sizes = generate_sizes(SizePlan{});
  for (BigInt n : {pow2(32) - 1, pow2(32), pow2(32) + 1, pow2(64) - 1, pow2(64), pow2(64) + 1})
    EXPECT_TRUE(contains(sizes, n)) << n;
  EXPECT_TRUE(contains(sizes, pow2(4095)));
  EXPECT_TRUE(contains(sizes, pow2(4096) - 1));
}

TEST(SizeFamily, SameSeedSameListOtherSeedOtherRandomMembers) {
  SizePlan plan;
  plan.seed = 42;
  std::vector<Size> a = generate_sizes(plan), b = generate_sizes(plan);
  ASSERT_EQ(a.size(), b.size());
  for (size_t i = 0; i < a.size(); ++i) {
    EXPECT_EQ(a[i].n, b[i].n);
    EXPECT_EQ(a[i].family, b[i].family);
  }
  plan.seed = 43;
  auto ra = by_family(a)["random"], rc = by_family(generate_sizes(plan))["random"];
  ASSERT_FALSE(ra.empty());
  EXPECT_NE(ra, rc);
}

TEST(SizeFamily, RandomMembersLieInTheirScales) {
  SizePlan plan;
  plan.families = {"random"};
  plan.seed = 9;
  plan.random_per_scale = 3;
  plan.min_n = 0;
  std::vector<Size> sizes = generate_sizes(plan);
  std::map<uint64_t, int> per_scale;
  for (const Size& s : sizes) {
    EXPECT_EQ(s.family, "random");
    ++per_scale[bit_length(s.n) - 1];
  }
  // Every scheduled scale is hit, never more than random_per_scale times
  // (fewer only where the draws collide in the tiny scales).
  std::vector<uint64_t> sched = scales(plan.max_bits);
  EXPECT_EQ(per_scale.size(), sched.size());
  for (uint64_t k : sched) {
    EXPECT_LE(per_scale[k], 3) << k;
    if (k >= 8) {
      EXPECT_EQ(per_scale[k], 3) << k;
    }
  }
}

TEST(SizeFamily, RandomDrawsOfAScaleDoNotDependOnMaxBits) {
  SizePlan wide, narrow;
  wide.families = narrow.families = {"random"};
  wide.seed = narrow.seed = 5;
  narrow.max_bits = 64;
  auto w = generate_sizes(wide), n = generate_sizes(narrow);
  for (const Size& s : n) EXPECT_TRUE(contains(w, s.n)) << s.n;
}

TEST(SizeFamily, FamilyMembersHaveThePromisedForm) {
  for (int base : {2, 3, 10}) {
    const BigInt b = base;
    SizePlan plan;
    plan.divisors = {b};
    plan.max_bits = 512;
    plan.exhaustive_limit = 0;
    plan.seed = 3;
    auto fam = by_family(generate_sizes(plan));
    for (const BigInt& n : fam["powers"]) {
      auto d = digits(n, b);
      EXPECT_EQ(d.back(), 1) << n;
      EXPECT_TRUE(std::all_of(d.begin(), d.end() - 1, [](const BigInt& x) { return x == 0; })) << n;
    }
    for (const BigInt& n : fam["ones"]) {
      auto d = digits(n, b);
      EXPECT_TRUE(std::all_of(d.begin(), d.end(), [](const BigInt& x) { return x == 1; })) << n;
    }
    for (const BigInt& n : fam["alternating"]) {
      auto d = digits(n, b);
      for (size_t i = 0; i < d.size(); ++i)
        EXPECT_EQ(d[i], (d.size() - 1 - i) % 2 == 0 ? 1 : 0) << n;
    }
    for (const BigInt& n : fam["power-neighbours"]) {
      // b^k − 1 is all (b−1) digits; b^k + 1 is 100…01.
      auto d = digits(n, b);
      bool minus = std::all_of(d.begin(), d.end(), [&](const BigInt& x) { return x == b - 1; });
      bool plus = d.size() >= 2 && d.front() == 1 && d.back() == 1 &&
                  std::all_of(d.begin() + 1, d.end() - 1, [](const BigInt& x) { return x == 0; });
      EXPECT_TRUE(minus || plus) << n;
    }
    for (const BigInt& n : fam["power-multiples"]) {
      BigInt m = n;
      while (m % b == 0) m /= b;
      // What is left is c in {3, 5, 6, 7}, or 3 from 6·2^k, or 2 from 6·3^k;
      // never 1: c = b would make a plain power, and is skipped.
      EXPECT_TRUE(m == 3 || m == 5 || m == 6 || m == 7 || m == 2) << n;
    }
    EXPECT_FALSE(fam["powers"].empty());
    EXPECT_FALSE(fam["ones"].empty());
    EXPECT_FALSE(fam["alternating"].empty());
    EXPECT_FALSE(fam["power-multiples"].empty());
  }
}

TEST(SizeFamily, OnesAreEveryHalvingOddForDivisorTwo) {
  SizePlan plan;
  plan.families = {"ones"};
  plan.max_bits = 200;
  for (const Size& s : generate_sizes(plan))
    for (BigInt n = s.n; n > 1; n /= 2) EXPECT_EQ(n % 2, 1) << s.n;
}

TEST(SizeFamily, BoundsAreRespected) {
  SizePlan plan;
  plan.min_n = 5000;
  plan.max_bits = 100;
  plan.divisors = {2, 3, 5};
  std::vector<Size> sizes = generate_sizes(plan);
  ASSERT_FALSE(sizes.empty());
  EXPECT_EQ(sizes.front().n, 5000);
  EXPECT_EQ(sizes.front().family, "small");
  for (const Size& s : sizes) {
    EXPECT_GE(s.n, 5000);
    EXPECT_LT(s.n, pow2(100));
  }
  EXPECT_TRUE(contains(sizes, pow2(99)));
  EXPECT_TRUE(contains(sizes, pow2(100) - 1));
  EXPECT_TRUE(contains(sizes, pow(BigInt(3), 63)));  // 3^63 < 2^100 < 3^64
}

TEST(SizeFamily, DuplicatesKeepTheFirstFamilyByPriority) {
  SizePlan plan;
  plan.max_bits = 80;
  plan.exhaustive_limit = 0;
  std::vector<Size> sizes = generate_sizes(plan);
  auto family_of = [&](const BigInt& n) {
    for (const Size& s : sizes)
      if (s.n == n) return s.family;
    return std::string("missing");
  };
  // 2^20 − 1 is both all-ones and a power neighbour: "ones" comes first.
  EXPECT_EQ(family_of(pow2(20) - 1), "ones");
  EXPECT_EQ(family_of(pow2(20) + 1), "power-neighbours");
  EXPECT_EQ(family_of(pow2(20)), "powers");
  // 6·2^20 = 3·2^21.
  EXPECT_EQ(family_of(6 * pow2(20)), "power-multiples");
  // 5 = 101₂ is alternating; with the small range on it would be "small".
  EXPECT_EQ(family_of(5), "alternating");
}

TEST(SizeFamily, SelectsFamiliesByName) {
  SizePlan plan;
  plan.families = {"powers", "power-neighbours"};
  plan.max_bits = 70;
  std::set<std::string> seen;
  for (const Size& s : generate_sizes(plan)) seen.insert(s.family);
  EXPECT_EQ(seen, (std::set<std::string>{"powers", "power-neighbours"}));
}

TEST(SizeFamily, UnknownFamilyIsAnInputError) {
  EXPECT_TRUE(is_size_family("power-multiples"));
  EXPECT_FALSE(is_size_family("squares"));
  EXPECT_EQ(unknown_size_family({"powers", "squares", "odd"}), std::string("squares"));
  EXPECT_EQ(unknown_size_family({"powers", "random"}), std::nullopt);
  SizePlan plan;
  plan.families = {"powers", "squares"};
  EXPECT_EQ(located_error_of([&] { generate_sizes(plan); }),
            "<sizes>:1:1: unknown size family 'squares' [hint: known families: small, powers, "
            "ones, alternating, power-neighbours, power-multiples, random]");
}

TEST(SizeFamily, ListsEveryFamilyWithADescription) {
  std::set<std::string> names;
  for (const FamilyInfo& f : size_families()) {
    EXPECT_FALSE(f.description.empty()) << f.name;
    names.insert(f.name);
  }
  EXPECT_EQ(names, (std::set<std::string>{"small", "powers", "ones", "alternating",
                                          "power-neighbours", "power-multiples", "random"}));
}

}  // namespace
}  // namespace thetagate::engine
