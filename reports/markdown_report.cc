#include "reports/markdown_report.h"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cstring>

#include "reports/number_text.h"
#include "reports/text_report.h"
#include "reports/verdict_text.h"
#include "reports/xml_escape.h"
#include "verifier/syntax/terminal_text.h"

namespace thetagate::engine {

namespace {

constexpr size_t kMaxWitnesses = 8;

// Text inside <summary>: an HTML block, where Markdown is not read.
std::string html_text(const std::string& text) { return xml_escape_text(escape_controls(text)); }

std::string location(const ClaimResult& c) {
  if (c.file.empty()) return "";
  return c.line > 0 ? c.file + ":" + std::to_string(c.line) : c.file;
}

std::string derived_cell(const ClaimResult& c) {
  if (c.derived.empty()) return "\u2014";
  std::string s = c.derived;
  if (!c.method.empty() && c.method != "numeric") s += " by " + c.method;
  return s;
}

void append_list(std::string& out, const char* heading, const std::vector<std::string>& items) {
  if (items.empty()) return;
  out += std::string("**") + heading + "**\n\n";
  for (const std::string& item : items) out += "- " + markdown_text(item) + "\n";
  out += "\n";
}

void append_witnesses(std::string& out, const ClaimResult& c) {
  if (c.witnesses.empty()) return;
  out += c.witnesses.size() == 1 ? "**Witness**\n\n" : "**Witnesses**\n\n";
  size_t shown = std::min(c.witnesses.size(), kMaxWitnesses);
  for (size_t i = 0; i < shown; ++i) {
    const Witness& w = c.witnesses[i];
    std::string line = "n = " + short_decimal(w.n) + " (" + side_name(w.side) +
                       " side, T(n)/g(n) = " + format_ratio(w.ratio);
    if (!w.factor.empty()) line += ", ladder c = " + w.factor;
    if (!w.family.empty()) line += ", family " + w.family;
    line += ")";
    if (!w.value.empty()) line += ": T(n) = " + short_value(w.value);
    if (!w.bound.empty()) line += ", bound " + short_value(w.bound);
    out += "- " + markdown_text(line) + "\n";
  }
  if (shown < c.witnesses.size()) {
    out += fmt::format("- \u2026 and {} more (every witness is in the JSON report)\n",
                       c.witnesses.size() - shown);
  }
  out += "\n";
}

void append_details(std::string& out, const ClaimResult& c) {
  out += "<details>\n<summary>" + html_text(std::string(verdict_name(c.verdict)) + ": " + c.name) +
         "</summary>\n\n";
  if (std::string where = location(c); !where.empty()) {
    out += "At " + markdown_text(where) + "\n\n";
  }
  if (c.verdict == Verdict::kError && c.error) {
    const Diagnostic& d = *c.error;
    out += markdown_text(d.where.file + ":" + std::to_string(d.where.line) + ":" +
                         std::to_string(d.where.column) + ": " + d.message) +
           "\n\n";
    if (!d.hint.empty()) out += "Hint: " + markdown_text(d.hint) + "\n\n";
  } else {
    out += markdown_text(verdict_message(c)) + "\n\n";
  }
  append_list(out, "Derivation", c.steps);
  append_list(out, "Theorems that did not apply", c.failed_hypotheses);
  append_witnesses(out, c);
  std::vector<std::string> notes = c.notes;
  if (!c.note.empty()) notes.insert(notes.begin(), c.note);
  append_list(out, "Notes", notes);
  out += "</details>\n\n";
}

}  // namespace

std::string markdown_text(const std::string& text) {
  // ASCII punctuation that starts Markdown or forge syntax: emphasis, code,
  // links and images, entities, table cells, headings, strikethrough, math,
  // mentions. Any ASCII punctuation may be backslash-escaped. Three are
  // escaped only where they could act, so "merge_sort" and "T(n) <= n^2"
  // stay readable in the raw text: '_' inside a word opens no emphasis, '<'
  // starts raw HTML or an autolink only before a letter, '/', '!' or '?',
  // and '>' quotes only at the start of a line.
  static const char* const kSyntax = "\\`*[]|#!~&$@";
  std::string safe = escape_controls(text);
  auto alnum = [&](size_t i) {
    return i < safe.size() && std::isalnum(static_cast<unsigned char>(safe[i])) != 0;
  };
  std::string out;
  out.reserve(safe.size());
  for (size_t i = 0; i < safe.size(); ++i) {
    char ch = safe[i];
    bool escape = false;
    if (ch == '\n' || ch == '\r') {
      out += ' ';
      continue;
    }
    if (ch == '_') {
      escape = !(i > 0 && alnum(i - 1) && alnum(i + 1));
    } else if (ch == '<') {
      char next = i + 1 < safe.size() ? safe[i + 1] : ' ';
      escape = std::isalpha(static_cast<unsigned char>(next)) != 0 || next == '/' || next == '!' ||
               next == '?';
    } else if (ch == '>') {
      escape = i == 0;
    } else {
      escape = ch != '\0' && std::strchr(kSyntax, ch) != nullptr;
    }
    if (escape) out += '\\';
    out += ch;
  }
  return out;
}

std::string render_markdown(const RunResult& run) {
  std::string summary = summary_line(run);
  summary.pop_back();  // the newline
  std::string out = "### thetagate: " + summary + "\n\n";
  out += "Seed " + std::to_string(run.seed);
  if (run.max_bits || run.effort) out += " (replay: `" + replay_options(run) + "`)";
  if (!run.tool_version.empty()) out += ", thetagate " + markdown_text(run.tool_version);
  if (!run.started.empty()) out += ", started " + markdown_text(run.started);
  out += ".";
  if (run.claims.empty()) return out + "\n";
  out += " Claims that did not hold are explained below the table.\n\n";
  out += "| Verdict | Claim | Claimed | Derived | Proof or witness |\n";
  out += "| --- | --- | --- | --- | --- |\n";
  for (const ClaimResult& c : run.claims) {
    std::string claimed = c.claimed;
    if (c.verdict == Verdict::kHolds && !c.tight) claimed += " (not tight)";
    out += "| **" + std::string(verdict_name(c.verdict)) + "** | " + markdown_text(c.name) + " | " +
           markdown_text(claimed) + " | " + markdown_text(derived_cell(c)) + " | " +
           markdown_text(brief_evidence(c)) + " |\n";
  }
  out += "\n";
  for (const ClaimResult& c : run.claims) {
    if (c.verdict != Verdict::kHolds) append_details(out, c);
  }
  while (out.size() >= 2 && out[out.size() - 1] == '\n' && out[out.size() - 2] == '\n') {
    out.pop_back();
  }
  return out;
}

}  // namespace thetagate::engine
