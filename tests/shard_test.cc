// Spreading a run over machines (issue 18, §3): the assignment of claims to
// shards is deterministic, covers every claim exactly once, stays balanced
// by expected cost, and moves few claims when one is added.
#include "verifier/checking/shard.h"

#include <gtest/gtest.h>

#include <map>
#include <string>
#include <vector>

namespace thetagate::engine {
namespace {

std::vector<ClaimEntry> entries(int count, int first = 0) {
  std::string text;
  for (int i = first; i < first + count; ++i) {
    text += "[[claim]]\nname = \"orchard::tree_" + std::to_string(i) +
            " / probes\"\nrecurrence = \"T(n) = T(n/2) + 1; T(1) = 0\"\nbound = \"Theta(lg n)\"\n";
    if (i % 10 == 0) text += "[claim.sizes]\neffort = 8\n";
  }
  return load_claim_text(text, "orchard.toml");
}

TEST(Shard, EveryClaimLandsInExactlyOneShardTheSameWayEachTime) {
  auto all = entries(200);
  CheckOptions options;
  for (uint64_t n : {1u, 2u, 3u, 7u}) {
    std::vector<uint64_t> a = assign_shards(all, options, n);
    EXPECT_EQ(a, assign_shards(all, options, n));
    ASSERT_EQ(a.size(), all.size());
    for (uint64_t s : a) {
      EXPECT_GE(s, 1u);
      EXPECT_LE(s, n);
    }
  }
}

TEST(Shard, LoadsStayWithinTheBoundOfTheMean) {
  auto all = entries(300);
  CheckOptions options;
  const uint64_t n = 4;
  std::vector<uint64_t> a = assign_shards(all, options, n);
  std::map<uint64_t, double> load;
  double total = 0;
  for (size_t i = 0; i < all.size(); ++i) {
    double c = expected_cost(all[i], options);
    load[a[i]] += c;
    total += c;
  }
  // Claims with effort 8 cost eight times the others.
  EXPECT_DOUBLE_EQ(expected_cost(all[0], options), 8 * expected_cost(all[1], options));
  for (uint64_t s = 1; s <= n; ++s) {
    EXPECT_LE(load[s], 1.25 * total / n + 1e-9) << "shard " << s;
    EXPECT_GT(load[s], 0.5 * total / n) << "shard " << s;
  }
}

TEST(Shard, AddingAClaimMovesFewOthers) {
  auto before = entries(200);
  auto after = entries(201);
  CheckOptions options;
  std::vector<uint64_t> a = assign_shards(before, options, 3);
  std::vector<uint64_t> b = assign_shards(after, options, 3);
  int moved = 0;
  for (size_t i = 0; i < before.size(); ++i) moved += a[i] != b[i];
  // A plain "hash mod N" after sorting by cost would move a third or more.
  EXPECT_LE(moved, 20);
}

TEST(Shard, TheDigestNamesTheClaimSetAndTheOptions) {
  auto all = entries(20);
  CheckOptions options;
  std::string d = run_digest(all, options);
  EXPECT_EQ(d, run_digest(entries(20), options));
  EXPECT_NE(d, run_digest(entries(21), options));
  CheckOptions other = options;
  other.seed = 2;
  EXPECT_NE(d, run_digest(all, other));
}

}  // namespace
}  // namespace thetagate::engine
