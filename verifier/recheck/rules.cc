#include "verifier/recheck/rules.h"

#include <algorithm>
#include <functional>
#include <optional>

#include "verifier/recheck/expansion.h"
#include "verifier/recheck/small_eval.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine::recheck {
namespace {

// An obligation that fails: the certificate is rejected.
struct Rejected {
  std::string why;
};

// Residue moduli tried where a certificate does not name one.
constexpr uint64_t kModuli[] = {1, 2, 3, 4, 6, 8, 12, 16, 24, 32, 48, 64};

ExprPtr parse_text(const std::string& text, const std::string& what) {
  try {
    return parse_expression(SourceText::whole(what, text));
  } catch (const std::exception& e) {
    throw Rejected{"the " + what + " '" + text + "' does not parse: " + e.what()};
  }
}

Rational parse_rational(const std::string& text, const std::string& what) {
  RealNumber v = constant_value(*parse_text(text, what));
  if (!v.is_rational()) throw Rejected{"the " + what + " '" + text + "' is not a rational"};
  return v.rational();
}

BigInt parse_size(const std::string& text, const std::string& what) {
  Rational v = parse_rational(text, what);
  if (denominator(v) != 1 || v < 0) throw Rejected{"the " + what + " '" + text + "' is not a size"};
  return numerator(v);
}

// Body = sum of a_i T(arg_i) + f(n).
struct Call {
  Rational a;
  ExprPtr arg;
};
struct Linear {
  std::vector<Call> calls;
  ExprPtr f;  // null: no driver
};

bool calls_function(const Expr& e, const std::string& name) {
  if (e.kind == ExprKind::kCall && e.name == name) return true;
  for (const ExprPtr& a : e.args)
    if (calls_function(*a, name)) return true;
  return false;
}

void linearize(const ExprPtr& e, const Rational& coef, const std::string& name, Linear& out) {
  if (!calls_function(*e, name)) {
    ExprPtr term = coef == 1 ? e : make_binary(ExprKind::kMul, make_number(coef), e);
    out.f = out.f ? make_binary(ExprKind::kAdd, out.f, term) : term;
    return;
  }
  auto constant_side = [&](const Expr& x) {
    if (mentions_n(x) || calls_function(x, name)) throw Unsupported("T inside a product with n");
    RealNumber v = constant_value(x);
    if (!v.is_rational()) throw Unsupported("an irrational coefficient of T");
    return v.rational();
  };
  switch (e->kind) {
    case ExprKind::kAdd:
      linearize(e->args[0], coef, name, out);
      linearize(e->args[1], coef, name, out);
      return;
    case ExprKind::kSub:
      linearize(e->args[0], coef, name, out);
      linearize(e->args[1], -coef, name, out);
      return;
    case ExprKind::kNeg:
      linearize(e->args[0], -coef, name, out);
      return;
    case ExprKind::kMul:
      if (!calls_function(*e->args[0], name)) {
        linearize(e->args[1], coef * constant_side(*e->args[0]), name, out);
      } else {
        linearize(e->args[0], coef * constant_side(*e->args[1]), name, out);
      }
      return;
    case ExprKind::kDiv: {
      if (calls_function(*e->args[1], name)) throw Unsupported("T in a denominator");
      Rational d = constant_side(*e->args[1]);
      if (d == 0) throw Unsupported("a division by zero");
      linearize(e->args[0], coef / d, name, out);
      return;
    }
    case ExprKind::kCall:
      if (e->name == name) {
        if (calls_function(*e->args[0], name)) throw Unsupported("T inside T's argument");
        out.calls.push_back({coef, e->args[0]});
        return;
      }
      [[fallthrough]];
    default:
      throw Unsupported("T inside " + print(*e));
  }
}

Expansion driver_of(const Linear& lin, const Context& ctx, const Rational& s = 1,
                    const Rational& t = 0) {
  return lin.f ? expand(*lin.f, ctx, s, t) : constant(Coef::of(Rational(0)));
}

// The leading key of a growth function with a positive coefficient.
Key leading_key(const Expansion& e, const std::string& what) {
  if (e.terms.empty()) throw Rejected{what + " is zero"};
  auto lead = std::max_element(e.terms.begin(), e.terms.end(), [](const Term& a, const Term& b) {
    return compare_keys(a.key, b.key) < 0;
  });
  if (!lead->coef.enclose().certainly_positive())
    throw Unsupported(what + " with a leading term that is not positive");
  return lead->key;
}

// A proof that fails for sure rejects the certificate; one the re-checker
// cannot finish leaves the claim not re-checked.
void require(const Expansion& e, const Context& ctx, const std::string& statement, int& count) {
  ProofOutcome p = prove_nonnegative(e, ctx.from, ctx.modulus, ctx.residue);
  if (p.proof == Proof::kFalse) throw Rejected{statement + ": " + p.why};
  if (p.proof == Proof::kUnproved) throw Unsupported("could not prove " + statement + ": " + p.why);
  ++count;
}

// E(n) >= 0 for every real n >= ctx.from on ctx's class, with E expanded in
// x = n + shift for the first shift that proves it (the class of x and its
// start move with it). Rejected only when the unshifted attempt fails for sure.
void require_shifted(const std::function<Expansion(const Context&, const Rational&)>& build,
                     const Context& ctx, const std::string& statement, int& count) {
  std::optional<ProofOutcome> unshifted;
  std::string unsupported;
  for (int shift : {0, -1, 1, -2, 2}) {
    Context shifted = ctx;
    shifted.from = ctx.from + shift;
    shifted.residue =
        static_cast<uint64_t>(floor_mod(BigInt(ctx.residue) + shift, BigInt(ctx.modulus)));
    ProofOutcome p;
    try {
      p = prove_nonnegative(build(shifted, Rational(shift)), shifted.from, shifted.modulus,
                            shifted.residue);
    } catch (const Unsupported& u) {
      if (unsupported.empty()) unsupported = u.what();
      continue;
    }
    if (p.proof == Proof::kProved) {
      ++count;
      return;
    }
    if (!unshifted) unshifted = p;
  }
  if (unshifted && unshifted->proof == Proof::kFalse)
    throw Rejected{statement + ": " + unshifted->why};
  throw Unsupported("could not prove " + statement + ": " +
                    (unshifted ? unshifted->why : unsupported));
}

std::string class_name(const Context& ctx) {
  if (ctx.modulus == 1) return "";
  return ", n ≡ " + std::to_string(ctx.residue) + " (mod " + std::to_string(ctx.modulus) + ")";
}

std::string key_text(const Key& k) {
  std::string out;
  if (k.rho != 1) out += to_string(k.rho) + "^n";
  auto join = [&](const std::string& part) { out += (out.empty() ? "" : " ") + part; };
  if (k.alpha == RealNumber(1L)) {
    join("n");
  } else if (k.alpha.sign() != 0) {
    join("n^" + k.alpha.str());
  }
  if (k.beta == 1) {
    join("lg n");
  } else if (k.beta != 0) {
    join("lg^" + std::to_string(k.beta) + " n");
  }
  return out.empty() ? "1" : out;
}

// Runs `body` on every residue class mod L for the first L in kModuli on
// which the re-checker can follow everything; a rejection on one modulus
// is final only when no larger modulus is followed and succeeds.
void on_some_modulus(const std::function<void(const Context&, int&)>& body, const BigInt& from,
                     const std::map<std::string, Function>* helpers, int& count) {
  std::optional<Rejected> rejected;
  std::string unsupported;
  for (uint64_t L : kModuli) {
    int here = 0;
    try {
      for (uint64_t r = 0; r < L; ++r) {
        Context ctx{from, L, r, helpers};
        body(ctx, here);
      }
      count += here;
      return;
    } catch (const Unsupported& u) {
      if (unsupported.empty()) unsupported = u.what();
    } catch (const Rejected& r) {
      if (!rejected) rejected = r;
    }
  }
  if (rejected) throw *rejected;
  throw Unsupported(unsupported);
}

// The recursive structure shared by every line that applies at large n,
// and the threshold beyond which only such lines apply.
struct Structure {
  std::vector<Call> calls;  // of the first recursive line
  std::vector<const CaseLine*> recursive;
  BigInt threshold = 1;  // lines without calls apply only at n < threshold
};

Structure structure_of(const Recurrence& r) {
  if (r.full_history) throw Unsupported("a sum over earlier values of T");
  if (!r.class_terms.empty()) throw Unsupported("a growth class written inside the recurrence");
  Structure st;
  for (const CaseLine& p : r.main.points)
    st.threshold = std::max(st.threshold, BigInt(*p.point + 1));
  auto note = [&](const CaseLine& line) {
    Linear lin;
    linearize(line.body, 1, r.main.name, lin);
    if (lin.calls.empty()) return false;
    if (st.recursive.empty()) st.calls = lin.calls;
    st.recursive.push_back(&line);
    return true;
  };
  for (const CaseLine& line : r.main.conditional) {
    if (note(line)) continue;
    // A base line must stop applying: find X with the condition false for
    // every n >= X.
    bool bounded = false;
    for (BigInt x = 2; x <= BigInt(1) << 20 && !bounded; x *= 2) {
      try {
        if (!decide(*line.condition, Context{x, 1, 0, &r.helpers})) {
          st.threshold = std::max(st.threshold, x);
          bounded = true;
        }
      } catch (const Unsupported&) {
      }
    }
    if (!bounded)
      throw Unsupported("the base line " + print(*line.condition) + " may apply at large n");
  }
  if (r.main.fallback && !note(*r.main.fallback))
    throw Unsupported("no recursive line applies at large n");
  if (st.recursive.empty()) throw Unsupported("no recursive line");
  return st;
}

// Every size from lo to hi: T(n) > 0 (or >= 0).
void require_positive(SmallEvaluator& eval, const BigInt& lo, const BigInt& hi, bool strict,
                      int& count) {
  if (hi - lo > SmallEvaluator::kLargestSize) throw Unsupported("a base range too long");
  for (BigInt n = lo; n <= hi; ++n) {
    Value v = eval.at(n);
    if (!eval.at_least(v, Value(int64_t{0}), strict))
      throw Rejected{std::string("T(n) ") + (strict ? "> 0" : ">= 0") + " for " + lo.str() +
                     " <= n <= " + hi.str() + " fails at n = " + n.str() + ": T(n) = " + v.str()};
  }
  ++count;
}

// The driver bounds low·g <= f <= high·g from `from` on, for every line.
struct DriverFacts {
  ExprPtr g;      // bounds f from above (and from below, unless g_low differs)
  ExprPtr g_low;  // bounds f from below
  Rational low, high;
  BigInt from;
  Key key, key_low;
  bool two_classes = false;  // a comparison: g_low is another class than g
};

DriverFacts driver_facts(const CertificateData& c) {
  DriverFacts d;
  d.g = parse_text(c.driver_class, "driver class");
  d.low = parse_rational(c.driver_low, "driver constant");
  d.high = parse_rational(c.driver_high, "driver constant");
  d.from = std::max(parse_size(c.driver_from, "driver start"), BigInt(4));
  d.two_classes = !c.driver_class_low.empty();
  if (d.low <= 0 || d.high <= 0 || (!d.two_classes && d.high < d.low))
    throw Rejected{"the driver constants are not 0 < low <= high"};
  d.key = leading_key(expand(*d.g, Context{BigInt(16), 1, 0, nullptr}), "the driver class");
  d.g_low = d.two_classes ? parse_text(c.driver_class_low, "lower driver class") : d.g;
  d.key_low = leading_key(expand(*d.g_low, Context{BigInt(16), 1, 0, nullptr}), "the driver class");
  if (d.two_classes && compare_keys(d.key_low, d.key) > 0)
    throw Rejected{"the lower driver class grows faster than the upper one"};
  if (d.key.rho != 1 || d.key_low.rho != 1) throw Unsupported("an exponential driver class");
  return d;
}

void require_driver_bounds(const Recurrence& r, const Structure& st, const DriverFacts& d,
                           int& count) {
  for (const CaseLine* line : st.recursive) {
    Linear lin;
    linearize(line->body, 1, r.main.name, lin);
    on_some_modulus(
        [&](const Context& ctx, int& here) {
          Expansion f = driver_of(lin, ctx);
          Expansion g = expand(*d.g, ctx);
          Expansion g_low = d.two_classes ? expand(*d.g_low, ctx) : g;
          std::string where = " for every n >= " + d.from.str() + class_name(ctx);
          require(add(f, negate(scale(g_low, Coef::of(d.low)))), ctx,
                  "f(n) >= " + to_string(d.low) + (d.two_classes ? " g_low(n)" : " g(n)") + where,
                  here);
          require(add(scale(g, Coef::of(d.high)), negate(f)), ctx,
                  "f(n) <= " + to_string(d.high) + " g(n)" + where, here);
        },
        d.from, &r.helpers, count);
  }
}

// Leighton's form: every argument is s n + h(n) with 0 < s < 1 and h bounded.
struct Split {
  Rational a;
  Rational s;
  Rational t_low, t_high;  // h(n) in [t_low, t_high]
};

Split split_of(const Call& call, const Recurrence& r) {
  Expansion e = expand(*make_call("floor", {call.arg}), Context{BigInt(4), 1, 0, &r.helpers});
  Split sp{call.a, 0, 0, 0};
  bool linear = false;
  for (const Term& t : e.terms) {
    Interval c = t.coef.enclose();
    if (compare_keys(t.key, Key{1, RealNumber(0L), 0}) == 0) {
      sp.t_low = c.lower();
      sp.t_high = c.upper();
    } else if (compare_keys(t.key, Key{1, RealNumber(1L), 0}) == 0 && t.coef.exact) {
      sp.s = *t.coef.exact;
      linear = true;
    } else {
      throw Unsupported("the argument " + print(*call.arg) + " is not s n + O(1)");
    }
  }
  if (!linear) throw Unsupported("the argument " + print(*call.arg) + " does not grow with n");
  return sp;
}

RuleOutcome divide(const Recurrence& r, const Bound& bound, const CertificateData& c) {
  RuleOutcome out;
  if (!bound.is_asymptotic()) throw Unsupported("an explicit bound proved by a theorem");
  int& count = out.obligations;
  Structure st = structure_of(r);
  std::vector<Split> splits;
  for (const Call& call : st.calls) splits.push_back(split_of(call, r));
  for (const CaseLine* line : st.recursive) {
    Linear lin;
    linearize(line->body, 1, r.main.name, lin);
    bool same = lin.calls.size() == splits.size();
    for (size_t i = 0; same && i < lin.calls.size(); ++i) {
      Split sp = split_of(lin.calls[i], r);
      same = sp.a == splits[i].a && sp.s == splits[i].s;
    }
    if (!same) throw Unsupported("case lines that recurse differently");
  }
  Rational total = 0;
  BigInt threshold = st.threshold;
  for (const Split& sp : splits) {
    if (sp.a <= 0 || sp.s <= 0 || sp.s >= 1)
      throw Rejected{"Akra–Bazzi needs a_i > 0 and 0 < b_i < 1; the recurrence has a = " +
                     to_string(sp.a) + ", b = " + to_string(sp.s)};
    total += sp.a;
    // From here on every argument lies in [1, n - 1].
    Rational need =
        std::max(Rational((2 - sp.t_low) / sp.s), Rational((sp.t_high + 1) / (1 - sp.s)));
    threshold = std::max(threshold, ceil_of(need) + 1);
  }
  ++count;  // the recurrence has Leighton's form
  DriverFacts d = driver_facts(c);
  require_driver_bounds(r, st, d, count);
  // Leighton's base: T is positive on the window the recursion bottoms out
  // in from every n beyond base_end (sizes below it are never reached).
  SmallEvaluator eval(r);
  BigInt base_end = std::max(threshold, d.from);
  Rational reach = Rational(base_end + 1);
  for (const Split& sp : splits) reach = std::min(reach, sp.s * Rational(base_end + 1) + sp.t_low);
  require_positive(eval, std::max(BigInt(1), floor_of(reach)), base_end, true, count);

  if (!c.regularity_c.empty()) {
    // a f(n/b) <= c f(n): checked whenever a certificate states it, though
    // the conclusion below does not depend on it.
    Rational rc = parse_rational(c.regularity_c, "regularity constant");
    BigInt from = std::max(parse_size(c.regularity_from, "regularity start"), BigInt(4));
    if (rc >= 1) throw Rejected{"the regularity constant " + to_string(rc) + " is not below 1"};
    for (const CaseLine* line : st.recursive) {
      Linear lin;
      linearize(line->body, 1, r.main.name, lin);
      on_some_modulus(
          [&](const Context& ctx, int& here) {
            Expansion lhs = constant(Coef::of(Rational(0)));
            for (const Call& call : lin.calls) {
              auto aff = as_affine(expand(*make_call("floor", {call.arg}), ctx));
              if (!aff) throw Unsupported("an argument not exact on the class");
              const CaseLine& at_arg = line_on_class(r.main, ctx, aff->first, aff->second);
              Linear inner;
              linearize(at_arg.body, 1, r.main.name, inner);
              lhs =
                  add(lhs, scale(driver_of(inner, ctx, aff->first, aff->second), Coef::of(call.a)));
            }
            Expansion slack = add(scale(driver_of(lin, ctx), Coef::of(rc)), negate(lhs));
            require(slack, ctx,
                    "regularity: a f(n/b) <= " + to_string(rc) +
                        " f(n) for every n >= " + from.str() + class_name(ctx),
                    here);
          },
          from, &r.helpers, count);
    }
  }

  // The conclusion (Akra–Bazzi): p solves sum a_i s_i^p = 1, and with
  // f = Θ(n^q lg^k n), T = Θ(n^p) if q < p; Θ(n^p lg^(k+1) n) if q = p and
  // k > -1; Θ(n^q lg^k n) if q > p.
  auto S_minus_1 = [&](const RealNumber& x) {
    Coef sum = Coef::of(Rational(-1));
    for (const Split& sp : splits) {
      Coef term = rational_power(sp.s, x);
      Coef scaled = term.exact ? Coef::of(*term.exact * sp.a)
                               : Coef::of(term.enclose() * Interval(sp.a, kPrecision));
      sum = sum.exact && scaled.exact ? Coef::of(*sum.exact + *scaled.exact)
                                      : Coef::of(sum.enclose() + scaled.enclose());
    }
    if (sum.exact) return *sum.exact == 0 ? 0 : (*sum.exact > 0 ? 1 : -1);
    if (sum.range->certainly_positive()) return 1;
    if (sum.range->certainly_negative()) return -1;
    throw Unsupported("whether the critical exponent equals " + x.str() +
                      " cannot be decided exactly");
  };
  // Compares the solution driven by g = n^q lg^k n with the claimed class:
  // -1, 0, +1 as it is below, equal to, above it; `text` names it.
  Key claimed =
      leading_key(expand(*bound.growth, Context{BigInt(16), 1, 0, nullptr}), "the claimed bound");
  auto order_of = [&](const Key& g, std::string& text) {
    int q_vs_p = -S_minus_1(g.alpha);  // sign(S(x) - 1) > 0 means x < p
    if (q_vs_p > 0 || (q_vs_p == 0 && g.beta >= 0)) {
      Key t{1, g.alpha, q_vs_p > 0 ? g.beta : g.beta + 1};
      text = key_text(t);
      return compare_keys(t, claimed);
    }
    if (q_vs_p == 0 && g.beta == -1) throw Unsupported("a conclusion with lg lg n");
    // Θ(n^p), p known through S: compare p with the claimed exponent.
    text = "n^p";
    if (claimed.rho != 1) return claimed.rho > 1 ? -1 : 1;
    int c_vs_p = -S_minus_1(claimed.alpha);
    return c_vs_p != 0 ? -c_vs_p : (claimed.beta == 0 ? 0 : (claimed.beta > 0 ? -1 : 1));
  };
  if (!d.two_classes) {
    int q_vs_p = -S_minus_1(d.key.alpha);  // -1: q < p, 0: q = p, +1: q > p
    int named_case = 0;
    if (c.proof.rfind("master theorem, case ", 0) == 0) named_case = c.proof[21] - '0';
    int actual_case = q_vs_p < 0 ? 1 : (q_vs_p == 0 ? 2 : 3);
    if (named_case != 0 && named_case != actual_case)
      throw Rejected{"the certificate names case " + std::to_string(named_case) +
                     ", but the driver n^" + d.key.alpha.str() +
                     (q_vs_p < 0    ? " grows slower than"
                      : q_vs_p == 0 ? " matches"
                                    : " grows faster than") +
                     " n^p (case " + std::to_string(actual_case) + ")"};
  }
  ++count;
  // T lies between the solutions driven by low·g_low and high·g (a > 0: T is
  // monotone in f); Akra–Bazzi gives each. An O claim needs the upper one
  // at most the claim, an Ω claim the lower one at least, Θ both equal.
  std::string upper_text, lower_text;
  int upper = order_of(d.key, upper_text);
  int lower = d.two_classes ? order_of(d.key_low, lower_text) : upper;
  if (!d.two_classes) lower_text = upper_text;
  bool holds = bound.kind == BoundKind::kTheta  ? upper == 0 && lower == 0
               : bound.kind == BoundKind::kBigO ? upper <= 0
                                                : lower >= 0;
  if (!holds) {
    std::string gives =
        d.two_classes ? "O(" + upper_text + ") and Ω(" + lower_text + ")" : "Θ(" + upper_text + ")";
    throw Rejected{"Akra–Bazzi gives " + gives + ", which does not establish " + bound.text()};
  }
  ++count;
  out.status = RuleStatus::kRechecked;
  return out;
}

RuleOutcome subtract(const Recurrence& r, const Bound& bound, const CertificateData& c) {
  RuleOutcome out;
  int& count = out.obligations;
  if (!bound.is_asymptotic()) throw Unsupported("an explicit bound proved by a theorem");
  auto shape = [&](const Linear& lin) {
    if (lin.calls.size() != 1 || lin.calls[0].a != 1) return false;
    Split sp = split_of(lin.calls[0], r);
    return sp.s == 1 && sp.t_low == sp.t_high && sp.t_low < 0 && denominator(sp.t_low) == 1;
  };
  Structure st = structure_of(r);
  for (const CaseLine* line : st.recursive) {
    Linear lin;
    linearize(line->body, 1, r.main.name, lin);
    if (!shape(lin)) throw Unsupported("subtract-and-conquer other than T(n) = T(n - c) + f(n)");
  }
  Linear first;
  linearize(st.recursive[0]->body, 1, r.main.name, first);
  if (!shape(first)) throw Unsupported("subtract-and-conquer other than T(n) = T(n - c) + f(n)");
  Split sp = split_of(first.calls[0], r);
  ++count;
  DriverFacts d = driver_facts(c);
  if (d.two_classes) throw Unsupported("a comparison with two drivers in subtract-and-conquer");
  // The sum of g = n^q lg^k n over the sizes up to n (common practice:
  // compare it with the integral): Θ(n g(n)) for q > -1, Θ(lg^(k+1) n) for
  // q = -1 and k > -1 (the harmonic numbers for k = 0); it converges below.
  const RealNumber minus_one(-1L);
  if (d.key.alpha < minus_one || (d.key.alpha == minus_one && d.key.beta <= -1))
    throw Unsupported("a driver whose sum converges or grows like lg lg n");
  require_driver_bounds(r, st, d, count);
  SmallEvaluator eval(r);
  BigInt base_end = std::max(BigInt(st.threshold + numerator(Rational(-sp.t_low))), d.from);
  require_positive(eval, BigInt(1), base_end, false, count);
  // T(n) = T(n0) + the sum of f over n0 < j <= n, j ≡ n (mod c), and f lies
  // between low·g and high·g there.
  Key t = d.key.alpha == minus_one ? Key{1, RealNumber(0L), d.key.beta + 1}
                                   : Key{1, d.key.alpha + RealNumber(1L), d.key.beta};
  Key claimed =
      leading_key(expand(*bound.growth, Context{BigInt(16), 1, 0, nullptr}), "the claimed bound");
  int order = compare_keys(t, claimed);
  bool holds = bound.kind == BoundKind::kTheta  ? order == 0
               : bound.kind == BoundKind::kBigO ? order <= 0
                                                : order >= 0;
  if (!holds)
    throw Rejected{"the sum gives Θ(" + key_text(t) + "), which does not establish " +
                   bound.text()};
  ++count;
  out.status = RuleStatus::kRechecked;
  return out;
}

// One side of an explicit bound: its expression and strictness, and the
// hypothesis carried through the step.
struct SideProof {
  Side side;
  ExprPtr claimed;
  bool strict;
  ExprPtr carried;
};

std::vector<SideProof> sides_of(const Bound& bound, const CertificateData& c) {
  std::vector<SideProof> out;
  std::vector<std::string> parts;
  std::string text = c.hypothesis;
  for (size_t at; (at = text.find(" and ")) != std::string::npos; text = text.substr(at + 5))
    parts.push_back(text.substr(0, at));
  parts.push_back(text);
  for (const std::string& part : parts) {
    size_t space = part.find(' ');
    if (space == std::string::npos)
      throw Rejected{"the hypothesis '" + c.hypothesis + "' has no relation"};
    std::string op = part.substr(0, space);
    ExprPtr e = parse_text(part.substr(space + 1), "hypothesis");
    bool upper = op == "<=" || op == "<" || op == "=";
    bool lower = op == ">=" || op == ">" || op == "=";
    if (!upper && !lower) throw Rejected{"the hypothesis '" + part + "' has an unknown relation"};
    if (upper) {
      if (!bound.upper) throw Rejected{"the hypothesis bounds T from above; the claim does not"};
      out.push_back({Side::kUpper, bound.upper, bound.strict_upper, e});
    }
    if (lower) {
      if (!bound.lower) throw Rejected{"the hypothesis bounds T from below; the claim does not"};
      out.push_back({Side::kLower, bound.lower, bound.strict_lower, e});
    }
  }
  if ((bound.upper &&
       std::none_of(out.begin(), out.end(), [](auto& s) { return s.side == Side::kUpper; })) ||
      (bound.lower &&
       std::none_of(out.begin(), out.end(), [](auto& s) { return s.side == Side::kLower; })))
    throw Rejected{"the certificate does not cover every side of the claim"};
  return out;
}

// T(n) against e for every n in [lo, hi].
void require_range(SmallEvaluator& eval, const SideProof& sp, const ExprPtr& e, const BigInt& lo,
                   const BigInt& hi, int& count) {
  if (lo > hi) return;
  if (hi - lo > SmallEvaluator::kLargestSize) throw Unsupported("an exact range too long");
  const char* op = sp.side == Side::kUpper ? (sp.strict ? "<" : "<=") : (sp.strict ? ">" : ">=");
  for (BigInt n = lo; n <= hi; ++n) {
    Value t = eval.at(n);
    Value b = eval.value(*e, n);
    bool holds =
        sp.side == Side::kUpper ? eval.at_least(b, t, sp.strict) : eval.at_least(t, b, sp.strict);
    if (!holds)
      throw Rejected{"T(n) " + std::string(op) + " " + print(*e) + " for " + lo.str() +
                     " <= n <= " + hi.str() + " fails at n = " + n.str() + ": T(n) = " + t.str() +
                     ", bound " + b.str()};
  }
  ++count;
}

RuleOutcome induction(const Recurrence& r, const Bound& bound, const CertificateData& c) {
  RuleOutcome out;
  int& count = out.obligations;
  if (bound.is_asymptotic()) throw Unsupported("an asymptotic bound proved by induction");
  if (r.full_history) throw Unsupported("a sum over earlier values of T");
  if (!r.class_terms.empty()) throw Unsupported("a growth class written inside the recurrence");
  BigInt m = parse_size(c.checked_to, "end of the exact range");
  BigInt modulus = parse_size(c.modulus, "modulus");
  if (modulus < 1 || modulus > 4096)
    throw Rejected{"the modulus " + modulus.str() + " is out of range"};
  uint64_t L = static_cast<uint64_t>(modulus);
  BigInt from = m + 1;
  if (from < 4) throw Rejected{"the step must start at n >= 4"};
  SmallEvaluator eval(r);
  for (const SideProof& sp : sides_of(bound, c)) {
    const char* op = sp.side == Side::kUpper ? "<=" : ">=";
    // The exact checks first: they are certain either way.
    require_range(eval, sp, sp.claimed, bound.n0, m, count);
    BigInt lowest = m;
    // A step the re-checker cannot finish waits until the exact check where
    // the step lands has had its say (a false hypothesis fails there for sure).
    std::optional<Unsupported> unfinished;
    for (uint64_t res = 0; res < L; ++res) try {
        Context ctx{from, L, res, &r.helpers};
        std::string where = class_name(ctx);
        const CaseLine& line = line_on_class(r.main, ctx);
        Linear lin;
        linearize(line.body, 1, r.main.name, lin);
        if (sp.strict && lin.calls.empty())
          throw Rejected{"a strict bound needs a recursive term" + where};
        BigInt first = from + floor_mod(BigInt(res) - from, modulus);
        struct Arg {
          Rational a, s, t;
        };
        std::vector<Arg> args;
        for (const Call& call : lin.calls) {
          if (call.a <= 0) throw Rejected{"a recursive term with a coefficient <= 0" + where};
          auto aff = as_affine(expand(*make_call("floor", {call.arg}), ctx));
          if (!aff)
            throw Rejected{"the argument " + print(*call.arg) + " is not exact modulo " +
                           modulus.str() + where};
          auto [s, t] = *aff;
          if (s <= 0 || s > 1 || (1 - s) * Rational(first) - t <= 0)
            throw Rejected{"the argument " + print(*call.arg) + " does not shrink for n > " +
                           m.str() + where};
          Rational low = s * Rational(first) + t;
          if (denominator(low) != 1 || low < 0)
            throw Rejected{"the argument " + print(*call.arg) + " is not a size"};
          lowest = std::min(lowest, numerator(low));
          args.push_back({call.a, s, t});
        }
        // The step's slack, expanded in x = n + shift: H(n) = 3 (n - 1)^(lg 3)
        // is a single term in x = n - 1, so an identity stays exact there.
        auto slack_in = [&](const Context& shifted, const Rational& shift) {
          Expansion rhs = driver_of(lin, shifted, 1, -shift);
          for (const Arg& arg : args)
            rhs = add(rhs, scale(expand(*sp.carried, shifted, arg.s, arg.t - arg.s * shift),
                                 Coef::of(arg.a)));
          Expansion slack = add(expand(*sp.carried, shifted, 1, -shift), negate(rhs));
          return sp.side == Side::kLower ? negate(slack) : slack;
        };
        require_shifted(slack_in, ctx,
                        std::string("step: ") +
                            (sp.side == Side::kUpper ? "H(n) - (the right side with H)"
                                                     : "(the right side with H) - H(n)") +
                            " >= 0 for every real n > " + m.str() + where +
                            ", H(n) = " + print(*sp.carried),
                        count);
        if (!same_tree(*sp.carried, *sp.claimed)) {
          auto inside_in = [&](const Context& shifted, const Rational& shift) {
            Expansion inside = add(expand(*sp.claimed, shifted, 1, -shift),
                                   negate(expand(*sp.carried, shifted, 1, -shift)));
            return sp.side == Side::kLower ? negate(inside) : inside;
          };
          require_shifted(inside_in, ctx,
                          print(*sp.carried) + " " + op + " " + print(*sp.claimed) +
                              " for every n > " + m.str() + where,
                          count);
        }
      } catch (const Unsupported& u) {
        if (!unfinished) unfinished = u;
      }
    require_range(eval, sp, sp.carried, lowest, m, count);
    if (unfinished) throw *unfinished;
  }
  out.status = RuleStatus::kRechecked;
  return out;
}

}  // namespace

RuleOutcome check_certificate(const Recurrence& recurrence, const Bound& bound,
                              const CertificateData& certificate) {
  try {
    if (certificate.method == "divide") return divide(recurrence, bound, certificate);
    if (certificate.method == "subtract") return subtract(recurrence, bound, certificate);
    if (certificate.method == "induction") return induction(recurrence, bound, certificate);
    return {RuleStatus::kNotRechecked,
            "the method '" + certificate.method + "' has no rule in the re-checker", 0};
  } catch (const Rejected& r) {
    return {RuleStatus::kRejected, r.why, 0};
  } catch (const Unsupported& u) {
    return {RuleStatus::kNotRechecked, u.what(), 0};
  } catch (const PrecisionShortfall& e) {
    // A comparison the exact reals cannot decide, a domain error, a budget:
    // the re-checker cannot follow, which is never an acceptance.
    return {RuleStatus::kNotRechecked, std::string("the re-checker could not decide: ") + e.what(),
            0};
  } catch (const DomainError& e) {
    return {RuleStatus::kNotRechecked, std::string("the re-checker met: ") + e.what(), 0};
  } catch (const LimitReached& e) {
    return {RuleStatus::kNotRechecked, std::string("the re-checker ran out: ") + e.what(), 0};
  }
}

}  // namespace thetagate::engine::recheck
