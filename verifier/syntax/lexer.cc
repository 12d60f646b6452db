#include "verifier/syntax/lexer.h"

#include <cctype>
#include <cstring>

namespace thetagate::engine {

namespace {

struct Spelling {
  const char* text;
  TokenKind kind;
  const char* name;  // for names spelled in Unicode: the ASCII name
};

// Longest spellings first so "<=" wins over "<".
const Spelling kSpellings[] = {
    {"==", TokenKind::kEqual, nullptr},         {"!=", TokenKind::kNotEqual, nullptr},
    {"<=", TokenKind::kLessEqual, nullptr},     {">=", TokenKind::kGreaterEqual, nullptr},
    {"\u2264", TokenKind::kLessEqual, nullptr}, {"\u2265", TokenKind::kGreaterEqual, nullptr},
    {"\u2260", TokenKind::kNotEqual, nullptr},  {"\u2212", TokenKind::kMinus, nullptr},
    {"\u00b7", TokenKind::kStar, nullptr},      {"\u00d7", TokenKind::kStar, nullptr},
    {"\u230a", TokenKind::kLeftFloor, nullptr}, {"\u230b", TokenKind::kRightFloor, nullptr},
    {"\u2308", TokenKind::kLeftCeil, nullptr},  {"\u2309", TokenKind::kRightCeil, nullptr},
    {"\u221a", TokenKind::kSqrt, nullptr},      {"\u0398", TokenKind::kName, "Theta"},
    {"\u03a9", TokenKind::kName, "Omega"},      {"+", TokenKind::kPlus, nullptr},
    {"-", TokenKind::kMinus, nullptr},          {"*", TokenKind::kStar, nullptr},
    {"/", TokenKind::kSlash, nullptr},          {"^", TokenKind::kCaret, nullptr},
    {"(", TokenKind::kLeftParen, nullptr},      {")", TokenKind::kRightParen, nullptr},
    {",", TokenKind::kComma, nullptr},          {"=", TokenKind::kAssign, nullptr},
    {"<", TokenKind::kLess, nullptr},           {">", TokenKind::kGreater, nullptr},
    {";", TokenKind::kNewline, nullptr},
};

bool name_start(char c) { return std::isalpha(static_cast<unsigned char>(c)) || c == '_'; }
bool name_char(char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; }

}  // namespace

std::vector<Token> tokenize(const SourceText& source) {
  const std::string& s = source.text;
  std::vector<Token> tokens;
  size_t i = 0;
  while (i < s.size()) {
    char c = s[i];
    if (c == '\n') {
      tokens.push_back({TokenKind::kNewline, "\n", i});
      ++i;
      continue;
    }
    if (c == ' ' || c == '\t' || c == '\r') {
      ++i;
      continue;
    }
    if (c == '#') {
      while (i < s.size() && s[i] != '\n') ++i;
      continue;
    }
    if (std::isdigit(static_cast<unsigned char>(c)) ||
        (c == '.' && i + 1 < s.size() && std::isdigit(static_cast<unsigned char>(s[i + 1])))) {
      size_t start = i;
      while (i < s.size() && std::isdigit(static_cast<unsigned char>(s[i]))) ++i;
      if (i < s.size() && s[i] == '.' && i + 1 < s.size() &&
          std::isdigit(static_cast<unsigned char>(s[i + 1]))) {
        ++i;
        while (i < s.size() && std::isdigit(static_cast<unsigned char>(s[i]))) ++i;
      }
      tokens.push_back({TokenKind::kNumber, s.substr(start, i - start), start});
      continue;
    }
    if (name_start(c)) {
      size_t start = i;
      while (i < s.size() && name_char(s[i])) ++i;
      tokens.push_back({TokenKind::kName, s.substr(start, i - start), start});
      continue;
    }
    bool matched = false;
    for (const Spelling& sp : kSpellings) {
      size_t len = std::strlen(sp.text);
      if (s.compare(i, len, sp.text) == 0) {
        tokens.push_back({sp.kind, sp.name ? sp.name : sp.text, i});
        i += len;
        matched = true;
        break;
      }
    }
    if (matched) continue;
    size_t len = 1;
    unsigned char u = static_cast<unsigned char>(c);
    if (u >= 0xF0)
      len = 4;
    else if (u >= 0xE0)
      len = 3;
    else if (u >= 0xC0)
      len = 2;
    std::string bad = s.substr(i, len);
    std::string hint = "the language uses + - * / ^ ( ) , = == != < <= > >= and ⌊ ⌋ ⌈ ⌉ √";
    if (bad == "[" || bad == "{") hint = "use ( ) for grouping, floor(x) or ⌊x⌋ for rounding down";
    if (bad == "!") {
      // After an operand ("n!", "(n-1)!") it is a factorial, not a negation.
      const Token* last = tokens.empty() ? nullptr : &tokens.back();
      bool keyword = last && (last->text == "if" || last->text == "and" || last->text == "or" ||
                              last->text == "not" || last->text == "is");
      bool after_operand = last && !keyword &&
                           (last->kind == TokenKind::kNumber || last->kind == TokenKind::kName ||
                            last->kind == TokenKind::kRightParen);
      hint = after_operand ? "there is no factorial; n! is itself the recurrence "
                             "T(n) = n T(n-1), T(0) = 1, or bound it, e.g. by n^n"
                           : "write 'not' for negation, '!=' for inequality";
    }
    if (bad == "&" || bad == "|") hint = "write 'and' / 'or' in conditions";
    fail_at(source, i, "unexpected character '" + bad + "'", hint);
  }
  tokens.push_back({TokenKind::kEnd, "", s.size()});
  return tokens;
}

std::string describe(const Token& t) {
  switch (t.kind) {
    case TokenKind::kEnd:
      return "the end of the text";
    case TokenKind::kNewline:
      return t.text == ";" ? "';'" : "the end of the line";
    default:
      return "'" + t.text + "'";
  }
}

}  // namespace thetagate::engine
