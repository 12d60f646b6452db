#include "verifier/numbers/number.h"

#include <gmp.h>

namespace thetagate::engine {

uint64_t bit_length(const BigInt& x) {
  if (x == 0) return 0;
  return mpz_sizeinbase(x.backend().data(), 2);
}

BigInt floor_of(const Rational& x) {
  BigInt q;
  mpz_fdiv_q(q.backend().data(), mpq_numref(x.backend().data()), mpq_denref(x.backend().data()));
  return q;
}

BigInt ceil_of(const Rational& x) {
  BigInt q;
  mpz_cdiv_q(q.backend().data(), mpq_numref(x.backend().data()), mpq_denref(x.backend().data()));
  return q;
}

BigInt isqrt(const BigInt& x) {
  BigInt r;
  mpz_sqrt(r.backend().data(), x.backend().data());
  return r;
}

BigInt iroot(const BigInt& x, unsigned long k) {
  BigInt r;
  mpz_root(r.backend().data(), x.backend().data(), k);
  return r;
}

namespace {
// k with |v| == 2^k for a positive integer v, if any.
std::optional<int64_t> power_of_two_exponent(mpz_srcptr v) {
  if (mpz_sgn(v) <= 0) return std::nullopt;
  mp_bitcnt_t low = mpz_scan1(v, 0);
  if (mpz_sizeinbase(v, 2) != low + 1) return std::nullopt;
  return static_cast<int64_t>(low);
}
}  // namespace

std::optional<int64_t> exact_log2(const Rational& x) {
  auto num = power_of_two_exponent(mpq_numref(x.backend().data()));
  auto den = power_of_two_exponent(mpq_denref(x.backend().data()));
  if (!num || !den) return std::nullopt;
  return *num - *den;
}

BigInt floor_mod(const BigInt& x, const BigInt& m) {
  BigInt r;
  mpz_fdiv_r(r.backend().data(), x.backend().data(), m.backend().data());
  return r;
}

size_t BigIntHash::operator()(const BigInt& x) const noexcept {
  // Sizes the evaluator meets differ in their length or in their lowest and
  // highest limbs (neighbours differ by a few units), so three limbs hash
  // well and keep hashing O(1) for 4096-bit keys.
  mpz_srcptr v = x.backend().data();
  uint64_t h = static_cast<uint64_t>(static_cast<int64_t>(v->_mp_size));
  int limbs = v->_mp_size < 0 ? -v->_mp_size : v->_mp_size;
  auto mix = [&h](uint64_t limb) {
    h ^= limb + 0x9e3779b97f4a7c15ULL + (h << 6) + (h >> 2);
    h *= 0xbf58476d1ce4e5b9ULL;
  };
  if (limbs > 0) mix(v->_mp_d[0]);
  if (limbs > 1) mix(v->_mp_d[1]);
  if (limbs > 2) mix(v->_mp_d[limbs - 1]);
  return static_cast<size_t>(h ^ (h >> 31));
}

std::string to_string(const Rational& x) { return x.str(); }

}  // namespace thetagate::engine
