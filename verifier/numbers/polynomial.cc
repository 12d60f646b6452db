#include "verifier/numbers/polynomial.h"

#include <algorithm>

namespace thetagate::engine {

Polynomial::Polynomial(std::vector<Rational> coefficients) : c_(std::move(coefficients)) { trim(); }

Polynomial Polynomial::monomial(const Rational& c, size_t degree) {
  std::vector<Rational> v(degree + 1);
  v[degree] = c;
  return Polynomial(std::move(v));
}

void Polynomial::trim() {
  while (!c_.empty() && c_.back() == 0) c_.pop_back();
}

Rational Polynomial::operator()(const Rational& x) const {
  Rational r = 0;
  for (size_t i = c_.size(); i-- > 0;) r = r * x + c_[i];
  return r;
}

Interval Polynomial::operator()(const Interval& x) const {
  Interval r(Rational(0), x.precision());
  for (size_t i = c_.size(); i-- > 0;) r = r * x + Interval(c_[i], x.precision());
  return r;
}

int Polynomial::sign_at(const Rational& x) const {
  Rational v = (*this)(x);
  return v > 0 ? 1 : (v < 0 ? -1 : 0);
}

Polynomial Polynomial::derivative() const {
  std::vector<Rational> d;
  for (size_t i = 1; i < c_.size(); ++i) d.push_back(c_[i] * Rational(static_cast<long>(i)));
  return Polynomial(std::move(d));
}

Polynomial Polynomial::monic() const {
  std::vector<Rational> m = c_;
  Rational lead = leading();
  for (auto& x : m) x /= lead;
  return Polynomial(std::move(m));
}

Polynomial Polynomial::shifted(const Rational& s) const {
  // Horner with polynomials: p(x + s) = (...(c_n (x+s) + c_{n-1})(x+s) ...).
  Polynomial r;
  Polynomial x_plus_s({s, Rational(1)});
  for (size_t i = c_.size(); i-- > 0;) r = r * x_plus_s + Polynomial({c_[i]});
  return r;
}

Polynomial Polynomial::scaled(const Rational& s) const {
  std::vector<Rational> v = c_;
  Rational power = 1;
  for (auto& x : v) {
    x *= power;
    power *= s;
  }
  return Polynomial(std::move(v));
}

Polynomial Polynomial::reversed() const {
  size_t low = 0;
  while (low < c_.size() && c_[low] == 0) ++low;
  std::vector<Rational> v(c_.begin() + static_cast<long>(low), c_.end());
  std::reverse(v.begin(), v.end());
  return Polynomial(std::move(v));
}

Polynomial operator+(const Polynomial& a, const Polynomial& b) {
  std::vector<Rational> v(std::max(a.c_.size(), b.c_.size()));
  for (size_t i = 0; i < v.size(); ++i) v[i] = a.coefficient(i) + b.coefficient(i);
  return Polynomial(std::move(v));
}

Polynomial operator-(const Polynomial& a, const Polynomial& b) {
  std::vector<Rational> v(std::max(a.c_.size(), b.c_.size()));
  for (size_t i = 0; i < v.size(); ++i) v[i] = a.coefficient(i) - b.coefficient(i);
  return Polynomial(std::move(v));
}

Polynomial operator*(const Polynomial& a, const Polynomial& b) {
  if (a.is_zero() || b.is_zero()) return {};
  std::vector<Rational> v(a.c_.size() + b.c_.size() - 1);
  for (size_t i = 0; i < a.c_.size(); ++i) {
    for (size_t j = 0; j < b.c_.size(); ++j) v[i + j] += a.c_[i] * b.c_[j];
  }
  return Polynomial(std::move(v));
}

void Polynomial::divide(const Polynomial& dividend, const Polynomial& divisor, Polynomial& quotient,
                        Polynomial& remainder) {
  std::vector<Rational> r = dividend.c_;
  int dd = divisor.degree();
  std::vector<Rational> q(r.size() >= divisor.c_.size() ? r.size() - divisor.c_.size() + 1 : 0);
  for (int i = static_cast<int>(r.size()) - 1; i >= dd; --i) {
    Rational factor = r[i] / divisor.leading();
    if (factor == 0) continue;
    q[i - dd] = factor;
    for (int j = 0; j <= dd; ++j) r[i - dd + j] -= factor * divisor.c_[j];
  }
  quotient = Polynomial(std::move(q));
  remainder = Polynomial(std::move(r));
}

Polynomial Polynomial::gcd(const Polynomial& a, const Polynomial& b) {
  Polynomial x = a, y = b;
  while (!y.is_zero()) {
    Polynomial q, r;
    divide(x, y, q, r);
    x = std::move(y);
    y = r.is_zero() ? r : r.monic();  // monic remainders keep the numbers small
  }
  return x.is_zero() ? x : x.monic();
}

Polynomial Polynomial::squarefree() const {
  if (degree() < 1) return *this;
  Polynomial g = gcd(*this, derivative());
  Polynomial q, r;
  divide(*this, g, q, r);
  return q.monic();
}

int Polynomial::multiplicity(const Polynomial& d) const {
  if (d.degree() < 1 || is_zero()) return 0;
  int m = 0;
  Polynomial p = *this;
  for (;;) {
    Polynomial q, r;
    divide(p, d, q, r);
    if (!r.is_zero()) return m;
    ++m;
    p = q;
  }
}

namespace {
int sign_changes(const std::vector<Polynomial>& chain, const Rational& x) {
  int changes = 0, last = 0;
  for (const auto& p : chain) {
    int s = p.sign_at(x);
    if (s == 0) continue;
    if (last != 0 && s != last) ++changes;
    last = s;
  }
  return changes;
}
}  // namespace

int Polynomial::count_real_roots(const Rational& lo, const Rational& hi) const {
  if (degree() < 1) return 0;
  Polynomial p = squarefree();
  std::vector<Polynomial> chain = {p, p.derivative()};
  while (chain.back().degree() > 0) {
    Polynomial q, r;
    divide(chain[chain.size() - 2], chain.back(), q, r);
    if (r.is_zero()) break;
    chain.push_back(Polynomial() - r);
  }
  return sign_changes(chain, lo) - sign_changes(chain, hi);
}

Rational Polynomial::root_bound() const {
  Rational m = 0;
  for (size_t i = 0; i + 1 < c_.size(); ++i) m = std::max(m, Rational(abs(c_[i] / leading())));
  return m + 1;
}

Polynomial Polynomial::root_squared() const {
  // q(x^2) = (-1)^d p(x) p(-x): p(-x) negates the odd coefficients.
  std::vector<Rational> mirrored = c_;
  for (size_t i = 1; i < mirrored.size(); i += 2) mirrored[i] = -mirrored[i];
  Polynomial product = *this * Polynomial(std::move(mirrored));
  std::vector<Rational> q;
  for (size_t i = 0; i < product.c_.size(); i += 2) q.push_back(product.c_[i]);
  if (degree() % 2 != 0) {
    for (Rational& c : q) c = -c;
  }
  return Polynomial(std::move(q));
}

bool Polynomial::certify_roots_inside(const Rational& radius, int inside, int max_squarings) const {
  if (inside < 0 || inside > degree()) return false;
  Polynomial p = *this;
  Rational rho = radius;
  for (int step = 0; step <= max_squarings; ++step) {
    // Pellet: |a_k| rho^k > sum over i != k of |a_i| rho^i gives exactly k
    // roots in |z| < rho and none on the circle.
    Rational dominant = 0, rest = 0, power = 1;
    for (int i = 0; i <= p.degree(); ++i) {
      Rational term = Rational(abs(p.coefficient(static_cast<size_t>(i)))) * power;
      (i == inside ? dominant : rest) += term;
      power *= rho;
    }
    if (dominant > rest) return true;
    if (step < max_squarings) {
      p = p.root_squared().monic();
      rho = rho * rho;
    }
  }
  return false;
}

std::string Polynomial::str() const {
  if (c_.empty()) return "0";
  std::string s;
  for (size_t i = c_.size(); i-- > 0;) {
    if (c_[i] == 0) continue;
    Rational a = Rational(abs(c_[i]));
    bool negative = c_[i] < 0;
    if (s.empty())
      s += negative ? "-" : "";
    else
      s += negative ? " - " : " + ";
    bool show = a != 1 || i == 0;
    if (show) s += to_string(a);
    if (i >= 1) s += "x";
    if (i >= 2) s += "^" + std::to_string(i);
  }
  return s;
}

}  // namespace thetagate::engine
