// A run spread over CI machines (issue 18, §3), through the command line:
// N = 1, 2 and 3 shards merged give the very JSON of one unsharded run with
// the same seed, and a merge refuses shards of different runs, a shard
// missing and a shard given twice.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "tests/support/scratch_test.h"
#include "tests/support/test_support.h"

namespace {

namespace fs = std::filesystem;
using thetagate::engine::test_support::CommandResult;
using thetagate::engine::test_support::run_shell;

class ShardMerge : public thetagate::engine::test_support::ScratchTest {
 protected:
  ShardMerge() : ScratchTest("shards") {}
  void SetUp() override {
    ScratchTest::SetUp();
    // A few orchard claims of each verdict, small enough to run quickly.
    write("claims/search.toml", R"toml([[claim]]
name = "orchard::find_sorted / probes"
recurrence = "T(n) = T(n/2) + 1; T(1) = 1"
bound = "Theta(lg n)"

[[claim]]
name = "orchard::find_sorted / probes, claimed constant"
recurrence = "T(n) = T(n/2) + 1; T(1) = 1"
bound = "O(1)"

[[claim]]
name = "orchard::scan / comparisons"
recurrence = "T(n) = T(n - 1) + n - 1; T(1) = 0"
bound = "T(n) = n(n - 1)/2"
)toml");
    write("claims/sort.toml", R"toml([[claim]]
name = "orchard::merge_rows / comparisons"
recurrence = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0"
bound = "Theta(n lg n)"

[[claim]]
name = "orchard::merge_rows / comparisons, linear"
recurrence = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0"
bound = "O(n)"

[[claim]]
name = "orchard::grid / cells"
recurrence = "T(n) = 4T(n/2) + n; T(1) = 1"
bound = "Theta(n^2)"

[[claim]]
name = "orchard::broken / a typo"
recurrence = "T(n) = 2T(n/2) + + n"
bound = "Theta(n)"
)toml");
  }

  CommandResult tg(const std::string& args) {
    return run_shell("cd '" + dir_.string() + "' && '" + THETAGATE_BINARY + "' " + args);
  }
};

TEST_F(ShardMerge, MergedShardsReadExactlyLikeOneRun) {
  CommandResult whole = tg("check claims --seed 7 --format json --out whole.json");
  ASSERT_EQ(whole.status, 1) << whole.out;  // refuted claims, an error claim: exit 1
  std::string expected = read("whole.json");
  ASSERT_FALSE(expected.empty());
  for (int n = 1; n <= 3; ++n) {
    std::string shards;
    size_t claims = 0;
    for (int k = 1; k <= n; ++k) {
      std::string name = "shard-" + std::to_string(k) + "-of-" + std::to_string(n) + ".json";
      CommandResult r = tg("check claims --seed 7 --shard " + std::to_string(k) + "/" +
                           std::to_string(n) + " --format json --out " + name);
      ASSERT_LE(r.status, 1) << r.out;
      std::string text = read(name);
      EXPECT_NE(text.find("\"shard\""), std::string::npos);
      for (size_t at = text.find("\"position\""); at != std::string::npos;
           at = text.find("\"position\"", at + 1))
        ++claims;
      shards += " " + name;
    }
    EXPECT_EQ(claims, 7u) << n << " shards hold every claim once";
    CommandResult merged = tg("merge" + shards + " --format json --out merged.json");
    EXPECT_EQ(merged.status, whole.status) << merged.out;
    EXPECT_EQ(read("merged.json"), expected) << n << " shards";
    // The text report of the merge is the unsharded one's too.
    CommandResult text_whole = tg("check claims --seed 7");
    CommandResult text_merged = tg("merge" + shards);
    EXPECT_EQ(text_merged.out, text_whole.out);
  }
}

TEST_F(ShardMerge, AMergeRefusesShardsThatAreNotOneRun) {
  ASSERT_LE(tg("check claims --seed 7 --shard 1/2 --format json --out a1.json").status, 1);
  ASSERT_LE(tg("check claims --seed 7 --shard 2/2 --format json --out a2.json").status, 1);
  ASSERT_LE(tg("check claims --seed 8 --shard 2/2 --format json --out seed8.json").status, 1);
  ASSERT_LE(
      tg("check claims --seed 7 --effort 2 --shard 2/2 --format json --out effort2.json").status,
      1);
  ASSERT_LE(tg("check claims/sort.toml --seed 7 --shard 2/2 --format json --out fewer.json").status,
            1);
  ASSERT_LE(tg("check claims --seed 7 --format json --out whole.json").status, 1);

  CommandResult ok = tg("merge a1.json a2.json");
  EXPECT_LE(ok.status, 1) << ok.out;

  struct Case {
    const char* args;
    const char* says;
  } cases[] = {
      {"merge a1.json seed8.json", "seed 8"},
      {"merge a1.json effort2.json", "another run"},
      {"merge a1.json fewer.json", "another run"},
      {"merge a1.json", "shard 2/2 is missing"},
      {"merge a1.json a1.json a2.json", "given twice"},
      {"merge a1.json whole.json", "not a shard"},
  };
  for (const Case& c : cases) {
    CommandResult r = tg(c.args);
    EXPECT_EQ(r.status, 2) << c.args << "\n" << r.out;
    EXPECT_NE(r.out.find(c.says), std::string::npos) << c.args << "\n" << r.out;
  }
}

TEST_F(ShardMerge, ABadShardOptionIsAUsageError) {
  for (const char* bad : {"0/2", "3/2", "2", "a/b", "1/2000"}) {
    CommandResult r = tg(std::string("check claims --shard ") + bad);
    EXPECT_EQ(r.status, 2) << bad << "\n" << r.out;
    EXPECT_NE(r.out.find("--shard takes K/N"), std::string::npos) << r.out;
  }
}

}  // namespace
