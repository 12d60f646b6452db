// The syntax tree of the expression language: driving functions, call
// arguments, conditions and bounds all share it.
#ifndef THETAGATE_VERIFIER_SYNTAX_EXPR_H_
#define THETAGATE_VERIFIER_SYNTAX_EXPR_H_

#include <cstddef>
#include <functional>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "thetagate/errors.h"
#include "verifier/numbers/number.h"

namespace thetagate::engine {

enum class ExprKind {
  kNumber,    // an exact literal (integer or terminating decimal)
  kVariable,  // the size n
  kAdd,
  kSub,
  kMul,
  kDiv,
  kPow,
  kNeg,
  kCall,   // builtin (floor, lg, ...), helper function, or the recurrence
  kSum,    // sum(k, lo, hi, body): name is the bound variable, args = {lo, hi, body}
  kBound,  // a variable bound by an enclosing sum; name is its spelling
  // Conditions.
  kEq,
  kNe,
  kLt,
  kLe,
  kGt,
  kGe,
  kAnd,
  kOr,
  kNot,
  kEven,
  kOdd,  // "x even", "x odd"
};

struct Expr;
using ExprPtr = std::shared_ptr<const Expr>;

struct Expr {
  ExprKind kind = ExprKind::kNumber;
  Rational number;         // kNumber
  bool has_small = false;  // kNumber: the value fits in int64 (fast path)
  int64_t small = 0;
  std::string name;           // kVariable: "n"; kCall: the function name; kSum, kBound: k
  std::vector<ExprPtr> args;  // operands, or call arguments
  size_t pos = 0;             // byte offset in its SourceText
  // Levels of the tree below and including this node (a leaf is 1). The
  // builders keep it; every walker may recurse to this depth, so the parser
  // refuses trees deeper than kMaxTreeDepth whatever their shape.
  size_t depth = 1;

  bool is_condition() const { return kind >= ExprKind::kEq; }
};

// Whether a comparison (kEq, kNe, kLt, kLe, kGt, kGe) holds when its left side
// compares to its right as `order` (< 0, 0, > 0). Any other kind is a bug:
// throws InternalError.
inline bool comparison_holds(ExprKind kind, int order) {
  switch (kind) {
    case ExprKind::kEq:
      return order == 0;
    case ExprKind::kNe:
      return order != 0;
    case ExprKind::kLt:
      return order < 0;
    case ExprKind::kLe:
      return order <= 0;
    case ExprKind::kGt:
      return order > 0;
    case ExprKind::kGe:
      return order >= 0;
    default:
      throw InternalError("", "comparison_holds of a kind that is no comparison");
  }
}

// The deepest tree any input may build: a flat chain "n + n + ... + n" of
// k terms is k levels deep, like k nested parentheses. Tree walks recurse,
// so this bounds their stack use (a few hundred KiB even under
// AddressSanitizer).
inline constexpr size_t kMaxTreeDepth = 1000;

// Builders (pos defaults to 0 for synthesized trees).
ExprPtr make_number(Rational value, size_t pos = 0);
ExprPtr make_variable(size_t pos = 0);
ExprPtr make_unary(ExprKind kind, ExprPtr a, size_t pos = 0);
ExprPtr make_binary(ExprKind kind, ExprPtr a, ExprPtr b, size_t pos = 0);
ExprPtr make_call(std::string name, std::vector<ExprPtr> args, size_t pos = 0);
// sum(k, lo, hi, body): body may use make_bound(k).
ExprPtr make_sum(std::string variable, ExprPtr lo, ExprPtr hi, ExprPtr body, size_t pos = 0);
ExprPtr make_bound(std::string variable, size_t pos = 0);

// 1 + the deepest of `e`'s operands: call after replacing operands of a copy.
void update_depth(Expr& e);

// Structural equality, ignoring positions.
bool same_tree(const Expr& a, const Expr& b);

// Canonical text that parses back to the same tree: "2T(n/2) + n*lg(n)".
std::string print(const Expr& e);

// Builtin functions and their arities (-1: two or more).
bool is_builtin(const std::string& name);
int builtin_arity(const std::string& name);

// Calls to `function` anywhere in `e`, in evaluation (left-to-right) order;
// with into_sums false, not those inside a sum's body.
void collect_calls(const ExprPtr& e, const std::string& function, std::vector<const Expr*>& out,
                   bool into_sums = true);
// True if `e` mentions the variable n.
bool mentions_n(const Expr& e);
// True if `e` contains a sum.
bool contains_sum(const Expr& e);
// True if `e` uses a bound variable that no sum inside `e` binds (a body
// that depends on an outer sum's variable).
bool has_free_bound(const Expr& e);
// The first sum node in `e` (outermost, left to right) whose variable is
// named like a function for which is_function holds, or null: such a
// variable would shadow the function inside the sum's body.
const Expr* find_sum_shadowing(const Expr& e,
                               const std::function<bool(const std::string&)>& is_function);
// The text of the sum that starts at byte `pos` of `text`, with every use of
// its variable `name` that is not a call renamed to the first of k, i, j, m,
// ... the sum does not use: a fix a message can show in the user's own
// terms ("sum(k, 1, n, T(k))" for "sum(T, 1, n, T(T))").
std::string sum_text_with_fresh_variable(std::string_view text, size_t pos,
                                         const std::string& name);
// True if the body of the sum node `sum` depends on its own variable only
// (not on n, not on an outer sum's variable): its partial sums can be kept.
bool sum_body_closed(const Expr& sum);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_SYNTAX_EXPR_H_
