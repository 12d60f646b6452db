// The hunt for witnesses: every size the families give, then local search
// at each scale from the band's extreme sample, then shrinking an explicit
// bound's break toward the smallest n that still breaks it, or climbing an
// asymptotic bound's witness ladder.
#include "verifier/checking/witness_search.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "generators/local_search.h"

namespace thetagate::engine::checker_internal {

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

class WitnessSearch {
 public:
  explicit WitnessSearch(ClaimEvaluation& eval) : eval_(eval) {}

  SearchOutcome run(const std::vector<Size>& sizes) {
    const Bound& bound = eval_.claim().bound;
    explicit_ = !bound.is_asymptotic();
    if (explicit_) {
      if (bound.upper) targets_.push_back({Side::kUpper, bound.upper.get(), bound.strict_upper});
      if (bound.lower) targets_.push_back({Side::kLower, bound.lower.get(), bound.strict_lower});
      if (targets_.empty()) throw InternalError("", "an explicit bound without a side");
    } else {
      if (bound.kind == BoundKind::kTheta || bound.kind == BoundKind::kBigO) {
        targets_.push_back({Side::kUpper, bound.growth.get()});
      }
      if (bound.kind == BoundKind::kTheta || bound.kind == BoundKind::kOmega) {
        targets_.push_back({Side::kLower, bound.growth.get()});
      }
    }
    sample_sizes(sizes);
    // A family member may land in a narrow window at a high scale while
    // lower scales have windows of their own: search those first, so an
    // explicit bound's witness is the smallest scale's, then shrink within it.
    search_targets();
    for (const Target& target : targets_) outcome_.any_samples |= !target.samples.empty();
    if (explicit_) {
      outcome_.band = targets_.front().band.rows();
      for (const Target& target : targets_) {
        if (target.violation) outcome_.breaks.push_back(witness_for(target, *target.violation));
      }
      return std::move(outcome_);
    }
    // One band for the report: both sides saw the same sizes, and local
    // search pushed each side's edge apart.
    BandBuilder merged;
    for (const Target& target : targets_) {
      for (const Sample& s : target.samples) merged.add(s.n, s.log2_ratio);
      outcome_.samples.insert(outcome_.samples.end(), target.samples.begin(), target.samples.end());
    }
    outcome_.band = merged.rows();
    for (const Target& target : targets_) climb_ladder(target);
    return std::move(outcome_);
  }

 private:
  // Samples every size; for explicit bounds, stops a side at its first
  // certified break.
  void sample_sizes(const std::vector<Size>& sizes);
  // Local search for every target, each with an equal share of the work
  // left below the local-search mark (WorkShares), and of the whole budget
  // for carrying.
  void search_targets();
  // Pushes each scale's band edge outward by local search from its extreme
  // sample, until the work reaches work_end. Each scale gets an equal share
  // of what is left when it starts, so cheap scales pass their work on.
  // Past work_end, each remaining scale still evaluates the size carried up
  // from the scale below, until carry_end.
  void search_locally(Target& target, uint64_t work_end, uint64_t carry_end);
  // Moves a certified violation toward the smallest size that still breaks
  // the bound: halve the distance to min_n while that keeps it broken, then
  // single steps (the shrinking RapidCheck does, on one integer).
  // REQUIRES: target.violation is set.
  void shrink(Target& target);
  // Rungs of the witness ladder: for c = 10, 100, ..., the smallest sampled
  // n with T(n) > c·g(n) (upper) or T(n) < g(n)/c (lower), certified exactly.
  void climb_ladder(const Target& target);
  // The witness for sample s of target; `factor` is the ladder rung's c
  // ("10", "100", ...), empty for an explicit side's break.
  // REQUIRES: T(s.n) was evaluated before (known_value).
  Witness witness_for(const Target& target, const Sample& s, const std::string& factor = "");
  std::optional<bool> breaks(const Target& target, const BigInt& n) {
    return eval_.breaks(target.side, *target.reference, target.strict, n);
  }

  ClaimEvaluation& eval_;
  bool explicit_ = false;
  std::vector<Target> targets_;
  SearchOutcome outcome_;
};

void WitnessSearch::sample_sizes(const std::vector<Size>& sizes) {
  for (const Size& size : sizes) {
    if (eval_.work_used() > WorkShares::kSizeFamilies) {
      eval_.note_stop(
          fmt::format("the search stopped before n = {}: {:.0f}% of the work budget went to "
                      "the size families",
                      short_number(size.n), WorkShares::kSizeFamilies * 100));
      outcome_.partial_scale = size.n == 0 ? 0 : bit_length(size.n) - 1;
      break;
    }
    std::optional<Value> t = eval_.value_at(size.n, true);
    if (!t) {
      outcome_.partial_scale = size.n == 0 ? 0 : bit_length(size.n) - 1;
      break;
    }
    bool all_done = true;
    for (Target& target : targets_) {
      if (target.violation) continue;
      std::optional<double> l = eval_.log2_ratio(*t, *target.reference, size.n);
      if (l) {
        target.band.add(size.n, *l);
        target.samples.push_back({size.n, size.family, *l});
      }
      if (explicit_ && ClaimEvaluation::suspicious(target.side, l)) {
        std::optional<bool> broken = breaks(target, size.n);
        if (broken && *broken) target.violation = Sample{size.n, size.family, l.value_or(0)};
      }
      all_done &= target.violation.has_value();
    }
    if (explicit_ && all_done) break;
  }
}

void WitnessSearch::search_targets() {
  uint64_t end = eval_.work_budget() / 100 * WorkShares::kLocalSearchPercent;
  for (size_t i = 0; i < targets_.size(); ++i) {
    uint64_t left = targets_.size() - i;
    uint64_t share = eval_.work() < end ? (end - eval_.work()) / left : 0;
    uint64_t carry =
        eval_.work() < eval_.work_budget() ? (eval_.work_budget() - eval_.work()) / left : 0;
    search_locally(targets_[i], eval_.work() + share, eval_.work() + carry);
    if (explicit_ && targets_[i].violation) shrink(targets_[i]);
  }
}

void WitnessSearch::search_locally(Target& target, uint64_t work_end, uint64_t carry_end) {
  std::vector<BandRow> rows = target.band.rows();
  LocalSearchOptions options;
  options.seed = eval_.options().seed;
  options.maximise = target.side == Side::kUpper;
  // Enough for coarse-to-fine moves to close in on a window a few parts
  // per million wide; the work share usually ends a scale first.
  options.max_evaluations = 96;
  bool upper = target.side == Side::kUpper;
  std::optional<uint64_t> scale_end;  // set while local_search runs
  SizeScore score = [&](const BigInt& n) -> std::optional<double> {
    if (scale_end && eval_.work() >= *scale_end) throw StopSearch{};
    if (n < eval_.min_n()) return std::nullopt;
    std::optional<Value> t = eval_.value_at(n, false);
    if (!t) return std::nullopt;
    try {
      return eval_.log2_ratio(*t, *target.reference, n);
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
  size_t scales_left =
      static_cast<size_t>(std::count_if(rows.begin(), rows.end(), [&](const BandRow& r) {
        return r.scale >= 14 && r.scale < below;
      }));
  bool searching = true;
  for (const BandRow& row : rows) {
    if (row.scale >= below) return;
    if (row.scale < 14) continue;
    // Past the search's share, each scale still gets its carried size: one
    // evaluation, and what keeps the high scales near the extreme. Only
    // this side's share of the whole budget ends that.
    if (eval_.work() >= carry_end) return;
    if (searching && eval_.work() >= work_end) {
      outcome_.notes.push_back(
          fmt::format("local search stopped at {} bits: work budget", row.scale + 1));
      searching = false;
    }
    uint64_t share = searching ? (work_end - eval_.work()) / scales_left : 0;
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
      scale_end = eval_.work() + share;
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
    if (explicit_ && ClaimEvaluation::suspicious(target.side, best_score)) {
      std::optional<bool> broken = breaks(target, best);
      if (broken && *broken) {
        target.violation = Sample{best, "local-search", best_score};
        return;  // rows are in increasing scale: this is the smallest scale
      }
    }
  }
}

void WitnessSearch::shrink(Target& target) {
  BigInt n = target.violation->n;
  int budget = 400;
  bool improved = true;
  while (improved && budget > 0) {
    improved = false;
    BigInt gap = n - eval_.min_n();
    for (BigInt d = gap; d >= 1 && budget > 0; d /= 2) {
      BigInt m = n - d;
      --budget;
      if (!eval_.value_at(m, false)) return;
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

Witness WitnessSearch::witness_for(const Target& target, const Sample& s,
                                   const std::string& factor) {
  Witness w;
  w.n = s.n;
  w.side = target.side;
  Value t = eval_.known_value(s.n);
  w.value = t.str();
  // What T(n) was compared with: the explicit side, or c·g(n) (upper) and
  // g(n)/c (lower) for a ladder rung.
  ExprPtr compared(ExprPtr(), target.reference);  // not owning: the claim outlives it
  if (!factor.empty()) {
    ExprKind op = target.side == Side::kUpper ? ExprKind::kMul : ExprKind::kDiv;
    ExprPtr c = make_number(Rational(BigInt(factor)));
    compared = op == ExprKind::kMul ? make_binary(op, c, compared) : make_binary(op, compared, c);
  }
  Value r = eval_.evaluate(*compared, eval_.claim().bound.source, s.n);
  w.bound = r.str();
  w.ratio =
      factor.empty() ? std::exp2(t.log2_magnitude() - r.log2_magnitude()) : std::exp2(s.log2_ratio);
  if (factor.empty()) {
    // By how much the bound is broken, exactly (an interval when the bound
    // is irrational): the certificate a reader can check at a glance.
    ExprPtr over = target.side == Side::kUpper
                       ? make_binary(ExprKind::kSub, eval_.t_of_n(), compared)
                       : make_binary(ExprKind::kSub, compared, eval_.t_of_n());
    try {
      w.margin = eval_.evaluate(*over, eval_.claim().bound.source, s.n).str();
    } catch (const BudgetExceeded&) {
      // The comparison was certified; only its display is lost.
    }
  }
  w.factor = factor;
  w.family = s.family;
  return w;
}

void WitnessSearch::climb_ladder(const Target& target) {
  const Bound& bound = eval_.claim().bound;
  const SourceText& rs = eval_.claim().recurrence->source;
  std::vector<Sample> ordered = target.samples;
  std::sort(ordered.begin(), ordered.end(),
            [](const Sample& a, const Sample& b) { return a.n < b.n; });
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
      ExprPtr scaled_t = make_binary(ExprKind::kMul, make_number(Rational(c)), eval_.t_of_n());
      std::optional<int> order =
          target.side == Side::kUpper
              ? eval_.compare_at(*eval_.t_of_n(), rs, *scaled_g, bound.source, s.n)
              : eval_.compare_at(*scaled_t, rs, *bound.growth, bound.source, s.n);
      bool certified = order && (target.side == Side::kUpper ? *order > 0 : *order < 0);
      if (!certified) continue;
      outcome_.rungs.push_back(witness_for(target, s, c.str()));
      found = true;
      break;
    }
    if (!found) break;
  }
}

}  // namespace

SearchOutcome search_witnesses(ClaimEvaluation& eval, const std::vector<Size>& sizes) {
  return WitnessSearch(eval).run(sizes);
}

}  // namespace thetagate::engine::checker_internal
