// The substitution method, mechanised (induction.h; docs/design.md,
// "Proofs"). Why a proof built here proves the claim: T(n) is compared
// exactly with B for n0 <= n <= M (the caller's check_range), and with the
// carried bound B' on every size the step lands on; for n > M each
// recursive line is T(n) = sum a_i T(arg_i(n)) + f(n) with a_i > 0 and
// arg_i(n) < n, so if every T(arg_i(n)) <= B'(arg_i(n)) (strong induction on
// n) then T(n) <= sum a_i B'(arg_i(n)) + f(n) <= B'(n) as soon as the slack
// B'(n) - sum a_i B'(arg_i(n)) - f(n) is >= 0 (series.h proves it for every
// real n > M). a_i > 0 is what lets the inequality pass through the sum; on
// the lower side every inequality is reversed. Finally B' <= B beyond M
// (same method) carries the conclusion back to the claim.
#include "verifier/derivation/induction.h"

#include <algorithm>
#include <utility>

#include "verifier/derivation/classify.h"
#include "verifier/derivation/series.h"
#include "verifier/derivation/sum_induction.h"

namespace thetagate::engine {

namespace {

// Where the exact check ends and the inductive step begins: the smallest
// first, a larger one when the step fails close to it. A larger M helps
// twice: the slack's lower-order terms weigh less against the leading one,
// and Taylor remainders expanded from M are tighter.
const BigInt kFirstM = 64;
const BigInt kSecondM = 1024;
const BigInt kThirdM = 4096;
// The longest exact check a proof may ask for.
const BigInt kLongestCheck = 65536;
// The largest modulus n is split by (floors of n/b for every b in the recurrence).
// The modulus grows to (at least) the lcm of the divisors whose floors need
// it: 720 = 16 · 9 · 5 admits every set of divisors from 2 to 6 (lcm 60) and
// more; each residue costs a whole step proof, so the cap bounds the work.
constexpr uint64_t kMaxModulus = 720;

// One proof attempt failed (DEVELOPERS.md, signals): caught in run() to try
// the next candidate or plan; prove_by_induction() catches it too, as a net
// (every throw today is inside an attempt).
struct Failure {
  std::string why;
  bool budget_spent = false;  // the shared work budget ran out: no later attempt can run
};

struct Call {
  Rational a;
  ExprPtr arg;
};

struct Linear {
  std::vector<Call> calls;
  ExprPtr f;  // null: 0
};

bool calls_function(const ExprPtr& e, const std::string& name) {
  std::vector<const Expr*> calls;
  collect_calls(e, name, calls);
  return !calls.empty();
}

std::optional<Rational> rational_constant(const Expr& e) {
  if (mentions_n(e)) return std::nullopt;
  std::optional<RealNumber> v = constant_value(e);
  if (!v || !v->is_rational()) return std::nullopt;
  return v->rational();
}

// body = sum a_i T(arg_i) + f(n). Only constant multiples are accepted:
// a coefficient that depends on n (n T(n/2)) would make the slack's
// inequality depend on the sign and size of that factor, which the step does
// not track.
void linearize(const ExprPtr& e, const Rational& factor, const std::string& name, Linear& out) {
  if (!calls_function(e, name)) {
    ExprPtr term = factor == 1 ? e : make_binary(ExprKind::kMul, make_number(factor), e);
    out.f = out.f ? make_binary(ExprKind::kAdd, out.f, term) : term;
    return;
  }
  switch (e->kind) {
    case ExprKind::kAdd:
      linearize(e->args[0], factor, name, out);
      linearize(e->args[1], factor, name, out);
      return;
    case ExprKind::kSub:
      linearize(e->args[0], factor, name, out);
      linearize(e->args[1], -factor, name, out);
      return;
    case ExprKind::kNeg:
      linearize(e->args[0], -factor, name, out);
      return;
    case ExprKind::kCall:
      if (e->name == name && e->args.size() == 1 && !calls_function(e->args[0], name)) {
        out.calls.push_back({factor, e->args[0]});
        return;
      }
      break;
    case ExprKind::kMul:
      if (std::optional<Rational> c = rational_constant(*e->args[0])) {
        linearize(e->args[1], factor * *c, name, out);
        return;
      }
      if (std::optional<Rational> c = rational_constant(*e->args[1])) {
        linearize(e->args[0], factor * *c, name, out);
        return;
      }
      break;
    case ExprKind::kDiv:
      if (std::optional<Rational> c = rational_constant(*e->args[1]); c && *c != 0) {
        linearize(e->args[0], factor / *c, name, out);
        return;
      }
      break;
    default:
      break;
  }
  throw Failure{"the recursive line is not a sum of constant multiples of " + name + "(...)"};
}

// The line that defines T(n) for every n > m in this residue class. A point
// line beyond m would be a value the step cannot see; a condition that the
// residue and n > m do not decide (n < 1000 with m = 64) would make the line
// change inside the class.
const CaseLine& line_for(const Function& f, uint64_t modulus, uint64_t residue, const BigInt& m) {
  for (const CaseLine& p : f.points) {
    if (p.point && *p.point > m) throw Failure{"a point case lies beyond the checked range"};
  }
  for (const CaseLine& line : f.conditional) {
    SeriesContext ctx;
    ctx.from = m + 1;
    ctx.modulus = modulus;
    ctx.residue = residue;
    std::optional<bool> holds = decide_condition(*line.condition, variable_series(), ctx);
    if (!holds)
      throw Failure{"the case line condition '" + print(*line.condition) +
                    "' is not decided by n's residue"};
    if (*holds) return line;
  }
  if (!f.fallback) throw Failure{"no line applies to large n"};
  return *f.fallback;
}

struct StepProof {
  bool identity = true;
  uint64_t tail_log2 = 0;
  uint64_t blocks = 0;
};

class Prover {
 public:
  explicit Prover(const InductionRequest& r) : request_(r) {}

  InductionOutcome run();

 private:
  // Proves build(ctx) >= 0 for every real n >= from.
  StepProof nonnegative(const std::function<Series(const SeriesContext&)>& build,
                        SeriesContext ctx);
  // The step for `candidate` on `side`, every residue; throws Failure or NeedModulus.
  StepProof step(const ExprPtr& candidate, const ExprPtr& claimed, Side side, bool strict,
                 const BigInt& m, uint64_t modulus, BigInt& lowest_argument);

  const InductionRequest& request_;
  uint64_t work_ = 0;
};

// prove_nonnegative's SeriesUnsupported is this attempt's Failure;
// NeedModulus passes through to run(), which splits n further.
StepProof Prover::nonnegative(const std::function<Series(const SeriesContext&)>& build,
                              SeriesContext ctx) {
  try {
    NonnegativeProof p = prove_nonnegative(build, ctx, work_, request_.work_budget);
    return StepProof{p.identity, p.tail_log2, p.blocks};
  } catch (const SeriesUnsupported& e) {
    throw Failure{e.why, work_ > request_.work_budget};
  }
}

StepProof Prover::step(const ExprPtr& candidate, const ExprPtr& claimed, Side side, bool strict,
                       const BigInt& m, uint64_t modulus, BigInt& lowest_argument) {
  const Recurrence& rec = *request_.recurrence;
  StepProof total;
  bool first = true;
  for (uint64_t r = 0; r < modulus; ++r) {
    const CaseLine& line = line_for(rec.main, modulus, r, m);
    Linear lin;
    linearize(line.body, Rational(1), rec.main.name, lin);
    // Strictness is inherited from the exact checks through the recursive
    // terms (T(arg) < B'(arg) and a > 0 give <); a line without one would
    // need f(n) < B'(n) strictly, which a non-negative slack does not say.
    if (strict && lin.calls.empty()) throw Failure{"a strict bound needs a recursive term"};
    // The smallest n > m in this residue class.
    BigInt n1 = m + 1;
    while (floor_mod(n1, BigInt(modulus)) != BigInt(r)) ++n1;
    SeriesContext probe;
    probe.modulus = modulus;
    probe.residue = r;
    probe.helpers = &rec.helpers;
    std::vector<Series> args;
    for (const Call& call : lin.calls) {
      // With a < 0, T(arg) <= B'(arg) turns into a T(arg) >= a B'(arg): the
      // wrong way for the step.
      if (call.a <= 0) throw Failure{"a recursive term with a coefficient <= 0"};
      // The argument as the evaluator reads it: T takes whole numbers, so
      // an argument is floored; on this residue class that is exact,
      // s n + t.
      Series arg;
      try {
        arg = expand(*make_call("floor", {call.arg}), variable_series(), probe);
      } catch (const SeriesUnsupported& e) {
        throw Failure{"the argument " + print(*call.arg) + ": " + e.why};
      }
      std::optional<std::pair<Rational, Rational>> aff = as_affine(arg);
      // 0 < s <= 1 with (1 - s)(m + 1) > t below: arg(n) < n for every
      // n > m (s n + t - n is non-increasing), so the induction is well
      // founded.
      if (!aff || aff->first <= 0 || aff->first > 1)
        throw Failure{"the argument " + print(*call.arg) + " is not s n + t with 0 < s <= 1"};
      auto [s, t] = *aff;
      // arg(n) < n for every n > m, and the smallest argument reached.
      if ((1 - s) * Rational(m + 1) - t <= 0)
        throw Failure{"the argument " + print(*call.arg) + " does not shrink"};
      // The smallest argument the step reaches, at the class's first n > m
      // (arg is increasing): T must be within B' from there up to m.
      Rational lowest = s * Rational(n1) + t;
      if (denominator(lowest) != 1) throw Failure{"an argument that is not a whole number"};
      lowest_argument = std::min(lowest_argument, numerator(lowest));
      args.push_back(arg);
    }
    const std::vector<Call> calls = lin.calls;
    ExprPtr f = lin.f;
    // The slack B'(n) - sum a_i B'(arg_i(n)) - f(n), rebuilt for every
    // `from` prove_nonnegative asks for (remainders depend on it).
    auto build = [&, calls, f, args](const SeriesContext& ctx) {
      Series n = variable_series();
      Series sum = expand(*candidate, n, ctx);
      Series rhs;
      for (size_t i = 0; i < calls.size(); ++i) {
        rhs = add(rhs, scale(expand(*candidate, args[i], ctx), Coef::of(calls[i].a), ctx.precision),
                  ctx.precision);
      }
      if (f) rhs = add(rhs, expand(*f, n, ctx), ctx.precision);
      Series slack = add(sum, negate(rhs), ctx.precision);
      return side == Side::kUpper ? slack : negate(slack);
    };
    SeriesContext ctx = probe;
    ctx.from = m + 1;
    StepProof p = nonnegative(build, ctx);
    if (candidate.get() != claimed.get()) {
      // The strengthened bound lies inside the claimed one beyond m.
      auto inside = [&](const SeriesContext& c) {
        Series n = variable_series();
        Series d = add(expand(*claimed, n, c), negate(expand(*candidate, n, c)), c.precision);
        return side == Side::kUpper ? d : negate(d);
      };
      StepProof q = nonnegative(inside, ctx);
      p.blocks += q.blocks;
      p.tail_log2 = std::max(p.tail_log2, q.tail_log2);
    }
    total.identity = total.identity && p.identity;
    total.blocks += p.blocks;
    total.tail_log2 = first ? p.tail_log2 : std::max(total.tail_log2, p.tail_log2);
    first = false;
  }
  return total;
}

struct Candidate {
  ExprPtr bound;
  std::string strengthening;
};

// The bounds tried in the step, the claim first: the classic repairs of a
// step that fails by a lower-order amount (docs/sources.md, "The substitution
// method"). Moving B away from T by h (B - h on the upper side) adds
// sum a_i h(arg_i) - h(n) to the slack: positive when sum a_i > 1 and h
// grows slowly enough (h = 1, lg n, sqrt n), which is why a bound with no
// room in its step (T(n) = 2T(n/2) + 1 against 2n) goes through as 2n - 1.
// The shift B(n -+ 1) absorbs a bounded rounding of the arguments. Roughly
// from the smallest change to the largest, so the proof names a small
// strengthening that works.
std::vector<Candidate> candidates(const ExprPtr& b, Side side) {
  std::vector<Candidate> out{{b, ""}};
  ExprPtr n = make_variable();
  auto shifted = [&](long by) {
    return substitute(b, make_binary(by < 0 ? ExprKind::kSub : ExprKind::kAdd, n,
                                     make_number(Rational(by < 0 ? -by : by))));
  };
  auto moved = [&](const ExprPtr& h) {
    return make_binary(side == Side::kUpper ? ExprKind::kSub : ExprKind::kAdd, b, h);
  };
  const char* sign = side == Side::kUpper ? "- " : "+ ";
  if (side == Side::kUpper) {
    out.push_back({shifted(-1), "the shift n -> n - 1"});
  } else {
    out.push_back({shifted(1), "the shift n -> n + 1"});
  }
  out.push_back({moved(make_number(Rational(1, 1024))), std::string(sign) + "1/1024"});
  out.push_back({moved(make_number(Rational(1))), std::string(sign) + "1"});
  out.push_back({moved(make_call("lg", {n})), std::string(sign) + "lg n"});
  out.push_back(
      {moved(make_binary(ExprKind::kMul, make_number(Rational(16)), make_call("lg", {n}))),
       std::string(sign) + "16 lg n"});
  out.push_back({moved(make_call("sqrt", {n})), std::string(sign) + "sqrt(n)"});
  out.push_back({moved(n), std::string(sign) + "n"});
  return out;
}

InductionOutcome Prover::run() {
  InductionOutcome out;
  const Bound& bound = *request_.bound;
  std::vector<std::pair<Side, ExprPtr>> sides;
  if (bound.upper) sides.push_back({Side::kUpper, bound.upper});
  if (bound.lower) sides.push_back({Side::kLower, bound.lower});
  InductionProof proof;
  proof.checked_from = bound.n0;
  proof.identity = true;
  std::vector<std::string> texts;
  BigInt m_used = 0;
  for (const auto& [side, claimed] : sides) {
    bool strict = side == Side::kUpper ? bound.strict_upper : bound.strict_lower;
    bool proved = false;
    // The proof may start below n0: T(n) within B from 1 on implies it
    // from n0 on. Starting at a large n0 itself needs the exact check up to
    // about 2 n0, where the step's arguments land.
    std::vector<std::pair<BigInt, BigInt>> plans;  // (start, m)
    for (const BigInt& m0 : {kFirstM, kSecondM, kThirdM}) {
      if (bound.n0 <= kFirstM) {
        plans.push_back({bound.n0, bound.n0 + m0});
      } else {
        plans.push_back({BigInt(1), m0});
        if (bound.n0 + m0 <= kLongestCheck) plans.push_back({bound.n0, 2 * bound.n0 + m0});
      }
    }
    for (auto [start, m] : plans) {
      // Both sides share one M (the proof reports one checked range).
      if (m_used != 0) m = std::max(m, m_used);
      for (const Candidate& cand : candidates(claimed, side)) {
        try {
          uint64_t modulus = 1;
          StepProof p;
          BigInt lowest;
          for (;;) {
            try {
              lowest = m;
              p = step(cand.bound, claimed, side, strict, m, modulus, lowest);
              break;
            } catch (const NeedModulus& need) {
              // A floor of s n + t is exact only on classes mod a multiple
              // of s's denominator (series.cc, rounded): split and redo.
              uint64_t next = modulus * need.factor;
              if (next > kMaxModulus) throw Failure{"floors need too many residue classes"};
              modulus = next;
            }
          }
          // Below `start` nothing about T is checked: the hypothesis would
          // be used where it was never established.
          if (lowest < start) throw Failure{"the step reaches arguments below n = " + start.str()};
          // Exact checks: T against the claim up to m, against the carried
          // bound where the step lands.
          if (!request_.check_range(claimed, side, strict, start, m))
            throw Failure{"the exact check up to n = " + m.str() + " did not complete"};
          if (cand.bound.get() != claimed.get() &&
              !request_.check_range(cand.bound, side, strict, lowest, m))
            throw Failure{"T(n) is not within " + print(*cand.bound) + " where the step lands"};
          proof.sides.push_back(side);
          proof.checked_to = m;
          proof.checked_from = std::min(proof.checked_from, std::min(start, lowest));
          proof.modulus = std::max(proof.modulus, modulus);
          proof.tail_log2 = std::max(proof.tail_log2, p.tail_log2);
          proof.blocks += p.blocks;
          proof.identity = proof.identity && p.identity;
          const char* op = side == Side::kUpper ? (strict ? "<" : "<=") : (strict ? ">" : ">=");
          texts.push_back(std::string(op) + " " + print(*cand.bound));
          InductionSideProof record;
          record.side = side;
          record.relation = op;
          record.claimed = print(*claimed);
          record.carried = print(*cand.bound);
          record.claimed_from = start;
          record.carried_from = lowest;
          record.to = m;
          record.modulus = modulus;
          record.identity = p.identity;
          proof.side_proofs.push_back(record);
          if (!cand.strengthening.empty()) proof.strengthening = cand.strengthening;
          m_used = m;
          proved = true;
          break;
        } catch (const Failure& f) {
          // The reason reported is the claim's own bound's (the first
          // candidate of the last plan): why the bound as written fails is
          // what a reader can act on; strengthenings are our guesses.
          if (out.failure.empty() || cand.strengthening.empty()) out.failure = f.why;
          // The work budget is shared by every attempt: once spent, later
          // candidates cannot run either.
          if (f.budget_spent) {
            out.failure = f.why;
            out.work = work_;
            return out;
          }
        }
      }
      if (proved) break;
    }
    if (!proved) {
      out.work = work_;
      return out;
    }
  }
  // Both sides proved with the same carried bound: T(n) equals it.
  if (texts.size() == 2 && texts[0].substr(3) == texts[1].substr(3) && !bound.strict_upper &&
      !bound.strict_lower) {
    proof.bound = "= " + texts[0].substr(3);
  } else {
    for (const std::string& t : texts) proof.bound += (proof.bound.empty() ? "" : " and ") + t;
  }
  out.proof = proof;
  out.failure.clear();
  out.work = work_;
  return out;
}

}  // namespace

std::string induction_proof_name(const InductionProof& proof) {
  if (proof.dyadic && !proof.closed_form.empty()) {
    const std::string t = proof.function + "(n)";
    return "induction on dyadic blocks from n = " + proof.checked_to.str() + ": " + t + " = " +
           proof.closed_form + ", then " + t + " " + proof.bound + " on every block";
  }
  std::string s = std::string(proof.dyadic ? "induction on dyadic blocks" : "induction") +
                  " from n = " + proof.checked_to.str() + ": " + proof.function + "(n) " +
                  proof.bound;
  if (!proof.strengthening.empty()) s += " (the claim strengthened by " + proof.strengthening + ")";
  if (!proof.method.empty()) s += sum_step_name(proof.method);
  return s;
}

InductionOutcome prove_by_induction(const InductionRequest& request) {
  Prover prover(request);
  try {
    return prover.run();
  } catch (const Failure& f) {
    InductionOutcome out;
    out.failure = f.why;
    return out;
  }
}

}  // namespace thetagate::engine
