// Certified asymptotic expansions for the inductive step of a proof by
// induction (docs/design.md, "Proofs"). An expression in n becomes a finite
// sum of terms c · rho^n · n^alpha · lg^beta n that encloses its value for
// every real n >= `from`: Taylor expansions keep a few terms and add their
// remainder as a term with an interval coefficient [-e, e]. Floors and
// ceilings of affine arguments are exact on one residue class of n, so the
// expansion is made per residue. Coefficients stay exact rationals while
// every step is exact (so n^(lg 3) against 3 (n/2)^(lg 3) cancels exactly);
// otherwise they are MPFI intervals.
#ifndef THETAGATE_VERIFIER_DERIVATION_SERIES_H_
#define THETAGATE_VERIFIER_DERIVATION_SERIES_H_

#include <cstdint>
#include <functional>
#include <map>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "verifier/derivation/classify.h"
#include "verifier/numbers/interval.h"
#include "verifier/numbers/number.h"
#include "verifier/numbers/real_number.h"
#include "verifier/syntax/expr.h"

namespace thetagate::engine {

// rho^n · n^alpha · lg^beta n.
struct SeriesKey {
  Rational rho = 1;
  RealNumber alpha;
  int beta = 0;
};
// Which key grows faster: -1, 0, +1 (exact).
int compare_keys(const SeriesKey& a, const SeriesKey& b);

// A coefficient: an exact rational while every step was exact; otherwise a
// sum of rational multiples of products of named irrational constants
// (binom(lg 3, 2), lg 5, 1/ln 2, ...), each with a certified enclosure, so
// equal constants on both sides of the step cancel exactly. An unnamed
// constant (an enclosure with no exact description) never cancels.
struct Coef {
  bool exact = true;
  Rational q;  // the value, when exact
  // When !exact: monomial ("" for the rational part, else atom names joined
  // by '*', sorted) -> its rational multiplier and the monomial's enclosure.
  std::map<std::string, std::pair<Rational, Interval>> monomials;

  static Coef of(const Rational& q);
  static Coef of(const Interval& iv);  // unnamed (a point interval is exact)
  static Coef atom(const std::string& name, const Interval& value);
  Interval enclose(long precision) const;
  bool is_zero() const { return exact && q == 0; }
};

// A term c · key(n), or, for a Taylor remainder, c · R(n) where R is one
// unknown function (named by `tag`) with |R(n)| <= bound · key(n): the same
// remainder on both sides of the step cancels exactly.
struct SeriesTerm {
  SeriesKey key;
  Coef coef;
  std::string tag = {};                // "" for an ordinary term
  std::optional<Interval> bound = {};  // set with tag

  // The term's coefficient as an enclosure of term(n) / key(n).
  Interval effective(long precision) const;
};

// A sum of terms, like keys merged; valid for every real n >= the
// context's `from`.
struct Series {
  std::vector<SeriesTerm> terms;
};

// Where an expansion is valid and how much of it is kept.
struct SeriesContext {
  BigInt from = 64;      // every real n >= from
  uint64_t modulus = 1;  // n = modulus·m + residue
  uint64_t residue = 0;
  long precision = 256;  // bits of the interval coefficients
  int order = 4;         // Taylor terms kept before the remainder
  const HelperTable* helpers = nullptr;
};

// Thrown when an expression leaves the class the expansion handles (the
// message says what); the caller reports the proof attempt as failed.
struct SeriesUnsupported {
  std::string why;
};
// Thrown when a floor or ceiling of s·n + t needs n split by residue modulo
// a multiple of `factor` (s·modulus is not an integer).
struct NeedModulus {
  uint64_t factor;
};

// Whether `condition` (about the variable, whose value is `value`) holds
// for every n >= ctx.from in the residue class, or for none of them;
// nullopt when it depends on more. Throws NeedModulus.
std::optional<bool> decide_condition(const Expr& condition, const Series& value,
                                     const SeriesContext& ctx);

// Proves build(ctx) >= 0 for every real n >= ctx.from: by the leading term
// beyond some 2^k, by interval blocks [x, 2x] below it. Each expansion and
// each block costs one unit of `work`; throws SeriesUnsupported (with the
// reason) when it cannot, or when work passes `budget`.
struct NonnegativeProof {
  bool identity = true;    // the series vanished identically
  uint64_t tail_log2 = 0;  // the leading term dominates from 2^tail_log2
  uint64_t blocks = 0;     // interval blocks below that
};
NonnegativeProof prove_nonnegative(const std::function<Series(const SeriesContext&)>& build,
                                   SeriesContext ctx, uint64_t& work, uint64_t budget);

// The expansion of e with the variable n replaced by `n_value` (a series in
// the true n). Throws SeriesUnsupported or NeedModulus.
Series expand(const Expr& e, const Series& n_value, const SeriesContext& ctx);
// The series of n itself.
Series variable_series();
Series add(const Series& a, const Series& b, long precision);
Series negate(const Series& a);
Series scale(const Series& a, const Coef& c, long precision);

// When the series is exactly s·n + t (exact coefficients), s and t.
std::optional<std::pair<Rational, Rational>> as_affine(const Series& s);

// Whether the series is >= 0 for every real n >= ctx.from, by its leading
// term alone: the leading coefficient is certainly positive and every other
// term, bounded at `from` by its ratio to the leading key (each ratio
// decreasing from there on), adds up to less than it.
bool dominates_from(const Series& s, const SeriesContext& ctx);
// An enclosure of the series on the real interval [lo, hi] (lo >= ctx.from).
Interval enclose_on(const Series& s, const BigInt& lo, const BigInt& hi, long precision);
// The series is identically zero (every coefficient exactly 0).
bool is_identically_zero(const Series& s);
// The leading term's coefficient is neither certainly positive nor certainly
// negative (an inexact cancellation, or only remainders left): the series
// does not settle its sign for large n.
bool leading_sign_unknown(const Series& s, long precision);
// The leading term's coefficient is certainly negative (the series is
// eventually negative): no amount of splitting proves it non-negative.
bool eventually_negative(const Series& s, long precision);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_SERIES_H_
