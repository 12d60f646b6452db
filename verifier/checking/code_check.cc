#include "verifier/checking/code_check.h"

#include <algorithm>
#include <cctype>
#include <filesystem>
#include <string_view>

#include "generators/size_family.h"
#include "verifier/checking/checker.h"
#include "verifier/syntax/input_file.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {

CostModel::CostModel(const Claim& claim, ModelRelation relation, Budget budget)
    : relation_(relation) {
  Rounding rounding = claim.rounding.value_or(Rounding::kFloor);
  bool unrounded = has_unrounded_calls(*claim.recurrence);
  if (rounding != Rounding::kCeil || !unrounded) {
    readings_.push_back(std::make_unique<Evaluator>(claim.recurrence, budget));
  }
  if (unrounded && rounding != Rounding::kFloor) {
    readings_.push_back(
        std::make_unique<Evaluator>(read_quotients_as_ceilings(*claim.recurrence), budget));
  }
  model_source_ = SourceText::whole("<model>", claim.recurrence->main.name + "(n)");
  model_expr_ = parse_expression(model_source_);
}

CostModel::~CostModel() = default;

int CostModel::compare(const BigInt& n, const BigInt& cost) {
  SourceText cost_source = SourceText::whole("<cost>", cost.str());
  ExprPtr cost_expr = parse_expression(cost_source);
  int toward = 0;
  bool first = true;
  for (auto& evaluator : readings_) {
    int sign = evaluator->compare_at(*cost_expr, cost_source, *model_expr_, model_source_, n);
    // The reading that breaks the relation wins; else the first.
    if (first || violates(sign)) toward = sign;
    if (violates(sign)) break;
    first = false;
  }
  return toward;
}

std::string CostModel::model_text(const BigInt& n) { return readings_.front()->value_at(n).str(); }

std::optional<BigInt> CostModel::allowed_max(const BigInt& n) {
  if (relation_ == ModelRelation::kLowerBound) return std::nullopt;
  std::optional<BigInt> least;
  for (auto& evaluator : readings_) {
    Value v = evaluator->value_at(n);
    Value top = v.is_exact() ? v : Value(v.as_interval().upper());
    BigInt floor = floor_value(top).integer();
    if (floor < 0) floor = 0;
    if (!least || floor < *least) least = floor;
  }
  return least;
}

void CostModel::start_query() {
  for (auto& evaluator : readings_) evaluator->start_query();
}

bool CostModel::violates(int sign) const { return relation_broken(relation_, sign); }

void CostRows::add(const BigInt& n, const BigInt& cost, const std::string& model, int sign,
                   const std::string& from) {
  auto it = entries_.find(n);
  if (it == entries_.end()) {
    Entry e;
    e.row.n = n;
    e.row.cost = cost.str();
    e.row.model = model;
    e.row.sign = sign;
    e.row.runs = 1;
    e.row.from = from;
    e.cost = cost;
    entries_.emplace(n, std::move(e));
    return;
  }
  Entry& entry = it->second;
  ++entry.row.runs;
  bool further = false;
  switch (relation_) {
    case ModelRelation::kUpperBound:
      further = cost > entry.cost;
      break;
    case ModelRelation::kLowerBound:
      further = cost < entry.cost;
      break;
    case ModelRelation::kExact:
      further = entry.row.sign == 0 && sign != 0;
      break;
  }
  if (!further) return;
  entry.row.cost = cost.str();
  entry.row.sign = sign;
  entry.row.from = from;
  entry.cost = cost;
}

std::vector<CostRow> CostRows::rows() const {
  std::vector<CostRow> out;
  out.reserve(entries_.size());
  for (const auto& [n, e] : entries_) out.push_back(e.row);
  return out;
}

namespace {

constexpr size_t kMaxViolationsKept = 20;
// A million measurements of 2^64-sized costs fit in 64 MiB.
constexpr size_t kMaxCostsFileBytes = size_t{64} << 20;
constexpr size_t kMaxDigits = 4000;  // per field: larger is surely a typo

struct Field {
  size_t begin = 0;
  size_t end = 0;
};

// What a costs-file error may show of the file: the line when it is short
// (a typo in "1024 9e3" is plain to see), nothing when it is long. A claim
// file can name a file that was never meant as costs (a credentials file in
// the same tree); its errors must not publish it in every report.
constexpr size_t kMaxShownLineBytes = 40;
constexpr size_t kMaxShownWordBytes = 12;

[[noreturn]] void fail_line(const SourceText& file, size_t pos, std::string message,
                            std::string hint) {
  Diagnostic d;
  d.where = file.locate(pos);
  d.message = std::move(message);
  d.hint = std::move(hint);
  std::string line = file.line_at(pos);
  if (line.size() <= kMaxShownLineBytes) d.source_line = std::move(line);
  throw InputError(std::move(d));
}

// A field of a costs file as a message may quote it: short, escaped.
std::string quoted_field(const std::string& word) {
  if (word.size() > kMaxShownWordBytes) {
    return "a " + std::to_string(word.size()) + "-byte word";
  }
  return "'" + escape_controls(word) + "'";
}

[[noreturn]] void fail_costs_key(const CodeLink& link, std::string message, std::string hint) {
  Diagnostic d;
  d.where = link.costs_where;
  d.message = std::move(message);
  d.hint = std::move(hint);
  throw InputError(std::move(d));
}

const char* const kWidenHint =
    "name a file under the claim file's folder (relative to the claim file, e.g. "
    "costs = \"costs/stable_sort.txt\"), or let the run read another folder with "
    "--costs-root DIR";

// Whether `path` lies in the tree under `root` (both absolute and normal).
bool inside(const std::filesystem::path& path, const std::filesystem::path& root) {
  std::filesystem::path relative = path.lexically_relative(root);
  return !relative.empty() && *relative.begin() != "..";
}

}  // namespace

std::string confined_costs_path(const CodeLink& link, const std::string& widened_root) {
  namespace fs = std::filesystem;
  const std::string& written = link.costs_as_written;
  if (!is_plain_text(written)) {
    fail_costs_key(link,
                   "the costs path '" + escape_controls(written) +
                       "' holds a control character (a NUL would end the path early)",
                   "write the path with printable characters only");
  }
  fs::path path(written);
  if (path.is_absolute() && widened_root.empty()) {
    fail_costs_key(link,
                   "the costs path '" + written +
                       "' is absolute; a claim file may only name files in its own folder tree",
                   kWidenHint);
  }
  std::error_code ec;
  std::vector<fs::path> roots = {fs::absolute(link.claim_folder, ec).lexically_normal()};
  if (!widened_root.empty()) roots.push_back(fs::absolute(widened_root, ec).lexically_normal());
  fs::path full = (path.is_absolute() ? path : roots.front() / path).lexically_normal();
  auto within_a_root = [&](const fs::path& p, bool resolve_roots) {
    for (const fs::path& root : roots) {
      std::error_code root_ec;
      fs::path r = resolve_roots ? fs::canonical(root, root_ec) : root;
      if (!root_ec && inside(p, r)) return true;
    }
    return false;
  };
  if (!within_a_root(full, /*resolve_roots=*/false)) {
    fail_costs_key(link,
                   "the costs path '" + written +
                       "' leaves the claim file's folder; a claim file may only name files in "
                       "its own folder tree",
                   kWidenHint);
  }
  // Symbolic links: the file they lead to must be inside too, and that file
  // (not the link, which could be swapped meanwhile) is the one read.
  fs::path resolved = fs::canonical(full, ec);
  if (ec) return full.string();  // missing: read_input_file says so at the costs key
  if (!within_a_root(resolved, /*resolve_roots=*/true)) {
    fail_costs_key(link,
                   "the costs path '" + written +
                       "' leads, through a symbolic link, out of the claim file's folder; a "
                       "claim file may only name files in its own folder tree",
                   kWidenHint);
  }
  return resolved.string();
}

CodeResult check_costs_file(const Claim& claim, const std::string& widened_root,
                            std::optional<double> clock_limit) {
  const CodeLink& link = *claim.code;
  std::string path = confined_costs_path(link, widened_root);
  // A regular file under a cap (a FIFO or a device would block or grow without
  // end); a file that cannot be read is an error at the claim's `costs` key.
  std::string bytes;
  try {
    bytes = read_input_file(path, kMaxCostsFileBytes, "costs file",
                            "'costs' is relative to the claim file's folder; the file "
                            "holds lines \"size cost\"");
  } catch (const InputError& e) {
    Diagnostic d = e.diagnostic();
    d.where = link.costs_where;
    d.source_line.clear();
    // Name the file as the claim file does, not by its resolved path.
    for (size_t at = d.message.find(path); at != std::string::npos && path != link.costs_path;
         at = d.message.find(path, at + link.costs_path.size())) {
      d.message.replace(at, path.size(), link.costs_path);
    }
    if (d.message.find(link.costs_path) == std::string::npos) {
      d.message += " ('" + link.costs_path + "')";
    }
    throw InputError(d);
  }
  return check_costs_text(claim, std::move(bytes), clock_limit);
}

namespace {

// Which size families the measured sizes reach (by the shapes of
// generators/size_family.h, in the recurrence's bases), and which
// adversarial ones they miss: a sort measured only at powers of two never
// meets an odd half.
void record_coverage(const Claim& claim, CodeResult& result) {
  std::vector<BigInt> divisors = recurrence_divisors(*claim.recurrence);
  std::vector<std::string> hit;
  for (const CostRow& row : result.rows) {
    std::string f = shape_family_of(row.n, divisors);
    if (!f.empty() && std::find(hit.begin(), hit.end(), f) == hit.end()) hit.push_back(f);
  }
  for (const FamilyInfo& f : size_families()) {
    if (std::find(hit.begin(), hit.end(), f.name) != hit.end())
      result.families_measured.push_back(f.name);
  }
  for (const std::string& f : adversarial_families()) {
    if (std::find(hit.begin(), hit.end(), f) == hit.end()) result.families_missed.push_back(f);
  }
}

}  // namespace

CodeResult check_costs_text(const Claim& claim, std::string bytes,
                            std::optional<double> clock_limit) {
  const CodeLink& link = *claim.code;
  SourceText file = SourceText::whole(link.costs_path, std::move(bytes));
  const std::string& text = file.text;
  const std::string kHint = "each line holds a size and its counted cost: \"1024 9217\"";

  CodeResult result;
  result.relation = link.model;
  result.source = link.costs_as_written;
  Budget budget;
  budget.max_seconds = 600;  // a long file is slow, not stuck: steps still bound each size
  if (clock_limit) budget.max_seconds = *clock_limit;
  CostModel model(claim, link.model, budget);
  CostRows rows(link.model);
  size_t line_start = 0;
  int line_number = 0;
  while (line_start < text.size()) {
    ++line_number;
    size_t line_end = text.find('\n', line_start);
    if (line_end == std::string::npos) line_end = text.size();
    size_t content_end = line_end;
    if (content_end > line_start && text[content_end - 1] == '\r') --content_end;
    // A comment ends the line's content; look for it within the line only
    // (a search to the end of the file for every line was quadratic).
    size_t hash = std::string_view(text).substr(line_start, content_end - line_start).find('#');
    if (hash != std::string_view::npos) content_end = line_start + hash;
    // Fields are separated by spaces, tabs, or one comma (a CSV export:
    // "1024,9217" or "1024, 9217").
    std::vector<Field> fields;
    size_t i = line_start;
    auto blank = [&](size_t k) { return text[k] == ' ' || text[k] == '\t'; };
    bool after_comma = false;
    while (i < content_end) {
      while (i < content_end && blank(i)) ++i;
      if (i >= content_end) break;
      if (text[i] == ',' && !fields.empty() && !after_comma) {
        after_comma = true;
        ++i;
        continue;
      }
      size_t begin = i;
      while (i < content_end && !blank(i) && text[i] != ',') ++i;
      if (i == begin) ++i;  // a stray comma: a field of its own, reported below
      fields.push_back({begin, i});
      after_comma = false;
    }
    if (!fields.empty()) {
      if (fields.size() == 1) {
        fail_line(file, fields[0].end, "a size without a cost", kHint);
      }
      if (fields.size() > 2) {
        fail_line(file, fields[2].begin, "more than two fields on a line",
                  kHint +
                      " (or \"1024,9217\"); no thousands separators; comments start "
                      "with '#'");
      }
      BigInt values[2];
      for (int f = 0; f < 2; ++f) {
        const char* what = f == 0 ? "size" : "cost";
        std::string word = text.substr(fields[f].begin, fields[f].end - fields[f].begin);
        size_t bad = word.find_first_not_of("0123456789");
        if (bad != std::string::npos) {
          bool numeric = std::isdigit(static_cast<unsigned char>(word[0])) &&
                         word.find_first_of(".eE") != std::string::npos;
          // A first line of short words is a spreadsheet's column header.
          bool header = result.measurements == 0 && word.size() <= kMaxShownWordBytes &&
                        std::isalpha(static_cast<unsigned char>(word[0])) != 0;
          std::string hint = word[0] == '-' ? std::string("a ") + what + " is never negative"
                             : numeric      ? std::string("write the ") + what +
                                             " as a whole number in decimal digits (no 1e6, no 2.5)"
                             : header ? "a header line? start it with '#' to make it a comment: "
                                        "\"# size cost\""
                                      : kHint;
          fail_line(file, fields[f].begin + bad,
                    std::string("the ") + what + " must be a non-negative whole number, found " +
                        quoted_field(word),
                    hint);
        }
        if (word.size() > kMaxDigits) {
          fail_line(file, fields[f].begin,
                    std::string("the ") + what + " has " + std::to_string(word.size()) +
                        " digits; at most " + std::to_string(kMaxDigits) + " are read",
                    kHint);
        }
        values[f] = decimal_integer(word);
      }
      const BigInt& n = values[0];
      const BigInt& cost = values[1];
      int sign = 0;
      std::string model_text;
      try {
        sign = model.compare(n, cost);
        model_text = model.model_text(n);
      } catch (const InputError& e) {
        fail_line(file, fields[0].begin,
                  "the model has no value at n = " + n.str() + ": " + e.diagnostic().message,
                  "measure only sizes the recurrence defines (see its base cases)");
      }
      std::string from = link.costs_as_written + ":" + std::to_string(line_number);
      rows.add(n, cost, model_text, sign, from);
      ++result.measurements;
      if (model.violates(sign) && result.violations.size() < kMaxViolationsKept) {
        CostViolation v;
        v.n = n;
        v.cost = cost.str();
        v.model = model_text;
        v.file = link.costs_path;
        v.line = line_number;
        result.violations.push_back(std::move(v));
      }
    }
    line_start = line_end + 1;
  }
  if (result.measurements == 0) {
    Diagnostic d;
    d.where = link.costs_where;
    d.message = "the costs file '" + link.costs_path + "' holds no measurements";
    d.hint = kHint;
    throw InputError(d);
  }
  result.rows = rows.rows();
  record_coverage(claim, result);
  return result;
}

namespace {}  // namespace

}  // namespace thetagate::engine
