// The model side of guarding code (include/thetagate/guard.h): a claim's
// recurrence as a cost model, built on the checker's own pieces.
#include "thetagate/guard.h"

#include <fmt/format.h>

#include <algorithm>
#include <cstdlib>
#include <limits>

#include "generators/size_family.h"
#include "reports/code_text.h"
#include "reports/text_report.h"
#include "verifier/checking/checker.h"
#include "verifier/checking/code_check.h"
#include "verifier/model/bound.h"
#include "verifier/model/claim.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/spelling.h"

namespace thetagate::guard {

using engine::BigInt;
using engine::Budget;
using engine::CheckOptions;
using engine::Claim;
using engine::ClaimEntry;
using engine::CodeResult;
using engine::CostModel;
using engine::CostViolation;
using engine::ModelRelation;
using engine::RunResult;
using engine::Size;
using engine::SizePlan;
using engine::TextStyle;

namespace {

// A located input error with `prefix` before its message.
[[noreturn]] void rethrow_input(const InputError& e, const std::string& prefix) {
  Diagnostic d = e.diagnostic();
  d.message = prefix + d.message;
  throw InputError(d);
}

[[noreturn]] void rethrow_limit(const LimitReached& e, const std::string& prefix) {
  throw LimitReached(e.limit(), prefix + e.what());
}

ModelRelation internal_relation(Relation r) {
  switch (r) {
    case Relation::kUpperBound:
      return ModelRelation::kUpperBound;
    case Relation::kExact:
      return ModelRelation::kExact;
    case Relation::kLowerBound:
      return ModelRelation::kLowerBound;
  }
  return ModelRelation::kUpperBound;
}

Relation public_relation(ModelRelation r) {
  switch (r) {
    case ModelRelation::kUpperBound:
      return Relation::kUpperBound;
    case ModelRelation::kExact:
      return Relation::kExact;
    case ModelRelation::kLowerBound:
      return Relation::kLowerBound;
  }
  return Relation::kUpperBound;
}

// A value's text ("12", "-7/2", "1.414...", an enclosure "[a, b]") as a
// double, for ratios shown to people; 0 where it reads as none of these.
double approximately(const std::string& text) {
  size_t at = text.find_first_of("-0123456789");
  if (at == std::string::npos) return 0;
  const char* start = text.c_str() + at;
  char* end = nullptr;
  double value = std::strtod(start, &end);
  if (end != start && *end == '/') {
    double below = std::strtod(end + 1, nullptr);
    if (below != 0) value /= below;
  }
  return value;
}

// The claim's own part of a text report: without the run's header (the tool,
// and how to rerun it from the command line) and its summary line, which a
// test's failure message has no use for.
std::string claim_part(const std::string& report) {
  std::string out = report;
  if (out.rfind("thetagate ", 0) == 0) {
    size_t blank = out.find("\n\n");
    out.erase(0, blank == std::string::npos ? out.size() : blank + 2);
  }
  size_t summary = out.rfind("\n\n");
  if (summary != std::string::npos) {
    size_t start = summary + 2;
    size_t digits = out.find_first_not_of("0123456789", start);
    bool counted = digits != std::string::npos && digits > start;
    if (counted &&
        (out.compare(digits, 7, " claim:") == 0 || out.compare(digits, 8, " claims:") == 0)) {
      out.erase(summary + 1);
    }
  }
  return out;
}

std::string budget_text(uint64_t n) {
  return fmt::format(
      "the time budget ran out at n = {}: that size and those above ran only one random "
      "input, their seeds, shapes and built-up orders (raise GuardOptions::time_budget or "
      "THETAGATE_GUARD_EFFORT)\n",
      n);
}

}  // namespace

const char* relation_name(Relation r) { return engine::relation_name(internal_relation(r)); }

struct Model::Impl {
  Claim claim;
  Relation relation = Relation::kUpperBound;
  uint64_t max_n = 65536;
  std::unique_ptr<CostModel> model;

  CostModel& cost_model() {
    if (!model) {
      // A model lives as long as a test: no wall-time limit from its creation.
      Budget budget;
      budget.max_seconds = 1e9;
      model = std::make_unique<CostModel>(claim, internal_relation(relation), budget);
    }
    return *model;
  }
};

Model::Model(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
Model::Model(Model&&) noexcept = default;
Model& Model::operator=(Model&&) noexcept = default;
Model::~Model() = default;

Model Model::from_file(const std::string& path, const std::string& claim_name) {
  std::vector<ClaimEntry> entries = engine::load_claim_file(path);
  std::string closest;
  size_t best = std::numeric_limits<size_t>::max();
  for (ClaimEntry& entry : entries) {
    if (entry.name == claim_name) {
      if (!entry.claim) throw InputError(entry.error.value_or(Diagnostic{}));
      auto impl = std::make_unique<Impl>();
      impl->claim = std::move(*entry.claim);
      if (impl->claim.code) {
        impl->relation = public_relation(impl->claim.code->model);
        impl->max_n = impl->claim.code->max_n;
      }
      return Model(std::move(impl));
    }
    size_t d = engine::edit_distance(claim_name, entry.name);
    if (d < best) {
      best = d;
      closest = entry.name;
    }
  }
  // A file that failed as a whole has one entry, with the error.
  if (entries.size() == 1 && !entries.front().claim && entries.front().name.empty()) {
    throw InputError(entries.front().error.value_or(Diagnostic{}));
  }
  Diagnostic d;
  d.where.file = path;
  d.message = "no claim is named '" + claim_name + "'";
  if (!closest.empty()) d.hint = "the closest name is '" + closest + "'";
  throw InputError(d);
}

Model Model::from_text(const std::string& name, const std::string& recurrence,
                       const std::string& bound, Relation relation, uint64_t max_n) {
  // Built from its parts, as Claim::from_text does, not through a claim
  // file: an error is located in the text the caller wrote (<recurrence>,
  // <bound>), never in TOML they did not write.
  auto refuse = [](const std::string& message, const std::string& hint) {
    throw InputError(Diagnostic{Location{"<claim>", 1, 1}, message, hint, ""});
  };
  if (name.find_first_not_of(" \t") == std::string::npos) {
    refuse("the claim name is empty", "name it, e.g. \"orchard::stable_sort / comparisons\"");
  }
  bool control = std::any_of(name.begin(), name.end(), [](char c) {
    return (static_cast<unsigned char>(c) < 0x20 && c != '\t') || c == '\x7f';
  });
  if (control) {
    refuse("a claim name cannot contain a line break or another control character",
           "give the claim a one-line name: reports show it on one line");
  }
  auto impl = std::make_unique<Impl>();
  impl->claim.name = name;
  impl->claim.recurrence = engine::recurrence_from_text(recurrence, "<recurrence>");
  impl->claim.bound = engine::parse_bound(engine::SourceText::whole("<bound>", bound),
                                          impl->claim.recurrence->main.name);
  impl->relation = relation;
  impl->max_n = std::max<uint64_t>(max_n, 1);
  return Model(std::move(impl));
}

const std::string& Model::name() const { return impl_->claim.name; }

std::string Model::where() const {
  if (impl_->claim.where.file.empty()) return "";
  return impl_->claim.where.file + ":" + std::to_string(impl_->claim.where.line);
}

Relation Model::relation() const { return impl_->relation; }
uint64_t Model::max_n() const { return impl_->max_n; }

std::vector<SizeSample> Model::sizes(uint64_t max_n, uint64_t seed, uint64_t small_limit) const {
  if (max_n < 1) max_n = 1;
  SizePlan plan;
  plan.divisors = engine::recurrence_divisors(*impl_->claim.recurrence);
  uint64_t bits = 1;
  while (bits < 64 && (uint64_t{1} << bits) <= max_n) ++bits;
  plan.max_bits = bits;
  plan.min_n = impl_->claim.sizes.min_n.value_or(BigInt(1));
  if (plan.min_n < 1) plan.min_n = 1;
  plan.exhaustive_limit = small_limit;
  plan.seed = seed;
  plan.families = impl_->claim.sizes.families;
  std::vector<SizeSample> out;
  for (const Size& s : engine::generate_sizes(plan)) {
    if (s.n > max_n) continue;
    out.push_back({s.n.convert_to<uint64_t>(), s.family});
  }
  return out;
}

ModelValue Model::value_at(uint64_t n) {
  ModelValue v;
  try {
    CostModel& model = impl_->cost_model();
    model.start_query();  // limits per query: a Model lives as long as a test suite
    v.text = model.model_text(BigInt(n));
    bool digits = !v.text.empty() && v.text.find_first_not_of("0123456789") == std::string::npos;
    v.exact_integer = digits;
    if (digits && v.text.size() <= 20) {
      BigInt value(v.text);
      if (value <= std::numeric_limits<uint64_t>::max()) v.integer = value.convert_to<uint64_t>();
    }
    if (std::optional<BigInt> most = model.allowed_max(BigInt(n))) {
      if (*most <= std::numeric_limits<uint64_t>::max())
        v.allowed_max = most->convert_to<uint64_t>();
    }
    v.approx = approximately(v.text);
  } catch (const InputError& e) {
    rethrow_input(e,
                  fmt::format("the model of '{}' has no value at n = {}: ", impl_->claim.name, n));
  } catch (const LimitReached& e) {
    rethrow_limit(e, fmt::format("evaluating the model of '{}' at n = {} ran out of budget: ",
                                 impl_->claim.name, n));
  }
  return v;
}

int Model::compare(uint64_t n, uint64_t cost) {
  try {
    CostModel& model = impl_->cost_model();
    model.start_query();
    return model.compare(BigInt(n), BigInt(cost));
  } catch (const InputError& e) {
    rethrow_input(e,
                  fmt::format("the model of '{}' has no value at n = {}: ", impl_->claim.name, n));
  } catch (const LimitReached& e) {
    rethrow_limit(e, fmt::format("comparing with the model of '{}' at n = {} ran out of budget: ",
                                 impl_->claim.name, n));
  }
}

bool Model::violates(int sign) const {
  return engine::relation_broken(internal_relation(impl_->relation), sign);
}

CostCheck Model::check_cost(uint64_t n, uint64_t cost) {
  CostCheck check;
  check.n = n;
  check.cost = cost;
  check.relation = impl_->relation;
  check.model = value_at(n).text;
  check.sign = compare(n, cost);
  check.kept = !violates(check.sign);
  return check;
}

std::string to_string(const CostCheck& check) {
  const char* op = check.sign < 0 ? "<" : check.sign > 0 ? ">" : "=";
  return fmt::format("n = {}: counted cost {} {} T(n) = {} (model: {}, {})", check.n, check.cost,
                     op, check.model, relation_name(check.relation),
                     check.kept ? "kept" : "broken");
}

BoundOutcome Model::check_bound(uint64_t seed) const {
  CheckOptions options;
  options.seed = seed;
  Claim claim = impl_->claim;
  claim.code.reset();  // only model -> bound here; the runner checks the code
  RunResult run;
  run.seed = seed;
  run.claims.push_back(engine::check_claim(claim, options));
  BoundOutcome out;
  out.verdict = static_cast<Verdict>(run.claims.front().verdict);  // mirrors, see check.cc
  out.report = claim_part(engine::render_text(run, TextStyle{}));
  return out;
}

std::string GuardResult::report() const {
  std::string out;
  if (bound.failed()) {
    out += "model -> bound: the claim '" + claim + "' is " + verdict_name(*bound.verdict) + "\n" +
           bound.report;
  }
  if (error) out += "code -> model: " + *error + "\n";
  CodeResult code;
  code.relation = internal_relation(relation);
  code.source = runner.empty() ? "runner" : "runner '" + runner + "'";
  code.measurements = runs;
  for (const CostRow& r : rows) {
    engine::CostRow row;
    row.n = r.n;
    row.cost = std::to_string(r.cost);
    row.model = r.model;
    row.sign = r.sign;
    row.runs = r.runs;
    row.from = r.family;
    code.rows.push_back(std::move(row));
  }
  if (violation) {
    CostViolation v;
    v.n = violation->n;
    v.cost = std::to_string(violation->cost);
    v.model = violation->model;
    v.input = violation->input;
    v.replay = violation->replay;
    code.violations.push_back(std::move(v));
  }
  std::string link = engine::code_link_text(code, "", 1, 12);
  if (violation) {
    out += "the code breaks its model '" + claim + "' (seed " + std::to_string(seed) + ")\n";
    if (violation->stopped) {
      out += "the run at n = " + std::to_string(violation->n) +
             " was stopped as soon as its count passed T(n): its full cost is at least " +
             std::to_string(violation->cost) + "\n";
    }
  }
  out += link;
  if (budget_reached_at) out += budget_text(*budget_reached_at);
  if (!bound.failed() && bound.verdict) {
    out += "model -> bound: " + std::string(verdict_name(*bound.verdict)) + "\n";
  }
  return out;
}

std::string GuardResult::coverage() const {
  uint64_t sized_runs = 0;
  for (const CostRow& r : rows) sized_runs += r.runs;
  std::string out = fmt::format("guard coverage of '{}' ({}, seed {}, effort {}): {} sizes", claim,
                                relation_name(relation), seed, effort, rows.size());
  if (!rows.empty()) out += fmt::format(" from {} to {}", rows.front().n, rows.back().n);
  out += fmt::format(", {} runs, {:.2f} s\n", sized_runs, seconds);
  const bool lower = relation == Relation::kLowerBound;
  // Per scale: 2^k <= n < 2^(k+1).
  size_t i = 0;
  while (i < rows.size()) {
    int k = 0;
    while (k < 63 && (uint64_t{2} << k) <= rows[i].n) ++k;
    const uint64_t top = k >= 63 ? std::numeric_limits<uint64_t>::max() : (uint64_t{2} << k) - 1;
    uint64_t sizes = 0, runs_here = 0;
    const CostRow* tightest = nullptr;
    for (; i < rows.size() && rows[i].n <= top; ++i) {
      ++sizes;
      runs_here += rows[i].runs;
      if (!tightest || (lower ? rows[i].ratio < tightest->ratio : rows[i].ratio > tightest->ratio))
        tightest = &rows[i];
    }
    out +=
        fmt::format("  n in [2^{}, 2^{}): {} sizes, {} runs, tightest cost/T(n) = {:.4f} at n = {}",
                    k, k + 1, sizes, runs_here, tightest->ratio, tightest->n);
    out += fmt::format(" ({} of {})\n", tightest->cost, tightest->model);
  }
  if (budget_reached_at) out += budget_text(*budget_reached_at);
  return out;
}

}  // namespace thetagate::guard
