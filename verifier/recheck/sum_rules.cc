// The rules for explicit bounds over a sum of earlier values, T(n) = A(n) +
// W(n)·sum(k, lo, hi, T(k)) (docs/design.md, "The re-checker"):
//
// - sum-difference: a closed form B with closed sums. The line at n - 1
//   (n > M) gives the sum as (T(n-1) - A(n-1))/W(n-1), so T(n) = A(n) +
//   W(n)·((T(n-1) - A(n-1))/W(n-1) + T(n-1)); B satisfies that identically
//   when the numerator of B(n) - (the right side with B) is the zero
//   polynomial in n and one symbol per closed sum, and no divisor met on
//   the way has a whole root past M. T = B exactly on n0..M starts it.
// - sum-step: a polynomial B on either side. For n > M on each residue
//   class the sum's range lies in [n0, n - 1], W(n) >= 0, and with Q the
//   polynomial summing B (Q(x) - Q(x - 1) = B(x), Q(-1) = 0, solved here)
//   the slack B(n) - A(n) - W(n)(Q(hi) - Q(lo - 1)) is >= 0 (reversed
//   below).
#include <algorithm>
#include <map>
#include <optional>

#include "verifier/numbers/polynomial.h"
#include "verifier/recheck/rule_support.h"

namespace thetagate::engine::recheck {
namespace {

// The most terms between two upper limits of a closed sum, the largest
// power and degree followed, and the most whole numbers tried as roots.
constexpr int64_t kMaxOffset = 64;
constexpr int64_t kMaxPower = 64;
constexpr int kMaxDegree = 16;
const BigInt kMaxRootTries = 100000;
// The longest exact range: the evaluator adds T's full-history sums term
// by term, so a range costs its square (1,024 sizes: a few seconds).
const BigInt kLongestRange = 1024;
// The largest fraction followed: degree in n and terms of the numerator
// (a product of many powers would otherwise grow without bound).
constexpr int kMaxFractionDegree = 256;
constexpr size_t kMaxFractionTerms = 256;

const Polynomial kOne({Rational(1)});
const Polynomial kX({Rational(0), Rational(1)});

// Exponents of the closed sums' symbols, by index; no trailing zeros.
using Powers = std::vector<int>;

// sum over p of num[p](x)·S^p / den(x): a rational function of n whose
// numerator is a polynomial in the symbols. No zero entries in num.
struct Fraction {
  std::map<Powers, Polynomial> num;
  Polynomial den = kOne;

  static Fraction of(const Polynomial& p) {
    Fraction f;
    if (!p.is_zero()) f.num[{}] = p;
    return f;
  }
  bool symbol_free() const {
    return num.empty() || (num.size() == 1 && num.begin()->first.empty());
  }
  Polynomial free_part() const {
    auto it = num.find({});
    return it == num.end() ? Polynomial() : it->second;
  }
};

void accumulate(std::map<Powers, Polynomial>& into, const Powers& p, const Polynomial& c) {
  Polynomial sum = into.count(p) ? into[p] + c : c;
  if (sum.is_zero()) {
    into.erase(p);
  } else {
    into[p] = sum;
  }
}

Fraction operator+(const Fraction& a, const Fraction& b) {
  Fraction out;
  out.den = a.den * b.den;
  for (const auto& [p, c] : a.num) accumulate(out.num, p, c * b.den);
  for (const auto& [p, c] : b.num) accumulate(out.num, p, c * a.den);
  return out;
}

Fraction operator*(const Fraction& a, const Fraction& b) {
  int degree = a.den.degree() + b.den.degree();
  for (const auto& [p, c] : a.num) degree = std::max(degree, c.degree() + b.den.degree());
  for (const auto& [p, c] : b.num) degree = std::max(degree, c.degree() + a.den.degree());
  if (degree > kMaxFractionDegree || a.num.size() * b.num.size() > kMaxFractionTerms)
    throw Unsupported("the algebra grows past degree " + std::to_string(kMaxFractionDegree) +
                      " or " + std::to_string(kMaxFractionTerms) + " terms");
  Fraction out;
  out.den = a.den * b.den;
  for (const auto& [p, c] : a.num)
    for (const auto& [q, d] : b.num) {
      Powers pq(std::max(p.size(), q.size()), 0);
      for (size_t i = 0; i < pq.size(); ++i)
        pq[i] = (i < p.size() ? p[i] : 0) + (i < q.size() ? q[i] : 0);
      accumulate(out.num, pq, c * d);
    }
  return out;
}

Fraction operator-(const Fraction& a) { return Fraction::of(Polynomial({Rational(-1)})) * a; }
Fraction operator-(const Fraction& a, const Fraction& b) { return a + -b; }

// The numerator and denominator divided by their common factor (the value
// is unchanged wherever the old denominator was not zero).
void cancel(Fraction& f) {
  Polynomial g = f.den;
  for (const auto& [p, c] : f.num) g = Polynomial::gcd(g, c);
  Polynomial q, rest;
  for (auto& [p, c] : f.num) {
    Polynomial::divide(c, g, q, rest);
    c = q;
  }
  Polynomial::divide(f.den, g, q, rest);
  f.den = q;
}

// Whether p has no whole root n >= from: Sturm's count on (from - 1, R]
// (R Cauchy's bound), then p at each whole number up to R. nullopt: too
// many to try; otherwise the first root, if any.
std::optional<std::optional<BigInt>> whole_root_from(const Polynomial& p, const BigInt& from) {
  if (p.is_zero()) return std::optional<BigInt>(from);
  if (p.degree() == 0) return std::optional<BigInt>();
  BigInt top = ceil_of(p.root_bound());
  if (top < from || p.count_real_roots(Rational(from - 1), Rational(top)) == 0)
    return std::optional<BigInt>();
  if (top - from > kMaxRootTries) return std::nullopt;
  for (BigInt n = from; n <= top; ++n)
    if (p.sign_at(Rational(n)) == 0) return std::optional<BigInt>(n);
  return std::optional<BigInt>();
}

std::string text_of(const Polynomial& p) {
  std::string s = p.str();
  std::replace(s.begin(), s.end(), 'x', 'n');
  return s;
}

// Expressions as Fractions in x, with the size n read as x - shift. A sum
// sum(j, c, x + e, g(j)) with g a rational function of j alone becomes
// S + g(x) + ... + g(x + e) (or S minus the terms past x + e), S =
// sum(j, c, x - 1, g(j)) its symbol; `valid_from` is where every such
// relation holds (both ranges plain or empty). Every divisor's numerator
// is kept: none may vanish where the forms stand for the values.
class Algebra {
 public:
  explicit Algebra(std::string name) : name_(std::move(name)) {}

  Fraction build(const Expr& e, int shift) {
    return walk(e, kX - Polynomial({Rational(shift)}), {}, divisors_);
  }
  Fraction divide(const Fraction& a, const Fraction& b, std::vector<Polynomial>& divisors) {
    if (!b.symbol_free()) throw Unsupported("a division by a closed sum");
    Polynomial top = b.free_part();
    if (top.is_zero()) throw Unsupported("a division by zero");
    divisors.push_back(top);
    Fraction out = a * Fraction::of(b.den);
    out.den = out.den * top;
    cancel(out);
    return out;
  }
  const std::vector<Polynomial>& divisors() const { return divisors_; }
  std::vector<Polynomial>& divisors() { return divisors_; }
  const BigInt& valid_from() const { return valid_from_; }
  const std::vector<std::string>& symbols() const { return names_; }

 private:
  using Bindings = std::map<std::string, Polynomial>;

  Fraction walk(const Expr& e, const Polynomial& n, const Bindings& bound,
                std::vector<Polynomial>& divisors) {
    switch (e.kind) {
      case ExprKind::kNumber:
        return Fraction::of(Polynomial({e.number}));
      case ExprKind::kVariable:
        return Fraction::of(n);
      case ExprKind::kBound: {
        auto it = bound.find(e.name);
        if (it == bound.end()) throw Unsupported("the free variable " + e.name);
        return Fraction::of(it->second);
      }
      case ExprKind::kAdd:
        return walk(*e.args[0], n, bound, divisors) + walk(*e.args[1], n, bound, divisors);
      case ExprKind::kSub:
        return walk(*e.args[0], n, bound, divisors) - walk(*e.args[1], n, bound, divisors);
      case ExprKind::kNeg:
        return -walk(*e.args[0], n, bound, divisors);
      case ExprKind::kMul:
        return walk(*e.args[0], n, bound, divisors) * walk(*e.args[1], n, bound, divisors);
      case ExprKind::kDiv:
        return divide(walk(*e.args[0], n, bound, divisors), walk(*e.args[1], n, bound, divisors),
                      divisors);
      case ExprKind::kPow: {
        const Expr& k = *e.args[1];
        if (mentions_n(k) || has_free_bound(k) || contains_sum(k) || calls_function(k, name_))
          throw Unsupported("the power " + print(e));
        RealNumber v = constant_value(k);
        if (!v.is_rational() || denominator(v.rational()) != 1 ||
            abs(numerator(v.rational())) > kMaxPower)
          throw Unsupported("the power " + print(e) + " is not a small whole power");
        int64_t times = static_cast<int64_t>(numerator(v.rational()));
        Fraction base = walk(*e.args[0], n, bound, divisors), out = Fraction::of(kOne);
        for (int64_t i = 0; i < std::abs(times); ++i) out = out * base;
        return times < 0 ? divide(Fraction::of(kOne), out, divisors) : out;
      }
      case ExprKind::kSum:
        return closed_sum(e, n, bound, divisors);
      default:
        throw Unsupported("no rational function of n and closed sums: " + print(e));
    }
  }

  Fraction closed_sum(const Expr& e, const Polynomial& n, const Bindings& bound,
                      std::vector<Polynomial>& divisors) {
    const Expr &lo = *e.args[0], &hi = *e.args[1], &g = *e.args[2];
    if (!bound.empty() || mentions_n(lo) || has_free_bound(lo) || contains_sum(lo) ||
        mentions_n(g) || contains_sum(g) || calls_function(g, name_))
      throw Unsupported(
          "a sum other than sum(j, c, n + e, g(j)) with g a rational function of j: " + print(e));
    RealNumber c = constant_value(lo);
    if (!c.is_rational() || denominator(c.rational()) != 1)
      throw Unsupported("the sum's lower limit " + print(lo) + " is not whole");
    BigInt first = numerator(c.rational());
    // The upper limit must be x + offset.
    Fraction top = walk(hi, n, bound, divisors);
    Polynomial t = top.free_part();
    if (!top.symbol_free() || top.den.degree() != 0 || t.degree() != 1 ||
        t.coefficient(1) != top.den.coefficient(0))
      throw Unsupported("the sum's upper limit " + print(hi) + " is not n plus a whole number");
    Rational offset = t.coefficient(0) / top.den.coefficient(0);
    if (denominator(offset) != 1 || abs(numerator(offset)) > kMaxOffset)
      throw Unsupported("the sum's upper limit " + print(hi) +
                        " is not n plus a small whole number");
    int64_t off = static_cast<int64_t>(numerator(offset));
    // g as a function of j, reduced: its text names the symbol, and its
    // divisors may not vanish at any j >= first.
    std::vector<Polynomial> in_j;
    Fraction gj = walk(g, n, {{e.name, kX}}, in_j);
    cancel(gj);
    Rational lead = gj.den.leading();
    std::string key = text_of(gj.free_part() * Polynomial({1 / lead})) + " / " +
                      text_of(gj.den * Polynomial({1 / lead})) + " from " + first.str();
    in_j.push_back(gj.den);
    for (const Polynomial& d : in_j) {
      auto root = whole_root_from(d, first);
      if (!root) throw Unsupported("the divisors of " + print(g) + " have too many candidates");
      if (*root)
        throw Unsupported("the sum " + print(e) + " divides by zero at " + e.name + " = " +
                          (*root)->str());
    }
    auto [it, added] = index_.emplace(key, names_.size());
    if (added) names_.push_back(print(e));
    Powers p(it->second + 1, 0);
    p.back() = 1;
    Fraction out;
    out.num[p] = kOne;
    // Terms between x - 1 and x + off, added or taken away.
    for (int64_t i = off >= 0 ? 0 : off + 1; i <= (off >= 0 ? off : -1); ++i) {
      Fraction term = walk(g, n, {{e.name, kX + Polynomial({Rational(i)})}}, divisors);
      out = off >= 0 ? out + term : out - term;
    }
    // Both sums plain or empty: x - 1 >= first - 1 and x + off >= first - 1.
    valid_from_ = std::max({valid_from_, first, BigInt(first - 1 - off)});
    return out;
  }

  std::string name_;
  std::vector<Polynomial> divisors_;
  std::map<std::string, size_t> index_;
  std::vector<std::string> names_;
  BigInt valid_from_ = 0;
};

// The claim's closed form for an explicit bound proved over sums: both
// sides alike (or one side), neither strict.
struct Closed {
  ExprPtr b;
  std::vector<Side> sides;
};

Closed closed_of(const Bound& bound) {
  if (bound.is_asymptotic()) throw Unsupported("an asymptotic bound proved over sums");
  if (bound.strict_upper || bound.strict_lower) throw Unsupported("a strict bound over sums");
  Closed c;
  if (bound.upper) c.sides.push_back(Side::kUpper);
  if (bound.lower) c.sides.push_back(Side::kLower);
  c.b = bound.upper ? bound.upper : bound.lower;
  return c;
}

// T(n) = e(n) exactly for every n in [lo, hi].
void require_equal(SmallEvaluator& eval, const ExprPtr& e, const std::string& name,
                   const BigInt& lo, const BigInt& hi, int& count) {
  if (hi - lo > kLongestRange) throw Unsupported("an exact range too long for full-history sums");
  for (BigInt n = lo; n <= hi; ++n) {
    Value t = eval.at(n), b = eval.value(*e, n);
    if (eval.sign_of_difference(t, b) != 0)
      throw Rejected{name + "(n) = " + print(*e) + " for " + lo.str() + " <= n <= " + hi.str() +
                     " fails at n = " + n.str() + ": " + name + "(n) = " + t.str() + ", bound " +
                     b.str()};
  }
  ++count;
}

// The certificate's M: the exact range is n0..M, the step n > M.
BigInt range_end(const Bound& bound, const CertificateData& c) {
  BigInt m = parse_size(c.checked_to, "end of the exact range");
  if (bound.n0 > m)
    throw Unsupported("the exact range ends at " + m.str() +
                      ", before the bound's n0 = " + bound.n0.str());
  if (m - bound.n0 > kLongestRange)
    throw Unsupported("an exact range too long for full-history sums");
  return m;
}

// An exact polynomial in n as an expansion in x = n + shift.
Expansion expansion_of(const Polynomial& p, const Rational& shift) {
  Polynomial in_x = p.shifted(-shift);
  Expansion out = constant(Coef::of(Rational(0)));
  for (int k = 0; k <= in_x.degree(); ++k) {
    if (in_x.coefficient(k) == 0) continue;
    out = add(out, Expansion{{Term{Key{1, RealNumber(static_cast<long>(k)), 0},
                                   Coef::of(in_x.coefficient(k))}}});
  }
  return out;
}

// q(s·x + t).
Polynomial at_affine(const Polynomial& q, const Rational& s, const Rational& t) {
  if (s == 0) return Polynomial({q(t)});
  return q.shifted(t).scaled(s);
}

// B as an exact polynomial in n (from the expansions), else Unsupported.
Polynomial polynomial_of(const Expr& b, const Recurrence& r) {
  std::vector<Rational> coefficients;
  for (const Term& t : expand(b, Context{BigInt(4), 1, 0, &r.helpers}).terms) {
    if (t.key.rho != 1 || t.key.beta != 0 || !t.key.alpha.is_integer() || t.key.alpha.sign() < 0 ||
        !t.coef.exact || t.key.alpha.rational() > kMaxDegree)
      throw Unsupported("the bound " + print(b) + " is not a polynomial in n");
    size_t d = static_cast<size_t>(numerator(t.key.alpha.rational()));
    coefficients.resize(std::max(coefficients.size(), d + 1));
    coefficients[d] += *t.coef.exact;
  }
  return Polynomial(coefficients);
}

// Q with Q(x) - Q(x - 1) = p(x) and Q(-1) = 0: the difference lowers a
// degree by one and multiplies its leading coefficient by it, so Q is
// solved from the top degree down, then checked exactly.
Polynomial summed(const Polynomial& p) {
  auto difference = [](const Polynomial& q) { return q - q.shifted(Rational(-1)); };
  Polynomial q;
  for (int j = p.degree(); j >= 0; --j)
    q = q + Polynomial::monomial((p - difference(q)).coefficient(j) / (j + 1), j + 1);
  q = q - Polynomial({q(Rational(-1))});
  if (!(difference(q) == p) || q(Rational(-1)) != 0)
    throw Unsupported("the sum of " + text_of(p) + " has no polynomial closed form");
  return q;
}

}  // namespace

void sum_difference(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count) {
  if (!r.class_terms.empty()) throw Unsupported("a growth class written inside the recurrence");
  Closed closed = closed_of(bound);
  if (bound.upper && bound.lower && !same_tree(*bound.upper, *bound.lower))
    throw Unsupported("two sides that differ: differencing carries one closed form");
  const std::string& name = r.main.name;
  BigInt m = range_end(bound, c);
  // The line must apply at n - 1 for every n > M: at every n >= M.
  for (const CaseLine& p : r.main.points)
    if (*p.point >= m)
      throw Rejected{"the point case " + name + "(" + p.point->str() + ") lies at or past M = " +
                     m.str() + ": the line does not apply at n - 1 for every n > M"};
  Context at_m{m, 1, 0, &r.helpers};
  const CaseLine& line = line_on_class(r.main, at_m);
  SumLine sl = sum_line_of(line.body, name);
  const Expr& k0 = *sl.sum->args[0];
  auto top = as_affine(expand(*sl.sum->args[1], at_m));
  if (mentions_n(k0) || contains_sum(k0) || !top || *top != std::pair{Rational(1), Rational(-1)})
    throw Unsupported("a sum other than sum(k, k0, n - 1, " + name + "(k))");
  RealNumber start = constant_value(k0);
  if (!start.is_rational() || denominator(start.rational()) != 1)
    throw Unsupported("the sum's lower limit " + print(k0) + " is not whole");
  // U(n) = U(n - 1) + T(n - 1) needs the sum at n - 1 plain or empty.
  if (Rational(m) < start.rational())
    throw Rejected{"the sum starts at k = " + print(k0) + ", past M = " + m.str()};
  if (calls_function(*closed.b, name)) throw Unsupported("the bound calls " + name);
  ++count;

  // B(n) - A(n) - W(n)((B(n - 1) - A(n - 1))/W(n - 1) + B(n - 1)), in n and
  // the closed sums' symbols.
  Algebra alg(name);
  Fraction a0 = alg.build(*sl.a, 0), w0 = alg.build(*sl.w, 0);
  Fraction a1 = alg.build(*sl.a, 1), w1 = alg.build(*sl.w, 1);
  Fraction b0 = alg.build(*closed.b, 0), b1 = alg.build(*closed.b, 1);
  if (!w1.symbol_free()) throw Unsupported("a factor of the sum that is itself a sum");
  Fraction residual = b0 - (a0 + w0 * (alg.divide(b1 - a1, w1, alg.divisors()) + b1));
  const BigInt from = m + 1;
  if (alg.valid_from() > from)
    throw Rejected{"the closed sums' relations hold only from n = " + alg.valid_from().str() +
                   "; the step starts at n = " + from.str()};
  for (const Polynomial& d : alg.divisors()) {
    auto root = whole_root_from(d, from);
    if (!root) throw Unsupported("the divisor " + text_of(d) + " has too many candidate roots");
    if (*root)
      throw Rejected{"the divisor " + text_of(d) + " vanishes at n = " + (*root)->str() +
                     " > M = " + m.str()};
  }
  ++count;
  SmallEvaluator eval(r);
  require_equal(eval, closed.b, name, bound.n0, m, count);
  if (!residual.num.empty()) {
    // Not an identity: a size past M where T and B differ rejects for
    // sure; without one the re-checker cannot follow.
    require_equal(eval, closed.b, name, from, from + 15, count);
    std::string num;
    for (const auto& [p, coefficient] : residual.num) {
      std::string term = "(" + text_of(coefficient) + ")";
      for (size_t i = 0; i < p.size(); ++i)
        for (int k = 0; k < p[i]; ++k) term += "·S" + std::to_string(i + 1);
      num += (num.empty() ? "" : " + ") + term;
    }
    std::string symbols;
    for (size_t i = 0; i < alg.symbols().size(); ++i)
      symbols += ", S" + std::to_string(i + 1) + " = " + alg.symbols()[i];
    throw Unsupported("the step's identity leaves the numerator " + num + symbols);
  }
  ++count;
}

void sum_step(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count) {
  if (!r.class_terms.empty()) throw Unsupported("a growth class written inside the recurrence");
  Closed closed = closed_of(bound);
  const std::string& name = r.main.name;
  BigInt m = range_end(bound, c);
  BigInt modulus = parse_size(c.modulus, "modulus");
  if (modulus < 1 || modulus > 720)
    throw Rejected{"the modulus " + modulus.str() + " is out of range"};
  uint64_t L = static_cast<uint64_t>(modulus);
  const BigInt from = m + 1;
  SmallEvaluator eval(r);
  for (Side side : closed.sides) {
    const ExprPtr& b = side == Side::kUpper ? bound.upper : bound.lower;
    SideProof sp{side, b, false, b};
    require_range(eval, sp, b, bound.n0, m, count);
    Polynomial p = polynomial_of(*b, r);
    Polynomial q = summed(p);
    ++count;
    for (uint64_t res = 0; res < L; ++res) {
      Context ctx{from, L, res, &r.helpers};
      std::string where = " for every n > " + m.str() + class_name(ctx);
      SumLine sl = sum_line_of(line_on_class(r.main, ctx).body, name);
      BigInt first = from + floor_mod(BigInt(res) - from, modulus);
      auto limit = [&](const ExprPtr& e) {
        auto aff = as_affine(expand(*e, ctx));
        if (!aff)
          throw Rejected{"the sum's limit " + print(*e) + " is not exact modulo " + modulus.str() +
                         where};
        auto [s, t] = *aff;
        if (denominator(s * Rational(modulus)) != 1 || denominator(s * Rational(res) + t) != 1)
          throw Rejected{"the sum's limit " + print(*e) + " is not whole" + where};
        return *aff;
      };
      const auto [ls, lt] = limit(sl.sum->args[0]);
      const auto [hs, ht] = limit(sl.sum->args[1]);
      // Affine in n: each holds on the class iff at its first size and in
      // its slope. A failure names the first size or the slope.
      Rational n1 = Rational(first);
      auto fails = [&](const std::string& what, const Rational& slope, const Rational& at_first) {
        if (slope < 0)
          throw Rejected{what + " fails for large n (its margin falls by " + to_string(-slope) +
                         " per size)" + class_name(ctx)};
        if (at_first < 0)
          throw Rejected{what + " fails at n = " + first.str() +
                         ": lo = " + to_string(ls * n1 + lt) + ", hi = " + to_string(hs * n1 + ht)};
      };
      std::string lo_text = print(*sl.sum->args[0]), hi_text = print(*sl.sum->args[1]);
      fails(bound.n0.str() + " <= " + lo_text, ls, ls * n1 + lt - Rational(bound.n0));
      fails(hi_text + " <= n - 1", 1 - hs, (1 - hs) * n1 - ht - 1);
      fails(hi_text + " >= " + lo_text + " - 1", hs - ls, (hs - ls) * n1 + ht - lt + 1);
      ++count;
      require_shifted([&](const Context& shifted,
                          const Rational& shift) { return expand(*sl.w, shifted, 1, -shift); },
                      ctx, "W(n) = " + print(*sl.w) + " >= 0" + where, count);
      auto slack_in = [&](const Context& shifted, const Rational& shift) {
        // In x = n + shift: n = x - shift, so hi(n) = hs x + ht - hs shift.
        Polynomial sum_b =
            at_affine(q, hs, ht - hs * shift) - at_affine(q, ls, lt - 1 - ls * shift);
        Expansion rhs = add(expand(*sl.a, shifted, 1, -shift),
                            multiply(expand(*sl.w, shifted, 1, -shift), expansion_of(sum_b, 0)));
        Expansion slack = add(expansion_of(p, shift), negate(rhs));
        return side == Side::kLower ? negate(slack) : slack;
      };
      require_shifted(slack_in, ctx,
                      std::string("step: ") +
                          (side == Side::kUpper ? "B(n) - A(n) - W(n)(Q(hi) - Q(lo - 1))"
                                                : "A(n) + W(n)(Q(hi) - Q(lo - 1)) - B(n)") +
                          " >= 0" + where + ", B(n) = " + print(*b) + ", Q(n) = " + text_of(q),
                      count);
    }
  }
}

}  // namespace thetagate::engine::recheck
