// Notation people already write (issue "Each user's first ten minutes", §2):
// base cases listed with commas, ** and superscripts for a power, % for mod,
// && and || in conditions. Each reads exactly as
// the canonical form does, so printing and parsing again is unchanged.
#include <gtest/gtest.h>

#include "tests/support/diagnostic_matchers.h"
#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/expr.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {
namespace {

using test_support::located_error_of;

std::string printed(const std::string& text) {
  SourceText source = SourceText::whole("<recurrence>", text);
  std::shared_ptr<const Recurrence> r = build_recurrence(source);
  std::string out;
  for (const CaseLine& line : r->main.points)
    out += print(*line.body) + " @" + line.point->str() + ";";
  for (const CaseLine& line : r->main.conditional) {
    out += print(*line.body) + " if " + print(*line.condition) + ";";
  }
  if (r->main.fallback) out += print(*r->main.fallback->body) + ";";
  return out;
}

TEST(Notation, BaseCasesMayBeListedWithCommas) {
  EXPECT_EQ(printed("T(n) = 2T(n/2) + n, T(1) = 1, T(2) = 3"),
            printed("T(n) = 2T(n/2) + n; T(1) = 1; T(2) = 3"));
  EXPECT_EQ(printed("T(n) = T(n - 1) + n; T(1) = 1, T(2) = 3"),
            printed("T(n) = T(n - 1) + n\nT(1) = 1\nT(2) = 3"));
  // A comma before a condition keeps its old meaning.
  EXPECT_EQ(printed("T(n) = 1, if n < 2; T(n) = T(n/2) + 1, otherwise"),
            printed("T(n) = 1 if n < 2; T(n) = T(n/2) + 1 otherwise"));
  // Commas inside calls are arguments, not line ends.
  EXPECT_EQ(printed("T(n) = T(n/2) + log(2, n), T(1) = 1"),
            printed("T(n) = T(n/2) + log(2, n); T(1) = 1"));
}

TEST(Notation, DoubleStarIsAPower) {
  for (const char* text : {"n**2", "2**n", "n**(1/2) lg n", "2 ** (n - 1)"}) {
    SCOPED_TRACE(text);
    std::string caret = text;
    for (size_t at = caret.find("**"); at != std::string::npos; at = caret.find("**"))
      caret.replace(at, 2, "^");
    ExprPtr a = parse_expression(SourceText::whole("<e>", text));
    ExprPtr b = parse_expression(SourceText::whole("<e>", caret));
    EXPECT_EQ(print(*a), print(*b));
    // parse(print(x)) == print(x): the printer writes ^, which reads back.
    EXPECT_EQ(print(*parse_expression(SourceText::whole("<e>", print(*a)))), print(*a));
  }
  // n * *2 is still an error, not a power.
  EXPECT_EQ(
      located_error_of([] { parse_expression(SourceText::whole("<e>", "n * *2")); }),
      "<e>:1:5: expected a number, 'n', a function or '(' after '*', found '*' [hint: a value "
      "goes here: a number, a name, a call or a parenthesised expression]");
}

TEST(Notation, PercentAndTheDoubledLogicalOperatorsReadAsModAndOrAnd) {
  // Programmers write n % 2 == 0 and a && b (common practice in C-like languages).
  EXPECT_EQ(printed("f(n) = n^2 if n % 2 == 0; f(n) = n otherwise; T(n) = T(n/2) + f(n); "
                    "T(1) = 1"),
            printed("f(n) = n^2 if n mod 2 == 0; f(n) = n otherwise; T(n) = T(n/2) + f(n); "
                    "T(1) = 1"));
  EXPECT_EQ(printed("T(n) = 1 if n < 2 || n == 5 && n % 3 != 1; T(n) = T(n - 1) + 1 otherwise"),
            printed("T(n) = 1 if n < 2 or n == 5 and n mod 3 != 1; T(n) = T(n - 1) + 1 otherwise"));
  ExprPtr e = parse_expression(SourceText::whole("<e>", "(n + 1) % 4"));
  EXPECT_EQ(print(*e), print(*parse_expression(SourceText::whole("<e>", "(n + 1) mod 4"))));
  // A single & or | is still an error, with the spellings that work.
  EXPECT_EQ(located_error_of([] {
              build_recurrence(SourceText::whole("<r>", "T(n) = 1 if n < 2 & n > 0; T(n) = 2"));
            }),
            "<r>:1:19: unexpected character '&' [hint: write 'and' / 'or' (or && / ||) in "
            "conditions]");
}

TEST(Notation, SuperscriptsArePowers) {
  // As documentation writes them (common practice): n², 2ⁿ, n¹⁰ lg² n.
  for (auto [text, caret] :
       {std::pair{"n²", "n^2"}, std::pair{"2ⁿ", "2^n"}, std::pair{"n¹⁰ lg² n", "n^10 lg^2 n"},
        std::pair{"3n³ + n", "3n^3 + n"}, std::pair{"n^(lg 3) + n⁰", "n^(lg 3) + n^0"}}) {
    SCOPED_TRACE(text);
    EXPECT_EQ(print(*parse_expression(SourceText::whole("<e>", text))),
              print(*parse_expression(SourceText::whole("<e>", caret))));
  }
  EXPECT_EQ(printed("T(n) = 2T(n/2) + n²; T(1) = 1"), printed("T(n) = 2T(n/2) + n^2; T(1) = 1"));
  EXPECT_EQ(located_error_of([] { parse_expression(SourceText::whole("<e>", "n²ⁿ")); }),
            "<e>:1:2: a superscript mixes ⁿ with other characters [hint: write the power with ^, "
            "e.g. n^2 or 2^n]");
}

TEST(Notation, LogUnderscoreTwoIsLg) {
  // TeX's log_2 n (common practice in papers and documentation).
  EXPECT_EQ(print(*parse_expression(SourceText::whole("<e>", "n log_2 n"))),
            print(*parse_expression(SourceText::whole("<e>", "n log2 n"))));
  EXPECT_EQ(
      located_error_of([] { parse_expression(SourceText::whole("<e>", "n log_10 n")); }),
      "<e>:1:3: unknown name 'log_10' [hint: write log(b, n) for a logarithm to base b (lg n or "
      "log_2 n for base 2, ln n for e)]");
}

TEST(Notation, LogWithoutABaseIsLgWhereOnlyTheClassMatters) {
  Bound b = parse_bound(SourceText::whole("<bound>", "O(n log n)"));
  EXPECT_EQ(print(*b.growth),
            print(*parse_bound(SourceText::whole("<bound>", "O(n lg n)")).growth));
  ASSERT_EQ(b.notes.size(), 1u);
  EXPECT_NE(b.notes[0].find("read as lg"), std::string::npos);
  EXPECT_TRUE(parse_bound(SourceText::whole("<bound>", "Theta(n lg n)")).notes.empty());
  // log(b, x) keeps its base; in an exact context a bare log is still an error.
  EXPECT_TRUE(parse_bound(SourceText::whole("<bound>", "Theta(log(3, n))")).notes.empty());
  EXPECT_EQ(located_error_of([] { parse_bound(SourceText::whole("<bound>", "T(n) <= n log n")); }),
            "<bound>:1:11: 'log' needs its base [hint: write lg n (base 2), ln n (base e) or "
            "log(b, n); inside Theta(...), O(...) or Omega(...) the base does not matter and log n "
            "is read as lg n]");
  EXPECT_EQ(located_error_of([] {
              build_recurrence(SourceText::whole("<recurrence>", "T(n) = T(n/2) + log n"));
            }),
            "<recurrence>:1:17: 'log' needs its base [hint: write lg n (base 2), ln n (base e) or "
            "log(b, n); inside Theta(...), O(...) or Omega(...) the base does not matter and log n "
            "is read as lg n]");
}

}  // namespace
}  // namespace thetagate::engine
