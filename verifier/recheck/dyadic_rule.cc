// The rule for induction on dyadic blocks (certificate method
// `dyadic-induction`): a closed form B written with floor(lg), ceil(lg) and
// 2^ of them, re-proved from the claim's own line. The certificate gives
// numbers only: M, the end of the exact range (and where it starts), and
// for a bound that is not exact T's closed form F.
//
// The argument, rebuilt here from scratch:
//
// - T(n) = B(n) exactly for s <= n <= M (the small evaluator).
// - Every n > M is 2m + r, r in {0, 1}, with m in a block P <= m < 2P,
//   P = 2^k, for some k >= k0 = floor(lg(M + 1)) - 1 (2^(k0+1) <= M + 1).
//   Each block is cut into pieces, for each r: m = P + j and m = 2P - 1 - j
//   (0 <= j < E), one size each, and the interior P + E <= m <= 2P - 1 - E.
// - On a piece every size q met (n, each call's argument, each argument of
//   lg) is a·m + b·P + c with exact a, b, c (on an edge piece a = 0). Its
//   least and greatest value on the piece are α·P + β (at the piece's ends:
//   q is monotone in m). floor(lg q) = k + t holds on the whole piece when
//   min - 2^t P >= 0 and 2^(t+1) P - max > 0, ceil(lg q) = k + u when
//   min - 2^(u-1) P > 0 and 2^u P - max >= 0. Each such condition, and
//   each call's "lands at >= s" and "shrinks", is α·2^k + β >= 0 (or > 0)
//   for every k >= k0. With α > 0 the left side increases with k, so it
//   holds for every k from the first k where it holds; with α = 0 it is the
//   sign of β; with α < 0 it fails for large k and the rule cannot follow.
//   The largest such first k, kmin, must be <= k0: else M is too small.
// - Then B(n) - (Σ a_i B(arg_i) + f(n)) is a polynomial in m, P and k on
//   each piece; it must be the zero polynomial, so it vanishes at every n of
//   the piece, and strong induction (every argument in [s, n - 1]) carries
//   T = B to every n > M. A polynomial that is not zero is nonzero at some
//   n of the piece (P and k are tied by P = 2^k, but a nonzero polynomial
//   in P and k is nonzero at P = 2^k for all large k): the step is false,
//   and the certificate is rejected with such an n where one is found.
// - A bound that is not exact: T = F is proved as above; the claim's side
//   B against F is then compared on each block 2^k <= n < 2^(k+1) with the
//   re-checker's own interval arithmetic in x = n/2^k (compare_on_blocks).
#include <algorithm>
#include <array>
#include <map>
#include <optional>
#include <tuple>

#include "verifier/recheck/rule_support.h"

namespace thetagate::engine::recheck {
namespace {

// ---- Polynomials with exact coefficients in m, P = 2^k and k (and, for
// the comparison of a bound with F, x = n/2^k and L = lg x).

enum Symbol { kM = 0, kP, kK, kX, kL, kSymbols };
using Powers = std::array<int, kSymbols>;

struct Poly {
  std::map<Powers, Rational> terms;

  static Poly of(const Rational& c) {
    Poly p;
    if (c != 0) p.terms[Powers{}] = c;
    return p;
  }
  static Poly symbol(Symbol s) {
    Poly p;
    Powers e{};
    e[s] = 1;
    p.terms[e] = 1;
    return p;
  }
  void add(const Powers& e, const Rational& c) {
    if (c == 0) return;
    Rational& slot = terms[e];
    slot += c;
    if (slot == 0) terms.erase(e);
  }
  bool is_zero() const { return terms.empty(); }
  std::optional<Rational> constant() const {
    if (terms.empty()) return Rational(0);
    if (terms.size() == 1 && terms.begin()->first == Powers{}) return terms.begin()->second;
    return std::nullopt;
  }
};

Poly operator+(Poly a, const Poly& b) {
  for (const auto& [e, c] : b.terms) a.add(e, c);
  return a;
}
Poly operator-(Poly a, const Poly& b) {
  for (const auto& [e, c] : b.terms) a.add(e, -c);
  return a;
}
Poly operator*(const Poly& a, const Poly& b) {
  Poly out;
  for (const auto& [ea, ca] : a.terms)
    for (const auto& [eb, cb] : b.terms) {
      Powers e;
      for (int s = 0; s < kSymbols; ++s) e[s] = ea[s] + eb[s];
      out.add(e, ca * cb);
    }
  if (out.terms.size() > 4096) throw Unsupported("a polynomial of more than 4096 terms");
  return out;
}

Rational power_of_two(int64_t t) {
  return t >= 0 ? Rational(BigInt(1) << t) : Rational(1, BigInt(1) << -t);
}

// "2 m*k - P + 1" for messages (x and L do not occur in the step).
std::string text_of(const Poly& p) {
  if (p.is_zero()) return "0";
  static const char* kNames[] = {"m", "2^k", "k", "x", "lg(x)"};
  std::string out;
  for (auto it = p.terms.rbegin(); it != p.terms.rend(); ++it) {
    Rational c = it->second;
    out += out.empty() ? (c < 0 ? "-" : "") : (c < 0 ? " - " : " + ");
    if (c < 0) c = -c;
    std::string factors;
    for (int s = 0; s < kSymbols; ++s) {
      if (it->first[s] == 0) continue;
      factors += std::string(factors.empty() ? "" : "*") + kNames[s] +
                 (it->first[s] == 1 ? "" : "^" + std::to_string(it->first[s]));
    }
    out += factors.empty() ? to_string(c) : (c == 1 ? "" : to_string(c) + "*") + factors;
  }
  return out;
}

Rational value_at(const Poly& p, const Rational& m, const BigInt& P, uint64_t k) {
  Rational sum = 0;
  for (const auto& [e, c] : p.terms) {
    Rational v = c;
    for (int i = 0; i < e[kM]; ++i) v *= m;
    for (int i = 0; i < e[kP]; ++i) v *= Rational(P);
    for (int i = 0; i < e[kK]; ++i) v *= Rational(BigInt(k));
    sum += v;
  }
  return sum;
}

// ---- Sizes on a piece of a block.

// a·m + b·P + c.
struct Form {
  Rational a, b, c;
};
Form operator+(const Form& x, const Form& y) { return {x.a + y.a, x.b + y.b, x.c + y.c}; }
Form scaled(const Form& x, const Rational& s) { return {x.a * s, x.b * s, x.c * s}; }
bool is_constant(const Form& f) { return f.a == 0 && f.b == 0; }

std::string text_of(const Form& f) {
  Poly p = Poly::of(f.c) + Poly::of(f.a) * Poly::symbol(kM) + Poly::of(f.b) * Poly::symbol(kP);
  return text_of(p);
}

// α·P + β.
struct InP {
  Rational alpha, beta;
};

// The first k >= 0 from which α·2^k + β >= 0 (> 0 when strict) holds for
// every larger k: with α > 0 the left side increases with k, so the first k
// where it holds; with α = 0 the sign of β decides once for all k; with
// α < 0 it fails for every large k (nullopt). Searched up to k = 200.
std::optional<uint64_t> first_block(const InP& v, bool strict) {
  auto holds = [&](const Rational& x) { return strict ? x > 0 : x >= 0; };
  if (v.alpha < 0) return std::nullopt;
  if (v.alpha == 0) return holds(v.beta) ? std::optional<uint64_t>(0) : std::nullopt;
  for (uint64_t k = 0; k <= 200; ++k)
    if (holds(v.alpha * Rational(BigInt(1) << k) + v.beta)) return k;
  return std::nullopt;
}

enum class Part { kInterior, kLow, kHigh };

// One piece: n = 2m + r with m = P + j (kLow), m = 2P - 1 - j (kHigh), or
// P + E <= m <= 2P - 1 - E (kInterior).
struct Piece {
  int r = 0;
  Part part = Part::kInterior;
  int j = 0;
  int edge = 0;  // E

  // n on the piece: on an edge m is a fixed size, so m does not occur.
  Form n() const {
    switch (part) {
      case Part::kLow:
        return {0, 2, Rational(2 * j + r)};
      case Part::kHigh:
        return {0, 4, Rational(r - 2 - 2 * j)};
      case Part::kInterior:
        break;
    }
    return {2, 0, Rational(r)};
  }
  // The least and greatest value of q on the piece (q is monotone in m).
  std::pair<InP, InP> range(const Form& q) const {
    if (part != Part::kInterior) {
      if (q.a != 0) throw Unsupported("m on an edge piece");  // (never: n has no m there)
      return {{q.b, q.c}, {q.b, q.c}};
    }
    InP at_low{q.a + q.b, q.a * edge + q.c}, at_high{2 * q.a + q.b, q.c - q.a * (1 + edge)};
    return q.a >= 0 ? std::pair{at_low, at_high} : std::pair{at_high, at_low};
  }
  std::string text() const {
    std::string where =
        part == Part::kInterior
            ? "2^k + " + std::to_string(edge) + " <= m <= 2^(k+1) - " + std::to_string(edge + 1)
        : part == Part::kLow ? "m = 2^k + " + std::to_string(j)
                             : "m = 2^(k+1) - " + std::to_string(j + 1);
    return "the piece " + where + ", n = 2m + " + std::to_string(r);
  }
  // The m of the piece's i-th size in the block P (for a witness).
  Rational m_at(const BigInt& P, int i) const {
    switch (part) {
      case Part::kLow:
        return Rational(P + j);
      case Part::kHigh:
        return Rational(2 * P - 1 - j);
      case Part::kInterior:
        break;
    }
    return Rational(P + edge + i);
  }
};

// What the pieces need: the first block from which every condition holds,
// and the condition that needs it.
struct Needs {
  uint64_t from = 0;
  std::string why;
  void require(const InP& v, bool strict, const std::string& what) {
    std::optional<uint64_t> k = first_block(v, strict);
    if (!k) throw Unsupported(what + " fails on every large block");
    if (*k > from) {
      from = *k;
      why = what;
    }
  }
};

// ---- Expressions of n on one piece.

// floor(lg q) (ceil when `up`) for a constant q > 0.
int64_t lg_of_constant(const Rational& q, bool up) {
  if (q <= 0) throw Unsupported("lg of a number that is not positive");
  int64_t t = static_cast<int64_t>(bit_length(numerator(q))) -
              static_cast<int64_t>(bit_length(denominator(q)));
  while (power_of_two(t) > q) --t;
  while (power_of_two(t + 1) <= q) ++t;
  return up && power_of_two(t) != q ? t + 1 : t;
}

// Expressions of n as polynomials: what n, lg and the floors are is up to
// the context (a piece of the step, or a block of the comparison).
class Translator {
 public:
  explicit Translator(const std::string& function) : function_(function) {}
  virtual ~Translator() = default;

  Poly value(const Expr& e) const {
    switch (e.kind) {
      case ExprKind::kNumber:
        return Poly::of(e.number);
      case ExprKind::kVariable:
        return size();
      case ExprKind::kAdd:
        return value(*e.args[0]) + value(*e.args[1]);
      case ExprKind::kSub:
        return value(*e.args[0]) - value(*e.args[1]);
      case ExprKind::kNeg:
        return Poly{} - value(*e.args[0]);
      case ExprKind::kMul:
        return value(*e.args[0]) * value(*e.args[1]);
      case ExprKind::kDiv: {
        std::optional<Rational> d = value(*e.args[1]).constant();
        if (!d || *d == 0) throw Unsupported("a division by something other than a constant");
        return value(*e.args[0]) * Poly::of(1 / *d);
      }
      case ExprKind::kPow:
        return power(e);
      case ExprKind::kCall:
        return call(e);
      default:
        throw Unsupported("an expression that is not a polynomial in n, floors of lg and 2^");
    }
  }

 protected:
  // n itself; floor(lg q) or ceil(lg q) (up); lg q; floor(q) or ceil(q).
  virtual Poly size() const = 0;
  virtual Poly lg_rounded(const Expr& q, bool up) const = 0;
  virtual Poly lg(const Expr& q) const = 0;
  virtual Poly rounded(const Expr& e) const = 0;

 private:
  Poly power(const Expr& e) const {
    Poly exponent = value(*e.args[1]);
    if (std::optional<Rational> w = exponent.constant();
        w && denominator(*w) == 1 && *w >= 0 && *w <= 16) {
      Poly base = value(*e.args[0]), out = Poly::of(1);
      for (long i = 0; i < static_cast<long>(numerator(*w)); ++i) out = out * base;
      return out;
    }
    // 2^(e·k + c) = P^e · 2^c, e and c whole (2^floor(lg n), 2^(ceil(lg n) + 1)).
    std::optional<Rational> base = value(*e.args[0]).constant();
    if (!base || *base != 2) throw Unsupported("a power other than a whole power or 2^(k + c)");
    Rational times_k = 0, c = 0;
    for (const auto& [powers, coef] : exponent.terms) {
      if (powers == Powers{}) {
        c = coef;
      } else if (powers == Powers{0, 0, 1, 0, 0}) {
        times_k = coef;
      } else {
        throw Unsupported("2 to a power that is not k times a whole number plus a constant");
      }
    }
    if (denominator(times_k) != 1 || times_k < 0 || times_k > 8 || denominator(c) != 1 ||
        abs(c) > 64)
      throw Unsupported("2 to a power that is not k times a whole number plus a constant");
    Poly out = Poly::of(power_of_two(static_cast<int64_t>(numerator(c))));
    for (long i = 0; i < static_cast<long>(numerator(times_k)); ++i) out = out * Poly::symbol(kP);
    return out;
  }

  Poly call(const Expr& e) const {
    auto is_lg = [](const Expr& x) {
      return x.kind == ExprKind::kCall && (x.name == "lg" || x.name == "log2") &&
             x.args.size() == 1;
    };
    if ((e.name == "floor" || e.name == "ceil") && e.args.size() == 1) {
      if (is_lg(*e.args[0])) return lg_rounded(*e.args[0]->args[0], e.name == "ceil");
      return rounded(e);
    }
    if (is_lg(e)) return lg(*e.args[0]);
    if (e.name == function_) throw Unsupported(function_ + " inside the bound");
    throw Unsupported("the function " + e.name);
  }

  const std::string& function_;
};

// On a piece of the step: n, and every size met, is a form in m and P.
class OnPiece : public Translator {
 public:
  OnPiece(const Piece& piece, const std::string& function, Needs& needs)
      : Translator(function), piece_(piece), needs_(needs) {}

  // The value of e with the size read as `n`, a polynomial in m, P and k.
  Poly at(const Expr& e, const Form& n) {
    n_ = n;
    return value(e);
  }

  // e as a·m + b·P + c with the size read as `n`, or nullopt.
  std::optional<Form> form_at(const Expr& e, const Form& n) {
    n_ = n;
    return form(e);
  }

  // floor(q) (ceil when `up`): exact when a and b are whole (m and P are).
  static std::optional<Form> whole(const Form& q, bool up) {
    if (denominator(q.a) != 1 || denominator(q.b) != 1) return std::nullopt;
    return Form{q.a, q.b, Rational(up ? ceil_of(q.c) : floor_of(q.c))};
  }

 protected:
  std::optional<Form> form(const Expr& e) const {
    switch (e.kind) {
      case ExprKind::kNumber:
        return Form{0, 0, e.number};
      case ExprKind::kVariable:
        return n_;
      case ExprKind::kAdd:
      case ExprKind::kSub: {
        auto x = form(*e.args[0]), y = form(*e.args[1]);
        if (!x || !y) return std::nullopt;
        return *x + scaled(*y, e.kind == ExprKind::kSub ? -1 : 1);
      }
      case ExprKind::kNeg: {
        auto x = form(*e.args[0]);
        if (!x) return std::nullopt;
        return scaled(*x, -1);
      }
      case ExprKind::kMul: {
        auto x = form(*e.args[0]), y = form(*e.args[1]);
        if (!x || !y) return std::nullopt;
        if (is_constant(*x)) return scaled(*y, x->c);
        if (is_constant(*y)) return scaled(*x, y->c);
        return std::nullopt;
      }
      case ExprKind::kDiv: {
        auto x = form(*e.args[0]), y = form(*e.args[1]);
        if (!x || !y || !is_constant(*y) || y->c == 0) return std::nullopt;
        return scaled(*x, 1 / y->c);
      }
      case ExprKind::kCall:
        if ((e.name == "floor" || e.name == "ceil") && e.args.size() == 1) {
          auto x = form(*e.args[0]);
          if (x) return whole(*x, e.name == "ceil");
        }
        return std::nullopt;
      default:
        return std::nullopt;
    }
  }

  Poly size() const override { return of_form(n_); }

  Poly lg_rounded(const Expr& arg, bool up) const override {
    std::optional<Form> q = form(arg);
    if (!q) throw Unsupported("lg of something not affine in n");
    return lg_of(*q, up);
  }

  Poly lg(const Expr&) const override {
    throw Unsupported("lg without a floor or ceiling, which no piece makes a polynomial");
  }

  Poly rounded(const Expr& e) const override {
    if (auto q = form(e)) return of_form(*q);
    throw Unsupported("a floor or ceiling of something not affine in n");
  }

 private:
  static Poly of_form(const Form& f) {
    return Poly::of(f.a) * Poly::symbol(kM) + Poly::of(f.b) * Poly::symbol(kP) + Poly::of(f.c);
  }

  // floor(lg q) = k + t on the whole piece (ceil when `up`), with the
  // conditions that make it so noted in `needs_`.
  Poly lg_of(const Form& q, bool up) const {
    auto [low, high] = piece_.range(q);
    if (low.alpha == 0 && high.alpha == 0 && low.beta == high.beta)
      return Poly::of(Rational(BigInt(lg_of_constant(low.beta, up))));
    std::string what =
        std::string(up ? "ceil" : "floor") + "(lg(" + text_of(q) + ")) on " + piece_.text();
    if (low.alpha <= 0) throw Unsupported(what + ": not k plus a constant");
    int64_t guess = lg_of_constant(up ? high.alpha : low.alpha, up);
    std::optional<std::tuple<uint64_t, int64_t, InP, InP>> best;
    for (int64_t t = guess - 1; t <= guess + 1; ++t) {
      // floor: 2^t P <= min and max < 2^(t+1) P; ceil: 2^(t-1) P < min and
      // max <= 2^t P.
      int64_t below = up ? t - 1 : t, above = up ? t : t + 1;
      InP lower{low.alpha - power_of_two(below), low.beta};
      InP upper{power_of_two(above) - high.alpha, -high.beta};
      auto k1 = first_block(lower, up), k2 = first_block(upper, !up);
      if (!k1 || !k2) continue;
      uint64_t from = std::max(*k1, *k2);
      if (!best || from < std::get<0>(*best)) best = std::tuple{from, t, lower, upper};
    }
    if (!best) throw Unsupported(what + ": not k plus a constant");
    auto [from, t, lower, upper] = *best;
    needs_.require(lower, up, what + " = k + " + std::to_string(t));
    needs_.require(upper, !up, what + " = k + " + std::to_string(t));
    return Poly::symbol(kK) + Poly::of(Rational(BigInt(t)));
  }

  const Piece& piece_;
  Needs& needs_;
  Form n_;
};

// ---- The step.

std::vector<Piece> pieces(int edge) {
  std::vector<Piece> out;
  for (int r = 0; r < 2; ++r) {
    out.push_back({r, Part::kInterior, 0, edge});
    for (int j = 0; j < edge; ++j) {
      out.push_back({r, Part::kLow, j, edge});
      out.push_back({r, Part::kHigh, j, edge});
    }
  }
  return out;
}

// A size of the piece where `diff` is not zero, for the message.
std::string witness(const Poly& diff, const Piece& piece, uint64_t k0) {
  for (uint64_t k = k0; k < k0 + 6; ++k) {
    BigInt P = BigInt(1) << k;
    for (int i = 0; i < (piece.part == Part::kInterior ? 8 : 1); ++i) {
      Rational m = piece.m_at(P, i);
      if (piece.part == Part::kInterior && m > Rational(2 * P - 1 - piece.edge)) break;
      Rational v = value_at(diff, m, P, k);
      if (v != 0) return ": at n = " + to_string(2 * m + piece.r) + " it is " + to_string(v);
    }
  }
  return "";
}

// T(n) = B(n) for every n > M, given T = B on [s, M]: the step on every
// piece of every block from k0 = floor(lg(M + 1)) - 1 on. Throws Rejected
// (a false step, M too small) or Unsupported.
void prove_step(const Recurrence& r, const ExprPtr& b, const BigInt& s, const BigInt& m,
                int& count) {
  const std::string& name = r.main.name;
  uint64_t k0 = bit_length(m + 1) - 2;  // 2^(k0+1) <= M + 1 < 2^(k0+2)
  std::string unsupported;
  std::optional<Rejected> too_short;
  for (int edge : {2, 4, 8}) {
    try {
      Needs needs;
      needs.require({1, Rational(-edge)}, false, "the edge pieces lie in their block (2^k >= E)");
      std::vector<std::pair<Piece, Poly>> identities;
      for (const Piece& piece : pieces(edge)) {
        OnPiece on(piece, name, needs);
        Context ctx{m + 1, 2, static_cast<uint64_t>(piece.r), &r.helpers};
        const CaseLine& line = line_on_class(r.main, ctx);
        Linear lin;
        linearize(line.body, 1, name, lin);
        Form n = piece.n();
        Poly diff = on.at(*b, n);
        if (lin.f) diff = diff - on.at(*lin.f, n);
        for (const Call& call : lin.calls) {
          auto arg = on.form_at(*call.arg, n);
          if (arg) arg = OnPiece::whole(*arg, false);  // T(n/2) reads floor(n/2)
          if (!arg) throw Unsupported("the argument " + print(*call.arg) + " is not affine in m");
          if (piece.part == Part::kInterior && arg->a != 1)
            throw Unsupported("the argument " + print(*call.arg) + " does not halve n");
          std::string what = "the argument " + print(*call.arg) + " on " + piece.text();
          auto [low, high] = piece.range(*arg);
          auto [n_low, n_high] = piece.range(n + scaled(*arg, -1));
          needs.require({low.alpha, low.beta - Rational(s)}, false,
                        what + " is at least " + s.str());
          needs.require(n_low, true, what + " is below n");
          diff = diff - Poly::of(call.a) * on.at(*b, *arg);
        }
        identities.emplace_back(piece, diff);
      }
      if (needs.from > k0) {
        // Wider edges may need less; rejected when none is enough.
        BigInt need = (BigInt(1) << (needs.from + 1)) - 1;
        if (!too_short)
          too_short =
              Rejected{"the exact range ends at M = " + m.str() +
                       ", but the step holds only from the block 2^" + std::to_string(needs.from) +
                       " of m on (" + needs.why + "): M must be at least " + need.str()};
        continue;
      }
      for (const auto& [piece, diff] : identities) {
        if (!diff.is_zero())
          throw Rejected{"step: B(n) - (the right side of " + name + "'s line with B) is " +
                         text_of(diff) + " on " + piece.text() + ", not 0" +
                         witness(diff, piece, k0) + "; B(n) = " + print(*b)};
      }
      count += static_cast<int>(identities.size());
      return;
    } catch (const Unsupported& u) {
      if (unsupported.empty()) unsupported = u.what();
    }
  }
  if (too_short) throw *too_short;
  throw Unsupported(unsupported);
}

// ---- The comparison of a bound B with T's closed form F.
//
// On the block P <= n < 2P write n = x·P with x in [1, 2] and lg n = k + L,
// L = lg x: floor(lg n) = k, and ceil(lg n) = k + 1 except at n = P, where it
// is k. D = B - F (F - B below) is then Σ c_ij(x, L)·P^i·k^j inside the
// block and a polynomial in P and k at n = P. Over [1, 2] each c_ij is
// enclosed by interval arithmetic (mean-value forms on a bisection). If the
// leading group (largest i, then j) is at least l > 0 and the others at
// most u_ij in absolute value, then D >= P^i k^j (l - Σ u_ij 2^(-dk) k^e)
// (d, e the differences of the powers); each 2^(-dk) k^e does not increase
// from k >= 3e/(2d) + 1 on (its logarithmic derivative -d ln 2 + e/k is then
// negative, 1/ln 2 < 3/2; with d = 0, e < 0), so one k1 where the bracket
// is positive covers every later block. The blocks below k1 are checked one
// by one with P and k as numbers.

class OnBlock : public Translator {
 public:
  OnBlock(const std::string& function, bool at_power) : Translator(function), at_power_(at_power) {}

 protected:
  Poly size() const override {
    return at_power_ ? Poly::symbol(kP) : Poly::symbol(kX) * Poly::symbol(kP);
  }
  Poly lg_rounded(const Expr& q, bool up) const override {
    if (q.kind != ExprKind::kVariable) throw Unsupported("lg of something other than n in a bound");
    return Poly::symbol(kK) + Poly::of(up && !at_power_ ? 1 : 0);
  }
  Poly lg(const Expr& q) const override {
    if (q.kind != ExprKind::kVariable) throw Unsupported("lg of something other than n in a bound");
    return at_power_ ? Poly::symbol(kK) : Poly::symbol(kK) + Poly::symbol(kL);
  }
  Poly rounded(const Expr&) const override {
    throw Unsupported("a floor other than of lg n in a bound compared on blocks");
  }

 private:
  bool at_power_;
};

// Σ c·x^a·L^b over an interval X of x (L = lg X).
Interval enclose_on(const Poly& c, const Interval& x) {
  Interval lgx = x.log2(), sum(Rational(0), kPrecision);
  for (const auto& [e, q] : c.terms) {
    Interval t(q, kPrecision);
    for (int i = 0; i < std::abs(e[kX]); ++i) t = e[kX] > 0 ? t * x : t / x;
    for (int i = 0; i < e[kL]; ++i) t = t * lgx;
    sum = sum + t;
  }
  return sum;
}

Interval between(const Rational& lo, const Rational& hi) {
  Interval out(kPrecision);
  mpfi_interv_q(out.raw(), lo.backend().data(), hi.backend().data());
  return out;
}

// A coefficient c(x, L) and its derivative in x, c' = d + e/ln 2.
struct Coefficient {
  Poly c, d, e;
  explicit Coefficient(const Poly& p) : c(p) {
    for (const auto& [pw, q] : p.terms) {
      Powers lower = pw;
      lower[kX] -= 1;
      if (pw[kX] != 0) d.add(lower, q * pw[kX]);  // a·x^(a-1)·L^b
      if (pw[kL] != 0) {                          // b·x^(a-1)·L^(b-1)/ln 2
        lower[kL] -= 1;
        e.add(lower, q * pw[kL]);
      }
    }
  }
  // An enclosure of c on [lo, hi]: c(mid) + c'([lo, hi])·([lo, hi] - mid).
  Interval on(const Rational& lo, const Rational& hi) const {
    Rational mid = (lo + hi) / 2;
    Interval x = between(lo, hi), dx = between(lo - mid, hi - mid);
    Interval slope = enclose_on(d, x) + enclose_on(e, x) / Interval(Rational(2), kPrecision).log();
    return enclose_on(c, Interval(mid, kPrecision)) + slope * dx;
  }
};

// A lower bound of c on [lo, hi] that is > 0 (>= 0 when !strict), by
// bisection down to widths 2^-40, or nullopt. `work` counts enclosures.
std::optional<Rational> least_on(const Coefficient& c, const Rational& lo, const Rational& hi,
                                 bool strict, uint64_t& work) {
  if (std::optional<Rational> v = c.c.constant()) {
    if (strict ? *v > 0 : *v >= 0) return *v;
    return std::nullopt;
  }
  std::vector<std::pair<Rational, Rational>> todo{{lo, hi}};
  std::optional<Rational> least;
  const Rational finest = power_of_two(-40);
  while (!todo.empty()) {
    auto [a, b] = todo.back();
    todo.pop_back();
    if (++work > 200000)
      throw Unsupported("the comparison with T's closed form needs too many enclosures");
    Interval v = c.on(a, b);
    if (strict ? v.certainly_positive() : v.certainly_nonnegative()) {
      Rational l = v.lower();
      if (!least || l < *least) least = l;
      continue;
    }
    if (b - a <= finest) return std::nullopt;
    Rational mid = (a + b) / 2;
    todo.push_back({a, mid});
    todo.push_back({mid, b});
  }
  return least;
}

// The greatest |c| on [1, 2] (an upper bound).
Rational largest_on(const Coefficient& c) {
  Rational out = 0;
  for (int i = 0; i < 64; ++i) {
    Interval v = enclose_on(c.c, between(1 + Rational(i, 64), 1 + Rational(i + 1, 64)));
    out = std::max({out, Rational(abs(v.lower())), Rational(abs(v.upper()))});
  }
  return out;
}

using Groups = std::map<std::pair<int, int>, Poly>;  // (power of P, power of k) -> c(x, L)

Groups grouped(const Poly& d) {
  Groups g;
  for (const auto& [pw, q] : d.terms) {
    if (pw[kM] != 0 || pw[kP] < 0) throw Unsupported("a comparison outside powers of 2^k");
    Powers rest{};
    rest[kX] = pw[kX];
    rest[kL] = pw[kL];
    g[{pw[kP], pw[kK]}].add(rest, q);
  }
  return g;
}

// c(x, L) with P = 2^k and k as numbers.
Poly at_block(const Groups& g, uint64_t k) {
  Poly out;
  for (const auto& [ij, c] : g) {
    Rational w = Rational(BigInt(1) << (k * ij.first)) * Rational(pow(BigInt(k), ij.second));
    out = out + c * Poly::of(w);
  }
  return out;
}

// The k1 >= start from which the leading group outweighs the others at
// every block (the argument above); nullopt when the lead is not shown
// positive on [1, 2].
std::optional<uint64_t> tail_from(const Groups& g, uint64_t start, bool strict, uint64_t& work) {
  if (g.empty()) return strict ? std::nullopt : std::optional<uint64_t>(start);
  auto lead = std::prev(g.end());
  std::optional<Rational> least = least_on(Coefficient(lead->second), 1, 2, true, work);
  if (!least) return std::nullopt;
  uint64_t k1 = std::max<uint64_t>(start, 1);
  std::vector<std::tuple<int, int, Rational>> rest;
  for (auto it = g.begin(); it != lead; ++it) {
    int d = lead->first.first - it->first.first, e = it->first.second - lead->first.second;
    rest.emplace_back(d, e, largest_on(Coefficient(it->second)));
    if (d > 0 && e > 0) k1 = std::max<uint64_t>(k1, static_cast<uint64_t>(3 * e / (2 * d) + 1));
  }
  for (uint64_t limit = k1 + 400; k1 <= limit; ++k1) {
    Rational bracket = *least;
    for (const auto& [d, e, u] : rest) {
      Rational r = u / Rational(BigInt(1) << (k1 * d));
      r = e >= 0 ? r * Rational(pow(BigInt(k1), e)) : r / Rational(pow(BigInt(k1), -e));
      bracket -= r;
    }
    if (bracket > 0) return k1;
  }
  return std::nullopt;
}

// D >= 0 (> 0 when strict) for every whole n >= from, D = `inside` for
// P < n < 2P and `power` at n = P. Throws Rejected where D < 0 for sure at
// a whole n, Unsupported where the enclosures cannot decide.
void compare_on_blocks(const Poly& inside, const Poly& power, const BigInt& from, bool strict,
                       const std::string& statement, int& count) {
  uint64_t work = 0;
  uint64_t first = bit_length(from) - 1;  // 2^first <= from
  Groups in = grouped(inside), at = grouped(power);
  // n = 2^k: exact values, the first 64 blocks one by one (a failure there
  // is certain), then the tail.
  auto at_power = [&](uint64_t k) {
    if ((BigInt(1) << k) < from) return;
    std::optional<Rational> v = at_block(at, k).constant();
    if (!v) throw Unsupported("a difference at n = 2^k that depends on x");
    if (strict ? *v <= 0 : *v < 0)
      throw Rejected{statement + " fails at n = 2^" + std::to_string(k) + ": the difference is " +
                     to_string(*v)};
  };
  for (uint64_t k = first; k < first + 64; ++k) at_power(k);
  std::optional<uint64_t> ke = tail_from(at, first, strict, work);
  if (!ke) throw Unsupported("could not prove " + statement + " at n = 2^k for every large k");
  for (uint64_t k = first + 64; k <= *ke; ++k) at_power(k);
  std::optional<uint64_t> k1 = tail_from(in, first, strict, work);
  if (!k1) throw Unsupported("could not prove " + statement + " on every large block");
  if (*k1 - first > 128) throw Unsupported("too many blocks before the tail of " + statement);
  for (uint64_t k = first; k < *k1; ++k) {
    BigInt P = BigInt(1) << k;
    Rational lo = std::max(Rational(1), Rational(from) / Rational(P));
    if (!least_on(Coefficient(at_block(in, k)), lo, 2, strict, work)) {
      // A whole n inside the block where it fails for sure rejects.
      Coefficient c(at_block(in, k));
      for (BigInt n = std::max(from, BigInt(P + 1)); n < 2 * P && n < from + 4096; ++n) {
        Rational x = Rational(n) / Rational(P);
        Interval v = c.on(x, x);
        if (strict ? v.upper() <= 0 : v.certainly_negative())
          throw Rejected{statement + " fails at n = " + n.str() + ": the difference is in " +
                         v.str()};
      }
      throw Unsupported("could not prove " + statement + " on the block 2^" + std::to_string(k));
    }
  }
  ++count;
}

// T(n) = e(n) exactly for lo <= n <= hi.
void require_equal(SmallEvaluator& eval, const ExprPtr& e, const BigInt& lo, const BigInt& hi,
                   int& count) {
  if (hi - lo > SmallEvaluator::kLargestSize) throw Unsupported("an exact range too long");
  for (BigInt n = lo; n <= hi; ++n) {
    Value t = eval.at(n), v = eval.value(*e, n);
    if (eval.sign_of_difference(t, v) != 0)
      throw Rejected{"T(n) = " + print(*e) + " for " + lo.str() + " <= n <= " + hi.str() +
                     " fails at n = " + n.str() + ": T(n) = " + t.str() + ", " + print(*e) + " = " +
                     v.str()};
  }
  ++count;
}

}  // namespace

void dyadic_induction(const Recurrence& r, const Bound& bound, const CertificateData& c,
                      int& count) {
  if (bound.is_asymptotic()) throw Unsupported("an asymptotic bound proved on dyadic blocks");
  if (r.full_history) throw Unsupported("a sum over earlier values of T");
  if (!r.class_terms.empty()) throw Unsupported("a growth class written inside the recurrence");
  BigInt m = parse_size(c.checked_to, "end of the exact range");
  BigInt s = bound.n0;
  if (!c.checked_from.empty())
    s = std::min(s, parse_size(c.checked_from, "start of the exact range"));
  if (s < 1) throw Rejected{"the exact range starts below n = 1, where lg n is undefined"};
  if (m < 1) throw Rejected{"the exact range ends at M = " + m.str() + ", before any block"};
  // The hypothesis is read, never believed: it must be the claim's own bound.
  std::vector<SideProof> sides = sides_of(bound, c);
  for (const SideProof& sp : sides)
    if (!same_tree(*sp.carried, *sp.claimed))
      throw Rejected{"the hypothesis " + print(*sp.carried) + " is not the claim's bound " +
                     print(*sp.claimed)};
  SmallEvaluator eval(r);
  bool exact = bound.upper && bound.lower && same_tree(*bound.upper, *bound.lower) &&
               !bound.strict_upper && !bound.strict_lower;
  if (exact) {
    require_equal(eval, bound.upper, s, m, count);
    prove_step(r, bound.upper, s, m, count);
    return;
  }
  if (c.closed_form.empty())
    throw Rejected{"a bound that is not exact needs T's closed form, and the certificate has none"};
  ExprPtr closed = parse_text(c.closed_form, "closed form");
  require_equal(eval, closed, s, m, count);
  prove_step(r, closed, s, m, count);
  BigInt from = std::max(bound.n0, BigInt(m + 1));
  for (const SideProof& sp : sides) {
    require_range(eval, sp, sp.claimed, bound.n0, m, count);
    Poly inside =
        OnBlock(r.main.name, false).value(*sp.claimed) - OnBlock(r.main.name, false).value(*closed);
    Poly power =
        OnBlock(r.main.name, true).value(*sp.claimed) - OnBlock(r.main.name, true).value(*closed);
    bool upper = sp.side == Side::kUpper;
    if (!upper) {
      inside = Poly{} - inside;
      power = Poly{} - power;
    }
    std::string statement = std::string(upper ? "B(n) - F(n)" : "F(n) - B(n)") +
                            (sp.strict ? " > 0" : " >= 0") + " for every n >= " + from.str() +
                            ", B(n) = " + print(*sp.claimed) + ", F(n) = " + print(*closed);
    compare_on_blocks(inside, power, from, sp.strict, statement, count);
  }
}

}  // namespace thetagate::engine::recheck
