#include "reports/baseline.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <nlohmann/json.hpp>
#include <optional>
#include <string_view>

#include "reports/json_report.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {

namespace {

using Json = nlohmann::json;

const char* const kHint = "a baseline is a report written by `thetagate check --format json`";

// Finds the byte offset where the value at a path ("claims[2].band[0].low")
// starts. nlohmann::json keeps no positions, so errors, which are rare, scan
// the text once more. REQUIRES: the text is valid JSON.
class PathFinder {
 public:
  PathFinder(const std::string& text, const std::string& target) : text_(text), target_(target) {}

  std::optional<size_t> find() {
    value("", 0);
    return found_;
  }

 private:
  void skip_space() {
    while (pos_ < text_.size() && (text_[pos_] == ' ' || text_[pos_] == '\n' ||
                                   text_[pos_] == '\t' || text_[pos_] == '\r')) {
      ++pos_;
    }
  }

  // The raw text between the quotes; escapes are kept as written, which is
  // enough for our own ASCII keys.
  std::string string_token() {
    size_t start = ++pos_;
    while (pos_ < text_.size() && text_[pos_] != '"') pos_ += text_[pos_] == '\\' ? 2 : 1;
    std::string s = text_.substr(start, std::min(pos_, text_.size()) - start);
    ++pos_;
    return s;
  }

  // Returns false to stop the scan (found, or the text ended).
  bool value(const std::string& path, int depth) {
    skip_space();
    if (pos_ >= text_.size() || depth > 200) return false;
    if (path == target_) {
      found_ = pos_;
      return false;
    }
    char c = text_[pos_];
    if (c == '{' || c == '[') {
      ++pos_;
      char close = c == '{' ? '}' : ']';
      for (size_t index = 0;; ++index) {
        skip_space();
        if (pos_ >= text_.size()) return false;
        if (text_[pos_] == close) break;
        std::string child;
        if (c == '{') {
          std::string key = string_token();
          skip_space();
          ++pos_;  // ':'
          child = path.empty() ? key : path + "." + key;
        } else {
          child = path + "[" + std::to_string(index) + "]";
        }
        if (!value(child, depth + 1)) return false;
        skip_space();
        if (pos_ < text_.size() && text_[pos_] == ',') ++pos_;
      }
      ++pos_;
      return true;
    }
    if (c == '"') {
      string_token();
      return true;
    }
    while (pos_ < text_.size() &&
           std::string_view(",]} \n\t\r").find(text_[pos_]) == std::string_view::npos) {
      ++pos_;
    }
    return true;
  }

  const std::string& text_;
  const std::string& target_;
  size_t pos_ = 0;
  std::optional<size_t> found_;
};

class ReportReader {
 public:
  ReportReader(const std::string& text, const std::string& name) : text_(text), name_(name) {}

  RunResult read() {
    Json root;
    try {
      root = Json::parse(text_);
    } catch (const Json::parse_error& e) {
      // e.byte is 1-based: the byte the parser stopped at.
      std::string what = e.what();
      size_t detail = what.find("syntax error");
      fail_at_offset(
          e.byte > 0 ? e.byte - 1 : 0,
          "not valid JSON: " + (detail == std::string::npos ? what : what.substr(detail)));
    } catch (const Json::exception& e) {
      // A number beyond a double (1e3081) is out_of_range, not a parse
      // error; it carries no byte, so find the number it names.
      std::string what = e.what();
      size_t quote = what.find('\'');
      std::string number =
          quote == std::string::npos ? "" : what.substr(quote + 1, what.rfind('\'') - quote - 1);
      size_t at = number.empty() ? std::string::npos : text_.find(number);
      std::string shown = number.size() > 24 ? number.substr(0, 24) + "..." : number;
      fail_at_offset(at == std::string::npos ? 0 : at,
                     "not valid JSON here: the number " + shown + " is out of range");
    }
    expect_object(root, "");
    const Json& version = require(root, "", "schema_version");
    // Versions 2 and 3 only added keys (2 made "holds" require a proof, 3
    // added the proof's certificate): a version-1 baseline compares just as
    // well.
    if (!version.is_number_unsigned() || version.get<uint64_t>() < 1 ||
        version.get<uint64_t>() > kJsonSchemaVersion) {
      fail("schema_version", "schema_version " + version.dump() +
                                 " is not one this thetagate "
                                 "reads (it reads versions 1 to " +
                                 std::to_string(kJsonSchemaVersion) + ")");
    }
    RunResult run;
    run.tool_version.clear();  // older reports do not say which thetagate wrote them
    if (const Json* tool = optional_key(root, "tool_version"); tool && tool->is_string()) {
      run.tool_version = tool->get<std::string>();
    }
    run.seed = unsigned_at(root, "", "seed");
    if (const Json* started = optional_key(root, "started"); started && started->is_string()) {
      run.started = started->get<std::string>();
    }
    // Only when given: --max-bits and --effort, for replay commands.
    if (const Json* max_bits = optional_key(root, "max_bits"); max_bits && !max_bits->is_null()) {
      run.max_bits = unsigned_value(*max_bits, "max_bits");
    }
    if (const Json* effort = optional_key(root, "effort"); effort && !effort->is_null()) {
      run.effort = unsigned_value(*effort, "effort");
    }
    if (const Json* shard = optional_key(root, "shard"); shard && !shard->is_null()) {
      ShardInfo info;
      info.index = unsigned_at(*shard, "shard", "index");
      info.count = unsigned_at(*shard, "shard", "count");
      info.digest = string_at(*shard, "shard", "digest");
      info.claims = unsigned_at(*shard, "shard", "claims");
      run.shard = info;
    }
    const Json& claims = require(root, "", "claims");
    expect_array(claims, "claims");
    for (size_t i = 0; i < claims.size(); ++i) {
      run.claims.push_back(claim(claims[i], "claims[" + std::to_string(i) + "]"));
    }
    return run;
  }

 private:
  [[noreturn]] void fail_at_offset(size_t offset, const std::string& message) {
    offset = std::min(offset, text_.size());
    size_t line_start = text_.rfind('\n', offset == 0 ? 0 : offset - 1);
    line_start = line_start == std::string::npos || offset == 0 ? 0 : line_start + 1;
    size_t line_end = text_.find('\n', line_start);
    if (line_end == std::string::npos) line_end = text_.size();
    Diagnostic d;
    d.where.file = name_;
    d.where.line =
        1 + static_cast<int>(std::count(text_.begin(), text_.begin() + line_start, '\n'));
    d.where.column =
        1 + utf8_columns(text_.substr(line_start, offset - line_start), offset - line_start);
    d.message = message;
    d.hint = kHint;
    d.source_line = text_.substr(line_start, line_end - line_start);
    throw InputError(std::move(d));
  }

  // Fails at the value of `path` (or at the start of the text if the path
  // cannot be found).
  [[noreturn]] void fail(const std::string& path, const std::string& message) {
    std::optional<size_t> at = PathFinder(text_, path).find();
    fail_at_offset(at.value_or(0), message);
  }

  static std::string join(const std::string& path, const std::string& key) {
    return path.empty() ? key : path + "." + key;
  }

  static const char* type_name(const Json& j) {
    if (j.is_null()) return "null";
    if (j.is_boolean()) return "a boolean";
    if (j.is_number()) return "a number";
    if (j.is_string()) return "a string";
    if (j.is_array()) return "an array";
    return "an object";
  }

  void expect_object(const Json& j, const std::string& path) {
    if (!j.is_object()) {
      fail(path, (path.empty() ? std::string("the report") : "'" + path + "'") +
                     " should be an object, not " + type_name(j));
    }
  }

  void expect_array(const Json& j, const std::string& path) {
    if (!j.is_array()) fail(path, "'" + path + "' should be an array, not " + type_name(j));
  }

  const Json& require(const Json& object, const std::string& path, const std::string& key) {
    auto it = object.find(key);
    if (it == object.end()) {
      fail(path, "missing key '" + join(path, key) + "'");
    }
    return *it;
  }

  const Json* optional_key(const Json& object, const std::string& key) {
    auto it = object.find(key);
    return it == object.end() ? nullptr : &*it;
  }

  [[noreturn]] void wrong_type(const Json& j, const std::string& path, const char* expected) {
    fail(path, "'" + path + "' should be " + expected + ", not " + type_name(j));
  }

  std::string string_value(const Json& j, const std::string& path) {
    if (!j.is_string()) wrong_type(j, path, "a string");
    return j.get<std::string>();
  }

  uint64_t unsigned_value(const Json& j, const std::string& path) {
    if (!j.is_number_unsigned()) wrong_type(j, path, "a whole number >= 0");
    return j.get<uint64_t>();
  }

  // A ratio: a number, or null for "not finite".
  double ratio_value(const Json& j, const std::string& path) {
    if (j.is_null()) return std::numeric_limits<double>::quiet_NaN();
    if (!j.is_number()) wrong_type(j, path, "a number or null");
    return j.get<double>();
  }

  BigInt size_value(const Json& j, const std::string& path) {
    std::string s = string_value(j, path);
    bool digits = !s.empty() && s.find_first_not_of("0123456789") == std::string::npos;
    if (!digits) fail(path, "'" + path + "' should be a size in decimal digits, not \"" + s + "\"");
    return BigInt(s);
  }

  std::string string_at(const Json& o, const std::string& path, const std::string& key) {
    return string_value(require(o, path, key), join(path, key));
  }
  uint64_t unsigned_at(const Json& o, const std::string& path, const std::string& key) {
    return unsigned_value(require(o, path, key), join(path, key));
  }
  // A line or column: a whole number that fits an int.
  int position_at(const Json& o, const std::string& path, const std::string& key) {
    uint64_t v = unsigned_at(o, path, key);
    if (v > static_cast<uint64_t>(std::numeric_limits<int>::max())) {
      fail(join(path, key), "'" + join(path, key) + "' is " + std::to_string(v) +
                                ", more than any line or column (2147483647)");
    }
    return static_cast<int>(v);
  }
  std::string optional_string(const Json& o, const std::string& path, const std::string& key) {
    const Json* j = optional_key(o, key);
    return j ? string_value(*j, join(path, key)) : "";
  }
  uint64_t optional_unsigned(const Json& o, const std::string& path, const std::string& key) {
    const Json* j = optional_key(o, key);
    return j ? unsigned_value(*j, join(path, key)) : 0;
  }
  bool boolean_value(const Json& j, const std::string& path) {
    if (!j.is_boolean()) wrong_type(j, path, "true or false");
    return j.get<bool>();
  }
  std::vector<std::string> optional_strings(const Json& o, const std::string& path,
                                            const std::string& key) {
    std::vector<std::string> out;
    const Json* j = optional_key(o, key);
    if (!j) return out;
    std::string at = join(path, key);
    expect_array(*j, at);
    for (size_t i = 0; i < j->size(); ++i) {
      out.push_back(string_value((*j)[i], at + "[" + std::to_string(i) + "]"));
    }
    return out;
  }

  Verdict verdict_value(const Json& j, const std::string& path) {
    std::string s = string_value(j, path);
    for (Verdict v : {Verdict::kHolds, Verdict::kRefuted, Verdict::kUndecided, Verdict::kError}) {
      if (s == verdict_name(v)) return v;
    }
    fail(path, "'" + path + "' is \"" + s +
                   "\"; expected \"holds\", \"refuted\", \"undecided\" "
                   "or \"error\"");
  }

  Side side_value(const Json& j, const std::string& path) {
    std::string s = string_value(j, path);
    if (s == side_name(Side::kUpper)) return Side::kUpper;
    if (s == side_name(Side::kLower)) return Side::kLower;
    fail(path, "'" + path + "' is \"" + s + "\"; expected \"upper\" or \"lower\"");
  }

  Witness witness(const Json& j, const std::string& path) {
    expect_object(j, path);
    Witness w;
    w.n = size_value(require(j, path, "n"), join(path, "n"));
    w.ratio = ratio_value(require(j, path, "ratio"), join(path, "ratio"));
    w.side = side_value(require(j, path, "side"), join(path, "side"));
    w.value = optional_string(j, path, "value");
    w.bound = optional_string(j, path, "bound");
    w.family = optional_string(j, path, "family");
    w.factor = optional_string(j, path, "factor");
    w.margin = optional_string(j, path, "margin");
    return w;
  }

  // A band end: null with a positive finite log2 overflowed a double (+inf);
  // any other null stays NaN (both render as null again).
  static double band_end(double ratio, double log2) {
    if (!std::isnan(ratio) || !(log2 > 0)) return ratio;
    return std::numeric_limits<double>::infinity();
  }

  BandRow band_row(const Json& j, const std::string& path) {
    expect_object(j, path);
    BandRow r;
    r.scale = unsigned_at(j, path, "scale");
    r.low = ratio_value(require(j, path, "low"), join(path, "low"));
    r.high = ratio_value(require(j, path, "high"), join(path, "high"));
    if (const Json* at = optional_key(j, "low_at"))
      r.low_at = size_value(*at, join(path, "low_at"));
    if (const Json* at = optional_key(j, "high_at")) {
      r.high_at = size_value(*at, join(path, "high_at"));
    }
    r.samples = optional_unsigned(j, path, "samples");
    const Json* low_log2 = optional_key(j, "low_log2");
    const Json* high_log2 = optional_key(j, "high_log2");
    r.low_log2 = low_log2 ? ratio_value(*low_log2, join(path, "low_log2")) : std::log2(r.low);
    r.high_log2 = high_log2 ? ratio_value(*high_log2, join(path, "high_log2")) : std::log2(r.high);
    r.low = band_end(r.low, r.low_log2);
    r.high = band_end(r.high, r.high_log2);
    return r;
  }

  std::optional<Diagnostic> error(const Json& o, const std::string& path) {
    const Json* j = optional_key(o, "error");
    if (!j || j->is_null()) return std::nullopt;
    std::string at = join(path, "error");
    expect_object(*j, at);
    Diagnostic d;
    d.where.file = string_at(*j, at, "file");
    d.where.line = position_at(*j, at, "line");
    d.where.column = position_at(*j, at, "column");
    d.message = string_at(*j, at, "message");
    d.hint = optional_string(*j, at, "hint");
    // format_diagnostic puts the source line second, with a caret line below.
    std::string text = optional_string(*j, at, "text");
    size_t first = text.find('\n');
    size_t second = first == std::string::npos ? first : text.find('\n', first + 1);
    if (second != std::string::npos) {
      size_t third = text.find('\n', second + 1);
      std::string caret =
          text.substr(second + 1, third == std::string::npos ? third : third - second - 1);
      if (!caret.empty() && caret.back() == '^') {
        d.source_line = text.substr(first + 1, second - first - 1);
      }
    }
    return d;
  }

  EdgeReading edge(const Json& j, const std::string& path) {
    expect_object(j, path);
    EdgeReading e;
    std::string d = string_at(j, path, "direction");
    for (Direction x : {Direction::kSteady, Direction::kRising, Direction::kFalling,
                        Direction::kEscapes, Direction::kUnclear}) {
      if (d == direction_name(x)) e.direction = x;
    }
    e.slope = ratio_value(require(j, path, "slope"), join(path, "slope"));
    e.change_log2 = ratio_value(require(j, path, "change_log2"), join(path, "change_log2"));
    e.envelope_log2 = ratio_value(require(j, path, "envelope_log2"), join(path, "envelope_log2"));
    e.monotone = boolean_value(require(j, path, "monotone"), join(path, "monotone"));
    e.first_scale = unsigned_at(j, path, "first_scale");
    e.last_scale = unsigned_at(j, path, "last_scale");
    return e;
  }

  // The basis of a version-2 report; a version-1 report has none.
  VerdictBasis basis(const Json& o, const std::string& outer, const char* key = "basis") {
    VerdictBasis b;
    const Json* jp = optional_key(o, key);
    if (!jp || jp->is_null()) return b;
    const Json& j = *jp;
    std::string path = join(outer, key);
    expect_object(j, path);
    std::string kind = string_at(j, path, "kind");
    for (BasisKind k :
         {BasisKind::kDerivationAgrees, BasisKind::kInduction, BasisKind::kDerivationContradicts,
          BasisKind::kCertifiedBreak, BasisKind::kNumericTrend, BasisKind::kBudgetReached,
          BasisKind::kInternalInconsistency, BasisKind::kInputError, BasisKind::kInternalError,
          BasisKind::kCodeBreaksModel, BasisKind::kCodeSizesMissed}) {
      if (kind == basis_name(k)) b.kind = k;
    }
    std::string unproved = string_at(j, path, "unproved");
    for (Unproved u : {Unproved::kNone, Unproved::kDerivedOutgrowsSide, Unproved::kInductionFailed,
                       Unproved::kNumbersOnly, Unproved::kTrendUnsettled,
                       Unproved::kClaimUnclassified, Unproved::kEvaluatorLimit}) {
      if (unproved == unproved_name(u)) b.unproved = u;
    }
    b.detail = string_at(j, path, "detail");
    if (const Json* t = optional_key(j, "theorem"); t && !t->is_null()) {
      std::string at = join(path, "theorem");
      expect_object(*t, at);
      TheoremEvidence e;
      e.method = string_at(*t, at, "method");
      e.derived = string_at(*t, at, "derived");
      e.claimed = string_at(*t, at, "claimed");
      e.kind = compared_with_at(*t, at);
      std::string a = string_at(*t, at, "agreement");
      e.agreement = Agreement::kContradicts;
      for (Agreement known : {Agreement::kSame, Agreement::kLoose}) {
        if (a == agreement_name(known)) e.agreement = known;
      }
      if (optional_key(*t, "relation")) e.relation = one_sided_at(*t, at);
      e.claimed_below = optional_key(*t, "claimed_below") &&
                        boolean_value(require(*t, at, "claimed_below"), join(at, "claimed_below"));
      b.theorem = e;
    }
    if (const Json* in = optional_key(j, "induction"); in && !in->is_null()) {
      std::string at = join(path, "induction");
      expect_object(*in, at);
      InductionProof p;
      const Json& sides = require(*in, at, "sides");
      expect_array(sides, join(at, "sides"));
      for (size_t i = 0; i < sides.size(); ++i) {
        p.sides.push_back(side_value(sides[i], join(at, "sides") + "[" + std::to_string(i) + "]"));
      }
      p.bound = string_at(*in, at, "bound");
      p.strengthening = string_at(*in, at, "strengthening");
      p.checked_from = size_value(require(*in, at, "checked_from"), join(at, "checked_from"));
      p.checked_to = size_value(require(*in, at, "checked_to"), join(at, "checked_to"));
      p.modulus = unsigned_at(*in, at, "modulus");
      p.tail_log2 = unsigned_at(*in, at, "tail_log2");
      p.blocks = unsigned_at(*in, at, "blocks");
      p.identity = boolean_value(require(*in, at, "identity"), join(at, "identity"));
      // Both optional: reports from before induction on dyadic blocks lack them.
      if (const Json* d = optional_key(*in, "dyadic"))
        p.dyadic = boolean_value(*d, join(at, "dyadic"));
      if (optional_key(*in, "closed_form")) p.closed_form = string_at(*in, at, "closed_form");
      // Optional too: reports from before the proofs over sums, and before
      // the proof was named with the claim's own function.
      if (optional_key(*in, "method")) p.method = string_at(*in, at, "method");
      if (optional_key(*in, "function")) p.function = string_at(*in, at, "function");
      b.induction = p;
    }
    if (const Json* tr = optional_key(j, "trend"); tr && !tr->is_null()) {
      std::string at = join(path, "trend");
      expect_object(*tr, at);
      TrendEvidence t;
      const Json& up = require(*tr, at, "upper");
      const Json& lo = require(*tr, at, "lower");
      t.upper_matters = !up.is_null();
      t.lower_matters = !lo.is_null();
      if (t.upper_matters) t.upper = edge(up, join(at, "upper"));
      if (t.lower_matters) t.lower = edge(lo, join(at, "lower"));
      const Json& esc = require(*tr, at, "escapes");
      if (!esc.is_null()) t.escapes = side_value(esc, join(at, "escapes"));
      b.trend = t;
    }
    if (const Json* d = optional_key(j, "disagreement")) {
      std::string at = join(path, "disagreement");
      expect_array(*d, at);
      for (size_t i = 0; i < d->size(); ++i) {
        std::string item = at + "[" + std::to_string(i) + "]";
        EdgeDisagreement e;
        e.reading = edge((*d)[i], item);
        e.edge = side_value(require((*d)[i], item, "edge"), join(item, "edge"));
        b.disagreement.push_back(e);
      }
    }
    if (const Json* c = optional_key(j, "certificate"); c && !c->is_null()) {
      b.certificate = certificate(*c, join(path, "certificate"));
    }
    b.reading = optional_string(j, path, "reading");
    if (const Json* other = optional_key(j, "other_reading"); other && !other->is_null()) {
      b.other_reading = verdict_value(*other, join(path, "other_reading"));
    }
    return b;
  }

  // A version-3 proof certificate. Drift does not compare certificates; it
  // is read back so that a report reads back to the same bytes.
  Certificate certificate(const Json& j, const std::string& path) {
    expect_object(j, path);
    Certificate c;
    c.method = string_at(j, path, "method");
    c.proof = string_at(j, path, "proof");
    c.root_polynomial = optional_strings(j, path, "root_polynomial");
    for (auto [field, key] : {std::pair{&c.driver_class, "driver_class"},
                              {&c.driver_class_low, "driver_class_low"},
                              {&c.driver_low, "driver_low"},
                              {&c.driver_high, "driver_high"},
                              {&c.driver_from, "driver_from"},
                              {&c.regularity_c, "regularity_c"},
                              {&c.regularity_from, "regularity_from"},
                              {&c.root_low, "root_low"},
                              {&c.root_high, "root_high"},
                              {&c.bound_class, "bound_class"},
                              {&c.bound_low, "bound_low"},
                              {&c.bound_high, "bound_high"},
                              {&c.bound_from, "bound_from"},
                              {&c.normaliser, "normaliser"},
                              {&c.factor_limit, "factor_limit"},
                              {&c.factor_low, "factor_low"},
                              {&c.factor_high, "factor_high"},
                              {&c.factor_from, "factor_from"},
                              {&c.chain_low, "chain_low"},
                              {&c.chain_high, "chain_high"}})
      *field = optional_string(j, path, key);
    c.obligations = optional_strings(j, path, "obligations");
    return c;
  }

  // The names the JSON writer gives these enums; any other text is an error.
  // A one-sided derivation's side: "O" or "Omega" (absent means Θ).
  BoundKind one_sided_at(const Json& o, const std::string& path) {
    std::string at = join(path, "relation");
    std::string s = string_at(o, path, "relation");
    for (BoundKind k : {BoundKind::kBigO, BoundKind::kOmega}) {
      if (s == bound_kind_name(k)) return k;
    }
    fail(at, "'" + at + "' is \"" + s + "\"; expected \"O\" or \"Omega\"");
  }

  ComparedWith compared_with_at(const Json& o, const std::string& path) {
    std::string at = join(path, "kind");
    std::string s = string_at(o, path, "kind");
    for (ComparedWith c :
         {ComparedWith::kTheta, ComparedWith::kBigO, ComparedWith::kOmega, ComparedWith::kExplicit,
          ComparedWith::kUpperSide, ComparedWith::kLowerSide}) {
      if (s == compared_with_name(c)) return c;
    }
    fail(at, "'" + at + "' is \"" + s +
                 "\"; expected \"Theta\", \"O\", \"Omega\", \"explicit\", \"upper\" or \"lower\"");
  }

  ModelRelation relation_at(const Json& o, const std::string& path) {
    std::string at = join(path, "relation");
    std::string s = string_at(o, path, "relation");
    for (ModelRelation r :
         {ModelRelation::kUpperBound, ModelRelation::kExact, ModelRelation::kLowerBound}) {
      if (s == relation_name(r)) return r;
    }
    fail(at,
         "'" + at + "' is \"" + s + "\"; expected \"upper bound\", \"exact\" or \"lower bound\"");
  }

  int sign_value(const Json& j, const std::string& path) {
    if (!j.is_number_integer() || j.get<int64_t>() < -1 || j.get<int64_t>() > 1) {
      wrong_type(j, path, "-1, 0 or 1");
    }
    return static_cast<int>(j.get<int64_t>());
  }

  std::optional<CodeResult> code(const Json& o, const std::string& path) {
    const Json* j = optional_key(o, "code");
    if (!j || j->is_null()) return std::nullopt;
    std::string at = join(path, "code");
    expect_object(*j, at);
    CodeResult code;
    code.relation = relation_at(*j, at);
    code.source = optional_string(*j, at, "source");
    code.measurements = optional_unsigned(*j, at, "measurements");
    for (const char* key : {"families_measured", "families_missed"}) {
      const Json* list = optional_key(*j, key);
      if (!list) continue;
      std::string list_at = join(at, key);
      expect_array(*list, list_at);
      auto& into =
          std::string(key) == "families_missed" ? code.families_missed : code.families_measured;
      for (size_t i = 0; i < list->size(); ++i) {
        if (!(*list)[i].is_string())
          expect_object((*list)[i], list_at + "[" + std::to_string(i) + "]");
        into.push_back((*list)[i].get<std::string>());
      }
    }
    if (const Json* mv = optional_key(*j, "model_verdict"); mv && !mv->is_null()) {
      code.model_verdict = verdict_value(*mv, join(at, "model_verdict"));
      code.model_basis = basis(*j, at, "model_basis");
    }
    if (const Json* rows = optional_key(*j, "rows")) {
      std::string rows_at = join(at, "rows");
      expect_array(*rows, rows_at);
      for (size_t i = 0; i < rows->size(); ++i) {
        std::string row_at = rows_at + "[" + std::to_string(i) + "]";
        const Json& r = (*rows)[i];
        expect_object(r, row_at);
        CostRow row;
        row.n = size_value(require(r, row_at, "n"), join(row_at, "n"));
        row.cost = string_at(r, row_at, "cost");
        row.model = string_at(r, row_at, "model");
        row.sign = sign_value(require(r, row_at, "sign"), join(row_at, "sign"));
        row.runs = optional_unsigned(r, row_at, "runs");
        row.from = optional_string(r, row_at, "from");
        code.rows.push_back(std::move(row));
      }
    }
    if (const Json* violations = optional_key(*j, "violations")) {
      std::string list_at = join(at, "violations");
      expect_array(*violations, list_at);
      for (size_t i = 0; i < violations->size(); ++i) {
        std::string v_at = list_at + "[" + std::to_string(i) + "]";
        const Json& v = (*violations)[i];
        expect_object(v, v_at);
        CostViolation violation;
        violation.n = size_value(require(v, v_at, "n"), join(v_at, "n"));
        violation.cost = string_at(v, v_at, "cost");
        violation.model = string_at(v, v_at, "model");
        violation.file = optional_string(v, v_at, "file");
        violation.line = static_cast<int>(optional_unsigned(v, v_at, "line"));
        violation.input = optional_string(v, v_at, "input");
        violation.replay = optional_string(v, v_at, "replay");
        code.violations.push_back(std::move(violation));
      }
    }
    return code;
  }

  ClaimResult claim(const Json& j, const std::string& path) {
    expect_object(j, path);
    ClaimResult c;
    c.name = string_at(j, path, "name");
    c.file = string_at(j, path, "file");
    c.line = position_at(j, path, "line");
    c.verdict = verdict_value(require(j, path, "verdict"), join(path, "verdict"));
    c.claimed = string_at(j, path, "claimed");
    c.derived = string_at(j, path, "derived");
    c.method = string_at(j, path, "method");
    c.tight = boolean_value(require(j, path, "tight"), join(path, "tight"));
    const Json& witnesses = require(j, path, "witnesses");
    std::string at = join(path, "witnesses");
    expect_array(witnesses, at);
    for (size_t i = 0; i < witnesses.size(); ++i) {
      c.witnesses.push_back(witness(witnesses[i], at + "[" + std::to_string(i) + "]"));
    }
    const Json& band = require(j, path, "band");
    at = join(path, "band");
    expect_array(band, at);
    for (size_t i = 0; i < band.size(); ++i) {
      c.band.push_back(band_row(band[i], at + "[" + std::to_string(i) + "]"));
    }
    string_at(j, path, "message");  // required; the sentence is recomposed, not kept
    if (const Json* n = optional_key(j, "numeric_only")) {
      c.numeric_only = boolean_value(*n, join(path, "numeric_only"));
    }
    c.notes = optional_strings(j, path, "notes");
    if (optional_key(j, "steps")) {
      c.steps = optional_strings(j, path, "steps");
      c.failed_hypotheses = optional_strings(j, path, "failed_hypotheses");
    } else {
      c.steps = optional_strings(j, path, "reasons");
    }
    c.note = optional_string(j, path, "note");
    c.recurrence = optional_string(j, path, "recurrence");
    c.recheck = optional_string(j, path, "recheck");
    c.settings_known = optional_key(j, "sizes") != nullptr;
    c.sizes = optional_string(j, path, "sizes");
    c.rounding = optional_string(j, path, "rounding");
    if (const Json* s = optional_key(j, "seconds"); s && s->is_number() && s->get<double>() >= 0) {
      c.seconds = s->get<double>();
    }
    c.position = optional_unsigned(j, path, "position");
    c.sizes_checked = optional_unsigned(j, path, "sizes_checked");
    c.largest_bits = optional_unsigned(j, path, "largest_bits");
    c.error = error(j, path);
    c.basis = basis(j, path);
    if (const Json* f = optional_key(j, "function"))
      c.function = string_value(*f, join(path, "function"));
    c.code = code(j, path);
    return c;
  }

  const std::string& text_;
  const std::string& name_;
};

}  // namespace

RunResult read_json_report(const std::string& json_text, const std::string& display_name) {
  return ReportReader(json_text, display_name).read();
}

}  // namespace thetagate::engine
