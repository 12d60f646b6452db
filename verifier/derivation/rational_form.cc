#include "verifier/derivation/rational_form.h"

#include <algorithm>
#include <utility>

#include "verifier/evaluation/constant_value.h"

namespace thetagate::engine {

namespace {

// Terms a sum with constant limits may have before it is refused.
constexpr int64_t kMostConstantTerms = 4096;
// The largest |e| of sum(j, lo, n + e, h(j)), and the largest |k| of a power.
constexpr int64_t kMostOffset = 64;

const Polynomial kOne({Rational(1)});

Monomial product(const Monomial& a, const Monomial& b) {
  Monomial m(std::max(a.size(), b.size()), 0);
  for (size_t i = 0; i < a.size(); ++i) m[i] += a[i];
  for (size_t i = 0; i < b.size(); ++i) m[i] += b[i];
  return m;
}

void accumulate(std::map<Monomial, Polynomial>& num, const Monomial& m, const Polynomial& p) {
  auto it = num.find(m);
  Polynomial sum = it == num.end() ? p : it->second + p;
  if (sum.is_zero()) {
    if (it != num.end()) num.erase(it);
  } else {
    num[m] = sum;
  }
}

}  // namespace

void reduce(RationalForm& f) {
  if (f.num.empty()) {
    f.den = kOne;
    return;
  }
  Polynomial g = f.den;
  for (const auto& [m, p] : f.num) g = Polynomial::gcd(g, p);
  if (g.degree() <= 0) return;
  Polynomial q, r;
  Polynomial::divide(f.den, g, q, r);
  f.den = q;
  for (auto& [m, p] : f.num) {
    Polynomial::divide(p, g, q, r);
    p = q;
  }
}

namespace {

// The value of a symbol-free form without n: its constant, or nullopt.
std::optional<Rational> constant_of(const RationalForm& f) {
  if (!f.symbol_free() || f.den.degree() != 0) return std::nullopt;
  Polynomial p = f.free_numerator();
  if (p.degree() > 0) return std::nullopt;
  return p.coefficient(0) / f.den.coefficient(0);
}

BigInt whole_constant(const RationalForm& f, const Expr& e, const char* what) {
  std::optional<Rational> c = constant_of(f);
  if (!c || denominator(*c) != 1)
    throw NotRational{std::string(what) + " " + print(e) + " is not a whole constant"};
  return numerator(*c);
}

}  // namespace

RationalForm RationalForm::constant(const Rational& c) { return polynomial(Polynomial({c})); }

RationalForm RationalForm::polynomial(const Polynomial& p) {
  RationalForm f;
  if (!p.is_zero()) f.num[Monomial{}] = p;
  return f;
}

RationalForm RationalForm::symbol(size_t index) {
  RationalForm f;
  Monomial m(index + 1, 0);
  m[index] = 1;
  f.num[m] = kOne;
  return f;
}

bool RationalForm::symbol_free() const {
  return num.empty() || (num.size() == 1 && num.begin()->first.empty());
}

Polynomial RationalForm::free_numerator() const {
  auto it = num.find(Monomial{});
  return it == num.end() ? Polynomial() : it->second;
}

RationalForm operator+(const RationalForm& a, const RationalForm& b) {
  RationalForm r;
  if (a.den == b.den) {
    r = a;
    for (const auto& [m, p] : b.num) accumulate(r.num, m, p);
  } else {
    r.den = a.den * b.den;
    for (const auto& [m, p] : a.num) accumulate(r.num, m, p * b.den);
    for (const auto& [m, p] : b.num) accumulate(r.num, m, p * a.den);
  }
  reduce(r);
  return r;
}

RationalForm operator-(const RationalForm& a) {
  RationalForm r = a;
  for (auto& [m, p] : r.num) p = Polynomial() - p;
  return r;
}

RationalForm operator-(const RationalForm& a, const RationalForm& b) { return a + (-b); }

RationalForm operator*(const RationalForm& a, const RationalForm& b) {
  RationalForm r;
  r.den = a.den * b.den;
  for (const auto& [ma, pa] : a.num) {
    for (const auto& [mb, pb] : b.num) {
      Monomial m = product(ma, mb);
      while (!m.empty() && m.back() == 0) m.pop_back();
      accumulate(r.num, m, pa * pb);
    }
  }
  reduce(r);
  return r;
}

RationalForm FormBuilder::build(const Expr& e, int shift) {
  RationalForm n = RationalForm::polynomial(Polynomial({Rational(-shift), Rational(1)}));
  return walk(e, n, {});
}

RationalForm FormBuilder::divide(const RationalForm& a, const RationalForm& b) {
  if (!b.symbol_free()) throw NotRational{"a division by a sum"};
  Polynomial p = b.free_numerator();
  if (p.is_zero()) throw NotRational{"a division by zero"};
  nonzero_.push_back(p);
  RationalForm r;
  r.den = a.den * p;
  for (const auto& [m, q] : a.num) accumulate(r.num, m, q * b.den);
  reduce(r);
  return r;
}

size_t FormBuilder::symbol(const std::string& key, const std::string& name) {
  auto [it, fresh] = index_.emplace(key, names_.size());
  if (fresh) names_.push_back(name);
  return it->second;
}

RationalForm FormBuilder::walk(const Expr& e, const RationalForm& n,
                               const std::map<std::string, RationalForm>& bound) {
  switch (e.kind) {
    case ExprKind::kNumber:
      return RationalForm::constant(e.number);
    case ExprKind::kVariable:
      return n;
    case ExprKind::kBound: {
      auto it = bound.find(e.name);
      if (it == bound.end()) throw NotRational{"'" + e.name + "' outside its sum"};
      return it->second;
    }
    case ExprKind::kAdd:
      return walk(*e.args[0], n, bound) + walk(*e.args[1], n, bound);
    case ExprKind::kSub:
      return walk(*e.args[0], n, bound) - walk(*e.args[1], n, bound);
    case ExprKind::kMul:
      return walk(*e.args[0], n, bound) * walk(*e.args[1], n, bound);
    case ExprKind::kNeg:
      return -walk(*e.args[0], n, bound);
    case ExprKind::kDiv:
      return divide(walk(*e.args[0], n, bound), walk(*e.args[1], n, bound));
    case ExprKind::kPow: {
      if (mentions_n(*e.args[1]) || has_free_bound(*e.args[1]))
        throw NotRational{"the power " + print(e) + " has a variable exponent"};
      BigInt k = whole_constant(walk(*e.args[1], n, bound), *e.args[1], "the exponent");
      if (k > kMostOffset || k < -kMostOffset)
        throw NotRational{"the exponent of " + print(e) + " is too large"};
      RationalForm base = walk(*e.args[0], n, bound);
      RationalForm r = RationalForm::constant(1);
      for (BigInt i = 0; i < abs(k); ++i) r = r * base;
      return k < 0 ? divide(RationalForm::constant(1), r) : r;
    }
    case ExprKind::kCall: {
      if (e.name != function_ && !mentions_n(e) && !has_free_bound(e) && !contains_sum(e)) {
        std::optional<RealNumber> v = constant_value(e);
        if (v && v->is_rational()) return RationalForm::constant(v->rational());
      }
      throw NotRational{print(e) + " is not a rational function of n"};
    }
    case ExprKind::kSum:
      return sum(e, n, bound);
    default:
      throw NotRational{"a condition inside an expression"};
  }
}

RationalForm FormBuilder::sum(const Expr& e, const RationalForm& n,
                              const std::map<std::string, RationalForm>& bound) {
  const Expr& body = *e.args[2];
  BigInt lo = whole_constant(walk(*e.args[0], n, bound), *e.args[0], "the lower limit");
  RationalForm hi = walk(*e.args[1], n, bound);
  auto with = [&](const RationalForm& value) {
    std::map<std::string, RationalForm> inner = bound;
    inner[e.name] = value;
    return walk(body, n, inner);
  };
  if (std::optional<Rational> c = constant_of(hi)) {
    if (denominator(*c) != 1)
      throw NotRational{"the upper limit of " + print(e) + " is no whole number"};
    BigInt top = numerator(*c);
    if (top - lo >= kMostConstantTerms) throw NotRational{print(e) + " has too many terms"};
    RationalForm total;
    for (BigInt j = lo; j <= top; ++j) total = total + with(RationalForm::constant(Rational(j)));
    return total;
  }
  // hi = n + e: one polynomial of degree 1 and leading coefficient 1 over a constant.
  if (!hi.symbol_free() || hi.den.degree() != 0 || hi.free_numerator().degree() != 1)
    throw NotRational{"the upper limit of " + print(e) + " is not n plus a constant"};
  Polynomial top = hi.free_numerator();
  Rational d = hi.den.coefficient(0);
  if (top.coefficient(1) / d != 1 || denominator(top.coefficient(0) / d) != 1)
    throw NotRational{"the upper limit of " + print(e) + " is not n plus a whole constant"};
  BigInt offset = numerator(top.coefficient(0) / d);
  if (offset > kMostOffset || offset < -kMostOffset)
    throw NotRational{"the upper limit of " + print(e) + " is too far from n"};
  std::vector<const Expr*> calls;
  collect_calls(e.args[2], function_, calls);
  if (!calls.empty()) {
    bool plain = body.kind == ExprKind::kCall && body.name == function_ && body.args.size() == 1 &&
                 body.args[0]->kind == ExprKind::kBound && body.args[0]->name == e.name;
    if (!allow_function_sums_ || !plain)
      throw NotRational{print(e) + " sums over " + function_ + "'s values"};
    auto [it, fresh] = function_sums_.emplace(std::pair{lo, offset}, names_.size());
    if (fresh) names_.push_back(print(e));
    return RationalForm::symbol(it->second);
  }
  if (!sum_body_closed(e) || contains_sum(body))
    throw NotRational{"the body of " + print(e) + " depends on more than its own variable"};
  std::string own = "sum(" + e.name + ", " + lo.str() + ", n, " + print(body) + ")";
  RationalForm total = RationalForm::symbol(symbol(own, own));
  // S(n) = sum(j, lo, n, h(j)) and sum(j, lo, n + e, h(j)) differ by the
  // terms between n and n + e; both are plain sums from n >= lo - 1 and
  // n + e >= lo - 1 on.
  for (BigInt t = 1; t <= offset; ++t) {
    total = total + with(RationalForm::polynomial(Polynomial({Rational(t), Rational(1)})));
  }
  for (BigInt t = 0; t < -offset; ++t) {
    total = total - with(RationalForm::polynomial(Polynomial({Rational(-t), Rational(1)})));
  }
  valid_from_ = std::max({valid_from_, BigInt(lo - 1), BigInt(lo - 1 - offset)});
  return total;
}

std::optional<BigInt> nonzero_from(const std::vector<Polynomial>& nonzero, const BigInt& from,
                                   const BigInt& cap) {
  BigInt m = from;
  for (const Polynomial& p : nonzero) {
    if (p.degree() <= 0) continue;
    // Every root lies below the root bound R: none at n >= ceil(R). Below
    // it, Sturm's count says whether any real root is >= m.
    Rational r = p.root_bound();
    if (Rational(m) < r && p.count_real_roots(Rational(m) - Rational(1, 2), r) > 0) {
      m = ceil_of(r);
    }
  }
  if (m > cap) return std::nullopt;
  return m;
}

Polynomial summation_polynomial(const Polynomial& p) {
  // Q through x = -1, 0, ..., d + 1 (d = deg p), by Lagrange's formula.
  int d = std::max(p.degree(), 0);
  std::vector<Rational> xs, ys;
  Rational running = 0;
  xs.push_back(-1);
  ys.push_back(0);
  for (int k = 0; k <= d; ++k) {
    running += p(Rational(k));
    xs.push_back(k);
    ys.push_back(running);
  }
  Polynomial q;
  for (size_t i = 0; i < xs.size(); ++i) {
    Polynomial term({ys[i]});
    for (size_t j = 0; j < xs.size(); ++j) {
      if (j == i) continue;
      term = term * Polynomial({-xs[j] / (xs[i] - xs[j]), Rational(1) / (xs[i] - xs[j])});
    }
    q = q + term;
  }
  return q;
}

ExprPtr polynomial_expr(const Polynomial& p, const ExprPtr& x) {
  if (p.is_zero()) return make_number(Rational(0));
  const std::vector<Rational>& c = p.coefficients();
  ExprPtr acc = make_number(c.back());
  for (size_t i = c.size() - 1; i-- > 0;) {
    acc = make_binary(ExprKind::kMul, acc, x);
    if (c[i] != 0) acc = make_binary(ExprKind::kAdd, acc, make_number(c[i]));
  }
  return acc;
}

}  // namespace thetagate::engine
