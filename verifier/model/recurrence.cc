#include "verifier/model/recurrence.h"

#include <algorithm>
#include <set>

#include "verifier/model/definitions.h"

namespace thetagate::engine {

namespace {

bool has_unrounded_quotient(const Expr& e) {
  if (e.kind == ExprKind::kCall && (e.name == "floor" || e.name == "ceil")) return false;
  if (e.kind == ExprKind::kDiv) return true;
  for (const auto& a : e.args) {
    if (has_unrounded_quotient(*a)) return true;
  }
  return false;
}

// Checks every call in `e`: known function, right arity; T not inside a T
// argument, not in conditions and not in helpers.
void check_calls(const Expr& e, const SourceText& source, const std::string& main_name,
                 const std::map<std::string, Function>& helpers, bool in_helper, bool in_condition,
                 bool in_argument) {
  if (e.kind == ExprKind::kSum) {
    // T may be summed (its argument then uses the bound variable), but the
    // limits are plain expressions in n.
    for (int i = 0; i < 2; ++i) {
      std::vector<const Expr*> in_limit;
      collect_calls(e.args[i], main_name, in_limit);
      if (!in_limit.empty()) {
        fail_at(source, in_limit.front()->pos,
                "a limit of a sum calls " + main_name + ", which is not supported",
                "the limits are expressions in n such as 0, n - 1, floor(n/2)");
      }
    }
    if (in_argument) {
      fail_at(source, e.pos, "a sum inside the argument of " + main_name + " is not supported",
              "arguments are expressions in n such as n/2, n-1");
    }
  }
  if (e.kind == ExprKind::kCall && !is_builtin(e.name)) {
    bool is_main = e.name == main_name;
    if (!is_main && helpers.count(e.name) == 0) {
      std::string hint =
          "define it on its own line, e.g. " + e.name + "(n) = n^2, or use " + main_name;
      if (e.name == "log10" || e.name == "log_2") hint = "write log(10, x) or lg x";
      fail_at(source, e.pos, "unknown function '" + e.name + "'", hint);
    }
    if (e.args.size() != 1) {
      fail_at(source, e.pos,
              "'" + e.name + "' takes one argument, given " + std::to_string(e.args.size()),
              "write " + e.name + "(n/2)");
    }
    if (is_main && in_helper) {
      fail_at(source, e.pos, "a helper function calls " + main_name,
              "only " + main_name + " may recurse; move the call into " + main_name + "'s line");
    }
    if (is_main && in_condition) {
      fail_at(source, e.pos, "a condition calls " + main_name,
              "conditions may use n, arithmetic and helpers, not " + main_name);
    }
    if (is_main && in_argument) {
      fail_at(source, e.pos,
              main_name + " inside the argument of " + main_name + " is not supported",
              "arguments are expressions in n such as n/2, 2n/3, n-1, floor(sqrt(n))");
    }
    for (const auto& a : e.args) {
      check_calls(*a, source, main_name, helpers, in_helper, in_condition, in_argument || is_main);
    }
    return;
  }
  for (const auto& a : e.args) {
    check_calls(*a, source, main_name, helpers, in_helper, in_condition, in_argument);
  }
}

// The byte offset of a sum's variable: the first name after "sum(".
size_t sum_variable_pos(const SourceText& source, const Expr& sum) {
  size_t at = source.text.find(sum.name, sum.pos + 3);
  return at == std::string::npos ? sum.pos : at;
}

// A sum variable named like the recursive function or a helper would hide
// it inside the body (sum(T, 1, n, T(T)) reads T(T) as T*T).
void check_sum_variables(const Recurrence& r, const SourceText& source) {
  auto is_function = [&](const std::string& name) {
    return name == r.main.name || r.helpers.count(name) != 0;
  };
  auto check = [&](const ExprPtr& e) {
    if (!e) return;
    const Expr* sum = find_sum_shadowing(*e, is_function);
    if (sum == nullptr) return;
    bool helper = sum->name != r.main.name;
    fail_at(source, sum_variable_pos(source, *sum),
            "the sum's variable '" + sum->name + "' has the name of " +
                (helper ? "the helper function " : "the function ") + sum->name +
                ", which it would hide inside the sum",
            "give the variable another name: " +
                sum_text_with_fresh_variable(source.text, sum->pos, sum->name));
  };
  for (const CaseLine* line : r.main.lines_in_order()) {
    check(line->body);
    check(line->condition);
  }
  for (const auto& [name, h] : r.helpers) {
    for (const CaseLine* line : h.lines_in_order()) {
      check(line->body);
      check(line->condition);
    }
  }
}

struct HelperCall {
  const Function* callee;
  const Expr* call;
};

// The calls of helpers in `e`, left to right; each tree is walked once, so
// this is linear in the text however many helpers there are.
void collect_helper_calls(const Expr& e, const std::map<std::string, Function>& helpers,
                          std::vector<HelperCall>& out) {
  if (e.kind == ExprKind::kCall) {
    auto it = helpers.find(e.name);
    if (it != helpers.end()) out.push_back({&it->second, &e});
  }
  for (const ExprPtr& a : e.args) collect_helper_calls(*a, helpers, out);
}

uint64_t saturating_add(uint64_t a, uint64_t b) { return std::min(a + b, kInlinedSizeCap); }
uint64_t saturating_mul(uint64_t a, uint64_t b) {
  if (a != 0 && b > kInlinedSizeCap / a) return kInlinedSizeCap;
  return std::min(a * b, kInlinedSizeCap);
}

// Levels and nodes of `e` with every helper call inlined: a call counts its
// argument plus the callee (whose measures are known: callees come first).
// Depth is a sum, not a maximum: substituting the argument for n (as the
// classifier does) stacks the one on the other.
struct Inlined {
  size_t depth = 0;
  uint64_t size = 0;
  const Expr* deepest_call = nullptr;  // the helper call on the deepest path
};

Inlined measure_inlined(const Expr& e, const std::map<std::string, Function>& helpers) {
  Inlined out;
  for (const ExprPtr& a : e.args) {
    Inlined child = measure_inlined(*a, helpers);
    out.size = saturating_add(out.size, child.size);
    if (child.depth > out.depth) {
      out.depth = child.depth;
      out.deepest_call = child.deepest_call;
    }
  }
  out.depth += 1;
  out.size = saturating_add(out.size, 1);
  if (e.kind == ExprKind::kCall) {
    auto it = helpers.find(e.name);
    if (it != helpers.end()) {
      const Function& callee = it->second;
      out.depth += callee.inlined_depth;
      // Each n in the callee's lines becomes a copy of the argument.
      out.size = saturating_add(out.size, saturating_mul(callee.inlined_size, out.size));
      out.deepest_call = &e;
    }
  }
  return out;
}

// Helpers may call helpers, never in a cycle, and their calls may nest at
// most kMaxTreeDepth levels counting each helper's own expression: every
// walk that follows a helper call (evaluation, classification, expansion)
// recurses that deep. Fills in each helper's inlined depth and size.
// Iterative: a chain of thousands of helpers is an error, not a deep stack.
void check_helpers(Recurrence& r, const SourceText& source) {
  std::map<std::string, Function>& helpers = r.helpers;
  std::map<const Function*, std::vector<HelperCall>> calls;
  for (auto& [name, f] : helpers) {
    std::vector<HelperCall>& out = calls[&f];
    for (const CaseLine* line : f.lines_in_order()) {
      if (line->condition) collect_helper_calls(*line->condition, helpers, out);
      collect_helper_calls(*line->body, helpers, out);
    }
  }
  // Depth-first over the call graph with an explicit stack; post-order
  // (callees first) is the order in which the measures can be computed.
  std::map<const Function*, int> state;  // 0 new, 1 on the stack, 2 done
  std::vector<const Function*> order;
  for (auto& [root_name, root] : helpers) {
    if (state[&root] != 0) continue;
    std::vector<std::pair<const Function*, size_t>> stack = {{&root, 0}};
    state[&root] = 1;
    while (!stack.empty()) {
      auto& [f, next] = stack.back();
      const std::vector<HelperCall>& out = calls[f];
      if (next == out.size()) {
        state[f] = 2;
        order.push_back(f);
        stack.pop_back();
        continue;
      }
      const HelperCall& c = out[next++];
      int& s = state[c.callee];
      if (s == 1) {
        fail_at(source, c.call->pos,
                "helper '" + c.callee->name +
                    "' is used recursively (recursion among helpers, or "
                    "mutual recursion, is not supported)",
                "only the main function may recurse; helpers are plain formulas");
      }
      if (s == 0) {
        s = 1;
        stack.push_back({c.callee, 0});
      }
    }
  }
  // The deepest callee of each helper, to name the chain in an error.
  std::map<const Function*, const Expr*> deepest;
  for (const Function* f : order) {
    Function& h = helpers.at(f->name);
    Inlined total;
    for (const CaseLine* line : h.lines_in_order()) {
      for (const ExprPtr& part : {line->condition, line->body}) {
        if (!part) continue;
        Inlined m = measure_inlined(*part, helpers);
        total.size = saturating_add(total.size, m.size);
        if (m.depth > total.depth) {
          total.depth = m.depth;
          total.deepest_call = m.deepest_call;
        }
      }
    }
    // Saturate too: a long chain would otherwise add up without bound.
    h.inlined_depth = std::min<size_t>(total.depth, 4 * kMaxTreeDepth);
    h.inlined_size = total.size;
    deepest[f] = total.deepest_call;
  }
  // The first line, in the order written, whose helper calls nest too deep.
  std::vector<const CaseLine*> lines = r.main.lines_in_order();
  for (const auto& [name, h] : helpers) {
    for (const CaseLine* line : h.lines_in_order()) lines.push_back(line);
  }
  std::sort(lines.begin(), lines.end(),
            [](const CaseLine* a, const CaseLine* b) { return a->pos < b->pos; });
  for (const CaseLine* line : lines) {
    for (const ExprPtr& part : {line->condition, line->body}) {
      if (!part) continue;
      Inlined m = measure_inlined(*part, helpers);
      if (m.depth <= kMaxTreeDepth || m.deepest_call == nullptr) continue;
      // Name the chain: the first few helpers, then the last.
      std::vector<std::string> chain;
      for (const Expr* call = m.deepest_call; call != nullptr;) {
        const Function* callee = &helpers.at(call->name);
        chain.push_back(callee->name);
        call = deepest[callee];
      }
      std::string names;
      for (size_t i = 0; i < chain.size(); ++i) {
        if (chain.size() > 5 && i >= 3 && i + 1 < chain.size()) {
          if (i == 3) names += " → …";
          continue;
        }
        names += (i == 0 ? "" : " → ") + chain[i];
      }
      size_t length = chain.size();
      fail_at(source, m.deepest_call->pos,
              "helper calls nest too deeply: " + names + " (" + std::to_string(length) +
                  " helpers) reach more than " + std::to_string(kMaxTreeDepth) +
                  " levels, counting each helper's own expression",
              "a chain of helpers this long is a recurrence: write it as one recursive "
              "function with a base case, or substitute helpers into their callers");
    }
  }
}

void add_line(Function& f, const Definition& d, const SourceText& source) {
  CaseLine line;
  line.point = d.point;
  line.condition = d.condition;
  line.body = d.body;
  line.pos = d.name_pos;
  if (d.point) {
    if (d.condition) {
      fail_at(source, d.condition->pos, "a base case at a single point takes no condition",
              "write " + f.name + "(1) = 0, or " + f.name + "(n) = 0 if n <= 1");
    }
    if (!f.point_at.emplace(*d.point, f.points.size()).second) {
      fail_at(source, d.name_pos, f.name + "(" + d.point->str() + ") is defined twice",
              "keep one definition per point");
    }
    f.points.push_back(std::move(line));
  } else if (d.condition) {
    f.conditional.push_back(std::move(line));
  } else {
    if (f.fallback) {
      fail_at(source, d.name_pos, "a second line for " + f.name + "(n) without a condition",
              "only one line may apply to every n; add 'if COND' to the earlier one, or write "
              "'otherwise' on the last");
    }
    f.fallback = std::move(line);
  }
}

}  // namespace

std::vector<const CaseLine*> Function::lines_in_order() const {
  std::vector<const CaseLine*> lines;
  for (const auto& l : points) lines.push_back(&l);
  for (const auto& l : conditional) lines.push_back(&l);
  if (fallback) lines.push_back(&*fallback);
  return lines;
}

namespace {

// Θ(g), O(g) or Ω(g), unless the recurrence defines a helper of that name
// (then the call is the helper's, as before classes could be terms).
bool is_class_call(const Expr& e, const Recurrence& r) {
  return e.kind == ExprKind::kCall && (e.name == "Theta" || e.name == "O" || e.name == "Omega") &&
         r.helpers.count(e.name) == 0 && e.name != r.main.name;
}

const Expr* find_class_call(const Expr& e, const Recurrence& r) {
  if (is_class_call(e, r)) return &e;
  for (const auto& a : e.args) {
    if (const Expr* found = find_class_call(*a, r)) return found;
  }
  return nullptr;
}

// "Θ", "O", "Ω" for the class call's name.
std::string class_symbol(const std::string& name) {
  return name == "Theta" ? "Θ" : name == "Omega" ? "Ω" : name;
}

const char* const kClassTermHint =
    "a class stands as a term of its own, added to the rest of the line: "
    "T(n) = 2T(n/2) + Θ(n), or T(1) = Θ(1)";

// Replaces each class term Θ(g) on an added (never subtracted) top-level
// position of `e` by g, recording it; a class anywhere else is an error.
ExprPtr lift_class_terms(const ExprPtr& e, bool additive, bool base_case, Recurrence& r,
                         const SourceText& source) {
  if (e->kind == ExprKind::kAdd || e->kind == ExprKind::kSub) {
    ExprPtr a = lift_class_terms(e->args[0], additive, base_case, r, source);
    ExprPtr b =
        lift_class_terms(e->args[1], additive && e->kind == ExprKind::kAdd, base_case, r, source);
    if (a == e->args[0] && b == e->args[1]) return e;
    return make_binary(e->kind, a, b, e->pos);
  }
  if (is_class_call(*e, r)) {
    if (!additive) {
      fail_at(source, e->pos,
              "a growth class " + class_symbol(e->name) + "(...) subtracted or nested here",
              kClassTermHint);
    }
    if (e->args.size() != 1) {
      fail_at(source, e->pos, "'" + e->name + "' takes one argument, the growth in n",
              "write " + e->name + "(n lg n)");
    }
    const ExprPtr& g = e->args[0];
    if (const Expr* inner = find_class_call(*g, r)) {
      fail_at(source, inner->pos, "a growth class inside another", kClassTermHint);
    }
    std::vector<const Expr*> recursive;
    collect_calls(g, r.main.name, recursive);
    if (!recursive.empty()) {
      fail_at(source, recursive.front()->pos,
              "a growth class mentions " + r.main.name + "; it is a function of n alone",
              "write Θ(n), O(n^2), Ω(lg n)");
    }
    ClassTerm term;
    term.kind = e->name == "O"       ? ClassTermKind::kBigO
                : e->name == "Omega" ? ClassTermKind::kOmega
                                     : ClassTermKind::kTheta;
    term.representative = g;
    term.base_case = base_case;
    term.pos = e->pos;
    r.class_terms.push_back(term);
    return g;
  }
  if (const Expr* nested = find_class_call(*e, r)) {
    fail_at(source, nested->pos,
            "a growth class " + class_symbol(nested->name) + "(...) nested in a term",
            kClassTermHint);
  }
  return e;
}

// Lifts the class terms of T's lines and refuses them everywhere else.
void lift_all_class_terms(Recurrence& r, const SourceText& source) {
  auto refuse = [&](const ExprPtr& e, const std::string& where) {
    if (!e) return;
    if (const Expr* c = find_class_call(*e, r)) {
      fail_at(source, c->pos, "a growth class " + class_symbol(c->name) + "(...) in " + where,
              "a class may stand only as a term of " + r.main.name +
                  "'s own lines: " + r.main.name + "(n) = 2" + r.main.name + "(n/2) + Θ(n)");
    }
  };
  auto lift = [&](CaseLine& line) {
    refuse(line.condition, "a condition");
    std::vector<const Expr*> recursive;
    collect_calls(line.body, r.main.name, recursive);
    line.body = lift_class_terms(line.body, true, recursive.empty(), r, source);
  };
  for (auto& l : r.main.points) lift(l);
  for (auto& l : r.main.conditional) lift(l);
  if (r.main.fallback) lift(*r.main.fallback);
  std::stable_sort(r.class_terms.begin(), r.class_terms.end(),
                   [](const ClassTerm& a, const ClassTerm& b) { return a.pos < b.pos; });
  for (const auto& [name, h] : r.helpers) {
    for (const CaseLine* line : h.lines_in_order()) {
      refuse(line->body, "helper " + name);
      refuse(line->condition, "a condition");
    }
  }
}

}  // namespace

const char* class_term_name(ClassTermKind kind) {
  switch (kind) {
    case ClassTermKind::kTheta:
      return "Θ";
    case ClassTermKind::kBigO:
      return "O";
    case ClassTermKind::kOmega:
      return "Ω";
  }
  return "?";
}

namespace {

std::string class_terms_note(const Recurrence& r) {
  std::string listed;
  for (const ClassTerm& t : r.class_terms) {
    std::string g = print(*t.representative);
    listed +=
        (listed.empty() ? "" : ", ") + std::string(class_term_name(t.kind)) + "(" + g + ") by " + g;
  }
  return "the growth classes in " + r.main.name +
         " stand for some function of each class; exact values use one member of each (" + listed +
         "), so a refutation holds for that member, and a proof comes from the theorems alone";
}

}  // namespace

std::shared_ptr<const Recurrence> build_recurrence(const SourceText& source) {
  std::vector<Definition> defs = parse_definitions(source);
  auto r = std::make_shared<Recurrence>();
  r->source = source;
  r->main.name = defs.front().function;
  r->main.pos = defs.front().name_pos;

  // A helper defined before the main function would make it "first": the
  // main function is the first one that calls itself, else the first one.
  for (const Definition& d : defs) {
    std::vector<const Expr*> self;
    collect_calls(d.body, d.function, self);
    if (!self.empty()) {
      r->main.name = d.function;
      r->main.pos = d.name_pos;
      break;
    }
  }

  for (const Definition& d : defs) {
    if (d.function == r->main.name) {
      add_line(r->main, d, source);
    } else {
      Function& h = r->helpers[d.function];
      if (h.name.empty()) {
        h.name = d.function;
        h.pos = d.name_pos;
      }
      add_line(h, d, source);
    }
  }

  // Mutual recursion (T calls U, U calls T) is a different language.
  for (const auto& [name, h] : r->helpers) {
    const Expr* back = nullptr;
    for (const CaseLine* line : h.lines_in_order()) {
      std::vector<const Expr*> calls;
      collect_calls(line->body, r->main.name, calls);
      if (!calls.empty()) back = calls.front();
    }
    if (back == nullptr) continue;
    bool called = false;
    for (const CaseLine* line : r->main.lines_in_order()) {
      std::vector<const Expr*> calls;
      collect_calls(line->body, name, calls);
      called = called || !calls.empty();
    }
    if (called) {
      fail_at(source, back->pos,
              "mutual recursion (" + r->main.name + " calls " + name + " and " + name + " calls " +
                  r->main.name + ") is not supported",
              "only " + r->main.name + " may recurse: substitute " + name + "'s line into " +
                  r->main.name + "'s, so that " + r->main.name + " calls only itself");
    }
  }

  lift_all_class_terms(*r, source);
  for (const CaseLine* line : r->main.lines_in_order()) {
    check_calls(*line->body, source, r->main.name, r->helpers, false, false, false);
    if (line->condition)
      check_calls(*line->condition, source, r->main.name, r->helpers, false, true, false);
  }
  for (const auto& [name, h] : r->helpers) {
    for (const CaseLine* line : h.lines_in_order()) {
      check_calls(*line->body, source, r->main.name, r->helpers, true, false, false);
      if (line->condition)
        check_calls(*line->condition, source, r->main.name, r->helpers, true, true, false);
    }
  }
  check_helpers(*r, source);
  check_sum_variables(*r, source);

  // Record the recursive calls of each line; note base cases and floors.
  bool has_base = false;
  std::string floor_example;
  auto index_line = [&](CaseLine& line) {
    collect_calls(line.body, r->main.name, line.calls, false);
    std::vector<const Expr*> all;
    collect_calls(line.body, r->main.name, all);
    line.sums_calls = all.size() > line.calls.size();
    if (line.sums_calls) r->full_history = true;
    if (line.point || all.empty()) has_base = true;
    for (const Expr* call : line.calls) {
      if (floor_example.empty() && has_unrounded_quotient(*call->args[0])) {
        floor_example = print(*call->args[0]);
      }
    }
  };
  for (auto& l : r->main.points) index_line(l);
  for (auto& l : r->main.conditional) index_line(l);
  if (r->main.fallback) index_line(*r->main.fallback);

  r->default_base = !has_base;
  if (r->full_history) {
    // Sums over earlier sizes start empty; only a direct call can fail to shrink.
    bool direct = false;
    for (const CaseLine* line : r->main.lines_in_order()) direct = direct || !line->calls.empty();
    if (!direct) r->default_base = false;
  }
  if (!floor_example.empty()) {
    r->notes.push_back("inside " + r->main.name +
                       "(...), a quotient that is not a whole number is "
                       "rounded down: " +
                       floor_example + " is read as floor(" + floor_example + ")");
  }
  if (!r->class_terms.empty()) r->notes.push_back(class_terms_note(*r));
  if (r->default_base) {
    r->notes.push_back("no base case given: " + r->main.name +
                       "(n) = 1 assumed wherever the recursive line would not shrink its argument");
  }
  return r;
}

bool has_unrounded_calls(const Recurrence& r) {
  for (const CaseLine* line : r.main.lines_in_order()) {
    for (const Expr* call : line->calls) {
      if (has_unrounded_quotient(*call->args[0])) return true;
    }
  }
  return false;
}

namespace {
ExprPtr ceil_calls(const ExprPtr& e, const std::string& function) {
  if (e->kind == ExprKind::kCall && e->name == function && e->args.size() == 1 &&
      has_unrounded_quotient(*e->args[0])) {
    return make_call(function, {make_call("ceil", {e->args[0]}, e->args[0]->pos)}, e->pos);
  }
  if (e->args.empty()) return e;
  auto copy = std::make_shared<Expr>(*e);
  for (auto& a : copy->args) a = ceil_calls(a, function);
  update_depth(*copy);
  return copy;
}
}  // namespace

std::shared_ptr<const Recurrence> read_quotients_as_ceilings(const Recurrence& r) {
  auto copy = std::make_shared<Recurrence>(r);
  auto rewrite = [&](CaseLine& line) {
    line.body = ceil_calls(line.body, r.main.name);
    line.calls.clear();
    collect_calls(line.body, r.main.name, line.calls, false);
  };
  for (auto& l : copy->main.points) rewrite(l);
  for (auto& l : copy->main.conditional) rewrite(l);
  if (copy->main.fallback) rewrite(*copy->main.fallback);
  for (std::string& note : copy->notes) {
    if (note.find("rounded down") != std::string::npos) {
      note = "every quotient inside " + r.main.name +
             "(...) that is not a whole number is read "
             "as its ceiling (rounding = ceil)";
    }
  }
  return copy;
}

std::shared_ptr<const Recurrence> recurrence_from_text(const std::string& text,
                                                       const std::string& origin) {
  return build_recurrence(SourceText::whole(origin, text));
}

}  // namespace thetagate::engine
