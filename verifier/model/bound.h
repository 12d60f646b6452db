// Bound text: "Theta(n lg n)", "O(n^2)", "Omega(n)", or an explicit
// inequality checked exactly: "T(n) <= 2n lg n for n >= 2",
// "n - 1 <= T(n) <= n^2 for n >= 1", "T(n) = n ceil(lg n) - 2^ceil(lg n) + 1".
#ifndef THETAGATE_VERIFIER_MODEL_BOUND_H_
#define THETAGATE_VERIFIER_MODEL_BOUND_H_

#include <string>
#include <vector>

#include "verifier/syntax/expr.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {

enum class BoundKind { kTheta, kBigO, kOmega, kExplicit };

// A side of a bound: upper (T(n) <= ...) or lower (... <= T(n)); the side a
// witness breaks, a proof proves, a ratio edge belongs to.
enum class Side { kUpper, kLower };
const char* side_name(Side s);  // "upper", "lower"
// Whether T stays on its side of a bound, given order = sign(T(n) - B(n)):
// T <= B (T < B when strict) for kUpper, T >= B (T > B) for kLower.
inline bool on_side(Side side, bool strict, int order) {
  return side == Side::kUpper ? (strict ? order < 0 : order <= 0)
                              : (strict ? order > 0 : order >= 0);
}

struct Bound {
  BoundKind kind = BoundKind::kTheta;
  SourceText source;
  ExprPtr growth;  // g for Theta/O/Omega

  // Explicit: lower <= T(n) <= upper for n >= n0 (either side may be null).
  ExprPtr lower;
  ExprPtr upper;
  bool strict_lower = false;  // lower < T(n)
  bool strict_upper = false;  // T(n) < upper
  BigInt n0 = 1;

  // Readings the reader should know of ("log n without a base read as lg n").
  std::vector<std::string> notes;

  bool is_asymptotic() const { return kind != BoundKind::kExplicit; }
  // "Θ(n lg n)"-style text as written by the user (trimmed).
  std::string text() const;
};

// Parses bound text. `function` is the recurrence's name (usually "T"); an
// explicit bound must mention function(n) exactly once per side.
Bound parse_bound(const SourceText& source, const std::string& function = "T");

struct Recurrence;

// Throws InputError when the bound cannot be checked against the recurrence:
// an explicit bound (exact values) against a recurrence with a growth class
// as a term (T(n) = 2T(n/2) + Θ(n): the values of T are not determined).
void check_bound_fits(const Recurrence& recurrence, const Bound& bound);

// The kind as a mathematical symbol: "Θ", "O", "Ω" ("explicit" for kExplicit).
const char* bound_kind_symbol(BoundKind kind);

// The kind's name as reports print it: "Theta", "O", "Omega", "explicit".
const char* bound_kind_name(BoundKind kind);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_MODEL_BOUND_H_
