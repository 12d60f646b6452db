// Adversarial input, second round (issue 22, items 3, 6, 14 and 20): helper
// chains and fan-outs, sum variables that shadow functions, and messages for
// small sizes, nesting, invisible and look-alike characters and constants.
// Each test fails without its fix.
#include <gtest/gtest.h>

#include <functional>
#include <nlohmann/json.hpp>
#include <string>

#include "tests/support/diagnostic_matchers.h"
#include "tests/support/test_support.h"
#include "verifier/derivation/derive.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/bound.h"
#include "verifier/model/claim.h"
#include "verifier/model/recurrence.h"

namespace thetagate::engine {
namespace {

using test_support::located;

Diagnostic error_of(const std::function<void()>& f) {
  try {
    f();
  } catch (const InputError& e) {
    return e.diagnostic();
  }
  Diagnostic none;
  none.message = "(no error)";
  return none;
}

Diagnostic recurrence_error(const std::string& text) {
  return error_of([&] { recurrence_from_text(text); });
}

Budget no_clock() {
  Budget b;
  b.max_seconds = 0;  // only the work budgets: the same on every machine
  return b;
}

// f0(n) = f1(n) + 1, ..., f{k-1}(n) = fk(n) + 1, fk(n) = n, called by T.
std::string helper_chain(int k, const std::string& argument = "n") {
  std::string text = "T(n) = T(n/2) + f0(n)\nT(1) = 1\n";
  for (int i = 0; i < k; ++i) {
    text +=
        "f" + std::to_string(i) + "(n) = f" + std::to_string(i + 1) + "(" + argument + ") + 1\n";
  }
  return text + "f" + std::to_string(k) + "(n) = n\n";
}

// f_i(n) = f_{i+1}(a) + f_{i+1}(b), `levels` deep, f_levels(n) = n.
std::string helper_fan_out(int levels, const std::string& a = "n", const std::string& b = "n") {
  std::string text = "T(n) = T(n/2) + f0(n)\nT(1) = 1\n";
  for (int i = 0; i < levels; ++i) {
    std::string next = "f" + std::to_string(i + 1);
    text += "f" + std::to_string(i) + "(n) = " + next + "(" + a + ") + " + next + "(" + b + ")\n";
  }
  return text + "f" + std::to_string(levels) + "(n) = n\n";
}

// Item 3: 7,000 helpers overflowed the stack; now a located error at the
// first call of the chain, naming it.
TEST(HelperHardening, AChainOfSevenThousandHelpersIsALocatedError) {
  // At f0 in T's line.
  EXPECT_EQ(located(recurrence_error(helper_chain(7000))),
            "<recurrence>:1:17: helper calls nest too deeply: f0 → f1 → f2 → … → f7000 (7001 "
            "helpers) reach more than 1000 levels, counting each helper's own expression [hint: a "
            "chain of helpers this long is a recurrence: write it as one recursive function with a "
            "base case, or substitute helpers into their callers]");
}

// The class, not one shape: helpers nested through their arguments count
// the same way.
TEST(HelperHardening, HelpersNestedThroughArgumentsAreBoundedToo) {
  EXPECT_EQ(located(recurrence_error(helper_chain(3000, "n + 1"))),
            "<recurrence>:1:17: helper calls nest too deeply: f0 → f1 → f2 → … → f3000 (3001 "
            "helpers) reach more than 1000 levels, counting each helper's own expression [hint: a "
            "chain of helpers this long is a recurrence: write it as one recursive function with a "
            "base case, or substitute helpers into their callers]");
  // f(n) = g(g(g(...))) doubles nothing but stacks every level.
  std::string nested = "T(n) = T(n/2) + f0(n)\nT(1) = 1\n";
  for (int i = 0; i < 12; ++i) {
    std::string next = "f" + std::to_string(i + 1);
    nested += "f" + std::to_string(i) + "(n) = " + next + "(" + next + "(" + next + "(n)))\n";
  }
  nested += "f12(n) = n + 1\n";
  EXPECT_EQ(located(recurrence_error(nested)),
            "<recurrence>:1:17: helper calls nest too deeply: f0 → f1 → f2 → … → f12 (13 helpers) "
            "reach more than 1000 levels, counting each helper's own expression [hint: a chain of "
            "helpers this long is a recurrence: write it as one recursive function with a base "
            "case, or substitute helpers into their callers]");
}

TEST(HelperHardening, AChainWithinTheLimitEvaluatesExactly) {
  auto r = recurrence_from_text(helper_chain(200));
  Evaluator evaluator(r, no_clock());
  // f0(n) = n + 200; T(2) = T(1) + f0(2) = 1 + 202.
  EXPECT_EQ(evaluator.value_at(BigInt(2)).str(), "203");
}

TEST(HelperHardening, HelperRecursionIsStillRefused) {
  EXPECT_EQ(
      located(recurrence_error("T(n) = T(n/2) + f(n)\nT(1) = 1\nf(n) = g(n)\ng(n) = f(n) + 1")),
      "<recurrence>:4:8: helper 'f' is used recursively (recursion among helpers, or mutual "
      "recursion, is not supported) [hint: only the main function may recurse; helpers are plain "
      "formulas]");
}

// Item 6: 40 levels of f(n) = g(n) + g(n) are 2^40 evaluations unless a
// helper's value is remembered by argument.
TEST(HelperHardening, FanOutHelpersAreRememberedByArgument) {
  auto r = recurrence_from_text(helper_fan_out(40));
  Evaluator evaluator(r, no_clock());
  // f0(n) = 2^40 n, so T(2^20) = 1 + 2^40 (2^21 - 2).
  BigInt expected = BigInt(1) + (BigInt(1) << 40) * ((BigInt(1) << 21) - 2);
  EXPECT_EQ(evaluator.value_at(BigInt(1) << 20).str(), expected.str());
  // 21 sizes; each above 1 has 41 distinct helper values (f0 ... f40).
  EXPECT_EQ(evaluator.stats().steps, 21u);
  EXPECT_EQ(evaluator.stats().helper_steps, 20u * 41u);
}

// Arguments that never repeat cannot be remembered: each helper value is
// then a step, and the step budget ends the evaluation.
TEST(HelperHardening, HelperEvaluationIsChargedToTheStepBudget) {
  auto r = recurrence_from_text(helper_fan_out(40, "2n", "2n + 1"));
  Budget budget = no_clock();
  budget.max_steps = 10'000;
  Evaluator evaluator(r, budget);
  try {
    evaluator.value_at(BigInt(64));
    FAIL() << "2^40 helper evaluations finished within 10,000 steps";
  } catch (const BudgetExceeded& e) {
    EXPECT_EQ(e.limit(), Limit::kSteps) << e.what();
  }
}

TEST(HelperHardening, TheClockGuardSeesHelperEvaluation) {
  auto r = recurrence_from_text(helper_fan_out(40, "2n", "2n + 1"));
  Budget budget;
  budget.max_seconds = 0.2;
  Evaluator evaluator(r, budget);
  try {
    evaluator.value_at(BigInt(64));
    FAIL() << "2^40 helper evaluations finished";
  } catch (const BudgetExceeded& e) {
    EXPECT_TRUE(e.limit() == Limit::kTime || e.limit() == Limit::kSteps) << e.what();
  }
}

TEST(HelperHardening, TheDerivationRefusesToWriteOutAFanOut) {
  auto r = recurrence_from_text(helper_fan_out(40));
  Derivation d = derive(*r);  // 2^40 expansions before the fix
  EXPECT_FALSE(d.derived_class());
}

// Item 14: sum(T, 1, n-1, T(T)) read T(T) as T*T inside the sum.
TEST(HelperHardening, ASumVariableNamedLikeTheFunctionIsAnError) {
  // At the variable, after "sum(".
  EXPECT_EQ(
      located(recurrence_error("T(n) = n + sum(T, 1, n-1, T(T)); T(1) = 1")),
      "<recurrence>:1:16: the sum's variable 'T' has the name of the function T, which it would "
      "hide inside the sum [hint: give the variable another name: sum(k, 1, n-1, T(k))]");
}

TEST(HelperHardening, ASumVariableNamedLikeAHelperIsAnError) {
  EXPECT_EQ(
      located(recurrence_error(
          "T(n) = T(n/2) + g(n); T(1) = 1; f(n) = n^2; g(n) = sum(f, 1, n, f(f))")),
      "<recurrence>:1:56: the sum's variable 'f' has the name of the helper function f, which it "
      "would hide inside the sum [hint: give the variable another name: sum(k, 1, n, f(k))]");
}

TEST(HelperHardening, ASumVariableNamedLikeTheFunctionInABoundIsAnError) {
  EXPECT_EQ(located(error_of(
                [] { parse_bound(SourceText::whole("<bound>", "Theta(sum(T, 1, n, T))")); })),
            "<bound>:1:11: the sum's variable 'T' has the name of the function T, which it would "
            "hide inside the sum [hint: give the variable another name: sum(k, 1, n, k)]");
}

// Item 20: with T(1) = 1 written, T(2) and T(3) call T(0), which has no base
// case; the message names them and the base case that closes the gap.
TEST(HelperHardening, SizesThatFallBelowTheBaseCasesAreNamed) {
  auto r = recurrence_from_text("T(n) = 3T(n/4) + n; T(1) = 1");
  Evaluator evaluator(r, no_clock());
  EXPECT_EQ(
      located(error_of([&] { evaluator.value_at(BigInt(2)); })),
      "<recurrence>:1:9: T(n/4) at n = 0 calls T(0), which does not shrink; it is reached "
      "from n = 2..3 (T(n/4) at n = 2 is T(0)), and no base case covers those sizes [hint: add a "
      "base case for n < 4, e.g. T(n) = 1 if n < 4 (once base cases are written, no other "
      "small size is assumed: see 'Base cases' in docs/language.md)]");
  // The suggested base case is enough.
  Evaluator fixed(recurrence_from_text("T(n) = 3T(n/4) + n; T(1) = 1; T(n) = 1 if n < 4"),
                  no_clock());
  EXPECT_EQ(fixed.value_at(BigInt(16)).str(), "37");  // T(4) = 3 + 4 = 7; T(16) = 21 + 16
}

std::string nested_parentheses(size_t levels) {
  return "T(n) = T(n/2) + " + std::string(levels, '(') + "n" + std::string(levels, ')') +
         "; T(1) = 1";
}

TEST(HelperHardening, AThousandNestedParenthesesParse) {
  EXPECT_EQ(recurrence_error(nested_parentheses(100)).message, "(no error)");
  EXPECT_EQ(recurrence_error(nested_parentheses(1000)).message, "(no error)");
  EXPECT_EQ(located(recurrence_error(nested_parentheses(5000))),
            "<recurrence>:1:1033: the expression is nested too deeply [hint: more than 1000 levels "
            "of parentheses and prefix operators; simplify it]");
}

TEST(HelperHardening, InvisibleCharactersAreNamedNotShown) {
  // The whole text holds no raw U+200B or U+00A0: only their names.
  EXPECT_EQ(located(recurrence_error("T(n) = 2T(n/2) +\u200bn; T(1) = 1")),
            "<recurrence>:1:17: invisible character U+200B ZERO WIDTH SPACE [hint: delete it (it "
            "cannot be seen)]");
  EXPECT_EQ(located(recurrence_error("T(n) = 2T(n/2) +\u00a0n; T(1) = 1")),
            "<recurrence>:1:17: invisible character U+00A0 NO-BREAK SPACE where a space goes "
            "[hint: replace it with an ordinary space]");
}

TEST(HelperHardening, AByteOrderMarkInsideAClaimStringIsNamed) {
  std::vector<ClaimEntry> entries = load_claim_text(
      "[[claim]]\nname = \"bom\"\nrecurrence = \"T(n) = T(n/2) + 1;\ufeff T(1) = 1\"\n"
      "bound = \"Theta(lg n)\"\n",
      "bom.toml");
  ASSERT_EQ(entries.size(), 1u);
  EXPECT_EQ(located(entries[0].error),
            "bom.toml:3:33: invisible character U+FEFF ZERO WIDTH NO-BREAK SPACE (byte order mark) "
            "[hint: delete it (it cannot be seen)]");
}

TEST(HelperHardening, LookAlikesSuggestTheAsciiCharacter) {
  // Cyrillic Te, en dash, fullwidth 1.
  EXPECT_EQ(located(recurrence_error("T(n) = 2\u0422(n/2) + n; T(1) = 1")),
            "<recurrence>:1:9: character 'Т' (U+0422 CYRILLIC CAPITAL LETTER TE) is not the ASCII "
            "'T' [hint: replace it with 'T']");
  EXPECT_EQ(located(recurrence_error("T(n) = 2T(n/2) + n \u2013 1; T(1) = 1")),
            "<recurrence>:1:20: character '–' (U+2013 EN DASH) is not the ASCII '-' [hint: replace "
            "it with '-']");
  EXPECT_EQ(located(recurrence_error("T(n) = 2T(n/2) + \uff11; T(1) = 1")),
            "<recurrence>:1:18: character '１' (U+FF11 FULLWIDTH '1') is not the ASCII '1' [hint: "
            "replace it with '1']");
}

Diagnostic evaluation_error(const std::string& text, int64_t n) {
  return error_of([&] {
    Evaluator evaluator(recurrence_from_text(text), no_clock());
    evaluator.value_at(BigInt(n));
  });
}

TEST(HelperHardening, AConstantUndefinedEverywhereNeedsNoBaseCase) {
  // The hints ask for no base case: none would help.
  EXPECT_EQ(
      located(evaluation_error("T(n) = T(n/2) + lg(0); T(1) = 1", 4)),
      "<recurrence>:1:17: lg of a number that is not positive (in 'lg(0)') [hint: 'lg(0)' does not "
      "depend on n: it is undefined at every size, so no base case helps; fix the expression]");
  EXPECT_EQ(located(evaluation_error("T(n) = T(n/2) + log(1, n); T(1) = 1", 4)),
            "<recurrence>:1:17: log base must be positive and not 1 (in 'log(1, n)') [hint: the "
            "base '1' is the same at every size, and a logarithm's base must be positive and not "
            "1: write log(2, n), lg n or ln n]");
  // A size-dependent domain error still asks for a base case.
  EXPECT_EQ(located(evaluation_error("T(n) = T(n - 1) + lg(n - 1); T(0) = 0", 4)),
            "<recurrence>:1:19: lg of a number that is not positive at n = 1 (in 'lg(n - 1)') "
            "[hint: add a base case for the small sizes where this is undefined, e.g. T(1) = 1]");
}

TEST(HelperHardening, AConstantBeyondTheValueLimitIsLocatedAtTheConstant) {
  EXPECT_EQ(
      located(evaluation_error("T(n) = T(n/2) + 2^(2^20); T(1) = 1", 3)),
      "<recurrence>:1:18: the constant '2^2^20' is too large to compute exactly (a value would "
      "need 1048577 bits, over the budget of 1048576 bits per value) [hint: it does not depend on "
      "n, so every size needs it; write a smaller constant (values are limited to 1048576 bits)]");
}

// Item 20: --list-families --format json printed the text table.
TEST(HelperHardening, ListFamiliesHonoursTheFormat) {
  using test_support::run_shell;
  test_support::CommandResult json =
      run_shell(std::string(THETAGATE_BINARY) + " check --list-families --format json");
  EXPECT_EQ(json.status, 0) << json.out;
  nlohmann::json families = nlohmann::json::parse(json.out, nullptr, false);
  ASSERT_TRUE(families.is_array()) << json.out;
  ASSERT_FALSE(families.empty());
  EXPECT_EQ(families[0]["name"], "small");
  for (const auto& family : families) EXPECT_TRUE(family["description"].is_string()) << family;
  test_support::CommandResult junit =
      run_shell(std::string(THETAGATE_BINARY) + " check --list-families --format junit");
  EXPECT_EQ(junit.status, 2) << junit.out;
  EXPECT_NE(junit.out.find("prints text or json"), std::string::npos) << junit.out;
}

}  // namespace
}  // namespace thetagate::engine
