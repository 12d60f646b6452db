#include "verifier/syntax/expr.h"

#include <algorithm>
#include <cctype>
#include <cstdint>
#include <map>
#include <set>
#include <string_view>

namespace thetagate::engine {

ExprPtr make_number(Rational value, size_t pos) {
  auto e = std::make_shared<Expr>();
  e->kind = ExprKind::kNumber;
  e->number = std::move(value);
  if (denominator(e->number) == 1 && numerator(e->number) >= INT64_MIN + 1 &&
      numerator(e->number) <= INT64_MAX) {
    e->has_small = true;
    e->small = static_cast<int64_t>(numerator(e->number));
  }
  e->pos = pos;
  return e;
}

ExprPtr make_variable(size_t pos) {
  auto e = std::make_shared<Expr>();
  e->kind = ExprKind::kVariable;
  e->name = "n";
  e->pos = pos;
  return e;
}

ExprPtr make_unary(ExprKind kind, ExprPtr a, size_t pos) {
  auto e = std::make_shared<Expr>();
  e->kind = kind;
  e->args = {std::move(a)};
  e->pos = pos;
  update_depth(*e);
  return e;
}

ExprPtr make_binary(ExprKind kind, ExprPtr a, ExprPtr b, size_t pos) {
  auto e = std::make_shared<Expr>();
  e->kind = kind;
  e->args = {std::move(a), std::move(b)};
  e->pos = pos;
  update_depth(*e);
  return e;
}

ExprPtr make_call(std::string name, std::vector<ExprPtr> args, size_t pos) {
  auto e = std::make_shared<Expr>();
  e->kind = ExprKind::kCall;
  e->name = std::move(name);
  e->args = std::move(args);
  e->pos = pos;
  update_depth(*e);
  return e;
}

void update_depth(Expr& e) {
  size_t deepest = 0;
  for (const ExprPtr& a : e.args) deepest = std::max(deepest, a->depth);
  e.depth = deepest + 1;
}

ExprPtr make_sum(std::string variable, ExprPtr lo, ExprPtr hi, ExprPtr body, size_t pos) {
  auto e = std::make_shared<Expr>();
  e->kind = ExprKind::kSum;
  e->name = std::move(variable);
  e->args = {std::move(lo), std::move(hi), std::move(body)};
  e->pos = pos;
  update_depth(*e);
  return e;
}

ExprPtr make_bound(std::string variable, size_t pos) {
  auto e = std::make_shared<Expr>();
  e->kind = ExprKind::kBound;
  e->name = std::move(variable);
  e->pos = pos;
  return e;
}

bool same_tree(const Expr& a, const Expr& b) {
  if (a.kind != b.kind || a.args.size() != b.args.size()) return false;
  if (a.kind == ExprKind::kNumber && a.number != b.number) return false;
  if ((a.kind == ExprKind::kCall || a.kind == ExprKind::kVariable || a.kind == ExprKind::kSum ||
       a.kind == ExprKind::kBound) &&
      a.name != b.name)
    return false;
  for (size_t i = 0; i < a.args.size(); ++i) {
    if (!same_tree(*a.args[i], *b.args[i])) return false;
  }
  return true;
}

namespace {

const std::map<std::string, int>& builtins() {
  static const std::map<std::string, int> table = {
      {"floor", 1}, {"ceil", 1}, {"lg", 1},   {"ln", 1},  {"log2", 1}, {"sqrt", 1},
      {"log", 2},   {"min", -1}, {"max", -1}, {"mod", 2}, {"sum", 4},  // sum(k, lo, hi, body):
                                                                       // parsed as a kSum node,
                                                                       // never a call
  };
  return table;
}

// Binding strength, loosest first; the parser uses the same ladder.
enum Level {
  kOrLevel = 1,
  kAndLevel,
  kNotLevel,
  kCompareLevel,
  kSumLevel,
  kProductLevel,
  kUnaryLevel,
  kPowerLevel,
  kAtomLevel
};

int level_of(const Expr& e) {
  switch (e.kind) {
    case ExprKind::kOr:
      return kOrLevel;
    case ExprKind::kAnd:
      return kAndLevel;
    case ExprKind::kNot:
      return kNotLevel;
    case ExprKind::kEq:
    case ExprKind::kNe:
    case ExprKind::kLt:
    case ExprKind::kLe:
    case ExprKind::kGt:
    case ExprKind::kGe:
    case ExprKind::kEven:
    case ExprKind::kOdd:
      return kCompareLevel;
    case ExprKind::kAdd:
    case ExprKind::kSub:
      return kSumLevel;
    case ExprKind::kMul:
    case ExprKind::kDiv:
      return kProductLevel;
    case ExprKind::kCall:
      return e.name == "mod" ? kProductLevel : kAtomLevel;
    case ExprKind::kNeg:
      return kUnaryLevel;
    case ExprKind::kPow:
      return kPowerLevel;
    case ExprKind::kNumber:
      return e.number < 0 ? kUnaryLevel : (denominator(e.number) == 1 ? kAtomLevel : kAtomLevel);
    case ExprKind::kVariable:
    case ExprKind::kSum:
    case ExprKind::kBound:
      return kAtomLevel;
  }
  return kAtomLevel;
}

std::string number_text(const Rational& q) {
  BigInt num = numerator(q);
  BigInt den = denominator(q);
  if (den == 1) return num.str();
  // Terminating decimals print as decimals so they parse back to one literal.
  // GMP counts the factors 2 and 5 at once (dividing one factor at a time
  // is quadratic in the length of a long literal).
  BigInt d = den;
  mpz_ptr dz = d.backend().data();
  unsigned long twos = mpz_scan1(dz, 0);
  mpz_fdiv_q_2exp(dz, dz, twos);
  mpz_t five;
  mpz_init_set_ui(five, 5);
  unsigned long fives = mpz_remove(dz, dz, five);
  mpz_clear(five);
  if (d == 1) {
    unsigned long digits = std::max(twos, fives);
    BigInt scale;
    mpz_ui_pow_ui(scale.backend().data(), 10, digits);
    BigInt scaled = num * (scale / den);
    bool negative = scaled < 0;
    std::string s = (negative ? BigInt(-scaled) : scaled).str();
    if (s.size() <= digits) s = std::string(digits + 1 - s.size(), '0') + s;
    s.insert(s.size() - digits, ".");
    return (negative ? "-" : "") + s;
  }
  return "(" + num.str() + "/" + den.str() + ")";
}

std::string wrap(const Expr& e, int min_level) {
  std::string s = print(e);
  return level_of(e) < min_level ? "(" + s + ")" : s;
}

const char* compare_text(ExprKind k) {
  switch (k) {
    case ExprKind::kEq:
      return " == ";
    case ExprKind::kNe:
      return " != ";
    case ExprKind::kLt:
      return " < ";
    case ExprKind::kLe:
      return " <= ";
    case ExprKind::kGt:
      return " > ";
    default:
      return " >= ";
  }
}

}  // namespace

bool is_builtin(const std::string& name) { return builtins().count(name) != 0; }

int builtin_arity(const std::string& name) {
  auto it = builtins().find(name);
  return it == builtins().end() ? 0 : it->second;
}

std::string print(const Expr& e) {
  switch (e.kind) {
    case ExprKind::kNumber:
      return number_text(e.number);
    case ExprKind::kVariable:
      return "n";
    case ExprKind::kBound:
      return e.name;
    case ExprKind::kSum:
      return "sum(" + e.name + ", " + print(*e.args[0]) + ", " + print(*e.args[1]) + ", " +
             print(*e.args[2]) + ")";
    case ExprKind::kAdd:
      return wrap(*e.args[0], kSumLevel) + " + " + wrap(*e.args[1], kProductLevel);
    case ExprKind::kSub:
      return wrap(*e.args[0], kSumLevel) + " - " + wrap(*e.args[1], kProductLevel);
    case ExprKind::kMul: {
      const Expr& a = *e.args[0];
      const Expr& b = *e.args[1];
      // "2T(n/2)", "3n": a plain integer before a name reads naturally.
      bool juxtapose = a.kind == ExprKind::kNumber && a.number > 0 && denominator(a.number) == 1 &&
                       (b.kind == ExprKind::kVariable || b.kind == ExprKind::kBound ||
                        (b.kind == ExprKind::kCall && b.name != "mod"));
      if (juxtapose) return print(a) + print(b);
      return wrap(a, kProductLevel) + "*" + wrap(b, kUnaryLevel);
    }
    case ExprKind::kDiv:
      return wrap(*e.args[0], kProductLevel) + "/" + wrap(*e.args[1], kUnaryLevel);
    case ExprKind::kPow:
      return wrap(*e.args[0], kAtomLevel) + "^" + wrap(*e.args[1], kPowerLevel);
    case ExprKind::kNeg:
      return "-" + wrap(*e.args[0], kPowerLevel);
    case ExprKind::kCall: {
      if (e.name == "mod" && e.args.size() == 2) {
        return wrap(*e.args[0], kProductLevel) + " mod " + wrap(*e.args[1], kUnaryLevel);
      }
      std::string s = e.name + "(";
      for (size_t i = 0; i < e.args.size(); ++i) s += (i ? ", " : "") + print(*e.args[i]);
      return s + ")";
    }
    case ExprKind::kEq:
    case ExprKind::kNe:
    case ExprKind::kLt:
    case ExprKind::kLe:
    case ExprKind::kGt:
    case ExprKind::kGe:
      return wrap(*e.args[0], kSumLevel) + compare_text(e.kind) + wrap(*e.args[1], kSumLevel);
    case ExprKind::kEven:
      return wrap(*e.args[0], kSumLevel) + " even";
    case ExprKind::kOdd:
      return wrap(*e.args[0], kSumLevel) + " odd";
    case ExprKind::kNot:
      return "not " + wrap(*e.args[0], kNotLevel);
    case ExprKind::kAnd:
      return wrap(*e.args[0], kAndLevel) + " and " + wrap(*e.args[1], kNotLevel);
    case ExprKind::kOr:
      return wrap(*e.args[0], kOrLevel) + " or " + wrap(*e.args[1], kAndLevel);
  }
  return "?";
}

void collect_calls(const ExprPtr& e, const std::string& function, std::vector<const Expr*>& out,
                   bool into_sums) {
  if (!e) return;
  for (size_t i = 0; i < e->args.size(); ++i) {
    if (!into_sums && e->kind == ExprKind::kSum && i == 2) continue;
    collect_calls(e->args[i], function, out, into_sums);
  }
  if (e->kind == ExprKind::kCall && e->name == function) out.push_back(e.get());
}

bool mentions_n(const Expr& e) {
  if (e.kind == ExprKind::kVariable) return true;
  for (const auto& a : e.args) {
    if (mentions_n(*a)) return true;
  }
  return false;
}

bool contains_sum(const Expr& e) {
  if (e.kind == ExprKind::kSum) return true;
  for (const auto& a : e.args) {
    if (contains_sum(*a)) return true;
  }
  return false;
}

namespace {
bool free_bound(const Expr& e, std::vector<const std::string*>& bound) {
  if (e.kind == ExprKind::kBound) {
    for (const std::string* name : bound) {
      if (*name == e.name) return false;
    }
    return true;
  }
  if (e.kind == ExprKind::kSum) {
    if (free_bound(*e.args[0], bound) || free_bound(*e.args[1], bound)) return true;
    bound.push_back(&e.name);
    bool free = free_bound(*e.args[2], bound);
    bound.pop_back();
    return free;
  }
  for (const auto& a : e.args) {
    if (free_bound(*a, bound)) return true;
  }
  return false;
}
}  // namespace

const Expr* find_sum_shadowing(const Expr& e,
                               const std::function<bool(const std::string&)>& is_function) {
  if (e.kind == ExprKind::kSum && is_function(e.name)) return &e;
  for (const ExprPtr& a : e.args) {
    if (const Expr* found = find_sum_shadowing(*a, is_function)) return found;
  }
  return nullptr;
}

std::string sum_text_with_fresh_variable(std::string_view text, size_t pos,
                                         const std::string& name) {
  // The sum's text: from "sum" to its closing parenthesis.
  size_t end = text.size();
  int depth = 0;
  for (size_t i = text.find('(', pos); i < text.size(); ++i) {
    if (text[i] == '(') ++depth;
    if (text[i] == ')' && --depth == 0) {
      end = i + 1;
      break;
    }
  }
  std::string_view span = text.substr(pos, end - pos);
  auto word_char = [](char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; };
  struct Word {
    size_t begin, end;
  };
  std::vector<Word> words;
  std::set<std::string_view> taken;
  for (size_t i = 0; i < span.size();) {
    if (!word_char(span[i])) {
      ++i;
      continue;
    }
    size_t j = i;
    while (j < span.size() && word_char(span[j])) ++j;
    words.push_back({i, j});
    taken.insert(span.substr(i, j - i));
    i = j;
  }
  std::string fresh;
  for (const char* candidate : {"k", "i", "j", "m", "p", "q", "r"}) {
    if (taken.count(candidate) == 0) {
      fresh = candidate;
      break;
    }
  }
  if (fresh.empty()) return std::string(span);
  // Every use of the name but a call ("T(" stays T) becomes the fresh name.
  std::string out;
  size_t copied = 0;
  for (const Word& w : words) {
    if (span.substr(w.begin, w.end - w.begin) != name) continue;
    size_t next = span.find_first_not_of(" \t", w.end);
    if (next != std::string_view::npos && span[next] == '(') continue;
    out += span.substr(copied, w.begin - copied);
    out += fresh;
    copied = w.end;
  }
  out += span.substr(copied);
  return out;
}

bool has_free_bound(const Expr& e) {
  std::vector<const std::string*> bound;
  return free_bound(e, bound);
}

bool sum_body_closed(const Expr& sum) {
  if (sum.kind != ExprKind::kSum || mentions_n(*sum.args[2])) return false;
  std::vector<const std::string*> bound = {&sum.name};
  return !free_bound(*sum.args[2], bound);
}

}  // namespace thetagate::engine
