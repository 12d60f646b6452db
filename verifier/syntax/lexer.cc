#include "verifier/syntax/lexer.h"

#include <cctype>
#include <cstdint>
#include <cstdio>
#include <cstring>
#include <optional>
#include <utility>

namespace thetagate::engine {

namespace {

struct Spelling {
  const char* text;
  TokenKind kind;
  const char* name;  // for names spelled in Unicode: the ASCII name
};

// Longest spellings first so "<=" wins over "<". Programmers' spellings are
// read as the language's own: ** as ^, % as mod, && and || as and, or.
const Spelling kSpellings[] = {
    {"**", TokenKind::kCaret, nullptr},
    {"&&", TokenKind::kName, "and"},
    {"||", TokenKind::kName, "or"},
    {"==", TokenKind::kEqual, nullptr},
    {"!=", TokenKind::kNotEqual, nullptr},
    {"<=", TokenKind::kLessEqual, nullptr},
    {">=", TokenKind::kGreaterEqual, nullptr},
    {"\u2264", TokenKind::kLessEqual, nullptr},
    {"\u2265", TokenKind::kGreaterEqual, nullptr},
    {"\u2260", TokenKind::kNotEqual, nullptr},
    {"\u2212", TokenKind::kMinus, nullptr},
    {"\u00b7", TokenKind::kStar, nullptr},
    {"\u00d7", TokenKind::kStar, nullptr},
    {"\u230a", TokenKind::kLeftFloor, nullptr},
    {"\u230b", TokenKind::kRightFloor, nullptr},
    {"\u2308", TokenKind::kLeftCeil, nullptr},
    {"\u2309", TokenKind::kRightCeil, nullptr},
    {"\u221a", TokenKind::kSqrt, nullptr},
    {"\u0398", TokenKind::kName, "Theta"},
    {"\u03a9", TokenKind::kName, "Omega"},
    {"+", TokenKind::kPlus, nullptr},
    {"-", TokenKind::kMinus, nullptr},
    {"*", TokenKind::kStar, nullptr},
    {"/", TokenKind::kSlash, nullptr},
    {"^", TokenKind::kCaret, nullptr},
    {"(", TokenKind::kLeftParen, nullptr},
    {")", TokenKind::kRightParen, nullptr},
    {",", TokenKind::kComma, nullptr},
    {"=", TokenKind::kAssign, nullptr},
    {"<", TokenKind::kLess, nullptr},
    {">", TokenKind::kGreater, nullptr},
    {";", TokenKind::kNewline, nullptr},
    {"%", TokenKind::kName, "mod"},
};

// Characters that cannot be seen, or that look like ASCII but are not: the
// message names the code point (an invisible one is never shown as-is) and
// the hint the ASCII character meant.
struct LookAlike {
  char32_t code;
  const char* name;   // the Unicode name
  const char* ascii;  // what to write instead; "" to delete it
};

const LookAlike kLookAlikes[] = {
    {0x00A0, "NO-BREAK SPACE", " "},
    {0x00AD, "SOFT HYPHEN", ""},
    {0x2000, "EN QUAD", " "},
    {0x2001, "EM QUAD", " "},
    {0x2002, "EN SPACE", " "},
    {0x2003, "EM SPACE", " "},
    {0x2004, "THREE-PER-EM SPACE", " "},
    {0x2005, "FOUR-PER-EM SPACE", " "},
    {0x2006, "SIX-PER-EM SPACE", " "},
    {0x2007, "FIGURE SPACE", " "},
    {0x2008, "PUNCTUATION SPACE", " "},
    {0x2009, "THIN SPACE", " "},
    {0x200A, "HAIR SPACE", " "},
    {0x200B, "ZERO WIDTH SPACE", ""},
    {0x200C, "ZERO WIDTH NON-JOINER", ""},
    {0x200D, "ZERO WIDTH JOINER", ""},
    {0x200E, "LEFT-TO-RIGHT MARK", ""},
    {0x200F, "RIGHT-TO-LEFT MARK", ""},
    {0x202F, "NARROW NO-BREAK SPACE", " "},
    {0x205F, "MEDIUM MATHEMATICAL SPACE", " "},
    {0x2060, "WORD JOINER", ""},
    {0x3000, "IDEOGRAPHIC SPACE", " "},
    {0xFEFF, "ZERO WIDTH NO-BREAK SPACE (byte order mark)", ""},
    {0x2010, "HYPHEN", "-"},
    {0x2011, "NON-BREAKING HYPHEN", "-"},
    {0x2012, "FIGURE DASH", "-"},
    {0x2013, "EN DASH", "-"},
    {0x2014, "EM DASH", "-"},
    {0x2015, "HORIZONTAL BAR", "-"},
    {0xFE63, "SMALL HYPHEN-MINUS", "-"},
    {0x2217, "ASTERISK OPERATOR", "*"},
    {0x2219, "BULLET OPERATOR", "*"},
    {0x22C5, "DOT OPERATOR", "*"},
    {0x2044, "FRACTION SLASH", "/"},
    {0x2215, "DIVISION SLASH", "/"},
    {0x00F7, "DIVISION SIGN", "/"},
    {0x2018, "LEFT SINGLE QUOTATION MARK", "'"},
    {0x2019, "RIGHT SINGLE QUOTATION MARK", "'"},
    {0x201C, "LEFT DOUBLE QUOTATION MARK", "\""},
    {0x201D, "RIGHT DOUBLE QUOTATION MARK", "\""},
    {0x0391, "GREEK CAPITAL LETTER ALPHA", "A"},
    {0x0392, "GREEK CAPITAL LETTER BETA", "B"},
    {0x0395, "GREEK CAPITAL LETTER EPSILON", "E"},
    {0x0397, "GREEK CAPITAL LETTER ETA", "H"},
    {0x0399, "GREEK CAPITAL LETTER IOTA", "I"},
    {0x039A, "GREEK CAPITAL LETTER KAPPA", "K"},
    {0x039C, "GREEK CAPITAL LETTER MU", "M"},
    {0x039D, "GREEK CAPITAL LETTER NU", "N"},
    {0x039F, "GREEK CAPITAL LETTER OMICRON", "O"},
    {0x03A1, "GREEK CAPITAL LETTER RHO", "P"},
    {0x03A4, "GREEK CAPITAL LETTER TAU", "T"},
    {0x03A7, "GREEK CAPITAL LETTER CHI", "X"},
    {0x03BF, "GREEK SMALL LETTER OMICRON", "o"},
    {0x0410, "CYRILLIC CAPITAL LETTER A", "A"},
    {0x0412, "CYRILLIC CAPITAL LETTER VE", "B"},
    {0x0415, "CYRILLIC CAPITAL LETTER IE", "E"},
    {0x041A, "CYRILLIC CAPITAL LETTER KA", "K"},
    {0x041C, "CYRILLIC CAPITAL LETTER EM", "M"},
    {0x041D, "CYRILLIC CAPITAL LETTER EN", "H"},
    {0x041E, "CYRILLIC CAPITAL LETTER O", "O"},
    {0x0420, "CYRILLIC CAPITAL LETTER ER", "P"},
    {0x0421, "CYRILLIC CAPITAL LETTER ES", "C"},
    {0x0422, "CYRILLIC CAPITAL LETTER TE", "T"},
    {0x0425, "CYRILLIC CAPITAL LETTER HA", "X"},
    {0x0430, "CYRILLIC SMALL LETTER A", "a"},
    {0x0435, "CYRILLIC SMALL LETTER IE", "e"},
    {0x043E, "CYRILLIC SMALL LETTER O", "o"},
    {0x0440, "CYRILLIC SMALL LETTER ER", "p"},
    {0x0441, "CYRILLIC SMALL LETTER ES", "c"},
    {0x0445, "CYRILLIC SMALL LETTER HA", "x"},
    {0x0443, "CYRILLIC SMALL LETTER U", "y"},
    {0x0456, "CYRILLIC SMALL LETTER BYELORUSSIAN-UKRAINIAN I", "i"},
    {0x0458, "CYRILLIC SMALL LETTER JE", "j"},
    {0x0501, "CYRILLIC SMALL LETTER KOMI DE", "d"},
};

// The code point at byte i (its length in `length`), or nullopt for bytes
// that are not UTF-8.
std::optional<char32_t> decode_utf8(const std::string& s, size_t i, size_t& length) {
  unsigned char u = static_cast<unsigned char>(s[i]);
  length = 1;
  if (u < 0x80) return u;
  size_t extra = u >= 0xF0 && u < 0xF8 ? 3 : u >= 0xE0 ? 2 : u >= 0xC0 ? 1 : 0;
  if (extra == 0 || i + extra >= s.size()) return std::nullopt;
  char32_t code = u & (0x3F >> extra);
  for (size_t k = 1; k <= extra; ++k) {
    unsigned char c = static_cast<unsigned char>(s[i + k]);
    if ((c & 0xC0) != 0x80) return std::nullopt;
    code = (code << 6) | (c & 0x3F);
  }
  length = extra + 1;
  return code;
}

std::string code_point_text(char32_t code) {
  char buffer[16];
  std::snprintf(buffer, sizeof buffer, "U+%04X", static_cast<unsigned>(code));
  return buffer;
}

// The message and hint for a character outside the language that is
// invisible or a look-alike of an ASCII one; nullopt for any other.
std::optional<std::pair<std::string, std::string>> look_alike(char32_t code,
                                                              const std::string& text) {
  std::string ascii;
  std::string name;
  for (const LookAlike& l : kLookAlikes) {
    if (l.code == code) {
      ascii = l.ascii;
      name = l.name;
    }
  }
  // Fullwidth forms of ASCII: digits, letters, operators.
  if (code >= 0xFF01 && code <= 0xFF5E) {
    ascii = std::string(1, static_cast<char>(code - 0xFF01 + 0x21));
    name = "FULLWIDTH '" + ascii + "'";
  }
  if (name.empty()) return std::nullopt;
  std::string point = code_point_text(code) + " " + name;
  if (ascii.empty()) {
    return std::pair{"invisible character " + point, std::string("delete it (it cannot be seen)")};
  }
  if (ascii == " ") {
    return std::pair{"invisible character " + point + " where a space goes",
                     std::string("replace it with an ordinary space")};
  }
  return std::pair{"character '" + text + "' (" + point + ") is not the ASCII '" + ascii + "'",
                   "replace it with '" + ascii + "'"};
}

// The digit a superscript character stands for (n², 2ⁿ as documentation
// writes them), 'n' for ⁿ, or 0.
char superscript(char32_t code) {
  switch (code) {
    case 0x2070:
      return '0';
    case 0x00B9:
      return '1';
    case 0x00B2:
      return '2';
    case 0x00B3:
      return '3';
    case 0x207F:
      return 'n';
    default:
      return code >= 0x2074 && code <= 0x2079 ? static_cast<char>('4' + (code - 0x2074)) : 0;
  }
}

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
      std::string name = s.substr(start, i - start);
      if (name == "log_2") name = "log2";  // as TeX writes it: log_2 n
      tokens.push_back({TokenKind::kName, name, start});
      continue;
    }
    // A run of superscripts is a power: n² reads as n^2, 2ⁿ as 2^n, n¹⁰ as n^10.
    size_t sup_len = 1;
    std::optional<char32_t> sup_code =
        static_cast<unsigned char>(c) >= 0x80 ? decode_utf8(s, i, sup_len) : std::nullopt;
    if (sup_code && superscript(*sup_code)) {
      size_t start = i;
      std::string exponent;
      while (i < s.size()) {
        size_t len = 1;
        std::optional<char32_t> code = decode_utf8(s, i, len);
        char d = code ? superscript(*code) : 0;
        if (!d) break;
        exponent += d;
        i += len;
      }
      if (exponent.find('n') != std::string::npos && exponent != "n")
        fail_at(source, start, "a superscript mixes ⁿ with other characters",
                "write the power with ^, e.g. n^2 or 2^n");
      tokens.push_back({TokenKind::kCaret, "^", start});
      tokens.push_back({exponent == "n" ? TokenKind::kName : TokenKind::kNumber, exponent, start});
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
    std::optional<char32_t> code = decode_utf8(s, i, len);
    if (!code) {
      char byte[8];
      std::snprintf(byte, sizeof byte, "0x%02X", static_cast<unsigned>(static_cast<uint8_t>(c)));
      fail_at(source, i, std::string("the byte ") + byte + " is not UTF-8 text",
              "save the text as UTF-8");
    }
    std::string bad = s.substr(i, len);
    if (auto alike = look_alike(*code, bad)) fail_at(source, i, alike->first, alike->second);
    const char* sum_form =
        "write a sum as sum(k, lo, hi, body), e.g. sum(k, 0, n - 1, T(k)) for T(0) + ... + "
        "T(n-1)";
    if (bad == "." && i + 1 < s.size() && s[i + 1] == '.') {
      fail_at(source, i, "ranges with '..' are not part of the language", sum_form);
    }
    if (bad == "\u03a3" || bad == "\u2211") {
      fail_at(source, i, "the summation sign '" + bad + "' is not part of the language", sum_form);
    }
    if (bad == "\u220f" || bad == "\u03a0") {
      fail_at(source, i, "products with '" + bad + "' are not part of the language",
              "there is no product form; a product over k is itself a recurrence, "
              "P(n) = f(n) P(n-1)");
    }
    if (bad == "\u2026") {
      fail_at(source, i, "'…' marks the certified digits of a number without a closed form",
              "a bound needs an exact value: write the exponent as an expression such as lg 3 "
              "or (1 + sqrt(5))/2, or bound with a rational one");
    }
    if (bad == "_" || bad == "{" || bad == "}") {
      bool after_sum =
          !tokens.empty() && tokens.back().kind == TokenKind::kName &&
          (tokens.back().text.rfind("sum", 0) == 0 || tokens.back().text.rfind("Sum", 0) == 0);
      if (after_sum) fail_at(source, i, "sum limits in TeX style are not supported", sum_form);
    }
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
    if (bad == "&" || bad == "|") hint = "write 'and' / 'or' (or && / ||) in conditions";
    std::string shown = "'" + bad + "'";
    if (*code >= 0x80) shown += " (" + code_point_text(*code) + ")";
    if (*code < 0x20 || *code == 0x7F) shown = code_point_text(*code);  // a control character
    fail_at(source, i, "unexpected character " + shown, hint);
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
