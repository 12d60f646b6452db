#include "verifier/checker.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>
#include <unordered_map>

#include <fmt/format.h>

#include "generators/local_search.h"
#include "generators/size_family.h"
#include "verifier/approximate.h"
#include "verifier/classify.h"
#include "verifier/derive.h"
#include "verifier/trend.h"

namespace thetagate {

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

std::string short_number(const BigInt& n) {
  std::string s = n.str();
  if (s.size() <= 24) return s;
  return s.substr(0, 10) + "…" + s.substr(s.size() - 10) + " (" + std::to_string(s.size()) +
         " digits)";
}

// log2 of a growth class at n, approximately (for the consistency band).
std::optional<double> log2_of_class(const GrowthClass& g, const BigInt& n) {
  double lg_n = Value(n).log2_magnitude();
  if (lg_n <= 2.0) return std::nullopt;
  double result = g.alpha.approx() * lg_n + g.beta.approx() * std::log2(lg_n) +
                  g.gamma.approx() * std::log2(std::log2(lg_n));
  double rho = g.rho.approx();
  if (rho != 1.0) {
    if (bit_length(n) > 60) return std::nullopt;
    result += static_cast<double>(n) * std::log2(rho);
  }
  return std::isfinite(result) ? std::optional<double>(result) : std::nullopt;
}

// Per-scale minimum and maximum of log2(T/g).
class BandBuilder {
 public:
  void add(const BigInt& n, double log2_ratio) {
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
  std::vector<BandRow> rows() const {
    std::vector<BandRow> out;
    for (auto [scale, row] : rows_) {
      row.low = std::exp2(row.low_log2);
      row.high = std::exp2(row.high_log2);
      out.push_back(row);
    }
    return out;
  }
  bool empty() const { return rows_.empty(); }

 private:
  std::map<uint64_t, BandRow> rows_;
};

struct Sample {
  BigInt n;
  std::string family;
  double log2_ratio = 0;
};

// One side of a bound being hunted: the reference function (g, or an
// explicit side) and what breaking it means.
struct Target {
  Target(Side s, const Expr* r, bool strict_side = false)
      : side(s), reference(r), strict(strict_side) {}
  Side side;
  const Expr* reference;
  bool strict = false;
  BandBuilder band;
  std::vector<Sample> samples;
  std::optional<Sample> violation;  // explicit bounds: the first certified break
};

class ClaimCheck {
 public:
  ClaimCheck(const Claim& claim, const CheckOptions& options, ClaimResult& result)
      : claim_(claim), options_(options), result_(result),
        evaluator_(claim.recurrence, options.budget),
        t_of_n_(make_call(claim.recurrence->main.name, {make_variable()})) {}

  void run() {
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
          "sides irrational and equal to many digits)", undecidable_));
    }
  }

 private:
  void derive_bound() {
    try {
      derivation_ = derive(*claim_.recurrence);
    } catch (const std::exception& e) {
      derivation_ = Derivation{};
      derivation_->reasons.push_back(std::string("the derivation failed: ") + e.what());
    }
    if (!derivation_->derived.empty()) result_.derived = "Theta(" + derivation_->derived + ")";
    result_.method = derivation_->method;
    result_.reasons = derivation_->steps;
    for (const auto& r : derivation_->reasons) result_.reasons.push_back(r);
  }

  std::vector<Size> plan_sizes() {
    SizePlan plan;
    plan.divisors = recurrence_divisors(*claim_.recurrence);
    plan.max_bits = options_.max_bits.value_or(claim_.sizes.max_bits.value_or(4096));
    plan.min_n = claim_.sizes.min_n.value_or(BigInt(1));
    if (!claim_.bound.is_asymptotic()) plan.min_n = std::max(plan.min_n, claim_.bound.n0);
    plan.exhaustive_limit = options_.exhaustive_limit;
    plan.seed = options_.seed;
    plan.families = claim_.sizes.families;
    min_n_ = plan.min_n;
    return generate_sizes(plan);
  }

  // The work of `steps` subproblems of about `bits` bits (the size's or the
  // value's, whichever is larger: exponential recurrences have small n and
  // huge values). Calibrated on time (bench/check_bench.cc): a step costs
  // about the same up to a few thousand bits, memo traffic dominating the
  // arithmetic; on the general path (intervals, logarithms) a step costs
  // about 16 kernel steps.
  uint64_t work_of(uint64_t steps, uint64_t bits) const {
    uint64_t weight = evaluator_.uses_integer_kernel() ? 1 : kGeneralPathStepWork;
    return steps * weight * (kWorkBitsUnit + bits) / kWorkBitsUnit;
  }

  // The default budget times --effort times the claim's own `effort`.
  uint64_t work_budget() const {
    uint64_t effort = std::max<uint64_t>(1, options_.effort) * std::max<uint64_t>(1, claim_.sizes.effort);
    return std::max<uint64_t>(1, options_.work_budget * effort);
  }

  // The share of the work budget used so far.
  double work_used() const {
    return static_cast<double>(work_) / static_cast<double>(work_budget());
  }

  // Local search for every target, each with an equal share of the work
  // left below 85% of the budget.
  void search_targets(std::vector<Target>& targets, bool is_explicit) {
    uint64_t end = work_budget() / 100 * 85;
    for (size_t i = 0; i < targets.size(); ++i) {
      uint64_t share = work_ < end ? (end - work_) / (targets.size() - i) : 0;
      search_locally(targets[i], is_explicit, work_ + share);
      if (is_explicit && targets[i].violation) shrink(targets[i]);
    }
  }

  // T(n), or nullopt when the budget ran out (the search stops there).
  std::optional<Value> value_at(const BigInt& n, bool count) {
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

  // The rows a trend may be read through: scales the size families
  // covered, with at least three samples. Where the families stopped, and
  // in the scales c·2^k spills into, a row holds one or two shapes (often
  // only even sizes), and its edges would bend the trend.
  std::vector<BandRow> complete_scales(const std::vector<BandRow>& rows) const {
    std::vector<BandRow> out;
    for (const BandRow& row : rows) {
      if ((!partial_scale_ || row.scale < *partial_scale_) && row.samples >= 3) out.push_back(row);
    }
    return out;
  }

  // T(n) for a size evaluated before. Kept here because the evaluator's
  // memo may have been cleared since, and one large size alone can need
  // more subproblems than the per-size limit allows.
  Value known_value(const BigInt& n) {
    auto it = values_.find(n);
    return it != values_.end() ? it->second : evaluator_.value_at(n);
  }

  // -1, 0, +1, or nullopt when even the highest precision cannot decide.
  std::optional<int> compare_at(const Expr& a, const SourceText& sa, const Expr& b,
                                const SourceText& sb, const BigInt& n) {
    try {
      return evaluator_.compare_at(a, sa, b, sb, n);
    } catch (const BudgetExceeded&) {
      ++undecidable_;
      return std::nullopt;
    }
  }

  // log2(T(n)/reference(n)), or nullopt where either side is not positive
  // or the reference is undefined at a small n. InputErrors at larger n
  // propagate: the claim is malformed.
  std::optional<double> log2_ratio(const Value& t, const Target& target, const BigInt& n) {
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

  static int sign_of(const Value& v) {
    try {
      return v.sign();
    } catch (const PrecisionShortfall&) {
      return 0;
    }
  }

  // Explicit bounds: does T(n) break the target's side, exactly?
  std::optional<bool> breaks(const Target& target, const BigInt& n) {
    std::optional<int> order = compare_at(*t_of_n_, claim_.recurrence->source, *target.reference,
                                          claim_.bound.source, n);
    if (!order) return std::nullopt;
    if (target.side == Side::kUpper) return *order > 0 || (target.strict && *order == 0);
    return *order < 0 || (target.strict && *order == 0);
  }

  bool suspicious(const Target& target, std::optional<double> l) const {
    if (!l) return true;  // a side <= 0: only the exact comparison knows
    return target.side == Side::kUpper ? *l > -kExactMargin : *l < kExactMargin;
  }

  // Samples every size; for explicit bounds, stops a side at its first
  // certified break.
  void sample_sizes(const std::vector<Size>& sizes, std::vector<Target>& targets, bool is_explicit) {
    for (const Size& size : sizes) {
      if (work_used() > 0.6) {
        if (stopped_.empty()) {
          stopped_ = fmt::format("the search stopped before n = {}: 60% of the work budget "
                                 "went to the size families", short_number(size.n));
        }
        partial_scale_ = bit_length(size.n) - 1;
        break;
      }
      std::optional<Value> t = value_at(size.n, true);
      if (!t) {
        partial_scale_ = bit_length(size.n) - 1;
        break;
      }
      bool all_done = true;
      for (Target& target : targets) {
        if (target.violation) continue;
        std::optional<double> l = log2_ratio(*t, target, size.n);
        if (l) {
          target.band.add(size.n, *l);
          target.samples.push_back({size.n, size.family, *l});
        }
        if (is_explicit && suspicious(target, l)) {
          std::optional<bool> broken = breaks(target, size.n);
          if (broken && *broken) target.violation = Sample{size.n, size.family, l.value_or(0)};
        }
        all_done &= target.violation.has_value();
      }
      if (is_explicit && all_done) break;
    }
  }

  // Pushes each scale's band edge outward by local search from its extreme
  // sample, until the work reaches work_end. Each scale gets an equal share
  // of what is left when it starts, so cheap scales pass their work on.
  void search_locally(Target& target, bool is_explicit, uint64_t work_end) {
    std::vector<BandRow> rows = target.band.rows();
    LocalSearchOptions options;
    options.seed = options_.seed;
    options.maximise = target.side == Side::kUpper;
    // Enough for coarse-to-fine moves to close in on a window a few parts
    // per million wide; the work share usually ends a scale first.
    options.max_evaluations = 96;
    bool upper = target.side == Side::kUpper;
    std::optional<uint64_t> scale_end;  // set while local_search runs
    SizeScore score = [&](const BigInt& n) -> std::optional<double> {
      if (scale_end && work_ >= *scale_end) throw StopSearch{};
      if (n < min_n_) return std::nullopt;
      std::optional<Value> t = value_at(n, false);
      if (!t) return std::nullopt;
      try {
        return log2_ratio(*t, target, n);
      } catch (const InputError&) {
        return std::nullopt;
      }
    };
    // Explicit bounds with a violation already: only scales below it can
    // give a smaller witness.
    uint64_t below = target.violation ? bit_length(target.violation->n) - 1 : UINT64_MAX;
    // The best size of the previous scale, carried up: ratios of divide-
    // and-conquer recurrences fluctuate periodically in lg n (Drmota and
    // Szpankowski 2013), so the extreme sits at about the same place
    // relative to 2^k on every scale.
    std::optional<BigInt> carried;
    uint64_t carried_scale = 0;
    // Scales below 14 bits are covered by the exhaustive range.
    size_t scales_left = static_cast<size_t>(std::count_if(
        rows.begin(), rows.end(), [&](const BandRow& r) { return r.scale >= 14 && r.scale < below; }));
    bool searching = true;
    for (const BandRow& row : rows) {
      if (row.scale >= below) return;
      if (row.scale < 14) continue;
      // Past the search's share, each scale still gets its carried size: one
      // evaluation, and what keeps the high scales near the extreme. Only
      // the whole budget ends that.
      if (work_ >= work_budget()) return;
      if (searching && work_ >= work_end) {
        result_.notes.push_back(fmt::format("local search stopped at {} bits: work budget",
                                            row.scale + 1));
        searching = false;
      }
      uint64_t share = searching ? (work_end - work_) / scales_left : 0;
      --scales_left;
      BigInt start = upper ? row.high_at : row.low_at;
      double start_score = upper ? row.high_log2 : row.low_log2;
      if (carried) {
        BigInt shifted = *carried << static_cast<unsigned>(row.scale - carried_scale);
        if (std::optional<double> s = score(shifted);
            s && (upper ? *s > start_score : *s < start_score)) {
          start = shifted;
          start_score = *s;
          target.band.add(shifted, *s);
        }
      }
      std::optional<LocalSearchResult> found;
      if (searching) {
        scale_end = work_ + share;
        found = local_search(start, score, options);
        scale_end.reset();
      }
      bool better = found && (upper ? found->score > start_score : found->score < start_score);
      BigInt best = better ? found->n : start;
      double best_score = better ? found->score : start_score;
      carried = best;
      carried_scale = row.scale;
      bool improved = upper ? best_score > row.high_log2 : best_score < row.low_log2;
      if (!improved) continue;
      target.band.add(best, best_score);
      target.samples.push_back({best, "local-search", best_score});
      if (is_explicit && suspicious(target, best_score)) {
        std::optional<bool> broken = breaks(target, best);
        if (broken && *broken) {
          target.violation = Sample{best, "local-search", best_score};
          return;  // rows are in increasing scale: this is the smallest scale
        }
      }
    }
  }

  // Moves a certified violation toward the smallest size that still breaks
  // the bound: halve the distance to min_n while that keeps it broken, then
  // single steps (the shrinking RapidCheck does, on one integer).
  void shrink(Target& target) {
    BigInt n = target.violation->n;
    int budget = 400;
    bool improved = true;
    while (improved && budget > 0) {
      improved = false;
      BigInt gap = n - min_n_;
      for (BigInt d = gap; d >= 1 && budget > 0; d /= 2) {
        BigInt m = n - d;
        --budget;
        if (!value_at(m, false)) return;
        std::optional<bool> broken = breaks(target, m);
        if (broken && *broken) {
          n = m;
          improved = true;
          break;
        }
      }
    }
    if (n != target.violation->n) {
      target.violation->n = n;
      target.violation->family += ", shrunk";
    }
  }

  Witness witness_for(const Target& target, const Sample& s, const std::string& factor = "") {
    Witness w;
    w.n = s.n;
    w.side = target.side;
    Value t = known_value(s.n);
    w.value = t.str();
    if (factor.empty()) {
      Value r = evaluator_.evaluate(*target.reference, claim_.bound.source, s.n);
      w.bound = r.str();
      w.ratio = std::exp2(t.log2_magnitude() - r.log2_magnitude());
    } else {
      Value r = evaluator_.evaluate(*target.reference, claim_.bound.source, s.n);
      w.bound = r.str();
      w.ratio = std::exp2(s.log2_ratio);
    }
    w.factor = factor;
    w.family = s.family;
    return w;
  }

  void check_explicit(const std::vector<Size>& sizes) {
    const Bound& bound = claim_.bound;
    std::vector<Target> targets;
    if (bound.upper) targets.push_back({Side::kUpper, bound.upper.get(), bound.strict_upper});
    if (bound.lower) targets.push_back({Side::kLower, bound.lower.get(), bound.strict_lower});
    sample_sizes(sizes, targets, true);
    // A family member may land in a narrow window at a high scale while
    // lower scales have windows of their own: search those first, so the
    // witness is the smallest scale's, then shrink within it.
    search_targets(targets, true);
    result_.band = targets.front().band.rows();
    if (result_.method.empty()) result_.method = "exact evaluation";
    for (const Target& target : targets) {
      if (target.violation) result_.witnesses.push_back(witness_for(target, *target.violation));
    }
    if (!result_.witnesses.empty()) {
      const Witness& w = result_.witnesses.front();
      result_.verdict = Verdict::kRefuted;
      result_.message = fmt::format("{} bound broken at n = {} (family {}): {}({}) = {} {} {}",
                                    side_name(w.side), short_number(w.n), w.family,
                                    claim_.recurrence->main.name, short_number(w.n), w.value,
                                    w.side == Side::kUpper ? ">" : "<", w.bound);
      return;
    }
    std::string checked = fmt::format("no violation at {} sizes up to {} bits",
                                      result_.sizes_checked, result_.largest_bits);
    if (!derivation_->growth) {
      result_.verdict = Verdict::kUndecided;
      result_.numeric_only = true;
      result_.message = checked + "; no theorem derives the class, so the numbers cannot cover "
                                  "every n";
      return;
    }
    // The derived class must fit under the upper side and over the lower.
    const GrowthClass& derived = *derivation_->growth;
    bool fits = true, tight = true;
    std::string why;
    for (const Target& target : targets) {
      Classification c = classify(*target.reference, &claim_.recurrence->helpers);
      if (!c.growth) {
        fits = false;
        why = fmt::format("the {} side has no growth class ({})", side_name(target.side), c.reason);
        break;
      }
      int order = compare(derived, *c.growth);
      if (order != 0) tight = false;
      if ((target.side == Side::kUpper && order > 0) || (target.side == Side::kLower && order < 0)) {
        fits = false;
        why = fmt::format("T(n) = Θ({}) grows {} than the {} side Θ({}), so the bound must "
                          "break beyond the sizes checked",
                          derivation_->derived, target.side == Side::kUpper ? "faster" : "slower",
                          side_name(target.side), to_string(*c.growth));
      }
    }
    if (fits) {
      result_.verdict = Verdict::kHolds;
      result_.tight = tight;
      result_.message = checked + fmt::format("; {} derives Θ({}), which the bound's class {}",
                                              derivation_->method, derivation_->derived,
                                              tight ? "matches" : "contains");
      return;
    }
    result_.verdict = Verdict::kUndecided;
    result_.message = checked + "; " + why;
  }

  // Rungs of the witness ladder: for c = 10, 100, ..., the smallest sampled
  // n with T(n) > c·g(n) (upper) or T(n) < g(n)/c (lower), certified exactly.
  void climb_ladder(const Target& target) {
    const Bound& bound = claim_.bound;
    const SourceText& rs = claim_.recurrence->source;
    std::vector<Sample> ordered = target.samples;
    std::sort(ordered.begin(), ordered.end(), [](const Sample& a, const Sample& b) { return a.n < b.n; });
    // Rungs up to c = 10^12: past the escape factor 10^6 with room to show
    // the trend, without listing hundreds of sizes.
    for (int j = 1; j <= 12; ++j) {
      double c_log2 = j * std::log2(10.0);
      bool found = false;
      for (const Sample& s : ordered) {
        bool beyond = target.side == Side::kUpper ? s.log2_ratio > c_log2 : s.log2_ratio < -c_log2;
        if (!beyond) continue;
        BigInt c = boost::multiprecision::pow(BigInt(10), static_cast<unsigned>(j));
        ExprPtr scaled_g = make_binary(ExprKind::kMul, make_number(Rational(c)), bound.growth);
        ExprPtr scaled_t = make_binary(ExprKind::kMul, make_number(Rational(c)), t_of_n_);
        std::optional<int> order =
            target.side == Side::kUpper ? compare_at(*t_of_n_, rs, *scaled_g, bound.source, s.n)
                                        : compare_at(*scaled_t, rs, *bound.growth, bound.source, s.n);
        bool certified = order && (target.side == Side::kUpper ? *order > 0 : *order < 0);
        if (!certified) continue;
        result_.witnesses.push_back(witness_for(target, s, c.str()));
        found = true;
        break;
      }
      if (!found) break;
    }
  }

  // The exact numbers must agree with the derivation: T(n)/derived(n) stays
  // in a band that does not drift. Returns a description of the drift, or
  // "" when they agree.
  std::string consistency(const std::vector<Sample>& samples) {
    if (!derivation_->growth) return "";
    BandBuilder band;
    for (const Sample& s : samples) {
      Value t = known_value(s.n);
      std::optional<double> lg = log2_of_class(*derivation_->growth, s.n);
      if (!lg || sign_of(t) <= 0) continue;
      band.add(s.n, t.log2_magnitude() - *lg);
    }
    if (band.empty()) return "";
    TrendReading trend = read_trend(complete_scales(band.rows()));
    std::vector<std::string> drift;
    for (const auto& [edge, name] : {std::pair{trend.high, "upper"}, std::pair{trend.low, "lower"}}) {
      if (edge.drift == Drift::kEscapes || ((edge.drift == Drift::kRising || edge.drift == Drift::kFalling) &&
                                            std::fabs(edge.slope) > 0.5)) {
        drift.push_back(describe_edge(edge, name));
      }
    }
    std::string joined;
    for (const auto& d : drift) joined += (joined.empty() ? "" : "; ") + d;
    return joined;
  }

  void check_asymptotic(const std::vector<Size>& sizes) {
    const Bound& bound = claim_.bound;
    BoundKind kind = bound.kind;
    std::vector<Target> targets;
    if (kind == BoundKind::kTheta || kind == BoundKind::kBigO) {
      targets.push_back({Side::kUpper, bound.growth.get()});
    }
    if (kind == BoundKind::kTheta || kind == BoundKind::kOmega) {
      targets.push_back({Side::kLower, bound.growth.get()});
    }
    sample_sizes(sizes, targets, false);
    search_targets(targets, false);
    // One band for the report: both sides saw the same sizes.
    BandBuilder merged;
    for (const Target& target : targets) {
      for (const Sample& s : target.samples) merged.add(s.n, s.log2_ratio);
    }
    result_.band = merged.rows();
    for (const Target& target : targets) climb_ladder(target);

    ClaimComparison cmp = compare_claim(*derivation_, bound);
    std::vector<Sample> all = targets.front().samples;
    switch (cmp.agreement) {
      case ClaimAgreement::kAgree:
      case ClaimAgreement::kHoldsLoosely:
      case ClaimAgreement::kContradicts: {
        std::string drift = consistency(all);
        if (!drift.empty()) {
          result_.verdict = Verdict::kUndecided;
          result_.message = "INTERNAL INCONSISTENCY: " + derivation_->method + " derives Θ(" +
                            derivation_->derived + "), but the exact values disagree: " + drift +
                            ". This is a bug or a misapplied theorem; please report it.";
          return;
        }
        if (cmp.agreement == ClaimAgreement::kContradicts) {
          result_.verdict = Verdict::kRefuted;
          result_.message = cmp.message + "; the exact values agree with the derivation";
          return;
        }
        result_.verdict = Verdict::kHolds;
        result_.tight = cmp.agreement == ClaimAgreement::kAgree;
        result_.witnesses.clear();
        result_.message = cmp.message + "; the exact values agree";
        return;
      }
      default:
        break;
    }
    if (!cmp.message.empty()) result_.reasons.push_back(cmp.message);
    decide_numerically(targets);
  }

  void decide_numerically(const std::vector<Target>& targets) {
    BoundKind kind = claim_.bound.kind;
    bool upper_matters = kind == BoundKind::kTheta || kind == BoundKind::kBigO;
    bool lower_matters = kind == BoundKind::kTheta || kind == BoundKind::kOmega;
    TrendReading trend = read_trend(complete_scales(result_.band));
    result_.method = "numeric";
    result_.numeric_only = true;

    auto reached_escape = [&](Side side) {
      for (const Witness& w : result_.witnesses) {
        if (w.side == side && w.factor.size() >= 7) return true;  // c >= 10^6
      }
      return false;
    };
    bool upper_escapes = upper_matters && trend.high.drift == Drift::kEscapes && reached_escape(Side::kUpper);
    bool lower_escapes = lower_matters && trend.low.drift == Drift::kEscapes && reached_escape(Side::kLower);
    std::string joined;
    if (upper_matters) joined = describe_edge(trend.high, "upper");
    if (lower_matters) joined += (joined.empty() ? "" : "; ") + describe_edge(trend.low, "lower");

    if (upper_escapes || lower_escapes) {
      result_.verdict = Verdict::kRefuted;
      result_.message = fmt::format("numbers only (no theorem applied): T(n)/g(n) {} past a factor "
                                    "of 10^6 with a monotone trend; {}",
                                    upper_escapes ? "climbs" : "falls", joined);
      return;
    }
    bool upper_ok = !upper_matters || trend.high.drift == Drift::kSteady ||
                    (kind == BoundKind::kBigO && trend.high.drift == Drift::kFalling);
    bool lower_ok = !lower_matters || trend.low.drift == Drift::kSteady ||
                    (kind == BoundKind::kOmega && trend.low.drift == Drift::kRising);
    bool any = false;
    for (const Target& t : targets) any |= !t.samples.empty();
    if (upper_ok && lower_ok && any) {
      result_.verdict = Verdict::kHolds;
      result_.tight = !((kind == BoundKind::kBigO && trend.high.drift == Drift::kFalling) ||
                        (kind == BoundKind::kOmega && trend.low.drift == Drift::kRising));
      result_.witnesses.clear();
      result_.message = "numbers only (no theorem applied): " + joined;
      return;
    }
    result_.verdict = Verdict::kUndecided;
    result_.message = "numbers only (no theorem applied), and they do not settle it: " + joined;
  }

  const Claim& claim_;
  const CheckOptions& options_;
  ClaimResult& result_;
  Evaluator evaluator_;
  ExprPtr t_of_n_;
  uint64_t work_ = 0;
  std::optional<uint64_t> partial_scale_;  // where the size families stopped, if they did
  std::unordered_map<BigInt, Value, BigIntHash> values_;  // every T(n) value_at() gave
  std::optional<Derivation> derivation_;
  BigInt min_n_ = 1;
  std::string stopped_;
  uint64_t undecidable_ = 0;
};

ClaimResult error_result(const ClaimResult& base, const Diagnostic& d) {
  ClaimResult r = base;
  r.verdict = Verdict::kError;
  r.error = d;
  r.message = d.message;
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

namespace {

ClaimResult check_one_reading(const Claim& claim, const CheckOptions& options) {
  ClaimResult result;
  result.name = claim.name;
  result.file = claim.where.file;
  result.line = claim.where.line;
  result.claimed = claim.bound.text();
  result.note = claim.note;
  result.notes = claim.recurrence->notes;
  try {
    ClaimCheck(claim, options, result).run();
  } catch (const InputError& e) {
    return error_result(result, e.diagnostic());
  } catch (const BudgetExceeded& e) {
    result.verdict = Verdict::kUndecided;
    result.message = std::string("out of budget: ") + e.what();
  }
  return result;
}

// rounding = both: the claim must hold with quotients read as floors and as
// ceilings; the report says which reading fails.
ClaimResult combine_readings(ClaimResult floor_result, ClaimResult ceil_result) {
  if (floor_result.verdict == Verdict::kError) return floor_result;
  if (ceil_result.verdict == Verdict::kError) return ceil_result;
  const char* both_note = "checked twice: quotients inside T(...) read as floor and as ceil";
  auto labelled = [&](ClaimResult r, const std::string& reading) {
    r.message = "with quotients read as " + reading + ": " + r.message;
    r.notes.push_back(both_note);
    return r;
  };
  bool floor_refuted = floor_result.verdict == Verdict::kRefuted;
  bool ceil_refuted = ceil_result.verdict == Verdict::kRefuted;
  if (floor_refuted && ceil_refuted) return labelled(floor_result, "floor (and also as ceil)");
  if (floor_refuted) return labelled(floor_result, "floor (the ceil reading does not break it)");
  if (ceil_refuted) return labelled(ceil_result, "ceil (the floor reading does not break it)");
  if (floor_result.verdict == Verdict::kHolds && ceil_result.verdict == Verdict::kHolds) {
    floor_result.tight = floor_result.tight && ceil_result.tight;
    floor_result.message = "holds with quotients read as floor and as ceil: " + floor_result.message;
    floor_result.notes.push_back(both_note);
    floor_result.sizes_checked += ceil_result.sizes_checked;
    return floor_result;
  }
  if (floor_result.verdict != Verdict::kHolds) return labelled(floor_result, "floor");
  return labelled(ceil_result, "ceil");
}

}  // namespace

ClaimResult check_claim(const Claim& claim, const CheckOptions& options) {
  Rounding rounding = options.rounding.value_or(claim.rounding.value_or(Rounding::kFloor));
  if (rounding == Rounding::kFloor || !has_unrounded_calls(*claim.recurrence)) {
    return check_one_reading(claim, options);
  }
  Claim ceil_claim = claim;
  ceil_claim.recurrence = read_quotients_as_ceilings(*claim.recurrence);
  if (rounding == Rounding::kCeil) return check_one_reading(ceil_claim, options);
  return combine_readings(check_one_reading(claim, options), check_one_reading(ceil_claim, options));
}

RunResult check_entries(const std::vector<ClaimEntry>& entries, const CheckOptions& options) {
  RunResult run;
  run.seed = options.seed;
  for (const ClaimEntry& entry : entries) {
    if (entry.claim) {
      run.claims.push_back(check_claim(*entry.claim, options));
      continue;
    }
    ClaimResult base;
    base.name = entry.name;
    base.file = entry.where.file;
    base.line = entry.where.line;
    run.claims.push_back(error_result(base, entry.error.value_or(Diagnostic{})));
  }
  return run;
}

}  // namespace thetagate
