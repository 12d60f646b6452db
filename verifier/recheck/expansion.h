// The re-checker's own certified expansions (docs/design.md, "The
// re-checker"). A function of the size n on one residue class is enclosed,
// for every real n >= `from`, by a finite sum of terms c · rho^n · n^alpha ·
// lg^beta n whose coefficients c are exact rationals or certified intervals.
// Every key is positive for n >= 2, so sums and products of enclosures are
// enclosures. Affine arguments s·n + t inside lg and real powers are expanded
// to second order with an explicit remainder interval.
//
// This file shares nothing with the prover's series (verifier/derivation):
// it is the independent second opinion, deliberately small and simple.
#ifndef THETAGATE_VERIFIER_RECHECK_EXPANSION_H_
#define THETAGATE_VERIFIER_RECHECK_EXPANSION_H_

#include <map>
#include <optional>
#include <stdexcept>
#include <string>
#include <utility>
#include <vector>

#include "verifier/model/recurrence.h"
#include "verifier/numbers/interval.h"
#include "verifier/numbers/number.h"
#include "verifier/numbers/real_number.h"
#include "verifier/syntax/expr.h"

namespace thetagate::engine::recheck {

// Something this checker cannot follow (a function it does not expand, a
// floor that is not exact on the residue class). The claim is then "not
// re-checked", never accepted.
struct Unsupported : std::runtime_error {
  using std::runtime_error::runtime_error;
};

inline constexpr long kPrecision = 256;

// rho^n · n^alpha · lg^beta n.
struct Key {
  Rational rho = 1;
  RealNumber alpha;
  int beta = 0;
};
int compare_keys(const Key& a, const Key& b);  // -1, 0, +1 by growth

// An exact rational, or a certified interval.
struct Coef {
  std::optional<Rational> exact;
  std::optional<Interval> range;  // set when !exact
  static Coef of(const Rational& q) { return Coef{q, std::nullopt}; }
  static Coef of(const Interval& iv) { return Coef{std::nullopt, iv}; }
  Interval enclose() const;
  bool is_zero() const { return exact && *exact == 0; }
};

struct Term {
  Key key;
  Coef coef;
};

// A sum of terms with distinct keys, valid for every real n >= from on the
// residue class n = residue (mod modulus).
struct Expansion {
  std::vector<Term> terms;
};

struct Context {
  BigInt from = 2;
  uint64_t modulus = 1;
  uint64_t residue = 0;
  const std::map<std::string, Function>* helpers = nullptr;
};

Expansion constant(const Coef& c);
Expansion add(const Expansion& a, const Expansion& b);
Expansion scale(const Expansion& a, const Coef& c);
Expansion negate(const Expansion& a);
Expansion multiply(const Expansion& a, const Expansion& b);

// s^k for a rational s > 0: an exact rational whenever s^k is rational
// ((1/2)^(lg 3) = 1/3, verified by exact logarithms), else an enclosure.
Coef rational_power(const Rational& s, const RealNumber& k);

// s·n + t when the expansion is exactly that (exact coefficients).
std::optional<std::pair<Rational, Rational>> as_affine(const Expansion& e);

// The value of a constant expression (no n): exact where the kinds allow.
RealNumber constant_value(const Expr& e);

// The enclosure of `e` with the size n read as s·n + t (the real variable n
// on ctx's residue class). Throws Unsupported.
Expansion expand(const Expr& e, const Context& ctx, const Rational& s = 1, const Rational& t = 0);

// Whether a condition holds for every n >= ctx.from on ctx's residue class,
// the size read as s·n + t; throws Unsupported when it is not constant there.
bool decide(const Expr& condition, const Context& ctx, const Rational& s = 1,
            const Rational& t = 0);

// The line of `f` that applies at every n >= ctx.from on ctx's class, its
// argument s·n + t. Throws Unsupported (a point case or a condition beyond
// this checker).
const CaseLine& line_on_class(const Function& f, const Context& ctx, const Rational& s = 1,
                              const Rational& t = 0);

// Proves e(n) >= 0 for every real n >= from: a positive leading term that
// outweighs the rest beyond 2^K (every ratio to it decreasing there), and
// interval arithmetic on blocks between `from` and 2^K. The answer is kFalse
// only with certainty: a leading coefficient certainly negative, or an
// integer n >= from on the class (modulus, residue) where e(n) < 0 for sure;
// an enclosure too wide to decide is kUnproved, never kFalse.
enum class Proof { kProved, kFalse, kUnproved };
struct ProofOutcome {
  Proof proof = Proof::kProved;
  std::string why;  // for kFalse and kUnproved, with the n where it failed
};
ProofOutcome prove_nonnegative(const Expansion& e, const BigInt& from, uint64_t modulus = 1,
                               uint64_t residue = 0);

// "3 n^2 lg n - (1/2) n + [-0.1, 0.2]" for messages.
std::string describe(const Expansion& e);

}  // namespace thetagate::engine::recheck

#endif  // THETAGATE_VERIFIER_RECHECK_EXPANSION_H_
