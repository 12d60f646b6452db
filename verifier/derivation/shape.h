// The shape the theorems need, read off a recurrence model: scaled terms
// a*T(b n + h(n)), subtractive terms a*T(n - c), root terms a*T(n^(1/k)), the
// driving function f (the body without its T terms) and the base cases; or
// a precise reason why the recurrence has no such shape.
#ifndef THETAGATE_VERIFIER_DERIVATION_SHAPE_H_
#define THETAGATE_VERIFIER_DERIVATION_SHAPE_H_

#include <optional>
#include <string>
#include <vector>

#include "verifier/derivation/growth.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/expr.h"

namespace thetagate::engine {

// How the argument b n + h(n) departs from b n.
enum class Perturbation {
  kNone,     // exactly b n (+ 0)
  kBounded,  // floors, ceilings, "n/2" read as a floor, "+6": |h| = O(1)
  kGrowing,  // h grows with n, e.g. n/2 + sqrt(n); see perturbation_growth
};

struct ScaledTerm {
  Rational a;  // the coefficient (may be <= 0: the theorems refuse that)
  Rational b;  // in (0, 1)
  Perturbation perturbation = Perturbation::kNone;
  std::optional<GrowthClass> perturbation_growth;  // for kGrowing
  std::string argument;                            // the argument as written: "ceil(n/2)"
};

struct SubtractiveTerm {
  Rational a;
  BigInt c;  // >= 1: a * T(n - c)
};

struct RootTerm {
  Rational a;
  unsigned long k = 2;  // a * T(n^(1/k)), possibly rounded
  bool rounded = false;
  std::string argument;
};

// One alternative of a driving function given by parity or residue lines.
struct DrivingCase {
  std::string condition;  // "n even", "otherwise"
  ExprPtr f;              // null means 0
  ExprPtr test;           // the condition itself; null for "otherwise"
};

struct Shape {
  bool ok = false;
  std::string reason;  // when !ok: why no theorem's shape fits

  std::vector<ScaledTerm> scaled;
  std::vector<SubtractiveTerm> subtractive;
  std::vector<RootTerm> roots;
  ExprPtr driving;                          // f(n); null means f = 0 or see driving_cases
  std::vector<DrivingCase> driving_cases;   // set when case lines differ only in f
  std::vector<const CaseLine*> base_cases;  // point lines and lines for bounded n
  std::string recursive_text;               // the recursive line's body, printed

  bool has_driving_cases() const { return !driving_cases.empty(); }
};

// REQUIRES: a model from build_recurrence. Never throws for a valid model.
Shape extract_shape(const Recurrence& recurrence);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_SHAPE_H_
