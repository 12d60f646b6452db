// Expressions as exact rational functions of n whose numerators are
// polynomials in named sums (docs/design.md, "Proofs with sums"): the
// algebra under the proofs of sum_induction.h. A sum sum(j, lo, n + e, h(j))
// with a closed body becomes a symbol S(n) = sum(j, lo, n, h(j)) plus or
// minus the terms h(n + t) between n and n + e, so B(n) and B(n - 1) share
// their symbols; an identity whose numerator vanishes coefficient by
// coefficient holds for every value of the symbols, so for the sums' true
// values too, wherever no denominator met on the way is zero.
#ifndef THETAGATE_VERIFIER_DERIVATION_RATIONAL_FORM_H_
#define THETAGATE_VERIFIER_DERIVATION_RATIONAL_FORM_H_

#include <map>
#include <optional>
#include <string>
#include <vector>

#include "verifier/numbers/number.h"
#include "verifier/numbers/polynomial.h"
#include "verifier/syntax/expr.h"

namespace thetagate::engine {

// Exponents of the symbols, by index; no trailing zeros (the constant
// monomial is empty).
using Monomial = std::vector<int>;

// sum over monomials m of num[m](n) · m(S) / den(n); no zero entries in num.
struct RationalForm {
  std::map<Monomial, Polynomial> num;
  Polynomial den = Polynomial({Rational(1)});

  static RationalForm constant(const Rational& c);
  static RationalForm polynomial(const Polynomial& p);
  static RationalForm symbol(size_t index);
  bool is_zero() const { return num.empty(); }
  // No symbol occurs (num has at most the constant monomial).
  bool symbol_free() const;
  // The numerator's symbol-free part (zero when absent).
  Polynomial free_numerator() const;
};

RationalForm operator+(const RationalForm& a, const RationalForm& b);
// Cancels the common factor of the denominator and every numerator.
void reduce(RationalForm& f);
RationalForm operator-(const RationalForm& a);
RationalForm operator-(const RationalForm& a, const RationalForm& b);
RationalForm operator*(const RationalForm& a, const RationalForm& b);

// Thrown when an expression is no rational function of n and of closed
// sums (a floor, lg n, a non-integer power, ...); the message says which.
struct NotRational {
  std::string why;
};

// Builds forms from expressions and keeps what they rest on: the symbols,
// the polynomials that must not vanish (every divisor met), and from which
// n on the sums' symbol relations hold.
class FormBuilder {
 public:
  // `function`: the recurrence's name; a sum over its values,
  // sum(k, lo, n + e, T(k)), becomes its own symbol per (lo, e) when
  // `allow_function_sums`, else NotRational.
  FormBuilder(std::string function, bool allow_function_sums)
      : function_(std::move(function)), allow_function_sums_(allow_function_sums) {}

  // e with n replaced by n - shift. Throws NotRational.
  RationalForm build(const Expr& e, int shift);
  // Divides by a symbol-free form; its numerator joins `nonzero`. Throws
  // NotRational for a symbol or an identically zero divisor.
  RationalForm divide(const RationalForm& a, const RationalForm& b);

  // The symbols of the sums sum(k, lo, n + e, T(k)) built, by (lo, e).
  const std::map<std::pair<BigInt, BigInt>, size_t>& function_sums() const {
    return function_sums_;
  }
  // Printed symbols, by index: "sum(j, 1, n, 1/j)", "sum(k, 0, n - 1, T(k))".
  const std::vector<std::string>& symbols() const { return names_; }
  // Polynomials in n that must not vanish for the forms to be the values.
  const std::vector<Polynomial>& nonzero() const { return nonzero_; }
  // The symbol relations hold for every n >= valid_from.
  const BigInt& valid_from() const { return valid_from_; }

 private:
  RationalForm walk(const Expr& e, const RationalForm& n,
                    const std::map<std::string, RationalForm>& bound);
  RationalForm sum(const Expr& e, const RationalForm& n,
                   const std::map<std::string, RationalForm>& bound);
  size_t symbol(const std::string& key, const std::string& name);

  std::string function_;
  bool allow_function_sums_;
  std::map<std::string, size_t> index_;
  std::vector<std::string> names_;
  std::map<std::pair<BigInt, BigInt>, size_t> function_sums_;
  std::vector<Polynomial> nonzero_;
  BigInt valid_from_ = 0;
};

// A whole M >= from such that no polynomial of `nonzero` vanishes at any
// real n >= M (Cauchy's root bound, then Sturm's count); nullopt when that M
// exceeds `cap`.
std::optional<BigInt> nonzero_from(const std::vector<Polynomial>& nonzero, const BigInt& from,
                                   const BigInt& cap);

// The polynomial Q with Q(x) - Q(x - 1) = p(x) and Q(-1) = 0, so that
// sum(k, a, b, p(k)) = Q(b) - Q(a - 1) for all whole a <= b + 1.
Polynomial summation_polynomial(const Polynomial& p);

// Horner's form of p at x as an expression.
ExprPtr polynomial_expr(const Polynomial& p, const ExprPtr& x);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_RATIONAL_FORM_H_
