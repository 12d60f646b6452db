#include "verifier/derivation/theorems/akra_bazzi.h"

#include <boost/math/tools/roots.hpp>
#include <cmath>
#include <memory>
#include <mutex>
#include <numeric>
#include <optional>
#include <stdexcept>

#include "verifier/numbers/value.h"

namespace thetagate::engine {

namespace {

using Terms = std::vector<std::pair<Rational, Rational>>;

// sum a_i b_i^x - 1 at a rational x, as an MPFI enclosure.
Interval excess(const Terms& terms, const Rational& x, long prec) {
  Interval sum(Rational(-1), prec);
  Interval ix(x, prec);
  for (const auto& [a, b] : terms)
    sum = sum + Interval(a, prec) * (ix * Interval(b, prec).log()).exp();
  return sum;
}

// Exactly at an integer x (b^x is rational there).
Rational excess_exact(const Terms& terms, long x) {
  Rational sum = -1;
  for (const auto& [a, b] : terms) {
    Rational power = 1;
    Rational base = x >= 0 ? b : Rational(1) / b;
    for (long i = 0; i < std::labs(x); ++i) power *= base;
    sum += a * power;
  }
  return sum;
}

// The root of a strictly decreasing excess(x), kept as a shrinking bracket.
struct Bracket {
  Terms terms;
  std::mutex mutex;
  Rational lo, hi;  // excess(lo) > 0 > excess(hi)

  int sign_at(const Rational& x) {
    for (long prec = 128; prec <= 8192; prec *= 2) {
      Interval v = excess(terms, x, prec);
      if (v.certainly_positive()) return 1;
      if (v.certainly_negative()) return -1;
    }
    return 0;
  }

  Interval enclose(long prec) {
    std::lock_guard<std::mutex> lock(mutex);
    Rational width = Rational(1) / Rational(BigInt(1) << static_cast<unsigned>(prec));
    while (hi - lo > width) {
      Rational mid = (lo + hi) / 2;
      int s = sign_at(mid);
      if (s == 0) {
        mid = lo + (hi - lo) / 3;  // a point that is not the root itself
        s = sign_at(mid);
        if (s == 0) break;
      }
      (s > 0 ? lo : hi) = mid;
    }
    Interval r(prec + 8);
    mpfi_interv_q(r.raw(), lo.backend().data(), hi.backend().data());
    return r;
  }
};

double excess_double(const Terms& terms, double x) {
  double s = -1;
  for (const auto& [a, b] : terms)
    s += a.convert_to<double>() * std::pow(b.convert_to<double>(), x);
  return s;
}

// x = g^k with k as large as possible (g is then unique), for a rational x > 1.
std::pair<Rational, unsigned long> primitive_root(const Rational& x) {
  BigInt num = numerator(x), den = denominator(x);
  for (unsigned long k = std::max(bit_length(num), bit_length(den)); k >= 2; --k) {
    BigInt rn = iroot(num, k), rd = iroot(den, k);
    if (boost::multiprecision::pow(rn, static_cast<unsigned>(k)) == num &&
        boost::multiprecision::pow(rd, static_cast<unsigned>(k)) == den)
      return {Rational(rn, rd), k};
  }
  return {x, 1};
}

// When every 1/b_i is a whole power g^(k_i) of one rational g > 1, sum a_i b_i^p = 1
// is the polynomial equation sum a_i x^(k_i) = 1 in x = g^(-p): its one positive
// root x0 is algebraic and p = log_g(1/x0) exactly (T(n/2) + T(n/4): x + x^2 = 1,
// p = lg of the golden ratio). Empty when the b_i have no common base or the
// degree would exceed 64.
std::optional<RealNumber> common_base_exponent(const Terms& terms) {
  std::optional<Rational> base;
  std::vector<std::pair<Rational, unsigned long>> powers;  // (a_i, k_i)
  for (const auto& [a, b] : terms) {
    if (bit_length(numerator(b)) > 64 || bit_length(denominator(b)) > 64) return std::nullopt;
    auto [g, k] = primitive_root(Rational(1) / b);
    if (base && *base != g) return std::nullopt;
    base = g;
    powers.emplace_back(a, k);
  }
  unsigned long degree = 0;
  for (const auto& pw : powers) degree = std::max(degree, pw.second);
  if (degree > 64) return std::nullopt;
  std::vector<Rational> c(degree + 1);
  c[0] = -1;
  for (const auto& [a, k] : powers) c[k] += a;
  Polynomial poly(c);
  // P(0) = -1 < 0 and P increases on x > 0: one positive root, below hi.
  Rational hi = 1;
  while (poly.sign_at(hi) < 0) hi *= 2;
  if (poly.sign_at(hi) == 0) return RealNumber::log(*base, Rational(1) / hi);
  RealNumber x0 = RealNumber::algebraic(poly, 0, hi);
  return RealNumber::log_real(*base, RealNumber(1L) / x0);
}

}  // namespace

RealNumber critical_exponent(const Terms& terms) {
  if (terms.empty()) throw std::invalid_argument("critical_exponent: no terms");
  Rational total = 0;
  bool one_b = true;
  for (const auto& [a, b] : terms) {
    if (a <= 0 || b <= 0 || b >= 1)
      throw std::invalid_argument("critical_exponent: need a > 0, 0 < b < 1");
    total += a;
    one_b = one_b && b == terms[0].second;
  }
  if (one_b) return RealNumber::log(Rational(1) / terms[0].second, total);
  if (auto exact = common_base_exponent(terms)) return *exact;
  // A bracket on doubles: excess is strictly decreasing.
  double lo = -1, hi = 1;
  while (excess_double(terms, lo) <= 0 && lo > -1e6) lo *= 2;
  while (excess_double(terms, hi) >= 0 && hi < 1e6) hi *= 2;
  boost::uintmax_t iterations = 200;
  auto found =
      boost::math::tools::toms748_solve([&](double x) { return excess_double(terms, x); }, lo, hi,
                                        boost::math::tools::eps_tolerance<double>(48), iterations);
  // Coefficients beyond a double (a = 10^300) leave the search no finite
  // bracket; GMP would abort on a rational made from inf or NaN.
  if (!std::isfinite(found.first) || !std::isfinite(found.second)) {
    throw BudgetExceeded(Limit::kPrecision,
                         "the coefficients are too large for the numeric search of p");
  }
  double mid = (found.first + found.second) / 2;
  long nearest = std::lround(mid);
  if (std::fabs(mid - nearest) < 1e-6 && excess_exact(terms, nearest) == 0)
    return RealNumber(Rational(nearest));
  auto bracket = std::make_shared<Bracket>();
  bracket->terms = terms;
  double pad = 1e-9 * std::max(1.0, std::fabs(mid));
  for (int attempt = 0; attempt < 60; ++attempt, pad *= 4) {
    bracket->lo = Rational(found.first - pad);
    bracket->hi = Rational(found.second + pad);
    if (bracket->sign_at(bracket->lo) > 0 && bracket->sign_at(bracket->hi) < 0) break;
  }
  return RealNumber::enclosed([bracket](long prec) { return bracket->enclose(prec); });
}

std::optional<GrowthClass> akra_bazzi_integral(const GrowthClass& g, const RealNumber& p) {
  int c = compare(g.alpha, p);
  if (c > 0) return GrowthClass::polylog(g.alpha - p, g.beta, g.gamma);
  if (c < 0) return GrowthClass::constant();
  // ∫ lg^β u (lg lg u)^γ du/u: with v = ln u, ∫ v^β (ln v)^γ dv.
  if (g.beta > RealNumber(-1L)) return GrowthClass::polylog(0, g.beta + RealNumber(1L), g.gamma);
  if (g.beta < RealNumber(-1L)) return GrowthClass::constant();
  if (g.gamma > RealNumber(-1L)) return GrowthClass::polylog(0, 0, g.gamma + RealNumber(1L));
  if (g.gamma < RealNumber(-1L)) return GrowthClass::constant();
  return std::nullopt;
}

TheoremOutcome akra_bazzi(const DerivationInput& input) {
  TheoremOutcome out;
  out.theorem = "Akra–Bazzi";
  const Shape& s = *input.shape;
  if (s.scaled.empty() || !s.subtractive.empty() || !s.roots.empty()) {
    out.failure =
        "Akra–Bazzi needs every recursive term of the form a_i T(b_i n + h_i(n)) with 0 < b_i < 1";
    return out;
  }
  Terms terms;
  std::string equation;
  for (const auto& t : s.scaled) {
    if (t.a <= 0) {
      out.failure = "Akra–Bazzi needs positive coefficients; T(" + t.argument +
                    ") has coefficient " + to_string(t.a);
      return out;
    }
    terms.emplace_back(t.a, t.b);
    equation += (equation.empty() ? "" : " + ") + (t.a == 1 ? "" : to_string(t.a) + "*") + "(" +
                to_string(t.b) + ")^p";
  }
  for (const auto& t : s.scaled) {
    if (t.perturbation == Perturbation::kGrowing) {
      GrowthClass limit = GrowthClass::polylog(1, -2);
      if (compare(*t.perturbation_growth, limit) > 0) {
        out.failure = "Leighton's condition |h(n)| = O(n/lg^2 n) fails for T(" + t.argument +
                      "): h(n) = Θ(" + to_string(*t.perturbation_growth) + ")";
        return out;
      }
      out.steps.push_back("Leighton's condition: T(" + t.argument + ") departs from " +
                          to_string(t.b) + " n by Θ(" + to_string(*t.perturbation_growth) +
                          ") = O(n/lg^2 n)");
    } else if (t.perturbation == Perturbation::kBounded) {
      out.steps.push_back("Leighton's condition: T(" + t.argument + ") departs from " +
                          to_string(t.b) + " n by O(1) = O(n/lg^2 n)");
    }
  }
  RealNumber p = critical_exponent(terms);
  out.steps.push_back("critical exponent: " + equation + " = 1 gives p = " + p.str() +
                      (p.kind() == RealNumber::Kind::kEnclosed
                           ? " (certified enclosure " + p.enclose(40).str(10) + ")"
                       : p.is_rational() ? ""
                                         : " = " + p.digits()));
  GrowthClass np = GrowthClass::polylog(p);
  GrowthClass result;
  if (input.driving.zero && !input.leaves_positive) {
    out.failure = input.leaves_failure("g");
    return out;
  } else if (input.driving.zero) {
    out.steps.push_back("g(n) = 0: the integral vanishes");
    result = np;
  } else if (!input.driving.growth) {
    out.failure = "g(n) has no growth class, so its polynomial growth cannot be established: " +
                  input.driving.reason;
    return out;
  } else {
    const GrowthClass& g = *input.driving.growth;
    if (!g.is_subexponential()) {
      out.failure =
          "g(n) = Θ(" + to_string(g) + ") grows exponentially: it is not of polynomial growth";
      return out;
    }
    out.steps.push_back("g(n) = Θ(" + to_string(g) + "), non-negative and of polynomial growth");
    auto integral = akra_bazzi_integral(g, p);
    if (!integral) {
      out.failure = "the integral of g(u)/u^(p+1) grows like lg lg lg n, outside the normal form";
      return out;
    }
    std::string integral_text = to_string(*integral);
    if (compare(g.alpha, p) > 0 && !p.is_rational()) {
      // n^(α - p) first: its digits alone do not show where they come from.
      GrowthClass logs = GrowthClass::polylog(RealNumber(), g.beta, g.gamma);
      integral_text = "n^(" + g.alpha.str() + " - p)" +
                      (logs.is_constant() ? "" : " " + to_string(logs)) + ") = Θ(" + integral_text;
    }
    out.steps.push_back("∫_1^n g(u)/u^(p+1) du = Θ(" + integral_text + ")");
    // For alpha > p the product n^p * n^(alpha - p) is g itself; building it
    // from the two would leave p + (1 - p) as an enclosure that never equals 1.
    result = compare(g.alpha, p) > 0 ? g : np.times(*integral);
  }
  out.steps.push_back("T(n) = Θ(n^p (1 + ∫)) = Θ(" + to_string(result) + ")");
  out.method = "Akra–Bazzi";
  if (s.scaled.size() == 1) out.method += " (one term)";
  out.growth = result;
  return out;
}

}  // namespace thetagate::engine
