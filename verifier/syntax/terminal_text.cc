#include "verifier/syntax/terminal_text.h"

#include <cstddef>
#include <cstdint>

namespace thetagate::engine {

namespace {

const char* const kHex = "0123456789abcdef";

void append_byte_escape(std::string& out, unsigned char c) {
  out += "\\x";
  out += kHex[c >> 4];
  out += kHex[c & 15];
}

void append_code_point_escape(std::string& out, uint32_t cp) {
  out += "\\u";
  for (int shift = 12; shift >= 0; shift -= 4) out += kHex[(cp >> shift) & 15];
}

// The length of the well-formed UTF-8 sequence at s[i] (1..4) and its code
// point, or 0 when the bytes there are not UTF-8 (a stray continuation byte,
// a truncated or overlong sequence, a surrogate, past U+10FFFF).
size_t utf8_sequence(const std::string& s, size_t i, uint32_t& cp) {
  auto byte = [&](size_t k) { return static_cast<unsigned char>(s[k]); };
  unsigned char lead = byte(i);
  if (lead < 0x80) {
    cp = lead;
    return 1;
  }
  size_t length = lead >= 0xF0 ? 4 : lead >= 0xE0 ? 3 : lead >= 0xC0 ? 2 : 0;
  if (length == 0 || lead > 0xF4 || i + length > s.size()) return 0;
  cp = lead & (0x7F >> length);
  for (size_t k = 1; k < length; ++k) {
    if ((byte(i + k) & 0xC0) != 0x80) return 0;
    cp = (cp << 6) | (byte(i + k) & 0x3F);
  }
  static constexpr uint32_t kSmallest[] = {0, 0, 0x80, 0x800, 0x10000};
  if (cp < kSmallest[length] || cp > 0x10FFFF) return 0;
  if (cp >= 0xD800 && cp <= 0xDFFF) return 0;
  return length;
}

// The length of a colour sequence ESC [ (digits | ;)* m at s[i], or 0.
size_t colour_sequence(const std::string& s, size_t i) {
  if (i + 2 >= s.size() || s[i] != '\x1b' || s[i + 1] != '[') return 0;
  size_t k = i + 2;
  while (k < s.size() && ((s[k] >= '0' && s[k] <= '9') || s[k] == ';') && k - i < 16) ++k;
  return k < s.size() && s[k] == 'm' ? k + 1 - i : 0;
}

std::string escape(const std::string& s, bool keep_lines, bool keep_colour) {
  std::string out;
  out.reserve(s.size());
  size_t i = 0;
  while (i < s.size()) {
    if (keep_colour) {
      if (size_t colour = colour_sequence(s, i); colour > 0) {
        out.append(s, i, colour);
        i += colour;
        continue;
      }
    }
    uint32_t cp = 0;
    size_t length = utf8_sequence(s, i, cp);
    if (length == 0) {
      append_byte_escape(out, static_cast<unsigned char>(s[i]));
      ++i;
      continue;
    }
    if (keep_lines && (cp == '\n' || cp == '\t')) {
      out += static_cast<char>(cp);
    } else if (!is_control_code_point(cp)) {
      out.append(s, i, length);
    } else if (cp < 0x80) {
      append_byte_escape(out, static_cast<unsigned char>(cp));
    } else {
      append_code_point_escape(out, cp);
    }
    i += length;
  }
  return out;
}

}  // namespace

bool is_control_code_point(uint32_t cp) {
  return cp < 0x20 || cp == 0x7F || (cp >= 0x80 && cp <= 0x9F) || (cp >= 0x202A && cp <= 0x202E) ||
         (cp >= 0x2066 && cp <= 0x2069);
}

std::string escape_controls(const std::string& s) {
  if (is_plain_text(s)) return s;
  return escape(s, /*keep_lines=*/false, /*keep_colour=*/false);
}

std::string terminal_safe(const std::string& text, bool keep_colour) {
  return escape(text, /*keep_lines=*/true, keep_colour);
}

std::string masked_line(const std::string& line) {
  std::string out;
  out.reserve(line.size());
  size_t i = 0;
  while (i < line.size()) {
    uint32_t cp = 0;
    size_t length = utf8_sequence(line, i, cp);
    if (length == 0) {
      out += '?';
      ++i;
      continue;
    }
    if (cp != '\t' && is_control_code_point(cp)) {
      out += '?';
    } else {
      out.append(line, i, length);
    }
    i += length;
  }
  return out;
}

std::string json_escape_controls(const std::string& json) {
  std::string out;
  out.reserve(json.size());
  size_t i = 0;
  while (i < json.size()) {
    uint32_t cp = 0;
    size_t length = utf8_sequence(json, i, cp);
    if (length > 1 && is_control_code_point(cp)) {
      append_code_point_escape(out, cp);
    } else {
      out.append(json, i, length == 0 ? 1 : length);
    }
    i += length == 0 ? 1 : length;
  }
  return out;
}

bool is_plain_text(const std::string& s) {
  size_t i = 0;
  while (i < s.size()) {
    uint32_t cp = 0;
    size_t length = utf8_sequence(s, i, cp);
    if (length == 0 || is_control_code_point(cp)) return false;
    i += length;
  }
  return true;
}

}  // namespace thetagate::engine
