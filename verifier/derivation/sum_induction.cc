// Why the two methods prove the claim (sum_induction.h; docs/design.md,
// "Proofs over sums of earlier values").
//
// Differencing. Let the line T(n) = A(n) + W(n) U(n), U(n) = sum(k, lo,
// n - 1, T(k)), apply for every n >= N. For n > N it applies at n and at
// n - 1, so U(n - 1) = (T(n - 1) - A(n - 1))/W(n - 1) and U(n) = U(n - 1) +
// T(n - 1): T(n) is a function of T(n - 1) alone. If T(n - 1) = B(n - 1)
// (induction) and B(n) equals that function of B(n - 1) identically (every
// coefficient of the difference's numerator zero, with the closed sums as
// free symbols, no denominator zero past N), then T(n) = B(n). The exact
// check T = B for n0 <= n <= N starts it.
//
// Summed step. For n > M the line is T(n) = A(n) + W(n) sum(k, lo(n),
// hi(n), T(k)) with n0 <= lo(n), hi(n) <= n - 1 and hi(n) >= lo(n) - 1, so
// every T(k) in the sum is bounded by B(k) (strong induction), and with
// W(n) >= 0 the sum is bounded by sum(k, lo, hi, B(k)) = Q(hi) - Q(lo - 1)
// exactly (Q(x) - Q(x - 1) = B(x), so the sum telescopes; an empty sum,
// hi = lo - 1, gives 0 on both). B(n) - A(n) - W(n)(Q(hi) - Q(lo - 1)) >= 0
// then closes the step; the lower side is the same with every inequality
// reversed.
#include "verifier/derivation/sum_induction.h"

#include <algorithm>
#include <optional>
#include <utility>
#include <vector>

#include "verifier/derivation/rational_form.h"
#include "verifier/derivation/series.h"

namespace thetagate::engine {

namespace {

// The longest exact check either method asks for.
const BigInt kLongestCheck = 65536;
// Where the summed step begins, first and second.
const BigInt kStepStarts[] = {64, 1024};
// The largest modulus n is split by (floors in the sum's limits).
constexpr uint64_t kMaxModulus = 720;

struct NoProof {
  std::string why;
};

// The line that defines T(n) for every n >= from (points below from).
// Conditions are decided by the expansions, which may need from >= 64: then
// `from` moves there.
const CaseLine& line_from(const Function& f, BigInt& from) {
  for (const CaseLine& line : f.conditional) {
    SeriesContext ctx;
    ctx.from = from;
    try {
      if (!decide_condition(*line.condition, variable_series(), ctx))
        from = std::max(from, kStepStarts[0]);
    } catch (const NeedModulus&) {
    } catch (const SeriesUnsupported&) {
    }
  }
  for (const CaseLine& p : f.points) {
    if (p.point && *p.point >= from)
      throw NoProof{"the point case " + f.name + "(" + p.point->str() +
                    ") lies beyond n = " + from.str()};
  }
  for (const CaseLine& line : f.conditional) {
    SeriesContext ctx;
    ctx.from = from;
    std::optional<bool> holds;
    try {
      holds = decide_condition(*line.condition, variable_series(), ctx);
    } catch (const NeedModulus&) {
    } catch (const SeriesUnsupported&) {
    }
    if (!holds)
      throw NoProof{"the condition '" + print(*line.condition) +
                    "' is not decided for n >= " + from.str()};
    if (*holds) return line;
  }
  if (!f.fallback) throw NoProof{"no line applies to large n"};
  return *f.fallback;
}

// The bound's one closed form B and the sides it bounds.
struct Sides {
  ExprPtr closed;
  std::vector<Side> sides;
};

Sides sides_of(const Bound& bound, bool one_form) {
  if (bound.strict_upper || bound.strict_lower) throw NoProof{"a strict bound"};
  Sides s;
  if (bound.upper) s.sides.push_back(Side::kUpper);
  if (bound.lower) s.sides.push_back(Side::kLower);
  s.closed = bound.upper ? bound.upper : bound.lower;
  if (one_form && bound.upper && bound.lower && !same_tree(*bound.upper, *bound.lower))
    throw NoProof{"the two sides differ, and only a closed form T(n) = B(n) is carried"};
  return s;
}

std::string relation_of(Side side) { return side == Side::kUpper ? "<=" : ">="; }

std::string polynomial_text(const Polynomial& p) {
  std::string s = p.str();
  std::replace(s.begin(), s.end(), 'x', 'n');
  return s;
}

// "(n^2 - 1)/(n)" style, with the symbols S1, S2, ... of the builder.
std::string form_text(const RationalForm& f) {
  if (f.is_zero()) return "0";
  std::string num;
  for (const auto& [m, p] : f.num) {
    std::string term = polynomial_text(p);
    if (!m.empty() || f.num.size() > 1) term = "(" + term + ")";
    for (size_t i = 0; i < m.size(); ++i) {
      for (int k = 0; k < m[i]; ++k) term += "·S" + std::to_string(i + 1);
    }
    num += (num.empty() ? "" : " + ") + term;
  }
  if (f.den.degree() == 0 && f.den.coefficient(0) == 1) return num;
  if (f.num.size() > 1 || f.num.begin()->second.degree() > 0) num = "(" + num + ")";
  return num + "/(" + polynomial_text(f.den) + ")";
}

InductionSideProof side_proof(Side side, const std::string& text, const BigInt& from,
                              const BigInt& to, uint64_t modulus, bool identity) {
  InductionSideProof sp;
  sp.side = side;
  sp.relation = relation_of(side);
  sp.claimed = text;
  sp.carried = text;
  sp.claimed_from = from;
  sp.carried_from = from;
  sp.to = to;
  sp.modulus = modulus;
  sp.identity = identity;
  return sp;
}

// A + W·U at shift 0 or 1, U the sum over T's values: A and W.
void split(const RationalForm& body, size_t u, RationalForm& a, RationalForm& w) {
  a = RationalForm();
  w = RationalForm();
  a.den = body.den;
  w.den = body.den;
  for (const auto& [m, p] : body.num) {
    int k = u < m.size() ? m[u] : 0;
    if (k == 0) {
      a.num[m] = p;
    } else if (k == 1) {
      Monomial rest = m;
      rest[u] = 0;
      while (!rest.empty() && rest.back() == 0) rest.pop_back();
      w.num[rest] = p;
    } else {
      throw NoProof{"the line is not linear in its sum over earlier values"};
    }
  }
  reduce(a);
  reduce(w);
  if (w.is_zero() || !w.symbol_free())
    throw NoProof{"the sum over earlier values has a factor that is zero or itself a sum"};
}

InductionOutcome differencing(const InductionRequest& request) {
  const Recurrence& rec = *request.recurrence;
  const Bound& bound = *request.bound;
  Sides sides = sides_of(bound, true);
  BigInt n_start = bound.n0;
  for (const CaseLine& p : rec.main.points) {
    if (p.point) n_start = std::max(n_start, BigInt(*p.point + 1));
  }
  const CaseLine& line = line_from(rec.main, n_start);
  if (!line.calls.empty()) throw NoProof{"the line calls " + rec.main.name + " outside its sum"};
  FormBuilder fb(rec.main.name, true);
  RationalForm a0, w0, a1, w1, b0, b1, residual;
  size_t second_symbol = 0;
  try {
    RationalForm body0 = fb.build(*line.body, 0);
    RationalForm body1 = fb.build(*line.body, 1);
    const auto& sums = fb.function_sums();
    if (sums.size() != 2) throw NoProof{"the line has no single sum over earlier values"};
    auto first = sums.begin(), second = std::next(sums.begin());
    // Keys (lo, e), ordered: (lo, -2) at shift 1 before (lo, -1) at shift 0.
    const BigInt& lo = first->first.first;
    if (second->first.first != lo || first->first.second != -2 || second->first.second != -1)
      throw NoProof{"the sum over earlier values does not end at n - 1"};
    split(body0, second->second, a0, w0);
    second_symbol = second->second;
    split(body1, first->second, a1, w1);
    n_start = std::max(n_start, BigInt(lo + 1));
    b0 = fb.build(*sides.closed, 0);
    b1 = fb.build(*sides.closed, 1);
    residual = b0 - (a0 + w0 * (fb.divide(b1 - a1, w1) + b1));
  } catch (const NotRational& e) {
    throw NoProof{e.why};
  }
  if (!residual.is_zero())
    throw NoProof{
        "the closed form does not satisfy the differenced recurrence: B(n) - A(n) - "
        "W(n)((B(n - 1) - A(n - 1))/W(n - 1) + B(n - 1)) = " +
        form_text(residual)};
  n_start = std::max(n_start, fb.valid_from());
  std::optional<BigInt> n = nonzero_from(fb.nonzero(), n_start, kLongestCheck);
  if (!n) throw NoProof{"a denominator vanishes too far out"};
  BigInt last = *n;
  const BigInt& n0 = bound.n0;
  std::string text = print(*sides.closed);
  // The induction starts from T(N) = B(N) itself, so both sides are checked
  // even for a one-sided claim.
  for (Side side : {Side::kUpper, Side::kLower}) {
    if (!request.check_range(sides.closed, side, false, n0, last))
      throw NoProof{rec.main.name + "(n) = " + text + " fails or was not finished for " + n0.str() +
                    " <= n <= " + last.str()};
  }

  InductionProof proof;
  proof.method = "sum-difference";
  proof.sides = sides.sides;
  proof.bound = (sides.sides.size() == 2 ? "= " : relation_of(sides.sides[0]) + " ") + text;
  proof.checked_from = n0;
  proof.checked_to = last;
  proof.identity = true;
  for (Side side : sides.sides)
    proof.side_proofs.push_back(side_proof(side, text, n0, last, 1, true));
  // The closed sums, as named in A and W (the sums over T's values are
  // eliminated).
  std::string symbols;
  for (size_t i = 0; i < fb.symbols().size(); ++i) {
    bool eliminated = false;
    for (const auto& [key, index] : fb.function_sums()) eliminated = eliminated || index == i;
    if (eliminated) continue;
    symbols += ", S" + std::to_string(i + 1) + " = " + fb.symbols()[i];
  }
  std::string denominators;
  for (const Polynomial& p : fb.nonzero()) {
    if (p.degree() > 0) denominators += (denominators.empty() ? "" : ", ") + polynomial_text(p);
  }
  proof.obligations = {
      rec.main.name + "(n) = " + text + " checked exactly for " + n0.str() +
          " <= n <= " + last.str(),
      "the line " + rec.main.name + "(n) = " + print(*line.body) +
          " applies for every n >= " + n_start.str(),
      "the line is A(n) + W(n)·" + fb.symbols()[second_symbol] + " with A(n) = " + form_text(a0) +
          ", W(n) = " + form_text(w0) + symbols,
      "B(n) - A(n) - W(n)((B(n - 1) - A(n - 1))/W(n - 1) + B(n - 1)) = 0 identically in n and "
      "the sums",
      "no denominator vanishes for n >= " + last.str() +
          (denominators.empty() ? std::string() : ": " + denominators)};
  InductionOutcome out;
  out.proof = std::move(proof);
  return out;
}

// A copy of e with the node `target` replaced by `with`.
ExprPtr replace_node(const ExprPtr& e, const Expr* target, const ExprPtr& with) {
  if (e.get() == target) return with;
  if (e->args.empty()) return e;
  auto copy = std::make_shared<Expr>(*e);
  for (ExprPtr& a : copy->args) a = replace_node(a, target, with);
  update_depth(*copy);
  return copy;
}

// True when `target` occurs in e only through +, -, negation, products and
// numerators: e is A + W·target.
bool linear_in(const Expr& e, const Expr* target) {
  if (&e == target) return true;
  switch (e.kind) {
    case ExprKind::kAdd:
    case ExprKind::kSub:
    case ExprKind::kMul:
      return linear_in(*e.args[0], target) || linear_in(*e.args[1], target);
    case ExprKind::kNeg:
      return linear_in(*e.args[0], target);
    case ExprKind::kDiv:
      return linear_in(*e.args[0], target);
    default:
      return false;
  }
}

// The one sum over T's values in `body`.
const Expr* function_sum(const ExprPtr& body, const std::string& name) {
  std::vector<const Expr*> found;
  std::function<void(const ExprPtr&)> walk = [&](const ExprPtr& e) {
    if (e->kind == ExprKind::kSum) {
      std::vector<const Expr*> calls;
      collect_calls(e->args[2], name, calls);
      if (!calls.empty()) {
        found.push_back(e.get());
        return;
      }
    }
    for (const ExprPtr& a : e->args) walk(a);
  };
  walk(body);
  if (found.size() != 1) throw NoProof{"the line has no single sum over earlier values"};
  const Expr& s = *found[0];
  const Expr& b = *s.args[2];
  if (b.kind != ExprKind::kCall || b.name != name || b.args[0]->kind != ExprKind::kBound ||
      b.args[0]->name != s.name)
    throw NoProof{"the sum's body is not " + name + "(" + s.name + ")"};
  if (!linear_in(*body, found[0])) throw NoProof{"the line is not linear in its sum"};
  return found[0];
}

struct Affine {
  Rational s, t;
};

// The limit as s·n + t on the residue class, a whole number at each n.
Affine affine_limit(const Expr& limit, const SeriesContext& ctx) {
  std::optional<std::pair<Rational, Rational>> aff;
  try {
    aff = as_affine(expand(limit, variable_series(), ctx));
  } catch (const SeriesUnsupported& e) {
    throw NoProof{"the limit " + print(limit) + ": " + e.why};
  }
  if (!aff) throw NoProof{"the limit " + print(limit) + " is not affine in n"};
  auto [s, t] = *aff;
  Rational step = s * Rational(ctx.modulus), at = s * Rational(ctx.residue) + t;
  if (denominator(step) != 1 || denominator(at) != 1)
    throw NoProof{"the limit " + print(limit) + " is not a whole number on every residue class"};
  return {s, t};
}

InductionOutcome summed_step(const InductionRequest& request, const BigInt& m, uint64_t& work) {
  const Recurrence& rec = *request.recurrence;
  const Bound& bound = *request.bound;
  Sides sides = sides_of(bound, false);
  if (bound.n0 > m) throw NoProof{"the bound starts beyond n = " + m.str()};
  BigInt first_n = m + 1;
  const CaseLine& line = line_from(rec.main, first_n);
  if (first_n != m + 1) throw NoProof{"the line for n > " + m.str() + " is not decided"};
  if (!line.calls.empty()) throw NoProof{"the line calls " + rec.main.name + " outside its sum"};
  const Expr* sum = function_sum(line.body, rec.main.name);
  const ExprPtr& lo = sum->args[0];
  const ExprPtr& hi = sum->args[1];
  ExprPtr weight = make_binary(ExprKind::kSub, replace_node(line.body, sum, make_number(1)),
                               replace_node(line.body, sum, make_number(0)));
  InductionProof proof;
  proof.method = "sum-step";
  proof.sides = sides.sides;
  proof.checked_from = bound.n0;
  proof.checked_to = m;
  proof.identity = true;
  const BigInt& n0 = bound.n0;
  for (Side side : sides.sides) {
    const ExprPtr& b = side == Side::kUpper ? bound.upper : bound.lower;
    Polynomial p;
    try {
      FormBuilder fb(rec.main.name, false);
      RationalForm f = fb.build(*b, 0);
      if (!f.symbol_free() || f.den.degree() != 0) throw NotRational{"not a polynomial"};
      p = f.free_numerator();
      p = p * Polynomial({Rational(1) / f.den.coefficient(0)});
    } catch (const NotRational& e) {
      throw NoProof{"the bound " + print(*b) + " is no polynomial in n (" + e.why + ")"};
    }
    Polynomial q = summation_polynomial(p);
    ExprPtr summed =
        make_binary(ExprKind::kSub, polynomial_expr(q, hi),
                    polynomial_expr(q, make_binary(ExprKind::kSub, lo, make_number(1))));
    ExprPtr stepped = replace_node(line.body, sum, summed);
    ExprPtr slack = side == Side::kUpper ? make_binary(ExprKind::kSub, b, stepped)
                                         : make_binary(ExprKind::kSub, stepped, b);
    uint64_t modulus = 1;
    bool identity = true;
    for (;;) {
      try {
        identity = true;
        for (uint64_t r = 0; r < modulus; ++r) {
          SeriesContext ctx;
          ctx.from = m + 1;
          ctx.modulus = modulus;
          ctx.residue = r;
          ctx.helpers = &rec.helpers;
          BigInt n1 = m + 1;
          while (floor_mod(n1, BigInt(modulus)) != BigInt(r)) ++n1;
          Affine l = affine_limit(*lo, ctx), h = affine_limit(*hi, ctx);
          Rational first = Rational(n1);
          // The sum reaches only checked or earlier sizes, and is a plain
          // (possibly empty) range: n0 <= lo, hi <= n - 1, hi >= lo - 1.
          if (l.s < 0 || l.s * first + l.t < Rational(n0))
            throw NoProof{"the sum's lower limit " + print(*lo) + " falls below n = " + n0.str()};
          if (h.s > 1 || (h.s - 1) * first + h.t > -1)
            throw NoProof{"the sum's upper limit " + print(*hi) + " reaches n"};
          if (h.s < l.s || (h.s - l.s) * first + h.t - l.t < -1)
            throw NoProof{"the sum's range may run backwards"};
          try {
            prove_nonnegative(
                [&](const SeriesContext& c) { return expand(*weight, variable_series(), c); }, ctx,
                work, request.work_budget);
            NonnegativeProof np = prove_nonnegative(
                [&](const SeriesContext& c) { return expand(*slack, variable_series(), c); }, ctx,
                work, request.work_budget);
            identity = identity && np.identity;
          } catch (const SeriesUnsupported& e) {
            throw NoProof{e.why};
          }
        }
        break;
      } catch (const NeedModulus& need) {
        modulus *= need.factor;
        if (modulus > kMaxModulus) throw NoProof{"floors need too many residue classes"};
      }
    }
    if (!request.check_range(b, side, false, n0, m))
      throw NoProof{"the exact check up to n = " + m.str() + " did not finish or fails"};
    std::string text = print(*b);
    proof.side_proofs.push_back(side_proof(side, text, n0, m, modulus, identity));
    proof.modulus = std::max(proof.modulus, modulus);
    proof.identity = proof.identity && identity;
    proof.bound += (proof.bound.empty() ? "" : " and ") + relation_of(side) + " " + text;
    std::string where =
        modulus > 1 ? " on each residue class of n mod " + std::to_string(modulus) : "";
    proof.obligations.push_back(rec.main.name + "(n) " + relation_of(side) + " " + text +
                                " checked exactly for " + n0.str() + " <= n <= " + m.str());
    proof.obligations.push_back("sum(k, a, b, B(k)) = Q(b) - Q(a - 1) for B(n) = " + text +
                                ", Q(n) = " + polynomial_text(q));
    proof.obligations.push_back("for every n > " + m.str() + where + ": " + n0.str() +
                                " <= " + print(*lo) + ", " + print(*hi) + " <= n - 1, " +
                                print(*hi) + " >= " + print(*lo) + " - 1");
    proof.obligations.push_back("W(n) = " + print(*weight) + " >= 0 for every real n > " + m.str() +
                                where);
    proof.obligations.push_back("slack " + print(*slack) + " >= 0 for every real n > " + m.str() +
                                where);
  }
  proof.obligations.insert(proof.obligations.begin(), "the line " + rec.main.name +
                                                          "(n) = " + print(*line.body) +
                                                          " applies for every n > " + m.str());
  InductionOutcome out;
  out.proof = std::move(proof);
  out.work = work;
  return out;
}

}  // namespace

InductionOutcome prove_by_differencing(const InductionRequest& request) {
  try {
    return differencing(request);
  } catch (const NoProof& e) {
    InductionOutcome out;
    out.failure = "no proof by differencing the sum: " + e.why;
    return out;
  }
}

InductionOutcome prove_by_summed_step(const InductionRequest& request) {
  uint64_t work = 0;
  std::string why;
  for (const BigInt& m : kStepStarts) {
    try {
      InductionOutcome out = summed_step(request, std::max(m, request.bound->n0), work);
      return out;
    } catch (const NoProof& e) {
      if (why.empty()) why = e.why;
      if (work >= request.work_budget) break;
    }
  }
  InductionOutcome out;
  out.failure = "no proof by the summed step: " + why;
  out.work = work;
  return out;
}

InductionOutcome prove_over_sums(const InductionRequest& request) {
  InductionOutcome d = prove_by_differencing(request);
  if (d.proof) return d;
  InductionOutcome s = prove_by_summed_step(request);
  if (s.proof) return s;
  s.failure = d.failure + "; " + s.failure;
  return s;
}

std::string sum_step_name(const std::string& method) {
  if (method == "sum-difference")
    return " (the sum differenced away: the closed form satisfies the first-order recurrence "
           "identically)";
  if (method == "sum-step") return " (the sum of the bound in closed form)";
  return "";
}

}  // namespace thetagate::engine
