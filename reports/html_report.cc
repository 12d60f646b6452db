#include "reports/html_report.h"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdlib>

#include "reports/band_plot.h"
#include "reports/code_text.h"
#include "reports/cost_plot.h"
#include "reports/drift.h"
#include "reports/number_text.h"
#include "reports/text_report.h"
#include "reports/verdict_text.h"
#include "reports/xml_escape.h"

namespace thetagate::engine {

namespace {

const char* const kStyle = R"css(
body { font: 15px/1.45 system-ui, sans-serif; margin: 2em auto; max-width: 60em; padding: 0 1em;
       color: #1d2125; background: #fff; }
h1 { font-size: 1.5em; margin-bottom: 0.2em; }
h2 { font-size: 1.15em; margin: 0; }
h3 { font-size: 0.95em; margin: 1.2em 0 0.3em; color: #444; }
code, pre, .num { font-family: ui-monospace, monospace; font-size: 0.92em; }
table { border-collapse: collapse; margin: 0.4em 0; }
th, td { text-align: left; padding: 0.2em 0.7em; border-bottom: 1px solid #ddd; vertical-align: top; }
th { font-weight: 600; white-space: nowrap; }
table.witnesses { width: 100%; table-layout: fixed; }
table.witnesses th, table.witnesses td { overflow-wrap: anywhere; white-space: normal; }
.summary td:first-child { white-space: nowrap; }
.claim { border: 1px solid #ccd; border-left-width: 6px; border-radius: 4px; padding: 0.8em 1.1em;
         margin: 1.4em 0; }
.verdict { display: inline-block; min-width: 6.5em; font-weight: 700; text-transform: uppercase;
           font-size: 0.85em; letter-spacing: 0.04em; }
h2 .verdict { min-width: 7.6em; margin-right: 0.3em; }
.holds { border-left-color: #2e7d32; } .holds .verdict, .verdict.holds { color: #2e7d32; }
.refuted { border-left-color: #c62828; } .refuted .verdict, .verdict.refuted { color: #c62828; }
.undecided { border-left-color: #b26a00; } .undecided .verdict, .verdict.undecided { color: #b26a00; }
.error { border-left-color: #8e24aa; } .error .verdict, .verdict.error { color: #8e24aa; }
.where { color: #666; margin: 0.2em 0; }
pre.diagnostic { background: #f6f4f8; padding: 0.6em; overflow-x: auto; }
.band-plot { display: block; margin: 0.4em 0; max-width: 100%; height: auto; }
.band-plot .frame { fill: #fafbfc; stroke: #bbb; }
.band-plot .grid { stroke: #e3e5e8; }
.band-plot .tick, .band-plot .axis, .band-plot .constant-label { font: 11px sans-serif; fill: #555; }
.band-plot .band { fill: #1565c0; fill-opacity: 0.18; stroke: none; }
.band-plot .edge { fill: none; stroke: #1565c0; stroke-width: 1.5; }
.band-plot .mark { fill: #1565c0; }
.band-plot .constant { stroke: #c62828; stroke-dasharray: 5 4; }
.cost-plot { display: block; margin: 0.4em 0; max-width: 100%; height: auto; }
.cost-plot .frame { fill: #fafbfc; stroke: #bbb; }
.cost-plot .grid { stroke: #e3e5e8; }
.cost-plot .tick, .cost-plot .axis, .cost-plot .legend { font: 11px sans-serif; fill: #555; }
.cost-plot .model { fill: none; stroke: #1565c0; stroke-width: 1.5; }
.cost-plot .counted { fill: #2e7d32; }
.cost-plot .counted.broken { fill: #c62828; }
)css";

std::string esc(const std::string& text) { return xml_escape_text(text); }
std::string attr(const std::string& text) { return xml_escape_attribute(text); }

std::string verdict_span(Verdict v) {
  return fmt::format("<span class=\"verdict {0}\">{0}</span>", verdict_name(v));
}

std::string derived_text(const ClaimResult& c) {
  if (c.derived.empty()) return "\u2014";
  std::string s = c.derived;
  if (!c.method.empty() && c.method != "numeric") s += " by " + c.method;
  return s;
}

// A number shortened for reading, every digit in the hover title.
std::string number_cell(const std::string& full, const std::string& shown) {
  if (full == shown) return "<td class=\"num\">" + esc(full) + "</td>";
  return "<td class=\"num\" title=\"" + attr(full) + "\">" + esc(shown) + "</td>";
}

std::string witness_table(const ClaimResult& c) {
  std::string s =
      "<h3>Witnesses</h3>\n<table class=\"witnesses\">\n<tr><th>n</th><th>side</th>"
      "<th>T(n)/g(n)</th><th>T(n)</th><th>bound</th><th>broken by</th>"
      "<th>family</th><th>ladder c</th></tr>\n";
  for (const Witness& w : c.witnesses) {
    s += "<tr>" + number_cell(w.n.str(), short_decimal(w.n));
    s += std::string("<td>") + side_name(w.side) + "</td>";
    s += "<td class=\"num\">" + esc(format_ratio(w.ratio)) + "</td>";
    s += number_cell(w.value, short_value(w.value));
    s += number_cell(w.bound, short_value(w.bound));
    s += number_cell(w.margin, short_value(w.margin));
    s += "<td>" + esc(w.family) + "</td><td class=\"num\">" + esc(w.factor) + "</td></tr>\n";
  }
  return s + "</table>\n";
}

std::string list(const char* heading, const char* tag, const std::vector<std::string>& items) {
  if (items.empty()) return "";
  std::string s = fmt::format("<h3>{}</h3>\n<{}>\n", heading, tag);
  for (const std::string& item : items) s += "<li>" + esc(item) + "</li>\n";
  return s + fmt::format("</{}>\n", tag);
}

// Ratio 1 always; each witness-ladder constant c once.
std::vector<PlotLine> plot_lines(const ClaimResult& c) {
  std::vector<PlotLine> lines{{1.0, "ratio 1"}};
  for (const Witness& w : c.witnesses) {
    if (w.factor.empty()) continue;
    double factor = std::strtod(w.factor.c_str(), nullptr);
    if (!(factor > 0) || !std::isfinite(factor)) continue;
    double ratio = w.side == Side::kUpper ? factor : 1.0 / factor;
    // Powers of ten as 10^k: "c = 10^12" fits the plot's margin.
    std::string factor_text = w.factor;
    if (factor_text.size() > 4 && factor_text[0] == '1' &&
        factor_text.find_first_not_of('0', 1) == std::string::npos) {
      factor_text = "10^" + std::to_string(factor_text.size() - 1);
    }
    std::string label = (w.side == Side::kUpper ? "c = " : "1/c, c = ") + factor_text;
    bool seen = false;
    for (const PlotLine& l : lines) seen = seen || l.label == label;
    if (!seen) lines.push_back({ratio, label});
  }
  return lines;
}

// Code -> model: the violations, then counted costs against T(n) as a plot.
std::string code_section(const CodeResult& code) {
  std::string s = "<h3>Code against model: " + esc(code.source) + "</h3>\n";
  s += fmt::format("<p>{} measurement{} at {} size{}; the model is {}.</p>\n", code.measurements,
                   code.measurements == 1 ? "" : "s", code.rows.size(),
                   code.rows.size() == 1 ? "" : "s", esc(relation_phrase(code.relation)));
  if (!code.families_missed.empty()) {
    s += "<p>Size families never measured: " + esc(family_list(code.families_missed)) + ".</p>\n";
  }
  if (!code.violations.empty()) {
    s += "<table class=\"violations\">\n<tr><th>n</th><th>counted</th><th>T(n)</th>"
         "<th>where</th><th>input</th><th>replay</th></tr>\n";
    for (const CostViolation& v : code.violations) {
      std::string where = v.file.empty() ? "" : v.file + ":" + std::to_string(v.line);
      s += "<tr>" + number_cell(v.n.str(), short_decimal(v.n)) +
           number_cell(v.cost, short_value(v.cost)) + number_cell(v.model, short_value(v.model)) +
           "<td>" + esc(where) + "</td><td><code>" + esc(v.input) + "</code></td><td><code>" +
           esc(v.replay) + "</code></td></tr>\n";
    }
    s += "</table>\n";
  }
  std::string plot = render_cost_plot(code);
  if (!plot.empty()) s += plot + "\n";
  return s;
}

// A claim's section. A passing claim that did not drift is collapsed: its
// heading is the <summary> of a closed <details>.
std::string claim_section(const ClaimResult& c, size_t index, bool collapsed) {
  std::string s =
      fmt::format("<section class=\"claim {}\" id=\"claim-{}\">\n", verdict_name(c.verdict), index);
  std::string heading = "<h2>" + verdict_span(c.verdict) + " " + esc(c.name) + "</h2>";
  s += collapsed ? "<details>\n<summary>" + heading + "</summary>\n" : heading + "\n";
  if (!c.file.empty())
    s += "<p class=\"where\">" + esc(c.file + ":" + std::to_string(c.line)) + "</p>\n";
  s += "<table class=\"bounds\">\n";
  s += "<tr><th>claimed</th><td>" + esc(c.claimed.empty() ? "\u2014" : c.claimed) + "</td></tr>\n";
  s += "<tr><th>derived</th><td>" + esc(derived_text(c)) + "</td></tr>\n";
  if (c.verdict == Verdict::kHolds && !c.tight) s += "<tr><th>tight</th><td>no</td></tr>\n";
  if (c.numeric_only) s += "<tr><th>decided by</th><td>the numbers alone</td></tr>\n";
  if (std::string proof = proof_name(c); !proof.empty())
    s += "<tr><th>proof</th><td>" + esc(proof) + "</td></tr>\n";
  if (c.sizes_checked > 0) {
    s += fmt::format("<tr><th>checked</th><td>{} sizes up to {} bits</td></tr>\n", c.sizes_checked,
                     c.largest_bits);
  }
  s += "</table>\n";
  std::string message = verdict_message(c);
  if (!message.empty()) s += "<p class=\"message\">" + esc(message) + "</p>\n";
  if (c.error) s += "<pre class=\"diagnostic\">" + esc(format_diagnostic(*c.error)) + "</pre>\n";
  if (!c.note.empty()) s += "<p class=\"note\">Note: " + esc(c.note) + "</p>\n";
  s += list("Derivation", "ol", c.steps);
  s += list("Theorems that do not apply", "ul", c.failed_hypotheses);
  s += list("Assumptions", "ul", c.notes);
  if (!c.witnesses.empty()) s += witness_table(c);
  if (c.code) s += code_section(*c.code);
  std::string plot = render_band_plot(c.band, plot_lines(c));
  if (!plot.empty()) {
    s += fmt::format("<h3>Ratio band across {} scale{}</h3>\n", c.band.size(),
                     c.band.size() == 1 ? "" : "s");
    s += plot + "\n";
  }
  if (collapsed) s += "</details>\n";
  return s + "</section>\n";
}

// Which claims drifted against the baseline (none without one).
std::vector<bool> drifted_claims(const RunResult& run, const DriftReport* drift) {
  std::vector<bool> out(run.claims.size(), false);
  if (!drift) return out;
  for (size_t i = 0; i < run.claims.size(); ++i) {
    for (const ClaimDrift& d : drift->claims)
      if (d.name == run.claims[i].name && d.file == run.claims[i].file) out[i] = true;
  }
  return out;
}

// The order a reader in the morning wants: errors, refuted, drifted,
// undecided, then the claims that hold; run order within each group.
std::vector<size_t> reading_order(const RunResult& run, const std::vector<bool>& drifted) {
  auto rank = [&](size_t i) {
    const ClaimResult& c = run.claims[i];
    if (c.verdict == Verdict::kError) return 0;
    if (c.verdict == Verdict::kRefuted) return 1;
    if (drifted[i]) return 2;
    if (c.verdict == Verdict::kUndecided) return 3;
    return 4;
  };
  std::vector<size_t> order(run.claims.size());
  for (size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::stable_sort(order.begin(), order.end(),
                   [&](size_t a, size_t b) { return rank(a) < rank(b); });
  return order;
}

// The drift against the baseline, claim by claim.
std::string drift_section(const DriftReport& drift) {
  std::string s = "<section class=\"drift\">\n<h2>Changes since the baseline</h2>\n";
  if (!drift.any()) {
    return s + fmt::format(
                   "<p>{} claim{} compared with the baseline (seed {}): nothing "
                   "changed.</p>\n</section>\n",
                   drift.compared, drift.compared == 1 ? "" : "s", drift.baseline_seed);
  }
  s += fmt::format("<p>{} of the claims changed; {} compared with the baseline (seed {}).</p>\n",
                   drift.claims.size(), drift.compared, drift.baseline_seed);
  for (const ClaimDrift& d : drift.claims) {
    std::string text = render_claim_drift_text(d);
    size_t end = text.find('\n');
    std::string heading = text.substr(0, end);
    std::string body = end == std::string::npos ? "" : text.substr(end + 1);
    s += "<details open>\n<summary>" + esc(heading) + "</summary>\n";
    if (!body.empty()) s += "<pre>" + esc(body) + "</pre>\n";
    s += "</details>\n";
  }
  return s + "</section>\n";
}

}  // namespace

std::string render_html(const RunResult& run, const DriftReport* drift) {
  std::array<size_t, 4> count{};
  for (const ClaimResult& c : run.claims) ++count[static_cast<size_t>(c.verdict)];
  std::string summary = fmt::format("{} claim{}: {} holds, {} refuted, {} undecided, {} error{}",
                                    run.claims.size(), run.claims.size() == 1 ? "" : "s", count[0],
                                    count[1], count[2], count[3], count[3] == 1 ? "" : "s");

  std::string s = "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n";
  s += "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n";
  s += fmt::format("<title>thetagate report, seed {}</title>\n", run.seed);
  s += std::string("<style>") + kStyle + "</style>\n</head>\n<body>\n";
  s += "<header>\n<h1>thetagate report</h1>\n";
  s += fmt::format(
      "<p>Seed <code>{0}</code>: rerun with <code>{1}</code> to replay this "
      "run. {2}.</p>\n</header>\n",
      run.seed, esc(replay_options(run)), esc(summary));
  if (drift) s += drift_section(*drift);
  s += "<table class=\"summary\">\n<tr><th>verdict</th><th>claim</th><th>claimed</th>"
       "<th>derived</th></tr>\n";
  std::vector<bool> drifted = drifted_claims(run, drift);
  std::vector<size_t> order = reading_order(run, drifted);
  for (size_t i : order) {
    const ClaimResult& c = run.claims[i];
    s += fmt::format(
        "<tr><td>{}</td><td><a href=\"#claim-{}\">{}</a></td><td>{}</td><td>{}</td>"
        "</tr>\n",
        verdict_span(c.verdict), i + 1, esc(c.name), esc(c.claimed.empty() ? "\u2014" : c.claimed),
        esc(c.derived.empty() ? "\u2014" : c.derived));
  }
  s += "</table>\n";
  for (size_t i : order) {
    const ClaimResult& c = run.claims[i];
    s += claim_section(c, i + 1, c.verdict == Verdict::kHolds && !drifted[i]);
  }
  s += "<footer><p>Checked by thetagate " + esc(run.tool_version) +
       (run.started.empty() ? "" : ", started " + esc(run.started)) + ".</p></footer>\n";
  s += "</body>\n</html>\n";
  return s;
}

}  // namespace thetagate::engine
