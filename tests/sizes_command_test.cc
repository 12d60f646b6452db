// `thetagate sizes` and sizes_to_measure (issue 17, §5): the sizes a harness
// in any language should measure so that its costs file covers what the
// check covers, not only powers of two.
#include <gtest/gtest.h>
#include <unistd.h>

#include <algorithm>
#include <cstdio>
#include <fstream>
#include <nlohmann/json.hpp>
#include <set>
#include <string>

#include "tests/support/test_support.h"
#include "thetagate/thetagate.h"

namespace {

using thetagate::engine::test_support::CommandResult;
using thetagate::engine::test_support::run_shell;

thetagate::Claim merge_claim() {
  return thetagate::Claim::from_text("orchard::stable_sort / comparisons",
                                     "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0",
                                     "Theta(n lg n)");
}

TEST(SizesToMeasure, EverySmallSizeThenTheAdversarialFamiliesAtEveryScale) {
  std::vector<thetagate::SizeToMeasure> sizes =
      thetagate::sizes_to_measure(merge_claim(), "2^12", "32");
  std::set<unsigned long> ns;
  unsigned long previous = 0;
  for (const thetagate::SizeToMeasure& s : sizes) {
    unsigned long n = std::stoul(s.n);
    EXPECT_GT(n, previous) << "ascending, without repeats";
    EXPECT_LE(n, 4096u);
    previous = n;
    ns.insert(n);
  }
  for (unsigned long n = 1; n <= 32; ++n) EXPECT_TRUE(ns.count(n)) << n;
  // The shapes where floor and ceiling halvings differ (common practice: a
  // merge sort measured only at powers of two never splits unevenly).
  for (unsigned long k = 6; k <= 12; ++k) {
    unsigned long p = 1ul << k;
    EXPECT_TRUE(ns.count(p)) << "2^" << k;
    EXPECT_TRUE(ns.count(p + 1) || p + 1 > 4096) << "2^" << k << " + 1";
    EXPECT_TRUE(ns.count(p - 1)) << "2^" << k << " - 1";
    EXPECT_TRUE(ns.count(3 * p / 2) || 3 * p / 2 > 4096) << "3 * 2^" << k - 1;
  }
  std::set<std::string> families;
  for (const auto& s : sizes) families.insert(s.family);
  for (const char* f : {"small", "powers", "ones", "alternating", "power-neighbours",
                        "power-multiples", "random"}) {
    EXPECT_TRUE(families.count(f)) << f;
  }
  // Deterministic for a seed: a harness may regenerate the list.
  std::vector<thetagate::SizeToMeasure> again =
      thetagate::sizes_to_measure(merge_claim(), "2^12", "32");
  ASSERT_EQ(again.size(), sizes.size());
  for (size_t i = 0; i < sizes.size(); ++i) EXPECT_EQ(again[i].n, sizes[i].n);
}

TEST(SizesToMeasure, AMaximumBelowTheClaimsSmallestSizeIsAnError) {
  thetagate::ClaimSettings settings;
  settings.min_n = "100";
  thetagate::Claim claim = thetagate::Claim::from_text(
      "orchard::bisect / probes", "T(n) = T(floor(n/2)) + 1; T(1) = 1", "Theta(lg n)", settings);
  EXPECT_THROW(thetagate::sizes_to_measure(claim, "50"), thetagate::InputError);
  EXPECT_EQ(thetagate::sizes_to_measure(claim, "120", "110").front().n, "100");
}

class SizesCli : public ::testing::Test {
 protected:
  void SetUp() override {
    file_ = ::testing::TempDir() + "thetagate-sizes-" + std::to_string(::getpid()) + ".toml";
    std::ofstream(file_) << "[[claim]]\nname = \"orchard::stable_sort / comparisons\"\n"
                            "recurrence = \"T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; "
                            "T(1) = 0\"\nbound = \"Theta(n lg n)\"\n\n"
                            "[[claim]]\nname = \"orchard::bisect / probes\"\n"
                            "recurrence = \"T(n) = T(floor(n/2)) + 1; T(1) = 1\"\n"
                            "bound = \"Theta(lg n)\"\n";
  }
  void TearDown() override { std::remove(file_.c_str()); }
  CommandResult sizes(const std::string& options) {
    return run_shell(std::string(THETAGATE_BINARY) + " sizes " + file_ + " " + options);
  }
  std::string file_;
};

TEST_F(SizesCli, PrintsOneSizeAndItsFamilyPerLine) {
  CommandResult r = sizes("--claim 'orchard::stable_sort / comparisons' --max 2^8 --small 4");
  EXPECT_EQ(r.status, 0) << r.out;
  EXPECT_EQ(r.out.rfind("1 small\n2 small\n3 small\n4 small\n", 0), 0u) << r.out;
  EXPECT_NE(r.out.find("\n256 powers\n"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("\n255 ones\n"), std::string::npos) << r.out;
  nlohmann::json j = nlohmann::json::parse(
      sizes("--claim 'orchard::stable_sort / comparisons' --max 2^8 --small 4 --format json").out);
  ASSERT_TRUE(j.is_array());
  EXPECT_EQ(j.front()["n"], "1");
  EXPECT_EQ(j.back()["n"], "256");
}

TEST_F(SizesCli, AFileOfSeveralClaimsNeedsTheClaimNamed) {
  CommandResult r = sizes("");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("holds 2 claims: name one with --claim"), std::string::npos) << r.out;
  r = sizes("--claim 'orchard::bisect / probe'");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("hint: names containing it: 'orchard::bisect / probes'"), std::string::npos)
      << r.out;
  EXPECT_EQ(sizes("--claim 'orchard::bisect / probes' --max 'two'").status, 2);
}

}  // namespace
