#include "verifier/checking/code_check.h"

#include <algorithm>
#include <cctype>

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
  auto it = std::lower_bound(entries_.begin(), entries_.end(), n,
                             [](const Entry& e, const BigInt& m) { return e.row.n < m; });
  if (it == entries_.end() || it->row.n != n) {
    Entry e;
    e.row.n = n;
    e.row.cost = cost.str();
    e.row.model = model;
    e.row.sign = sign;
    e.row.runs = 1;
    e.row.from = from;
    e.cost = cost;
    entries_.insert(it, std::move(e));
    return;
  }
  ++it->row.runs;
  bool further = false;
  switch (relation_) {
    case ModelRelation::kUpperBound:
      further = cost > it->cost;
      break;
    case ModelRelation::kLowerBound:
      further = cost < it->cost;
      break;
    case ModelRelation::kExact:
      further = it->row.sign == 0 && sign != 0;
      break;
  }
  if (!further) return;
  it->row.cost = cost.str();
  it->row.sign = sign;
  it->row.from = from;
  it->cost = cost;
}

std::vector<CostRow> CostRows::rows() const {
  std::vector<CostRow> out;
  out.reserve(entries_.size());
  for (const Entry& e : entries_) out.push_back(e.row);
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

[[noreturn]] void fail_line(const SourceText& file, size_t pos, std::string message,
                            std::string hint) {
  fail_at(file, pos, std::move(message), std::move(hint));
}

}  // namespace

CodeResult check_costs_file(const Claim& claim) {
  const CodeLink& link = *claim.code;
  // A regular file under a cap (a FIFO or a device would block or grow without
  // end); a file that cannot be read is an error at the claim's `costs` key.
  std::string bytes;
  try {
    bytes = read_input_file(link.costs_path, kMaxCostsFileBytes, "costs file",
                            "'costs' is relative to the claim file's folder; the file "
                            "holds lines \"size cost\"");
  } catch (const InputError& e) {
    Diagnostic d = e.diagnostic();
    d.where = link.costs_where;
    d.source_line.clear();
    if (d.message.find(link.costs_path) == std::string::npos) {
      d.message += " ('" + link.costs_path + "')";
    }
    throw InputError(d);
  }
  SourceText file = SourceText::whole(link.costs_path, std::move(bytes));
  const std::string& text = file.text;
  const std::string kHint = "each line holds a size and its counted cost: \"1024 9217\"";

  CodeResult result;
  result.relation = relation_name(link.model);
  result.source = link.costs_as_written;
  Budget budget;
  budget.max_seconds = 600;  // a long file is slow, not stuck: steps still bound each size
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
    size_t hash = text.find('#', line_start);
    if (hash < content_end) content_end = hash;
    std::vector<Field> fields;
    size_t i = line_start;
    while (i < content_end) {
      while (i < content_end && (text[i] == ' ' || text[i] == '\t')) ++i;
      if (i >= content_end) break;
      size_t begin = i;
      while (i < content_end && text[i] != ' ' && text[i] != '\t') ++i;
      fields.push_back({begin, i});
    }
    if (!fields.empty()) {
      if (fields.size() == 1) {
        fail_line(file, fields[0].end, "a size without a cost", kHint);
      }
      if (fields.size() > 2) {
        fail_line(file, fields[2].begin, "more than two fields on a line",
                  kHint + "; comments start with '#'");
      }
      BigInt values[2];
      for (int f = 0; f < 2; ++f) {
        const char* what = f == 0 ? "size" : "cost";
        std::string word = text.substr(fields[f].begin, fields[f].end - fields[f].begin);
        size_t bad = word.find_first_not_of("0123456789");
        if (bad != std::string::npos) {
          bool numeric = std::isdigit(static_cast<unsigned char>(word[0])) &&
                         word.find_first_of(".eE") != std::string::npos;
          std::string hint = word[0] == '-' ? std::string("a ") + what + " is never negative"
                             : numeric      ? std::string("write the ") + what +
                                             " as a whole number in decimal digits (no 1e6, no 2.5)"
                                       : kHint;
          fail_line(file, fields[f].begin + bad,
                    std::string("the ") + what + " must be a non-negative whole number, found '" +
                        word + "'",
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
  return result;
}

namespace {}  // namespace

void apply_code_result(ClaimResult& result, CodeResult code) {
  if (!code.violations.empty()) {
    code.model_verdict = result.verdict;
    code.model_basis = result.basis;
    result.verdict = Verdict::kRefuted;
    result.basis = VerdictBasis{};
    result.basis.kind = BasisKind::kCodeBreaksModel;
  }
  result.code = std::move(code);
}

}  // namespace thetagate::engine
