// Lexer, expression parser, recurrence and bound grammars, and the printer.
// Trees are compared structurally (same_tree) against trees built by hand,
// so a test of the parser does not lean on the printer.
#include "verifier/syntax/parser.h"

#include <gtest/gtest.h>
#include <rapidcheck/gtest.h>

#include <string>
#include <vector>

#include "verifier/evaluation/evaluator.h"
#include "verifier/model/bound.h"
#include "verifier/model/definitions.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/expr.h"
#include "verifier/syntax/lexer.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {
namespace {

// Hand-built trees.
ExprPtr num(int64_t v) { return make_number(Rational(v)); }
ExprPtr num(int64_t p, int64_t q) { return make_number(Rational(p, q)); }
ExprPtr n() { return make_variable(); }
ExprPtr add(ExprPtr a, ExprPtr b) { return make_binary(ExprKind::kAdd, a, b); }
ExprPtr sub(ExprPtr a, ExprPtr b) { return make_binary(ExprKind::kSub, a, b); }
ExprPtr mul(ExprPtr a, ExprPtr b) { return make_binary(ExprKind::kMul, a, b); }
ExprPtr dvd(ExprPtr a, ExprPtr b) { return make_binary(ExprKind::kDiv, a, b); }
ExprPtr pw(ExprPtr a, ExprPtr b) { return make_binary(ExprKind::kPow, a, b); }
ExprPtr neg(ExprPtr a) { return make_unary(ExprKind::kNeg, a); }
ExprPtr call(const std::string& f, std::vector<ExprPtr> args) {
  return make_call(f, std::move(args));
}
ExprPtr call(const std::string& f, ExprPtr a) { return make_call(f, {std::move(a)}); }
ExprPtr cmp(ExprKind k, ExprPtr a, ExprPtr b) { return make_binary(k, a, b); }

ExprPtr parse(const std::string& text) {
  return parse_expression(SourceText::whole("<expr>", text));
}

ExprPtr parse_cond(const std::string& text) {
  Parser p(SourceText::whole("<cond>", text));
  ExprPtr e = p.parse_condition();
  EXPECT_TRUE(p.at(TokenKind::kEnd)) << text;
  return e;
}

// gtest-friendly structural check with both trees printed on failure.
::testing::AssertionResult Same(const ExprPtr& actual, const ExprPtr& expected) {
  if (same_tree(*actual, *expected)) return ::testing::AssertionSuccess();
  return ::testing::AssertionFailure()
         << "parsed as  " << print(*actual) << "\nexpected   " << print(*expected);
}

// The whole text of the diagnostic that `f` throws.
template <typename F>
std::string diagnostic_of(F f) {
  try {
    f();
  } catch (const InputError& e) {
    return format_diagnostic(e.diagnostic());
  }
  return "(no error)";
}

std::string recurrence_error(const std::string& text) {
  return diagnostic_of([&] { recurrence_from_text(text); });
}

std::string expression_error(const std::string& text) {
  return diagnostic_of([&] { parse(text); });
}

// ---- Lexer ----------------------------------------------------------------

TEST(Expr, ComparisonHoldsReadsTheOrder) {
  const ExprKind kinds[] = {ExprKind::kEq, ExprKind::kNe, ExprKind::kLt,
                            ExprKind::kLe, ExprKind::kGt, ExprKind::kGe};
  // Rows: order -1, 0, +1; columns as `kinds`.
  const bool expected[3][6] = {{false, true, true, true, false, false},
                               {true, false, false, true, false, true},
                               {false, true, false, false, true, true}};
  for (int order = -1; order <= 1; ++order) {
    for (int k = 0; k < 6; ++k) {
      EXPECT_EQ(comparison_holds(kinds[k], order * 7), expected[order + 1][k])
          << "kind " << k << ", order " << order;
    }
  }
  EXPECT_THROW(comparison_holds(ExprKind::kAnd, 0), InternalError);
}

TEST(Lexer, UnicodeSpellingsBecomeTheirAsciiTokens) {
  auto tokens = tokenize(SourceText::whole(
      "<t>", "\u0398 \u03a9 \u2212 \u2264 \u2265 \u2260 \u00b7 \u230a\u230b\u2308\u2309\u221a"));
  std::vector<TokenKind> kinds;
  for (const Token& t : tokens) kinds.push_back(t.kind);
  std::vector<TokenKind> expected = {
      TokenKind::kName,         TokenKind::kName,     TokenKind::kMinus,     TokenKind::kLessEqual,
      TokenKind::kGreaterEqual, TokenKind::kNotEqual, TokenKind::kStar,      TokenKind::kLeftFloor,
      TokenKind::kRightFloor,   TokenKind::kLeftCeil, TokenKind::kRightCeil, TokenKind::kSqrt,
      TokenKind::kEnd};
  EXPECT_EQ(kinds, expected);
  EXPECT_EQ(tokens[0].text, "Theta");
  EXPECT_EQ(tokens[1].text, "Omega");
}

TEST(Lexer, PositionsAreByteOffsetsAndCommentsVanish) {
  auto tokens = tokenize(SourceText::whole("<t>", "T(n) = 2.5n # cost\nT(1)=0"));
  ASSERT_GE(tokens.size(), 8u);
  EXPECT_EQ(tokens[0].text, "T");
  EXPECT_EQ(tokens[4].kind, TokenKind::kAssign);
  EXPECT_EQ(tokens[5].kind, TokenKind::kNumber);
  EXPECT_EQ(tokens[5].text, "2.5");
  EXPECT_EQ(tokens[5].pos, 7u);
  EXPECT_EQ(tokens[6].text, "n");
  EXPECT_EQ(tokens[7].kind, TokenKind::kNewline);  // the comment is gone
  EXPECT_EQ(tokens[8].text, "T");
}

TEST(Lexer, LongestOperatorWins) {
  auto tokens = tokenize(SourceText::whole("<t>", "<= < == = != >= >;"));
  std::vector<TokenKind> kinds;
  for (const Token& t : tokens) kinds.push_back(t.kind);
  EXPECT_EQ(kinds, (std::vector<TokenKind>{
                       TokenKind::kLessEqual, TokenKind::kLess, TokenKind::kEqual,
                       TokenKind::kAssign, TokenKind::kNotEqual, TokenKind::kGreaterEqual,
                       TokenKind::kGreater, TokenKind::kNewline, TokenKind::kEnd}));
}

// ---- Precedence and juxtaposition -----------------------------------------

TEST(Parser, CoefficientJuxtaposedWithACall) {
  EXPECT_TRUE(Same(parse("2T(n/2)"), mul(num(2), call("T", dvd(n(), num(2))))));
  EXPECT_TRUE(Same(parse("2T(n/2) + n"), add(mul(num(2), call("T", dvd(n(), num(2)))), n())));
}

TEST(Parser, LgAppliesToTheFactorThatFollows) {
  EXPECT_TRUE(Same(parse("n lg n"), mul(n(), call("lg", n()))));
  EXPECT_TRUE(Same(parse("lg lg n"), call("lg", call("lg", n()))));
  EXPECT_TRUE(Same(parse("lg^2 n"), pw(call("lg", n()), num(2))));
  EXPECT_TRUE(Same(parse("n lg^2 n"), mul(n(), pw(call("lg", n()), num(2)))));
  EXPECT_TRUE(Same(parse("lg n^2"), call("lg", pw(n(), num(2)))));
  EXPECT_TRUE(Same(parse("lg(n)"), call("lg", n())));
  EXPECT_TRUE(Same(parse("n lg n / 2"), dvd(mul(n(), call("lg", n())), num(2))));
}

TEST(Parser, JuxtapositionBindsTighterThanDivision) {
  // 1/2n is 1/(2n), and 7n/10 is (7n)/10.
  EXPECT_TRUE(Same(parse("1/2n"), dvd(num(1), mul(num(2), n()))));
  EXPECT_TRUE(Same(parse("7n/10 + 6"), add(dvd(mul(num(7), n()), num(10)), num(6))));
  EXPECT_TRUE(Same(parse("n/2 n"), dvd(n(), mul(num(2), n()))));
}

TEST(Parser, PowerIsRightAssociativeAndAboveUnaryMinus) {
  EXPECT_TRUE(Same(parse("n^(lg 7)"), pw(n(), call("lg", num(7)))));
  EXPECT_TRUE(Same(parse("2^3^2"), pw(num(2), pw(num(3), num(2)))));
  EXPECT_TRUE(Same(parse("-n^2"), neg(pw(n(), num(2)))));
  EXPECT_TRUE(Same(parse("2^-n"), pw(num(2), neg(n()))));
  EXPECT_TRUE(Same(parse("3n^2"), mul(num(3), pw(n(), num(2)))));
}

TEST(Parser, FloorCeilingAndRootSymbols) {
  EXPECT_TRUE(Same(parse("\u230an/2\u230b"), call("floor", dvd(n(), num(2)))));
  EXPECT_TRUE(Same(parse("\u2308n/2\u2309"), call("ceil", dvd(n(), num(2)))));
  EXPECT_TRUE(Same(parse("\u221an"), call("sqrt", n())));
  EXPECT_TRUE(Same(parse("\u221an lg n"), mul(call("sqrt", n()), call("lg", n()))));
  EXPECT_TRUE(Same(parse("sqrt n"), call("sqrt", n())));
  EXPECT_TRUE(Same(parse("T(\u230a\u221an\u230b)"), call("T", call("floor", call("sqrt", n())))));
}

TEST(Parser, UnicodeMinusAndMultiplicationSigns) {
  EXPECT_TRUE(Same(parse("n \u2212 1"), sub(n(), num(1))));
  EXPECT_TRUE(Same(parse("3\u00b7n \u00d7 2"), mul(mul(num(3), n()), num(2))));
}

TEST(Parser, SumsAndProductsAreLeftAssociative) {
  EXPECT_TRUE(Same(parse("n - 1 - 2"), sub(sub(n(), num(1)), num(2))));
  EXPECT_TRUE(Same(parse("n / 2 / 3"), dvd(dvd(n(), num(2)), num(3))));
  EXPECT_TRUE(Same(parse("n + 2*n - 1"), sub(add(n(), mul(num(2), n())), num(1))));
}

TEST(Parser, DecimalsAreExactRationals) {
  EXPECT_TRUE(Same(parse("1.50"), num(3, 2)));
  EXPECT_TRUE(Same(parse(".5"), num(1, 2)));
  EXPECT_TRUE(Same(parse("12.25n"), mul(num(49, 4), n())));
}

TEST(Parser, LiteralsWithLeadingZerosAreDecimal) {
  // "0.75" must not be read through the octal digits "075" (= 61), and
  // "0.08" must not fail on the digits "008".
  EXPECT_TRUE(Same(parse("0.75n"), mul(num(3, 4), n())));
  EXPECT_TRUE(Same(parse("010"), num(10)));
  EXPECT_NO_THROW(parse("0.08"));
  EXPECT_TRUE(Same(parse("0.5"), num(1, 2)));
  auto defs = parse_definitions(SourceText::whole("<r>", "T(n) = T(n-1) + 1; T(010) = 5"));
  ASSERT_EQ(defs.size(), 2u);
  ASSERT_TRUE(defs[1].point.has_value());
  EXPECT_EQ(*defs[1].point, 10);
}

TEST(Parser, CallsWithSeveralArguments) {
  EXPECT_TRUE(Same(parse("log(3, n)"), call("log", {num(3), n()})));
  EXPECT_TRUE(Same(parse("min(n, 2, n^2)"), call("min", {n(), num(2), pw(n(), num(2))})));
  EXPECT_TRUE(Same(parse("n mod 3"), call("mod", {n(), num(3)})));
  EXPECT_TRUE(Same(parse("2n mod 3 + 1"), add(call("mod", {mul(num(2), n()), num(3)}), num(1))));
}

// ---- Conditions -----------------------------------------------------------

TEST(Parser, ParityConditions) {
  EXPECT_TRUE(Same(parse_cond("n even"), make_unary(ExprKind::kEven, n())));
  EXPECT_TRUE(Same(parse_cond("n odd"), make_unary(ExprKind::kOdd, n())));
  EXPECT_TRUE(Same(parse_cond("n is odd"), make_unary(ExprKind::kOdd, n())));
  EXPECT_TRUE(Same(parse_cond("n + 1 even"), make_unary(ExprKind::kEven, add(n(), num(1)))));
}

TEST(Parser, ModularAndComparisonConditions) {
  EXPECT_TRUE(
      Same(parse_cond("n mod 3 == 1"), cmp(ExprKind::kEq, call("mod", {n(), num(3)}), num(1))));
  EXPECT_TRUE(Same(parse_cond("n \u2264 1"), cmp(ExprKind::kLe, n(), num(1))));
  EXPECT_TRUE(Same(parse_cond("n >= 2^10"), cmp(ExprKind::kGe, n(), pw(num(2), num(10)))));
  EXPECT_TRUE(Same(parse_cond("n != 4"), cmp(ExprKind::kNe, n(), num(4))));
  EXPECT_TRUE(Same(parse_cond("2n < n^2"), cmp(ExprKind::kLt, mul(num(2), n()), pw(n(), num(2)))));
}

TEST(Parser, AndBindsTighterThanOrAndNotTighterThanAnd) {
  ExprPtr expected =
      make_binary(ExprKind::kOr,
                  make_binary(ExprKind::kAnd, cmp(ExprKind::kGt, n(), num(1)),
                              make_unary(ExprKind::kNot, make_unary(ExprKind::kOdd, n()))),
                  cmp(ExprKind::kEq, n(), num(0)));
  EXPECT_TRUE(Same(parse_cond("n > 1 and not n odd or n == 0"), expected));
  ExprPtr grouped = make_binary(
      ExprKind::kAnd, cmp(ExprKind::kGt, n(), num(1)),
      make_binary(ExprKind::kOr, make_unary(ExprKind::kOdd, n()), cmp(ExprKind::kEq, n(), num(0))));
  EXPECT_TRUE(Same(parse_cond("n > 1 and (n odd or n == 0)"), grouped));
}

// ---- Recurrence lines -----------------------------------------------------

TEST(Parser, DefinitionLinesWithCasesAndPoints) {
  auto defs = parse_definitions(SourceText::whole(
      "<r>", "T(n) = 2T(n/2) - 1 if n even\nT(n) = 2T((n-1)/2) + 1 otherwise; T(1) = 1"));
  ASSERT_EQ(defs.size(), 3u);
  EXPECT_EQ(defs[0].function, "T");
  EXPECT_FALSE(defs[0].point.has_value());
  ASSERT_TRUE(defs[0].condition != nullptr);
  EXPECT_TRUE(Same(defs[0].condition, make_unary(ExprKind::kEven, n())));
  EXPECT_TRUE(defs[1].otherwise);
  EXPECT_TRUE(defs[1].condition == nullptr);
  ASSERT_TRUE(defs[2].point.has_value());
  EXPECT_EQ(*defs[2].point, 1);
  EXPECT_TRUE(Same(defs[2].body, num(1)));
}

TEST(Parser, RecurrenceModelFindsTheRecursiveFunctionAndHelpers) {
  auto r = recurrence_from_text(
      "f(n) = n^2 if n odd; f(n) = n otherwise; T(n) = T(n/2) + f(n); T(1) = 0");
  EXPECT_EQ(r->main.name, "T");
  ASSERT_EQ(r->helpers.count("f"), 1u);
  EXPECT_EQ(r->helpers.at("f").conditional.size(), 1u);
  EXPECT_TRUE(r->helpers.at("f").fallback.has_value());
  ASSERT_EQ(r->main.points.size(), 1u);
  EXPECT_FALSE(r->default_base);
  ASSERT_TRUE(r->main.fallback.has_value());
  EXPECT_EQ(r->main.fallback->calls.size(), 1u);
  // n/2 inside T(...) is read as a floor, and the model says so.
  ASSERT_EQ(r->notes.size(), 1u);
  EXPECT_NE(r->notes[0].find("n/2 is read as floor(n/2)"), std::string::npos) << r->notes[0];
}

// ---- Bounds ---------------------------------------------------------------

Bound bound(const std::string& text) { return parse_bound(SourceText::whole("<bound>", text)); }

TEST(Parser, AsymptoticBoundsInEverySpelling) {
  EXPECT_EQ(bound("Theta(n lg n)").kind, BoundKind::kTheta);
  EXPECT_TRUE(Same(bound("Theta(n lg n)").growth, mul(n(), call("lg", n()))));
  EXPECT_EQ(bound("\u0398(n^(lg 7))").kind, BoundKind::kTheta);
  EXPECT_TRUE(Same(bound("\u0398(n^(lg 7))").growth, pw(n(), call("lg", num(7)))));
  EXPECT_EQ(bound("O(n lg^2 n)").kind, BoundKind::kBigO);
  EXPECT_TRUE(Same(bound("O(n lg^2 n)").growth, mul(n(), pw(call("lg", n()), num(2)))));
  EXPECT_EQ(bound("Omega(n)").kind, BoundKind::kOmega);
  EXPECT_EQ(bound("\u03a9(n)").kind, BoundKind::kOmega);
  EXPECT_TRUE(bound("  O(1)\n").is_asymptotic());
  EXPECT_EQ(bound("  O(1)\n").text(), "O(1)");
}

TEST(Parser, ExplicitUpperBoundWithStartingSize) {
  Bound b = bound("T(n) <= 2n lg n for n >= 2");
  EXPECT_EQ(b.kind, BoundKind::kExplicit);
  EXPECT_TRUE(b.lower == nullptr);
  ASSERT_TRUE(b.upper != nullptr);
  EXPECT_TRUE(Same(b.upper, mul(mul(num(2), n()), call("lg", n()))));
  EXPECT_FALSE(b.strict_upper);
  EXPECT_EQ(b.n0, 2);
}

TEST(Parser, ExplicitLowerBoundEitherWayRound) {
  Bound b = bound("n - 1 <= T(n)");
  ASSERT_TRUE(b.lower != nullptr);
  EXPECT_TRUE(b.upper == nullptr);
  EXPECT_TRUE(Same(b.lower, sub(n(), num(1))));
  EXPECT_EQ(b.n0, 1);  // the default start
  Bound c = bound("T(n) \u2265 n/2 for n >= 4");
  ASSERT_TRUE(c.lower != nullptr);
  EXPECT_TRUE(Same(c.lower, dvd(n(), num(2))));
  EXPECT_EQ(c.n0, 4);
}

TEST(Parser, ExplicitTwoSidedAndStrictBounds) {
  Bound b = bound("n - 1 <= T(n) <= n^2 for n >= 1");
  ASSERT_TRUE(b.lower && b.upper);
  EXPECT_TRUE(Same(b.lower, sub(n(), num(1))));
  EXPECT_TRUE(Same(b.upper, pw(n(), num(2))));
  Bound s = bound("n < T(n) < n^2 for n > 3");
  EXPECT_TRUE(s.strict_lower);
  EXPECT_TRUE(s.strict_upper);
  EXPECT_EQ(s.n0, 4);  // n > 3 starts at 4
}

TEST(Parser, ExplicitEqualityBoundsBothSides) {
  Bound b = bound("T(n) = n ceil(lg n) - 2^ceil(lg n) + 1 for n >= 1");
  ASSERT_TRUE(b.lower && b.upper);
  EXPECT_TRUE(same_tree(*b.lower, *b.upper));
  EXPECT_TRUE(Same(b.upper, add(sub(mul(n(), call("ceil", call("lg", n()))),
                                    pw(num(2), call("ceil", call("lg", n())))),
                                num(1))));
}

// ---- Printer --------------------------------------------------------------

TEST(Printer, PrintsCanonicalText) {
  EXPECT_EQ(print(*parse("2T(n/2) + n lg n")), "2T(n/2) + n*lg(n)");
  EXPECT_EQ(print(*parse("1/2n")), "1/(2n)");
  EXPECT_EQ(print(*parse("(n+1)*2")), "(n + 1)*2");
  EXPECT_EQ(print(*parse("n - (1 - n)")), "n - (1 - n)");
  EXPECT_EQ(print(*parse("(2^3)^2")), "(2^3)^2");
  EXPECT_EQ(print(*parse("0.05n")), "0.05*n");
  EXPECT_EQ(print(*parse("-(n mod 3)")), "-(n mod 3)");
  EXPECT_EQ(print(*parse_cond("not (n odd and n > 1)")), "not (n odd and n > 1)");
}

TEST(Printer, RoundTripNeedsItsParentheses) {
  // What the property below relies on: dropping the parentheses changes the tree.
  ExprPtr e = mul(add(n(), num(1)), num(2));
  EXPECT_TRUE(Same(parse(print(*e)), e));
  EXPECT_FALSE(same_tree(*parse("n + 1*2"), *e));
}

// ---- Error messages (whole text) ------------------------------------------

TEST(ParserDiagnostic, MissingClosingParenthesis) {
  EXPECT_EQ(recurrence_error("T(n) = 2T(n/2 + n"),
            "<recurrence>:1:18: error: expected ')' after 'n', found the end of the text\n"
            "T(n) = 2T(n/2 + n\n"
            "                 ^\n"
            "  hint: close the argument list of 'T' with ')'");
}

TEST(ParserDiagnostic, UnknownName) {
  EXPECT_EQ(recurrence_error("T(n) = 2T(n/2) + m"),
            "<recurrence>:1:18: error: unknown name 'm'\n"
            "T(n) = 2T(n/2) + m\n"
            "                 ^\n"
            "  hint: the size is written 'n'; functions take parentheses: f(n)");
}

TEST(ParserDiagnostic, NumberAfterAFactor) {
  EXPECT_EQ(recurrence_error("T(n) = 2T(n/2) + n 2"),
            "<recurrence>:1:20: error: a number directly after a factor\n"
            "T(n) = 2T(n/2) + n 2\n"
            "                   ^\n"
            "  hint: write the coefficient first (3n, not n3) or use '*' between factors; a "
            "power may follow: n 2^n");
}

TEST(ParserDiagnostic, UnknownCharacter) {
  EXPECT_EQ(recurrence_error("T(n) = 2T[n/2] + n"),
            "<recurrence>:1:10: error: unexpected character '['\n"
            "T(n) = 2T[n/2] + n\n"
            "         ^\n"
            "  hint: use ( ) for grouping, floor(x) or \u230ax\u230b for rounding down");
}

TEST(ParserDiagnostic, ExclamationMarkIsReadAsFactorialAfterAnOperand) {
  EXPECT_EQ(recurrence_error("T(n) = n T(n-1) + (n-1)!; T(0) = 1"),
            "<recurrence>:1:24: error: unexpected character '!'\n"
            "T(n) = n T(n-1) + (n-1)!; T(0) = 1\n"
            "                       ^\n"
            "  hint: there is no factorial; n! is itself the recurrence T(n) = n T(n-1), T(0) = 1, "
            "or bound it, e.g. by n^n");
  EXPECT_EQ(recurrence_error("T(n) = T(n/2) + 1 if !(n even)"),
            "<recurrence>:1:22: error: unexpected character '!'\n"
            "T(n) = T(n/2) + 1 if !(n even)\n"
            "                     ^\n"
            "  hint: write 'not' for negation, '!=' for inequality");
}

TEST(ParserDiagnostic, LogWithoutBase) {
  EXPECT_EQ(recurrence_error("T(n) = 2T(n/2) + n log n"),
            "<recurrence>:1:20: error: 'log' needs its base\n"
            "T(n) = 2T(n/2) + n log n\n"
            "                   ^\n"
            "  hint: write lg n (base 2), ln n (base e) or log(b, n); inside Theta(...), O(...) "
            "or Omega(...) the base does not matter and log n is read as lg n");
}

TEST(ParserDiagnostic, EmptyRecurrence) {
  EXPECT_EQ(recurrence_error("  # nothing yet\n"),
            "<recurrence>:1:1: error: the recurrence is empty\n"
            "  # nothing yet\n"
            "^\n"
            "  hint: write it as: T(n) = 2T(n/2) + n; T(1) = 1");
}

TEST(ParserDiagnostic, TwoDefaultLines) {
  EXPECT_EQ(
      recurrence_error("T(n) = T(n/2) + 1\nT(n) = 2T(n/2)\nT(1) = 0"),
      "<recurrence>:2:1: error: a second line for T(n) without a condition\n"
      "T(n) = 2T(n/2)\n"
      "^\n"
      "  hint: only one line may apply to every n; add 'if COND' to the earlier one, or write "
      "'otherwise' on the last");
}

TEST(ParserDiagnostic, HelperCallingTheRecurrence) {
  EXPECT_EQ(recurrence_error("T(n) = T(n/2) + f(n); f(n) = T(n - 1); T(1) = 0"),
            "<recurrence>:1:30: error: mutual recursion (T calls f and f calls T) is not "
            "supported\n"
            "T(n) = T(n/2) + f(n); f(n) = T(n - 1); T(1) = 0\n"
            "                             ^\n"
            "  hint: only T may recurse: substitute f's line into T's, so that T calls only "
            "itself");
  // A helper that calls T without T calling it is not mutual recursion.
  EXPECT_EQ(recurrence_error("T(n) = T(n/2) + 1; f(n) = T(n - 1); T(1) = 0"),
            "<recurrence>:1:27: error: a helper function calls T\n"
            "T(n) = T(n/2) + 1; f(n) = T(n - 1); T(1) = 0\n"
            "                          ^\n"
            "  hint: only T may recurse; move the call into T's line");
}

TEST(ParserDiagnostic, UnknownFunction) {
  EXPECT_EQ(recurrence_error("T(n) = T(n/2) + cost(n); T(1) = 0"),
            "<recurrence>:1:17: error: unknown function 'cost'\n"
            "T(n) = T(n/2) + cost(n); T(1) = 0\n"
            "                ^\n"
            "  hint: define it on its own line, e.g. cost(n) = n^2, or use T");
}

TEST(ParserDiagnostic, CallThatDoesNotShrink) {
  auto r = recurrence_from_text("T(n) = T(n+1) + 1; T(0) = 0");
  EXPECT_EQ(diagnostic_of([&] { Evaluator(r).value_at(BigInt(5)); }),
            // Found before evaluating, at the first size past the base case.
            "<recurrence>:1:8: error: T(n + 1) at n = 1 calls T(2), which does not shrink\n"
            "T(n) = T(n+1) + 1; T(0) = 0\n"
            "       ^\n"
            "  hint: each call must reach a smaller size, such as T(n/2) or T(n-1)");
}

TEST(ParserDiagnostic, ExpressionStopsEarly) {
  EXPECT_EQ(
      expression_error("2^"),
      "<expr>:1:3: error: expected a number, 'n', a function or '(' after '^', found the end of "
      "the text\n"
      "2^\n"
      "  ^\n"
      "  hint: the expression stops too early");
}

// ---- parse(print(e)) == e for random trees -------------------------------

// Random trees of the shapes the parser produces: non-negative literals
// (integers and terminating decimals), n, + - * / ^, unary minus, calls, and
// conditions built from them.
rc::Gen<ExprPtr> gen_value(int depth);

rc::Gen<ExprPtr> gen_leaf() {
  return rc::gen::oneOf(
      rc::gen::map(rc::gen::inRange<int64_t>(0, 1000), [](int64_t v) { return num(v); }),
      rc::gen::map(rc::gen::pair(rc::gen::inRange<int64_t>(0, 10000), rc::gen::inRange(1, 4)),
                   [](std::pair<int64_t, int> p) {
                     int64_t scale = 1;
                     for (int i = 0; i < p.second; ++i) scale *= 10;
                     return num(p.first, scale);  // 12.34 and friends
                   }),
      rc::gen::just(n()), rc::gen::just(n()));
}

rc::Gen<ExprPtr> gen_value(int depth) {
  if (depth <= 0) return gen_leaf();
  auto sub_tree = rc::gen::lazy([depth] { return gen_value(depth - 1); });
  auto binary = [sub_tree](ExprKind k) {
    return rc::gen::map(rc::gen::pair(sub_tree, sub_tree), [k](std::pair<ExprPtr, ExprPtr> p) {
      return make_binary(k, p.first, p.second);
    });
  };
  auto unary_call = [sub_tree](const char* f) {
    std::string name = f;
    return rc::gen::map(sub_tree, [name](ExprPtr a) { return call(name, a); });
  };
  auto binary_call = [sub_tree](const char* f) {
    std::string name = f;
    return rc::gen::map(rc::gen::pair(sub_tree, sub_tree), [name](std::pair<ExprPtr, ExprPtr> p) {
      return call(name, {p.first, p.second});
    });
  };
  return rc::gen::oneOf(
      gen_leaf(), binary(ExprKind::kAdd), binary(ExprKind::kSub), binary(ExprKind::kMul),
      binary(ExprKind::kDiv), binary(ExprKind::kPow),
      rc::gen::map(sub_tree, [](ExprPtr a) { return neg(a); }), unary_call("floor"),
      unary_call("ceil"), unary_call("lg"), unary_call("sqrt"), unary_call("T"), binary_call("min"),
      binary_call("max"), binary_call("mod"), binary_call("log"),
      rc::gen::map(rc::gen::tuple(sub_tree, sub_tree, sub_tree),
                   [](std::tuple<ExprPtr, ExprPtr, ExprPtr> t) {
                     return call("max", {std::get<0>(t), std::get<1>(t), std::get<2>(t)});
                   }));
}

rc::Gen<ExprPtr> gen_condition(int depth) {
  auto value = gen_value(2);
  auto comparison =
      rc::gen::map(rc::gen::tuple(rc::gen::element(ExprKind::kEq, ExprKind::kNe, ExprKind::kLt,
                                                   ExprKind::kLe, ExprKind::kGt, ExprKind::kGe),
                                  value, value),
                   [](std::tuple<ExprKind, ExprPtr, ExprPtr> t) {
                     return make_binary(std::get<0>(t), std::get<1>(t), std::get<2>(t));
                   });
  auto parity =
      rc::gen::map(rc::gen::pair(rc::gen::element(ExprKind::kEven, ExprKind::kOdd), value),
                   [](std::pair<ExprKind, ExprPtr> p) { return make_unary(p.first, p.second); });
  if (depth <= 0) return rc::gen::oneOf(comparison, parity);
  auto inner = rc::gen::lazy([depth] { return gen_condition(depth - 1); });
  return rc::gen::oneOf(
      comparison, parity,
      rc::gen::map(inner, [](ExprPtr a) { return make_unary(ExprKind::kNot, a); }),
      rc::gen::map(rc::gen::pair(inner, inner),
                   [](std::pair<ExprPtr, ExprPtr> p) {
                     return make_binary(ExprKind::kAnd, p.first, p.second);
                   }),
      rc::gen::map(rc::gen::pair(inner, inner), [](std::pair<ExprPtr, ExprPtr> p) {
        return make_binary(ExprKind::kOr, p.first, p.second);
      }));
}

RC_GTEST_PROP(Printer, ParseOfPrintIsTheSameValueTree, ()) {
  const ExprPtr e = *gen_value(4);
  const std::string text = print(*e);
  RC_LOG() << "printed: " << text << "\n";
  const ExprPtr back = parse(text);
  RC_ASSERT(same_tree(*back, *e));
}

RC_GTEST_PROP(Printer, ParseOfPrintIsTheSameConditionTree, ()) {
  const ExprPtr e = *gen_condition(2);
  const std::string text = print(*e);
  RC_LOG() << "printed: " << text << "\n";
  const ExprPtr back = parse_cond(text);
  RC_ASSERT(same_tree(*back, *e));
}

// A printer that forgets every grouping parenthesis (calls keep theirs), to
// show the property has teeth: on the same generator it must fail often.
std::string print_without_grouping(const Expr& e) {
  auto p = [](const ExprPtr& a) { return print_without_grouping(*a); };
  switch (e.kind) {
    case ExprKind::kAdd:
      return p(e.args[0]) + " + " + p(e.args[1]);
    case ExprKind::kSub:
      return p(e.args[0]) + " - " + p(e.args[1]);
    case ExprKind::kMul:
      return p(e.args[0]) + "*" + p(e.args[1]);
    case ExprKind::kDiv:
      return p(e.args[0]) + "/" + p(e.args[1]);
    case ExprKind::kPow:
      return p(e.args[0]) + "^" + p(e.args[1]);
    case ExprKind::kNeg:
      return "-" + p(e.args[0]);
    case ExprKind::kCall: {
      if (e.name == "mod") return p(e.args[0]) + " mod " + p(e.args[1]);
      std::string s = e.name + "(";
      for (size_t i = 0; i < e.args.size(); ++i) s += (i ? ", " : "") + p(e.args[i]);
      return s + ")";
    }
    default:
      return print(e);  // leaves
  }
}

TEST(Printer, PropertyWouldCatchAPrinterThatDropsParentheses) {
  // Count trees the real printer round-trips but the careless one does not.
  auto gen = gen_value(4);
  int round_trips = 0;
  int caught = 0;
  for (uint64_t seed = 0; seed < 300; ++seed) {
    ExprPtr e = gen(rc::Random(seed), 30).value();
    try {
      if (!same_tree(*parse(print(*e)), *e)) continue;
    } catch (const std::exception&) {
      continue;
    }
    ++round_trips;
    try {
      if (!same_tree(*parse(print_without_grouping(*e)), *e)) ++caught;
    } catch (const std::exception&) {
      ++caught;  // unparsable text fails the property too
    }
  }
  EXPECT_GT(round_trips, 50);
  EXPECT_GT(caught, round_trips / 4);
}

}  // namespace
}  // namespace thetagate::engine

namespace {

TEST(ParserCallForms, ModAlsoReadsAsACall) {
  using namespace thetagate::engine;
  ExprPtr infix = parse_expression(SourceText::whole("<t>", "n mod 3"));
  ExprPtr call = parse_expression(SourceText::whole("<t>", "mod(n, 3)"));
  EXPECT_TRUE(same_tree(*infix, *call)) << print(*call);
}

}  // namespace
