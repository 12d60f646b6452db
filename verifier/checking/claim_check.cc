#include "verifier/checking/claim_check.h"

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

void BandBuilder::add(const BigInt& n, double log2_ratio) {
  uint64_t scale = bit_length(n) == 0 ? 0 : bit_length(n) - 1;
  auto [it, fresh] = rows_.try_emplace(scale);
  BandRow& row = it->second;
  row.scale = scale;
  if (fresh || log2_ratio < row.low_log2) {
    row.low_log2 = log2_ratio;
    row.low_at = n;
  }
  if (fresh || log2_ratio > row.high_log2) {
    row.high_log2 = log2_ratio;
    row.high_at = n;
  }
  ++row.samples;
}

std::vector<BandRow> BandBuilder::rows() const {
  std::vector<BandRow> out;
  for (auto [scale, row] : rows_) {
    row.low = std::exp2(row.low_log2);
    row.high = std::exp2(row.high_log2);
    out.push_back(row);
  }
  return out;
}

namespace {

// --effort times the claim's own effort.
uint64_t effort_of(const Claim& claim, const CheckOptions& options) {
  return std::max<uint64_t>(1, options.effort) * std::max<uint64_t>(1, claim.sizes.effort);
}

}  // namespace

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

ClaimCheck::ClaimCheck(const Claim& claim, const CheckOptions& options, ClaimResult& result)
    : claim_(claim),
      options_(options),
      result_(result),
      evaluator_(claim.recurrence, reading_budget(options, effort_of(claim, options))),
      t_of_n_(make_call(claim.recurrence->main.name, {make_variable()})),
      effort_(effort_of(claim, options)) {}

void ClaimCheck::run() {
  derive_bound();
  std::vector<Size> sizes = plan_sizes();
  if (claim_.bound.is_asymptotic()) {
    check_asymptotic(sizes);
  } else {
    check_explicit(sizes);
  }
  if (!stopped_.empty()) result_.notes.push_back(stopped_);
  if (undecidable_ > 0) {
    result_.notes.push_back(fmt::format(
        "{} exact comparisons stayed undecided even at the highest interval precision (both "
        "sides irrational and equal to many digits)",
        undecidable_));
  }
  if (skipped_comparisons_ > 0) {
    result_.notes.push_back(fmt::format("{} exact comparisons were skipped, out of budget ({})",
                                        skipped_comparisons_, first_skip_reason_));
  }
}

void ClaimCheck::derive_bound() {
  // derive() throws nothing for a valid model: what escapes is a bug, and
  // check_entry reports it on this claim.
  derivation_ = derive(*claim_.recurrence, options_.clock_limit);
  result_.derived = derivation_->bound_text();
  result_.method = derivation_->method;
  result_.function = claim_.recurrence->main.name;
  result_.steps = derivation_->steps;
  result_.failed_hypotheses = derivation_->reasons;
}

std::vector<Size> ClaimCheck::plan_sizes() {
  SizePlan plan =
      claim_size_plan(claim_, options_.max_bits.value_or(claim_.sizes.max_bits.value_or(4096)),
                      options_.exhaustive_limit, options_.seed);
  min_n_ = plan.min_n;
  if (plan.min_n >= (BigInt(1) << plan.max_bits)) {
    // Sizes are below 2^max_bits: nothing would be checked. An error at the
    // smallest size, not a verdict on no evidence.
    std::string what = fmt::format(
        "the smallest size, {} bits long, is not below 2^{}, the largest size checked (max_bits): "
        "no size is left to check",
        bit_length(plan.min_n), plan.max_bits);
    std::string hint = fmt::format(
        "lower it, or raise max_bits ([claim.sizes] or --max-bits, at "
        "most 65536)");
    if (claim_.sizes.min_n && *claim_.sizes.min_n == plan.min_n) {
      Diagnostic d = claim_.sizes.min_n_where;
      d.message = "'min_n': " + what;
      d.hint = hint;
      throw InputError(d);
    }
    // Else the bound's own "for n >= N0" asked for it.
    size_t at = claim_.bound.source.text.rfind(">=");
    fail_at(claim_.bound.source, at == std::string::npos ? 0 : at, "'for n >= ...': " + what, hint);
  }
  return generate_sizes(plan);
}

uint64_t ClaimCheck::work_of(uint64_t steps, uint64_t bits) const {
  uint64_t weight = evaluator_.uses_integer_kernel() ? 1 : kGeneralPathStepWork;
  return steps * weight * (kWorkBitsUnit + bits) / kWorkBitsUnit;
}

uint64_t ClaimCheck::work_budget() const {
  return std::max<uint64_t>(1, options_.work_budget * effort_of(claim_, options_));
}

double ClaimCheck::work_used() const {
  return static_cast<double>(work_) / static_cast<double>(work_budget());
}

std::optional<Value> ClaimCheck::value_at(const BigInt& n, bool count) {
  try {
    uint64_t before = evaluator_.stats().steps;
    Value v = evaluator_.value_at(n);
    work_ += work_of(evaluator_.stats().steps - before,
                     std::max<uint64_t>(bit_length(n), v.magnitude_bits()));
    if (count) {
      ++result_.sizes_checked;
      result_.largest_bits = std::max<uint64_t>(result_.largest_bits, bit_length(n));
    }
    values_.try_emplace(n, v);
    return v;
  } catch (const BudgetExceeded& e) {
    if (stopped_.empty()) {
      stopped_ = fmt::format("the search stopped before n = {} ({} bits): {}", short_number(n),
                             bit_length(n), e.what());
    }
    return std::nullopt;
  }
}

Value ClaimCheck::known_value(const BigInt& n) {
  auto it = values_.find(n);
  return it != values_.end() ? it->second : evaluator_.value_at(n);
}

std::optional<int> ClaimCheck::compare_at(const Expr& a, const SourceText& sa, const Expr& b,
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

std::optional<double> ClaimCheck::log2_ratio(const Value& t, const Target& target,
                                             const BigInt& n) {
  // Small sizes: a double evaluation of the reference is enough for the
  // band and is much cheaper than intervals; its sign must be clearly
  // positive, else the exact route below decides.
  // Larger sizes: the same on logarithms (error about 1e-12 in log2,
  // far inside kExactMargin).
  if (bit_length(n) < 50) {
    std::optional<double> g = approximate(*target.reference, static_cast<int64_t>(n));
    int t_sign = sign_of(t);
    if (g && *g > 0 && t_sign > 0) return t.log2_magnitude() - std::log2(*g);
  } else if (std::optional<double> lg = approximate_log2(*target.reference, n);
             lg && sign_of(t) > 0) {
    return t.log2_magnitude() - *lg;
  }
  std::optional<Value> r;
  try {
    r = evaluator_.evaluate(*target.reference, claim_.bound.source, n);
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
      fail_at(claim_.bound.source, target.reference->pos,
              fmt::format("the growth function is not positive at n = {}", short_number(n)),
              "a bound's class must be positive for large n, e.g. Theta(n lg n)");
    }
    return std::nullopt;
  }
  return t.log2_magnitude() - r->log2_magnitude();
}

int ClaimCheck::sign_of(const Value& v) {
  try {
    return v.sign();
  } catch (const PrecisionShortfall&) {
    return 0;
  }
}

std::optional<bool> ClaimCheck::breaks(const Target& target, const BigInt& n) {
  std::optional<int> order =
      compare_at(*t_of_n_, claim_.recurrence->source, *target.reference, claim_.bound.source, n);
  if (!order) return std::nullopt;
  if (target.side == Side::kUpper) return *order > 0 || (target.strict && *order == 0);
  return *order < 0 || (target.strict && *order == 0);
}

bool ClaimCheck::suspicious(const Target& target, std::optional<double> l) const {
  if (!l) return true;  // a side <= 0: only the exact comparison knows
  return target.side == Side::kUpper ? *l > -kExactMargin : *l < kExactMargin;
}

std::vector<BandRow> ClaimCheck::complete_scales(const std::vector<BandRow>& rows) const {
  std::vector<BandRow> out;
  for (const BandRow& row : rows) {
    if ((!partial_scale_ || row.scale < *partial_scale_) && row.samples >= 3) out.push_back(row);
  }
  return out;
}

std::vector<BandRow> ClaimCheck::scales_for_escape(const std::vector<BandRow>& rows) const {
  std::vector<BandRow> out;
  for (const BandRow& row : rows) {
    if ((!partial_scale_ || row.scale <= *partial_scale_) && row.samples >= 3) out.push_back(row);
  }
  return out;
}

}  // namespace thetagate::engine::checker_internal
