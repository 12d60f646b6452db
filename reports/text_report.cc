#include "reports/text_report.h"

#include <fmt/format.h>
#include <unistd.h>

#include <algorithm>
#include <array>
#include <cctype>
#include <cstdlib>
#include <vector>

#include "reports/code_text.h"
#include "reports/number_text.h"
#include "reports/verdict_text.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {

// Defined below, outside the file's own helpers: other writers use it too.
std::string replay_options(const RunResult& run);

namespace {

constexpr size_t kVerdictWidth = 11;  // "undecided" plus two spaces
constexpr int kMaxNameColumn = 48;    // longer names push their own line's claim text right
constexpr int kWrapColumn = 100;      // detail text wraps here; claim lines never wrap
constexpr size_t kMaxWitnesses = 8;
constexpr size_t kMaxBandRows = 12;
const char* const kIndent = "    ";

const char* verdict_colour(Verdict v) {
  switch (v) {
    case Verdict::kHolds:
      return "\033[32m";
    case Verdict::kRefuted:
      return "\033[1;31m";
    case Verdict::kUndecided:
      return "\033[33m";
    case Verdict::kError:
      return "\033[1;35m";
  }
  return "";
}

class Painter {
 public:
  explicit Painter(const TextStyle& style) : colour_(style.colour) {}
  std::string paint(const char* code, const std::string& text) const {
    return colour_ ? code + text + "\033[0m" : text;
  }
  std::string dim(const std::string& text) const { return paint("\033[2m", text); }
  std::string bold(const std::string& text) const { return paint("\033[1m", text); }

 private:
  bool colour_;
};

int display_width(const std::string& s) { return utf8_columns(s, s.size()); }

// Splits one line into pieces of at most `width` columns at spaces; a word
// longer than `width` stays whole.
std::vector<std::string> wrap(const std::string& line, int width) {
  if (display_width(line) <= width) return {line};  // keeps the line's own spacing
  std::vector<std::string> pieces;
  std::string current;
  size_t start = 0;
  while (start <= line.size()) {
    size_t end = line.find(' ', start);
    if (end == std::string::npos) end = line.size();
    std::string word = line.substr(start, end - start);
    if (!current.empty() && display_width(current) + 1 + display_width(word) > width) {
      pieces.push_back(current);
      current = word;
    } else {
      current += (current.empty() ? "" : " ") + word;
    }
    start = end + 1;
  }
  if (!current.empty() || pieces.empty()) pieces.push_back(current);
  return pieces;
}

// Appends `text` line by line: the first line after `first`, the others after
// `rest`; blank lines stay blank (no trailing spaces). With `wrap_lines`,
// long lines are wrapped to kWrapColumn; a diagnostic is never wrapped, so
// its caret stays under the column.
void append_lines(std::string& out, const std::string& first, const std::string& rest,
                  std::string text, bool wrap_lines = true) {
  while (!text.empty() && text.back() == '\n') text.pop_back();
  size_t start = 0;
  bool first_line = true;
  while (true) {
    size_t end = text.find('\n', start);
    std::string line = text.substr(start, end == std::string::npos ? end : end - start);
    std::vector<std::string> pieces{line};
    if (wrap_lines) pieces = wrap(line, kWrapColumn - display_width(rest));
    for (const std::string& piece : pieces) {
      if (!piece.empty()) out += (first_line ? first : rest) + piece;
      out += '\n';
      first_line = false;
    }
    if (end == std::string::npos) break;
    start = end + 1;
  }
}

void append_indented(std::string& out, const std::string& indent, const std::string& text,
                     bool wrap_lines = true) {
  append_lines(out, indent, indent, text, wrap_lines);
}

std::string claim_summary(const ClaimResult& c) {
  std::string s;
  if (!c.claimed.empty()) s += "claimed " + c.claimed;
  if (!c.claimed.empty() || !c.derived.empty()) {
    if (!s.empty()) s += " \u00b7 ";
    s += "derived " + (c.derived.empty() ? std::string("\u2014") : c.derived);
    if (!c.derived.empty() && !c.method.empty() && c.method != "numeric") s += " by " + c.method;
  }
  if (c.verdict == Verdict::kHolds && !c.tight) s += " \u00b7 not tight";
  if (c.verdict == Verdict::kHolds) s += " \u00b7 proof: " + proof_name(c);
  if (c.numeric_only) s += " \u00b7 numeric only";
  return s;
}

std::string claim_line(const ClaimResult& c, int name_column, const Painter& painter) {
  std::string verdict = verdict_name(c.verdict);
  std::string line = painter.paint(verdict_colour(c.verdict), verdict);
  line += std::string(kVerdictWidth - verdict.size(), ' ');
  line += painter.bold(c.name);
  std::string summary = claim_summary(c);
  if (!summary.empty()) {
    line += std::string(static_cast<size_t>(std::max(0, name_column - display_width(c.name))), ' ');
    line += "  " + summary;
  }
  return line + "\n";
}

std::string witness_headline(const Witness& w) {
  std::string s = "n = " + short_decimal(w.n) + "  (" + side_name(w.side) +
                  " side, T(n)/g(n) = " + format_ratio(w.ratio);
  if (!w.factor.empty()) s += ", ladder c = " + w.factor;
  if (!w.family.empty()) s += ", family " + w.family;
  return s + ")";
}

// Words a report uses that a new reader may not know: each is explained in
// one line where it first appears.
struct Glossary {
  bool ladder = false;
  bool band = false;
};

// "= 159", or "≈ 6090.37 (= 48723/8)" for a fraction.
std::string equals(const std::string& value) {
  std::string readable = readable_value(value);
  return readable.rfind("≈", 0) == 0 ? readable : "= " + readable;
}

void append_witnesses(std::string& out, const ClaimResult& c, Glossary& glossary) {
  if (c.witnesses.empty()) return;
  out += kIndent + std::string(c.witnesses.size() == 1 ? "witness:" : "witnesses:") + "\n";
  bool ladder = false;
  for (const Witness& w : c.witnesses) ladder = ladder || !w.factor.empty();
  if (ladder && !glossary.ladder) {
    glossary.ladder = true;
    out +=
        std::string(kIndent) +
        "  (ladder c: T(n) > c·g(n) here, checked exactly; rungs at growing c: no c bounds it)\n";
  }
  size_t shown = std::min(c.witnesses.size(), kMaxWitnesses);
  for (size_t i = 0; i < shown; ++i) {
    const Witness& w = c.witnesses[i];
    out += kIndent + std::string("  ") + witness_headline(w) + "\n";
    if (!w.value.empty()) out += kIndent + std::string("    T(n)  ") + equals(w.value) + "\n";
    if (!w.bound.empty()) out += kIndent + std::string("    bound ") + equals(w.bound) + "\n";
    if (!w.margin.empty()) {
      out += kIndent +
             std::string(w.side == Side::kUpper ? "    T(n) − bound = " : "    bound − T(n) = ") +
             short_value(w.margin) + "\n";
    }
  }
  if (shown < c.witnesses.size()) {
    out += fmt::format("{}  \u2026 and {} more (every witness is in --format json)\n", kIndent,
                       c.witnesses.size() - shown);
  }
}

// At most kMaxBandRows rows, evenly spread, always the first and last scale.
std::vector<size_t> band_rows_to_show(size_t rows) {
  std::vector<size_t> picked;
  if (rows <= kMaxBandRows) {
    for (size_t i = 0; i < rows; ++i) picked.push_back(i);
    return picked;
  }
  for (size_t i = 0; i < kMaxBandRows; ++i) {
    size_t index = (i * (rows - 1) + (kMaxBandRows - 1) / 2) / (kMaxBandRows - 1);
    if (picked.empty() || picked.back() != index) picked.push_back(index);
  }
  return picked;
}

void append_band(std::string& out, const ClaimResult& c, Glossary& glossary) {
  if (c.band.empty()) return;
  std::vector<size_t> rows = band_rows_to_show(c.band.size());
  out += kIndent + std::string("ratio band T(n)/g(n)");
  if (rows.size() < c.band.size()) {
    out += fmt::format(" ({} of {} scales)", rows.size(), c.band.size());
  }
  out += ":\n";
  if (!glossary.band) {
    glossary.band = true;
    out += std::string(kIndent) +
           "  (per scale: lowest and highest T(n)/g(n) of the sizes with that many bits)\n";
  }
  out +=
      fmt::format("{}  {:>6}  {:>11}  {:>11}  {:>8}\n", kIndent, "bits", "low", "high", "samples");
  for (size_t i : rows) {
    const BandRow& r = c.band[i];
    out += fmt::format("{}  {:>6}  {:>11}  {:>11}  {:>8}\n", kIndent, r.scale + 1,
                       format_band_ratio(r.low, r.low_log2), format_band_ratio(r.high, r.high_log2),
                       r.samples);
  }
}

void append_list(std::string& out, const char* heading, const std::vector<std::string>& items) {
  if (items.empty()) return;
  out += kIndent + std::string(heading) + "\n";
  for (const std::string& item : items) {
    append_lines(out, kIndent + std::string("  - "), kIndent + std::string("    "), item);
  }
}

// Quotes a word for a POSIX shell: abc stays abc, a b becomes 'a b'.
std::string shell_quote(const std::string& word) {
  bool plain = !word.empty();
  for (char c : word) {
    if (!(std::isalnum(static_cast<unsigned char>(c)) ||
          std::string("-_./:=+,").find(c) != std::string::npos)) {
      plain = false;
    }
  }
  if (plain) return word;
  std::string quoted = "'";
  for (char c : word) quoted += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return quoted + "'";
}

// A command that checks this claim again with the same sizes.
std::string replay_command(const RunResult& run, const ClaimResult& c) {
  return "thetagate check " + shell_quote(c.file) + " " + replay_options(run) + " --claim " +
         shell_quote(c.name);
}

void append_detail(std::string& out, const RunResult& run, const ClaimResult& c,
                   const Painter& painter, Glossary& glossary) {
  bool has_diagnostic = c.verdict == Verdict::kError && c.error.has_value();
  if (!has_diagnostic && !c.file.empty()) {
    out += kIndent + painter.dim("at " + c.file + ":" + std::to_string(c.line)) + "\n";
  }
  std::string message = escape_controls(verdict_message(c));
  if (!message.empty() && !(has_diagnostic && message == c.error->message)) {
    append_indented(out, kIndent, message);
  }
  std::string proof = proof_name(c);
  if (!proof.empty()) append_indented(out, kIndent, "proof: " + proof);
  if (has_diagnostic)
    append_indented(out, kIndent, format_diagnostic(*c.error), /*wrap_lines=*/false);
  append_witnesses(out, c, glossary);
  if (c.code) out += code_link_text(*c.code, kIndent);
  append_band(out, c, glossary);
  append_list(out, "assumptions:", c.notes);
  if (!c.note.empty()) append_indented(out, kIndent, "note: " + c.note);
  append_list(out, "derivation:", c.steps);
  append_list(out, "not applicable:", c.failed_hypotheses);
  if (c.sizes_checked > 0) {
    out += kIndent +
           painter.dim(fmt::format("checked {} size{} up to {} bits", c.sizes_checked,
                                   c.sizes_checked == 1 ? "" : "s", c.largest_bits)) +
           "\n";
  }
  if (!c.file.empty() && c.verdict != Verdict::kError) {
    out += kIndent + painter.dim("replay: " + replay_command(run, c)) + "\n";
  }
}

}  // namespace

// The options that make a run choose the same sizes again.
std::string replay_options(const RunResult& run) {
  std::string options = "--seed " + std::to_string(run.seed);
  if (run.max_bits) options += " --max-bits " + std::to_string(*run.max_bits);
  if (run.effort) options += " --effort " + std::to_string(*run.effort);
  return options;
}

std::string summary_line(const RunResult& run) {
  std::array<size_t, 4> count{};
  for (const ClaimResult& c : run.claims) ++count[static_cast<size_t>(c.verdict)];
  size_t total = run.claims.size();
  return fmt::format("{} claim{}: {} holds, {} refuted, {} undecided, {} error{}\n", total,
                     total == 1 ? "" : "s", count[0], count[1], count[2], count[3],
                     count[3] == 1 ? "" : "s");
}

std::string brief_evidence(const ClaimResult& c) {
  if (c.verdict == Verdict::kError && c.error) {
    return c.error->where.file + ":" + std::to_string(c.error->where.line) + ":" +
           std::to_string(c.error->where.column) + ": " + c.error->message;
  }
  if (c.verdict == Verdict::kHolds) return "proof: " + proof_name(c);
  if (!c.witnesses.empty()) {
    const Witness& w = c.witnesses.front();
    return "witness n = " + short_decimal(w.n) + ": T(n)/g(n) = " + format_ratio(w.ratio);
  }
  // The first clause of why: the whole story is in the full report.
  std::string why = verdict_message(c);
  size_t end = why.find_first_of(":;(");
  if (end != std::string::npos) why.resize(end);
  while (!why.empty() && why.back() == ' ') why.pop_back();
  return why;
}

// After `check --recheck`: how the independent re-check answered, in one
// line ("" without it). A rejected certificate made its claim an error.
static std::string recheck_line(const RunResult& run) {
  int rechecked = 0, not_rechecked = 0, rejected = 0;
  for (const ClaimResult& c : run.claims) {
    if (c.recheck.rfind("re-checked", 0) == 0) ++rechecked;
    if (c.recheck.rfind("not re-checked", 0) == 0) ++not_rechecked;
    if (c.recheck.rfind("REJECTED", 0) == 0) ++rejected;
  }
  if (rechecked + not_rechecked + rejected == 0) return "";
  return fmt::format(
      "re-check of the certificates: {} re-checked, {} not re-checked, {} rejected\n", rechecked,
      not_rechecked, rejected);
}

std::string render_text(const RunResult& raw_run, const TextStyle& style) {
  // Names and notes come from claim files: their control bytes (escape
  // sequences, NUL) are shown escaped, never sent to the terminal.
  RunResult run = raw_run;
  for (ClaimResult& c : run.claims) {
    c.name = escape_controls(c.name);
    c.file = escape_controls(c.file);
    c.note = escape_controls(c.note);
    c.basis.detail = escape_controls(c.basis.detail);
    if (c.error) c.error->message = escape_controls(c.error->message);
  }
  Painter painter(style);
  std::string tool = run.tool_version.empty() ? "" : "thetagate " + run.tool_version + " \u00b7 ";
  // "2026-12-05T07:32:04Z" reads as "2026-12-05 07:32 UTC".
  if (run.started.size() == 20)
    tool += run.started.substr(0, 10) + " " + run.started.substr(11, 5) + " UTC \u00b7 ";
  std::string out = painter.dim(fmt::format("{}seed {} (rerun with {} to replay this run)",
                                            escape_controls(tool), run.seed, replay_options(run)));
  out += "\n\n";
  int name_column = 0;
  for (const ClaimResult& c : run.claims) {
    name_column = std::max(name_column, std::min(display_width(c.name), kMaxNameColumn));
  }
  Glossary glossary;
  for (const ClaimResult& c : run.claims) {
    out += claim_line(c, name_column, painter);
    if (c.verdict == Verdict::kHolds && (c.basis.certificate || !c.recheck.empty())) {
      // Under the proof the claim line names: what a checker re-verifies,
      // and what the independent re-check said (check --recheck).
      std::string line;
      if (c.basis.certificate) {
        size_t count = c.basis.certificate->obligations.size();
        line = fmt::format("certificate: {} obligation{}", count, count == 1 ? "" : "s");
      }
      if (!c.recheck.empty()) line += (line.empty() ? "" : "; ") + escape_controls(c.recheck);
      out += kIndent + painter.dim(line) + "\n";
    }
    if (c.verdict == Verdict::kHolds && c.code) {
      // A passing claim still says what its costs covered.
      std::string coverage = code_coverage(*c.code);
      out += kIndent +
             painter.dim(code_headline(*c.code) + (coverage.empty() ? "" : "; " + coverage)) + "\n";
    }
    if (c.verdict != Verdict::kHolds) {
      append_detail(out, run, c, painter, glossary);
      out += "\n";
    }
  }
  if (!run.claims.empty() && run.claims.back().verdict == Verdict::kHolds) out += "\n";
  out += summary_line(run);
  out += recheck_line(run);
  // The fields above are escaped one by one; this pass catches any text a
  // future field brings along, so nothing from a claim file ever acts on the
  // reader's terminal. Only our own colour sequences stay.
  return terminal_safe(out, style.colour);
}

std::string render_brief(const RunResult& raw_run, const TextStyle& style) {
  RunResult run = raw_run;
  for (ClaimResult& c : run.claims) c.name = escape_controls(c.name);
  Painter painter(style);
  int name_column = 0;
  for (const ClaimResult& c : run.claims) {
    name_column = std::max(name_column, std::min(display_width(c.name), kMaxNameColumn));
  }
  std::string out;
  for (const ClaimResult& c : run.claims) {
    std::string line = claim_line(c, name_column, painter);
    line.pop_back();  // the newline
    // A holds line names its proof already (claim_summary).
    if (c.verdict != Verdict::kHolds) {
      std::string evidence = brief_evidence(c);
      if (!evidence.empty()) line += " \u00b7 " + evidence;
    }
    out += line + "\n";
  }
  out += summary_line(run);
  out += recheck_line(run);
  return terminal_safe(out, style.colour);
}

bool want_colour(int fd) {
  const char* no_colour = std::getenv("NO_COLOR");
  if (no_colour != nullptr && no_colour[0] != '\0') return false;
  return isatty(fd) == 1;
}

}  // namespace thetagate::engine
