#include "verifier/numbers/value.h"

#include <gmp.h>
#include <mpfr.h>

#include <cmath>
#include <limits>

namespace thetagate::engine {

namespace {

// MPFR's default exponent range stops near 2^(2^30); values such as 1.5^n at
// n = 2^40 need the widest range. Set once, before any thread starts.
const bool kWideExponentRange = [] {
  mpfr_set_emax(mpfr_get_emax_max());
  mpfr_set_emin(mpfr_get_emin_min());
  return true;
}();

Value normalized(BigInt x) {
  if (mpz_fits_slong_p(x.backend().data()))
    return Value(static_cast<int64_t>(mpz_get_si(x.backend().data())));
  return Value(std::move(x));
}

Value normalized(Rational x) {
  if (mpz_cmp_ui(mpq_denref(x.backend().data()), 1) == 0) {
    BigInt numerator;
    mpz_swap(numerator.backend().data(), mpq_numref(x.backend().data()));
    return normalized(std::move(numerator));
  }
  return Value(std::move(x));
}

// Bits of |x| for a machine integer, like bit_length().
uint64_t small_bit_length(int64_t x) {
  uint64_t magnitude = x < 0 ? uint64_t{0} - static_cast<uint64_t>(x) : static_cast<uint64_t>(x);
  return magnitude == 0 ? 0 : 64 - static_cast<uint64_t>(__builtin_clzll(magnitude));
}

uint64_t mpz_bits(mpz_srcptr z) { return mpz_sgn(z) == 0 ? 0 : mpz_sizeinbase(z, 2); }

// r = big + s and r = big - s for a machine integer s, without a scratch mpz.
void add_small(mpz_ptr r, mpz_srcptr big, int64_t s) {
  if (s >= 0)
    mpz_add_ui(r, big, static_cast<unsigned long>(s));
  else
    mpz_sub_ui(r, big, static_cast<unsigned long>(uint64_t{0} - static_cast<uint64_t>(s)));
}
void sub_small(mpz_ptr r, mpz_srcptr big, int64_t s) {
  if (s >= 0)
    mpz_sub_ui(r, big, static_cast<unsigned long>(s));
  else
    mpz_add_ui(r, big, static_cast<unsigned long>(uint64_t{0} - static_cast<uint64_t>(s)));
}
// r = s - big.
void small_sub(mpz_ptr r, int64_t s, mpz_srcptr big) {
  if (s >= 0) {
    mpz_ui_sub(r, static_cast<unsigned long>(s), big);
  } else {
    mpz_add_ui(r, big, static_cast<unsigned long>(uint64_t{0} - static_cast<uint64_t>(s)));
    mpz_neg(r, r);
  }
}

uint64_t rational_bits(const Rational& x) {
  return std::max(mpz_bits(mpq_numref(x.backend().data())),
                  mpz_bits(mpq_denref(x.backend().data())));
}

Value checked(BigInt x, const NumericContext& ctx) {
  check_bits(bit_length(x), ctx);
  return normalized(std::move(x));
}

Value checked(Rational x, const NumericContext& ctx) {
  check_bits(rational_bits(x), ctx);
  return normalized(std::move(x));
}

Value checked(Interval x) {
  if (mpfi_nan_p(x.raw())) throw DomainError("the result is not a real number");
  if (mpfi_inf_p(x.raw())) {
    throw BudgetExceeded(Limit::kValueSize,
                         "a value is too large even for an interval's exponent range");
  }
  return Value(std::move(x));
}

// Integer operands without copies: a big operand by pointer, a machine one
// by value. REQUIRES: v.is_integer().
struct IntegerOperand {
  const BigInt* big = nullptr;
  int64_t small = 0;
  BigInt scratch;  // a whole rational's numerator
  explicit IntegerOperand(const Value& v) {
    if (auto s = v.small())
      small = *s;
    else
      big = &v.integer_ref(scratch);
  }
  mpz_srcptr big_data() const { return big->backend().data(); }
};

bool both_small(const Value& a, const Value& b, int64_t& x, int64_t& y) {
  auto sa = a.small();
  auto sb = b.small();
  if (!sa || !sb) return false;
  x = *sa;
  y = *sb;
  return true;
}

long precision_for(const Value& a, const Value& b, const NumericContext& ctx) {
  long p = ctx.precision_bits;
  if (!a.is_exact()) p = std::max(p, a.as_interval().precision());
  if (!b.is_exact()) p = std::max(p, b.as_interval().precision());
  return p;
}

// Exact q-th root of a non-negative rational, if it is rational.
std::optional<Rational> exact_root(const Rational& x, unsigned long q) {
  BigInt num = boost::multiprecision::numerator(x);
  BigInt den = boost::multiprecision::denominator(x);
  if (num < 0) return std::nullopt;
  BigInt rn = iroot(num, q);
  BigInt rd = iroot(den, q);
  BigInt check_n, check_d;
  mpz_pow_ui(check_n.backend().data(), rn.backend().data(), q);
  mpz_pow_ui(check_d.backend().data(), rd.backend().data(), q);
  if (check_n != num || check_d != den) return std::nullopt;
  return Rational(rn, rd);
}

Value exact_integer_power(const Rational& base, const BigInt& k, const NumericContext& ctx) {
  if (base == 0) {
    if (k < 0) throw DomainError("0 raised to a negative power");
    return Value(int64_t{k == 0 ? 1 : 0});
  }
  if (base == 1) return Value(int64_t{1});
  if (base == -1) return Value(int64_t{mpz_even_p(k.backend().data()) ? 1 : -1});
  BigInt magnitude = k < 0 ? BigInt(-k) : k;
  uint64_t base_bits = rational_bits(base);
  // Estimate before computing: a huge power is a budget error, not an OOM.
  if (bit_length(magnitude) > 40) check_bits(ctx.max_value_bits + 1, ctx);
  uint64_t estimate = (base_bits > 1 ? base_bits - 1 : 1) * static_cast<uint64_t>(magnitude);
  check_bits(estimate, ctx);
  unsigned long e = static_cast<unsigned long>(magnitude);
  BigInt num = boost::multiprecision::numerator(base);
  BigInt den = boost::multiprecision::denominator(base);
  BigInt pn, pd;
  mpz_pow_ui(pn.backend().data(), num.backend().data(), e);
  mpz_pow_ui(pd.backend().data(), den.backend().data(), e);
  Rational result = k < 0 ? Rational(pd, pn) : Rational(pn, pd);
  return checked(result, ctx);
}

Interval interval_integer_power(const Interval& base, const BigInt& k) {
  if (bit_length(k < 0 ? BigInt(-k) : k) <= 20) {
    long e = static_cast<long>(k < 0 ? BigInt(-k) : k);
    Interval result(Rational(1), base.precision());
    Interval square = base;
    while (e > 0) {
      if (e & 1) result = result * square;
      e >>= 1;
      if (e > 0) square = square * square;
    }
    if (k < 0) {
      if (result.contains_zero()) throw PrecisionShortfall("power of an interval near zero");
      result = Interval(Rational(1), base.precision()) / result;
    }
    return result;
  }
  if (!base.certainly_positive()) throw DomainError("a huge power of a value that is not positive");
  return base.pow(Interval(k, base.precision()));
}

}  // namespace

void check_bits(uint64_t bits, const NumericContext& ctx) {
  if (bits > ctx.max_value_bits) {
    throw BudgetExceeded(Limit::kValueSize, "a value would need " + std::to_string(bits) +
                                                " bits, over the budget of " +
                                                std::to_string(ctx.max_value_bits) +
                                                " bits per value");
  }
}

Value::Value(const BigInt& x) : repr_(std::make_shared<BigInt>(x)) {}
Value::Value(BigInt&& x) : repr_(std::make_shared<BigInt>(std::move(x))) {}
Value::Value(const Rational& x) : repr_(std::make_shared<const Rational>(x)) {}
Value::Value(Rational&& x) : repr_(std::make_shared<const Rational>(std::move(x))) {}
Value::Value(Interval x) : repr_(std::make_shared<const Interval>(std::move(x))) {}

bool Value::is_integer() const {
  if (std::holds_alternative<int64_t>(repr_) || std::holds_alternative<BigIntPtr>(repr_))
    return true;
  if (const Rational* q = rational()) return mpz_cmp_ui(mpq_denref(q->backend().data()), 1) == 0;
  return false;
}

Rational Value::exact() const {
  if (auto* s = std::get_if<int64_t>(&repr_)) return Rational(*s);
  if (const BigInt* b = big_integer()) return Rational(*b);
  return *rational();
}

BigInt Value::integer() const {
  if (auto* s = std::get_if<int64_t>(&repr_)) return BigInt(*s);
  if (const BigInt* b = big_integer()) return *b;
  return boost::multiprecision::numerator(*rational());
}

const BigInt& Value::integer_ref(BigInt& scratch) const {
  if (const BigInt* b = big_integer()) return *b;
  scratch = integer();
  return scratch;
}

Interval Value::interval(long precision_bits) const {
  if (auto* s = std::get_if<int64_t>(&repr_)) return Interval(BigInt(*s), precision_bits);
  if (const BigInt* b = big_integer()) return Interval(*b, precision_bits);
  if (const Rational* q = rational()) return Interval(*q, precision_bits);
  const Interval& i = *interval_ptr();
  if (i.precision() >= precision_bits) return i;
  Interval wider(precision_bits);
  mpfi_set(wider.raw(), i.raw());
  return wider;
}

int Value::sign() const {
  if (auto* s = std::get_if<int64_t>(&repr_)) return (*s > 0) - (*s < 0);
  if (const BigInt* b = big_integer()) return b->sign();
  if (const Rational* q = rational()) return q->sign();
  const Interval& i = *interval_ptr();
  if (i.certainly_positive()) return 1;
  if (i.certainly_negative()) return -1;
  if (mpfi_is_zero(i.raw())) return 0;
  throw PrecisionShortfall("the sign of an interval around zero");
}

double Value::approx() const {
  if (auto* s = std::get_if<int64_t>(&repr_)) return static_cast<double>(*s);
  if (const BigInt* b = big_integer()) return mpz_get_d(b->backend().data());
  if (const Rational* q = rational()) return mpq_get_d(q->backend().data());
  return interval_ptr()->approx();
}

double Value::log2_magnitude() const {
  auto log2_of_integer = [](mpz_srcptr z) {
    if (mpz_sgn(z) == 0) return -std::numeric_limits<double>::infinity();
    long exponent = 0;
    double mantissa = std::fabs(mpz_get_d_2exp(&exponent, z));
    return std::log2(mantissa) + static_cast<double>(exponent);
  };
  if (auto* s = std::get_if<int64_t>(&repr_)) {
    return *s == 0 ? -std::numeric_limits<double>::infinity()
                   : std::log2(std::fabs(static_cast<double>(*s)));
  }
  if (const BigInt* b = big_integer()) return log2_of_integer(b->backend().data());
  if (const Rational* q = rational()) {
    return log2_of_integer(mpq_numref(q->backend().data())) -
           log2_of_integer(mpq_denref(q->backend().data()));
  }
  const Interval& i = *interval_ptr();
  mpfr_t mid;
  mpfr_init2(mid, i.precision());
  mpfi_mid(mid, i.raw());
  double result;
  if (mpfr_zero_p(mid)) {
    result = -std::numeric_limits<double>::infinity();
  } else {
    long exponent = 0;
    double mantissa = std::fabs(mpfr_get_d_2exp(&exponent, mid, MPFR_RNDN));
    result = std::log2(mantissa) + static_cast<double>(exponent);
  }
  mpfr_clear(mid);
  return result;
}

uint64_t Value::magnitude_bits() const {
  if (auto* s = std::get_if<int64_t>(&repr_)) return small_bit_length(*s);
  if (const BigInt* b = big_integer()) return bit_length(*b);
  if (const Rational* q = rational()) return bit_length(floor_of(abs(*q)));
  const Interval& i = *interval_ptr();
  mpfr_srcptr hi = &i.raw()->right;
  if (mpfr_zero_p(hi) || mpfr_get_exp(hi) <= 0) return 0;
  return static_cast<uint64_t>(mpfr_get_exp(hi));
}

std::string Value::str() const {
  if (auto* s = std::get_if<int64_t>(&repr_)) return std::to_string(*s);
  if (const BigInt* b = big_integer()) return b->str();
  if (const Rational* q = rational()) return to_string(*q);
  return interval_ptr()->str();
}

bool Value::same_exact(const Value& other) const {
  if (!is_exact() || !other.is_exact()) return false;
  if (is_integer() && other.is_integer()) {
    IntegerOperand a(*this), b(other);
    if (!a.big && !b.big) return a.small == b.small;
    if (a.big && b.big) return mpz_cmp(a.big_data(), b.big_data()) == 0;
    return a.big ? mpz_cmp_si(a.big_data(), b.small) == 0 : mpz_cmp_si(b.big_data(), a.small) == 0;
  }
  return exact() == other.exact();
}

Value canonical_integer(BigInt&& x) { return normalized(std::move(x)); }

Value canonical_integer(const Value& v) {
  if (v.small()) return v;
  if (const BigInt* b = v.big_integer()) {
    if (mpz_fits_slong_p(b->backend().data()))
      return Value(static_cast<int64_t>(mpz_get_si(b->backend().data())));
    return v;
  }
  return normalized(v.integer());
}

bool same_integer(const Value& a, const Value& b) {
  auto sa = a.small();
  auto sb = b.small();
  if (sa || sb) return sa && sb && *sa == *sb;
  return mpz_cmp(a.big_integer()->backend().data(), b.big_integer()->backend().data()) == 0;
}

size_t IntegerValueHash::operator()(const Value& v) const {
  if (auto s = v.small()) {
    uint64_t h = static_cast<uint64_t>(*s) * 0x9e3779b97f4a7c15ULL;
    return static_cast<size_t>(h ^ (h >> 29));
  }
  return BigIntHash()(*v.big_integer());
}

bool equals_integer(const Value& v, const BigInt& x) {
  if (auto s = v.small()) return mpz_cmp_si(x.backend().data(), *s) == 0;
  if (const BigInt* b = v.big_integer())
    return mpz_cmp(b->backend().data(), x.backend().data()) == 0;
  return v.integer() == x;
}

Value add(const Value& a, const Value& b, const NumericContext& ctx) {
  int64_t x, y, r;
  if (both_small(a, b, x, y) && !__builtin_add_overflow(x, y, &r)) return Value(r);
  if (a.is_integer() && b.is_integer()) {
    IntegerOperand p(a), q(b);
    BigInt r;
    mpz_ptr out = r.backend().data();
    if (p.big && q.big)
      mpz_add(out, p.big_data(), q.big_data());
    else if (p.big)
      add_small(out, p.big_data(), q.small);
    else if (q.big)
      add_small(out, q.big_data(), p.small);
    else
      add_small(out, BigInt(p.small).backend().data(), q.small);  // int64 overflow
    return checked(std::move(r), ctx);
  }
  if (a.is_exact() && b.is_exact()) return checked(Rational(a.exact() + b.exact()), ctx);
  long p = precision_for(a, b, ctx);
  return checked(a.interval(p) + b.interval(p));
}

// Access to a Value's storage for the in-place operations.
struct ValueOps {
  // The big integer of a value that alone owns it, else null.
  static BigInt* unique_big(Value& v) {
    auto* p = std::get_if<Value::BigIntPtr>(&v.repr_);
    return p && p->use_count() == 1 ? p->get() : nullptr;
  }
  // `v` after its big integer was changed in place: what checked() gives.
  static Value finish(Value&& v, const NumericContext& ctx) {
    mpz_srcptr z = std::get<Value::BigIntPtr>(v.repr_)->backend().data();
    check_bits(mpz_bits(z), ctx);
    if (mpz_fits_slong_p(z)) return Value(static_cast<int64_t>(mpz_get_si(z)));
    return std::move(v);
  }
};

Value add(Value&& a, Value&& b, const NumericContext& ctx) {
  if (!a.small() || !b.small()) {
    if (BigInt* t = ValueOps::unique_big(a); t && b.is_integer()) {
      mpz_ptr out = t->backend().data();
      if (auto y = b.small())
        add_small(out, out, *y);
      else {
        BigInt scratch;
        mpz_add(out, out, b.integer_ref(scratch).backend().data());
      }
      return ValueOps::finish(std::move(a), ctx);
    }
    if (BigInt* t = ValueOps::unique_big(b); t && a.is_integer()) {
      mpz_ptr out = t->backend().data();
      if (auto x = a.small())
        add_small(out, out, *x);
      else {
        BigInt scratch;
        mpz_add(out, a.integer_ref(scratch).backend().data(), out);
      }
      return ValueOps::finish(std::move(b), ctx);
    }
  }
  return add(static_cast<const Value&>(a), static_cast<const Value&>(b), ctx);
}

Value sub(Value&& a, Value&& b, const NumericContext& ctx) {
  if (!a.small() || !b.small()) {
    if (BigInt* t = ValueOps::unique_big(a); t && b.is_integer()) {
      mpz_ptr out = t->backend().data();
      if (auto y = b.small())
        sub_small(out, out, *y);
      else {
        BigInt scratch;
        mpz_sub(out, out, b.integer_ref(scratch).backend().data());
      }
      return ValueOps::finish(std::move(a), ctx);
    }
    if (BigInt* t = ValueOps::unique_big(b); t && a.is_integer()) {
      mpz_ptr out = t->backend().data();
      if (auto x = a.small())
        small_sub(out, *x, out);
      else {
        BigInt scratch;
        mpz_sub(out, a.integer_ref(scratch).backend().data(), out);
      }
      return ValueOps::finish(std::move(b), ctx);
    }
  }
  return sub(static_cast<const Value&>(a), static_cast<const Value&>(b), ctx);
}

Value sub(const Value& a, const Value& b, const NumericContext& ctx) {
  int64_t x, y, r;
  if (both_small(a, b, x, y) && !__builtin_sub_overflow(x, y, &r)) return Value(r);
  if (a.is_integer() && b.is_integer()) {
    IntegerOperand p(a), q(b);
    BigInt r;
    mpz_ptr out = r.backend().data();
    if (p.big && q.big)
      mpz_sub(out, p.big_data(), q.big_data());
    else if (p.big)
      sub_small(out, p.big_data(), q.small);
    else if (q.big)
      small_sub(out, p.small, q.big_data());
    else
      sub_small(out, BigInt(p.small).backend().data(), q.small);  // int64 overflow
    return checked(std::move(r), ctx);
  }
  if (a.is_exact() && b.is_exact()) return checked(Rational(a.exact() - b.exact()), ctx);
  long p = precision_for(a, b, ctx);
  return checked(a.interval(p) - b.interval(p));
}

Value mul(const Value& a, const Value& b, const NumericContext& ctx) {
  int64_t x, y, r;
  if (both_small(a, b, x, y) && !__builtin_mul_overflow(x, y, &r)) return Value(r);
  if (a.is_exact() && a.sign() == 0) return Value(int64_t{0});
  if (b.is_exact() && b.sign() == 0) return Value(int64_t{0});
  if (a.is_integer() && b.is_integer()) {
    check_bits(a.magnitude_bits() + b.magnitude_bits(), ctx);
    IntegerOperand p(a), q(b);
    BigInt r;
    mpz_ptr out = r.backend().data();
    if (p.big && q.big)
      mpz_mul(out, p.big_data(), q.big_data());
    else if (p.big)
      mpz_mul_si(out, p.big_data(), static_cast<long>(q.small));
    else if (q.big)
      mpz_mul_si(out, q.big_data(), static_cast<long>(p.small));
    else
      mpz_mul_si(out, BigInt(p.small).backend().data(), static_cast<long>(q.small));
    return checked(std::move(r), ctx);
  }
  if (a.is_exact() && b.is_exact()) return checked(Rational(a.exact() * b.exact()), ctx);
  long p = precision_for(a, b, ctx);
  return checked(a.interval(p) * b.interval(p));
}

Value div(const Value& a, const Value& b, const NumericContext& ctx) {
  if (b.is_exact()) {
    if (b.sign() == 0) throw DomainError("division by zero");
    int64_t x, y;
    if (both_small(a, b, x, y) && y != -1 && x % y == 0) return Value(x / y);
    if (a.is_integer() && b.is_integer()) {
      BigInt sp, sq;
      const BigInt& p = a.integer_ref(sp);
      const BigInt& q = b.integer_ref(sq);
      if (mpz_divisible_p(p.backend().data(), q.backend().data())) {
        BigInt r;
        mpz_divexact(r.backend().data(), p.backend().data(), q.backend().data());
        return normalized(std::move(r));
      }
      return checked(Rational(p, q), ctx);
    }
    if (a.is_exact()) return checked(Rational(a.exact() / b.exact()), ctx);
  }
  long p = precision_for(a, b, ctx);
  Interval divisor = b.interval(p);
  if (divisor.contains_zero()) throw PrecisionShortfall("division by an interval around zero");
  return checked(a.interval(p) / divisor);
}

Value neg(const Value& a) {
  if (auto s = a.small(); s && *s != std::numeric_limits<int64_t>::min()) return Value(-*s);
  if (a.is_integer()) return normalized(BigInt(-a.integer()));
  if (a.is_exact()) return normalized(Rational(-a.exact()));
  return Value(-a.as_interval());
}

Value power(const Value& base, const Value& exponent, const NumericContext& ctx) {
  if (exponent.is_integer()) {
    BigInt k = exponent.integer();
    if (base.is_exact()) return exact_integer_power(base.exact(), k, ctx);
    return checked(interval_integer_power(base.as_interval(), k));
  }
  long p = precision_for(base, exponent, ctx);
  if (base.is_exact() && exponent.is_exact()) {
    Rational b = base.exact();
    Rational y = exponent.exact();
    if (b < 0) throw DomainError("a negative number raised to a fractional power");
    if (b == 0) {
      if (y < 0) throw DomainError("0 raised to a negative power");
      return Value(int64_t{0});
    }
    BigInt q = boost::multiprecision::denominator(y);
    if (bit_length(q) <= 20) {
      if (auto root = exact_root(b, static_cast<unsigned long>(q))) {
        return exact_integer_power(*root, boost::multiprecision::numerator(y), ctx);
      }
    }
  }
  if (base.is_exact() && base.exact() == 0) {
    if (exponent.sign() > 0) return Value(int64_t{0});
    throw DomainError("0 raised to a power that is not positive");
  }
  Interval b = base.interval(p);
  if (!b.certainly_positive()) {
    if (b.certainly_negative()) throw DomainError("a negative number raised to a fractional power");
    throw PrecisionShortfall("power of an interval around zero");
  }
  return checked(b.pow(exponent.interval(p)));
}

namespace {
// floor(a/b) or ceil(a/b) of integers. A positive machine divisor divides
// without a scratch mpz; a power of two is a shift.
Value rounded_quotient(const Value& a, const Value& b, bool ceiling) {
  BigInt q;
  mpz_ptr out = q.backend().data();
  auto divisor = b.small();
  if (divisor && *divisor > 0 && a.big_integer()) {
    mpz_srcptr p = a.big_integer()->backend().data();
    auto d = static_cast<unsigned long>(*divisor);
    if ((d & (d - 1)) == 0) {
      auto shift = static_cast<mp_bitcnt_t>(__builtin_ctzl(d));
      if (ceiling)
        mpz_cdiv_q_2exp(out, p, shift);
      else
        mpz_fdiv_q_2exp(out, p, shift);
    } else if (ceiling) {
      mpz_cdiv_q_ui(out, p, d);
    } else {
      mpz_fdiv_q_ui(out, p, d);
    }
    return normalized(std::move(q));
  }
  BigInt sp, sd;
  const BigInt& p = a.integer_ref(sp);
  const BigInt& d = b.integer_ref(sd);
  if (d == 0) throw DomainError("division by zero");
  if (ceiling)
    mpz_cdiv_q(out, p.backend().data(), d.backend().data());
  else
    mpz_fdiv_q(out, p.backend().data(), d.backend().data());
  return normalized(std::move(q));
}
}  // namespace

Value floor_quotient(const Value& a, const Value& b, const NumericContext& ctx) {
  if (a.is_integer() && b.is_integer()) {
    int64_t x, y;
    if (both_small(a, b, x, y) && y != 0 && y != -1) {
      int64_t q = x / y;
      if ((x % y != 0) && ((x < 0) != (y < 0))) --q;
      return Value(q);
    }
    return rounded_quotient(a, b, /*ceiling=*/false);
  }
  return floor_value(div(a, b, ctx));
}

Value ceil_quotient(const Value& a, const Value& b, const NumericContext& ctx) {
  if (a.is_integer() && b.is_integer()) {
    int64_t x, y;
    if (both_small(a, b, x, y) && y != 0 && y != -1) {
      int64_t q = x / y;
      if ((x % y != 0) && ((x < 0) == (y < 0))) ++q;
      return Value(q);
    }
    return rounded_quotient(a, b, /*ceiling=*/true);
  }
  return ceil_value(div(a, b, ctx));
}

Value floor_value(const Value& a) {
  if (a.is_integer()) return a;
  if (a.is_exact()) return normalized(floor_of(a.exact()));
  auto f = a.as_interval().common_floor();
  if (!f) throw PrecisionShortfall("floor of an interval that straddles an integer");
  return normalized(*f);
}

Value ceil_value(const Value& a) {
  if (a.is_integer()) return a;
  if (a.is_exact()) return normalized(ceil_of(a.exact()));
  auto c = a.as_interval().common_ceil();
  if (!c) throw PrecisionShortfall("ceiling of an interval that straddles an integer");
  return normalized(*c);
}

namespace {
Interval positive_interval(const Value& a, long p, const char* what) {
  if (a.is_exact() && a.sign() <= 0)
    throw DomainError(std::string(what) + " of a number that is not positive");
  Interval x = a.interval(p);
  if (!x.certainly_positive()) {
    if (!mpfi_is_strictly_pos(x.raw()) && mpfr_sgn(&x.raw()->right) <= 0) {
      throw DomainError(std::string(what) + " of a number that is not positive");
    }
    throw PrecisionShortfall(std::string(what) + " of an interval around zero");
  }
  return x;
}
}  // namespace

Value lg_value(const Value& a, const NumericContext& ctx) {
  if (const BigInt* b = a.big_integer(); b && b->sign() > 0) {
    // lg of a big size: exact only for a power of two (no rational copy).
    mpz_srcptr z = b->backend().data();
    mp_bitcnt_t low = mpz_scan1(z, 0);
    if (mpz_sizeinbase(z, 2) == low + 1) return Value(static_cast<int64_t>(low));
    return checked(positive_interval(a, ctx.precision_bits, "lg").log2());
  }
  if (a.is_exact()) {
    if (a.exact() <= 0) throw DomainError("lg of a number that is not positive");
    if (auto k = exact_log2(a.exact())) return Value(*k);
  }
  long p = std::max(ctx.precision_bits, a.is_exact() ? 0L : a.as_interval().precision());
  return checked(positive_interval(a, p, "lg").log2());
}

Value ln_value(const Value& a, const NumericContext& ctx) {
  if (a.is_exact()) {
    if (a.exact() <= 0) throw DomainError("ln of a number that is not positive");
    if (a.exact() == 1) return Value(int64_t{0});
  }
  long p = std::max(ctx.precision_bits, a.is_exact() ? 0L : a.as_interval().precision());
  return checked(positive_interval(a, p, "ln").log());
}

Value log_value(const Value& base, const Value& x, const NumericContext& ctx) {
  if (base.is_exact() && (base.exact() <= 0 || base.exact() == 1)) {
    throw DomainError("log base must be positive and not 1");
  }
  if (base.is_exact() && x.is_exact()) {
    if (x.exact() <= 0) throw DomainError("log of a number that is not positive");
    if (x.exact() == 1) return Value(int64_t{0});
    // Guess k from a low-precision estimate, then confirm b^k == x exactly.
    Interval estimate = Interval(x.exact(), 64).log() / Interval(base.exact(), 64).log();
    double guess = estimate.approx();
    if (std::isfinite(guess) && std::fabs(guess) < 1e9) {
      int64_t k = std::llround(guess);
      if (k != 0 && std::fabs(guess - static_cast<double>(k)) < 1e-6) {
        NumericContext wide = ctx;
        wide.max_value_bits = std::max<uint64_t>(ctx.max_value_bits, rational_bits(x.exact()) + 64);
        try {
          Value candidate = exact_integer_power(base.exact(), BigInt(k), wide);
          if (candidate.same_exact(x)) return Value(k);
        } catch (const BudgetExceeded&) {
        }
      }
    }
  }
  long p = precision_for(base, x, ctx);
  Interval lx = positive_interval(x, p, "log");
  Interval lb = positive_interval(base, p, "log base").log();
  if (lb.contains_zero()) throw PrecisionShortfall("log base near 1");
  return checked(lx.log() / lb);
}

Value sqrt_value(const Value& a, const NumericContext& ctx) {
  if (a.is_exact()) {
    if (a.exact() < 0) throw DomainError("sqrt of a negative number");
    if (auto r = exact_root(a.exact(), 2)) return normalized(*r);
  }
  long p = std::max(ctx.precision_bits, a.is_exact() ? 0L : a.as_interval().precision());
  Interval x = a.interval(p);
  if (x.certainly_negative()) throw DomainError("sqrt of a negative number");
  if (!x.certainly_nonnegative()) throw PrecisionShortfall("sqrt of an interval around zero");
  return checked(x.sqrt());
}

Value min_value(const Value& a, const Value& b, const NumericContext& ctx) {
  if (a.is_exact() && b.is_exact()) return compare(a, b, ctx) <= 0 ? a : b;
  long p = precision_for(a, b, ctx);
  return Value(Interval::min(a.interval(p), b.interval(p)));
}

Value max_value(const Value& a, const Value& b, const NumericContext& ctx) {
  if (a.is_exact() && b.is_exact()) return compare(a, b, ctx) >= 0 ? a : b;
  long p = precision_for(a, b, ctx);
  return Value(Interval::max(a.interval(p), b.interval(p)));
}

Value mod_value(const Value& a, const Value& m, const NumericContext& ctx) {
  int64_t x, y;
  if (both_small(a, m, x, y)) {
    if (y == 0) throw DomainError("mod by zero");
    if (y != -1) {
      int64_t r = x % y;
      if (r != 0 && ((r < 0) != (y < 0))) r += y;
      return Value(r);
    }
  }
  if (m.is_exact() && m.exact() == 0) throw DomainError("mod by zero");
  if (a.is_integer() && m.is_integer()) return normalized(floor_mod(a.integer(), m.integer()));
  return sub(a, mul(m, floor_value(div(a, m, ctx)), ctx), ctx);
}

int compare(const Value& a, const Value& b, const NumericContext& ctx) {
  int64_t x, y;
  if (both_small(a, b, x, y)) return (x > y) - (x < y);
  if (a.is_exact() && b.is_exact()) {
    if (a.is_integer() && b.is_integer()) {
      IntegerOperand p(a), q(b);
      int c;
      if (p.big && q.big)
        c = mpz_cmp(p.big_data(), q.big_data());
      else if (p.big)
        c = mpz_cmp_si(p.big_data(), static_cast<long>(q.small));
      else
        c = -mpz_cmp_si(q.big_data(), static_cast<long>(p.small));
      return (c > 0) - (c < 0);
    }
    int c = a.exact().compare(b.exact());
    return (c > 0) - (c < 0);
  }
  long p = precision_for(a, b, ctx);
  Interval d = a.interval(p) - b.interval(p);
  if (d.certainly_positive()) return 1;
  if (d.certainly_negative()) return -1;
  throw PrecisionShortfall("a comparison of overlapping intervals");
}

}  // namespace thetagate::engine
