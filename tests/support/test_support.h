// Small helpers shared by tests.
#ifndef THETAGATE_TESTS_SUPPORT_TEST_SUPPORT_H_
#define THETAGATE_TESTS_SUPPORT_TEST_SUPPORT_H_

#include <gmp.h>
#include <sys/wait.h>

#include <cstddef>
#include <cstdio>
#include <string>

namespace thetagate::engine::test_support {

// What a shell command printed (stdout and stderr together) and its exit status
// (-1 when it did not exit normally).
struct CommandResult {
  int status = -1;
  std::string out;
};

// Runs `command` through the shell, capturing both output streams.
inline CommandResult run_shell(const std::string& command) {
  CommandResult r;
  FILE* pipe = popen((command + " 2>&1").c_str(), "r");
  if (pipe == nullptr) return r;
  char buffer[4096];
  size_t got;
  while ((got = fread(buffer, 1, sizeof buffer, pipe)) > 0) r.out.append(buffer, got);
  int raw = pclose(pipe);
  r.status = WIFEXITED(raw) ? WEXITSTATUS(raw) : -1;
  return r;
}

#ifdef THETAGATE_BINARY
// Runs a shell command line in which "$TG" names the thetagate binary.
inline CommandResult run_thetagate_shell(const std::string& line) {
  return run_shell("TG='" + std::string(THETAGATE_BINARY) + "'; " + line);
}
#endif

// A plain GMP integer, independent of Boost.Multiprecision, so tests can
// compare the engine against the reference library directly.
class Mpz {
 public:
  Mpz() { mpz_init(v_); }
  explicit Mpz(const std::string& decimal) { mpz_init_set_str(v_, decimal.c_str(), 10); }
  Mpz(const Mpz& o) { mpz_init_set(v_, o.v_); }
  Mpz& operator=(const Mpz& o) {
    mpz_set(v_, o.v_);
    return *this;
  }
  ~Mpz() { mpz_clear(v_); }
  mpz_ptr get() { return v_; }
  mpz_srcptr get() const { return v_; }
  std::string str() const {
    std::string out(mpz_sizeinbase(v_, 10) + 2, '\0');
    mpz_get_str(out.data(), 10, v_);
    out.resize(std::char_traits<char>::length(out.c_str()));
    return out;
  }

 private:
  mpz_t v_;
};

// Occurrences of `needle` in `text` (overlapping ones count).
inline size_t count_of(const std::string& text, const std::string& needle) {
  size_t count = 0;
  for (size_t at = text.find(needle); at != std::string::npos; at = text.find(needle, at + 1)) {
    ++count;
  }
  return count;
}

}  // namespace thetagate::engine::test_support

#endif  // THETAGATE_TESTS_SUPPORT_TEST_SUPPORT_H_
