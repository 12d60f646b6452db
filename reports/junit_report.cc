#include "reports/junit_report.h"

#include <fmt/format.h>

#include <algorithm>
#include <cstdint>

#include "reports/code_text.h"
#include "reports/drift.h"
#include "reports/number_text.h"
#include "reports/text_report.h"
#include "reports/verdict_text.h"
#include "reports/xml_escape.h"

namespace thetagate::engine {

namespace {

std::string suite_name(const ClaimResult& c) { return c.file.empty() ? "(command line)" : c.file; }

// "claims/sort.toml" -> "claims.sort": CI tools split classname at dots into
// package and class, so claims group by folder and file.
std::string class_name(const std::string& file) {
  if (file.empty()) return "command-line";
  std::string path = file.rfind("./", 0) == 0 ? file.substr(2) : file;
  size_t slash = path.find_last_of("/\\");
  size_t dot = path.rfind('.');
  if (dot != std::string::npos && dot > 0 && (slash == std::string::npos || dot > slash + 1)) {
    path.resize(dot);
  }
  for (char& ch : path) {
    if (ch == '/' || ch == '\\') ch = '.';
  }
  return path;
}

std::string attr(const char* name, const std::string& value) {
  return fmt::format(" {}=\"{}\"", name, xml_escape_attribute(value));
}

std::string claim_headline(const ClaimResult& c) {
  std::string s = "claimed " + (c.claimed.empty() ? std::string("(nothing)") : c.claimed);
  s += "; derived " + (c.derived.empty() ? std::string("(nothing)") : c.derived);
  if (!c.method.empty()) s += " (" + c.method + ")";
  return s + "\n";
}

std::string witness_block(const ClaimResult& c) {
  std::string s;
  for (size_t i = 0; i < c.witnesses.size(); ++i) {
    const Witness& w = c.witnesses[i];
    s += fmt::format("witness {}: n = {} ({} side)\n", i + 1, w.n.str(), side_name(w.side));
    if (!w.value.empty()) s += "  T(n) = " + w.value + "\n";
    if (!w.bound.empty()) s += "  bound = " + w.bound + "\n";
    if (!w.margin.empty()) {
      s += std::string(w.side == Side::kUpper ? "  T(n) - bound = " : "  bound - T(n) = ") +
           w.margin + "\n";
    }
    s += "  T(n)/g(n) = " + format_ratio(w.ratio) + "\n";
    if (!w.family.empty()) s += "  family = " + w.family + "\n";
    if (!w.factor.empty()) s += "  ladder c = " + w.factor + "\n";
  }
  return s;
}

std::string outcome_element(const ClaimResult& c, const JunitOptions& options) {
  std::string message = verdict_message(c);
  switch (c.verdict) {
    case Verdict::kHolds:
      return "";
    case Verdict::kRefuted: {
      std::string body = claim_headline(c);
      if (!message.empty()) body += message + "\n";
      body += witness_block(c);
      if (c.code) body += code_link_text(*c.code, "");
      return "      <failure" + attr("message", message) + attr("type", "refuted") + ">" +
             xml_escape_text(body) + "</failure>\n";
    }
    case Verdict::kUndecided: {
      if (!options.undecided_fails) {
        return "      <skipped" + attr("message", message) + "/>\n";
      }
      std::string body = claim_headline(c) + (message.empty() ? "" : message + "\n");
      return "      <failure" + attr("message", message) + attr("type", "undecided") + ">" +
             xml_escape_text(body) + "</failure>\n";
    }
    case Verdict::kError: {
      std::string body = c.error ? format_diagnostic(*c.error) + "\n" : message + "\n";
      return "      <error" + attr("message", message) + attr("type", "input") + ">" +
             xml_escape_text(body) + "</error>\n";
    }
  }
  return "";
}

// The derivation and assumptions, for a reader who opens the test case.
std::string system_out(const ClaimResult& c) {
  std::string s;
  if (c.verdict == Verdict::kHolds) s += claim_headline(c) + "proof: " + proof_name(c) + "\n";
  if (c.code && c.verdict != Verdict::kRefuted) s += code_link_text(*c.code, "");
  for (const std::string& note : c.notes) s += "assumption: " + note + "\n";
  if (!c.note.empty()) s += "note: " + c.note + "\n";
  for (const std::string& step : c.steps) s += "derivation: " + step + "\n";
  for (const std::string& h : c.failed_hypotheses) s += "not applicable: " + h + "\n";
  if (c.sizes_checked > 0) {
    s += fmt::format("checked {} sizes up to {} bits\n", c.sizes_checked, c.largest_bits);
  }
  if (s.empty()) return s;
  return "      <system-out>" + xml_escape_text(s) + "</system-out>\n";
}

// The drift of claim `c` when drift fails the run, else null.
const ClaimDrift* drift_of(const ClaimResult& c, const JunitOptions& options) {
  if (!options.drift_fails) return nullptr;
  for (const ClaimDrift& d : options.drift_fails->claims) {
    if (!d.is_lost() && d.name == c.name && d.file == c.file) return &d;
  }
  return nullptr;
}

// A claim that drifted and would otherwise pass (or be skipped) fails as
// drift; a refuted one keeps its failure and says how it drifted.
std::string drift_element(const ClaimResult& c, const ClaimDrift& d, const JunitOptions& options) {
  std::string text = render_claim_drift_text(d);
  if (c.verdict == Verdict::kRefuted || c.verdict == Verdict::kError ||
      (c.verdict == Verdict::kUndecided && options.undecided_fails)) {
    return "";
  }
  std::string message = "drifted from the baseline";
  if (d.verdict_changed()) {
    message += std::string(": verdict ") + verdict_name(*d.before) + " → " + verdict_name(*d.after);
  } else if (d.is_new()) {
    message += ": a new claim";
  }
  return "      <failure" + attr("message", message) + attr("type", "drift") + ">" +
         xml_escape_text(text) + "</failure>\n";
}

struct Counts {
  size_t tests = 0, failures = 0, errors = 0, skipped = 0;
  void add(const ClaimResult& c, const JunitOptions& options) {
    ++tests;
    bool drifted = drift_of(c, options) != nullptr;
    if (c.verdict == Verdict::kRefuted) ++failures;
    if (c.verdict == Verdict::kError) ++errors;
    if (c.verdict == Verdict::kUndecided) {
      ++(options.undecided_fails || drifted ? failures : skipped);
    }
    if (c.verdict == Verdict::kHolds && drifted) ++failures;
  }
  void add_lost() {
    ++tests;
    ++failures;
  }
  std::string attributes() const {
    return fmt::format(" tests=\"{}\" failures=\"{}\" errors=\"{}\" skipped=\"{}\"", tests,
                       failures, errors, skipped);
  }
};

}  // namespace

std::string render_junit(const RunResult& run, const JunitOptions& options) {
  // Suites in order of first appearance; claims keep their order inside.
  std::vector<std::string> suites;
  for (const ClaimResult& c : run.claims) {
    if (std::find(suites.begin(), suites.end(), suite_name(c)) == suites.end()) {
      suites.push_back(suite_name(c));
    }
  }
  Counts total;
  for (const ClaimResult& c : run.claims) total.add(c, options);
  std::vector<const ClaimDrift*> lost;
  if (options.drift_fails) {
    for (const ClaimDrift& d : options.drift_fails->claims) {
      if (d.is_lost()) lost.push_back(&d);
    }
  }
  for (size_t i = 0; i < lost.size(); ++i) total.add_lost();

  std::string out = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  out += "<testsuites" + attr("name", "thetagate") + total.attributes() + ">\n";
  for (const std::string& suite : suites) {
    Counts counts;
    for (const ClaimResult& c : run.claims) {
      if (suite_name(c) == suite) counts.add(c, options);
    }
    double suite_seconds = 0;
    for (const ClaimResult& c : run.claims) {
      if (suite_name(c) == suite) suite_seconds += c.seconds;
    }
    out += "  <testsuite" + attr("name", suite) + counts.attributes() +
           attr("time", fmt::format("{:.3f}", suite_seconds)) +
           (run.started.empty() ? "" : attr("timestamp", run.started.substr(0, 19))) + ">\n";
    out += "    <properties>\n";
    out +=
        "      <property" + attr("name", "seed") + attr("value", std::to_string(run.seed)) + "/>\n";
    out += "      <property" + attr("name", "thetagate.version") + attr("value", run.tool_version) +
           "/>\n";
    out += "      <property" + attr("name", "thetagate.options") +
           attr("value", replay_options(run)) + "/>\n";
    out += "    </properties>\n";
    for (const ClaimResult& c : run.claims) {
      if (suite_name(c) != suite) continue;
      out += "    <testcase" + attr("name", c.name) + attr("classname", class_name(c.file)) +
             attr("time", fmt::format("{:.3f}", c.seconds));
      if (!c.file.empty()) out += attr("file", c.file) + attr("line", std::to_string(c.line));
      const ClaimDrift* drift = drift_of(c, options);
      std::string outcome = outcome_element(c, options);
      if (drift) {
        std::string as_drift = drift_element(c, *drift, options);
        if (!as_drift.empty()) {
          outcome = as_drift;
        } else {
          // Already failing: the drift goes with the failure's detail.
          size_t close = outcome.rfind("</");
          if (close != std::string::npos) {
            outcome.insert(close, xml_escape_text("drift:\n" + render_claim_drift_text(*drift)));
          }
        }
      }
      std::string inner = outcome + system_out(c);
      if (inner.empty()) {
        out += "/>\n";
      } else {
        out += ">\n" + inner + "    </testcase>\n";
      }
    }
    out += "  </testsuite>\n";
  }
  if (!lost.empty()) {
    // Claims the baseline had and this run has not: failing test cases, so
    // the count of failures matches what made the run fail.
    Counts counts;
    for (size_t i = 0; i < lost.size(); ++i) counts.add_lost();
    out += "  <testsuite" + attr("name", "lost since the baseline") + counts.attributes() + ">\n";
    for (const ClaimDrift* d : lost) {
      out += "    <testcase" + attr("name", d->name) + attr("classname", class_name(d->file)) +
             attr("file", d->file) + attr("line", std::to_string(d->line)) + ">\n";
      out += "      <failure" + attr("message", "lost since the baseline") + attr("type", "drift") +
             ">" + xml_escape_text(render_claim_drift_text(*d)) + "</failure>\n    </testcase>\n";
    }
    out += "  </testsuite>\n";
  }
  out += "</testsuites>\n";
  return out;
}

}  // namespace thetagate::engine
