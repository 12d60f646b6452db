#include "verifier/derivation/derive.h"

#include "verifier/derivation/classify.h"
#include "verifier/derivation/shape.h"
#include "verifier/derivation/theorems/akra_bazzi.h"
#include "verifier/derivation/theorems/change_of_variables.h"
#include "verifier/derivation/theorems/full_history.h"
#include "verifier/derivation/theorems/linear.h"
#include "verifier/derivation/theorems/master.h"
#include "verifier/derivation/theorems/normalised_roots.h"
#include "verifier/derivation/theorems/subtract.h"
#include "verifier/evaluation/evaluator.h"

namespace thetagate::engine {

namespace {

Budget derivation_budget(std::optional<double> clock_limit) {
  // The step limit is what ends a long evaluation: at most a few seconds
  // even on the general path (intervals, ~10 µs a step), so the same
  // recurrence always gets the same derivation. The time limit only guards
  // against hangs, as in the checker.
  Budget b;
  b.max_seconds = 60.0;
  b.max_steps = 400'000;
  b.max_memo_entries = 200'000;
  if (clock_limit) b.max_seconds = *clock_limit;
  return b;
}

// Whether a case-line condition holds at n, by exact evaluation.
bool holds(Evaluator& ev, const Expr& c, const SourceText& source, const BigInt& n) {
  switch (c.kind) {
    case ExprKind::kAnd:
      return holds(ev, *c.args[0], source, n) && holds(ev, *c.args[1], source, n);
    case ExprKind::kOr:
      return holds(ev, *c.args[0], source, n) || holds(ev, *c.args[1], source, n);
    case ExprKind::kNot:
      return !holds(ev, *c.args[0], source, n);
    case ExprKind::kEven:
    case ExprKind::kOdd: {
      Value v = ev.evaluate(*c.args[0], source, n);
      bool even = v.is_integer() && floor_mod(v.integer(), 2) == 0;
      return c.kind == ExprKind::kEven ? even : (v.is_integer() && !even);
    }
    default: {
      int r = ev.compare_at(*c.args[0], source, *c.args[1], source, n);
      return comparison_holds(c.kind, r);
    }
  }
}

// The smallest n >= 1 at which none of T's point cases and lines for bounded
// n applies, decided exactly up to kLastBaseSize; nullopt past it, or when a
// condition cannot be decided.
constexpr int64_t kLastBaseSize = 4096;

std::optional<BigInt> recursive_start(const Shape& shape, Evaluator& ev, const SourceText& source) {
  try {
    for (BigInt n = 1; n <= kLastBaseSize; ++n) {
      bool base = false;
      for (const CaseLine* line : shape.base_cases) {
        if (line->point ? *line->point == n
                        : line->condition && holds(ev, *line->condition, source, n)) {
          base = true;
          break;
        }
      }
      if (!base) return n;
    }
  } catch (const InputError&) {
  } catch (const LimitReached&) {
  }
  return std::nullopt;
}

std::string when(const std::string& condition) {
  return condition == "otherwise" ? condition : "when " + condition;
}

// The extremes of a driving function whose alternatives differ in class.
void driving_extremes(const std::vector<ExprPtr>& alternatives, const HelperTable* helpers,
                      DerivationInput& input) {
  for (const auto& f : alternatives) {
    if (!f) return;
    Classification c = classify(*f, helpers);
    if (!c) return;
    if (!input.driving_lower || compare(*c.growth, *input.driving_lower) < 0)
      input.driving_lower = c.growth;
    if (!input.driving_upper || compare(*c.growth, *input.driving_upper) > 0)
      input.driving_upper = c.growth;
  }
}

// f's additive terms with their signs (+1 or -1).
void additive_terms(const ExprPtr& e, int sign, std::vector<std::pair<ExprPtr, int>>& out) {
  if (e->kind == ExprKind::kAdd || e->kind == ExprKind::kSub) {
    additive_terms(e->args[0], sign, out);
    additive_terms(e->args[1], e->kind == ExprKind::kAdd ? sign : -sign, out);
  } else if (e->kind == ExprKind::kNeg) {
    additive_terms(e->args[0], -sign, out);
  } else {
    out.push_back({e, sign});
  }
}

// f with growth classes as terms (f = rest + Θ(g) + O(h) + Ω(k)): its class
// where every term is Θ; otherwise the class of its upper bound (rest + g +
// h, none with an Ω term) and of its lower bound (rest + g + k, or nothing).
// The model put each class's representative in the class's place; a term of
// f equal to a representative is taken as that class (once per class term).
void classify_class_driving(const Shape& shape, const Recurrence& rec, DerivationInput& input) {
  input.driving_is_class = true;
  std::vector<std::pair<ExprPtr, int>> terms;
  additive_terms(shape.driving, 1, terms);
  std::vector<bool> used(rec.class_terms.size(), false);
  ExprPtr upper, lower;
  bool has_upper = true;
  bool one_sided = false;
  auto append = [](ExprPtr& sum, const ExprPtr& t, int sign) {
    if (!sum) {
      sum = sign > 0 ? t : make_unary(ExprKind::kNeg, t);
    } else {
      sum = make_binary(sign > 0 ? ExprKind::kAdd : ExprKind::kSub, sum, t);
    }
  };
  for (const auto& [t, sign] : terms) {
    std::optional<ClassTermKind> kind;
    for (size_t i = 0; i < rec.class_terms.size() && sign > 0; ++i) {
      const ClassTerm& c = rec.class_terms[i];
      if (used[i] || c.base_case || !same_tree(*t, *c.representative)) continue;
      used[i] = true;
      kind = c.kind;
      break;
    }
    if (kind == ClassTermKind::kOmega) {
      has_upper = false;
      one_sided = true;
    }
    if (kind == ClassTermKind::kBigO) one_sided = true;
    if (kind != ClassTermKind::kOmega) append(upper, t, sign);
    if (kind != ClassTermKind::kBigO) append(lower, t, sign);
  }
  if (!one_sided) {
    input.driving = classify(*shape.driving, &rec.helpers);
    input.driving.coefficient_known = false;  // any function of the class
    return;
  }
  input.driving_one_sided = true;
  input.driving.reason =
      "f(n) has an O or Ω term, which bounds it on one side only, so it has no class";
  if (has_upper) {
    Classification u = classify(*upper, &rec.helpers);
    if (u) input.driving_upper = u.growth;
  }
  if (!lower) {
    input.driving_lower_zero = true;
  } else {
    Classification l = classify(*lower, &rec.helpers);
    if (l) input.driving_lower = l.growth;
  }
}

void classify_driving(const Shape& shape, const Recurrence& rec, DerivationInput& input) {
  const HelperTable* helpers = &rec.helpers;
  bool class_terms = false;
  for (const ClassTerm& c : rec.class_terms) class_terms = class_terms || !c.base_case;
  if (class_terms && shape.driving) {
    classify_class_driving(shape, rec, input);
    return;
  }
  if (class_terms) {
    // Lines that differ by condition, one with a class term: the case-line
    // machinery would classify the class's representative as if it were f
    // (an O(n^2) term as n^2, though 0 is a member too). Not supported.
    input.driving_is_class = true;
    input.driving.reason =
        "a growth class as a term of lines that differ by condition is not supported by the "
        "theorems here";
    return;
  }
  if (shape.has_driving_cases()) {
    std::vector<ExprPtr> alternatives;
    std::vector<Classification> classes;
    for (const auto& c : shape.driving_cases) {
      alternatives.push_back(c.f);
      classes.push_back(c.f ? classify(*c.f, helpers) : Classification{});
      if (!c.f) classes.back().zero = true;
    }
    for (size_t i = 0; i < classes.size(); ++i) {
      if (!classes[i]) {
        input.driving.reason = "when " + shape.driving_cases[i].condition + ", f(n) = " +
                               (shape.driving_cases[i].f ? print(*shape.driving_cases[i].f) : "0") +
                               ": " + classes[i].reason;
        return;
      }
    }
    for (size_t i = 1; i < classes.size(); ++i) {
      if (compare(*classes[i].growth, *classes[0].growth) != 0) {
        input.driving.reason =
            "the case lines give f(n) = " + print(*shape.driving_cases[0].f) + " " +
            when(shape.driving_cases[0].condition) + " but " + print(*shape.driving_cases[i].f) +
            " " + when(shape.driving_cases[i].condition) + ", of different classes (" +
            to_string(*classes[0].growth) + " and " + to_string(*classes[i].growth) + ")";
        driving_extremes(alternatives, helpers, input);
        return;
      }
    }
    input.driving.growth = classes[0].growth;
    input.driving.coefficient_known = false;
    return;
  }
  if (!shape.driving) {
    input.driving.zero = true;
    input.driving.reason = "f(n) = 0";
    return;
  }
  input.driving = classify(*shape.driving, helpers);
  if (!input.driving && !input.driving.zero && shape.driving->kind == ExprKind::kCall) {
    // f(n) is one helper whose lines differ in class: their extremes still help case 3.
    auto it = rec.helpers.find(shape.driving->name);
    if (it != rec.helpers.end() && shape.driving->args.size() == 1) {
      std::vector<ExprPtr> alternatives;
      for (const CaseLine* line : it->second.lines_in_order()) {
        if (line->point || (line->condition && condition_reach(*line->condition) < 0)) continue;
        alternatives.push_back(substitute(line->body, shape.driving->args[0]));
      }
      driving_extremes(alternatives, helpers, input);
    }
  }
}

bool holds_node(const Expr& e, const Expr* node) {
  if (&e == node) return true;
  for (const ExprPtr& a : e.args)
    if (holds_node(*a, node)) return true;
  return false;
}

// Sets input.leaves_positive: every line of T without a recursive call gives
// a positive constant. A class term counts only as the whole body, and only
// Θ or Ω (O(1) has 0 as a member); a body that depends on n, calls a helper
// or cannot be evaluated counts as not known to be positive.
void check_leaves(const Recurrence& rec, DerivationInput& input) {
  auto reason = [&](const CaseLine& line, const std::string& why) {
    std::string where =
        line.point ? rec.main.name + "(" + line.point->str() + ")"
                   : rec.main.name + "(n)" +
                         (line.condition ? " where " + print(*line.condition) : std::string());
    return "the base value " + where + " = " + print(*line.body) + " " + why;
  };
  for (const CaseLine* line : rec.main.lines_in_order()) {
    if (!line->calls.empty() || line->sums_calls) continue;
    const ClassTerm* term = nullptr;
    for (const ClassTerm& c : rec.class_terms) {
      if (c.base_case && holds_node(*line->body, c.representative.get())) {
        term = &c;
        break;
      }
    }
    if (term && (term->representative != line->body || term->kind == ClassTermKind::kBigO)) {
      input.leaves_reason =
          reason(*line, term->kind == ClassTermKind::kBigO ? "has 0 among its members"
                                                           : "is not a class alone");
      return;
    }
    std::optional<RealNumber> v = constant_value(*line->body);  // empty where n occurs
    bool positive = false;
    try {
      positive = v && v->sign() > 0;
    } catch (const PrecisionShortfall&) {
    }
    if (!positive) {
      input.leaves_reason =
          reason(*line, v ? "is not positive" : "is not a constant known to be positive");
      return;
    }
  }
  input.leaves_positive = true;
}

// "master theorem: needs exactly one ...", not "master theorem: the master
// theorem needs exactly one ...".
std::string outcome_reason(const TheoremOutcome& o) {
  std::string failure = o.failure;
  for (const std::string& lead : {"the " + o.theorem + " ", o.theorem + " "}) {
    if (failure.rfind(lead, 0) == 0) {
      failure = failure.substr(lead.size());
      break;
    }
  }
  return o.theorem + ": " + failure;
}

}  // namespace

Derivation derive(const Recurrence& recurrence, std::optional<double> clock_limit) {
  Derivation d;
  d.notes = recurrence.notes;
  Shape shape = extract_shape(recurrence);
  if (!shape.ok) {
    d.failed_hypotheses.push_back("no theorem's shape fits: " + shape.reason);
    return d;
  }
  DerivationInput input;
  input.shape = &shape;
  input.helpers = &recurrence.helpers;
  classify_driving(shape, recurrence, input);
  check_leaves(recurrence, input);
  d.driving = input.driving;
  d.driving_is_class = input.driving_is_class;
  d.driving_one_sided = input.driving_one_sided;
  d.driving_upper = input.driving_upper;
  d.driving_lower = input.driving_lower;
  // Exact values of T and f, for the theorems that look at numbers. Not
  // when the recurrence has a class term: its values are one member's, and a
  // theorem that solves with them (a linear recurrence's initial values and
  // polynomial driver) would prove the claim for that member only.
  if (recurrence.class_terms.empty()) {
    // A non-owning handle: the evaluator lives only inside this call.
    std::shared_ptr<const Recurrence> handle(std::shared_ptr<const Recurrence>(), &recurrence);
    auto evaluator = std::make_shared<Evaluator>(handle, derivation_budget(clock_limit));
    const SourceText& source = recurrence.source;
    input.value_at = [evaluator](const BigInt& n) -> std::optional<Value> {
      // Input errors (lg 0 at this n) and limits mean "no value here"; any
      // other exception is a bug and propagates.
      try {
        return evaluator->value_at(n);
      } catch (const InputError&) {
        return std::nullopt;
      } catch (const LimitReached&) {
        return std::nullopt;
      }
    };
    input.driving_at = [evaluator, &shape, &source](const BigInt& n) -> std::optional<Value> {
      try {
        if (shape.driving) return evaluator->evaluate(*shape.driving, source, n);
        for (const auto& c : shape.driving_cases) {
          if (c.test && !holds(*evaluator, *c.test, source, n)) continue;
          return c.f ? evaluator->evaluate(*c.f, source, n) : Value(int64_t{0});
        }
      } catch (const InputError&) {
      } catch (const LimitReached&) {
      }
      return std::nullopt;
    };
  }
  if (!shape.roots.empty()) {
    // Only the base lines' conditions are evaluated: a class term in T's
    // body does not matter to them.
    std::shared_ptr<const Recurrence> handle(std::shared_ptr<const Recurrence>(), &recurrence);
    Evaluator conditions(handle, derivation_budget(clock_limit));
    input.recursive_from = recursive_start(shape, conditions, recurrence.source);
  }
  using Theorem = std::pair<const char*, TheoremOutcome (*)(const DerivationInput&)>;
  std::vector<Theorem> theorems;
  if (!shape.sums.empty())
    theorems = {{"full-history summation factor", full_history}};
  else if (!shape.scaled.empty())
    theorems = {{"master theorem", master_theorem}, {"Akra–Bazzi", akra_bazzi}};
  else if (!shape.roots.empty() && shape.roots[0].coefficient.varies())
    theorems = {{kNormalisedRootsTheorem, normalised_change_of_variables}};
  else if (!shape.roots.empty())
    theorems = {{"change of variables", change_of_variables}};
  else if (!shape.subtractive.empty()) {
    theorems = {{"subtract-and-conquer", subtract_and_conquer},
                {"linear recurrence with constant coefficients", linear_recurrence}};
  }
  if (!shape.scaled.empty() && (!shape.subtractive.empty() || !shape.roots.empty())) {
    d.failed_hypotheses.push_back(
        "the recurrence mixes T(b n) terms with T(n - c) or T(n^(1/k)) terms; no theorem here "
        "covers that");
  }
  for (const auto& [name, theorem] : theorems) {
    TheoremOutcome o;
    // What a theorem may meet on valid input; anything else is a bug.
    try {
      o = theorem(input);
    } catch (const LimitReached& e) {
      o.failure = std::string("could not be decided: ") + e.what();
    } catch (const PrecisionShortfall& e) {
      o.failure = std::string("could not be decided: ") + e.what();
    } catch (const DomainError& e) {
      o.failure = std::string("could not be decided: ") + e.what();
    } catch (const InputError& e) {
      o.failure = std::string("could not be decided: ") + e.diagnostic().message;
    }
    if (o.theorem.empty()) o.theorem = name;
    d.outcomes.push_back(o);
    if (!o.applies()) {
      d.failed_hypotheses.push_back(outcome_reason(o));
      continue;
    }
    if (!d.growth) {
      d.growth = o.growth;
      d.method = o.method;
      d.steps = o.steps;
      d.theorem = o.theorem;
      d.regularity = o.regularity;
      d.normalisation = o.normalisation;
    } else if (compare(*d.growth, *o.growth) != 0) {
      // Two theorems whose hypotheses both hold cannot disagree: one of them is wrong.
      throw InternalError("", d.method + " gives Θ(" + to_string(*d.growth) + ") but " + o.method +
                                  " gives Θ(" + to_string(*o.growth) + ")");
    }
  }
  if (d.growth) d.derived = to_string(*d.growth);
  if (!d.growth) {
    // No Θ class: the first one-sided bound a theorem found by comparison.
    for (const TheoremOutcome& o : d.outcomes) {
      if (!o.upper && !o.lower) continue;
      d.upper = o.upper;
      d.lower = o.lower;
      d.method = o.bounds_method;
      d.steps = o.bounds_steps;
      break;
    }
  }
  if (!d.growth && !recurrence.class_terms.empty()) {
    // The member with each class's own g: its class refutes what it breaks.
    Recurrence member = recurrence;
    member.class_terms.clear();
    Derivation m = derive(member, clock_limit);
    if (m.growth) {
      std::string which;
      for (const ClassTerm& c : recurrence.class_terms) {
        if (c.base_case) continue;
        std::string g = print(*c.representative);
        which +=
            (which.empty() ? "" : ", ") + g + " for " + class_term_name(c.kind) + "(" + g + ")";
      }
      d.member_growth = m.growth;
      d.member_method = (which.empty() ? std::string("its values") : which) + ": " + m.method;
    }
  }
  return d;
}

std::string Derivation::bound_text() const {
  if (growth) return "Theta(" + to_string(*growth) + ")";
  std::string s;
  if (upper) s = "O(" + to_string(*upper) + ")";
  if (lower) s += (s.empty() ? "" : " and ") + std::string("Omega(") + to_string(*lower) + ")";
  return s;
}

const char* agreement_name(Agreement a) {
  switch (a) {
    case Agreement::kSame:
      return "same";
    case Agreement::kLoose:
      return "loose";
    case Agreement::kContradicts:
      return "contradicts";
  }
  return "?";
}

namespace {

// The claim against T(n) = O(upper) and/or Ω(lower): O(g) holds when g is at
// least the upper bound and is refuted when g is below the lower one; Ω(g)
// the other way round; Θ(g) can only be refuted (outside [lower, upper]).
ClaimComparison compare_one_sided(const Derivation& derivation, const Bound& bound,
                                  ClaimComparison r) {
  const GrowthClass& g = *r.claimed;
  r.agreement.reset();
  auto settle = [&](Agreement a, const GrowthClass& derived, BoundKind relation,
                    bool claimed_below) {
    r.agreement = a;
    r.derived = derived;
    r.relation = relation;
    r.claimed_below = claimed_below;
  };
  try {
    bool upper_side = bound.kind == BoundKind::kBigO || bound.kind == BoundKind::kTheta;
    bool lower_side = bound.kind == BoundKind::kOmega || bound.kind == BoundKind::kTheta;
    if (upper_side && derivation.lower && compare(g, *derivation.lower) < 0) {
      settle(Agreement::kContradicts, *derivation.lower, BoundKind::kOmega, true);
    } else if (lower_side && derivation.upper && compare(g, *derivation.upper) > 0) {
      settle(Agreement::kContradicts, *derivation.upper, BoundKind::kBigO, false);
    } else if (bound.kind == BoundKind::kBigO && derivation.upper &&
               compare(g, *derivation.upper) >= 0) {
      // O(g) with g the derived upper bound itself is as tight as anything
      // derived says; only a larger g is known to be loose.
      settle(compare(g, *derivation.upper) == 0 ? Agreement::kSame : Agreement::kLoose,
             *derivation.upper, BoundKind::kBigO, false);
    } else if (bound.kind == BoundKind::kOmega && derivation.lower &&
               compare(g, *derivation.lower) <= 0) {
      settle(compare(g, *derivation.lower) == 0 ? Agreement::kSame : Agreement::kLoose,
             *derivation.lower, BoundKind::kOmega, false);
    }
    if (!r.agreement && derivation.member_growth) {
      // Not settled by the bounds every member obeys; one member may still
      // break the claim.
      int c = compare(g, *derivation.member_growth);
      if ((upper_side && c < 0) || (lower_side && c > 0)) {
        settle(Agreement::kContradicts, *derivation.member_growth, BoundKind::kTheta, c < 0);
        r.method = "the member with " + derivation.member_method;
      }
    }
  } catch (const PrecisionShortfall& e) {
    r.agreement.reset();
    r.claim_unclassified = true;
    r.detail = std::string("the claimed and derived classes could not be ordered: ") + e.what();
  }
  return r;
}

}  // namespace

ClaimComparison compare_with_derivation(const Derivation& derivation, const Bound& bound) {
  ClaimComparison r;
  if (!bound.is_asymptotic()) return r;
  Classification g = classify(*bound.growth);
  if (!g) {
    r.claim_unclassified = true;
    r.detail = "the claimed class " + print(*bound.growth) + " has no normal form: " + g.reason;
    return r;
  }
  r.claimed = g.growth;
  if (derivation.one_sided()) return compare_one_sided(derivation, bound, r);
  if (!derivation.growth) return r;
  r.derived = derivation.growth;
  int c;
  try {
    c = compare(*g.growth, *derivation.growth);
  } catch (const PrecisionShortfall& e) {
    r.claim_unclassified = true;
    r.detail = std::string("the claimed and derived classes could not be ordered: ") + e.what();
    return r;
  }
  if (c == 0) {
    r.agreement = Agreement::kSame;
  } else if ((bound.kind == BoundKind::kBigO && c > 0) ||
             (bound.kind == BoundKind::kOmega && c < 0)) {
    r.agreement = Agreement::kLoose;
  } else {
    r.agreement = Agreement::kContradicts;
    r.claimed_below = c < 0;
  }
  return r;
}

}  // namespace thetagate::engine
