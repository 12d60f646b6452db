// Tokens of the expression and recurrence language, with byte positions.
// Knows ASCII spellings and their Unicode twins (⌊ ⌋ ⌈ ⌉ √ Θ Ω − · × ≤ ≥ ≠).
#ifndef THETAGATE_VERIFIER_SYNTAX_LEXER_H_
#define THETAGATE_VERIFIER_SYNTAX_LEXER_H_

#include <string>
#include <vector>

#include "verifier/syntax/source.h"

namespace thetagate::engine {

enum class TokenKind {
  kNumber,  // 12, 0.75
  kName,    // n, T, lg, floor, Theta, if, even ...
  kPlus,
  kMinus,
  kStar,
  kSlash,
  kCaret,
  kLeftParen,
  kRightParen,
  kComma,
  kLeftFloor,
  kRightFloor,
  kLeftCeil,
  kRightCeil,
  kSqrt,
  kAssign,    // =
  kEqual,     // ==
  kNotEqual,  // != ≠
  kLess,
  kLessEqual,
  kGreater,
  kGreaterEqual,
  kNewline,  // end of one definition: a line break or ';'
  kEnd,
};

struct Token {
  TokenKind kind;
  std::string text;  // the spelling; names are as written ("Θ" becomes "Theta")
  size_t pos;        // byte offset in the SourceText
};

// Splits `source.text` into tokens. `#` starts a comment to the end of the
// line. Throws InputError on a character that is not part of the language.
std::vector<Token> tokenize(const SourceText& source);

// A short description for messages: "')'", "the end of the line", "'lg'".
std::string describe(const Token& t);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_SYNTAX_LEXER_H_
