// Costs measured anywhere say what they cover (issue 17, §5): the size
// families a costs file reaches, the adversarial ones it misses, and a code
// link that is not green when only the smooth sizes were measured.
#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "generators/size_family.h"
#include "reports/text_report.h"
#include "reports/verdict_text.h"
#include "verifier/checking/checker.h"
#include "verifier/model/claim.h"

namespace thetagate::engine {
namespace {

TEST(ShapeFamily, EachMeasuredSizeIsNamedByItsShape) {
  const std::vector<BigInt> two = {2};
  EXPECT_EQ(shape_family_of(1024, two), "powers");
  EXPECT_EQ(shape_family_of(1023, two), "ones");              // 1111111111 in binary
  EXPECT_EQ(shape_family_of(682, two), "alternating");        // 1010101010
  EXPECT_EQ(shape_family_of(341, two), "alternating");        // 101010101
  EXPECT_EQ(shape_family_of(1025, two), "power-neighbours");  // 2^10 + 1
  EXPECT_EQ(shape_family_of(3 * 1024, two), "power-multiples");
  EXPECT_EQ(shape_family_of(7 * 64, two), "power-multiples");
  EXPECT_EQ(shape_family_of(1000, two), "");
  EXPECT_EQ(shape_family_of(5, two), "");  // below 8 every size has some shape
  // In base 3 (a recurrence with T(n/3)), 3^5 is a power too.
  EXPECT_EQ(shape_family_of(243, two), "");
  EXPECT_EQ(shape_family_of(243, {2, 3}), "powers");
}

// Worst-case comparisons of a bottom-up merge sort: passes merge adjacent
// runs of lengths a and b at a cost of a + b - 1; an odd run out waits for
// the next pass. At powers of two this equals the top-down count; elsewhere
// the runs are shaped differently (common practice: n = 5 merges 4 with 1 at
// the end, 9 comparisons against the top-down 8).
uint64_t bottom_up_worst(uint64_t n) {
  std::vector<uint64_t> runs(n, 1);
  uint64_t cost = 0;
  while (runs.size() > 1) {
    std::vector<uint64_t> next;
    for (size_t i = 0; i + 1 < runs.size(); i += 2) {
      cost += runs[i] + runs[i + 1] - 1;
      next.push_back(runs[i] + runs[i + 1]);
    }
    if (runs.size() % 2 == 1) next.push_back(runs.back());
    runs.swap(next);
  }
  return cost;
}

class CostsCoverage : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = std::filesystem::temp_directory_path() /
           ("thetagate-coverage-" + std::to_string(::getpid()) + "-" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    std::filesystem::create_directories(dir_);
  }
  void TearDown() override { std::filesystem::remove_all(dir_); }

  // The top-down merge-sort recurrence as an upper bound on the counted
  // comparisons of the code measured at `sizes`.
  ClaimResult check_sizes(const std::vector<uint64_t>& sizes) {
    std::string costs;
    for (uint64_t n : sizes)
      costs += std::to_string(n) + " " + std::to_string(bottom_up_worst(n)) + "\n";
    std::ofstream(dir_ / "costs.txt") << costs;
    std::string toml =
        "[[claim]]\nname = \"orchard::stable_sort / bottom-up\"\n"
        "recurrence = \"T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0\"\n"
        "bound = \"O(n lg n)\"\n[claim.code]\ncosts = \"costs.txt\"\nmodel = \"upper bound\"\n";
    std::ofstream(dir_ / "sort.toml") << toml;
    std::vector<ClaimEntry> entries = load_claim_file((dir_ / "sort.toml").string());
    CheckOptions options;
    options.max_bits = 64;
    return check_entry(entries.at(0), options);
  }

  std::filesystem::path dir_;
};

TEST_F(CostsCoverage, PowersOfTwoAloneAreNotAGreenCodeLink) {
  std::vector<uint64_t> powers;
  for (uint64_t n = 2; n <= 4096; n *= 2) powers.push_back(n);
  ClaimResult r = check_sizes(powers);
  ASSERT_EQ(r.verdict, Verdict::kUndecided) << verdict_message(r);
  EXPECT_EQ(r.basis.kind, BasisKind::kCodeSizesMissed);
  ASSERT_TRUE(r.code.has_value());
  EXPECT_TRUE(r.code->violations.empty());
  EXPECT_EQ(r.code->families_measured, std::vector<std::string>{"powers"});
  EXPECT_EQ(
      r.code->families_missed,
      (std::vector<std::string>{"ones", "alternating", "power-neighbours", "power-multiples"}));
  // The recurrence's own verdict is kept and shown beside the code link's.
  ASSERT_TRUE(r.code->model_verdict.has_value());
  EXPECT_EQ(*r.code->model_verdict, Verdict::kHolds);
  std::string message = verdict_message(r);
  EXPECT_NE(message.find("never reach the size families ones, alternating, power-neighbours, "
                         "power-multiples"),
            std::string::npos)
      << message;
  EXPECT_NE(message.find("The recurrence itself holds"), std::string::npos) << message;
}

TEST_F(CostsCoverage, EverySizeUpTo199FindsTheBottomUpSortAtFive) {
  std::vector<uint64_t> all;
  for (uint64_t n = 1; n < 200; ++n) all.push_back(n);
  ClaimResult r = check_sizes(all);
  ASSERT_EQ(r.verdict, Verdict::kRefuted) << verdict_message(r);
  EXPECT_EQ(r.basis.kind, BasisKind::kCodeBreaksModel);
  ASSERT_FALSE(r.code->violations.empty());
  EXPECT_EQ(r.code->violations.front().n, 5);
  EXPECT_TRUE(r.code->families_missed.empty());
}

TEST_F(CostsCoverage, APassingClaimSaysWhatItsCostsCovered) {
  // The top-down count itself at 1..64: no violation, every family reached.
  std::vector<uint64_t> sizes;
  for (uint64_t n = 1; n <= 64; ++n) sizes.push_back(n);
  std::string costs;
  std::vector<uint64_t> t(65, 0);
  for (uint64_t n = 2; n <= 64; ++n) t[n] = t[(n + 1) / 2] + t[n / 2] + n - 1;
  for (uint64_t n : sizes) costs += std::to_string(n) + " " + std::to_string(t[n]) + "\n";
  std::ofstream(dir_ / "costs.txt") << costs;
  std::ofstream(dir_ / "sort.toml")
      << "[[claim]]\nname = \"orchard::stable_sort / top-down\"\n"
         "recurrence = \"T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0\"\n"
         "bound = \"O(n lg n)\"\n[claim.code]\ncosts = \"costs.txt\"\n";
  RunResult run;
  CheckOptions options;
  options.max_bits = 64;
  run.claims.push_back(check_entry(load_claim_file((dir_ / "sort.toml").string()).at(0), options));
  ASSERT_EQ(run.claims[0].verdict, Verdict::kHolds) << verdict_message(run.claims[0]);
  std::string text = render_text(run, TextStyle{});
  EXPECT_NE(
      text.find(
          "code -> model: costs.txt (64 measurements at 64 sizes), the model is an upper bound; "
          "size families measured: powers, ones, alternating, power-neighbours, "
          "power-multiples"),
      std::string::npos)
      << text;
}

}  // namespace
}  // namespace thetagate::engine
