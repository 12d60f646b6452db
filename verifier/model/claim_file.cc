// Claim files: TOML (toml++) -> claims. Each recurrence and bound string is
// parsed as a SourceText that knows where it sits in the file, so an error
// inside a multi-line recurrence names the file's own line and column.
#include <toml++/toml.h>

#include <algorithm>
#include <cctype>
#include <cstring>
#include <filesystem>
#include <map>

#include "generators/size_family.h"
#include "verifier/evaluation/size_expression.h"
#include "verifier/model/claim.h"
#include "verifier/model/limits.h"
#include "verifier/syntax/input_file.h"
#include "verifier/syntax/spelling.h"

namespace thetagate::engine {

namespace {

const std::vector<std::string> kTopLevelKeys = {"claim"};
const std::vector<std::string> kClaimKeys = {"name",  "recurrence", "bound", "note",
                                             "sizes", "rounding",   "code"};
const std::vector<std::string> kSizeKeys = {"max_bits", "families", "min_n", "effort"};
const std::vector<std::string> kCodeKeys = {"model", "costs", "max_n"};
constexpr int64_t kMaxRunnableN = int64_t{1} << 40;

std::string lower(std::string s) {
  for (char& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

// The allowed key a typo most likely meant, or "" when none is close.
std::string closest_key(const std::string& key, const std::vector<std::string>& allowed) {
  std::string typed = lower(key);
  std::string best;
  size_t best_distance = 0;
  for (const std::string& candidate : allowed) {
    size_t d = edit_distance(typed, candidate);
    size_t prefix = 0;
    while (prefix < typed.size() && prefix < candidate.size() &&
           typed[prefix] == candidate[prefix]) {
      ++prefix;
    }
    bool likely = d <= std::max<size_t>(2, candidate.size() / 3) || prefix >= 4;
    if (likely && (best.empty() || d < best_distance)) {
      best = candidate;
      best_distance = d;
    }
  }
  return best;
}

std::string join(const std::vector<std::string>& words) {
  std::string out;
  for (const std::string& w : words) out += (out.empty() ? "" : ", ") + w;
  return out;
}

std::string unknown_key_hint(const std::string& key, const std::vector<std::string>& allowed) {
  std::string hint;
  std::string guess = closest_key(key, allowed);
  if (!guess.empty()) hint = "did you mean '" + guess + "'? ";
  return hint + "allowed keys: " + join(allowed);
}

std::string type_with_article(toml::node_type type) {
  switch (type) {
    case toml::node_type::string:
      return "a string";
    case toml::node_type::integer:
      return "an integer";
    case toml::node_type::floating_point:
      return "a floating-point number";
    case toml::node_type::boolean:
      return "a boolean";
    case toml::node_type::date:
      return "a date";
    case toml::node_type::time:
      return "a time";
    case toml::node_type::date_time:
      return "a date-time";
    case toml::node_type::array:
      return "an array";
    case toml::node_type::table:
      return "a table";
    default:
      return "nothing";
  }
}

bool before(const toml::source_position& a, const toml::source_position& b) {
  return a.line != b.line ? a.line < b.line : a.column < b.column;
}

// One claim file being read: turns toml++ positions (line, column in code
// points) into byte offsets, and byte offsets into Diagnostics.
class ClaimFileReader {
 public:
  explicit ClaimFileReader(std::shared_ptr<const SourceFile> file) : file_(std::move(file)) {
    whole_.file = file_;
    whole_.text = file_->text;
    line_starts_.push_back(0);
    for (size_t i = 0; i < file_->text.size(); ++i) {
      if (file_->text[i] == '\n') line_starts_.push_back(i + 1);
    }
  }

  std::vector<ClaimEntry> read(const toml::table& root);

 private:
  size_t offset_of(const toml::source_position& p) const;
  Location locate(const toml::source_position& p) const { return whole_.locate(offset_of(p)); }
  [[noreturn]] void fail(size_t offset, std::string message, std::string hint) const {
    fail_at(whole_, offset, std::move(message), std::move(hint));
  }
  [[noreturn]] void fail(const toml::source_position& p, std::string message,
                         std::string hint) const {
    fail(offset_of(p), std::move(message), std::move(hint));
  }
  Diagnostic diagnostic(const toml::source_position& p, std::string message,
                        std::string hint) const;

  SourceText text_of(const toml::node& value, const std::string& decoded) const;
  const std::string& require_string(const toml::table& t, const std::string& key,
                                    const std::string& example) const;
  void check_keys(const toml::table& t, const std::vector<std::string>& allowed,
                  const std::string& where) const;
  ClaimEntry read_claim(const toml::table& t);
  void read_sizes(const toml::node& node, SizeOptions& sizes) const;
  CodeLink read_code(const toml::node& node) const;

  std::shared_ptr<const SourceFile> file_;
  SourceText whole_;  // the whole file, for file-level positions
  std::vector<size_t> line_starts_;
  std::map<std::string, int> first_line_of_name_;
};

size_t ClaimFileReader::offset_of(const toml::source_position& p) const {
  const std::string& text = file_->text;
  if (p.line == 0) return 0;
  if (p.line > line_starts_.size()) return text.size();
  return utf8_advance(text, line_starts_[p.line - 1], static_cast<int>(p.column) - 1);
}

Diagnostic ClaimFileReader::diagnostic(const toml::source_position& p, std::string message,
                                       std::string hint) const {
  size_t offset = offset_of(p);
  return Diagnostic{whole_.locate(offset), std::move(message), std::move(hint),
                    whole_.line_at(offset)};
}

// The decoded string as a SourceText over the whole file. Exact when the
// decoded text is the file's bytes at that place (a CR before a line break
// is allowed: the lexer skips it); otherwise positions map to the opening
// quote.
SourceText ClaimFileReader::text_of(const toml::node& value, const std::string& decoded) const {
  const std::string& raw = file_->text;
  size_t start = offset_of(value.source().begin);
  std::string delimiter = "\"";
  for (const char* d : {"\"\"\"", "'''", "\"", "'"}) {
    if (raw.compare(start, std::strlen(d), d) == 0) {
      delimiter = d;
      break;
    }
  }
  size_t content = start + delimiter.size();
  if (delimiter.size() == 3) {
    // TOML trims a line break right after the opening delimiter.
    if (raw.compare(content, 1, "\n") == 0)
      content += 1;
    else if (raw.compare(content, 2, "\r\n") == 0)
      content += 2;
  }
  size_t r = content;
  size_t d = 0;
  while (d < decoded.size() && r < raw.size()) {
    if (raw[r] == decoded[d]) {
      ++r;
      ++d;
    } else if (raw[r] == '\r' && decoded[d] == '\n' && r + 1 < raw.size() && raw[r + 1] == '\n') {
      ++r;
    } else {
      break;
    }
  }
  SourceText s;
  s.file = file_;
  if (d == decoded.size() && raw.compare(r, delimiter.size(), delimiter) == 0) {
    s.offset = content;
    s.exact = true;
    s.text = raw.substr(content, r - content);
  } else {
    s.offset = start;
    s.exact = false;
    s.text = decoded;
  }
  return s;
}

void ClaimFileReader::check_keys(const toml::table& t, const std::vector<std::string>& allowed,
                                 const std::string& where) const {
  std::vector<const toml::key*> unknown;
  for (auto&& [key, value] : t) {
    if (std::find(allowed.begin(), allowed.end(), key.str()) == allowed.end()) {
      unknown.push_back(&key);
    }
  }
  if (unknown.empty()) return;
  const toml::key* first =
      *std::min_element(unknown.begin(), unknown.end(), [](const toml::key* a, const toml::key* b) {
        return before(a->source().begin, b->source().begin);
      });
  fail(first->source().begin, "unknown key '" + std::string(first->str()) + "' in " + where,
       unknown_key_hint(std::string(first->str()), allowed));
}

const std::string& ClaimFileReader::require_string(const toml::table& t, const std::string& key,
                                                   const std::string& example) const {
  const toml::node* node = t.get(key);
  if (!node) {
    fail(t.source().begin, "the claim has no '" + key + "'", "add " + key + " = " + example);
  }
  const auto* s = node->as_string();
  if (!s) {
    fail(node->source().begin,
         "'" + key + "' must be a string, found " + type_with_article(node->type()),
         "write " + key + " = " + example);
  }
  return s->get();
}

void ClaimFileReader::read_sizes(const toml::node& node, SizeOptions& sizes) const {
  const toml::table* t = node.as_table();
  if (!t) {
    fail(node.source().begin, "'sizes' must be a table, found " + type_with_article(node.type()),
         "write sizes = { max_bits = 2048 }, or a [claim.sizes] table under the claim");
  }
  check_keys(*t, kSizeKeys, "sizes");
  if (const toml::node* bits = t->get("max_bits")) {
    const auto* i = bits->as_integer();
    if (!i) {
      fail(bits->source().begin,
           "'max_bits' must be an integer, found " + type_with_article(bits->type()),
           "write max_bits = 2048");
    }
    if (i->get() < 1 || i->get() > kMaxBitsLimit) {
      fail(bits->source().begin,
           "'max_bits' must be between 1 and " + std::to_string(kMaxBitsLimit) + ", found " +
               std::to_string(i->get()),
           "the default is 4096 bits");
    }
    sizes.max_bits = static_cast<uint64_t>(i->get());
  }
  if (const toml::node* effort = t->get("effort")) {
    const auto* i = effort->as_integer();
    if (!i) {
      fail(effort->source().begin,
           "'effort' must be an integer, found " + type_with_article(effort->type()),
           "write effort = 10: ten times the default search work for this claim");
    }
    if (i->get() < 1 || i->get() > kMaxEffort) {
      fail(effort->source().begin,
           "'effort' must be between 1 and " + std::to_string(kMaxEffort) + ", found " +
               std::to_string(i->get()),
           "the default is 1, about 0.2 s of search per claim");
    }
    sizes.effort = static_cast<uint64_t>(i->get());
  }
  if (const toml::node* families = t->get("families")) {
    const toml::array* a = families->as_array();
    if (!a) {
      fail(families->source().begin,
           "'families' must be an array of strings, found " + type_with_article(families->type()),
           "write families = [\"powers\", \"random\"]");
    }
    for (const toml::node& element : *a) {
      const auto* s = element.as_string();
      if (!s) {
        fail(element.source().begin,
             "'families' must be an array of strings, found " + type_with_article(element.type()) +
                 " in it",
             "write families = [\"powers\", \"random\"]");
      }
      if (!is_size_family(s->get())) {
        std::vector<std::string> names;
        for (const FamilyInfo& f : size_families()) names.push_back(f.name);
        std::string guess = closest_key(s->get(), names);
        fail(element.source().begin, "unknown size family '" + s->get() + "'",
             (guess.empty() ? "" : "did you mean '" + guess + "'? ") + "families: " + join(names));
      }
      sizes.families.push_back(s->get());
    }
  }
  if (const toml::node* min_n = t->get("min_n")) {
    sizes.min_n_where = diagnostic(min_n->source().begin, "", "");
    if (const auto* i = min_n->as_integer()) {
      if (i->get() < 0) {
        fail(min_n->source().begin,
             "'min_n' must not be negative, found " + std::to_string(i->get()),
             "write min_n = 1000 or min_n = \"2^20\"");
      }
      sizes.min_n = BigInt(i->get());
    } else if (const auto* s = min_n->as_string()) {
      SourceText text = text_of(*min_n, s->get());
      try {
        sizes.min_n = evaluate_size(s->get(), whole_.file->name);
      } catch (const InputError& e) {
        // evaluate_size sees only the string; point into the file instead.
        const Diagnostic& inner = e.diagnostic();
        size_t pos = 0;
        if (inner.where.line == 1 && text.text.find('\n') == std::string::npos) {
          pos = utf8_advance(text.text, 0, inner.where.column - 1);
        }
        fail_at(text, pos, "in 'min_n': " + inner.message,
                inner.hint.empty() ? "write min_n = 1000 or min_n = \"2^20\"" : inner.hint);
      }
    } else {
      fail(min_n->source().begin,
           "'min_n' must be an integer or a string such as \"2^20\", found " +
               type_with_article(min_n->type()),
           "write min_n = 1000 or min_n = \"2^20\"");
    }
  }
}

CodeLink ClaimFileReader::read_code(const toml::node& node) const {
  const toml::table* t = node.as_table();
  if (!t) {
    fail(node.source().begin, "'code' must be a table, found " + type_with_article(node.type()),
         "write a [claim.code] table with model = \"upper bound\" and costs = \"costs.txt\"");
  }
  check_keys(*t, kCodeKeys, "code");
  CodeLink code;
  code.where = locate(t->source().begin);
  if (const toml::node* model = t->get("model")) {
    std::string value = model->is_string() ? model->as_string()->get() : "";
    if (value == "upper bound")
      code.model = ModelRelation::kUpperBound;
    else if (value == "exact")
      code.model = ModelRelation::kExact;
    else if (value == "lower bound")
      code.model = ModelRelation::kLowerBound;
    else {
      fail(model->source().begin, "'model' must be \"upper bound\", \"exact\" or \"lower bound\"",
           "\"upper bound\": every counted cost is at most T(n) (a worst-case model)");
    }
  }
  if (const toml::node* costs = t->get("costs")) {
    const auto* s = costs->as_string();
    if (!s || s->get().empty()) {
      fail(costs->source().begin,
           "'costs' must name a file, found " +
               (s ? std::string("an empty string") : type_with_article(costs->type())),
           "write costs = \"costs/stable_sort.txt\" (relative to this claim file)");
    }
    code.costs_as_written = s->get();
    code.claim_folder = std::filesystem::path(file_->name).parent_path().string();
    if (code.claim_folder.empty()) code.claim_folder = ".";
    std::filesystem::path path(s->get());
    if (path.is_relative()) path = std::filesystem::path(code.claim_folder) / path;
    code.costs_path = path.lexically_normal().string();
    code.costs_where = locate(costs->source().begin);
  }
  if (const toml::node* max_n = t->get("max_n")) {
    const auto* i = max_n->as_integer();
    if (!i || i->get() < 1 || i->get() > kMaxRunnableN) {
      fail(max_n->source().begin,
           "'max_n' must be an integer between 1 and 2^40" +
               (i ? ", found " + std::to_string(i->get())
                  : ", found " + type_with_article(max_n->type())),
           "the largest size a runner is given; the default is 65536");
    }
    code.max_n = static_cast<uint64_t>(i->get());
  }
  return code;
}

ClaimEntry ClaimFileReader::read_claim(const toml::table& t) {
  ClaimEntry entry;
  entry.where = locate(t.source().begin);
  try {
    // The name first, so that even a claim with an error is reported under it.
    if (const toml::node* name = t.get("name"); name && name->is_string()) {
      entry.name = name->as_string()->get();
      auto [first, inserted] = first_line_of_name_.emplace(entry.name, entry.where.line);
      if (!inserted) {
        fail(name->source().begin,
             "duplicate claim name '" + entry.name + "' (first used by the claim on line " +
                 std::to_string(first->second) + ")",
             "names identify claims in reports; make each one unique, e.g. add the case measured");
      }
    }
    check_keys(t, kClaimKeys, "[[claim]]");
    Claim claim;
    claim.where = entry.where;
    claim.name = require_string(t, "name", "\"orchard::stable_sort / comparisons\"");
    if (claim.name.find_first_not_of(" \t") == std::string::npos) {
      fail(t.get("name")->source().begin, "the claim name is empty",
           "write name = \"orchard::stable_sort / comparisons\"");
    }
    const std::string& recurrence =
        require_string(t, "recurrence", "\"T(n) = 2T(n/2) + n; T(1) = 1\"");
    const std::string& bound = require_string(t, "bound", "\"Theta(n lg n)\"");
    if (const toml::node* note = t.get("note")) {
      if (!note->is_string()) {
        fail(note->source().begin,
             "'note' must be a string, found " + type_with_article(note->type()),
             "write note = \"what the recurrence models\"");
      }
      claim.note = note->as_string()->get();
    }
    if (const toml::node* sizes = t.get("sizes")) read_sizes(*sizes, claim.sizes);
    if (const toml::node* rounding = t.get("rounding")) {
      std::string value = rounding->is_string() ? rounding->as_string()->get() : "";
      if (value == "floor")
        claim.rounding = Rounding::kFloor;
      else if (value == "ceil")
        claim.rounding = Rounding::kCeil;
      else if (value == "both")
        claim.rounding = Rounding::kBoth;
      else {
        fail(rounding->source().begin, "'rounding' must be \"floor\", \"ceil\" or \"both\"",
             "write rounding = \"both\" to check T(n/2) read as floor and as ceil");
      }
    }
    if (const toml::node* code = t.get("code")) claim.code = read_code(*code);
    claim.recurrence = build_recurrence(text_of(*t.get("recurrence"), recurrence));
    claim.bound = parse_bound(text_of(*t.get("bound"), bound), claim.recurrence->main.name);
    check_bound_fits(*claim.recurrence, claim.bound);
    entry.claim = std::move(claim);
  } catch (const InputError& e) {
    entry.error = e.diagnostic();
  } catch (const InternalError& e) {
    entry.internal_error = e.detail();
  } catch (const std::exception& e) {
    // Not an input error but a bug: kept on this claim (check_entry reports
    // it as an internal error), so the other claims are still checked.
    entry.internal_error = e.what();
  }
  return entry;
}

std::vector<ClaimEntry> ClaimFileReader::read(const toml::table& root) {
  std::vector<ClaimEntry> entries;
  for (auto&& [key, value] : root) {
    if (key.str() == "claim") continue;
    ClaimEntry entry;
    entry.where = locate(key.source().begin);
    std::string hint = unknown_key_hint(std::string(key.str()), kTopLevelKeys);
    if (std::find(kClaimKeys.begin(), kClaimKeys.end(), key.str()) != kClaimKeys.end()) {
      hint = "'" + std::string(key.str()) + "' belongs to a claim: put it below a [[claim]] header";
    }
    entry.error =
        diagnostic(key.source().begin, "unknown top-level key '" + std::string(key.str()) + "'",
                   hint + "; a claim file holds [[claim]] tables");
    entries.push_back(std::move(entry));
  }
  if (const toml::node* claims = root.get("claim")) {
    const toml::array* list = claims->as_array();
    if (!list || !list->is_array_of_tables()) {
      ClaimEntry entry;
      entry.where = locate(claims->source().begin);
      entry.error = diagnostic(
          claims->source().begin,
          "'claim' must be an array of tables, found " + type_with_article(claims->type()),
          "start each claim with a [[claim]] header (two brackets)");
      entries.push_back(std::move(entry));
    } else {
      for (const toml::node& element : *list) entries.push_back(read_claim(*element.as_table()));
    }
  }
  if (entries.empty()) {
    ClaimEntry entry;
    entry.where = whole_.locate(0);
    entry.error = Diagnostic{entry.where, "the file holds no claims",
                             "start a claim with [[claim]], then name, recurrence and bound",
                             whole_.line_at(0)};
    entries.push_back(std::move(entry));
  }
  std::stable_sort(entries.begin(), entries.end(), [](const ClaimEntry& a, const ClaimEntry& b) {
    return a.where.line != b.where.line ? a.where.line < b.where.line
                                        : a.where.column < b.where.column;
  });
  return entries;
}

// toml++ says "Error while parsing key-value pair: expected value, saw '\n'";
// keep the part after the colon, and add a hint for the usual slips.
Diagnostic toml_error(const toml::parse_error& e, const SourceFile& file) {
  std::string detail(e.description());
  const std::string prefix = "Error while parsing ";
  if (detail.rfind(prefix, 0) == 0) {
    size_t colon = detail.find(": ");
    if (colon != std::string::npos) detail = detail.substr(colon + 2);
  }
  std::string hint =
      "claim files are TOML: key = \"string\" on one line, a multi-line recurrence "
      "in \"\"\"...\"\"\"";
  if (detail.find("control characters") != std::string::npos) {
    hint = "a \"...\" string ends on its line; write a multi-line recurrence in \"\"\"...\"\"\"";
  } else if (detail.find("redefine") != std::string::npos) {
    hint = "each key appears once per claim; start the next claim with [[claim]]";
  }
  Diagnostic d;
  d.where.file = file.name;
  d.where.line = std::max<int>(1, static_cast<int>(e.source().begin.line));
  d.where.column = std::max<int>(1, static_cast<int>(e.source().begin.column));
  d.message = "not valid TOML: " + detail;
  d.hint = hint;
  size_t start = 0;
  for (int line = 1; line < d.where.line && start != std::string::npos; ++line) {
    start = file.text.find('\n', start);
    if (start != std::string::npos) ++start;
  }
  if (start != std::string::npos) {
    size_t end = std::min(file.text.find('\n', start), file.text.size());
    d.source_line = file.text.substr(start, end - start);
    if (!d.source_line.empty() && d.source_line.back() == '\r') d.source_line.pop_back();
  }
  return d;
}

}  // namespace

std::vector<ClaimEntry> load_claim_text(const std::string& text, const std::string& display_name) {
  auto file = std::make_shared<const SourceFile>(SourceFile{display_name, text});
  toml::table root;
  try {
    SourceText whole;
    whole.file = file;
    whole.text = file->text;
    if (text.size() > kMaxClaimFileBytes) {
      fail_at(whole, 0,
              "the claim file is too large: " + std::to_string(text.size()) +
                  " bytes, the limit is " + std::to_string(kMaxClaimFileBytes >> 20) + " MiB",
              "split it into several files");
    }
    check_toml_limits(whole);
    root = toml::parse(file->text, std::string_view(display_name));
  } catch (const InputError& e) {
    ClaimEntry entry;
    entry.error = e.diagnostic();
    entry.where = entry.error->where;
    return {entry};
  } catch (const toml::parse_error& e) {
    ClaimEntry entry;
    entry.error = toml_error(e, *file);
    entry.where = entry.error->where;
    return {entry};
  }
  return ClaimFileReader(file).read(root);
}

std::vector<ClaimEntry> load_claim_file(const std::string& path) {
  std::string text;
  try {
    text =
        read_input_file(path, kMaxClaimFileBytes, "claim file",
                        "check the path; claim files are TOML files such as claims/sorting.toml");
  } catch (const InputError& e) {
    ClaimEntry entry;
    entry.error = e.diagnostic();
    entry.where = entry.error->where;
    return {entry};
  }
  return load_claim_text(text, path);
}

const std::vector<std::string>& claim_keys() { return kClaimKeys; }
const std::vector<std::string>& size_keys() { return kSizeKeys; }
const std::vector<std::string>& code_keys() { return kCodeKeys; }

const char* relation_name(ModelRelation r) {
  switch (r) {
    case ModelRelation::kUpperBound:
      return "upper bound";
    case ModelRelation::kExact:
      return "exact";
    case ModelRelation::kLowerBound:
      return "lower bound";
  }
  return "?";
}

bool relation_broken(ModelRelation r, int sign) {
  switch (r) {
    case ModelRelation::kUpperBound:
      return sign > 0;
    case ModelRelation::kExact:
      return sign != 0;
    case ModelRelation::kLowerBound:
      return sign < 0;
  }
  return false;
}

const char* rounding_name(Rounding r) {
  switch (r) {
    case Rounding::kFloor:
      return "floor";
    case Rounding::kCeil:
      return "ceil";
    case Rounding::kBoth:
      return "both";
  }
  return "?";
}

}  // namespace thetagate::engine
