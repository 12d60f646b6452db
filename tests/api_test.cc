// The public API (include/thetagate/): claims from strings and TOML, checks,
// derivations, exact evaluation, reports and the error taxonomy, exercised
// as a program outside the engine would.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "tests/support/claim_texts.h"
#include "thetagate/thetagate.h"

namespace {

using thetagate::Basis;
using thetagate::basis_name;
using thetagate::Claim;
using thetagate::ClaimResult;
using thetagate::InputError;
using thetagate::Verdict;

constexpr const char* kMergeSort = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1; T(1) = 0";

TEST(PublicApi, EvaluatesMergeSortWorstCaseExactly) {
  // W(n) = n⌈lg n⌉ − 2^⌈lg n⌉ + 1 (Suchenek; docs/sources.md, "Values").
  thetagate::Evaluator evaluator(thetagate::Recurrence::parse(kMergeSort));
  EXPECT_EQ(evaluator.value_at("37"), "159");     // 37·6 − 64 + 1
  EXPECT_EQ(evaluator.value_at("2^10"), "9217");  // 1024·10 − 1024 + 1
  // n = 2^64 + 1: ⌈lg n⌉ = 65, so n·65 − 2^65 + 1.
  EXPECT_EQ(thetagate::exact_size("2^64 + 1"), "18446744073709551617");
  EXPECT_EQ(evaluator.value_at("2^64 + 1"), "1162144876643701751874");
}

TEST(PublicApi, ChecksAClaimBuiltFromStrings) {
  Claim claim = Claim::from_text("orchard::stable_sort / comparisons", kMergeSort, "Theta(n lg n)");
  ClaimResult held = thetagate::check(claim, {.seed = 3});
  EXPECT_EQ(held.verdict, Verdict::kHolds) << held.message;
  EXPECT_EQ(held.name, "orchard::stable_sort / comparisons");
  EXPECT_NE(held.derived.find("lg n"), std::string::npos);
  EXPECT_GT(held.sizes_checked, 0u);
  // A green result names its proof (the master theorem, Cormen et al.,
  // Introduction to Algorithms, 3rd ed., Section 4.5, case 2), as data.
  EXPECT_EQ(held.basis, Basis::kDerivationAgrees);
  EXPECT_STREQ(basis_name(held.basis), "derivation_agrees");
  EXPECT_NE(held.proof.find("master theorem"), std::string::npos) << held.proof;
  EXPECT_FALSE(held.steps.empty());

  // Θ(n) is wrong by a lg n factor: a witness n, exact, as decimal digits.
  ClaimResult wrong =
      thetagate::check(Claim::from_text("orchard::stable_sort / linear", kMergeSort, "O(n)"));
  ASSERT_EQ(wrong.verdict, Verdict::kRefuted) << wrong.message;
  ASSERT_FALSE(wrong.witnesses.empty());
  const std::string& n = wrong.witnesses.front().n;
  EXPECT_FALSE(n.empty());
  EXPECT_EQ(n.find_first_not_of("0123456789"), std::string::npos) << n;
  EXPECT_TRUE(wrong.proof.empty());
  EXPECT_TRUE(wrong.basis == Basis::kDerivationContradicts || wrong.basis == Basis::kCertifiedBreak)
      << basis_name(wrong.basis);
}

TEST(PublicApi, ExplicitBoundsAreCheckedAtEverySize) {
  // W(n) <= n lg n for n >= 1 holds: W(n) = n lg n + n A(lg n) + 1 with
  // A <= −0.9139 (Suchenek; docs/sources.md, "Values"), and W(1) = 0.
  ClaimResult r = thetagate::check(
      Claim::from_text("orchard::merge / comparisons", kMergeSort, "T(n) <= n lg n for n >= 1"));
  EXPECT_EQ(r.verdict, Verdict::kHolds) << r.message;
  EXPECT_EQ(r.basis, Basis::kInduction) << r.message;
  EXPECT_NE(r.proof.find("induction"), std::string::npos) << r.proof;
}

TEST(PublicApi, BadInputThrowsALocatedInputError) {
  try {
    Claim::from_text("orchard::x", "T(n) = 2T(n/2) + ", "Theta(n)");
    ADD_FAILURE() << "no InputError";
  } catch (const InputError& e) {
    EXPECT_EQ(e.diagnostic().where.file, "<recurrence>");
    EXPECT_GT(e.diagnostic().where.column, 1);
    EXPECT_NE(std::string(e.what()).find("<recurrence>:1:"), std::string::npos);
  }
  EXPECT_THROW(Claim::from_text("orchard::x", kMergeSort, "Theta(n lg)"), InputError);
  EXPECT_THROW(Claim::from_text(" ", kMergeSort, "Theta(n)"), InputError);
  thetagate::ClaimSettings settings;
  settings.families = {"powerz"};
  EXPECT_THROW(Claim::from_text("orchard::x", kMergeSort, "Theta(n lg n)", settings), InputError);
  EXPECT_THROW(thetagate::exact_size("n + 1"), InputError);
  EXPECT_THROW(thetagate::exact_size("-3"), InputError);
  thetagate::CheckOptions options;
  options.effort = 0;
  EXPECT_THROW(
      thetagate::check(Claim::from_text("orchard::x", kMergeSort, "Theta(n lg n)"), options),
      InputError);
}

TEST(PublicApi, AllErrorsShareOneBase) {
  // A program can catch everything thetagate throws on purpose at once.
  try {
    thetagate::Recurrence::parse("T(n) = ");
    ADD_FAILURE() << "no exception";
  } catch (const thetagate::Error& e) {
    EXPECT_NE(dynamic_cast<const InputError*>(&e), nullptr);
  }
  thetagate::InternalError bug("orchard::x", "index out of range");
  EXPECT_NE(std::string(bug.what()).find("bug"), std::string::npos);
  EXPECT_NE(std::string(bug.what()).find("orchard::x"), std::string::npos);
  EXPECT_STREQ(thetagate::limit_name(thetagate::Limit::kPrecision), "precision");
}

TEST(PublicApi, DerivesWithTheMasterTheorem) {
  // T(n) = 2T(n/2) + n/lg n is Θ(n lg lg n): the polylog extension of case 2
  // with k = −1 (docs/sources.md, "Theorems").
  thetagate::Derivation d = thetagate::derive("T(n) = 2T(n/2) + n/lg n; T(1) = 1");
  ASSERT_TRUE(d.derived());
  EXPECT_EQ(d.bound(), "n lg lg n");
  EXPECT_NE(d.method().find("master theorem"), std::string::npos);
  EXPECT_FALSE(d.steps().empty());
  EXPECT_NE(d.to_text().find("Θ(n lg lg n)"), std::string::npos);
  EXPECT_NE(d.to_json().find("\"derived\""), std::string::npos);
  // The theorems that did not apply have one name, in the API and the JSON.
  thetagate::Derivation none = thetagate::derive("T(n) = T(n/2) + n mod 3; T(1) = 1");
  ASSERT_FALSE(none.derived());
  ASSERT_FALSE(none.failed_hypotheses().empty());
  EXPECT_NE(none.to_json().find("\"failed_hypotheses\": [\n    \"" + none.failed_hypotheses()[0]),
            std::string::npos)
      << none.to_json();
  EXPECT_EQ(none.to_json().find("not_applied"), std::string::npos);
}

TEST(PublicApi, LoadsSelectsAndChecksClaimsFromToml) {
  // The broken claim's recurrence is on line 8.
  std::string toml = std::string(thetagate::engine::test_support::kHeapSiftDownsClaim) + R"toml(
[[claim]]
name = "orchard::heap / broken"
recurrence = "T(n) = T(n/2) + "
bound = "Theta(lg n)"

)toml" + thetagate::engine::test_support::kHeapBuildClaim;
  std::vector<Claim> claims = thetagate::load_claims_from_text(toml, "heap.toml");
  ASSERT_EQ(claims.size(), 3u);
  EXPECT_FALSE(claims[0].error());
  ASSERT_TRUE(claims[1].error());
  EXPECT_EQ(claims[1].error()->where.file, "heap.toml");
  EXPECT_EQ(claims[1].error()->where.line, 8);

  thetagate::Report report = thetagate::check(claims, {.seed = 5, .jobs = 2});
  ASSERT_EQ(report.claims().size(), 3u);
  EXPECT_EQ(report.seed(), 5u);
  EXPECT_EQ(report.claims()[0].verdict, Verdict::kHolds);
  EXPECT_EQ(report.claims()[1].verdict, Verdict::kError);
  EXPECT_EQ(report.claims()[2].verdict, Verdict::kHolds);
  EXPECT_TRUE(report.any_error());
  EXPECT_FALSE(report.any_internal_error());

  std::vector<Claim> picked = thetagate::select_claims(claims, {"orchard::heap / build"});
  ASSERT_EQ(picked.size(), 1u);
  EXPECT_EQ(picked[0].name(), "orchard::heap / build");
  try {
    thetagate::select_claims(claims, {"orchard::heap / biuld"});
    ADD_FAILURE() << "no InputError";
  } catch (const InputError& e) {
    EXPECT_NE(e.diagnostic().hint.find("orchard::heap / build"), std::string::npos);
  }
}

TEST(PublicApi, ReportsRenderAndReadBack) {
  Claim claim = Claim::from_text("orchard::stable_sort / comparisons", kMergeSort, "Theta(n lg n)");
  thetagate::Report report = thetagate::check(std::vector<Claim>{claim});
  std::string json = thetagate::render(report, thetagate::Format::kJson);
  thetagate::Report again = thetagate::read_json_report(json, "old.json");
  EXPECT_EQ(thetagate::render(again, thetagate::Format::kJson), json);
  EXPECT_FALSE(thetagate::drift_from_baseline(again, report).any());
  EXPECT_NE(thetagate::render(report, thetagate::Format::kText).find("holds"), std::string::npos);
  EXPECT_NE(thetagate::render(report, thetagate::Format::kJunit).find("<testsuites"),
            std::string::npos);
  EXPECT_THROW(thetagate::read_json_report("{", "old.json"), InputError);
}

TEST(PublicApi, VersionOfHeadersAndLibraryAgree) {
  EXPECT_STREQ(thetagate::version(), THETAGATE_VERSION_STRING);
}

}  // namespace
