// Exact real numbers for growth exponents and bases: rationals, logarithms
// such as lg 7 or log_3 5, real algebraic numbers such as the golden ratio,
// and numbers known through certified enclosures (an Akra–Bazzi critical
// exponent). Comparisons are exact: lg 7 against 2807/1000 compares 7^1000
// with 2^2807; an algebraic number against a rational evaluates its
// polynomial exactly; everything else is refined with intervals until the
// order is decided. Nothing is ever rounded to equality.
#ifndef THETAGATE_VERIFIER_NUMBERS_REAL_NUMBER_H_
#define THETAGATE_VERIFIER_NUMBERS_REAL_NUMBER_H_

#include <functional>
#include <memory>
#include <optional>
#include <string>

#include "verifier/numbers/interval.h"
#include "verifier/numbers/number.h"
#include "verifier/numbers/polynomial.h"

namespace thetagate::engine {

class RealNumber {
 public:
  enum class Kind {
    kRational,      // exact rational
    kLog,           // q + c * log_g(a), canonical: g, a > 1 and not powers of anything
    kAlgebraic,     // the unique root of a squarefree polynomial in an isolating interval
    kEnclosed,      // known through certified enclosures only
    kLogAlgebraic,  // q + c * log_g(alpha), alpha a positive algebraic number (lg of the
                    // golden ratio: an Akra–Bazzi exponent whose b_i are powers of one base)
  };

  RealNumber();                   // zero
  RealNumber(const Rational& q);  // NOLINT: rationals are reals
  RealNumber(long x);             // NOLINT

  // log_base(x), exactly. REQUIRES: x > 0, base > 0, base != 1.
  static RealNumber log(const Rational& base, const Rational& x);
  // log_base(x) for a real x > 0: exact for a rational or algebraic x
  // (kLog, kLogAlgebraic), else enclosed. REQUIRES: base > 0, base != 1.
  static RealNumber log_real(const Rational& base, const RealNumber& x);
  // The root of `p` in the open interval (lo, hi). REQUIRES: p has exactly
  // one real root there (checked; throws std::invalid_argument otherwise).
  // A rational root is found and kept as a rational, unless the caller
  // knows the root is irrational (`irrational`), which skips that search.
  static RealNumber algebraic(const Polynomial& p, const Rational& lo, const Rational& hi,
                              bool irrational = false);
  // The positive real x with x^k = q. REQUIRES: q > 0, k >= 1.
  static RealNumber root(const Rational& q, unsigned long k);
  // A number known only by enclosures: enclose(prec) must contain it, and its
  // width must shrink toward zero as prec grows.
  static RealNumber enclosed(std::function<Interval(long)> enclose);

  Kind kind() const;
  bool is_rational() const { return kind() == Kind::kRational; }
  // REQUIRES: is_rational().
  const Rational& rational() const;
  bool is_integer() const;
  // The defining polynomial of an algebraic number (nullptr otherwise).
  const Polynomial* polynomial() const;

  // An interval of about `precision_bits` bits containing the number.
  Interval enclose(long precision_bits) const;
  double approx() const;
  // -1, 0, +1, exactly (throws PrecisionShortfall if undecidable in budget).
  int sign() const;

  // Readable and, where exact, parseable text: "3/2", "lg 7", "log(3, 5)",
  // "lg 7 - 1", "(1 + sqrt(5))/2", "2^(1/3)"; otherwise certified digits
  // "0.839780…" (correctly rounded to six decimals, then "…").
  std::string str() const;
  // Certified digits only: the number correctly rounded to `decimals`
  // decimals, followed by "…" unless it is exactly that decimal.
  std::string digits(int decimals = 6) const;

  struct Node;
  explicit RealNumber(std::shared_ptr<const Node> node) : node_(std::move(node)) {}
  const Node& node() const { return *node_; }
  bool same_node(const RealNumber& other) const { return node_ == other.node_; }

 private:
  std::shared_ptr<const Node> node_;
};

// Arithmetic: exact where the kinds allow (rational with anything,
// logarithms of one base, algebraic with rationals), otherwise an enclosed
// number. Division REQUIRES a non-zero divisor (throws DomainError).
RealNumber operator+(const RealNumber& a, const RealNumber& b);
RealNumber operator-(const RealNumber& a, const RealNumber& b);
RealNumber operator*(const RealNumber& a, const RealNumber& b);
RealNumber operator/(const RealNumber& a, const RealNumber& b);
RealNumber operator-(const RealNumber& a);
// base^exponent for base > 0 (exact when both are rational and the result is
// rational or a k-th root). REQUIRES: base > 0 (throws DomainError).
RealNumber pow(const RealNumber& base, const RealNumber& exponent);
// lg c: exact for a rational (RealNumber::log) or an algebraic number
// (RealNumber::log_real), enclosed otherwise. REQUIRES: c > 0.
RealNumber log2_of(const RealNumber& c);

// The parts of a log-algebraic number x = q + c·log_g(alpha) (g > 1, alpha a
// positive algebraic number), for exact arithmetic in Q(alpha) by callers;
// nullopt for every other kind.
struct LogAlgebraicForm {
  Rational q, c, g;
  RealNumber alpha;
};
std::optional<LogAlgebraicForm> log_algebraic_form(const RealNumber& x);

// Exact three-way comparison: -1, 0, +1. Throws PrecisionShortfall only when
// two numbers of different kinds agree to 2^-16384 (never seen in practice).
int compare(const RealNumber& a, const RealNumber& b);
inline bool operator==(const RealNumber& a, const RealNumber& b) { return compare(a, b) == 0; }
inline bool operator!=(const RealNumber& a, const RealNumber& b) { return compare(a, b) != 0; }
inline bool operator<(const RealNumber& a, const RealNumber& b) { return compare(a, b) < 0; }
inline bool operator>(const RealNumber& a, const RealNumber& b) { return compare(a, b) > 0; }
inline bool operator<=(const RealNumber& a, const RealNumber& b) { return compare(a, b) <= 0; }
inline bool operator>=(const RealNumber& a, const RealNumber& b) { return compare(a, b) >= 0; }

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_NUMBERS_REAL_NUMBER_H_
