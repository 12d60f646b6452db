// The integer kernel against the general evaluation path: for random integer
// recurrences (conditions, min/max, powers, mod, ceilings, quotients of
// multiples) both give the same values, expand the same subproblems (equal
// steps and memo counts, so work budgets and reports do not depend on the
// path), and fail with the same located errors.
#include <gtest/gtest.h>
#include <rapidcheck/gtest.h>

#include <functional>
#include <set>
#include <string>
#include <vector>

#include "tests/support/test_support.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {
namespace {

using test_support::Mpz;

// Recursive terms over n. Multiples p·n/q (q > p) do not collapse: each
// level adds distinct subproblems, so they get smaller sizes below.
const std::vector<std::string> kCollapsingCalls = {"T(floor(n/2))",
                                                   "T(ceil(n/2))",
                                                   "T(n/2)",
                                                   "T(n/3)",
                                                   "T(ceil(n/4))",
                                                   "T(floor(n/2) - 1)",
                                                   "T(floor(sqrt(n)))",
                                                   "T(floor(lg(n + 1)))"};
const std::vector<std::string> kSpreadingCalls = {"T(7n/10)", "T(ceil(2n/3))", "T(floor(3n/4))"};
const std::vector<std::string> kDrivers = {"n",
                                           "n^2",
                                           "1",
                                           "n mod 3",
                                           "floor(n/2)",
                                           "ceil(n/3)",
                                           "max(n, 7)",
                                           "min(n, 100)",
                                           "2n + 3",
                                           "n^3 - n",
                                           "(n mod 2) * n",
                                           "-n",
                                           "0",
                                           "mod(n, 5)^2",
                                           "10^20 - n",
                                           "floor(lg(n + 1))",
                                           "ceil(lg(n + 2))",
                                           "ceil(sqrt(n)) * n",
                                           "floor(sqrt(3n + 1))"};

struct Spec {
  std::string text;
  bool spreading = false;
};

Spec gen_spec() {
  Spec s;
  int terms = *rc::gen::inRange(1, 4);
  std::string body;
  for (int i = 0; i < terms; ++i) {
    bool spread = *rc::gen::inRange(0, 4) == 0;
    s.spreading |= spread;
    std::string call =
        spread ? *rc::gen::elementOf(kSpreadingCalls) : *rc::gen::elementOf(kCollapsingCalls);
    int coefficient = *rc::gen::inRange(1, 4);
    body += (i > 0 ? " + " : "") + (coefficient > 1 ? std::to_string(coefficient) : "") + call;
  }
  body += " + " + *rc::gen::elementOf(kDrivers);
  std::vector<std::string> lines;
  switch (*rc::gen::inRange(0, 4)) {
    case 0:  // point base cases
      lines = {"T(n) = " + body, "T(0) = " + std::to_string(*rc::gen::inRange(-3, 10)),
               "T(1) = " + std::to_string(*rc::gen::inRange(-3, 10))};
      break;
    case 1:  // a conditional base case
      lines = {"T(n) = " + std::to_string(*rc::gen::inRange(0, 5)) +
                   " if n <= " + std::to_string(*rc::gen::inRange(3, 7)),
               "T(n) = " + body};
      break;
    case 2:  // parity lines: odd sizes step down by one, even sizes divide
      lines = {"T(n) = T(n - 1) + " + *rc::gen::elementOf(kDrivers) + " if n odd and n > 1",
               "T(n) = " + body, "T(0) = 0", "T(1) = 2"};
      break;
    default:  // no base case: the default base case applies
      lines = {"T(n) = " + body};
      break;
  }
  for (size_t i = 0; i < lines.size(); ++i) s.text += (i > 0 ? "\n" : "") + lines[i];
  return s;
}

BigInt gen_size(bool spreading) {
  int bits = *rc::gen::inRange(1, spreading ? 40 : 300);
  auto limbs = *rc::gen::container<std::vector<uint64_t>>(static_cast<size_t>(bits / 64 + 1),
                                                          rc::gen::arbitrary<uint64_t>());
  BigInt n = 0;
  for (uint64_t limb : limbs) n = (n << 64) | BigInt(limb);
  return n & ((BigInt(1) << bits) - 1);
}

// Only the work limits, never the clock, may stop an evaluation in these
// comparisons: a loaded machine must not make the two paths differ.
Budget work_only() {
  Budget b;
  b.max_seconds = 0;
  return b;
}

RC_GTEST_PROP(IntegerKernel, AgreesWithTheGeneralPathStepForStep, ()) {
  const Spec spec = gen_spec();
  RC_LOG() << spec.text << "\n";
  auto recurrence = recurrence_from_text(spec.text);
  Evaluator fast(recurrence, work_only());
  Evaluator general(recurrence, work_only(), EvaluationPath::kGeneral);
  RC_ASSERT(fast.uses_integer_kernel());
  RC_ASSERT(!general.uses_integer_kernel());
  for (int i = 0; i < 4; ++i) {
    BigInt n = gen_size(spec.spreading);
    RC_LOG() << "n = " << n << "\n";
    std::string fast_value, general_value;
    try {
      fast_value = fast.value_at(n).str();
    } catch (const InputError& e) {
      fast_value = "error: " + e.diagnostic().message;
    }
    try {
      general_value = general.value_at(n).str();
    } catch (const InputError& e) {
      general_value = "error: " + e.diagnostic().message;
    }
    RC_ASSERT(fast_value == general_value);
    if (fast_value.rfind("error", 0) == 0) return;  // step counts differ after a decline
    // The general path reads lg and sqrt as intervals, and a floor it cannot
    // decide is redone at doubled precision, charging its steps again; the
    // kernel is exact and never retries. Otherwise the counts are equal.
    if (general.stats().precision_retries > 0) continue;
    RC_ASSERT(fast.stats().steps == general.stats().steps);
    RC_ASSERT(fast.stats().memo_entries == general.stats().memo_entries);
  }
}

// The diagnostic both paths give for `text` at n, or "" when there is none.
std::string error_of(const std::string& text, const BigInt& n, EvaluationPath path) {
  Evaluator ev(recurrence_from_text(text), work_only(), path);
  try {
    ev.value_at(n);
  } catch (const InputError& e) {
    return format_diagnostic(e.diagnostic());
  }
  return "";
}

TEST(IntegerKernel, DeclinedSizesFailWithTheGeneralPathsLocatedError) {
  const std::vector<std::string> cases = {
      "T(n) = T(n + 1) + 1",                             // does not shrink, beyond the default base
      "T(n) = T(n/2) + 1 if n > 5\nT(n) = 1 if n == 0",  // no line applies at 1..5
      "T(n) = T(n/2) + n mod (n - n)\nT(0) = 0",         // mod by zero
      "T(n) = T(floor(n/(n - 3))) + 1\nT(0) = 0",        // reaches T(1), which calls T(-1)
  };
  for (const std::string& text : cases) {
    EXPECT_TRUE(Evaluator(recurrence_from_text(text)).uses_integer_kernel()) << text;
    std::string fast = error_of(text, BigInt(100000), EvaluationPath::kAuto);
    std::string general = error_of(text, BigInt(100000), EvaluationPath::kGeneral);
    EXPECT_FALSE(fast.empty()) << text;
    EXPECT_EQ(fast, general) << text;
  }
}

TEST(IntegerKernel, CompilesOnlyRecurrencesThatStayWhole) {
  struct Case {
    const char* text;
    bool compiles;
  };
  const Case cases[] = {
      {"T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1\nT(1) = 0", true},
      {"T(n) = 1 if n <= 4\nT(n) = T(n/5) + T(7n/10) + n", true},
      {"T(n) = 7T(n/2) + n^2", true},
      {"T(n) = T(n/2) + 1 if n even\nT(n) = T(n - 1) + 1 if n odd\nT(0) = 0", true},
      {"T(n) = 2T(n/2) + n lg n", false},               // irrational driving function
      {"T(n) = 2T(n/2) + n/2", false},                  // a bare quotient may be a fraction
      {"T(n) = T(floor(sqrt(n))) + ceil(lg n)", true},  // rounded roots and logarithms
      {"T(n) = T(n/2) + sqrt(n)", false},               // an unrounded root
      {"T(n) = 2T(n/2) + 0.5", false},                  // not a whole constant
      {"T(n) = 2T(n/2) + f(n)\nf(n) = n + 1", false},   // helpers stay general
  };
  for (const Case& c : cases) {
    Evaluator ev(recurrence_from_text(c.text));
    EXPECT_EQ(ev.uses_integer_kernel(), c.compiles) << c.text;
  }
  // T(n - c) alone is swept bottom-up, never through the kernel.
  Evaluator sweep(recurrence_from_text("T(n) = T(n - 1) + n\nT(0) = 0"));
  EXPECT_TRUE(sweep.bottom_up());
  EXPECT_FALSE(sweep.uses_integer_kernel());
}

TEST(IntegerKernel, ValueBitsBudgetAppliesAsOnTheGeneralPath) {
  Budget budget;
  budget.max_value_bits = 4096;
  auto recurrence = recurrence_from_text("T(n) = T(n/2) + n^64\nT(0) = 0");
  Evaluator fast(recurrence, budget);
  Evaluator general(recurrence, budget, EvaluationPath::kGeneral);
  ASSERT_TRUE(fast.uses_integer_kernel());
  // 2^70 raised to the 64th power needs about 4480 bits.
  const BigInt n = BigInt(1) << 70;
  std::string fast_error, general_error;
  try {
    fast.value_at(n);
  } catch (const BudgetExceeded& e) {
    fast_error = e.what();
  }
  try {
    general.value_at(n);
  } catch (const BudgetExceeded& e) {
    general_error = e.what();
  }
  EXPECT_NE(fast_error.find("bits per value"), std::string::npos) << fast_error;
  EXPECT_EQ(fast_error, general_error);
}

TEST(IntegerKernel, MergeSortWorstCaseMatchesItsClosedFormAtLargeSizes) {
  // W(n) = n⌈lg n⌉ − 2^⌈lg n⌉ + 1 for the comparisons of top-down merge sort:
  // M. A. Suchenek, "Elementary yet precise worst-case analysis of
  // MergeSort", arXiv:1702.08443, 2017. Closed form computed with GMP.
  Evaluator ev(recurrence_from_text("T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1\nT(1) = 0"));
  ASSERT_TRUE(ev.uses_integer_kernel());
  for (const BigInt& n : {BigInt(1000003), (BigInt(1) << 4096) + 12345, (BigInt(3) << 2000) - 1}) {
    Mpz size, power, expected;
    mpz_set(size.get(), n.backend().data());
    mpz_sub_ui(power.get(), size.get(), 1);
    unsigned long k = mpz_sizeinbase(power.get(), 2);  // ⌈lg n⌉ for n >= 2
    mpz_ui_pow_ui(power.get(), 2, k);
    mpz_mul_ui(expected.get(), size.get(), k);
    mpz_sub(expected.get(), expected.get(), power.get());
    mpz_add_ui(expected.get(), expected.get(), 1);
    EXPECT_EQ(ev.value_at(n).str(), expected.str());
  }
}

// The sizes a memoised top-down evaluation of T(n) visits: n and, for each
// size that is not a base case, the sizes its calls reach. Each is one
// subproblem (common practice: memoised recursion evaluates every distinct
// subproblem once), computed here with plain GMP arithmetic and a std::set,
// independently of both evaluation paths.
size_t sizes_reached(const BigInt& n, const std::function<bool(const Mpz&)>& is_base,
                     const std::function<std::vector<Mpz>(const Mpz&)>& calls) {
  auto less = [](const Mpz& a, const Mpz& b) { return mpz_cmp(a.get(), b.get()) < 0; };
  std::set<Mpz, decltype(less)> seen(less);
  std::vector<Mpz> pending(1);
  mpz_set(pending[0].get(), n.backend().data());
  while (!pending.empty()) {
    Mpz m = pending.back();
    pending.pop_back();
    if (!seen.insert(m).second || is_base(m)) continue;
    for (const Mpz& next : calls(m)) pending.push_back(next);
  }
  return seen.size();
}

// m / d rounded down (floor) or up (ceil), and floor(sqrt(m)), in GMP.
Mpz fdiv(const Mpz& m, unsigned long d) {
  Mpz q;
  mpz_fdiv_q_ui(q.get(), m.get(), d);
  return q;
}
Mpz cdiv(const Mpz& m, unsigned long d) {
  Mpz q;
  mpz_cdiv_q_ui(q.get(), m.get(), d);
  return q;
}
bool at_most(const Mpz& m, unsigned long k) { return mpz_cmp_ui(m.get(), k) <= 0; }

// Budgets, the checker's work units and the golden reports count steps: the
// kernel must charge exactly the steps of the general path's walk. Pinned on
// representative shapes, each against the sizes-reached count above.
TEST(IntegerKernel, CountsTheSameStepsAsTheGeneralPathOnRepresentativeRecurrences) {
  struct Case {
    const char* text;
    std::function<bool(const Mpz&)> is_base;
    std::function<std::vector<Mpz>(const Mpz&)> calls;
  };
  const Case cases[] = {
      // Two calls that stay two adjacent sizes per level.
      {"T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1\nT(1) = 0",
       [](const Mpz& m) { return at_most(m, 1); },
       [](const Mpz& m) {
         return std::vector<Mpz>{cdiv(m, 2), fdiv(m, 2)};
       }},
      // Three calls over two primes: the sizes floor(n / (2^a 3^b)).
      {"T(n) = T(floor(n/2)) + T(floor(n/3)) + T(floor(n/6)) + n\nT(0) = 0",
       [](const Mpz& m) { return at_most(m, 0); },
       [](const Mpz& m) {
         return std::vector<Mpz>{fdiv(m, 2), fdiv(m, 3), fdiv(m, 6)};
       }},
      // Case lines by parity (J(n/2) and J((n - 1)/2) are both floor(n/2)).
      {"J(n) = 2J(n/2) - 1 if n even\nJ(n) = 2J((n-1)/2) + 1 if n odd\nJ(1) = 1",
       [](const Mpz& m) { return at_most(m, 1); },
       [](const Mpz& m) { return std::vector<Mpz>{fdiv(m, 2)}; }},
      // A conditional base case and an unbalanced split.
      {"T(n) = 1 if n <= 4\nT(n) = T(n/5) + T(7n/10) + n",
       [](const Mpz& m) { return at_most(m, 4); },
       [](const Mpz& m) {
         Mpz seven_m;
         mpz_mul_ui(seven_m.get(), m.get(), 7);
         return std::vector<Mpz>{fdiv(m, 5), fdiv(seven_m, 10)};
       }},
      // Rounded roots: lg lg n levels.
      {"T(n) = 2T(floor(sqrt(n))) + 1 if n > 2\nT(n) = 1 if n <= 2",
       [](const Mpz& m) { return at_most(m, 2); },
       [](const Mpz& m) {
         Mpz root;
         mpz_sqrt(root.get(), m.get());
         return std::vector<Mpz>{root};
       }},
  };
  for (const Case& c : cases) {
    auto recurrence = recurrence_from_text(c.text);
    for (const BigInt& n : {BigInt(1000003), (BigInt(1) << 200) + 12345}) {
      Evaluator fast(recurrence, work_only());
      Evaluator general(recurrence, work_only(), EvaluationPath::kGeneral);
      ASSERT_TRUE(fast.uses_integer_kernel()) << c.text;
      ASSERT_EQ(general.strategy(), EvaluationStrategy::kTopDown) << c.text;
      EXPECT_EQ(fast.value_at(n).str(), general.value_at(n).str()) << c.text;
      ASSERT_EQ(general.stats().precision_retries, 0u) << c.text;
      size_t expected = sizes_reached(n, c.is_base, c.calls);
      EXPECT_EQ(fast.stats().steps, expected) << c.text << " at n = " << n;
      EXPECT_EQ(general.stats().steps, expected) << c.text << " at n = " << n;
      // Every size reached is remembered once, on either path.
      EXPECT_EQ(fast.stats().memo_entries, expected) << c.text;
      EXPECT_EQ(general.stats().memo_entries, expected) << c.text;
    }
  }
}

}  // namespace
}  // namespace thetagate::engine
