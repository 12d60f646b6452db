// Induction on dyadic blocks (dyadic.h; docs/design.md, "Induction on
// dyadic blocks"). Why a proof built here proves the claim:
//
// The step. Past the exact range every n >= 2^(k0+1) is 2m + r with
// r in {0, 1} and m in a block [P, 2P), P = 2^k, k >= k0, and T's only
// line there is T(n) = sum a_i T(arg_i) + f(n) with each arg_i a whole
// linear form in m, P (floor(n/2) = m, ceil(n/2) = m + r). The block is
// split into pieces: the edge sizes m = P + j (0 <= j < kEdge) and
// m = 2P - j (1 <= j <= kEdge), where every size is b·P + c with b a power
// of two and |c| small, and the interior P + kEdge <= m <= 2P - kEdge,
// where a·m + b·P + c (a >= 1, |c| < a·kEdge) lies strictly between two
// consecutive powers of two times P. On each piece floor(lg q), ceil(lg q),
// 2^floor(lg q) and 2^ceil(lg q) of every size q met are therefore
// polynomials in P and k, and B(n) - (sum a_i B(arg_i) + f(n)) is a
// polynomial in m, P, k: when it is the zero polynomial it vanishes for
// every m, P and k, so T(arg_i) = B(arg_i) (strong induction: every arg_i is
// at least P >= 2^k0, within the exact range's start, and below n) gives
// T(n) = B(n).
//
// The comparison. With T = E proved, B - E on the block [P, 2P) is, in
// x = n/P and L = lg x (lg n = k + L), a polynomial in P, k whose
// coefficients are polynomials in x and L; at n = P itself (x = 1) ceil(lg n)
// is k, elsewhere k + 1, so n = P is its own piece. Grouping by powers
// P^i k^j, the leading group's coefficient is bounded below on [1, 2] by
// certified interval arithmetic and the others' above in absolute value;
// from the k where the leading one outweighs the rest (each ratio
// 2^(-dk) k^e falling from there on) every block is covered, and the blocks
// below are checked one by one with P and k as numbers.
#include "verifier/derivation/dyadic.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <map>
#include <string>
#include <tuple>
#include <utility>
#include <vector>

#include "verifier/numbers/interval.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine {

namespace {

// Edge sizes taken one by one on each side of a block.
constexpr int64_t kEdge = 4;
// The smallest block the step is proved on: P >= 2^kFirstBlock, so that a
// size b·P + c near an edge (|c| < b·2^kFirstBlock/2) stays between b·P/2
// and 2b·P.
constexpr uint64_t kFirstBlock = 5;
// The largest claim start n0 the exact range may begin at (it runs to
// 2^(k0+1) with 2^k0 >= n0); larger starts use T's first size instead.
const BigInt kLargestExactStart = 4096;
// Exact values fitted for a closed form.
constexpr int64_t kFitSizes = 160;
// The largest power of k and of P, n in a closed form's basis.
constexpr int kMaxLogPower = 2;
constexpr int kMaxDegree = 3;
// Blocks a comparison may check one by one before its tail.
constexpr uint64_t kMaxSingleBlocks = 96;
// How deep the subdivision of [1, 2] may go (widths 2^-kMaxDepth).
constexpr int kMaxDepth = 44;
constexpr long kPrecision = 256;

// One attempt failed: caught in Prover::run.
struct Outside {
  std::string why;
};
// The recurrence is not one the method is for (some call does not halve
// n): no proof, and nothing to say (caught in Prover::run).
struct NotHalving {};

// ---- Polynomials in m, P = 2^k, k, x = n/2^k and L = lg x.

enum Var { kM = 0, kP, kK, kX, kL, kVarCount };
using Mono = std::array<int, kVarCount>;

class Poly {
 public:
  Poly() = default;
  explicit Poly(const Rational& c) {
    if (c != 0) t_[Mono{}] = c;
  }
  static Poly var(Var v, int power = 1) {
    Poly p;
    Mono m{};
    m[v] = power;
    p.t_[m] = 1;
    return p;
  }
  bool is_zero() const { return t_.empty(); }
  const std::map<Mono, Rational>& terms() const { return t_; }
  // The constant, when this is one.
  std::optional<Rational> constant() const {
    if (t_.empty()) return Rational(0);
    if (t_.size() == 1 && t_.begin()->first == Mono{}) return t_.begin()->second;
    return std::nullopt;
  }
  friend Poly operator+(Poly a, const Poly& b) {
    for (const auto& [m, c] : b.t_) a.add(m, c);
    return a;
  }
  friend Poly operator-(Poly a, const Poly& b) {
    for (const auto& [m, c] : b.t_) a.add(m, -c);
    return a;
  }
  friend Poly operator*(const Poly& a, const Poly& b) {
    Poly r;
    for (const auto& [ma, ca] : a.t_)
      for (const auto& [mb, cb] : b.t_) {
        Mono m;
        for (int v = 0; v < kVarCount; ++v) m[v] = ma[v] + mb[v];
        r.add(m, ca * cb);
      }
    return r;
  }
  void add(const Mono& m, const Rational& c) {
    if (c == 0) return;
    auto [it, fresh] = t_.emplace(m, c);
    if (!fresh) {
      it->second += c;
      if (it->second == 0) t_.erase(it);
    }
  }

 private:
  std::map<Mono, Rational> t_;
};

Poly pow_of(const Poly& p, uint64_t e) {
  Poly r(1);
  for (uint64_t i = 0; i < e; ++i) r = r * p;
  return r;
}

// ---- Sizes: what a piece knows of a whole number q.

// q = a·m + b·P + c, whole coefficients.
struct Lin {
  BigInt a, b, c;
};
Lin operator+(const Lin& x, const Lin& y) { return {x.a + y.a, x.b + y.b, x.c + y.c}; }
Lin operator-(const Lin& x, const Lin& y) { return {x.a - y.a, x.b - y.b, x.c - y.c}; }

struct Size {
  Poly value;
  std::optional<Poly> lg;  // lg q, where the context writes real logarithms
  Poly floor_lg, ceil_lg, pow_floor, pow_ceil;
  std::optional<Lin> lin;  // the step's pieces: q as a linear form
};

std::optional<int> exact_log2(const BigInt& b) {
  if (b <= 0 || (b & (b - 1)) != 0) return std::nullopt;
  return static_cast<int>(bit_length(b) - 1);
}

Poly pow2(int t) {
  return t >= 0 ? Poly(Rational(BigInt(1) << t)) : Poly(Rational(1, BigInt(1) << -t));
}

// The size q = lin on a piece of the step (m in the interior when a > 0).
Size size_of(const Lin& q) {
  Size s;
  s.lin = q;
  s.value = Poly(Rational(q.a)) * Poly::var(kM) + Poly(Rational(q.b)) * Poly::var(kP) +
            Poly(Rational(q.c));
  Poly k = Poly::var(kK), p = Poly::var(kP);
  if (q.a < 0 || q.b < 0) throw Outside{"a size with a negative part in the block"};
  int t = 0;
  if (q.a == 0) {
    std::optional<int> e = exact_log2(q.b);
    if (!e) throw Outside{"a size that is not a power of two times 2^k near a block's edge"};
    // Between 2^(t-1)·P and 2^(t+1)·P: |c| < 2^t·P/2, P >= 2^kFirstBlock.
    if (abs(q.c) >= (q.b << kFirstBlock) / 2) throw Outside{"a size too far from a block's edge"};
    t = *e;
    int below = q.c < 0 ? -1 : 0, above = q.c > 0 ? 1 : 0;
    s.floor_lg = k + Poly(Rational(t + below));
    s.ceil_lg = k + Poly(Rational(t + above));
    s.pow_floor = pow2(t + below) * p;
    s.pow_ceil = pow2(t + above) * p;
    return s;
  }
  // Interior: (a + b)P + a·kEdge + c <= q <= (2a + b)P - a·kEdge + c.
  if (abs(q.c) >= q.a * kEdge) throw Outside{"a size too far from m inside a block"};
  BigInt lo = q.a + q.b, hi = 2 * q.a + q.b;
  t = static_cast<int>(bit_length(lo) - 1);
  if (hi > (BigInt(1) << (t + 1))) throw Outside{"a size that spans a power of two in a block"};
  s.floor_lg = k + Poly(Rational(t));
  s.ceil_lg = k + Poly(Rational(t + 1));
  s.pow_floor = pow2(t) * p;
  s.pow_ceil = pow2(t + 1) * p;
  return s;
}

// n on the comparison's block [P, 2P): the interior (x in (1, 2)) or n = P.
Size block_size(bool edge) {
  Size s;
  Poly k = Poly::var(kK), p = Poly::var(kP);
  s.value = edge ? p : Poly::var(kX) * p;
  s.lg = edge ? k : k + Poly::var(kL);
  s.floor_lg = k;
  s.ceil_lg = edge ? k : k + Poly(1);
  s.pow_floor = p;
  s.pow_ceil = edge ? p : Poly(2) * p;
  return s;
}

std::optional<BigInt> whole(const Expr& e) {
  if (e.kind != ExprKind::kNumber || denominator(e.number) != 1) return std::nullopt;
  return numerator(e.number);
}

bool is_lg_call(const Expr& e) {
  return e.kind == ExprKind::kCall && (e.name == "lg" || e.name == "log2") && e.args.size() == 1;
}

// Translates expressions of n into polynomials on one piece.
class Translator {
 public:
  // `calls`: what a call of the recursive function (its argument, n) becomes
  // (null: refused).
  using Calls = std::function<Poly(const Expr& arg, const Size& n)>;
  Translator(const std::string& function, Calls calls)
      : function_(function), calls_(std::move(calls)) {}

  Poly poly(const Expr& e, const Size& n) const {
    switch (e.kind) {
      case ExprKind::kNumber:
        return Poly(e.number);
      case ExprKind::kVariable:
        return n.value;
      case ExprKind::kAdd:
        return poly(*e.args[0], n) + poly(*e.args[1], n);
      case ExprKind::kSub:
        return poly(*e.args[0], n) - poly(*e.args[1], n);
      case ExprKind::kNeg:
        return Poly(0) - poly(*e.args[0], n);
      case ExprKind::kMul:
        return poly(*e.args[0], n) * poly(*e.args[1], n);
      case ExprKind::kDiv: {
        std::optional<Rational> d = poly(*e.args[1], n).constant();
        if (!d || *d == 0) throw Outside{"a division by something other than a constant"};
        return poly(*e.args[0], n) * Poly(1 / *d);
      }
      case ExprKind::kPow:
        return power(e, n);
      case ExprKind::kCall:
        return call(e, n);
      default:
        throw Outside{"an expression outside polynomials in n, lg n and dyadic floors"};
    }
  }

  // The whole number an argument stands for, as a linear form.
  Lin lin(const Expr& e, const Size& n, bool floor_quotient) const {
    switch (e.kind) {
      case ExprKind::kNumber:
        if (std::optional<BigInt> w = whole(e)) return {0, 0, *w};
        break;
      case ExprKind::kVariable:
        if (n.lin) return *n.lin;
        break;
      case ExprKind::kAdd:
        return lin(*e.args[0], n, false) + lin(*e.args[1], n, false);
      case ExprKind::kSub:
        return lin(*e.args[0], n, false) - lin(*e.args[1], n, false);
      case ExprKind::kDiv:
        if (floor_quotient) return divided(e, n, true);
        break;
      case ExprKind::kCall:
        if ((e.name == "floor" || e.name == "ceil") && e.args.size() == 1 &&
            e.args[0]->kind == ExprKind::kDiv) {
          return divided(*e.args[0], n, e.name == "floor");
        }
        break;
      default:
        break;
    }
    throw Outside{"an argument that is not n, floor(n/2^j) or ceil(n/2^j) plus a constant"};
  }

 private:
  Lin divided(const Expr& quotient, const Size& n, bool down) const {
    Lin u = lin(*quotient.args[0], n, false);
    std::optional<BigInt> d = whole(*quotient.args[1]);
    if (!d || *d <= 0 || u.a % *d != 0 || u.b % *d != 0) {
      throw Outside{"a quotient whose rounding depends on more than the residue of n"};
    }
    BigInt c = u.c / *d, rem = u.c % *d;  // truncated: fix toward -inf / +inf
    if (rem != 0 && down && u.c < 0) c -= 1;
    if (rem != 0 && !down && u.c > 0) c += 1;
    return {u.a / *d, u.b / *d, c};
  }

  Size argument_size(const Expr& arg, const Size& n) const {
    if (arg.kind == ExprKind::kVariable) return n;
    if (!n.lin) throw Outside{"a logarithm of something other than n"};
    return size_of(lin(arg, n, false));
  }

  Poly power(const Expr& e, const Size& n) const {
    const Expr& base = *e.args[0];
    const Expr& exp = *e.args[1];
    if (std::optional<BigInt> w = whole(exp); w && *w >= 0 && *w <= 16) {
      return pow_of(poly(base, n), static_cast<uint64_t>(*w));
    }
    std::optional<BigInt> b = whole(base);
    if (b && *b == 2) return pow2_of(exp, n);
    throw Outside{"a power other than a whole constant power or 2^floor(lg n)"};
  }

  // 2^exp for exp = floor(lg q) or ceil(lg q) plus or minus a whole constant.
  Poly pow2_of(const Expr& exp, const Size& n) const {
    if (std::optional<BigInt> w = whole(exp); w && abs(*w) <= 64) {
      return pow2(static_cast<int>(*w));
    }
    if ((exp.kind == ExprKind::kAdd || exp.kind == ExprKind::kSub)) {
      for (int side = 0; side < 2; ++side) {
        std::optional<BigInt> w = whole(*exp.args[side]);
        if (!w || abs(*w) > 64 || (side == 0 && exp.kind == ExprKind::kSub)) continue;
        int shift = static_cast<int>(*w) * (side == 1 && exp.kind == ExprKind::kSub ? -1 : 1);
        return pow2(shift) * pow2_of(*exp.args[1 - side], n);
      }
    }
    if (exp.kind == ExprKind::kCall && (exp.name == "floor" || exp.name == "ceil") &&
        exp.args.size() == 1 && is_lg_call(*exp.args[0])) {
      Size q = argument_size(*exp.args[0]->args[0], n);
      return exp.name == "floor" ? q.pow_floor : q.pow_ceil;
    }
    throw Outside{"a power of two other than 2^floor(lg n) or 2^ceil(lg n)"};
  }

  Poly call(const Expr& e, const Size& n) const {
    if (e.name == function_) {
      if (!calls_ || e.args.size() != 1) throw Outside{"a call of the recursive function here"};
      return calls_(*e.args[0], n);
    }
    if ((e.name == "floor" || e.name == "ceil") && e.args.size() == 1) {
      const Expr& inner = *e.args[0];
      if (is_lg_call(inner)) {
        Size q = argument_size(*inner.args[0], n);
        return e.name == "floor" ? q.floor_lg : q.ceil_lg;
      }
      if (n.lin) return size_of(lin(e, n, false)).value;
      throw Outside{"a floor or ceiling other than of lg n"};
    }
    if (is_lg_call(e)) {
      Size q = argument_size(*e.args[0], n);
      if (!q.lg) throw Outside{"lg of a size in the inductive step (only its floor and ceiling)"};
      return *q.lg;
    }
    throw Outside{"the function " + e.name + " (only floor, ceil and lg of n)"};
  }

  std::string function_;
  Calls calls_;
};

// ---- The step.

// T's only line past the point cases; the exact range must reach every point.
const CaseLine& recursive_line(const Recurrence& r, const BigInt& first_general) {
  const Function& f = r.main;
  if (!f.conditional.empty()) throw Outside{"T has case lines with conditions"};
  if (!f.fallback || f.fallback->calls.empty() || f.fallback->sums_calls) {
    throw Outside{"T has no recursive line of calls"};
  }
  if (!r.helpers.empty()) throw Outside{"T's line calls helper functions"};
  for (const CaseLine& p : f.points) {
    if (*p.point >= first_general) throw Outside{"a point case past the exact range"};
  }
  return *f.fallback;
}

// q >= lo as whole numbers on every piece of every block from 2^kFirstBlock
// on: the least of q - lo = a·m + b·P + c over the interior
// P + kEdge <= m <= 2P - kEdge (a != 0) is u·P + v, least at the smallest P.
bool at_least(const Lin& q, const Lin& lo) {
  Lin d = q - lo;
  BigInt u = d.b, v = d.c;
  if (d.a > 0) {
    u += d.a;
    v += d.a * kEdge;
  } else if (d.a < 0) {
    u += 2 * d.a;
    v -= d.a * kEdge;
  }
  if (u < 0) return false;
  return u * (BigInt(1) << kFirstBlock) + v >= 0;
}

// Proves the step identity for the carried form `b` past the block 2^k0.
// Returns the number of pieces checked.
uint64_t prove_step(const Recurrence& r, const ExprPtr& b, uint64_t k0, uint64_t& work,
                    uint64_t budget) {
  const CaseLine& line = recursive_line(r, BigInt(1) << (k0 + 1));
  uint64_t pieces = 0;
  for (int64_t rr = 0; rr <= 1; ++rr) {
    std::vector<Lin> ms;
    ms.push_back({1, 0, 0});
    for (int64_t j = 0; j < kEdge; ++j) ms.push_back({0, 1, j});
    for (int64_t j = 1; j <= kEdge; ++j) ms.push_back({0, 2, -j});
    for (const Lin& m : ms) {
      if (++work > budget) throw Outside{"the proof's work budget ran out"};
      Lin n{2 * m.a, 2 * m.b, 2 * m.c + rr};
      Size ns = size_of(n);
      Translator plain(r.main.name, nullptr);
      Translator step(r.main.name, [&](const Expr& e, const Size& at) {
        Lin arg = plain.lin(e, at, true);
        // Every argument at least P >= 2^k0 and below n: strong induction.
        if (!at_least(arg, {0, 1, 0}) || !at_least(n, arg + Lin{0, 0, 1})) {
          throw Outside{"a recursive call that leaves the blocks below n"};
        }
        return plain.poly(*b, size_of(arg));
      });
      Poly slack = plain.poly(*b, ns) - step.poly(*line.body, ns);
      if (!slack.is_zero()) {
        throw Outside{"the inductive step is no identity on the block's " +
                      std::string(m.a != 0 ? "interior" : "edge sizes") +
                      (rr == 0 ? " (n even)" : " (n odd)")};
      }
      ++pieces;
    }
  }
  return pieces;
}

// ---- Interval analysis of a polynomial in x and L = lg x on [lo, hi].

Interval hull(const Rational& lo, const Rational& hi) {
  Interval a(lo, kPrecision), b(hi, kPrecision), r(kPrecision);
  mpfi_union(r.raw(), a.raw(), b.raw());
  return r;
}

Interval ipow(const Interval& x, int e) {
  Interval r(Rational(1), kPrecision);
  for (int i = 0; i < std::abs(e); ++i) r = r * x;
  return e >= 0 ? r : Interval(Rational(1), kPrecision) / r;
}

// Σ c·x^a·L^b over the interval x (x > 0); with `derivative`, its derivative in x.
Interval enclose(const std::map<std::pair<int, int>, Rational>& f, const Interval& x,
                 bool derivative) {
  Interval lgx = x.log2();
  Interval inv_ln2 = Interval(Rational(1), kPrecision) / Interval(Rational(2), kPrecision).log();
  Interval sum(Rational(0), kPrecision);
  for (const auto& [ab, c] : f) {
    auto [a, b] = ab;
    Interval coef(c, kPrecision);
    if (!derivative) {
      sum = sum + coef * ipow(x, a) * ipow(lgx, b);
      continue;
    }
    if (a != 0)
      sum = sum + coef * Interval(Rational(a), kPrecision) * ipow(x, a - 1) * ipow(lgx, b);
    if (b != 0) {
      sum = sum +
            coef * Interval(Rational(b), kPrecision) * inv_ln2 * ipow(x, a - 1) * ipow(lgx, b - 1);
    }
  }
  return sum;
}

// A positive lower bound of f on [lo, hi], or nullopt when none is found
// (f may dip to 0 or below, or the subdivision ran out).
std::optional<Rational> lower_bound(const std::map<std::pair<int, int>, Rational>& f,
                                    const Rational& lo, const Rational& hi, uint64_t& work,
                                    uint64_t budget) {
  struct Piece {
    Rational lo, hi;
    int depth;
  };
  std::vector<Piece> stack{{lo, hi, 0}};
  std::optional<Rational> least;
  while (!stack.empty()) {
    Piece p = stack.back();
    stack.pop_back();
    if (++work > budget) return std::nullopt;
    Interval x = hull(p.lo, p.hi);
    Rational mid = (p.lo + p.hi) / 2;
    Interval at_mid = enclose(f, Interval(mid, kPrecision), false);
    if (at_mid.certainly_negative()) return std::nullopt;  // f < 0 somewhere
    // Mean-value form: f(x) in f(mid) + f'(X)·(X - mid).
    Interval mv = at_mid + enclose(f, x, true) * (x - Interval(mid, kPrecision));
    Rational bound = std::max(mv.lower(), enclose(f, x, false).lower());
    if (bound > 0) {
      if (!least || bound < *least) least = bound;
      continue;
    }
    if (p.depth >= kMaxDepth) return std::nullopt;
    stack.push_back({p.lo, mid, p.depth + 1});
    stack.push_back({mid, p.hi, p.depth + 1});
  }
  return least;
}

// max |f| on [lo, hi], from 32 natural enclosures.
Rational magnitude_bound(const std::map<std::pair<int, int>, Rational>& f, const Rational& lo,
                         const Rational& hi) {
  Rational best = 0;
  for (int i = 0; i < 32; ++i) {
    Interval v = enclose(f, hull(lo + (hi - lo) * i / 32, lo + (hi - lo) * (i + 1) / 32), false);
    best = std::max({best, Rational(abs(v.lower())), Rational(abs(v.upper()))});
  }
  return best;
}

using Coefficient = std::map<std::pair<int, int>, Rational>;  // (x power, L power) -> c

// D = Σ over (i, j) of coefficient(x, L)·P^i·k^j.
std::map<std::pair<int, int>, Coefficient> grouped(const Poly& d) {
  std::map<std::pair<int, int>, Coefficient> g;
  for (const auto& [m, c] : d.terms()) g[{m[kP], m[kK]}][{m[kX], m[kL]}] += c;
  return g;
}

// D with P = 2^k and k as numbers: a polynomial in x and L.
Coefficient at_block(const std::map<std::pair<int, int>, Coefficient>& g, uint64_t k) {
  Coefficient out;
  for (const auto& [ij, coef] : g) {
    Rational w = (ij.first >= 0 ? Rational(BigInt(1) << (k * ij.first))
                                : Rational(1, BigInt(1) << (k * -ij.first))) *
                 Rational(pow(BigInt(k), static_cast<unsigned>(ij.second)));
    for (const auto& [ab, c] : coef) out[ab] += c * w;
  }
  for (auto it = out.begin(); it != out.end();)
    it = it->second == 0 ? out.erase(it) : std::next(it);
  return out;
}

struct Comparison {
  uint64_t tail_from = 0;  // k1
  uint64_t blocks = 0;     // checked one by one
};

using Groups = std::map<std::pair<int, int>, Coefficient>;

// The k1 >= start from which the leading group outweighs the others on
// [1, 2] at every k >= k1: each other group's ratio to it, 2^(-dk)·k^e,
// falls from k1 on, and their bounds sum below the leading one's least.
uint64_t tail_from(const Groups& groups, uint64_t start, uint64_t& work, uint64_t budget) {
  uint64_t k1 = std::max<uint64_t>(start, 1);
  if (groups.empty()) return k1;
  auto lead = std::prev(groups.end());
  std::optional<Rational> least = lower_bound(lead->second, 1, 2, work, budget);
  if (!least) {
    throw Outside{
        "the leading term of the bound minus T's closed form is not shown positive on "
        "[1, 2]"};
  }
  std::vector<std::tuple<int, int, Rational>> rest;
  for (auto it = groups.begin(); it != lead; ++it) {
    int d = lead->first.first - it->first.first, e = it->first.second - lead->first.second;
    rest.emplace_back(d, e, magnitude_bound(it->second, 1, 2));
    // 2^(-dk) k^e falls from k >= e/(d ln 2).
    if (d > 0 && e > 0) {
      k1 = std::max<uint64_t>(k1, static_cast<uint64_t>(std::ceil(e / (d * std::log(2.0)))) + 1);
    }
  }
  for (uint64_t limit = k1 + 400; k1 <= limit; ++k1) {
    Interval sum(Rational(0), kPrecision);
    for (const auto& [d, e, mag] : rest) {
      Interval w = Interval(mag, kPrecision) / Interval(BigInt(1) << (k1 * d), kPrecision);
      sum = sum + w * ipow(Interval(BigInt(k1), kPrecision), e);
    }
    if ((Interval(*least, kPrecision) - sum).certainly_positive()) return k1;
  }
  throw Outside{"the leading term of the bound minus T's closed form dominates too late"};
}

// D >= 0 (D > 0 when strict) for every whole n >= n0, D written on blocks:
// `interior` for P < n < 2P, `edge` for n = P.
Comparison compare_on_blocks(const Poly& interior, const Poly& edge, const BigInt& n0, bool strict,
                             uint64_t& work, uint64_t budget) {
  Comparison out;
  uint64_t k0 = bit_length(n0) - 1;
  Groups groups = grouped(interior), edges = grouped(edge);
  for (const Groups* g : {&groups, &edges}) {
    for (const auto& [ij, coef] : *g) {
      if (ij.first < 0) throw Outside{"a negative power of 2^k in the comparison"};
    }
  }
  // n = 2^k: exact below its tail.
  uint64_t ke = tail_from(edges, k0, work, budget);
  for (uint64_t k = k0; k < ke + 1; ++k) {
    if ((BigInt(1) << k) < n0) continue;
    Coefficient v = at_block(edges, k);
    Rational value = v.empty() ? Rational(0) : v.begin()->second;  // x = 1, L = 0: a constant
    if (v.size() > 1 || (strict ? value <= 0 : value < 0)) {
      throw Outside{"the bound fails against T's closed form at n = 2^" + std::to_string(k)};
    }
  }
  if (groups.empty() && strict) {
    throw Outside{"the bound equals T's closed form: a strict side fails"};
  }
  // The interior: blocks below the tail one by one.
  uint64_t k1 = tail_from(groups, k0, work, budget);
  for (uint64_t k = k0; k < k1; ++k) {
    if (++out.blocks > kMaxSingleBlocks) throw Outside{"too many blocks below the tail"};
    Rational lo = std::max(Rational(1), Rational(n0) / Rational(BigInt(1) << k));
    Coefficient f = at_block(groups, k);
    if (f.empty() && !strict) continue;
    if (!lower_bound(f, lo, 2, work, budget)) {
      throw Outside{"the bound minus T's closed form is not shown positive on the block 2^" +
                    std::to_string(k)};
    }
  }
  out.tail_from = k1;
  return out;
}

// ---- Closed forms fitted to T's values.

struct Basis {
  int a, b, c;  // n^a k^b 2^(c k), k = floor(lg n)
};

ExprPtr basis_expr(const Basis& f) {
  ExprPtr k = make_call("floor", {make_call("lg", {make_variable()})});
  ExprPtr e;
  auto times = [&](ExprPtr x) { e = e ? make_binary(ExprKind::kMul, e, x) : x; };
  if (f.a > 0)
    times(f.a == 1 ? make_variable()
                   : make_binary(ExprKind::kPow, make_variable(), make_number(f.a)));
  if (f.b > 0) times(f.b == 1 ? k : make_binary(ExprKind::kPow, k, make_number(f.b)));
  if (f.c > 0) {
    ExprPtr p = make_binary(ExprKind::kPow, make_number(2), k);
    times(f.c == 1 ? p : make_binary(ExprKind::kPow, p, make_number(f.c)));
  }
  return e ? e : make_number(1);
}

Rational basis_value(const Basis& f, const BigInt& n) {
  uint64_t k = bit_length(n) - 1;
  return Rational(pow(n, f.a) * pow(BigInt(k), f.b) * (BigInt(1) << (k * f.c)));
}

// Exact Gaussian elimination; nullopt when the values fit no combination.
std::optional<std::vector<Rational>> solve(std::vector<std::vector<Rational>> rows, size_t vars) {
  std::vector<int> pivot_of(vars, -1);
  size_t r = 0;
  for (size_t col = 0; col < vars && r < rows.size(); ++col) {
    size_t p = r;
    while (p < rows.size() && rows[p][col] == 0) ++p;
    if (p == rows.size()) continue;
    std::swap(rows[p], rows[r]);
    Rational inv = 1 / rows[r][col];
    for (Rational& v : rows[r]) v *= inv;
    for (size_t i = 0; i < rows.size(); ++i) {
      if (i == r || rows[i][col] == 0) continue;
      Rational f = rows[i][col];
      for (size_t j = col; j <= vars; ++j) rows[i][j] -= f * rows[r][j];
    }
    pivot_of[col] = static_cast<int>(r);
    ++r;
  }
  for (size_t i = r; i < rows.size(); ++i) {
    if (rows[i][vars] != 0) return std::nullopt;
  }
  std::vector<Rational> x(vars, 0);
  for (size_t col = 0; col < vars; ++col) {
    if (pivot_of[col] >= 0) x[col] = rows[pivot_of[col]][vars];
  }
  return x;
}

// T's closed form in the basis, from its values at s .. s + kFitSizes - 1.
ExprPtr fit_closed_form(const DyadicRequest& req, const BigInt& s, int degree) {
  std::vector<Basis> basis;
  for (int a = 0; a <= degree; ++a)
    for (int c = 0; a + c <= degree; ++c)
      for (int b = 0; b <= kMaxLogPower; ++b) basis.push_back({a, b, c});
  std::vector<std::vector<Rational>> rows;
  for (int64_t i = 0; i < kFitSizes; ++i) {
    BigInt n = s + i;
    std::optional<Rational> t = req.value_at(n);
    if (!t) throw Outside{"T's exact values are not all rational"};
    std::vector<Rational> row;
    for (const Basis& f : basis) row.push_back(basis_value(f, n));
    row.push_back(*t);
    rows.push_back(std::move(row));
  }
  std::optional<std::vector<Rational>> x = solve(std::move(rows), basis.size());
  if (!x) throw Outside{"T's values fit no closed form in n, floor(lg n) and 2^floor(lg n)"};
  ExprPtr e;
  for (size_t i = basis.size(); i-- > 0;) {  // the fastest-growing terms first
    if ((*x)[i] == 0) continue;
    ExprPtr term = basis_expr(basis[i]);
    Rational c = (*x)[i];
    bool negative = c < 0 && e;
    Rational mag = negative ? -c : c;
    if (mag != 1) {
      term = basis[i].a + basis[i].b + basis[i].c == 0
                 ? make_number(mag)
                 : make_binary(ExprKind::kMul, make_number(mag), term);
    }
    e = !e ? term : make_binary(negative ? ExprKind::kSub : ExprKind::kAdd, e, term);
  }
  return e ? e : make_number(0);
}

// The degree of f (T's line without its calls) in n: the largest power of
// 2^k of its interior translation.
int driver_degree(const Recurrence& r) {
  const CaseLine& line = *r.main.fallback;
  Translator t(r.main.name, [](const Expr&, const Size&) { return Poly(0); });
  Poly p = t.poly(*line.body, block_size(false));
  int d = 0;
  for (const auto& [m, c] : p.terms()) {
    if (m[kL] != 0 || m[kK] != 0) throw Outside{"f(n) has logarithms"};
    d = std::max(d, m[kP]);
  }
  return d;
}

// ---- The prover.

class Prover {
 public:
  explicit Prover(const DyadicRequest& req) : req_(req), bound_(*req.bound) {}

  InductionOutcome run() {
    InductionOutcome out;
    try {
      if (!halving(*req_.recurrence)) throw NotHalving{};
      out.proof = prove();
    } catch (const Outside& o) {
      out.failure = "no proof by induction on dyadic blocks: " + o.why;
    } catch (const NotHalving&) {
      out.failure.clear();
    }
    out.work = work_;
    return out;
  }

 private:
  // Whether every call on T's lines (past the point cases) is T(floor(n/2)),
  // T(ceil(n/2)) or T(n/2) plus a constant: n = 2m + r gives m + c.
  static bool halving(const Recurrence& r) {
    const Function& f = r.main;
    std::vector<const CaseLine*> lines;
    for (const CaseLine& l : f.conditional) lines.push_back(&l);
    if (f.fallback) lines.push_back(&*f.fallback);
    if (lines.empty()) return false;
    Translator t(f.name, nullptr);
    Size n;
    n.lin = Lin{2, 0, 1};
    for (const CaseLine* l : lines) {
      if (l->sums_calls || l->calls.empty()) return false;
      for (const Expr* call : l->calls) {
        if (call->args.size() != 1) return false;
        try {
          if (t.lin(*call->args[0], n, true).a != 1) return false;
        } catch (const Outside&) {
          return false;
        }
      }
    }
    return true;
  }

  // Where the exact range starts and k0 (the first block of the step).
  std::pair<BigInt, uint64_t> start() const {
    const Function& f = req_.recurrence->main;
    BigInt s = bound_.n0;
    if (s > kLargestExactStart) {
      if (f.points.empty()) throw Outside{"the claim starts too far out and T has no point case"};
      s = f.points.front().point.value();
      for (const CaseLine& p : f.points) s = std::min(s, *p.point);
    }
    if (s < 1) throw Outside{"the claim starts below n = 1, where lg n is undefined"};
    if (s > bound_.n0) throw Outside{"T's first point case lies past the claim's start"};
    uint64_t k0 = std::max<uint64_t>(kFirstBlock, bit_length(s - 1));  // 2^k0 >= s
    return {s, k0};
  }

  // T(n) = form for every n >= s: exact below 2^(k0+1), the step beyond.
  void prove_equal(const ExprPtr& form, const BigInt& s, uint64_t k0, InductionProof& proof) {
    uint64_t pieces = prove_step(*req_.recurrence, form, k0, work_, req_.work_budget);
    BigInt to = (BigInt(1) << (k0 + 1)) - 1;
    if (!req_.check_range(form, Side::kUpper, false, s, to) ||
        !req_.check_range(form, Side::kLower, false, s, to)) {
      throw Outside{"T(n) differs from " + print(*form) + " below n = " + to.str() +
                    " (or the exact check ran out)"};
    }
    proof.checked_from = s;
    proof.checked_to = to;
    proof.identity = true;
    proof.obligations.push_back("T(n) = " + print(*form) + " checked exactly for " + s.str() +
                                " <= n <= " + to.str());
    proof.obligations.push_back(
        "step: for n = 2m + r (r = 0, 1), 2^k <= m < 2^(k+1), k >= " + std::to_string(k0) +
        ", B(n) - (the right side of T's line with B) = 0 as a polynomial in m, 2^k and k on " +
        std::to_string(pieces) + " pieces (the interior and " + std::to_string(kEdge) +
        " sizes at each edge, each parity), B(n) = " + print(*form));
  }

  InductionProof prove() {
    if (!bound_.upper && !bound_.lower) throw Outside{"no side to prove"};
    const Recurrence& r = *req_.recurrence;
    if (!r.class_terms.empty()) throw Outside{"T has growth classes as terms"};
    auto [s, k0] = start();
    recursive_line(r, BigInt(1) << (k0 + 1));
    InductionProof proof;
    proof.dyadic = true;
    bool exact = bound_.upper && bound_.lower && same_tree(*bound_.upper, *bound_.lower) &&
                 !bound_.strict_upper && !bound_.strict_lower;
    if (exact) {
      proof.sides = {Side::kUpper, Side::kLower};
      prove_equal(bound_.upper, s, k0, proof);
      proof.bound = "= " + print(*bound_.upper);
      return proof;
    }
    // Against T's own closed form.
    int degree = driver_degree(r) + 1;
    if (degree > kMaxDegree) throw Outside{"f(n) has too high a degree"};
    BigInt fit_from = s;
    ExprPtr form = fit_closed_form(req_, fit_from, degree);
    prove_equal(form, s, k0, proof);
    proof.closed_form = print(*form);
    Translator plain(r.main.name, nullptr);
    uint64_t tail = 0, blocks = 0;
    for (auto [side, b, strict] : {std::tuple{Side::kUpper, bound_.upper, bound_.strict_upper},
                                   std::tuple{Side::kLower, bound_.lower, bound_.strict_lower}}) {
      if (!b) continue;
      Poly d_in = plain.poly(*b, block_size(false)) - plain.poly(*form, block_size(false));
      Poly d_edge = plain.poly(*b, block_size(true)) - plain.poly(*form, block_size(true));
      if (side == Side::kLower) {
        d_in = Poly(0) - d_in;
        d_edge = Poly(0) - d_edge;
      }
      BigInt from = std::max(bound_.n0, s);
      Comparison c = compare_on_blocks(d_in, d_edge, from, strict, work_, req_.work_budget);
      tail = std::max(tail, c.tail_from);
      blocks += c.blocks;
      proof.sides.push_back(side);
      std::string rel = side == Side::kUpper ? (strict ? "<" : "<=") : (strict ? ">" : ">=");
      proof.bound += (proof.bound.empty() ? "" : " and ") + rel + " " + print(*b);
      proof.obligations.push_back(
          std::string(side == Side::kUpper ? "B(n) - E(n)" : "E(n) - B(n)") +
          (strict ? " > 0" : " >= 0") + " for every n >= " + from.str() +
          ", E(n) = " + print(*form) + ", B(n) = " + print(*b) +
          ": on each block 2^k <= n < 2^(k+1) in x = n/2^k in [1, 2] (lg n = k + lg x), by "
          "interval arithmetic, " +
          std::to_string(c.blocks) +
          " blocks one by one, then the leading power of 2^k and k "
          "from k = " +
          std::to_string(c.tail_from) + "; and at n = 2^k exactly");
    }
    proof.tail_log2 = tail;
    proof.blocks = blocks;
    return proof;
  }

  const DyadicRequest& req_;
  const Bound& bound_;
  uint64_t work_ = 0;
};

}  // namespace

InductionOutcome prove_on_dyadic_blocks(const DyadicRequest& request) {
  // (Prover::run catches the method's own signals; intervals too wide to
  // decide end the attempt here.)
  try {
    return Prover(request).run();
  } catch (const PrecisionShortfall&) {
    InductionOutcome out;
    out.failure = "no proof by induction on dyadic blocks: an interval too wide to decide";
    return out;
  }
}

}  // namespace thetagate::engine
