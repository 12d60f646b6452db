// Two independent routes to the same value, for random recurrences:
// (1) the memoised evaluator against a direct table built with plain GMP;
// (2) at large n, T(n) against the value assembled by hand from its own
//     subproblem values. RapidCheck prints the seed of a failing run.
#include <gmp.h>
#include <gtest/gtest.h>
#include <rapidcheck/gtest.h>

#include <cstdint>
#include <string>
#include <vector>

#include "tests/support/test_support.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/recurrence.h"

namespace thetagate::engine {
namespace {

// A GMP integer with automatic cleanup.
using test_support::Mpz;

enum class Shape { kFloor, kCeil, kImplicitFloor, kMinus };

struct Term {
  int coefficient = 1;
  Shape shape = Shape::kFloor;
  int step = 2;  // the divisor b, or c in n - c
};

enum class Driver { kN, kNSquared, kOne, kNMod3, kHalfFloor };

struct Spec {
  std::vector<Term> terms;
  Driver driver = Driver::kN;
  std::vector<int> bases;  // T(0), T(1), ... as point cases

  std::string text() const {
    std::string s = "T(n) = ";
    for (size_t i = 0; i < terms.size(); ++i) {
      const Term& t = terms[i];
      if (i > 0) s += " + ";
      if (t.coefficient != 1) s += std::to_string(t.coefficient);
      std::string b = std::to_string(t.step);
      switch (t.shape) {
        case Shape::kFloor:
          s += "T(floor(n/" + b + "))";
          break;
        case Shape::kCeil:
          s += "T(ceil(n/" + b + "))";
          break;
        case Shape::kImplicitFloor:
          s += "T(n/" + b + ")";
          break;
        case Shape::kMinus:
          s += "T(n - " + b + ")";
          break;
      }
    }
    switch (driver) {
      case Driver::kN:
        s += " + n";
        break;
      case Driver::kNSquared:
        s += " + n^2";
        break;
      case Driver::kOne:
        s += " + 1";
        break;
      case Driver::kNMod3:
        s += " + n mod 3";
        break;
      case Driver::kHalfFloor:
        s += " + floor(n/2)";
        break;
    }
    for (size_t k = 0; k < bases.size(); ++k) {
      s += "\nT(" + std::to_string(k) + ") = " + std::to_string(bases[k]);
    }
    return s;
  }
};

// The child size of a term at size n, with GMP's own rounding divisions.
void child_of(const Term& t, mpz_srcptr n, mpz_ptr out) {
  switch (t.shape) {
    case Shape::kFloor:
    case Shape::kImplicitFloor:
      mpz_fdiv_q_ui(out, n, static_cast<unsigned long>(t.step));
      break;
    case Shape::kCeil:
      mpz_cdiv_q_ui(out, n, static_cast<unsigned long>(t.step));
      break;
    case Shape::kMinus:
      mpz_sub_ui(out, n, static_cast<unsigned long>(t.step));
      break;
  }
}

// f(n) with GMP.
void driving(Driver d, mpz_srcptr n, mpz_ptr out) {
  switch (d) {
    case Driver::kN:
      mpz_set(out, n);
      break;
    case Driver::kNSquared:
      mpz_mul(out, n, n);
      break;
    case Driver::kOne:
      mpz_set_ui(out, 1);
      break;
    case Driver::kNMod3:
      mpz_fdiv_r_ui(out, n, 3);
      break;
    case Driver::kHalfFloor:
      mpz_fdiv_q_ui(out, n, 2);
      break;
  }
}

rc::Gen<Term> gen_term(bool allow_subtractive) {
  return rc::gen::build<Term>(
      rc::gen::set(&Term::coefficient, rc::gen::inRange(1, 4)),
      rc::gen::set(
          &Term::shape,
          allow_subtractive
              ? rc::gen::element(Shape::kFloor, Shape::kCeil, Shape::kImplicitFloor, Shape::kMinus)
              : rc::gen::element(Shape::kFloor, Shape::kCeil, Shape::kImplicitFloor)),
      rc::gen::set(&Term::step, rc::gen::inRange(2, 5)));
}

Driver gen_driver() {
  return *rc::gen::element(Driver::kN, Driver::kNSquared, Driver::kOne, Driver::kNMod3,
                           Driver::kHalfFloor);
}

// Small sizes: 1-3 terms of any shape. Subtractive terms T(n - c) take c in
// 1..3 and point cases cover every size below the largest c.
Spec gen_small_spec() {
  Spec s;
  s.terms = *rc::gen::container<std::vector<Term>>(static_cast<size_t>(*rc::gen::inRange(1, 4)),
                                                   gen_term(true));
  for (Term& t : s.terms) {
    if (t.shape == Shape::kMinus) t.step -= 1;  // c in 1..3
  }
  s.driver = gen_driver();
  int lowest_unsafe = 2;  // T(0), T(1) always
  for (const Term& t : s.terms) {
    if (t.shape == Shape::kMinus) lowest_unsafe = std::max(lowest_unsafe, t.step);
  }
  s.bases = *rc::gen::container<std::vector<int>>(static_cast<size_t>(lowest_unsafe),
                                                  rc::gen::inRange(-3, 10));
  return s;
}

// Large sizes: divide-only terms whose divisors are b0 or b0^2, so the
// distinct subproblems stay a few per level.
Spec gen_large_spec() {
  Spec s;
  int b0 = *rc::gen::element(2, 3);
  s.terms = *rc::gen::container<std::vector<Term>>(static_cast<size_t>(*rc::gen::inRange(1, 4)),
                                                   gen_term(false));
  for (Term& t : s.terms) t.step = (t.step % 2 == 0) ? b0 : b0 * b0;
  s.driver = gen_driver();
  s.bases = *rc::gen::container<std::vector<int>>(2, rc::gen::inRange(-3, 10));
  return s;
}

// The direct route: a table T(0..top) filled in increasing order with GMP.
std::vector<Mpz> direct_table(const Spec& s, unsigned long top) {
  std::vector<Mpz> table(top + 1);
  Mpz n, child, term;
  for (unsigned long i = 0; i <= top; ++i) {
    if (i < s.bases.size()) {
      mpz_set_si(table[i].get(), s.bases[i]);
      continue;
    }
    mpz_set_ui(n.get(), i);
    driving(s.driver, n.get(), table[i].get());
    for (const Term& t : s.terms) {
      child_of(t, n.get(), child.get());
      mpz_mul_si(term.get(), table[mpz_get_ui(child.get())].get(), t.coefficient);
      mpz_add(table[i].get(), table[i].get(), term.get());
    }
  }
  return table;
}

RC_GTEST_PROP(EvaluatorProperty, MemoisedEvaluationEqualsDirectTable, ()) {
  const Spec spec = gen_small_spec();
  const std::string text = spec.text();
  RC_LOG() << text << "\n";
  const unsigned long top = 300;
  std::vector<Mpz> table = direct_table(spec, top);
  Evaluator ev(recurrence_from_text(text));
  // All-subtractive recurrences take the bottom-up route; others top-down.
  bool all_subtractive = true;
  for (const Term& t : spec.terms) all_subtractive &= t.shape == Shape::kMinus;
  RC_ASSERT(ev.bottom_up() == all_subtractive);
  // Ask out of order too, so the memo (and the sweep's restart) is exercised.
  const unsigned long start = *rc::gen::inRange<unsigned long>(0, top + 1);
  for (unsigned long k = 0; k <= top; ++k) {
    unsigned long i = (start + k) % (top + 1);
    Value v = ev.value_at(BigInt(i));
    RC_ASSERT(v.is_integer());
    RC_ASSERT(v.str() == table[i].str());
  }
}

// A random size with exactly `bits` bits.
BigInt random_size(int bits) {
  auto limbs = *rc::gen::container<std::vector<uint64_t>>(static_cast<size_t>(bits / 64 + 1),
                                                          rc::gen::arbitrary<uint64_t>());
  BigInt n = 0;
  for (uint64_t limb : limbs) n = (n << 64) | BigInt(limb);
  n &= (BigInt(1) << bits) - 1;
  n |= BigInt(1) << (bits - 1);
  return n;
}

RC_GTEST_PROP(EvaluatorProperty, LargeValueEqualsItsAssembledSubproblems, ()) {
  const Spec spec = gen_large_spec();
  const std::string text = spec.text();
  const BigInt n = random_size(*rc::gen::inRange(200, 1001));
  RC_LOG() << text << "\nn = " << n << "\n";
  auto recurrence = recurrence_from_text(text);
  Evaluator whole(recurrence);
  Value value = whole.value_at(n);
  RC_ASSERT(value.is_integer());

  // By hand: children with GMP's divisions, their values from a separate
  // evaluator, the driving function with GMP, combined with GMP.
  Evaluator parts(recurrence);
  Mpz size, child, sum, term;
  mpz_set(size.get(), n.backend().data());
  driving(spec.driver, size.get(), sum.get());
  for (const Term& t : spec.terms) {
    child_of(t, size.get(), child.get());
    Value child_value = parts.value_at(BigInt(child.get()));
    RC_ASSERT(child_value.is_integer());
    mpz_mul_si(term.get(), child_value.integer().backend().data(), t.coefficient);
    mpz_add(sum.get(), sum.get(), term.get());
  }
  RC_ASSERT(value.str() == sum.str());
}

}  // namespace
}  // namespace thetagate::engine
