#include "verifier/recheck/rule_support.h"

#include <algorithm>
#include <optional>

#include "verifier/syntax/parser.h"

namespace thetagate::engine::recheck {

namespace {

// Residue moduli tried where a certificate does not name one.
constexpr uint64_t kModuli[] = {1, 2, 3, 4, 6, 8, 12, 16, 24, 32, 48, 64};

}  // namespace

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

namespace {

// `e` with its one sum over T's values (reached through products,
// quotients' numerators and negation only) replaced by 1, the sum kept in
// `sum`: e = (result) · sum.
ExprPtr factor_of_sum(const ExprPtr& e, const std::string& name, const Expr*& sum) {
  if (!calls_function(*e, name)) return e;
  if (e->kind == ExprKind::kSum && !sum) {
    sum = e.get();
    return make_number(Rational(1));
  }
  bool linear = e->kind == ExprKind::kMul || e->kind == ExprKind::kNeg ||
                (e->kind == ExprKind::kDiv && !calls_function(*e->args[1], name));
  if (!linear) throw Unsupported("T inside " + print(*e));
  auto copy = std::make_shared<Expr>(*e);
  for (ExprPtr& a : copy->args) a = factor_of_sum(a, name, sum);
  // (2/n)·1 reads as 2/n in messages.
  auto is_one = [](const ExprPtr& x) { return x->kind == ExprKind::kNumber && x->number == 1; };
  if (copy->kind == ExprKind::kMul && is_one(copy->args[1])) return copy->args[0];
  if (copy->kind == ExprKind::kMul && is_one(copy->args[0])) return copy->args[1];
  update_depth(*copy);
  return copy;
}

}  // namespace

SumLine sum_line_of(const ExprPtr& body, const std::string& name) {
  // body = A + W·sum: split off the one additive term that mentions T.
  ExprPtr a, term;
  std::function<void(const ExprPtr&, bool)> split = [&](const ExprPtr& e, bool minus) {
    if (e->kind == ExprKind::kAdd || e->kind == ExprKind::kSub) {
      split(e->args[0], minus);
      split(e->args[1], e->kind == ExprKind::kSub ? !minus : minus);
      return;
    }
    ExprPtr signed_e = minus ? make_unary(ExprKind::kNeg, e) : e;
    if (!calls_function(*e, name)) {
      a = a ? make_binary(ExprKind::kAdd, a, signed_e) : signed_e;
      return;
    }
    if (term) throw Unsupported("T in two terms of the line");
    term = signed_e;
  };
  split(body, false);
  if (!term) throw Unsupported("no sum over earlier values of T");
  SumLine out;
  out.a = a ? a : make_number(Rational(0));
  out.w = factor_of_sum(term, name, out.sum);
  if (!out.sum || calls_function(*out.w, name)) throw Unsupported("T outside the sum");
  const Expr& summand = *out.sum->args[2];
  if (summand.kind != ExprKind::kCall || summand.name != name ||
      summand.args[0]->kind != ExprKind::kBound || summand.args[0]->name != out.sum->name ||
      calls_function(*out.sum->args[0], name) || calls_function(*out.sum->args[1], name))
    throw Unsupported("a sum other than sum(k, lo, hi, T(k))");
  return out;
}

Expansion driver_of(const Linear& lin, const Context& ctx, const Rational& s, const Rational& t) {
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

// The leading key of a class written in the claim language (no helpers).
Key growth_key(const Expr& g, const std::string& what) {
  return leading_key(expand(g, Context{BigInt(16), 1, 0, nullptr}), what);
}

// Rejects unless a class ordered `upper` and `lower` (-1, 0, +1) against the
// claimed one from above and below establishes the claim's kind.
void require_establishes(const Bound& bound, int upper, int lower, const std::string& gives) {
  bool holds = bound.kind == BoundKind::kTheta  ? upper == 0 && lower == 0
               : bound.kind == BoundKind::kBigO ? upper <= 0
                                                : lower >= 0;
  if (!holds) throw Rejected{gives + ", which does not establish " + bound.text()};
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

}  // namespace thetagate::engine::recheck
