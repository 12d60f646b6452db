// Polynomials with exact rational coefficients: the characteristic
// polynomials of linear recurrences and the defining polynomials of the
// algebraic numbers in growth classes (the golden ratio, 2^(1/3), ...).
#ifndef THETAGATE_VERIFIER_NUMBERS_POLYNOMIAL_H_
#define THETAGATE_VERIFIER_NUMBERS_POLYNOMIAL_H_

#include <string>
#include <vector>

#include "verifier/numbers/interval.h"
#include "verifier/numbers/number.h"

namespace thetagate::engine {

class Polynomial {
 public:
  Polynomial() = default;
  // coefficients[i] multiplies x^i; trailing zeros are trimmed.
  explicit Polynomial(std::vector<Rational> coefficients);
  static Polynomial monomial(const Rational& c, size_t degree);

  // -1 for the zero polynomial.
  int degree() const { return static_cast<int>(c_.size()) - 1; }
  bool is_zero() const { return c_.empty(); }
  const std::vector<Rational>& coefficients() const { return c_; }
  Rational coefficient(size_t i) const { return i < c_.size() ? c_[i] : Rational(0); }
  Rational leading() const { return c_.empty() ? Rational(0) : c_.back(); }

  Rational operator()(const Rational& x) const;  // exact (Horner)
  Interval operator()(const Interval& x) const;  // certified enclosure
  // Sign of the value at x: -1, 0, +1, exactly.
  int sign_at(const Rational& x) const;

  Polynomial derivative() const;
  Polynomial monic() const;  // REQUIRES: !is_zero()
  // p(x + s) and p(x * s) (s != 0 for the latter).
  Polynomial shifted(const Rational& s) const;
  Polynomial scaled(const Rational& s) const;
  // x^deg p(1/x): the roots become their reciprocals (zero roots vanish).
  Polynomial reversed() const;

  friend Polynomial operator+(const Polynomial& a, const Polynomial& b);
  friend Polynomial operator-(const Polynomial& a, const Polynomial& b);
  friend Polynomial operator*(const Polynomial& a, const Polynomial& b);
  friend bool operator==(const Polynomial& a, const Polynomial& b) { return a.c_ == b.c_; }

  // Euclidean division. REQUIRES: !divisor.is_zero().
  static void divide(const Polynomial& dividend, const Polynomial& divisor, Polynomial& quotient,
                     Polynomial& remainder);
  // Monic greatest common divisor (zero if both are zero).
  static Polynomial gcd(const Polynomial& a, const Polynomial& b);
  // p / gcd(p, p'): the same roots, each simple.
  Polynomial squarefree() const;
  // Multiplicity of the factor (x - r)-like divisor d in p: how often d divides p.
  int multiplicity(const Polynomial& d) const;

  // Number of distinct real roots in the half-open interval (lo, hi], by
  // Sturm's theorem. REQUIRES: lo < hi.
  int count_real_roots(const Rational& lo, const Rational& hi) const;
  // Cauchy's bound: every complex root has modulus < the result.
  Rational root_bound() const;

  // Whether exactly `inside` roots (with multiplicity) lie in the open disk
  // |z| < radius, certified: Pellet's theorem (Rouché's theorem with one
  // dominant term on the circle) on p, then on its Graeffe root-squarings
  // (roots z^2, z^4, ... against radius^2, radius^4, ...), which separate
  // the moduli, up to max_squarings times. False means "not shown", not
  // "false". REQUIRES: radius > 0, !is_zero().
  bool certify_roots_inside(const Rational& radius, int inside, int max_squarings = 8) const;
  // The Graeffe step: the polynomial whose roots are the squares of p's.
  Polynomial root_squared() const;

  // "x^2 - x - 1".
  std::string str() const;

 private:
  void trim();
  std::vector<Rational> c_;
};

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_NUMBERS_POLYNOMIAL_H_
