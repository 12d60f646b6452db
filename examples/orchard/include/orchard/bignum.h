// orchard::mul_karatsuba: Karatsuba multiplication of digit vectors (least
// significant digit first). Its single-digit products are the claim
// "orchard::mul_karatsuba / digit products, documented constant"
// (claims/bignum.toml): T(n) = 3T(ceil(n/2)), T(1) = 1, exactly. The
// recursion works on digit polynomials (digits may exceed 9 until the final
// carry pass), so every half stays ceil(n/2) digits long.
#ifndef ORCHARD_BIGNUM_H_
#define ORCHARD_BIGNUM_H_

#include <cstddef>
#include <cstdint>
#include <functional>
#include <vector>

namespace orchard {

namespace detail {

// The 2n - 1 coefficients of a(x)·b(x). REQUIRES: a.size() == b.size() >= 1.
template <class Multiply>
std::vector<int64_t> karatsuba(const std::vector<int64_t>& a, const std::vector<int64_t>& b,
                               Multiply& multiply) {
  size_t n = a.size();
  if (n == 1) return {multiply(a[0], b[0])};
  size_t m = (n + 1) / 2;
  std::vector<int64_t> a0(a.begin(), a.begin() + m), b0(b.begin(), b.begin() + m);
  std::vector<int64_t> a1(a.begin() + m, a.end()), b1(b.begin() + m, b.end());
  a1.resize(m, 0);
  b1.resize(m, 0);
  std::vector<int64_t> sa(m), sb(m);
  for (size_t i = 0; i < m; ++i) {
    sa[i] = a0[i] + a1[i];
    sb[i] = b0[i] + b1[i];
  }
  std::vector<int64_t> low = karatsuba(a0, b0, multiply);
  std::vector<int64_t> high = karatsuba(a1, b1, multiply);
  std::vector<int64_t> mid = karatsuba(sa, sb, multiply);
  std::vector<int64_t> out(2 * n - 1, 0);
  for (size_t i = 0; i < low.size(); ++i) {
    out[i] += low[i];
    out[i + m] += mid[i] - low[i] - high[i];
  }
  // high has 2m - 1 coefficients, of which those past 2n - 2 - 2m are zero.
  for (size_t i = 0; i < high.size() && i + 2 * m < out.size(); ++i) out[i + 2 * m] += high[i];
  return out;
}

}  // namespace detail

// The product of two n-digit decimal numbers, least significant digit first,
// 2n digits. `multiply(x, y)` multiplies two digits (the counted operation).
// REQUIRES: a.size() == b.size() >= 1, every digit in 0..9.
template <class Multiply = std::multiplies<int64_t>>
std::vector<int> mul_karatsuba(const std::vector<int>& a, const std::vector<int>& b,
                               Multiply multiply = Multiply()) {
  std::vector<int64_t> a64(a.begin(), a.end()), b64(b.begin(), b.end());
  std::vector<int64_t> c = detail::karatsuba(a64, b64, multiply);
  std::vector<int> digits(2 * a.size(), 0);
  int64_t carry = 0;
  for (size_t i = 0; i < digits.size(); ++i) {
    int64_t v = carry + (i < c.size() ? c[i] : 0);
    digits[i] = static_cast<int>(v % 10);
    carry = v / 10;
  }
  return digits;
}

}  // namespace orchard

#endif  // ORCHARD_BIGNUM_H_
