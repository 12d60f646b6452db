#include "verifier/model/definitions.h"

#include "verifier/syntax/parser.h"

namespace thetagate::engine {

namespace {

Definition parse_line(Parser& p) {
  Definition d;
  const Token& name = p.peek();
  if (name.kind != TokenKind::kName || is_keyword(name.text) || name.text == "n") {
    p.fail(name, "expected a definition such as 'T(n) = ...', found " + describe(name),
           "each line defines a function: T(n) = 2T(n/2) + n, or a base case: T(1) = 0");
  }
  p.next();
  d.function = name.text;
  d.name_pos = name.pos;
  if (is_builtin(name.text)) {
    p.fail(name, "'" + name.text + "' is a built-in function and cannot be redefined",
           "pick another name for the helper, such as f or cost");
  }
  p.expect(TokenKind::kLeftParen, "'(' after the function name",
           "write " + name.text + "(n) = ...");
  if (p.at_name("n")) {
    p.next();
  } else if (p.at(TokenKind::kNumber) && p.peek().text.find('.') == std::string::npos) {
    d.point = decimal_integer(p.next().text);
  } else {
    p.fail_expected("'n' or a whole number", "the left side is " + name.text +
                                                 "(n) for the general case or " + name.text +
                                                 "(1) for a base case");
  }
  p.expect(TokenKind::kRightParen, "')'",
           "the left side is " + name.text + "(n) or " + name.text + "(1)");
  p.expect(TokenKind::kAssign, "'='", "a definition reads " + name.text + "(n) = EXPRESSION");
  d.body = p.parse_value();
  bool comma = p.accept(TokenKind::kComma);
  if (p.accept_name("if") || p.accept_name("when") || p.accept_name("for")) {
    d.condition = p.parse_condition();
  } else if (p.accept_name("otherwise")) {
    d.otherwise = true;
  } else if (comma && p.at(TokenKind::kName) && p.peek(1).kind == TokenKind::kLeftParen) {
    // "T(1) = 1, T(2) = 3": base cases listed with commas, as people write
    // them; the comma ends this definition like ';'.
    return d;
  }
  if (!p.at_line_end()) {
    p.fail_expected("the end of the definition",
                    "add an operator between terms, or start a condition with 'if'");
  }
  return d;
}

}  // namespace

std::vector<Definition> parse_definitions(const SourceText& source) {
  Parser p(source);
  std::vector<Definition> lines;
  while (true) {
    while (p.accept(TokenKind::kNewline)) {
    }
    if (p.at(TokenKind::kEnd)) break;
    lines.push_back(parse_line(p));
  }
  if (lines.empty()) {
    fail_at(source, 0, "the recurrence is empty", "write it as: T(n) = 2T(n/2) + n; T(1) = 1");
  }
  return lines;
}

}  // namespace thetagate::engine
