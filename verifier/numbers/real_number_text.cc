// RealNumber as text: exact and parseable where the kind allows ("lg 7 - 1",
// "(1 + sqrt(5))/2", "2^(1/3)"), otherwise certified digits, correctly rounded
// from an enclosure rather than from a double.
#include <string>

#include "verifier/numbers/real_number.h"
#include "verifier/numbers/real_number_node.h"

namespace thetagate::engine {

using real_number_internal::exact_value;
using real_number_internal::kMaxPrecision;

namespace {

using Kind = RealNumber::Kind;

std::string log_text(const Rational& g, const Rational& a) {
  std::string arg = denominator(a) == 1 ? to_string(a) : "(" + to_string(a) + ")";
  if (g == 2) return "lg " + arg;
  return "log(" + to_string(g) + ", " + to_string(a) + ")";
}

}  // namespace

std::string RealNumber::digits(int decimals) const {
  BigInt scale = boost::multiprecision::pow(BigInt(10), static_cast<unsigned>(decimals));
  for (long prec = 64; prec <= kMaxPrecision; prec *= 2) {
    Interval x = enclose(prec);
    // A number such as 2^(10^10) has no digits worth printing: its interval.
    if (!mpfi_bounded_p(x.raw()) || mpfr_get_exp(&x.raw()->right) > 4096 ||
        mpfr_get_exp(&x.raw()->left) > 4096) {
      break;
    }
    BigInt lo = floor_of(x.lower() * Rational(scale) + Rational(1, 2));
    BigInt hi = floor_of(x.upper() * Rational(scale) + Rational(1, 2));
    if (lo != hi) continue;
    bool exact = x.lower() == x.upper() && x.lower() * Rational(scale) == Rational(lo);
    bool negative = lo < 0;
    BigInt m = negative ? BigInt(-lo) : lo;
    std::string s = BigInt(m / scale).str();
    std::string frac = BigInt(m % scale).str();
    if (decimals > 0) s += "." + std::string(decimals - frac.size(), '0') + frac;
    return (negative ? "-" : "") + s + (exact ? "" : "…");
  }
  return "[" + enclose(64).str(8) + "]";
}

std::string RealNumber::str() const {
  const Node& n = *node_;
  switch (n.kind) {
    case Kind::kRational:
      return to_string(n.q);
    case Kind::kLog: {
      std::string log = log_text(n.g, n.a);
      BigInt u = numerator(n.c), v = denominator(n.c);
      std::string s = u == 1 ? log : (u == -1 ? "-" + log : u.str() + " " + log);
      if (v != 1) s = "(" + s + ")/" + v.str();
      if (n.q > 0) s += " + " + to_string(n.q);
      if (n.q < 0) s += " - " + to_string(Rational(-n.q));
      return s;
    }
    case Kind::kAlgebraic: {
      if (auto q = exact_value(*this)) return to_string(*q);
      Polynomial m = n.p.monic();
      if (m.degree() == 2) {
        Rational b = m.coefficient(1), c = m.coefficient(0);
        Rational disc = b * b - 4 * c;
        Rational center = -b / 2;
        bool plus = compare(*this, RealNumber(center)) > 0;
        std::string root = "sqrt(" + to_string(disc) + ")";
        if (-b == 0) return std::string(plus ? "" : "-") + root + "/2";
        return "(" + to_string(Rational(-b)) + (plus ? " + " : " - ") + root + ")/2";
      }
      bool binomial = true;
      for (int i = 1; i < m.degree(); ++i) binomial = binomial && m.coefficient(i) == 0;
      if (binomial && m.coefficient(0) < 0) {
        std::string q = to_string(Rational(-m.coefficient(0)));
        if (denominator(m.coefficient(0)) != 1) q = "(" + q + ")";
        return q + "^(1/" + std::to_string(m.degree()) + ")";
      }
      return digits();
    }
    case Kind::kEnclosed:
      return digits();
  }
  return "?";
}

}  // namespace thetagate::engine
