#include "verifier/checking/run_comparison.h"

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <map>
#include <optional>

namespace thetagate::engine {

namespace {

using ClaimKey = std::pair<std::string, std::string>;  // name, file

bool same_witness(const Witness& a, const Witness& b) { return a.side == b.side && a.n == b.n; }

// Witnesses of `from` that `other` lacks, in `from`'s order.
std::vector<Witness> missing_from(const std::vector<Witness>& from,
                                  const std::vector<Witness>& other) {
  std::vector<Witness> out;
  for (const Witness& w : from) {
    bool found = false;
    for (const Witness& o : other) found = found || same_witness(w, o);
    if (!found) out.push_back(w);
  }
  return out;
}

// An end moved: by more than the tolerance, or between finite and not.
bool end_moved(double before_log2, double after_log2) {
  bool finite_before = std::isfinite(before_log2), finite_after = std::isfinite(after_log2);
  if (finite_before != finite_after) return true;
  if (!finite_before) return false;
  return std::fabs(after_log2 - before_log2) > kBandMoveLog2;
}

std::vector<BandMove> band_moves(const std::vector<BandRow>& before,
                                 const std::vector<BandRow>& after) {
  std::map<uint64_t, const BandRow*> by_scale;
  for (const BandRow& r : before) by_scale.emplace(r.scale, &r);
  std::map<uint64_t, BandMove> moves;  // sorted by scale
  for (const BandRow& r : after) {
    auto it = by_scale.find(r.scale);
    if (it == by_scale.end()) continue;
    BandMove m{*it->second, r, end_moved(it->second->low_log2, r.low_log2),
               end_moved(it->second->high_log2, r.high_log2)};
    if (m.low_moved || m.high_moved) moves.emplace(r.scale, m);
  }
  std::vector<BandMove> out;
  for (auto& [scale, m] : moves) out.push_back(m);
  return out;
}

// How a holds was proved, as the drift names it; "" when it did not hold.
std::string proof_of(const ClaimResult& c) {
  if (c.verdict != Verdict::kHolds) return "";
  if (c.basis.kind == BasisKind::kInduction) return "induction";
  if (c.basis.kind == BasisKind::kDerivationAgrees) return c.method;
  return "";
}

ClaimDrift drift_of_claim(const ClaimResult& before, const ClaimResult& after) {
  ClaimDrift d;
  d.name = after.name;
  d.file = after.file;
  d.line = after.line;
  d.before = before.verdict;
  d.after = after.verdict;
  if (before.name != after.name) d.renamed_from = before.name;
  d.recurrence_before = before.recurrence;
  d.recurrence_after = after.recurrence;
  d.claimed_before = before.claimed;
  d.claimed_after = after.claimed;
  d.sizes_before = before.sizes;
  d.sizes_after = after.sizes;
  d.rounding_before = before.rounding;
  d.rounding_after = after.rounding;
  // A report written before claims carried their settings says nothing of
  // them: no edit is claimed from it (both have the recurrence then).
  d.has_settings = !before.recurrence.empty() && !after.recurrence.empty() &&
                   before.settings_known && after.settings_known;
  d.derived_before = before.derived;
  d.derived_after = after.derived;
  d.proof_before = proof_of(before);
  d.proof_after = proof_of(after);
  d.new_witnesses = missing_from(after.witnesses, before.witnesses);
  d.lost_witnesses = missing_from(before.witnesses, after.witnesses);
  // The band is T(n)/g(n): after an edit, or with a new g(n), it moves
  // because the claim did, which the lines above already say.
  if (!d.edited() && !d.derived_changed()) d.band_moves = band_moves(before.band, after.band);
  return d;
}

// Each claim's file, lexically normalised ("./a/../b.toml" is "b.toml") and
// relative to the run's root: the deepest folder that holds every file of
// the run. "claims/x.toml" and "./claims/x.toml", or the same tree checked
// from another folder, give the same names.
std::vector<std::string> files_below_root(const RunResult& run) {
  namespace fs = std::filesystem;
  std::vector<fs::path> files;
  for (const ClaimResult& c : run.claims) files.push_back(fs::path(c.file).lexically_normal());
  std::optional<fs::path> root;
  for (const fs::path& f : files) {
    fs::path folder = f.parent_path();
    if (!root) {
      root = folder;
      continue;
    }
    fs::path common;
    auto a = root->begin(), b = folder.begin();
    for (; a != root->end() && b != folder.end() && *a == *b; ++a, ++b) common /= *a;
    root = common;
  }
  std::vector<std::string> out;
  for (const fs::path& f : files) {
    fs::path relative = root && !root->empty() ? f.lexically_relative(*root) : f;
    out.push_back(relative.empty() ? f.generic_string() : relative.generic_string());
  }
  return out;
}

bool drifted(const ClaimDrift& d) {
  return d.is_new() || d.is_lost() || d.edited() || d.renamed() || d.verdict_changed() ||
         d.derived_changed() || d.proof_changed() || !d.new_witnesses.empty() ||
         !d.lost_witnesses.empty() || !d.band_moves.empty();
}

}  // namespace

DriftReport compare_runs(const RunResult& baseline, const RunResult& current) {
  DriftReport report;
  report.baseline_seed = baseline.seed;
  report.current_seed = current.seed;
  std::vector<std::string> before_files = files_below_root(baseline);
  std::vector<std::string> after_files = files_below_root(current);
  // First by name and file below each run's root; a repeated copy of a
  // baseline claim (an older run that checked it twice) is neither compared
  // nor lost.
  std::map<ClaimKey, size_t> by_key;
  std::vector<bool> matched(baseline.claims.size(), false);
  std::vector<bool> copy(baseline.claims.size(), false);
  for (size_t i = 0; i < baseline.claims.size(); ++i) {
    copy[i] = !by_key.emplace(ClaimKey{baseline.claims[i].name, before_files[i]}, i).second;
  }
  std::vector<std::optional<size_t>> partner(current.claims.size());
  for (size_t i = 0; i < current.claims.size(); ++i) {
    auto it = by_key.find(ClaimKey{current.claims[i].name, after_files[i]});
    if (it == by_key.end()) continue;
    partner[i] = it->second;
    matched[it->second] = true;
  }
  // Then by name alone: a claim whose file moved or was named another way.
  for (size_t i = 0; i < current.claims.size(); ++i) {
    if (partner[i]) continue;
    for (size_t j = 0; j < baseline.claims.size(); ++j) {
      if (matched[j] || copy[j] || baseline.claims[j].name != current.claims[i].name) continue;
      partner[i] = j;
      matched[j] = true;
      break;
    }
  }
  // Then by text: the same recurrence and bound in the same file under a
  // new name is a rename, not one lost claim and one new.
  for (size_t i = 0; i < current.claims.size(); ++i) {
    const ClaimResult& c = current.claims[i];
    if (partner[i] || c.recurrence.empty()) continue;
    for (size_t j = 0; j < baseline.claims.size(); ++j) {
      const ClaimResult& b = baseline.claims[j];
      if (matched[j] || copy[j] || b.recurrence != c.recurrence || b.claimed != c.claimed ||
          before_files[j] != after_files[i]) {
        continue;
      }
      partner[i] = j;
      matched[j] = true;
      break;
    }
  }
  for (size_t i = 0; i < current.claims.size(); ++i) {
    const ClaimResult& c = current.claims[i];
    if (!partner[i]) {
      ClaimDrift d;
      d.name = c.name;
      d.file = c.file;
      d.line = c.line;
      d.after = c.verdict;
      d.recurrence_after = c.recurrence;
      d.claimed_after = c.claimed;
      d.derived_after = c.derived;
      report.claims.push_back(std::move(d));
      continue;
    }
    ++report.compared;
    ClaimDrift d = drift_of_claim(baseline.claims[*partner[i]], c);
    if (drifted(d)) report.claims.push_back(std::move(d));
  }
  std::vector<size_t> lost;
  for (size_t j = 0; j < baseline.claims.size(); ++j) {
    if (!matched[j] && !copy[j]) lost.push_back(j);
  }
  for (size_t index : lost) {
    const ClaimResult& c = baseline.claims[index];
    ClaimDrift d;
    d.name = c.name;
    d.file = c.file;
    d.line = c.line;
    d.before = c.verdict;
    d.recurrence_before = c.recurrence;
    d.claimed_before = c.claimed;
    d.derived_before = c.derived;
    report.claims.push_back(std::move(d));
  }
  return report;
}

}  // namespace thetagate::engine
