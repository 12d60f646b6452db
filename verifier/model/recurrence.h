// The recurrence model: the meaning of the definition lines. Which function
// recurses, its base cases and case lines, helper functions, and the facts a
// report must state (default base case, quotients read as floors).
#ifndef THETAGATE_VERIFIER_MODEL_RECURRENCE_H_
#define THETAGATE_VERIFIER_MODEL_RECURRENCE_H_

#include <cstdint>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "verifier/syntax/expr.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {

struct CaseLine {
  std::optional<BigInt> point;  // a point case T(1) = 0
  ExprPtr condition;            // null: no condition
  ExprPtr body;
  std::vector<const Expr*> calls;  // recursive calls in body outside sums, left to right
  bool sums_calls = false;         // a sum in body calls the recursive function
  size_t pos = 0;                  // where the line's function name stands
};

struct Function {
  std::string name;
  std::vector<CaseLine> points;       // tried first
  std::map<BigInt, size_t> point_at;  // point -> its index in `points`
  std::vector<CaseLine> conditional;  // then these, in the order written
  std::optional<CaseLine> fallback;   // then the line without a condition
  size_t pos = 0;
  // Helpers only (build_recurrence fills them in): the levels of the
  // deepest line with every helper call inlined (a call counts its
  // argument's levels plus the callee's), at most kMaxTreeDepth; and the
  // nodes of all lines so inlined (saturating at kInlinedSizeCap), which
  // the derivation refuses to expand past kMaxInlinedHelperSize.
  size_t inlined_depth = 0;
  uint64_t inlined_size = 0;

  // The case line that applies at n is found by the evaluator (conditions
  // may need exact arithmetic); these are the lines in the order tried.
  std::vector<const CaseLine*> lines_in_order() const;
};

// Saturation point of Function::inlined_size (fan-out doubles it per level).
inline constexpr uint64_t kInlinedSizeCap = uint64_t{1} << 40;
// The largest inlined helper the derivation expands (classify, series):
// 40 levels of f(n) = g(n) + g(n) would otherwise be 2^40 expansions.
inline constexpr uint64_t kMaxInlinedHelperSize = 100'000;

// A growth class written as a term of one of T's lines, T(n) = 2T(n/2) + Θ(n)
// or T(1) = Θ(1): "some function of that class". The line keeps the class's
// own function g (the representative) in its place, so exact values are those
// of that one member and every report says so; the derivation reads the kind
// (an O term bounds f from above only, an Ω term from below only). A proof
// by induction would cover only the representative, so none is attempted.
enum class ClassTermKind { kTheta, kBigO, kOmega };
struct ClassTerm {
  ClassTermKind kind = ClassTermKind::kTheta;
  ExprPtr representative;  // g, as written inside the class
  bool base_case = false;  // on a line without recursive calls
  size_t pos = 0;          // where the class name stands
};
const char* class_term_name(ClassTermKind kind);  // "Θ", "O", "Ω"

struct Recurrence {
  SourceText source;
  Function main;                            // the recursive function (first defined)
  std::map<std::string, Function> helpers;  // f(n) = ... ; never recursive
  // No base case was written: T(n) = 1 wherever the recursive line would
  // not shrink its argument (docs/design.md §3). Reports state this.
  bool default_base = false;
  // A line sums over earlier values (sum(k, 0, n - 1, T(k))): the evaluator
  // goes bottom-up over every size and keeps them all.
  bool full_history = false;
  // Facts for the report, e.g. "inside T(...), n/2 is read as ⌊n/2⌋".
  std::vector<std::string> notes;
  // Classes written as terms of T's lines, in the order written.
  std::vector<ClassTerm> class_terms;

  // The text as the user wrote it (one line per definition).
  std::string text() const { return source.text; }
};

// Parses and checks a recurrence. Throws InputError naming the offending
// line and column: unknown functions, helpers that recurse or call the main
// function, T inside T's argument, two default lines, duplicate points,
// helper calls nested deeper than kMaxTreeDepth levels (counting each
// helper's own expression), a sum variable named like a function.
std::shared_ptr<const Recurrence> build_recurrence(const SourceText& source);

// True when some call of the recursive function has a quotient that is not
// rounded explicitly (T(n/2), not T(floor(n/2))): the reading matters.
bool has_unrounded_calls(const Recurrence& r);

// The same recurrence with every such quotient read as its ceiling:
// T(n/2) becomes T(ceil(n/2)). Explicit floors and ceilings stay.
std::shared_ptr<const Recurrence> read_quotients_as_ceilings(const Recurrence& r);

// A recurrence written on the command line: ';' separates lines.
std::shared_ptr<const Recurrence> recurrence_from_text(const std::string& text,
                                                       const std::string& origin = "<recurrence>");

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_MODEL_RECURRENCE_H_
