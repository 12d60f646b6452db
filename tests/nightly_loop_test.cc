// The README's nightly recipe, run as written (with a small effort) from an
// empty folder, night after night (issue "Nightly runs", §1): the first
// night has no baseline and must still work; the second compares with the
// first; an edited claim then shows as drift and fails the run.
#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "tests/support/test_support.h"

namespace {

namespace fs = std::filesystem;
using thetagate::engine::test_support::CommandResult;
using thetagate::engine::test_support::count_of;
using thetagate::engine::test_support::run_shell;

std::string read(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  return std::string(std::istreambuf_iterator<char>(in), {});
}

// The first ```sh block after "A nightly job" in README.md.
std::string readme_nightly_recipe() {
  std::string readme = read(fs::path(THETAGATE_SOURCE_DIR) / "README.md");
  size_t at = readme.find("A nightly job");
  if (at == std::string::npos) return "";
  size_t begin = readme.find("```sh\n", at);
  size_t end = readme.find("```", begin + 6);
  if (begin == std::string::npos || end == std::string::npos) return "";
  return readme.substr(begin + 6, end - begin - 6);
}

const char* const kHalving = R"toml([[claim]]
name = "orchard::find_sorted / probes"
recurrence = "T(n) = T(n/2) + 1; T(1) = 1"
bound = "Theta(lg n)"
)toml";

const char* const kMerge = R"toml([[claim]]
name = "orchard::stable_sort / comparisons"
recurrence = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0"
bound = "Theta(n lg n)"
)toml";

TEST(NightlyLoop, TheReadmeRecipeWorksFromTheFirstNightOn) {
  std::string recipe = readme_nightly_recipe();
  ASSERT_NE(recipe.find("--baseline last/report.json"), std::string::npos) << recipe;
  ASSERT_NE(recipe.find("cp nightly/report.json last/report.json"), std::string::npos) << recipe;
  // The same commands, with this build's binary and a small effort.
  size_t effort = recipe.find("--effort 20");
  ASSERT_NE(effort, std::string::npos);
  recipe.replace(effort, 11, "--effort 1");

  fs::path dir = fs::temp_directory_path() / ("thetagate-nightly-" + std::to_string(::getpid()));
  fs::remove_all(dir);
  fs::create_directories(dir / "claims");
  std::ofstream(dir / "claims" / "search.toml") << kHalving;
  std::ofstream(dir / "claims" / "sorting.toml") << kMerge;
  std::ofstream(dir / "nightly.sh") << recipe;
  fs::path bin = fs::path(THETAGATE_BINARY).parent_path();
  std::string night =
      "cd '" + dir.string() + "' && PATH='" + bin.string() + "':\"$PATH\" && bash nightly.sh";

  CommandResult first = run_shell(night);
  EXPECT_EQ(first.status, 0) << first.out;
  EXPECT_NE(first.out.find("no baseline yet at 'last/report.json'"), std::string::npos)
      << first.out;
  EXPECT_NE(first.out.find("2 claims: 2 holds, 0 refuted, 0 undecided, 0 errors"),
            std::string::npos)
      << first.out;
  EXPECT_NE(first.out.find("wrote nightly/report.json"), std::string::npos) << first.out;
  EXPECT_TRUE(fs::exists(dir / "last" / "report.json"));

  CommandResult second = run_shell(night);
  EXPECT_EQ(second.status, 0) << second.out;
  EXPECT_EQ(second.out.find("no baseline yet"), std::string::npos) << second.out;
  EXPECT_NE(read(dir / "nightly" / "report.txt").find("no drift against the baseline"),
            std::string::npos);

  // A maintainer edits a bound: that night fails, and says the claim drifted.
  std::ofstream(dir / "claims" / "search.toml", std::ios::trunc)
      << std::string(kHalving).replace(std::string(kHalving).find("Theta(lg n)"), 11, "O(1)");
  CommandResult third = run_shell(night);
  EXPECT_EQ(third.status, 1) << third.out;
  std::string text = read(dir / "nightly" / "report.txt");
  EXPECT_NE(text.find("drift against the baseline: 1 of 2 claims changed"), std::string::npos)
      << text;
  // Its first line of drift is the cause: the edit, before the verdict.
  size_t edit = text.find("the bound changed: Theta(lg n) → O(1)");
  EXPECT_NE(edit, std::string::npos) << text;
  EXPECT_LT(edit, text.find("verdict holds → refuted", edit)) << text;
  // The CI's test view agrees with the exit code: the drifted claim is a
  // failure in JUnit (it is refuted now, and says how it drifted).
  std::string junit = read(dir / "nightly" / "report.junit.xml");
  EXPECT_NE(junit.find("<testsuites name=\"thetagate\" tests=\"2\" failures=\"1\""),
            std::string::npos)
      << junit;
  EXPECT_NE(junit.find("verdict holds → refuted"), std::string::npos) << junit;

  // A drift-only night: the bound loosened (still holds) and a claim
  // renamed (matched by its text, not one lost and one new). Every change
  // is a JUnit failure.
  fs::copy_file(dir / "nightly" / "report.json", dir / "last" / "report.json",
                fs::copy_options::overwrite_existing);
  std::ofstream(dir / "claims" / "search.toml", std::ios::trunc)
      << std::string(kHalving).replace(std::string(kHalving).find("Theta(lg n)"), 11, "O(n)");
  std::ofstream(dir / "claims" / "sorting.toml", std::ios::trunc)
      << std::string(kMerge).replace(std::string(kMerge).find("comparisons"), 11, "compares");
  CommandResult fourth = run_shell(night);
  EXPECT_EQ(fourth.status, 1) << fourth.out;
  junit = read(dir / "nightly" / "report.junit.xml");
  EXPECT_NE(junit.find("<testsuites name=\"thetagate\" tests=\"2\" failures=\"2\""),
            std::string::npos)
      << junit;
  EXPECT_EQ(count_of(junit, "type=\"drift\""), 2u) << junit;
  EXPECT_NE(junit.find("the bound changed: O(1) → O(n)"), std::string::npos) << junit;
  EXPECT_NE(junit.find("renamed from orchard::stable_sort / comparisons"), std::string::npos)
      << junit;
  EXPECT_EQ(junit.find("lost since the baseline"), std::string::npos) << junit;
  EXPECT_EQ(junit.find("failures=\"0\""), std::string::npos) << junit;
  fs::remove_all(dir);
}

TEST(NightlyLoop, AReportFileTakesItsFormatFromItsExtension) {
  fs::path dir = fs::temp_directory_path() / ("thetagate-out-" + std::to_string(::getpid()));
  fs::remove_all(dir);
  fs::create_directories(dir);
  std::ofstream(dir / "search.toml") << kHalving;
  std::string tg = std::string("cd '") + dir.string() + "' && '" + THETAGATE_BINARY +
                   "' check search.toml --clock-limit 0 ";
  for (const auto& [file, start] :
       {std::pair{"r.json", "{"}, std::pair{"r.xml", "<?xml"},
        std::pair{"r.html", "<!DOCTYPE html>"}, std::pair{"r.txt", "thetagate "},
        std::pair{"r.md", "### thetagate: 1 claim"}}) {
    CommandResult r = run_shell(tg + "--out " + file);
    EXPECT_EQ(r.status, 0) << r.out;
    EXPECT_EQ(r.out, std::string("1 claim: 1 holds, 0 refuted, 0 undecided, 0 errors\nwrote ") +
                         file + "\n");
    EXPECT_EQ(read(dir / file).rfind(start, 0), 0u) << file;
  }
  // An extension that contradicts --format is a usage error; one that agrees is fine.
  CommandResult clash = run_shell(tg + "--out r.html --format json");
  EXPECT_EQ(clash.status, 2) << clash.out;
  EXPECT_NE(clash.out.find("--out 'r.html' asks by its extension for the html format, but "
                           "--format says json"),
            std::string::npos)
      << clash.out;
  EXPECT_EQ(run_shell(tg + "--out r.json --format json").status, 0);
  // Other names keep --format (text by default).
  EXPECT_EQ(run_shell(tg + "--out report --format junit").status, 0);
  EXPECT_EQ(read(dir / "report").rfind("<?xml", 0), 0u);
  // A baseline that exists but is no report stays an error.
  fs::create_directories(dir / "last" / "report.json");
  CommandResult folder = run_shell(tg + "--baseline last/report.json");
  EXPECT_EQ(folder.status, 2) << folder.out;
  std::ofstream(dir / "cut.json") << "{\"schema_version\": 2, \"claims\": [";
  EXPECT_EQ(run_shell(tg + "--baseline cut.json").status, 2);
  fs::remove_all(dir);
}

}  // namespace
