#include "verifier/checking/checker.h"

#include <mpfr.h>

#include <algorithm>
#include <chrono>
#include <new>
#include <set>

#include "verifier/checking/claim_check.h"
#include "verifier/checking/code_check.h"
#include "verifier/checking/verdict.h"
#include "verifier/numbers/allocation.h"

namespace thetagate::engine {

namespace {

void collect_divisors(const Expr& e, std::set<BigInt>& out) {
  bool is_div = e.kind == ExprKind::kDiv;
  bool is_mod = e.kind == ExprKind::kCall && e.name == "mod" && e.args.size() == 2;
  if (is_div || is_mod) {
    const Expr& d = *e.args[1];
    if (d.kind == ExprKind::kNumber && denominator(d.number) == 1 && d.number >= 2 &&
        d.number <= 1'000'000) {
      out.insert(numerator(d.number));
    }
  }
  for (const auto& a : e.args) collect_divisors(*a, out);
}

// `undecided`: an evaluator limit ended the check (`detail`: which).
ClaimResult budget_result(const ClaimResult& base, const std::string& detail) {
  ClaimResult r = base;
  r.verdict = Verdict::kUndecided;
  r.basis = VerdictBasis{};
  r.basis.kind = BasisKind::kBudgetReached;
  r.basis.unproved = Unproved::kEvaluatorLimit;
  r.basis.detail = detail;
  return r;
}

ClaimResult error_result(const ClaimResult& base, const Diagnostic& d) {
  ClaimResult r = base;
  r.verdict = Verdict::kError;
  r.error = d;
  r.basis = VerdictBasis{};
  r.basis.kind = BasisKind::kInputError;
  r.witnesses.clear();
  r.band.clear();
  return r;
}

ClaimResult internal_error_result(const ClaimResult& base, const std::string& what) {
  ClaimResult r = base;
  r.verdict = Verdict::kError;
  r.internal_error = what;
  r.basis = VerdictBasis{};
  r.basis.kind = BasisKind::kInternalError;
  r.basis.detail = what;
  r.witnesses.clear();
  r.band.clear();
  return r;
}

}  // namespace

Budget CheckOptions::default_check_budget() {
  Budget b;
  // A guard against hangs only: the work budget (deterministic) is what
  // normally ends a search.
  b.max_seconds = 60.0;
  b.max_steps = 20'000'000;
  // Sizes are tried in increasing order; one that needs this many
  // subproblems (T(n/5) + T(7n/10) at thousands of bits) ends the climb.
  b.max_steps_per_size = 50'000;
  return b;
}

std::vector<BigInt> recurrence_divisors(const Recurrence& r) {
  std::set<BigInt> found = {BigInt(2)};
  for (const CaseLine* line : r.main.lines_in_order()) {
    collect_divisors(*line->body, found);
    if (line->condition) collect_divisors(*line->condition, found);
  }
  for (const auto& [name, helper] : r.helpers) {
    for (const CaseLine* line : helper.lines_in_order()) {
      collect_divisors(*line->body, found);
      if (line->condition) collect_divisors(*line->condition, found);
    }
  }
  return {found.begin(), found.end()};
}

SizePlan claim_size_plan(const Claim& claim, uint64_t max_bits, const BigInt& exhaustive_limit,
                         uint64_t seed) {
  SizePlan plan;
  plan.divisors = recurrence_divisors(*claim.recurrence);
  plan.max_bits = max_bits;
  plan.min_n = claim.sizes.min_n.value_or(BigInt(1));
  if (!claim.bound.is_asymptotic()) plan.min_n = std::max(plan.min_n, claim.bound.n0);
  plan.exhaustive_limit = exhaustive_limit;
  plan.seed = seed;
  plan.families = claim.sizes.families;
  return plan;
}

std::vector<Size> harness_sizes(const Claim& claim, const BigInt& max_n, const BigInt& small,
                                uint64_t seed) {
  SizePlan plan = claim_size_plan(claim, std::max<uint64_t>(1, bit_length(max_n)),
                                  std::min(small, max_n), seed);
  if (plan.min_n > max_n) {
    throw InputError(Diagnostic{claim.where,
                                "the largest size asked for, " + max_n.str() +
                                    ", is below the claim's smallest, " + plan.min_n.str(),
                                "raise --max"});
  }
  std::vector<Size> sizes = generate_sizes(plan);
  while (!sizes.empty() && sizes.back().n > max_n) sizes.pop_back();
  return sizes;
}

namespace {

// The claim's [claim.sizes] as written, keys in the file's order of the
// reference (docs/language.md); "" when it sets none.
std::string sizes_text(const SizeOptions& s) {
  std::string out;
  auto add = [&](const std::string& part) { out += (out.empty() ? "" : ", ") + part; };
  if (s.max_bits) add("max_bits = " + std::to_string(*s.max_bits));
  if (!s.families.empty()) {
    std::string list;
    for (const std::string& f : s.families) list += (list.empty() ? "" : ", ") + f;
    add("families = [" + list + "]");
  }
  if (s.min_n) add("min_n = " + s.min_n->str());
  if (s.effort != 1) add("effort = " + std::to_string(s.effort));
  return out;
}

ClaimResult check_one_reading(const Claim& claim, const CheckOptions& options) {
  ClaimResult result;
  result.name = claim.name;
  result.file = claim.where.file;
  result.line = claim.where.line;
  result.recurrence = claim.recurrence->text();
  result.claimed = claim.bound.text();
  result.sizes = sizes_text(claim.sizes);
  result.rounding = claim.rounding ? rounding_name(*claim.rounding) : "";
  result.note = claim.note;
  result.notes = claim.recurrence->notes;
  result.notes.insert(result.notes.end(), claim.bound.notes.begin(), claim.bound.notes.end());
  try {
    checker_internal::ClaimCheck(claim, options, result).run();
  } catch (const InputError& e) {
    return error_result(result, e.diagnostic());
  } catch (const BudgetExceeded& e) {
    return budget_result(result, e.what());
  }
  return result;
}

// rounding = both: the claim must hold with quotients read as floors and as
// ceilings; the report says which reading fails.
ClaimResult combine_readings(ClaimResult floor_result, ClaimResult ceil_result) {
  if (floor_result.verdict == Verdict::kError) return floor_result;
  if (ceil_result.verdict == Verdict::kError) return ceil_result;
  const char* both_note = "checked twice: quotients inside T(...) read as floor and as ceil";
  // Whichever reading is reported, both were checked: count both.
  uint64_t sizes = floor_result.sizes_checked + ceil_result.sizes_checked;
  uint64_t bits = std::max(floor_result.largest_bits, ceil_result.largest_bits);
  auto labelled = [&](ClaimResult r, const std::string& reading, const ClaimResult& other) {
    r.basis.reading = reading;
    r.basis.other_reading = other.verdict;
    r.notes.push_back(both_note);
    r.sizes_checked = sizes;
    r.largest_bits = bits;
    return r;
  };
  bool floor_refuted = floor_result.verdict == Verdict::kRefuted;
  bool ceil_refuted = ceil_result.verdict == Verdict::kRefuted;
  if (floor_refuted) return labelled(floor_result, "floor", ceil_result);
  if (ceil_refuted) return labelled(ceil_result, "ceil", floor_result);
  if (floor_result.verdict == Verdict::kHolds && ceil_result.verdict == Verdict::kHolds) {
    floor_result.tight = floor_result.tight && ceil_result.tight;
    floor_result.basis.reading = "floor and ceil";
    floor_result.notes.push_back(both_note);
    floor_result.sizes_checked = sizes;
    floor_result.largest_bits = bits;
    return floor_result;
  }
  if (floor_result.verdict != Verdict::kHolds) return labelled(floor_result, "floor", ceil_result);
  return labelled(ceil_result, "ceil", floor_result);
}

ClaimResult check_model(const Claim& claim, const CheckOptions& options) {
  Rounding rounding = options.rounding.value_or(claim.rounding.value_or(Rounding::kFloor));
  if (rounding == Rounding::kFloor || !has_unrounded_calls(*claim.recurrence)) {
    return check_one_reading(claim, options);
  }
  Claim ceil_claim = claim;
  ceil_claim.recurrence = read_quotients_as_ceilings(*claim.recurrence);
  if (rounding == Rounding::kCeil) return check_one_reading(ceil_claim, options);
  // A clock limit is per claim: the second reading gets what the first left.
  auto start = std::chrono::steady_clock::now();
  ClaimResult floor_result = check_one_reading(claim, options);
  CheckOptions rest = options;
  if (options.clock_limit && *options.clock_limit > 0) {
    double used = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    rest.clock_limit = std::max(*options.clock_limit - used, 1e-3);  // 0 would mean no clock
  }
  return combine_readings(std::move(floor_result), check_one_reading(ceil_claim, rest));
}

}  // namespace

ClaimResult check_claim(const Claim& claim, const CheckOptions& options) {
  auto start = std::chrono::steady_clock::now();
  ClaimResult result = check_model(claim, options);
  // Code -> model: a claim's measured costs, checked whatever the bound's
  // verdict (the report shows both links); an error in them is the claim's.
  if (result.verdict == Verdict::kError || !claim.code || claim.code->costs_path.empty()) {
    return result;
  }
  // The costs file gets what the check of the bound left of a clock limit.
  std::optional<double> clock_limit = options.clock_limit;
  if (clock_limit && *clock_limit > 0) {
    double used = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    clock_limit = std::max(*clock_limit - used, 1e-3);
  }
  try {
    apply_code_result(result, check_costs_file(claim, options.costs_root, clock_limit));
  } catch (const InputError& e) {
    return error_result(result, e.diagnostic());
  } catch (const BudgetExceeded& e) {
    return budget_result(
        result, std::string("out of budget while checking the measured costs: ") + e.what());
  }
  return result;
}

ClaimResult check_entry(const ClaimEntry& entry, const CheckOptions& options) {
  ClaimResult base;
  base.name = entry.name;
  base.file = entry.where.file;
  base.line = entry.where.line;
  if (!entry.internal_error.empty()) return internal_error_result(base, entry.internal_error);
  if (!entry.claim) return error_result(base, entry.error.value_or(Diagnostic{}));
  // The one place that catches everything: what escapes check_claim is not
  // about the input (check_claim turns input errors and limits into
  // verdicts), so it is reported as a bug, on this claim only.
  install_gmp_memory_functions();  // GMP's allocation failures throw bad_alloc, below
  try {
    return check_claim(*entry.claim, options);
  } catch (const std::bad_alloc&) {
    // It may have come through MPFR (verifier/numbers/allocation.h): this
    // thread's constant caches may be half-updated, so they go.
    mpfr_free_cache();
    base.recurrence = entry.claim->recurrence->text();
    base.claimed = entry.claim->bound.text();
    return budget_result(base, "memory ran out while checking this claim");
  } catch (const InternalError& e) {
    // An invariant of the engine broke: its detail, without the "a bug" prefix
    // that main adds when it names the claim.
    return internal_error_result(base, e.detail());
  } catch (const std::exception& e) {
    return internal_error_result(base, e.what());
  } catch (...) {
    return internal_error_result(base, "an exception that is not a std::exception");
  }
}

RunResult check_entries(const std::vector<ClaimEntry>& entries, const CheckOptions& options) {
  RunResult run;
  run.seed = options.seed;
  for (const ClaimEntry& entry : entries) run.claims.push_back(check_entry(entry, options));
  return run;
}

}  // namespace thetagate::engine
