#include "reports/xml_escape.h"

#include <fmt/format.h>

#include <cstdint>

#include "verifier/syntax/terminal_text.h"

namespace thetagate::engine {

namespace {

const char* const kReplacement = "\xEF\xBF\xBD";  // U+FFFD

// Length of the well-formed UTF-8 sequence at text[i] whose code point XML
// 1.0 allows, or 0 when the bytes there are invalid or forbidden.
size_t allowed_sequence(const std::string& text, size_t i) {
  auto byte = [&](size_t k) { return static_cast<unsigned char>(text[k]); };
  unsigned char lead = byte(i);
  if (lead < 0x80) return (lead >= 0x20 || lead == '\t' || lead == '\n' || lead == '\r') ? 1 : 0;
  size_t length = lead >= 0xF0 ? 4 : lead >= 0xE0 ? 3 : lead >= 0xC0 ? 2 : 0;
  if (length == 0 || lead > 0xF4 || i + length > text.size()) return 0;
  uint32_t cp = lead & (0x7F >> length);
  for (size_t k = 1; k < length; ++k) {
    if ((byte(i + k) & 0xC0) != 0x80) return 0;
    cp = (cp << 6) | (byte(i + k) & 0x3F);
  }
  static constexpr uint32_t kSmallest[] = {0, 0, 0x80, 0x800, 0x10000};
  if (cp < kSmallest[length] || cp > 0x10FFFF) return 0;  // overlong or too large
  if (cp >= 0xD800 && cp <= 0xDFFF) return 0;             // surrogates
  if (cp == 0xFFFE || cp == 0xFFFF) return 0;             // not XML characters
  return length;
}

uint32_t code_point(const std::string& text, size_t i, size_t length) {
  uint32_t cp = static_cast<unsigned char>(text[i]) & (0x7F >> length);
  for (size_t k = 1; k < length; ++k)
    cp = (cp << 6) | (static_cast<unsigned char>(text[i + k]) & 0x3F);
  return cp;
}

// C1 controls and bidirectional overrides (terminal_text's list; the C0
// controls are handled by allowed_sequence).
bool is_invisible_control(const std::string& text, size_t i, size_t length) {
  return is_control_code_point(code_point(text, i, length));
}

std::string escape(const std::string& text, bool attribute) {
  std::string out;
  out.reserve(text.size());
  size_t i = 0;
  while (i < text.size()) {
    size_t length = allowed_sequence(text, i);
    if (length == 0) {
      out += kReplacement;
      ++i;
      continue;
    }
    char c = text[i];
    if (length > 1 && is_invisible_control(text, i, length)) {
      // C1 controls and bidirectional overrides: legal XML, but they act on
      // a terminal that shows the file and reorder what a reader sees.
      out += fmt::format("&#x{:x};", code_point(text, i, length));
    } else if (length > 1) {
      out.append(text, i, length);
    } else if (c == '&') {
      out += "&amp;";
    } else if (c == '<') {
      out += "&lt;";
    } else if (c == '>') {
      out += "&gt;";
    } else if (attribute && c == '"') {
      out += "&quot;";
    } else if (attribute && c == '\'') {
      out += "&apos;";
    } else if (attribute && (c == '\t' || c == '\n' || c == '\r')) {
      out += fmt::format("&#{};", static_cast<int>(c));
    } else if (!attribute && c == '\r') {
      out += "&#13;";  // a literal CR would be folded into a newline by the parser
    } else {
      out += c;
    }
    i += length;
  }
  return out;
}

}  // namespace

std::string xml_escape_text(const std::string& text) { return escape(text, false); }
std::string xml_escape_attribute(const std::string& text) { return escape(text, true); }

}  // namespace thetagate::engine
