#include "verifier/model/bound.h"

#include "verifier/evaluation/expression_eval.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {

namespace {

bool is_function_of_n(const Expr& e, const std::string& function) {
  return e.kind == ExprKind::kCall && e.name == function && e.args.size() == 1 &&
         e.args[0]->kind == ExprKind::kVariable;
}

bool mentions_function(const Expr& e, const std::string& function) {
  if (e.kind == ExprKind::kCall && e.name == function) return true;
  for (const auto& a : e.args) {
    if (mentions_function(*a, function)) return true;
  }
  return false;
}

bool is_less(TokenKind k) { return k == TokenKind::kLess || k == TokenKind::kLessEqual; }
bool is_greater(TokenKind k) { return k == TokenKind::kGreater || k == TokenKind::kGreaterEqual; }
bool is_equal(TokenKind k) { return k == TokenKind::kAssign || k == TokenKind::kEqual; }
bool is_strict(TokenKind k) { return k == TokenKind::kLess || k == TokenKind::kGreater; }

Bound parse_asymptotic(Parser& p, const SourceText& source) {
  Bound b;
  b.source = source;
  const Token& name = p.next();
  b.kind = name.text == "O" ? BoundKind::kBigO
                            : (name.text == "Omega" ? BoundKind::kOmega : BoundKind::kTheta);
  p.expect(TokenKind::kLeftParen, "'(' after '" + name.text + "'",
           "write " + name.text + "(n lg n)");
  p.read_unbased_log_as_lg();
  b.growth = p.parse_value();
  if (p.unbased_logs() > 0) {
    b.notes.push_back("log without a base in " + name.text +
                      "(...) is read as lg: the base changes a constant factor only");
  }
  p.expect(TokenKind::kRightParen, "')'", "close the class: " + name.text + "(...)");
  while (p.accept(TokenKind::kNewline)) {
  }
  if (!p.at(TokenKind::kEnd)) {
    p.fail_expected("the end of the bound", "one class per claim: Theta(g), O(g) or Omega(g)");
  }
  if (mentions_function(*b.growth, "T")) {
    p.fail(name, "the class mentions T", "write the growth in n alone: Theta(n lg n)");
  }
  return b;
}

}  // namespace

std::string Bound::text() const {
  std::string t = source.text;
  size_t a = t.find_first_not_of(" \t\r\n");
  size_t z = t.find_last_not_of(" \t\r\n");
  return a == std::string::npos ? "" : t.substr(a, z - a + 1);
}

void check_bound_fits(const Recurrence& recurrence, const Bound& bound) {
  if (bound.is_asymptotic() || recurrence.class_terms.empty()) return;
  const ClassTerm& t = recurrence.class_terms.front();
  std::string written = std::string(class_term_name(t.kind)) + "(" + print(*t.representative) + ")";
  fail_at(recurrence.source, t.pos,
          "an explicit bound needs the exact values of " + recurrence.main.name + ", but " +
              written + " stands for any function of that class",
          "claim a class instead (Theta(...), O(...), Omega(...)), or write the cost exactly, "
          "e.g. n - 1 in place of Θ(n)");
}

const char* side_name(Side s) { return s == Side::kUpper ? "upper" : "lower"; }

const char* bound_kind_symbol(BoundKind kind) {
  switch (kind) {
    case BoundKind::kTheta:
      return "Θ";
    case BoundKind::kBigO:
      return "O";
    case BoundKind::kOmega:
      return "Ω";
    case BoundKind::kExplicit:
      return "explicit";
  }
  return "?";
}

const char* bound_kind_name(BoundKind kind) {
  switch (kind) {
    case BoundKind::kTheta:
      return "Theta";
    case BoundKind::kBigO:
      return "O";
    case BoundKind::kOmega:
      return "Omega";
    case BoundKind::kExplicit:
      return "explicit";
  }
  return "?";
}

namespace {

// A sum variable named like the recurrence's function would hide it inside
// the sum's body (sum(T, 1, n, T(T)) reads T(T) as T*T).
void check_sum_shadowing(const Bound& b, const SourceText& source, const std::string& function) {
  auto is_function = [&](const std::string& name) { return name == function; };
  for (const ExprPtr& side : {b.lower, b.upper, b.growth}) {
    if (!side) continue;
    if (const Expr* sum = find_sum_shadowing(*side, is_function)) {
      size_t at = source.text.find(sum->name, sum->pos + 3);
      fail_at(source, at == std::string::npos ? sum->pos : at,
              "the sum's variable '" + sum->name + "' has the name of the function " + function +
                  ", which it would hide inside the sum",
              "give the variable another name: " +
                  sum_text_with_fresh_variable(source.text, sum->pos, sum->name));
    }
  }
}

}  // namespace

Bound parse_bound(const SourceText& source, const std::string& function) {
  Parser p(source);
  while (p.accept(TokenKind::kNewline)) {
  }
  if (p.at(TokenKind::kEnd)) {
    p.fail(p.peek(), "the bound is empty",
           "write Theta(n lg n), O(n^2), or T(n) <= 2n lg n for n >= 2");
  }
  if (p.at(TokenKind::kName) &&
      (p.peek().text == "Theta" || p.peek().text == "O" || p.peek().text == "Omega") &&
      p.peek(1).kind == TokenKind::kLeftParen) {
    Bound b = parse_asymptotic(p, source);
    check_sum_shadowing(b, source, function);
    return b;
  }

  Bound b;
  b.source = source;
  b.kind = BoundKind::kExplicit;
  std::vector<ExprPtr> sides;
  std::vector<Token> ops;
  sides.push_back(p.parse_sum());
  while (p.at(TokenKind::kLess) || p.at(TokenKind::kLessEqual) || p.at(TokenKind::kGreater) ||
         p.at(TokenKind::kGreaterEqual) || p.at(TokenKind::kAssign) || p.at(TokenKind::kEqual)) {
    ops.push_back(p.next());
    sides.push_back(p.parse_sum());
  }
  const std::string hint =
      "write T(n) <= EXPR, EXPR <= T(n), or EXPR <= T(n) <= EXPR, then 'for n >= N0'";
  if (ops.empty()) {
    p.fail(p.peek(),
           "expected Theta(...), O(...), Omega(...) or an inequality with " + function + "(n)",
           hint);
  }
  if (ops.size() > 2) p.fail(ops[2], "too many comparisons in the bound", hint);

  // Find the side that is exactly T(n).
  size_t t_index = sides.size();
  for (size_t i = 0; i < sides.size(); ++i) {
    if (is_function_of_n(*sides[i], function) || is_function_of_n(*sides[i], "T")) {
      t_index = i;
      break;
    }
  }
  if (t_index == sides.size()) {
    p.fail(ops[0], "the inequality does not compare " + function + "(n)", hint);
  }
  for (size_t i = 0; i < sides.size(); ++i) {
    if (i != t_index &&
        (mentions_function(*sides[i], function) || mentions_function(*sides[i], "T"))) {
      fail_at(source, sides[i]->pos, "only one side may mention " + function + "(n)", hint);
    }
  }
  // Each comparison puts a bound on one side of T(n).
  for (size_t k = 0; k < ops.size(); ++k) {
    size_t left = k, right = k + 1;
    TokenKind op = ops[k].kind;
    ExprPtr other;
    bool other_is_left;
    if (left == t_index) {
      other = sides[right];
      other_is_left = false;
    } else if (right == t_index) {
      other = sides[left];
      other_is_left = true;
    } else {
      p.fail(ops[k], "each comparison must involve " + function + "(n)", hint);
    }
    // Normalise "other OP T" and "T OP other" to lower/upper.
    bool other_is_upper;
    if (is_equal(op)) {
      if (b.lower || b.upper)
        p.fail(ops[k], "'=' cannot be combined with another comparison", hint);
      b.lower = other;
      b.upper = other;
      continue;
    }
    if (is_less(op))
      other_is_upper = !other_is_left;
    else if (is_greater(op))
      other_is_upper = other_is_left;
    else
      p.fail(ops[k], "'!=' cannot bound " + function + "(n)", hint);
    if (other_is_upper) {
      if (b.upper) p.fail(ops[k], "two upper bounds", hint);
      b.upper = other;
      b.strict_upper = is_strict(op);
    } else {
      if (b.lower) p.fail(ops[k], "two lower bounds", hint);
      b.lower = other;
      b.strict_lower = is_strict(op);
    }
  }

  if (p.accept_name("for")) {
    p.accept_name("all");
    if (!p.at_name("n")) p.fail_expected("'n'", "the range reads: for n >= 2");
    p.next();
    bool strict = false;
    if (p.accept(TokenKind::kGreater))
      strict = true;
    else
      p.expect(TokenKind::kGreaterEqual, "'>='", "the range reads: for n >= 2");
    const Token& start = p.peek();
    ExprPtr n0 = p.parse_sum();
    if (mentions_n(*n0)) p.fail(start, "the starting size must not depend on n", "for n >= 2");
    // A constant expression: "for n >= 10^6", "for n >= 2^40".
    NumericContext ctx;
    ctx.max_value_bits = 1 << 16;
    EvalScope scope;
    scope.source = &source;
    scope.ctx = &ctx;
    std::optional<Value> value;
    try {
      value = evaluate_expr(*n0, Value(int64_t{0}), scope);
    } catch (const BudgetExceeded&) {
      p.fail(start, "the starting size is too large: more than 65536 bits",
             "sizes have at most 65536 bits: write, for example, for n >= 2^4000");
    } catch (const PrecisionShortfall&) {
    }
    if (!value || !value->is_integer() || value->sign() < 0) {
      p.fail(start, "the starting size must be a whole number", "for n >= 2, for n >= 10^6");
    }
    b.n0 = value->integer() + (strict ? 1 : 0);
  }
  while (p.accept(TokenKind::kNewline)) {
  }
  if (!p.at(TokenKind::kEnd)) p.fail_expected("the end of the bound", hint);
  check_sum_shadowing(b, source, function);
  return b;
}

}  // namespace thetagate::engine
