// Exact number types shared by the whole engine.
#ifndef THETAGATE_VERIFIER_NUMBERS_NUMBER_H_
#define THETAGATE_VERIFIER_NUMBERS_NUMBER_H_

#include <boost/multiprecision/gmp.hpp>
#include <cstdint>
#include <optional>
#include <string>

namespace thetagate::engine {

// Arbitrary-precision integers and rationals (GMP through Boost.Multiprecision).
using BigInt = boost::multiprecision::mpz_int;
using Rational = boost::multiprecision::mpq_rational;

// Number of bits in |x| (0 for x == 0), like std::bit_width.
uint64_t bit_length(const BigInt& x);

// Floor and ceiling of a rational.
BigInt floor_of(const Rational& x);
BigInt ceil_of(const Rational& x);

// Integer square root: the largest r with r*r <= x. REQUIRES: x >= 0.
BigInt isqrt(const BigInt& x);

// Integer k-th root: the largest r with r^k <= x. REQUIRES: x >= 0, k >= 1.
BigInt iroot(const BigInt& x, unsigned long k);

// Exact k with x == 2^k if x is a (possibly negative-exponent) power of two.
std::optional<int64_t> exact_log2(const Rational& x);

// Mathematical floor-mod: x - m*floor(x/m); same sign as m. REQUIRES: m != 0.
BigInt floor_mod(const BigInt& x, const BigInt& m);

// Hash of a big integer, for unordered containers.
struct BigIntHash {
  size_t operator()(const BigInt& x) const noexcept;
};

// Decimal text of a rational: "p" or "p/q".
std::string to_string(const Rational& x);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_NUMBERS_NUMBER_H_
