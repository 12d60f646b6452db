#include "verifier/syntax/input_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

namespace thetagate::engine {

namespace {

[[noreturn]] void fail_file(const std::string& path, std::string message, std::string hint) {
  throw InputError(Diagnostic{Location{path, 1, 1}, std::move(message), std::move(hint), ""});
}

std::string size_text(size_t bytes) {
  return bytes % (size_t{1} << 20) == 0 ? std::to_string(bytes >> 20) + " MiB"
                                        : std::to_string(bytes) + " bytes";
}

}  // namespace

std::string read_input_file(const std::string& path, size_t max_bytes, const std::string& what,
                            const std::string& hint) {
  struct stat info;
  if (::stat(path.c_str(), &info) != 0) {
    int error = errno;
    fail_file(path, "cannot read the " + what + ": " + std::strerror(error), hint);
  }
  if (S_ISDIR(info.st_mode)) {
    fail_file(path, "'" + path + "' is a folder, not a " + what, hint);
  }
  if (!S_ISREG(info.st_mode)) {
    fail_file(path, "'" + path + "' is not a regular file (a pipe, socket or device)",
              "save the " + what + " to a file first and give its path");
  }
  if (static_cast<unsigned long long>(info.st_size) > max_bytes) {
    fail_file(path,
              "the " + what + " is too large: " + std::to_string(info.st_size) +
                  " bytes, the limit is " + size_text(max_bytes),
              "split it into several files");
  }
  // O_NONBLOCK: a file replaced by a FIFO after the check must not block.
  int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC | O_NONBLOCK);
  if (fd < 0) {
    int error = errno;
    fail_file(path, "cannot read the " + what + ": " + std::strerror(error), hint);
  }
  std::string text;
  char buffer[1 << 16];
  while (true) {
    ssize_t got = ::read(fd, buffer, sizeof buffer);
    if (got < 0 && errno == EINTR) continue;
    if (got < 0) {
      int error = errno;
      ::close(fd);
      fail_file(path, "cannot read the " + what + ": " + std::strerror(error), hint);
    }
    if (got == 0) break;
    text.append(buffer, static_cast<size_t>(got));
    if (text.size() > max_bytes) {
      ::close(fd);
      fail_file(path, "the " + what + " is too large: the limit is " + size_text(max_bytes),
                "split it into several files");
    }
  }
  ::close(fd);
  return text;
}

void check_toml_limits(const SourceText& toml) {
  const std::string& t = toml.text;
  // A "segment" runs between the characters that separate keys and values
  // (= , [ ] { } and line breaks); a dotted key is one segment, and so is a
  // number or date, which holds at most one dot. Brackets and braces
  // outside strings and comments count nesting.
  int dots = 0;
  int nesting = 0;
  size_t i = 0;
  while (i < t.size()) {
    char c = t[i];
    if (c == '#') {
      while (i < t.size() && t[i] != '\n') ++i;
      continue;
    }
    if (c == '"' || c == '\'') {
      bool triple = t.compare(i, 3, std::string(3, c)) == 0;
      i += triple ? 3 : 1;
      while (i < t.size()) {
        if (c == '"' && t[i] == '\\') {
          i += 2;
          continue;
        }
        if (!triple && t[i] == '\n') break;  // toml++ reports the unclosed string
        if (t[i] == c && (!triple || t.compare(i, 3, std::string(3, c)) == 0)) {
          i += triple ? 3 : 1;
          // A multi-line string may end in up to two more quotes.
          for (int extra = 0; triple && extra < 2 && i < t.size() && t[i] == c; ++extra) ++i;
          break;
        }
        ++i;
      }
      continue;
    }
    switch (c) {
      case '.':
        if (++dots >= kMaxTomlKeyParts) {
          fail_at(toml, i,
                  "a dotted key has more than " + std::to_string(kMaxTomlKeyParts) + " parts",
                  "the keys of a claim file have one or two parts, such as sizes.max_bits");
        }
        break;
      case '[':
      case '{':
        dots = 0;
        if (++nesting > kMaxTomlNesting) {
          fail_at(toml, i,
                  "arrays and tables are nested more than " + std::to_string(kMaxTomlNesting) +
                      " levels deep",
                  "claim files nest at most a few levels: [[claim]], sizes = { ... }");
        }
        break;
      case ']':
      case '}':
        dots = 0;
        if (nesting > 0) --nesting;
        break;
      case '=':
      case ',':
      case '\n':
        dots = 0;
        break;
      default:
        break;
    }
    ++i;
  }
}

}  // namespace thetagate::engine
