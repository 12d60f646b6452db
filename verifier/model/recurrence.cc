#include "verifier/model/recurrence.h"

#include <functional>
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

// Helpers may call helpers but never in a cycle.
void check_helper_cycles(const std::map<std::string, Function>& helpers, const SourceText& source) {
  std::map<std::string, int> state;  // 0 new, 1 on stack, 2 done
  std::function<void(const std::string&)> visit = [&](const std::string& name) {
    state[name] = 1;
    const Function& f = helpers.at(name);
    for (const CaseLine* line : f.lines_in_order()) {
      for (const ExprPtr& part : {line->body, line->condition}) {
        if (!part) continue;
        for (const auto& [other, _] : helpers) {
          std::vector<const Expr*> calls;
          collect_calls(part, other, calls);
          if (calls.empty()) continue;
          if (state[other] == 1) {
            fail_at(source, calls.front()->pos, "helper '" + other + "' is used recursively",
                    "only the main function may recurse; helpers are plain formulas");
          }
          if (state[other] == 0) visit(other);
        }
      }
    }
    state[name] = 2;
  };
  for (const auto& [name, _] : helpers) {
    if (state[name] == 0) visit(name);
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
  check_helper_cycles(r->helpers, source);

  // Record the recursive calls of each line; note base cases and floors.
  bool has_base = false;
  std::string floor_example;
  auto index_line = [&](CaseLine& line) {
    collect_calls(line.body, r->main.name, line.calls);
    if (line.point || line.calls.empty()) has_base = true;
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
  if (!floor_example.empty()) {
    r->notes.push_back("inside " + r->main.name +
                       "(...), a quotient that is not a whole number is "
                       "rounded down: " +
                       floor_example + " is read as floor(" + floor_example + ")");
  }
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
    collect_calls(line.body, r.main.name, line.calls);
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
