// Small helpers shared by tests.
#ifndef THETAGATE_TESTS_TEST_SUPPORT_H_
#define THETAGATE_TESTS_TEST_SUPPORT_H_

#include <gmp.h>

#include <cstddef>
#include <string>

namespace thetagate::engine::test_support {

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

#endif  // THETAGATE_TESTS_TEST_SUPPORT_H_
