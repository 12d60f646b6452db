// Claim files: TOML in, claims or located errors out. Error texts are
// asserted whole (location, source line, caret, hint), as ninja's tests do.
#include <gtest/gtest.h>
#include <unistd.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <set>

#include "tests/support/diagnostic_matchers.h"
#include "verifier/model/claim.h"
#include "verifier/model/claim_discovery.h"

namespace thetagate::engine {
namespace {

using test_support::located;
using test_support::located_error_of;

std::string error_text(const ClaimEntry& entry) {
  return entry.error ? format_diagnostic(*entry.error) : "(no error)";
}

// docs/language.md's key tables and the reader's key lists say the same: a
// row "| `key` | ..." per claim key (under "Claim files"), the `sizes` row
// naming each size key, and a row per [claim.code] key (under "Linking a
// claim to code").
TEST(ClaimFile, KeyTableInTheLanguageDocsMatchesTheReader) {
  std::ifstream in(std::string(THETAGATE_SOURCE_DIR) + "/docs/language.md");
  ASSERT_TRUE(in) << "docs/language.md not found";
  std::vector<std::string> documented, code_documented;
  std::string sizes_row, section;
  for (std::string line; std::getline(in, line);) {
    if (line.rfind("## ", 0) == 0) section = line.substr(3);
    if (line.rfind("| `", 0) != 0) continue;
    std::string key = line.substr(3, line.find('`', 3) - 3);
    if (section == "Linking a claim to code") {
      code_documented.push_back(key);
      continue;
    }
    documented.push_back(key);
    if (key == "sizes") sizes_row = line;
  }
  std::vector<std::string> code_read = code_keys();
  std::sort(code_documented.begin(), code_documented.end());
  std::sort(code_read.begin(), code_read.end());
  EXPECT_EQ(code_documented, code_read);
  std::vector<std::string> read = claim_keys();
  std::sort(documented.begin(), documented.end());
  std::sort(read.begin(), read.end());
  EXPECT_EQ(documented, read);
  for (const std::string& key : size_keys()) {
    EXPECT_NE(sizes_row.find("`" + key + "`"), std::string::npos) << key;
  }
  // And no size key the reader does not know: every `word` followed by " (".
  for (size_t at = sizes_row.find("table:");
       (at = sizes_row.find(", `", at)) != std::string::npos;) {
    std::string key = sizes_row.substr(at + 3, sizes_row.find('`', at + 3) - at - 3);
    EXPECT_NE(std::find(size_keys().begin(), size_keys().end(), key), size_keys().end()) << key;
    at += 3;
  }
}

TEST(ClaimFile, TwoGoodClaimsLoadWithTheirLines) {
  auto entries = load_claim_text(
      "# two claims\n"
      "[[claim]]\n"
      "name = \"orchard::find_sorted / probes\"\n"
      "recurrence = \"T(n) = T(n/2) + 1; T(1) = 1\"\n"
      "bound = \"Theta(lg n)\"\n"
      "\n"
      "[[claim]]\n"
      "name = \"orchard::stable_sort / comparisons\"\n"
      "recurrence = \"\"\"\n"
      "T(n) = 2T(n/2) + n\n"
      "T(1) = 0\n"
      "\"\"\"\n"
      "bound = \"O(n lg n)\"\n"
      "note = \"top-down merge sort\"\n"
      "[claim.sizes]\n"
      "max_bits = 64\n"
      "families = [\"powers\", \"random\"]\n"
      "min_n = \"2^4\"\n"
      "effort = 3\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 2u);
  for (const ClaimEntry& e : entries) ASSERT_FALSE(e.error) << error_text(e);

  const Claim& first = *entries[0].claim;
  EXPECT_EQ(first.name, "orchard::find_sorted / probes");
  EXPECT_EQ(entries[0].name, first.name);
  EXPECT_EQ(first.where.file, "mem.toml");
  EXPECT_EQ(first.where.line, 2);
  EXPECT_EQ(first.bound.kind, BoundKind::kTheta);
  EXPECT_EQ(first.recurrence->main.name, "T");
  EXPECT_FALSE(first.sizes.max_bits);
  EXPECT_EQ(first.sizes.effort, 1u);
  EXPECT_TRUE(first.note.empty());

  const Claim& second = *entries[1].claim;
  EXPECT_EQ(second.where.line, 7);
  EXPECT_EQ(second.bound.kind, BoundKind::kBigO);
  EXPECT_EQ(second.note, "top-down merge sort");
  EXPECT_EQ(second.sizes.max_bits, std::optional<uint64_t>(64));
  EXPECT_EQ(second.sizes.families, (std::vector<std::string>{"powers", "random"}));
  EXPECT_EQ(second.sizes.min_n, std::optional<BigInt>(16));
  EXPECT_EQ(second.sizes.effort, 3u);
  // The recurrence text keeps its place in the file: its first byte is the
  // start of line 10 (TOML drops the line break after the opening quotes).
  Location at = second.recurrence->source.locate(0);
  EXPECT_EQ(at.line, 10);
  EXPECT_EQ(at.column, 1);
  EXPECT_EQ(second.recurrence->text(), "T(n) = 2T(n/2) + n\nT(1) = 0\n");
}

TEST(ClaimFile, UnknownKeyNamesTheKeyAndSuggestsTheClosestOne) {
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"orchard::kd_build / visits\"\n"
      "recurrence = \"T(n) = 2T(n/2) + n\"\n"
      "  bounds = \"Theta(n lg n)\"\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 1u);
  EXPECT_EQ(entries[0].name, "orchard::kd_build / visits");
  EXPECT_FALSE(entries[0].claim);
  EXPECT_EQ(error_text(entries[0]),
            "mem.toml:4:3: error: unknown key 'bounds' in [[claim]]\n"
            "  bounds = \"Theta(n lg n)\"\n"
            "  ^\n"
            "  hint: did you mean 'bound'? allowed keys: name, recurrence, bound, note, sizes, "
            "rounding, code");
}

TEST(ClaimFile, UnknownKeyInSizes) {
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"a\"\n"
      "recurrence = \"T(n) = 2T(n/2) + n\"\n"
      "bound = \"Theta(n lg n)\"\n"
      "sizes = { max_bits = 64, maxbit = 10 }\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 1u);
  EXPECT_EQ(error_text(entries[0]),
            "mem.toml:5:26: error: unknown key 'maxbit' in sizes\n"
            "sizes = { max_bits = 64, maxbit = 10 }\n"
            "                         ^\n"
            "  hint: did you mean 'max_bits'? allowed keys: max_bits, families, min_n, effort");
}

TEST(ClaimFile, UnknownTopLevelKeyIsAnEntryOfItsOwn) {
  auto entries = load_claim_text(
      "bound = \"Theta(n)\"\n"
      "[[claim]]\n"
      "name = \"a\"\n"
      "recurrence = \"T(n) = T(n/2) + n\"\n"
      "bound = \"Theta(n)\"\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 2u);
  EXPECT_EQ(error_text(entries[0]),
            "mem.toml:1:1: error: unknown top-level key 'bound'\n"
            "bound = \"Theta(n)\"\n"
            "^\n"
            "  hint: 'bound' belongs to a claim: put it below a [[claim]] header; a claim file "
            "holds [[claim]] tables");
  EXPECT_TRUE(entries[1].claim) << error_text(entries[1]);
}

TEST(ClaimFile, DuplicateNameIsAnErrorAtTheSecondClaim) {
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"orchard::rope_concat\"\n"
      "recurrence = \"T(n) = T(n/2) + 1\"\n"
      "bound = \"Theta(lg n)\"\n"
      "[[claim]]\n"
      "name   = \"orchard::rope_concat\"\n"
      "recurrence = \"T(n) = T(n/2) + 1\"\n"
      "bound = \"O(lg n)\"\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 2u);
  EXPECT_TRUE(entries[0].claim) << error_text(entries[0]);
  EXPECT_EQ(entries[1].name, "orchard::rope_concat");
  EXPECT_EQ(entries[1].where.line, 5);
  EXPECT_EQ(error_text(entries[1]),
            "mem.toml:6:10: error: duplicate claim name 'orchard::rope_concat' (first used by "
            "the claim on line 1)\n"
            "name   = \"orchard::rope_concat\"\n"
            "         ^\n"
            "  hint: names identify claims in reports; make each one unique, e.g. add the case "
            "measured");
}

TEST(ClaimFile, EffortOutOfRangeIsLocated) {
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"a\"\n"
      "recurrence = \"T(n) = 2T(n/2) + n\"\n"
      "bound = \"Theta(n lg n)\"\n"
      "sizes = { effort = 0 }\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 1u);
  EXPECT_EQ(error_text(entries[0]),
            "mem.toml:5:20: error: 'effort' must be between 1 and 10000, found 0\n"
            "sizes = { effort = 0 }\n"
            "                   ^\n"
            "  hint: the default is 1, about 0.2 s of search per claim");
}

TEST(ClaimFile, WrongTypeNamesTheKeyAndTheExpectedType) {
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"a\"\n"
      "recurrence = \"T(n) = 2T(n/2) + n\"\n"
      "bound = \"Theta(n lg n)\"\n"
      "[claim.sizes]\n"
      "max_bits = \"4096\"\n"
      "[[claim]]\n"
      "name = 7\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 2u);
  EXPECT_EQ(error_text(entries[0]),
            "mem.toml:6:12: error: 'max_bits' must be an integer, found a string\n"
            "max_bits = \"4096\"\n"
            "           ^\n"
            "  hint: write max_bits = 2048");
  EXPECT_EQ(entries[1].name, "");
  EXPECT_EQ(error_text(entries[1]),
            "mem.toml:8:8: error: 'name' must be a string, found an integer\n"
            "name = 7\n"
            "       ^\n"
            "  hint: write name = \"orchard::stable_sort / comparisons\"");
}

TEST(ClaimFile, MissingKeyIsReportedAtTheClaimHeader) {
  auto entries = load_claim_text(
      "\n"
      "[[claim]]\n"
      "name = \"a\"\n"
      "recurrence = \"T(n) = 2T(n/2) + n\"\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 1u);
  EXPECT_EQ(error_text(entries[0]),
            "mem.toml:2:1: error: the claim has no 'bound'\n"
            "[[claim]]\n"
            "^\n"
            "  hint: add bound = \"Theta(n lg n)\"");
}

TEST(ClaimFile, OutOfRangeSizesAndUnknownFamily) {
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"a\"\n"
      "recurrence = \"T(n) = 2T(n/2) + n\"\n"
      "bound = \"Theta(n lg n)\"\n"
      "sizes = { max_bits = 70000 }\n"
      "[[claim]]\n"
      "name = \"b\"\n"
      "recurrence = \"T(n) = 2T(n/2) + n\"\n"
      "bound = \"Theta(n lg n)\"\n"
      "sizes = { families = [\"powers\", \"power\"] }\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 2u);
  EXPECT_EQ(error_text(entries[0]),
            "mem.toml:5:22: error: 'max_bits' must be between 1 and 65536, found 70000\n"
            "sizes = { max_bits = 70000 }\n"
            "                     ^\n"
            "  hint: the default is 4096 bits");
  EXPECT_EQ(located(entries[1].error),
            "mem.toml:10:33: unknown size family 'power' [hint: did you mean 'powers'? families: "
            "small, powers, ones, alternating, power-neighbours, power-multiples, random]");
}

TEST(ClaimFile, SizeTextErrorPointsIntoTheString) {
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"a\"\n"
      "recurrence = \"T(n) = 2T(n/2) + n\"\n"
      "bound = \"Theta(n lg n)\"\n"
      "sizes.min_n = \"2^^4\"\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 1u);
  EXPECT_EQ(error_text(entries[0]),
            "mem.toml:5:18: error: in 'min_n': expected a number, 'n', a function or '(' after "
            "'^', found '^'\n"
            "sizes.min_n = \"2^^4\"\n"
            "                 ^\n"
            "  hint: a value goes here: a number, a name, a call or a parenthesised expression");
}

TEST(ClaimFile, SyntaxErrorInMultiLineRecurrencePointsAtTheFileLine) {
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"orchard::rope_concat / rotations\"\n"
      "recurrence = \"\"\"\n"
      "T(1) = 0\n"
      "T(n) = T(n/2) + lg n)\n"
      "\"\"\"\n"
      "bound = \"Theta(lg^2 n)\"\n",
      "claims/ropes.toml");
  ASSERT_EQ(entries.size(), 1u);
  EXPECT_EQ(error_text(entries[0]),
            "claims/ropes.toml:5:21: error: expected the end of the definition after 'n', found "
            "')'\n"
            "T(n) = T(n/2) + lg n)\n"
            "                    ^\n"
            "  hint: add an operator between terms, or start a condition with 'if'");
}

TEST(ClaimFile, SyntaxErrorInOneLineBoundPointsAtTheColumn) {
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"a\"\n"
      "recurrence = 'T(n) = 2T(n/2) + n'\n"
      "bound      = \"Theta(n lg n\"\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 1u);
  EXPECT_EQ(error_text(entries[0]),
            "mem.toml:4:27: error: expected ')' after 'n', found the end of the text\n"
            "bound      = \"Theta(n lg n\"\n"
            "                          ^\n"
            "  hint: close the class: Theta(...)");
}

TEST(ClaimFile, StringWithEscapesPointsAtItsOpeningQuote) {
  // "\u0071" decodes to 'q': decoded text and file bytes differ, so no
  // position inside the string can be trusted; the error names the string.
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"a\"\n"
      "recurrence = \"T(n) = 2T(n/2) + \\u0071\"\n"
      "bound = \"Theta(n lg n)\"\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 1u);
  EXPECT_EQ(located(entries[0].error),
            "mem.toml:3:14: unknown name 'q' [hint: the size is written 'n'; functions take "
            "parentheses: f(n)]");
}

TEST(ClaimFile, InvalidTomlGivesOneEntryWithTheTomlPosition) {
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"orchard::stable_sort\n"
      "bound = \"Theta(n lg n)\"\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 1u);
  ASSERT_TRUE(entries[0].error);
  EXPECT_FALSE(entries[0].claim);
  const Diagnostic& d = *entries[0].error;
  // The wording after the prefix is toml++'s own; pin only our part of it.
  EXPECT_EQ(d.message.rfind("not valid TOML: ", 0), 0u) << d.message;
  EXPECT_EQ(d.where.file, "mem.toml");
  EXPECT_EQ(d.where.line, 2);
  EXPECT_EQ(d.where.column, 29);
  EXPECT_EQ(d.source_line, "name = \"orchard::stable_sort");
  EXPECT_EQ(d.hint,
            "a \"...\" string ends on its line; write a multi-line recurrence in \"\"\"...\"\"\"");
}

TEST(ClaimFile, OneBadClaimDoesNotHideTheOthers) {
  auto entries = load_claim_text(
      "[[claim]]\n"
      "name = \"good one\"\n"
      "recurrence = \"T(n) = 2T(n/2) + n\"\n"
      "bound = \"Theta(n lg n)\"\n"
      "[[claim]]\n"
      "name = \"bad one\"\n"
      "recurrence = \"T(n) = 2T(n/2) +\"\n"
      "bound = \"Theta(n lg n)\"\n"
      "[[claim]]\n"
      "name = \"good two\"\n"
      "recurrence = \"T(n) = T(n - 1) + 1; T(0) = 0\"\n"
      "bound = \"T(n) = n for n >= 0\"\n",
      "mem.toml");
  ASSERT_EQ(entries.size(), 3u);
  EXPECT_TRUE(entries[0].claim) << error_text(entries[0]);
  EXPECT_EQ(entries[1].name, "bad one");
  EXPECT_EQ(entries[1].where.line, 5);
  EXPECT_FALSE(entries[1].claim);
  EXPECT_EQ(located(entries[1].error),
            "mem.toml:7:31: expected a number, 'n', a function or '(' after '+', found the end of "
            "the text [hint: the expression stops too early]");
  ASSERT_TRUE(entries[2].claim) << error_text(entries[2]);
  EXPECT_EQ(entries[2].claim->bound.kind, BoundKind::kExplicit);
  EXPECT_EQ(entries[2].claim->bound.n0, 0);
}

TEST(ClaimFile, EmptyFileAndMissingFileEachGiveOneError) {
  auto empty = load_claim_text("# nothing yet\n", "mem.toml");
  ASSERT_EQ(empty.size(), 1u);
  EXPECT_EQ(located(empty[0].error),
            "mem.toml:1:1: the file holds no claims [hint: start a claim with [[claim]], then "
            "name, recurrence and bound]");

  auto missing = load_claim_file("/nonexistent/thetagate/claims.toml");
  ASSERT_EQ(missing.size(), 1u);
  EXPECT_EQ(
      located(missing[0].error),
      "/nonexistent/thetagate/claims.toml:1:1: cannot read the claim file: No such file or "
      "directory [hint: check the path; claim files are TOML files such as claims/sorting.toml]");
}

TEST(ClaimFile, FindClaimFilesExpandsFoldersSorted) {
  namespace fs = std::filesystem;
  fs::path root = fs::path(::testing::TempDir()) / ("thetagate_claims_" + std::to_string(getpid()));
  fs::remove_all(root);
  fs::create_directories(root / "deep" / "er");
  for (const char* name : {"b.toml", "a.toml", "notes.txt", "deep/er/c.toml", "deep/z.toml"}) {
    std::ofstream(root / name) << "# empty\n";
  }
  std::string single = (root / "notes.txt").string();
  auto files = find_claim_files({single, root.string()});
  std::vector<std::string> expected = {
      single, (root / "a.toml").string(), (root / "b.toml").string(),
      (root / "deep/er/c.toml").string(), (root / "deep/z.toml").string()};
  EXPECT_EQ(files, expected);
  // The message names the path, which is a fresh temporary folder each run.
  std::string missing = (root / "missing").string();
  EXPECT_EQ(
      located_error_of([&] { find_claim_files({missing}); }),
      missing + ":1:1: no such file or folder: '" + missing +
          "' [hint: give claim files (*.toml) or folders holding them; the default is claims/]");
  fs::remove_all(root);
}

TEST(ClaimFile, DemoLibraryLoadsWithoutErrors) {
  auto files = find_claim_files({std::string(THETAGATE_SOURCE_DIR) + "/claims"});
  EXPECT_GE(files.size(), 3u);
  std::set<std::string> names;
  size_t claims = 0;
  for (const std::string& file : files) {
    for (const ClaimEntry& e : load_claim_file(file)) {
      EXPECT_FALSE(e.error) << error_text(e);
      EXPECT_TRUE(names.insert(e.name).second) << "duplicate name " << e.name;
      ++claims;
    }
  }
  EXPECT_GE(claims, 14u);
}

}  // namespace
}  // namespace thetagate::engine
