#include "verifier/derivation/theorems/linear.h"

#include <algorithm>
#include <cmath>
#include <complex>

namespace thetagate::engine {

namespace {

using Complex = std::complex<long double>;

// All complex roots of a polynomial, numerically (Durand–Kerner).
std::vector<Complex> numeric_roots(const Polynomial& p) {
  Polynomial m = p.monic();
  int d = m.degree();
  std::vector<long double> c(d + 1);
  for (int i = 0; i <= d; ++i) c[i] = m.coefficient(i).convert_to<long double>();
  std::vector<Complex> z(d);
  for (int i = 0; i < d; ++i) z[i] = std::pow(Complex(0.4L, 0.9L), i);
  for (int iteration = 0; iteration < 2000; ++iteration) {
    for (int i = 0; i < d; ++i) {
      Complex value = 0;
      for (int k = d; k >= 0; --k) value = value * z[i] + c[k];
      Complex denominator = 1;
      for (int j = 0; j < d; ++j) {
        if (j != i) denominator *= z[i] - z[j];
      }
      if (std::abs(denominator) > 0) z[i] -= value / denominator;
    }
  }
  return z;
}

bool is_polynomial_in_n(const Expr& e) {
  switch (e.kind) {
    case ExprKind::kNumber:
    case ExprKind::kVariable:
      return true;
    case ExprKind::kAdd:
    case ExprKind::kSub:
    case ExprKind::kMul:
    case ExprKind::kNeg:
      return std::all_of(e.args.begin(), e.args.end(),
                         [](const ExprPtr& a) { return is_polynomial_in_n(*a); });
    case ExprKind::kDiv:
      return is_polynomial_in_n(*e.args[0]) && !mentions_n(*e.args[1]);
    case ExprKind::kPow:
      return is_polynomial_in_n(*e.args[0]) && e.args[1]->kind == ExprKind::kNumber &&
             denominator(e.args[1]->number) == 1 && e.args[1]->number >= 0;
    default:
      return false;
  }
}

// Why every root of p other than r (multiplicity m, r > lo) has smaller
// modulus: a radius between them, numerically, at which Pellet's theorem
// after root-squaring certifies that exactly degree - m roots lie inside.
// `distinct` are p's distinct roots, numerically.
std::string others_smaller(const Polynomial& p, const std::vector<Complex>& distinct, long double r,
                           int m, const Rational& lo) {
  if (p.degree() == m) return "there is no other root";
  long double largest = 0;
  bool skipped = false;  // r itself, the distinct root nearest to it
  size_t nearest = 0;
  for (size_t i = 1; i < distinct.size(); ++i) {
    if (std::abs(distinct[i] - Complex(r, 0)) < std::abs(distinct[nearest] - Complex(r, 0)))
      nearest = i;
  }
  for (size_t i = 0; i < distinct.size(); ++i) {
    if (i == nearest && !skipped) {
      skipped = true;
      continue;
    }
    largest = std::max(largest, std::abs(distinct[i]));
  }
  Rational radius(static_cast<double>((largest + r) / 2));
  if (radius >= lo) radius = lo;  // r itself must stay outside
  if (radius > 0 && p.certify_roots_inside(radius, p.degree() - m)) {
    char text[32];
    std::snprintf(text, sizeof text, "%.4g", radius.convert_to<double>());
    return "every other root has modulus below " + std::string(text) +
           " (certified: Pellet's theorem after Graeffe root-squaring)";
  }
  return "every other root has smaller modulus (numerically)";
}

}  // namespace

Polynomial active_polynomial(const Polynomial& c, const std::vector<Rational>& values) {
  int d = c.degree();
  Polynomial q = c.reversed();  // q(0) = 1 up to scale; W = N/q
  std::vector<Rational> n(d);
  for (int i = 0; i < d; ++i) {
    for (int j = 0; j <= i; ++j) n[i] += q.coefficient(j) * values[i - j];
  }
  Polynomial numerator(n);
  if (numerator.is_zero()) return Polynomial({Rational(1)});
  Polynomial g = Polynomial::gcd(numerator, q), reduced, remainder;
  Polynomial::divide(q, g, reduced, remainder);
  // Back from q(x) = x^d c(1/x) to a characteristic polynomial.
  std::vector<Rational> r = reduced.coefficients();
  std::reverse(r.begin(), r.end());
  return Polynomial(r).monic();
}

TheoremOutcome linear_recurrence(const DerivationInput& input) {
  TheoremOutcome out;
  out.theorem = "linear recurrence with constant coefficients";
  const Shape& s = *input.shape;
  if (s.subtractive.empty() || !s.scaled.empty() || !s.roots.empty()) {
    out.failure = "a linear recurrence with constant coefficients uses only terms c T(n - j)";
    return out;
  }
  if (!input.value_at) {
    out.failure = "the initial values are needed and cannot be evaluated";
    return out;
  }
  long d = 0;
  for (const auto& t : s.subtractive) d = std::max(d, static_cast<long>(t.c));
  if (d > 12) {
    out.failure = "order " + std::to_string(d) + " is above the supported 12";
    return out;
  }
  std::vector<Rational> c(d + 1);
  c[d] = 1;
  for (const auto& t : s.subtractive) c[d - static_cast<long>(t.c)] -= t.a;
  Polynomial characteristic(c);
  out.steps.push_back("characteristic polynomial: " + characteristic.str());
  Polynomial full = characteristic;
  if (!input.driving.zero) {
    if (!s.driving || !is_polynomial_in_n(*s.driving) || !input.driving.growth ||
        !input.driving.growth->alpha.is_integer()) {
      out.failure = "the driving function must be a polynomial in n for this method";
      return out;
    }
    long degree = static_cast<long>(numerator(input.driving.growth->alpha.rational()));
    for (long i = 0; i <= degree; ++i) full = full * Polynomial({Rational(-1), Rational(1)});
    std::string times = degree == 0   ? "once"
                        : degree == 1 ? "twice"
                                      : std::to_string(degree + 1) + " times";
    out.steps.push_back("the polynomial driving function of degree " + std::to_string(degree) +
                        " adds the root 1 " + times + ": " + full.str());
  }
  // The recurrence holds from the first n above every base case; starting
  // later is always safe.
  BigInt bound = 0;
  for (const CaseLine* line : s.base_cases) {
    if (line->point) bound = std::max(bound, *line->point);
    if (line->condition && line->condition->args.size() == 2) {
      for (const auto& side : line->condition->args) {
        if (!mentions_n(*side) && side->kind == ExprKind::kNumber)
          bound = std::max(bound, ceil_of(side->number));
      }
    }
  }
  int big_d = full.degree();
  BigInt start = bound + 1 + d;
  std::vector<Rational> values;
  std::string shown;
  for (int i = 0; i < big_d + 1; ++i) {
    auto v = input.value_at(start - d + i);  // nullopt: an input error or a limit at that n
    if (!v || !v->is_exact()) {
      out.failure = "the initial values could not be evaluated exactly: T(" +
                    BigInt(start - d + i).str() + ") is " + (v ? "not exact" : "out of reach");
      return out;
    }
    values.push_back(v->exact());
    if (i < 6) shown += (shown.empty() ? "" : ", ") + to_string(values.back());
  }
  out.steps.push_back("values from n = " + BigInt(start - d).str() + ": " + shown +
                      (big_d + 1 > 6 ? ", ..." : ""));
  Polynomial active = active_polynomial(full, values);
  if (active.degree() < 1) {
    out.failure = "T(n) = 0 for all large n";
    return out;
  }
  if (active.degree() < full.degree()) {
    out.steps.push_back("for these initial values only the roots of " + active.str() +
                        " have non-zero coefficients (the others cancel exactly)");
  }
  // Roots of the squarefree part: a repeated root scatters numerically
  // (by about the ε^(1/m) of its multiplicity m) and would look like several.
  // Multiplicities come exactly from gcds below.
  std::vector<Complex> roots = numeric_roots(active.squarefree());
  long double modulus = 0;
  for (const auto& z : roots) modulus = std::max(modulus, std::abs(z));
  long double tolerance = 1e-9L * std::max<long double>(1, modulus);
  std::vector<Complex> dominant;
  for (const auto& z : roots) {
    if (std::abs(z) >= modulus - tolerance) dominant.push_back(z);
  }
  long double real_root = 0;
  int positive = 0, other = 0;
  for (const auto& z : dominant) {
    if (std::fabs(z.imag()) <= 1e-7L * std::max<long double>(1, modulus) && z.real() > 0) {
      ++positive;
      real_root = z.real();
    } else {
      ++other;
    }
  }
  if (positive == 0 || positive < other) {
    std::string list;
    for (const auto& z : dominant) {
      char buffer[64];
      std::snprintf(buffer, sizeof buffer, "%.6Lf%+.6Lfi", z.real(), z.imag());
      list += (list.empty() ? "" : ", ") + std::string(buffer);
    }
    out.failure = "the dominant roots of " + active.str() + " (" + list +
                  ") are not a single positive root: "
                  "T(n) oscillates and has no Θ of the form n^j r^n";
    return out;
  }
  // Certify the positive root: an isolating interval checked by Sturm's theorem.
  RealNumber r;
  long double pad = 1e-8L * std::max<long double>(1, real_root);
  Rational lo, hi;
  for (int attempt = 0;; ++attempt, pad *= 4) {
    lo = Rational(static_cast<double>(real_root - pad));
    hi = Rational(static_cast<double>(real_root + pad));
    if (active.count_real_roots(lo, hi) == 1 && active.sign_at(lo) != 0 && active.sign_at(hi) != 0)
      break;
    if (attempt > 40) {
      out.failure = "the dominant root could not be isolated";
      return out;
    }
  }
  r = RealNumber::algebraic(active, lo, hi);
  int multiplicity = 0;
  Polynomial derivative = active;
  Polynomial common = active;
  while (common.degree() >= 1 && common.count_real_roots(lo, hi) >= 1) {
    ++multiplicity;
    derivative = derivative.derivative();
    common = Polynomial::gcd(common, derivative);
  }
  if (multiplicity <= other) {
    out.failure =
        "roots of the same modulus as " + r.str() + " oscillate with at least its multiplicity";
    return out;
  }
  // Digits only when r has a closed form of its own: "1 + sqrt(2) = 2.414214…".
  bool closed_form = !r.is_rational() && r.str() != r.digits();
  out.steps.push_back("dominant root r = " + r.str() + (closed_form ? " = " + r.digits() : "") +
                      " (certified by Sturm's theorem), multiplicity " +
                      std::to_string(multiplicity) + "; " +
                      (other > 0 ? std::string("the other roots of modulus r (numerically) have "
                                               "lower multiplicity, so n^(m-1) r^n dominates")
                                 : others_smaller(active, roots, real_root, multiplicity, lo)));
  try {
    auto far = input.value_at(start + 40 * std::max(1, big_d));
    if (far && far->sign() < 0) {
      out.failure = "the leading coefficient is negative: T(n) tends to -infinity";
      return out;
    }
  } catch (const PrecisionShortfall&) {
    // The sign of an interval around 0 is unknown: no evidence either way.
  }
  GrowthClass result = GrowthClass::polylog(multiplicity - 1);
  if (r != RealNumber(1L)) result = GrowthClass::exponential(r).times(result);
  out.steps.push_back("T(n) = Θ(" + to_string(result) + ")");
  out.method = "linear recurrence, dominant characteristic root";
  out.growth = result;
  return out;
}

}  // namespace thetagate::engine
