// The hunt for witnesses: every size the families give, then local search
// at each scale from the band's extreme sample, then shrinking an explicit
// bound's break toward the smallest n that still breaks it.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "generators/local_search.h"
#include "verifier/checking/claim_check.h"

namespace thetagate::engine::checker_internal {

void ClaimCheck::sample_sizes(const std::vector<Size>& sizes, std::vector<Target>& targets,
                              bool is_explicit) {
  for (const Size& size : sizes) {
    if (work_used() > 0.6) {
      if (stopped_.empty()) {
        stopped_ = fmt::format(
            "the search stopped before n = {}: 60% of the work budget "
            "went to the size families",
            short_number(size.n));
      }
      partial_scale_ = size.n == 0 ? 0 : bit_length(size.n) - 1;
      break;
    }
    std::optional<Value> t = value_at(size.n, true);
    if (!t) {
      partial_scale_ = size.n == 0 ? 0 : bit_length(size.n) - 1;
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

void ClaimCheck::search_targets(std::vector<Target>& targets, bool is_explicit) {
  uint64_t end = work_budget() / 100 * 85;
  for (size_t i = 0; i < targets.size(); ++i) {
    uint64_t left = targets.size() - i;
    uint64_t share = work_ < end ? (end - work_) / left : 0;
    uint64_t carry = work_ < work_budget() ? (work_budget() - work_) / left : 0;
    search_locally(targets[i], is_explicit, work_ + share, work_ + carry);
    if (is_explicit && targets[i].violation) shrink(targets[i]);
  }
}

void ClaimCheck::search_locally(Target& target, bool is_explicit, uint64_t work_end,
                                uint64_t carry_end) {
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
    if (work_ >= carry_end) return;
    if (searching && work_ >= work_end) {
      result_.notes.push_back(
          fmt::format("local search stopped at {} bits: work budget", row.scale + 1));
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

void ClaimCheck::shrink(Target& target) {
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

Witness ClaimCheck::witness_for(const Target& target, const Sample& s, const std::string& factor) {
  Witness w;
  w.n = s.n;
  w.side = target.side;
  Value t = known_value(s.n);
  w.value = t.str();
  // What T(n) was compared with: the explicit side, or c·g(n) (upper) and
  // g(n)/c (lower) for a ladder rung.
  ExprPtr compared(ExprPtr(), target.reference);  // not owning: the claim outlives it
  if (!factor.empty()) {
    ExprKind op = target.side == Side::kUpper ? ExprKind::kMul : ExprKind::kDiv;
    ExprPtr c = make_number(Rational(BigInt(factor)));
    compared = op == ExprKind::kMul ? make_binary(op, c, compared) : make_binary(op, compared, c);
  }
  Value r = evaluator_.evaluate(*compared, claim_.bound.source, s.n);
  w.bound = r.str();
  w.ratio =
      factor.empty() ? std::exp2(t.log2_magnitude() - r.log2_magnitude()) : std::exp2(s.log2_ratio);
  if (factor.empty()) {
    // By how much the bound is broken, exactly (an interval when the bound
    // is irrational): the certificate a reader can check at a glance.
    ExprPtr over = target.side == Side::kUpper ? make_binary(ExprKind::kSub, t_of_n_, compared)
                                               : make_binary(ExprKind::kSub, compared, t_of_n_);
    try {
      w.margin = evaluator_.evaluate(*over, claim_.bound.source, s.n).str();
    } catch (const BudgetExceeded&) {
      // The comparison was certified; only its display is lost.
    }
  }
  w.factor = factor;
  w.family = s.family;
  return w;
}

}  // namespace thetagate::engine::checker_internal
