#include "verifier/checking/claim_evaluation.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "verifier/evaluation/approximate.h"

namespace thetagate::engine::checker_internal {

namespace {

// Below this size a growth function may be undefined or zero (lg lg 1,
// n lg n at 1) and T is dominated by its base cases: such sizes are skipped
// rather than reported.
const BigInt kSmallSize = 64;
// A log2 ratio this close to 0 is checked exactly; farther away, the double
// approximation (relative error ~1e-15) already decides the side.
constexpr double kExactMargin = 1e-9;
// Work units (CheckOptions::work_budget): a subproblem of b bits on the
// integer kernel costs 1 + b/kWorkBitsUnit, on the general path
// kGeneralPathStepWork times that.
constexpr uint64_t kWorkBitsUnit = 8192;
constexpr uint64_t kGeneralPathStepWork = 16;

}  // namespace

std::string short_number(const BigInt& n) {
  std::string s = n.str();
  if (s.size() <= 24) return s;
  return s.substr(0, 10) + "…" + s.substr(s.size() - 10) + " (" + std::to_string(s.size()) +
         " digits)";
}

uint64_t effort_of(const Claim& claim, const CheckOptions& options) {
  return std::max<uint64_t>(1, options.effort) * std::max<uint64_t>(1, claim.sizes.effort);
}

// The evaluator's limits grow with the effort: a deeper search may need
// larger single sizes (the per-size limit), more steps in all, and more
// time before the default hang guard, which must never be what ends a
// search. A clock limit the caller gave is kept as given.
Budget reading_budget(const CheckOptions& options, uint64_t effort) {
  Budget b = options.budget;
  b.max_steps *= effort;
  if (b.max_steps_per_size != 0) b.max_steps_per_size *= effort;
  if (options.clock_limit) {
    b.max_seconds = *options.clock_limit;
  } else {
    b.max_seconds *= static_cast<double>(effort);
  }
  return b;
}

ClaimEvaluation::ClaimEvaluation(const Claim& claim, const CheckOptions& options,
                                 ClaimResult& counters)
    : claim_(claim),
      options_(options),
      counters_(counters),
      effort_(effort_of(claim, options)),
      evaluator_(claim.recurrence, reading_budget(options, effort_)),
      t_of_n_(make_call(claim.recurrence->main.name, {make_variable()})) {}

uint64_t ClaimEvaluation::work_of(uint64_t steps, uint64_t bits) const {
  uint64_t weight = evaluator_.uses_integer_kernel() ? 1 : kGeneralPathStepWork;
  return steps * weight * (kWorkBitsUnit + bits) / kWorkBitsUnit;
}

uint64_t ClaimEvaluation::work_budget() const {
  return std::max<uint64_t>(1, options_.work_budget * effort_);
}

double ClaimEvaluation::work_used() const {
  return static_cast<double>(work_) / static_cast<double>(work_budget());
}

std::optional<Value> ClaimEvaluation::value_at(const BigInt& n, bool count) {
  try {
    uint64_t before = evaluator_.stats().steps;
    Value v = evaluator_.value_at(n);
    work_ += work_of(evaluator_.stats().steps - before,
                     std::max<uint64_t>(bit_length(n), v.magnitude_bits()));
    if (count) {
      ++counters_.sizes_checked;
      counters_.largest_bits = std::max<uint64_t>(counters_.largest_bits, bit_length(n));
    }
    values_.try_emplace(n, v);
    return v;
  } catch (const BudgetExceeded& e) {
    note_stop(fmt::format("the search stopped before n = {} ({} bits): {}", short_number(n),
                          bit_length(n), e.what()));
    return std::nullopt;
  }
}

Value ClaimEvaluation::known_value(const BigInt& n) {
  auto it = values_.find(n);
  return it != values_.end() ? it->second : evaluator_.value_at(n);
}

Value ClaimEvaluation::evaluate(const Expr& e, const SourceText& source, const BigInt& n) {
  return evaluator_.evaluate(e, source, n);
}

std::optional<int> ClaimEvaluation::compare_at(const Expr& a, const SourceText& sa, const Expr& b,
                                               const SourceText& sb, const BigInt& n) {
  try {
    return evaluator_.compare_at(a, sa, b, sb, n);
  } catch (const PrecisionExhausted&) {
    ++undecidable_;
    return std::nullopt;
  } catch (const BudgetExceeded& e) {
    // Steps or memory, e.g. T(n) recomputed after a memo clear.
    if (skipped_comparisons_++ == 0) first_skip_reason_ = e.what();
    return std::nullopt;
  }
}

std::optional<double> ClaimEvaluation::log2_ratio(const Value& t, const Expr& reference,
                                                  const BigInt& n) {
  // Small sizes: a double evaluation of the reference is enough for the
  // band and is much cheaper than intervals; its sign must be clearly
  // positive, else the exact route below decides.
  // Larger sizes: the same on logarithms (error about 1e-12 in log2,
  // far inside kExactMargin).
  if (bit_length(n) < 50) {
    std::optional<double> g = approximate(reference, static_cast<int64_t>(n));
    int t_sign = sign_of(t);
    if (g && *g > 0 && t_sign > 0) return t.log2_magnitude() - std::log2(*g);
  } else if (std::optional<double> lg = approximate_log2(reference, n); lg && sign_of(t) > 0) {
    return t.log2_magnitude() - *lg;
  }
  std::optional<Value> r;
  try {
    r = evaluator_.evaluate(reference, claim_.bound.source, n);
  } catch (const InputError&) {
    if (n < kSmallSize) return std::nullopt;
    throw;
  } catch (const BudgetExceeded&) {
    // g(n) too large to hold (n^(10^10)): no band point here; the exact
    // comparison may still decide, and the derivation can decide the claim.
    return std::nullopt;
  }
  int r_sign = sign_of(*r), t_sign = sign_of(t);
  if (r_sign <= 0 || t_sign <= 0) {
    if (n < kSmallSize || !claim_.bound.is_asymptotic()) return std::nullopt;
    if (r_sign <= 0) {
      fail_at(claim_.bound.source, reference.pos,
              fmt::format("the growth function is not positive at n = {}", short_number(n)),
              "a bound's class must be positive for large n, e.g. Theta(n lg n)");
    }
    return std::nullopt;
  }
  return t.log2_magnitude() - r->log2_magnitude();
}

int ClaimEvaluation::sign_of(const Value& v) {
  try {
    return v.sign();
  } catch (const PrecisionShortfall&) {
    return 0;
  }
}

std::optional<bool> ClaimEvaluation::breaks(Side side, const Expr& reference, bool strict,
                                            const BigInt& n) {
  std::optional<int> order =
      compare_at(*t_of_n_, claim_.recurrence->source, reference, claim_.bound.source, n);
  if (!order) return std::nullopt;
  if (side == Side::kUpper) return *order > 0 || (strict && *order == 0);
  return *order < 0 || (strict && *order == 0);
}

bool ClaimEvaluation::suspicious(Side side, std::optional<double> log2_ratio) {
  if (!log2_ratio) return true;  // a side <= 0: only the exact comparison knows
  return side == Side::kUpper ? *log2_ratio > -kExactMargin : *log2_ratio < kExactMargin;
}

void ClaimEvaluation::note_stop(const std::string& why) {
  if (stopped_.empty()) stopped_ = why;
}

std::vector<std::string> ClaimEvaluation::notes() const {
  std::vector<std::string> out;
  if (!stopped_.empty()) out.push_back(stopped_);
  if (undecidable_ > 0) {
    out.push_back(fmt::format(
        "{} exact comparisons stayed undecided even at the highest interval precision (both "
        "sides irrational and equal to many digits)",
        undecidable_));
  }
  if (skipped_comparisons_ > 0) {
    out.push_back(fmt::format("{} exact comparisons were skipped, out of budget ({})",
                              skipped_comparisons_, first_skip_reason_));
  }
  return out;
}

}  // namespace thetagate::engine::checker_internal
