#include "verifier/syntax/source.h"

#include <algorithm>

namespace thetagate::engine {

SourceText SourceText::whole(std::string name, std::string text) {
  SourceText s;
  s.file = std::make_shared<SourceFile>(SourceFile{std::move(name), text});
  s.offset = 0;
  s.exact = true;
  s.text = std::move(text);
  return s;
}

int utf8_columns(const std::string& s, size_t bytes) {
  int columns = 0;
  for (size_t i = 0; i < bytes && i < s.size(); ++i) {
    if ((static_cast<unsigned char>(s[i]) & 0xC0) != 0x80) ++columns;
  }
  return columns;
}

size_t utf8_advance(const std::string& s, size_t at, int columns) {
  for (int column = 0; column < columns && at < s.size() && s[at] != '\n';) {
    ++at;
    if (at >= s.size() || (static_cast<unsigned char>(s[at]) & 0xC0) != 0x80) ++column;
  }
  return at;
}

namespace {
size_t file_offset(const SourceText& source, size_t pos) {
  if (!source.exact) return source.offset;
  return source.offset + std::min(pos, source.text.size());
}
}  // namespace

Location SourceText::locate(size_t pos) const {
  Location loc;
  loc.file = file ? file->name : "<input>";
  if (!file) {
    loc.line = 1;
    loc.column = utf8_columns(text, pos) + 1;
    return loc;
  }
  const std::string& all = file->text;
  size_t at = std::min(file_offset(*this, pos), all.size());
  // The end of a CRLF line is its CR, where the caret of an LF line stands.
  if (at > 0 && at < all.size() && all[at] == '\n' && all[at - 1] == '\r') --at;
  size_t line_start = all.rfind('\n', at == 0 ? std::string::npos : at - 1);
  line_start = (line_start == std::string::npos || at == 0) ? 0 : line_start + 1;
  if (at > 0 && all[at - 1] == '\n') line_start = at;
  loc.line =
      1 + static_cast<int>(std::count(all.begin(), all.begin() + static_cast<long>(at), '\n'));
  loc.column = utf8_columns(all.substr(line_start, at - line_start), at - line_start) + 1;
  return loc;
}

std::string SourceText::line_at(size_t pos) const {
  const std::string& all = file ? file->text : text;
  size_t at = file ? std::min(file_offset(*this, pos), all.size()) : std::min(pos, all.size());
  size_t start = at == 0 ? 0 : all.rfind('\n', at - 1);
  start = (start == std::string::npos || at == 0) ? 0 : start + 1;
  if (at > 0 && all[at - 1] == '\n') start = at;
  size_t end = all.find('\n', start);
  if (end == std::string::npos) end = all.size();
  std::string line = all.substr(start, end - start);
  if (!line.empty() && line.back() == '\r') line.pop_back();
  return line;
}

void fail_at(const SourceText& source, size_t pos, std::string message, std::string hint) {
  Diagnostic d;
  d.where = source.locate(pos);
  d.message = std::move(message);
  d.hint = std::move(hint);
  d.source_line = source.line_at(pos);
  throw InputError(std::move(d));
}

}  // namespace thetagate::engine

// The public error types (thetagate/errors.h) that render diagnostics.
namespace thetagate {

namespace {
constexpr int kShownColumns = 120;  // of a long source line, around the caret
}  // namespace

std::string format_diagnostic(const Diagnostic& d) {
  std::string out = engine::escape_controls(d.where.file) + ":" + std::to_string(d.where.line) +
                    ":" + std::to_string(d.where.column) +
                    ": error: " + engine::escape_controls(d.message);
  if (!d.source_line.empty()) {
    // A long line shows a window around the caret, marked with "...".
    std::string line = d.source_line;
    int total = engine::utf8_columns(line, line.size());
    // The caret stays on the line (or just past its end): a column read back
    // from a report may be anything.
    int column = std::clamp(d.where.column, 1, total + 1);
    if (total > kShownColumns) {
      int first = std::max(1, std::min(column - kShownColumns / 2, total - kShownColumns + 1));
      size_t from = engine::utf8_advance(line, 0, first - 1);
      size_t to = engine::utf8_advance(line, 0, first - 1 + kShownColumns);
      std::string window = line.substr(from, to - from);
      column -= first - 1;
      if (first > 1) {
        window = "..." + window;
        column += 3;
      }
      if (to < line.size()) window += "...";
      line = window;
    }
    // One character for each control character, so the caret stays in place.
    line = engine::masked_line(line);
    out += "\n" + line + "\n";
    // Keep tabs so the caret lines up under tab-indented text.
    int at = 1;
    size_t i = 0;
    while (at < column && i < line.size()) {
      unsigned char c = static_cast<unsigned char>(line[i]);
      if ((c & 0xC0) != 0x80) {
        out += c == '\t' ? '\t' : ' ';
        ++at;
      }
      ++i;
    }
    while (at < column) {
      out += ' ';
      ++at;
    }
    out += "^";
  }
  if (!d.hint.empty()) out += "\n  hint: " + engine::escape_controls(d.hint);
  return out;
}

InputError::InputError(Diagnostic d) : Error(format_diagnostic(d)), diagnostic_(std::move(d)) {}

}  // namespace thetagate
