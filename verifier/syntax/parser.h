// The expression grammar: tokens -> syntax tree. The recurrence and bound
// grammars (definitions.h, bound.h) build on this cursor.
//
// Binding, loosest first: or, and, not, comparisons and "x even"/"x odd",
// + -, * / mod, unary minus, juxtaposition (2T(n/2), n lg n), ^ (right
// associative), atoms. "lg n", "lg^2 n", "sqrt n", "√n" apply a function to
// the power-level operand that follows; "lg(n)" with parentheses is a call.
// A number may follow a factor only as the base of a power: "n 2^n".
// "sum(k, lo, hi, body)" binds k inside body (docs/language.md).
#ifndef THETAGATE_VERIFIER_SYNTAX_PARSER_H_
#define THETAGATE_VERIFIER_SYNTAX_PARSER_H_

#include <string>
#include <vector>

#include "verifier/syntax/expr.h"
#include "verifier/syntax/lexer.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {

class Parser {
 public:
  explicit Parser(const SourceText& source);

  const SourceText& source() const { return source_; }
  const Token& peek(size_t ahead = 0) const;
  const Token& next();
  bool at(TokenKind kind) const { return peek().kind == kind; }
  bool at_name(const char* name) const;
  bool accept(TokenKind kind);
  bool accept_name(const char* name);
  // Consumes a token of `kind` or fails with "expected WHAT after ...".
  const Token& expect(TokenKind kind, const std::string& what, const std::string& hint = "");
  bool at_line_end() const { return at(TokenKind::kNewline) || at(TokenKind::kEnd); }
  // The position just after the previous token, for "expected X after Y".
  const Token& previous() const;

  // Any expression, condition or value (the loosest level).
  ExprPtr parse_any();
  // A value expression; a condition here is an error.
  ExprPtr parse_value();
  // A condition; a plain value here is an error.
  ExprPtr parse_condition();
  // An additive-level value (no comparisons), for bound sides.
  ExprPtr parse_sum();

  // Where only a growth class matters (inside Theta/O/Omega), `log n`
  // without a base is read as lg n: the base changes a constant factor only.
  // Counts how often that happened, for a note.
  void read_unbased_log_as_lg() { unbased_log_ok_ = true; }
  int unbased_logs() const { return unbased_logs_; }

  [[noreturn]] void fail(const Token& at, std::string message, std::string hint = "") const;
  [[noreturn]] void fail_expected(const std::string& what, const std::string& hint = "") const;

 private:
  ExprPtr parse_or();
  ExprPtr parse_and();
  ExprPtr parse_not();
  ExprPtr parse_comparison();
  ExprPtr parse_product();
  ExprPtr parse_unary();
  ExprPtr parse_juxtaposition();
  ExprPtr parse_power();
  ExprPtr parse_exponent();
  ExprPtr parse_atom();
  ExprPtr parse_name(const Token& name);
  ExprPtr parse_prefix_function(const Token& name);
  ExprPtr parse_sum_form(const Token& name);
  std::vector<ExprPtr> parse_arguments(const Token& name);
  bool starts_atom(const Token& t) const;
  // `e`, or a located error when its tree is deeper than kMaxTreeDepth.
  ExprPtr bounded(ExprPtr e) const;

  // Nesting guard: parsing recurses, so depth is bounded (an input of
  // 100,000 '(' is an error, not a stack overflow).
  class Nesting;
  SourceText source_;
  std::vector<Token> tokens_;
  size_t cursor_ = 0;
  int depth_ = 0;
  // At this depth parsing continues on a large stack (large_stack.h).
  // Shallow enough that the levels before it fit any caller's stack (under
  // AddressSanitizer a level takes about 11 KiB), deep enough that the
  // recurrences people write never need the extra thread.
  static constexpr int kLargeStackDepth = 16;
  bool on_large_stack_ = false;
  std::vector<std::string> bound_;  // variables of the enclosing sums, innermost last
  bool unbased_log_ok_ = false;
  int unbased_logs_ = 0;
};

// Words that end an expression and are never names: if, otherwise, and, or,
// not, even, odd, mod, for, is.
bool is_keyword(const std::string& word);

// A string of decimal digits as an integer (never octal: "010" is 10).
BigInt decimal_integer(const std::string& digits);

// Parses the whole of `source` as one value expression ("2^4096 + 7").
ExprPtr parse_expression(const SourceText& source);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_SYNTAX_PARSER_H_
