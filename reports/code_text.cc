#include "reports/code_text.h"

#include <fmt/format.h>

#include <algorithm>
#include <vector>

namespace thetagate::engine {

const char* relation_phrase(ModelRelation relation) {
  switch (relation) {
    case ModelRelation::kExact:
      return "exact";
    case ModelRelation::kUpperBound:
      return "an upper bound";
    case ModelRelation::kLowerBound:
      return "a lower bound";
  }
  return "?";
}

namespace {

const char* relation_sign(int sign) { return sign < 0 ? "<" : sign > 0 ? ">" : "="; }

// Long decimals shortened for a table cell.
std::string cell(const std::string& s) {
  if (s.size() <= 24) return s;
  return s.substr(0, 10) + "…" + s.substr(s.size() - 6) + " (" + std::to_string(s.size()) +
         " digits)";
}

std::vector<size_t> spread(size_t rows, size_t max_rows) {
  std::vector<size_t> picked;
  if (rows <= max_rows || max_rows < 2) {
    for (size_t i = 0; i < std::min(rows, std::max<size_t>(max_rows, rows)); ++i)
      picked.push_back(i);
    return picked;
  }
  for (size_t i = 0; i < max_rows; ++i) {
    size_t index = (i * (rows - 1) + (max_rows - 1) / 2) / (max_rows - 1);
    if (picked.empty() || picked.back() != index) picked.push_back(index);
  }
  return picked;
}

int violation_sign(const CodeResult& code, const CostViolation& v) {
  for (const CostRow& r : code.rows)
    if (r.n == v.n && r.cost == v.cost) return r.sign;
  // Not the row's extreme: the relation says which side it broke.
  return code.relation == ModelRelation::kLowerBound ? -1 : 1;
}

}  // namespace

std::string violation_text(const CodeResult& code, const CostViolation& v) {
  std::string s = "n = " + v.n.str();
  if (!v.file.empty()) s += " (" + v.file + ":" + std::to_string(v.line) + ")";
  s += ": counted cost " + v.cost + " " + relation_sign(violation_sign(code, v)) +
       " T(n) = " + v.model;
  return s;
}

std::string code_headline(const CodeResult& code) {
  size_t sizes = code.rows.size();
  return fmt::format("code -> model: {} ({} measurement{} at {} size{}), the model is {}",
                     code.source, code.measurements, code.measurements == 1 ? "" : "s", sizes,
                     sizes == 1 ? "" : "s", relation_phrase(code.relation));
}

std::string family_list(const std::vector<std::string>& names) {
  std::string s;
  for (const std::string& n : names) s += (s.empty() ? "" : ", ") + n;
  return s.empty() ? std::string("none") : s;
}

std::string code_coverage(const CodeResult& code) {
  if (code.families_measured.empty() && code.families_missed.empty()) return "";
  return "size families measured: " + family_list(code.families_measured) +
         (code.families_missed.empty() ? "" : "; missed: " + family_list(code.families_missed));
}

std::string code_link_text(const CodeResult& code, const std::string& indent, size_t max_violations,
                           size_t max_rows) {
  std::string out;
  size_t sizes = code.rows.size();
  out += indent + code_headline(code) + "\n";
  std::string coverage = code_coverage(code);
  if (!coverage.empty()) out += indent + "  " + coverage + "\n";
  if (!code.violations.empty()) {
    out += indent + (code.violations.size() == 1 ? "  violation:\n" : "  violations:\n");
    size_t shown = std::min(code.violations.size(), max_violations);
    for (size_t i = 0; i < shown; ++i) {
      const CostViolation& v = code.violations[i];
      out += indent + "    " + violation_text(code, v) + "\n";
      if (!v.input.empty()) out += indent + "      input:  " + v.input + "\n";
      if (!v.replay.empty()) out += indent + "      replay: " + v.replay + "\n";
    }
    if (shown < code.violations.size()) {
      out += fmt::format("{}    … and {} more\n", indent, code.violations.size() - shown);
    }
  }
  if (sizes == 0) return out;
  const char* extreme = code.relation == ModelRelation::kUpperBound   ? "largest counted cost"
                        : code.relation == ModelRelation::kLowerBound ? "smallest counted cost"
                                                                      : "counted cost";
  std::vector<size_t> rows = spread(sizes, max_rows);
  out += fmt::format(
      "{}  {} against T(n){}:\n", indent, extreme,
      rows.size() < sizes ? fmt::format(" ({} of {} sizes)", rows.size(), sizes) : std::string());
  out +=
      fmt::format("{}    {:>12}  {:>14}    {:<14}  {:>6}\n", indent, "n", "cost", "T(n)", "runs");
  for (size_t i : rows) {
    const CostRow& r = code.rows[i];
    out += fmt::format("{}    {:>12}  {:>14} {} {:<14}  {:>6}\n", indent, cell(r.n.str()),
                       cell(r.cost), relation_sign(r.sign), cell(r.model), r.runs);
  }
  return out;
}

}  // namespace thetagate::engine
