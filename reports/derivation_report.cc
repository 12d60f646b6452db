#include "reports/derivation_report.h"

#include <fmt/format.h>

#include <nlohmann/json.hpp>

#include "verifier/syntax/terminal_text.h"

namespace thetagate::engine {

std::string render_derivation_text(const Derivation& d) {
  std::string out;
  if (d.growth) {
    out += fmt::format("T(n) = Θ({})  by {}\n", d.derived, d.method);
  } else if (d.one_sided()) {
    std::string bound = d.upper ? "O(" + to_string(*d.upper) + ")" : "";
    if (d.lower) bound += (bound.empty() ? "Ω(" : " and Ω(") + to_string(*d.lower) + ")";
    out += fmt::format("T(n) = {}  by {}\n", bound, d.method);
  } else {
    out += "no theorem applies: the class is not derived\n";
  }
  if (!d.steps.empty()) {
    out += "\n";
    for (size_t i = 0; i < d.steps.size(); ++i) {
      out += fmt::format("  {:>2}. {}\n", i + 1, d.steps[i]);
    }
  }
  if (!d.failed_hypotheses.empty()) {
    out += d.growth ? "\nother theorems:\n" : "\nwhy not:\n";
    for (const std::string& r : d.failed_hypotheses) out += "  - " + r + "\n";
  }
  if (!d.notes.empty()) {
    out += "\nassumptions:\n";
    for (const std::string& n : d.notes) out += "  - " + n + "\n";
  }
  return out;
}

std::string render_derivation_json(const Derivation& d) {
  nlohmann::ordered_json j;
  j["derived"] = d.derived;
  j["method"] = d.method;
  j["steps"] = d.steps;
  // One-sided bounds, present only when no Θ class was derived.
  if (d.one_sided()) {
    j["upper"] = d.upper ? to_string(*d.upper) : "";
    j["lower"] = d.lower ? to_string(*d.lower) : "";
  }
  j["failed_hypotheses"] = d.failed_hypotheses;
  j["notes"] = d.notes;
  return json_escape_controls(j.dump(2, ' ', false, nlohmann::json::error_handler_t::replace)) +
         "\n";
}

}  // namespace thetagate::engine
