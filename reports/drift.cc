#include "reports/drift.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <nlohmann/json.hpp>
#include <tuple>

#include "reports/json_report.h"
#include "reports/number_text.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {

namespace {

constexpr size_t kMaxDetailLines = 8;  // per kind (new witnesses, lost ones, band moves)
const char* const kIndent = "    ";

const char* change_name(const ClaimDrift& d) {
  return d.is_new() ? "new" : d.is_lost() ? "lost" : "changed";
}

// ---- text ----

std::string paint(const TextStyle& style, const char* code, const std::string& text) {
  return style.colour ? code + text + "\033[0m" : text;
}

std::string witness_text(const Witness& w) {
  std::string s = fmt::format("n = {} ({}, ratio {}", short_decimal(w.n), side_name(w.side),
                              format_ratio(w.ratio));
  if (!w.factor.empty()) s += ", c = " + w.factor;
  return s + ")";
}

void append_witnesses(std::string& out, const char* kind, const std::vector<Witness>& ws) {
  for (size_t i = 0; i < ws.size() && i < kMaxDetailLines; ++i) {
    out += fmt::format("{}{} witness {}\n", kIndent, kind, witness_text(ws[i]));
  }
  if (ws.size() > kMaxDetailLines) {
    out +=
        fmt::format("{}… and {} more {} witnesses\n", kIndent, ws.size() - kMaxDetailLines, kind);
  }
}

std::string band_move_text(const BandMove& m) {
  std::string s = fmt::format("band at scale {}:", m.after.scale);
  if (m.low_moved) {
    s += fmt::format(" low {} → {}", format_band_ratio(m.before.low, m.before.low_log2),
                     format_band_ratio(m.after.low, m.after.low_log2));
  }
  if (m.high_moved) {
    s += fmt::format("{} high {} → {}", m.low_moved ? "," : "",
                     format_band_ratio(m.before.high, m.before.high_log2),
                     format_band_ratio(m.after.high, m.after.high_log2));
  }
  return s;
}

// A recurrence as one line: its lines joined by "; ", shortened past 120
// characters (the JSON drift keeps the whole text).
std::string one_line(const std::string& text) {
  std::string out;
  size_t start = 0;
  while (start <= text.size()) {
    size_t end = text.find('\n', start);
    if (end == std::string::npos) end = text.size();
    std::string line = text.substr(start, end - start);
    while (!line.empty() && (line.back() == ' ' || line.back() == '\r')) line.pop_back();
    size_t first = line.find_first_not_of(' ');
    if (first != std::string::npos) {
      if (!out.empty()) out += "; ";
      out += line.substr(first);
    }
    start = end + 1;
  }
  out = escape_controls(out);
  if (out.size() > 120) {
    size_t cut = 117;
    while (cut > 0 && (static_cast<unsigned char>(out[cut]) & 0xC0) == 0x80) --cut;
    out = out.substr(0, cut) + "…";
  }
  return out;
}

std::string or_none(const std::string& derived) { return derived.empty() ? "none" : derived; }

std::string claim_text(const ClaimDrift& d, const TextStyle& style) {
  std::string label = fmt::format("{:<11}", change_name(d));
  std::string s = paint(style, "\033[33m", label) + escape_controls(d.name) + "   " +
                  escape_controls(d.file) + ":" + std::to_string(d.line);
  if (d.is_new()) s += std::string("   ") + verdict_name(*d.after);
  if (d.is_lost()) s += std::string("   was ") + verdict_name(*d.before);
  s += "\n";
  // What changed in the claim itself comes first: it explains the rest.
  if (d.renamed())
    s += fmt::format("{}renamed from {}\n", kIndent, escape_controls(d.renamed_from));
  if (d.recurrence_edited()) {
    s += fmt::format("{}the recurrence changed: {} → {}\n", kIndent, one_line(d.recurrence_before),
                     one_line(d.recurrence_after));
  }
  if (d.bound_edited()) {
    s += fmt::format("{}the bound changed: {} → {}\n", kIndent, escape_controls(d.claimed_before),
                     escape_controls(d.claimed_after));
  }
  auto shown = [](const std::string& v) { return v.empty() ? std::string("(defaults)") : v; };
  if (d.sizes_edited()) {
    s += fmt::format("{}the sizes changed: {} → {}\n", kIndent,
                     escape_controls(shown(d.sizes_before)), escape_controls(shown(d.sizes_after)));
  }
  if (d.rounding_edited()) {
    s += fmt::format("{}the rounding changed: {} → {}\n", kIndent,
                     escape_controls(shown(d.rounding_before)),
                     escape_controls(shown(d.rounding_after)));
  }
  if (d.verdict_changed()) {
    s += fmt::format("{}verdict {} → {}\n", kIndent, verdict_name(*d.before),
                     verdict_name(*d.after));
  }
  if (d.derived_changed()) {
    s += fmt::format("{}derived {} → {}\n", kIndent, or_none(d.derived_before),
                     or_none(d.derived_after));
  }
  if (d.proof_changed()) {
    s +=
        d.proof_after.empty()
            ? fmt::format("{}no longer proved (it held by {})\n", kIndent, d.proof_before)
            : fmt::format("{}the proof changed: {} → {}\n", kIndent, d.proof_before, d.proof_after);
  }
  append_witnesses(s, "new", d.new_witnesses);
  append_witnesses(s, "lost", d.lost_witnesses);
  for (size_t i = 0; i < d.band_moves.size() && i < kMaxDetailLines; ++i) {
    s += kIndent + band_move_text(d.band_moves[i]) + "\n";
  }
  if (d.band_moves.size() > kMaxDetailLines) {
    s += fmt::format("{}… and {} more scales moved\n", kIndent,
                     d.band_moves.size() - kMaxDetailLines);
  }
  return s;
}

// ---- JSON ----

using Json = nlohmann::ordered_json;

Json witnesses_json(const std::vector<Witness>& ws) {
  Json j = Json::array();
  for (const Witness& w : ws) j.push_back(witness_to_json(w));
  return j;
}

Json claim_json(const ClaimDrift& d) {
  Json j;
  j["name"] = d.name;
  j["file"] = d.file;
  j["line"] = d.line;
  j["change"] = change_name(d);
  j["renamed_from"] = d.renamed_from;
  j["recurrence_before"] = d.recurrence_before;
  j["recurrence_after"] = d.recurrence_after;
  j["claimed_before"] = d.claimed_before;
  j["claimed_after"] = d.claimed_after;
  j["sizes_before"] = d.sizes_before;
  j["sizes_after"] = d.sizes_after;
  j["rounding_before"] = d.rounding_before;
  j["rounding_after"] = d.rounding_after;
  j["proof_before"] = d.proof_before;
  j["proof_after"] = d.proof_after;
  j["verdict_before"] = d.before ? verdict_name(*d.before) : "";
  j["verdict_after"] = d.after ? verdict_name(*d.after) : "";
  j["derived_before"] = d.derived_before;
  j["derived_after"] = d.derived_after;
  j["new_witnesses"] = witnesses_json(d.new_witnesses);
  j["lost_witnesses"] = witnesses_json(d.lost_witnesses);
  j["band_moves"] = Json::array();
  for (const BandMove& m : d.band_moves) {
    Json move;
    move["scale"] = m.after.scale;
    move["before"] = band_row_to_json(m.before);
    move["after"] = band_row_to_json(m.after);
    move["low_moved"] = m.low_moved;
    move["high_moved"] = m.high_moved;
    j["band_moves"].push_back(move);
  }
  return j;
}

}  // namespace

std::string render_drift_text(const DriftReport& drift, const TextStyle& style) {
  size_t changed = 0, added = 0, lost = 0;
  for (const ClaimDrift& d : drift.claims) {
    if (d.is_new()) {
      ++added;
    } else if (d.is_lost()) {
      ++lost;
    } else {
      ++changed;
    }
  }
  std::string heading =
      drift.any()
          ? fmt::format("drift against the baseline: {} of {} claim{} changed, {} new, {} lost",
                        changed, drift.compared, drift.compared == 1 ? "" : "s", added, lost)
          : fmt::format("no drift against the baseline: {} claim{} compared", drift.compared,
                        drift.compared == 1 ? "" : "s");
  std::string s = "\n" + paint(style, "\033[1m", heading) + "\n";
  if (drift.baseline_seed != drift.current_seed) {
    s += fmt::format(
        "{}the seeds differ (baseline {}, this run {}): witnesses and band ends at "
        "random sizes may move for that reason alone\n",
        kIndent, drift.baseline_seed, drift.current_seed);
  }
  for (const ClaimDrift& d : drift.claims) s += claim_text(d, style);
  // Names come from claim files and baselines: nothing in them may act on a
  // terminal (see render_text).
  return terminal_safe(s, style.colour);
}

std::string render_claim_drift_text(const ClaimDrift& d) { return claim_text(d, TextStyle{}); }

std::string render_json_with_drift(const RunResult& run, const DriftReport& drift) {
  // Re-reading our own output keeps render_json the one writer of the claims;
  // ordered_json keeps the key order and doubles print back identically.
  Json j = Json::parse(render_json(run));
  Json d;
  d["baseline_seed"] = drift.baseline_seed;
  d["claims_compared"] = drift.compared;
  d["band_move_log2"] = kBandMoveLog2;
  d["changed"] = drift.any();
  d["claims"] = Json::array();
  for (const ClaimDrift& c : drift.claims) d["claims"].push_back(claim_json(c));
  j["drift"] = std::move(d);
  return json_escape_controls(j.dump(2, ' ', false, Json::error_handler_t::replace)) + "\n";
}

}  // namespace thetagate::engine
