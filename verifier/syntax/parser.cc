#include "verifier/syntax/parser.h"

#include <set>

#include "verifier/syntax/large_stack.h"

namespace thetagate::engine {

namespace {

// 2^65536, the largest size, has 19,729 digits.
constexpr size_t kMaxLiteralDigits = 100000;

const std::set<std::string>& keywords() {
  static const std::set<std::string> words = {"if",  "otherwise", "and", "or", "not", "even",
                                              "odd", "mod",       "for", "is", "all", "when"};
  return words;
}

const char* const kSumHint =
    "a sum is written sum(k, lo, hi, body): sum(k, 0, n - 1, T(k)) adds T(0) ... T(n-1)";

bool is_prefix_function(const std::string& name) {
  return name == "lg" || name == "ln" || name == "log2" || name == "sqrt" || name == "log";
}

}  // namespace

BigInt decimal_integer(const std::string& digits) {
  // Always base 10: GMP would read a leading 0 as octal.
  BigInt value;
  mpz_set_str(value.backend().data(), digits.c_str(), 10);
  return value;
}

namespace {

Rational literal_value(const std::string& text) {
  size_t dot = text.find('.');
  if (dot == std::string::npos) return Rational(decimal_integer(text));
  std::string digits = text.substr(0, dot) + text.substr(dot + 1);
  BigInt scale;  // 10^(digits after the point), by GMP, not digit by digit
  mpz_ui_pow_ui(scale.backend().data(), 10, text.size() - dot - 1);
  return Rational(decimal_integer(digits), scale);
}

ExprKind comparison_kind(TokenKind t) {
  switch (t) {
    case TokenKind::kEqual:
    case TokenKind::kAssign:
      return ExprKind::kEq;
    case TokenKind::kNotEqual:
      return ExprKind::kNe;
    case TokenKind::kLess:
      return ExprKind::kLt;
    case TokenKind::kLessEqual:
      return ExprKind::kLe;
    case TokenKind::kGreater:
      return ExprKind::kGt;
    default:
      return ExprKind::kGe;
  }
}

bool is_comparison(TokenKind t) {
  return t == TokenKind::kEqual || t == TokenKind::kAssign || t == TokenKind::kNotEqual ||
         t == TokenKind::kLess || t == TokenKind::kLessEqual || t == TokenKind::kGreater ||
         t == TokenKind::kGreaterEqual;
}

}  // namespace

bool is_keyword(const std::string& word) { return keywords().count(word) != 0; }

ExprPtr Parser::bounded(ExprPtr e) const {
  if (e->depth > kMaxTreeDepth) {
    fail_at(source_, e->pos, "the expression is nested too deeply",
            "more than " + std::to_string(kMaxTreeDepth) +
                " levels: a chain of terms counts one level per operator, like parentheses; "
                "split it with a helper function or simplify it");
  }
  return e;
}

// One level per recursion of the parser: a parenthesis (or argument list,
// or sum), a prefix '-', '+' or 'not', a power's exponent, a prefix function
// (lg lg n). So kMaxTreeDepth nested parentheses parse, as
// docs/decisions.md promises, and any deeper input is a located error
// before the stack grows further.
class Parser::Nesting {
 public:
  explicit Nesting(Parser& p) : parser_(p) {
    if (++parser_.depth_ > kMaxDepth) {
      parser_.fail(parser_.peek(), "the expression is nested too deeply",
                   "more than " + std::to_string(kMaxTreeDepth) +
                       " levels of parentheses and prefix operators; simplify it");
    }
  }
  ~Nesting() { --parser_.depth_; }

 private:
  // The margin is for the levels around the expression itself (a call's
  // argument list, the line's own value).
  static constexpr int kMaxDepth = static_cast<int>(kMaxTreeDepth) + 16;
  Parser& parser_;
};

Parser::Parser(const SourceText& source) : source_(source), tokens_(tokenize(source_)) {}

const Token& Parser::peek(size_t ahead) const {
  size_t i = std::min(cursor_ + ahead, tokens_.size() - 1);
  return tokens_[i];
}

const Token& Parser::next() {
  const Token& t = tokens_[cursor_];
  if (cursor_ + 1 < tokens_.size()) ++cursor_;
  return t;
}

const Token& Parser::previous() const { return tokens_[cursor_ == 0 ? 0 : cursor_ - 1]; }

bool Parser::at_name(const char* name) const { return at(TokenKind::kName) && peek().text == name; }

bool Parser::accept(TokenKind kind) {
  if (!at(kind)) return false;
  next();
  return true;
}

bool Parser::accept_name(const char* name) {
  if (!at_name(name)) return false;
  next();
  return true;
}

const Token& Parser::expect(TokenKind kind, const std::string& what, const std::string& hint) {
  if (!at(kind)) fail_expected(what, hint);
  return next();
}

void Parser::fail(const Token& at, std::string message, std::string hint) const {
  fail_at(source_, at.pos, std::move(message), std::move(hint));
}

void Parser::fail_expected(const std::string& what, const std::string& hint) const {
  std::string message = "expected " + what;
  if (cursor_ > 0) message += " after " + describe(previous());
  message += ", found " + describe(peek());
  fail(peek(), message, hint);
}

ExprPtr Parser::parse_any() { return parse_or(); }

ExprPtr Parser::parse_value() {
  const Token& start = peek();
  ExprPtr e = parse_or();
  if (e->is_condition()) {
    fail(start, "a condition stands where a number is expected",
         "conditions go after 'if': T(n) = 1 if n <= 1");
  }
  return e;
}

ExprPtr Parser::parse_condition() {
  const Token& start = peek();
  ExprPtr e = parse_or();
  if (!e->is_condition()) {
    fail(start, "expected a condition, found the value '" + print(*e) + "'",
         "conditions look like 'n even', 'n odd', 'n mod 3 == 1', 'n <= 4'");
  }
  return e;
}

ExprPtr Parser::parse_sum() {
  ExprPtr left = parse_product();
  while (at(TokenKind::kPlus) || at(TokenKind::kMinus)) {
    const Token& op = next();
    ExprPtr right = parse_product();
    left = bounded(make_binary(op.kind == TokenKind::kPlus ? ExprKind::kAdd : ExprKind::kSub, left,
                               right, op.pos));
  }
  return left;
}

ExprPtr Parser::parse_or() {
  // Every parenthesis, bracket and argument list comes through here. Past
  // a shallow depth the rest of this subexpression moves to a stack of
  // known size, so the promised depth parses whatever stack we were given.
  if (depth_ == kLargeStackDepth && !on_large_stack_) {
    on_large_stack_ = true;
    struct Restore {
      bool& flag;
      ~Restore() { flag = false; }
    } restore{on_large_stack_};
    return on_large_stack([this] { return parse_or(); });
  }
  Nesting guard(*this);
  ExprPtr left = parse_and();
  while (at_name("or")) {
    const Token& op = next();
    left = bounded(make_binary(ExprKind::kOr, left, parse_and(), op.pos));
  }
  return left;
}

ExprPtr Parser::parse_and() {
  ExprPtr left = parse_not();
  while (at_name("and")) {
    const Token& op = next();
    left = bounded(make_binary(ExprKind::kAnd, left, parse_not(), op.pos));
  }
  return left;
}

ExprPtr Parser::parse_not() {
  if (at_name("not")) {
    Nesting guard(*this);
    const Token& op = next();
    return bounded(make_unary(ExprKind::kNot, parse_not(), op.pos));
  }
  return parse_comparison();
}

ExprPtr Parser::parse_comparison() {
  ExprPtr left = parse_sum();
  if (is_comparison(peek().kind)) {
    const Token& op = next();
    ExprPtr right = parse_sum();
    if (is_comparison(peek().kind)) {
      fail(peek(), "comparisons do not chain here", "join them with 'and': 1 <= n and n <= 5");
    }
    return bounded(make_binary(comparison_kind(op.kind), left, right, op.pos));
  }
  if (at_name("is") && (peek(1).text == "even" || peek(1).text == "odd")) next();
  if (at_name("even") || at_name("odd")) {
    const Token& op = next();
    return bounded(make_unary(op.text == "even" ? ExprKind::kEven : ExprKind::kOdd, left, op.pos));
  }
  return left;
}

ExprPtr Parser::parse_product() {
  ExprPtr left = parse_unary();
  while (at(TokenKind::kStar) || at(TokenKind::kSlash) || at_name("mod")) {
    const Token& op = next();
    ExprPtr right = parse_unary();
    if (op.kind == TokenKind::kStar)
      left = bounded(make_binary(ExprKind::kMul, left, right, op.pos));
    else if (op.kind == TokenKind::kSlash)
      left = bounded(make_binary(ExprKind::kDiv, left, right, op.pos));
    else
      left = bounded(make_call("mod", {left, right}, op.pos));
  }
  return left;
}

ExprPtr Parser::parse_unary() {
  if (at(TokenKind::kMinus)) {
    Nesting guard(*this);
    const Token& op = next();
    return bounded(make_unary(ExprKind::kNeg, parse_unary(), op.pos));
  }
  if (at(TokenKind::kPlus)) {
    Nesting guard(*this);
    next();
    return parse_unary();
  }
  return parse_juxtaposition();
}

bool Parser::starts_atom(const Token& t) const {
  switch (t.kind) {
    case TokenKind::kName:
      return !is_keyword(t.text);
    case TokenKind::kLeftParen:
    case TokenKind::kLeftFloor:
    case TokenKind::kLeftCeil:
    case TokenKind::kSqrt:
      return true;
    default:
      return false;
  }
}

ExprPtr Parser::parse_juxtaposition() {
  ExprPtr left = parse_power();
  // "n 2^n", "n^2 3^n": a number after a factor is the base of a power.
  while (starts_atom(peek()) || (at(TokenKind::kNumber) && peek(1).kind == TokenKind::kCaret)) {
    size_t pos = peek().pos;
    left = bounded(make_binary(ExprKind::kMul, left, parse_power(), pos));
  }
  if (at(TokenKind::kNumber)) {
    fail(peek(), "a number directly after a factor",
         "write the coefficient first (3n, not n3) or use '*' between factors; a power may "
         "follow: n 2^n");
  }
  return left;
}

ExprPtr Parser::parse_power() {
  ExprPtr base = parse_atom();
  if (at(TokenKind::kCaret)) {
    Nesting guard(*this);
    const Token& op = next();
    return bounded(make_binary(ExprKind::kPow, base, parse_exponent(), op.pos));
  }
  return base;
}

ExprPtr Parser::parse_exponent() {
  if (at(TokenKind::kMinus)) {
    Nesting guard(*this);
    const Token& op = next();
    return bounded(make_unary(ExprKind::kNeg, parse_exponent(), op.pos));
  }
  return parse_power();
}

ExprPtr Parser::parse_atom() {
  const Token& t = peek();
  switch (t.kind) {
    case TokenKind::kNumber:
      if (t.text.size() > kMaxLiteralDigits) {
        fail(t, "a number with more than " + std::to_string(kMaxLiteralDigits) + " digits",
             "write large numbers as powers: 10^100000, 2^65536 + 7");
      }
      next();
      return make_number(literal_value(t.text), t.pos);
    case TokenKind::kLeftParen: {
      next();
      ExprPtr inner = parse_any();
      expect(TokenKind::kRightParen, "')'", "every '(' needs a matching ')'");
      return inner;
    }
    case TokenKind::kLeftFloor: {
      next();
      ExprPtr inner = parse_value();
      expect(TokenKind::kRightFloor, "'⌋'", "close ⌊ with ⌋");
      return bounded(make_call("floor", {inner}, t.pos));
    }
    case TokenKind::kLeftCeil: {
      next();
      ExprPtr inner = parse_value();
      expect(TokenKind::kRightCeil, "'⌉'", "close ⌈ with ⌉");
      return bounded(make_call("ceil", {inner}, t.pos));
    }
    case TokenKind::kSqrt:
      return parse_prefix_function(t);
    case TokenKind::kName:
      if (t.text == "mod" && peek(1).kind == TokenKind::kLeftParen) {
        next();  // mod(a, b): the call form of the infix operator
        return bounded(make_call("mod", parse_arguments(t), t.pos));
      }
      if (is_keyword(t.text)) {
        fail(t, "expected a number, 'n' or a function, found the keyword '" + t.text + "'");
      }
      next();
      return parse_name(t);
    default:
      fail_expected(
          "a number, 'n', a function or '('",
          t.kind == TokenKind::kEnd || t.kind == TokenKind::kNewline
              ? "the expression stops too early"
              : "a value goes here: a number, a name, a call or a parenthesised expression");
  }
}

ExprPtr Parser::parse_name(const Token& name) {
  if (name.text == "n") return make_variable(name.pos);
  for (const std::string& bound : bound_) {
    if (bound == name.text) return make_bound(name.text, name.pos);
  }
  if (name.text == "sum") return parse_sum_form(name);
  if (is_prefix_function(name.text)) return parse_prefix_function(name);
  if (at(TokenKind::kLeftParen)) {
    // Inside a growth class (a term Θ(n log n) of a recurrence) only the
    // class matters, so log without a base is read as lg.
    bool growth_class = name.text == "Theta" || name.text == "O" || name.text == "Omega";
    bool saved = unbased_log_ok_;
    if (growth_class) unbased_log_ok_ = true;
    std::vector<ExprPtr> args = parse_arguments(name);
    unbased_log_ok_ = saved;
    return bounded(make_call(name.text, std::move(args), name.pos));
  }
  std::string hint = "the size is written 'n'; functions take parentheses: f(n)";
  if (name.text.rfind("sum", 0) == 0 || name.text == "Sum" || name.text == "sigma") {
    hint = kSumHint;
  } else if (name.text.size() > 1 && name.text[0] == 'n') {
    hint = "separate factors with spaces or '*': n lg n, n*n";
  } else if (name.text == "Theta" || name.text == "O" || name.text == "Omega") {
    hint = "asymptotic classes belong in 'bound', not in an expression";
  } else if (name.text.rfind("log_", 0) == 0) {
    hint = "write log(b, n) for a logarithm to base b (lg n or log_2 n for base 2, ln n for e)";
  }
  fail(name, "unknown name '" + name.text + "'", hint);
}

std::vector<ExprPtr> Parser::parse_arguments(const Token& name) {
  expect(TokenKind::kLeftParen, "'('");
  std::vector<ExprPtr> args;
  if (!at(TokenKind::kRightParen)) {
    do {
      args.push_back(parse_value());
    } while (accept(TokenKind::kComma));
  }
  expect(TokenKind::kRightParen, "')'", "close the argument list of '" + name.text + "' with ')'");
  int arity = builtin_arity(name.text);
  if (arity > 0 && static_cast<int>(args.size()) != arity) {
    std::string hint = name.text == "log"
                           ? "log takes a base and a value: log(3, n); lg n is base 2"
                           : name.text + " takes " + std::to_string(arity) +
                                 (arity == 1 ? " argument" : " arguments");
    fail(name,
         "'" + name.text + "' given " + std::to_string(args.size()) + " argument" +
             (args.size() == 1 ? "" : "s"),
         hint);
  }
  if (arity < 0 && args.size() < 2) {
    fail(name, "'" + name.text + "' needs at least two arguments", name.text + "(a, b)");
  }
  return args;
}

// sum(k, lo, hi, body): k is bound in body; lo and hi are expressions in n
// (and in the variables of enclosing sums).
ExprPtr Parser::parse_sum_form(const Token& name) {
  const char* form = "a sum is written sum(k, lo, hi, body), e.g. sum(k, 0, n - 1, T(k))";
  if (!at(TokenKind::kLeftParen)) fail_expected("'(' after 'sum'", form);
  next();
  const Token& variable = peek();
  if (variable.kind != TokenKind::kName || is_keyword(variable.text) || variable.text == "n" ||
      is_builtin(variable.text) || peek(1).kind != TokenKind::kComma) {
    std::string hint = form;
    if (variable.kind == TokenKind::kName && peek(1).kind == TokenKind::kAssign)
      hint = "the limits are separate arguments: sum(k, 0, n - 1, T(k)), not sum(k = 0 ...)";
    else if (variable.kind == TokenKind::kName && variable.text == "n")
      hint = "n is the size; name the summation variable k, i or j";
    fail(variable, "the first argument of 'sum' must be the name of its variable", hint);
  }
  next();
  next();  // ','
  ExprPtr lo = parse_value();
  expect(TokenKind::kComma, "',' after the lower limit", form);
  ExprPtr hi = parse_value();
  expect(TokenKind::kComma, "',' after the upper limit", form);
  bound_.push_back(variable.text);
  ExprPtr body = parse_value();
  bound_.pop_back();
  if (at(TokenKind::kComma)) fail(peek(), "'sum' takes four arguments", form);
  expect(TokenKind::kRightParen, "')'", "close the sum with ')'");
  return make_sum(variable.text, lo, hi, body, name.pos);
}

// lg n, lg^2 n, lg lg n, sqrt n, √n, and lg(n) as an ordinary call.
ExprPtr Parser::parse_prefix_function(const Token& name) {
  Nesting guard(*this);  // lg lg lg n, lg^lg^... n recurse without parentheses
  std::string function = name.kind == TokenKind::kSqrt ? "sqrt" : name.text;
  if (function == "log" && unbased_log_ok_ && !at(TokenKind::kLeftParen)) {
    function = "lg";
    ++unbased_logs_;
  }
  if (name.kind == TokenKind::kSqrt) next();
  ExprPtr exponent;
  if (at(TokenKind::kCaret) && function != "sqrt") {
    next();
    exponent = parse_atom();
  }
  ExprPtr result;
  if (at(TokenKind::kLeftParen) && name.kind != TokenKind::kSqrt) {
    Token call_name = name;
    call_name.text = function;
    result = bounded(make_call(function, parse_arguments(call_name), name.pos));
  } else {
    if (function == "log") {
      fail(name, "'log' needs its base",
           "write lg n (base 2), ln n (base e) or log(b, n); inside Theta(...), O(...) or "
           "Omega(...) the base does not matter and log n is read as lg n");
    }
    if (!starts_atom(peek()) && !at(TokenKind::kNumber)) {
      fail_expected("the argument of '" + function + "'", "for example " + function + " n");
    }
    result = bounded(make_call(function, {parse_power()}, name.pos));
  }
  if (exponent) result = bounded(make_binary(ExprKind::kPow, result, exponent, name.pos));
  return result;
}

ExprPtr parse_expression(const SourceText& source) {
  Parser p(source);
  while (p.accept(TokenKind::kNewline)) {
  }
  if (p.at(TokenKind::kEnd)) p.fail(p.peek(), "the expression is empty");
  ExprPtr e = p.parse_value();
  while (p.accept(TokenKind::kNewline)) {
  }
  if (!p.at(TokenKind::kEnd)) p.fail_expected("the end of the expression");
  return e;
}

}  // namespace thetagate::engine
