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

// floor(n^(1/k))^exponent or ceil(n^(1/k))^exponent: a rounded root in a
// root term's coefficient.
struct RoundedRoot {
  bool ceiling = false;
  unsigned long k = 2;
  Rational exponent;
};

// How a root term's coefficient depends on n: n^n_exponent times the
// rounded roots (exact roots such as sqrt(n) are folded into n_exponent).
// Empty for a constant coefficient.
struct RootCoefficient {
  Rational n_exponent;
  std::vector<RoundedRoot> rounded;
  std::string text;  // the factor as written: "floor(sqrt(n))", "" when constant

  bool varies() const { return n_exponent != 0 || !rounded.empty(); }
  bool same_as(const RootCoefficient& other) const;
};

struct RootTerm {
  Rational a;           // the constant factor of the coefficient
  unsigned long k = 2;  // a(n) * T(n^(1/k)), possibly rounded
  bool rounded = false;
  bool ceiling = false;  // rounded up (ceil), else down
  std::string argument;
  RootCoefficient coefficient;  // a(n) = a * (this); constant when !coefficient.varies()
};

// A sum over earlier values, scale * n^n_power * sum(k, lo, hi, body), with
// body calling T (quicksort's average: (2/n) sum(k, 0, n - 1, T(k))).
struct HistorySum {
  Rational scale;
  int n_power = 0;
  ExprPtr sum;  // the kSum node
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
  std::vector<HistorySum> sums;
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
