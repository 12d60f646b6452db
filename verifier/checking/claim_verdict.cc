// How the verdict is reached: an explicit bound by its certified breaks and
// the derived class; an asymptotic one by the derivation, checked against the
// exact values, or failing that by the trend of the band and the witness
// ladder alone.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <utility>

#include "verifier/checking/claim_check.h"
#include "verifier/checking/trend.h"
#include "verifier/derivation/classify.h"

namespace thetagate::engine::checker_internal {

namespace {

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

}  // namespace

void ClaimCheck::check_explicit(const std::vector<Size>& sizes) {
  const Bound& bound = claim_.bound;
  std::vector<Target> targets;
  if (bound.upper) targets.push_back({Side::kUpper, bound.upper.get(), bound.strict_upper});
  if (bound.lower) targets.push_back({Side::kLower, bound.lower.get(), bound.strict_lower});
  if (targets.empty()) throw std::logic_error("an explicit bound without a side");
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
    result_.message = fmt::format(
        "{} bound broken at n = {} (family {}): {}({}) = {} {} {}{}", side_name(w.side),
        short_number(w.n), w.family, claim_.recurrence->main.name, short_number(w.n), w.value,
        w.side == Side::kUpper ? ">" : "<", w.bound, w.margin.empty() ? "" : ", by " + w.margin);
    return;
  }
  std::string checked = fmt::format("no violation at {} sizes up to {} bits", result_.sizes_checked,
                                    result_.largest_bits);
  if (!derivation_->growth) {
    result_.verdict = Verdict::kUndecided;
    result_.numeric_only = true;
    result_.message = checked +
                      "; no theorem derives the class, so the numbers cannot cover "
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
      why = fmt::format(
          "T(n) = Θ({}) grows {} than the {} side Θ({}), so the bound must "
          "break beyond the sizes checked",
          derivation_->derived, target.side == Side::kUpper ? "faster" : "slower",
          side_name(target.side), to_string(*c.growth));
    }
  }
  if (fits) {
    result_.verdict = Verdict::kHolds;
    result_.tight = tight;
    result_.message =
        checked + fmt::format("; {} derives Θ({}), which the bound's class {}", derivation_->method,
                              derivation_->derived, tight ? "matches" : "contains");
    return;
  }
  result_.verdict = Verdict::kUndecided;
  result_.message = checked + "; " + why;
}

void ClaimCheck::check_asymptotic(const std::vector<Size>& sizes) {
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
  // Every side's samples: local search pushed each side's edge apart.
  std::vector<Sample> all;
  for (const Target& target : targets)
    all.insert(all.end(), target.samples.begin(), target.samples.end());
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

void ClaimCheck::climb_ladder(const Target& target) {
  const Bound& bound = claim_.bound;
  const SourceText& rs = claim_.recurrence->source;
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
      ExprPtr scaled_t = make_binary(ExprKind::kMul, make_number(Rational(c)), t_of_n_);
      std::optional<int> order = target.side == Side::kUpper
                                     ? compare_at(*t_of_n_, rs, *scaled_g, bound.source, s.n)
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

std::string ClaimCheck::consistency(const std::vector<Sample>& samples) {
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
    bool moves = edge.drift == Drift::kRising || edge.drift == Drift::kFalling;
    if (edge.drift == Drift::kEscapes || (moves && std::fabs(edge.slope) > 0.5)) {
      drift.push_back(describe_edge(edge, name));
    }
  }
  std::string joined;
  for (const auto& d : drift) joined += (joined.empty() ? "" : "; ") + d;
  return joined;
}

void ClaimCheck::decide_numerically(const std::vector<Target>& targets) {
  BoundKind kind = claim_.bound.kind;
  bool upper_matters = kind == BoundKind::kTheta || kind == BoundKind::kBigO;
  bool lower_matters = kind == BoundKind::kTheta || kind == BoundKind::kOmega;
  TrendReading trend = read_trend(complete_scales(result_.band));
  result_.method = "numeric";
  result_.numeric_only = true;

  auto reached_escape = [&](Side side) {
    for (const Witness& w : result_.witnesses) {
      if (w.side == side && !w.factor.empty() && BigInt(w.factor) >= 1000000) return true;
    }
    return false;
  };
  bool upper_escapes =
      upper_matters && trend.high.drift == Drift::kEscapes && reached_escape(Side::kUpper);
  bool lower_escapes =
      lower_matters && trend.low.drift == Drift::kEscapes && reached_escape(Side::kLower);
  std::string joined;
  if (upper_matters) joined = describe_edge(trend.high, "upper");
  if (lower_matters) joined += (joined.empty() ? "" : "; ") + describe_edge(trend.low, "lower");

  if (upper_escapes || lower_escapes) {
    result_.verdict = Verdict::kRefuted;
    result_.message = fmt::format(
        "numbers only (no theorem applied): T(n)/g(n) {} past a factor "
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

}  // namespace thetagate::engine::checker_internal
