// The witness hunt end to end (issue 4 §7): adversarial sizes (multiples of
// 3, odd chains), narrow windows between two powers, equality at powers,
// shrinking, and replay from the seed. Every witness the checker reports is
// re-certified here by an independent route (a closed form or a direct loop,
// exact integers; MPFI where lg n is irrational), so a test cannot pass on
// the checker's own arithmetic alone.
#include <gmp.h>
#include <gtest/gtest.h>
#include <mpfi.h>

#include <bit>
#include <cmath>
#include <cstdint>
#include <string>
#include <utility>
#include <vector>

#include "generators/size_family.h"
#include "reports/json_report.h"
#include "reports/verdict_text.h"
#include "verifier/checking/checker.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/evaluation/size_expression.h"
#include "verifier/model/claim.h"

namespace thetagate::engine {
namespace {

BigInt pow2(uint64_t k) { return BigInt(1) << k; }

// Loads one claim from TOML text and checks it.
ClaimResult check_one(const std::string& toml, const CheckOptions& options) {
  std::vector<ClaimEntry> entries = load_claim_text(toml, "hunt.toml");
  if (entries.size() != 1 || !entries[0].claim) {
    ADD_FAILURE() << "the claim text did not load: "
                  << (entries.empty() || !entries[0].error ? std::string("no entry")
                                                           : entries[0].error->message);
    return ClaimResult{};
  }
  return check_claim(*entries[0].claim, options);
}

std::string claim_toml(const std::string& recurrence, const std::string& bound) {
  return "[[claim]]\nname = \"orchard::hunt\"\nrecurrence = \"\"\"\n" + recurrence +
         "\n\"\"\"\nbound = \"" + bound + "\"\n";
}

CheckOptions options_with(uint64_t seed, uint64_t max_bits) {
  CheckOptions options;
  options.seed = seed;
  options.max_bits = max_bits;
  return options;
}

bool divisible(const BigInt& n, unsigned long d) {
  return mpz_divisible_ui_p(n.backend().data(), d) != 0;
}

// The sign of x − k·n·lg n, certified: exact when n is a power of two (lg n
// is then an integer), otherwise an MPFI enclosure of lg n whose precision
// grows until the comparison is decided (lg n is irrational, so it is).
// REQUIRES: n >= 1, k >= 0.
int sign_minus_k_n_lg_n(const BigInt& x, const BigInt& k, const BigInt& n) {
  if ((n & (n - 1)) == 0) {
    BigInt diff = x - k * n * BigInt(bit_length(n) - 1);
    return diff > 0 ? 1 : diff < 0 ? -1 : 0;
  }
  for (mpfr_prec_t prec = 128; prec <= 8192; prec *= 2) {
    mpfi_t y;
    mpfi_init2(y, prec);
    mpfi_set_z(y, n.backend().data());
    mpfi_log2(y, y);
    BigInt kn = k * n;
    mpfi_mul_z(y, y, kn.backend().data());
    int c = mpfi_cmp_z(y, x.backend().data());  // sign of k n lg n − x, or 0 if undecided
    mpfi_clear(y);
    if (c != 0) return c > 0 ? -1 : 1;
  }
  ADD_FAILURE() << "MPFI could not decide x vs k n lg n at n = " << n;
  return 0;
}

// ---------------------------------------------------------------------------
// Merge sort worst case: W(1) = 0, W(n) = W(⌈n/2⌉) + W(⌊n/2⌋) + n − 1 has the
// closed form W(n) = n⌈lg n⌉ − 2^⌈lg n⌉ + 1 (M. A. Suchenek, "Elementary yet
// precise worst-case analysis of MergeSort", arXiv:1702.08443, 2017; see
// docs/sources.md). (W(n) − n lg n)/n = A(lg n) + 1/n with A(u) = 1 − {u} −
// 2^(1−{u}), whose maximum is −lg(ln 2) − 1/ln 2 = −0.913928667944… [calc].
const char* kMergeSort = "T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1\nT(1) = 0";

BigInt merge_sort_worst(const BigInt& n) {
  uint64_t ceil_lg = bit_length(n - 1);  // ⌈lg n⌉ for n >= 1
  return n * BigInt(ceil_lg) - pow2(ceil_lg) + 1;
}

// Whether W(n) > n lg n − (c_num/c_den)·n + 1, exactly:
// c_den(W − 1) + c_num·n > c_den·n lg n.
bool breaks_merge_sort_bound(const BigInt& n, const BigInt& c_num, const BigInt& c_den) {
  BigInt x = c_den * (merge_sort_worst(n) - 1) + c_num * n;
  return sign_minus_k_n_lg_n(x, c_den, n) > 0;
}

// ---------------------------------------------------------------------------
// 1. Driving function n² on multiples of 3, n elsewhere. T(n) = T(⌊n/2⌋) +
// f(n) is at least n² at every multiple of 3, so Θ(n) is false; at other n
// the chain meets a multiple of 3 only further down.
const char* kModThree =
    "f(n) = n^2 if n mod 3 == 0\n"
    "f(n) = n otherwise\n"
    "T(n) = T(n/2) + f(n)\n"
    "T(1) = 1";

// T(n) = 1 + Σ f(m) over the halving chain m = n, ⌊n/2⌋, …, 2 [calc, by
// unrolling]. `f_odd_square` picks test 2's driver instead of test 1's.
BigInt chain_value(BigInt n, bool f_odd_square) {
  BigInt total = 1;
  for (; n >= 2; n >>= 1) {
    bool square = f_odd_square ? !divisible(n, 2) : divisible(n, 3);
    total += square ? BigInt(n * n) : n;
  }
  return total;
}

// The smallest n with T(n) > c·n, by direct search.
BigInt smallest_above(uint64_t c, bool f_odd_square) {
  for (BigInt n = 1;; ++n) {
    if (chain_value(n, f_odd_square) > c * n) return n;
  }
}

// Checks every ladder rung independently; rungs with c <= 1000 are reached
// below the exhaustive limit 10^4, so they must be the smallest such n.
void expect_ladder_certified(const ClaimResult& r, bool f_odd_square) {
  ASSERT_FALSE(r.witnesses.empty());
  for (const Witness& w : r.witnesses) {
    SCOPED_TRACE("rung c = " + w.factor + ", n = " + w.n.str() + ", family " + w.family);
    EXPECT_EQ(w.side, Side::kUpper);
    ASSERT_FALSE(w.factor.empty());
    BigInt c(w.factor);
    EXPECT_GT(chain_value(w.n, f_odd_square), c * w.n);
    if (w.factor.size() <= 4)
      EXPECT_EQ(w.n, smallest_above(c.convert_to<uint64_t>(), f_odd_square));
    EXPECT_EQ(w.value, chain_value(w.n, f_odd_square).str());
  }
}

TEST(WitnessHunt, ModThreeDriverRefutedAtAMultipleOfThree) {
  ClaimResult r = check_one(claim_toml(kModThree, "Theta(n)"), options_with(7, 256));
  ASSERT_EQ(r.verdict, Verdict::kRefuted) << verdict_message(r);
  // No theorem applies (f has no single class and regularity fails), so the
  // ladder must climb past 10^6 (docs/design.md §4.5).
  EXPECT_NE(verdict_message(r).find("past a factor of 10^6"), std::string::npos)
      << verdict_message(r);
  expect_ladder_certified(r, /*f_odd_square=*/false);
  // calc: T(12) = 144 + 36 + 9 + 1 = 190 > 120, and T(n) <= 10n below 12.
  EXPECT_EQ(r.witnesses.front().n, 12);
  EXPECT_EQ(r.witnesses.front().factor, "10");
  EXPECT_EQ(r.witnesses.front().family, "small");
  bool reached_million = false, from_multiples = false;
  for (const Witness& w : r.witnesses) {
    EXPECT_TRUE(divisible(w.n, 3))
        << "witness n = " << w.n << " (family " << w.family << ") is not a multiple of 3";
    reached_million |= w.factor.size() >= 7;
    from_multiples |= w.family == "power-multiples";  // c·2^k with c = 3, 6 (docs/design.md §5)
  }
  EXPECT_TRUE(reached_million);
  EXPECT_TRUE(from_multiples) << "no rung beyond the exhaustive range came from c·2^k";
}

// ---------------------------------------------------------------------------
// 2. Driving function n for even n, n² for odd n.
const char* kOddSquare =
    "f(n) = n if n even\n"
    "f(n) = n^2 otherwise\n"
    "T(n) = T(n/2) + f(n)\n"
    "T(1) = 1";

// Splits "at n = A, B, C: ..." into the size labels A, B, C.
std::vector<std::string> sizes_listed(const std::string& reason) {
  std::vector<std::string> out;
  size_t at = reason.find("at n = ");
  if (at == std::string::npos) return out;
  size_t end = reason.find(':', at);
  std::string list =
      reason.substr(at + 7, end == std::string::npos ? std::string::npos : end - at - 7);
  for (size_t start = 0; start < list.size();) {
    size_t comma = list.find(", ", start);
    out.push_back(
        list.substr(start, comma == std::string::npos ? std::string::npos : comma - start));
    if (comma == std::string::npos) break;
    start = comma + 2;
  }
  return out;
}

TEST(WitnessHunt, OddSquareDriverRefutedOnAnOddChain) {
  ClaimResult r = check_one(claim_toml(kOddSquare, "Theta(n)"), options_with(7, 256));
  ASSERT_EQ(r.verdict, Verdict::kRefuted) << verdict_message(r);
  EXPECT_NE(verdict_message(r).find("past a factor of 10^6"), std::string::npos)
      << verdict_message(r);
  expect_ladder_certified(r, /*f_odd_square=*/true);
  // calc: T(11) = 121 + 5 + 2 + 1 = 129 > 110, and T(n) <= 10n below 11.
  EXPECT_EQ(r.witnesses.front().n, 11);
  bool from_odd_chain = false;
  for (const Witness& w : r.witnesses) {
    EXPECT_FALSE(divisible(w.n, 2))
        << "witness n = " << w.n << " (family " << w.family << ") is even";
    from_odd_chain |= w.family == "ones";  // 2^k − 1: every halving odd
  }
  EXPECT_TRUE(from_odd_chain) << "no rung came from the odd-chain family";
  // The derivation refuses case 3 and names sizes where a f(⌊n/b⌋) >= f(n);
  // each listed size is re-checked here (a = 1, b = 2).
  std::string regularity;
  for (const std::string& reason : r.failed_hypotheses) {
    if (reason.find("regularity condition") != std::string::npos) regularity = reason;
  }
  ASSERT_FALSE(regularity.empty()) << "no reason mentions the regularity condition";
  std::vector<std::string> listed = sizes_listed(regularity);
  ASSERT_FALSE(listed.empty()) << regularity;
  auto f = [](const BigInt& n) { return divisible(n, 2) ? n : BigInt(n * n); };
  for (const std::string& label : listed) {
    BigInt n = evaluate_size(label);
    EXPECT_GE(f(n / 2), f(n)) << "listed size " << label << " does not break regularity";
  }
}

// ---------------------------------------------------------------------------
// 3. Explicit merge-sort bounds near the peak −0.913928667944…: the constant
// 0.9139 is on the safe side (A never exceeds −0.913928…), 0.91393 is not,
// and breaks only inside a window about ±0.14% wide around 2 ln 2 · 2^k.

TEST(WitnessHunt, MergeSortBoundJustAboveThePeakHolds) {
  ClaimResult r =
      check_one(claim_toml(kMergeSort, "T(n) <= n lg n - 0.9139 n + 1 for n >= 1000000"),
                options_with(7, 4096));
  EXPECT_EQ(r.verdict, Verdict::kHolds) << verdict_message(r);
  EXPECT_TRUE(r.witnesses.empty());
}

TEST(WitnessHunt, MergeSortBoundJustBelowThePeakRefutedInTheNarrowWindow) {
  ClaimResult r =
      check_one(claim_toml(kMergeSort, "T(n) <= n lg n - 0.91393 n + 1 for n >= 1000000"),
                options_with(7, 4096));
  ASSERT_EQ(r.verdict, Verdict::kRefuted) << verdict_message(r);
  ASSERT_EQ(r.witnesses.size(), 1u);
  const Witness& w = r.witnesses.front();
  EXPECT_EQ(w.side, Side::kUpper);
  EXPECT_GE(w.n, 1000000);
  EXPECT_EQ(w.value, merge_sort_worst(w.n).str());
  EXPECT_TRUE(breaks_merge_sort_bound(w.n, 91393, 100000)) << w.n;
  // The margin is a certified interval above 0 (the bound is irrational).
  ASSERT_FALSE(w.margin.empty());
  EXPECT_EQ(w.margin.front(), '[') << w.margin;
  EXPECT_GT(std::stod(w.margin.substr(1)), 0.0) << w.margin;
  EXPECT_NE(verdict_message(r).find("n = " + w.n.str()), std::string::npos) << verdict_message(r);
  // The smallest violation >= 10^6, by scanning the closed form [calc]. The
  // window of scale 19 lies below 10^6 (2 ln 2 · 2^19 ≈ 726,817), so the
  // first one is in scale 20, near 2 ln 2 · 2^20 ≈ 1,453,635.
  BigInt first = 0;
  for (uint64_t n = 1000000; n <= w.n; ++n) {
    // A double rules out the sizes more than 10^-4 below the boundary (its
    // error here is under 10^-8); the rest are decided with MPFI.
    double x = static_cast<double>(n);
    double w_n = merge_sort_worst(n).convert_to<double>();
    if (w_n - 1 + 0.91393 * x - x * std::log2(x) < -1e-4) continue;
    if (breaks_merge_sort_bound(n, 91393, 100000)) {
      first = n;
      break;
    }
  }
  ASSERT_GT(first, 0);
  EXPECT_EQ(bit_length(first), 21u);
  EXPECT_EQ(w.n, first) << "the witness (family " << w.family << ") is not the smallest "
                        << "violation: a window of a smaller scale was missed";
}

TEST(WitnessHunt, MergeSortBoundsNearThePeakFromTwoToTheForty) {
  ClaimResult holds =
      check_one(claim_toml(kMergeSort, "T(n) <= n lg n - 0.9139 n + 1 for n >= 1099511627776"),
                options_with(7, 4096));
  EXPECT_EQ(holds.verdict, Verdict::kHolds) << verdict_message(holds);

  ClaimResult r =
      check_one(claim_toml(kMergeSort, "T(n) <= n lg n - 0.91393 n + 1 for n >= 1099511627776"),
                options_with(7, 4096));
  ASSERT_EQ(r.verdict, Verdict::kRefuted) << verdict_message(r);
  ASSERT_EQ(r.witnesses.size(), 1u);
  const Witness& w = r.witnesses.front();
  EXPECT_GE(w.n, pow2(40));
  EXPECT_TRUE(breaks_merge_sort_bound(w.n, 91393, 100000)) << w.n << ", family " << w.family;
  // The first window at or above 2^40 is that of scale 40 (calc: A(lg n)
  // depends only on n/2^k, and 2 ln 2 · 2^40 > 2^40): shrinking toward 2^40
  // must not leave it.
  EXPECT_EQ(bit_length(w.n), 41u) << w.n;
}

// Far out and close to the peak: the gap (W(n) − n lg n)/n peaks at
// −lg(ln 2) − 1/ln 2 = −0.9139286679… [calc: with n = x·2^⌈lg n⌉ the gap is
// −lg x − 1/x + 1/n, largest at x = ln 2], so a constant 3.2·10^-8 past it
// fails only where |x − ln 2| < about 1.5·10^-4: the default search, with
// no family below 10^30, must close in on that window.
TEST(WitnessHunt, MergeSortBoundsNearThePeakBeyondTenToTheThirty) {
  const BigInt n0 = boost::multiprecision::pow(BigInt(10), 30);
  // True: the bound fails at small n (T(1) = 0 > −0.9139286), so no
  // induction on the bound itself can start below 10^30; induction on
  // dyadic blocks proves T's closed form instead and compares the bound
  // with it on every block from 10^30 on. Never refuted.
  ClaimResult holds = check_one(
      claim_toml(kMergeSort, "T(n) <= n lg n - 0.9139286 n for n >= 10^30"), CheckOptions{});
  EXPECT_EQ(holds.verdict, Verdict::kHolds) << verdict_message(holds);
  EXPECT_NE(verdict_message(holds).find("on each dyadic block"), std::string::npos)
      << verdict_message(holds);
  EXPECT_TRUE(holds.witnesses.empty());

  ClaimResult r = check_one(claim_toml(kMergeSort, "T(n) <= n lg n - 0.9139287 n for n >= 10^30"),
                            CheckOptions{});
  ASSERT_EQ(r.verdict, Verdict::kRefuted) << verdict_message(r);
  ASSERT_EQ(r.witnesses.size(), 1u);
  const Witness& w = r.witnesses.front();
  EXPECT_GE(w.n, n0);
  EXPECT_EQ(w.value, merge_sort_worst(w.n).str());
  // W(n) + 0.9139287 n > n lg n, exactly (the bound has no "+ 1" here).
  BigInt x = BigInt(10000000) * merge_sort_worst(w.n) + BigInt(9139287) * w.n;
  EXPECT_GT(sign_minus_k_n_lg_n(x, 10000000, w.n), 0) << w.n << ", family " << w.family;
}

// The ratio band of the holding bound: at every scale >= 20 bits the band's
// top must be attained at a size whose gap (W(n) − n lg n − 1)/n is within
// 10^-4 of the peak −0.913928667944… (issue 4 §3). For this bound the
// maximiser of W/bound per scale is the peak itself to within 10^-5 in lg n
// [calc: d/du of (A + 0.9139)/(u − 0.9139) vanishes where A' ≈ 1.4·10^-6],
// so this is the "band top within 10^-4 of the peak", exactly.
TEST(WitnessHunt, MergeSortBandTopReachesThePeakAtEveryScale) {
  ClaimResult r =
      check_one(claim_toml(kMergeSort, "T(n) <= n lg n - 0.9139 n + 1 for n >= 1000000"),
                options_with(7, 4096));
  ASSERT_EQ(r.verdict, Verdict::kHolds) << verdict_message(r);
  std::vector<uint64_t> scales_seen, scales_short;
  for (const BandRow& row : r.band) {
    if (row.scale < 20) continue;
    scales_seen.push_back(row.scale);
    // The row's number must be log2(W/bound) at the size it names.
    BigInt n = row.high_at;
    EXPECT_EQ(bit_length(n), row.scale + 1);
    // gap >= −0.91402867 (peak − 10^-4, rounded down) ⇔
    // 10^8 (W − 1) + 91402867 n >= 10^8 n lg n.
    BigInt x = BigInt(100000000) * (merge_sort_worst(n) - 1) + BigInt(91402867) * n;
    if (sign_minus_k_n_lg_n(x, 100000000, n) < 0) scales_short.push_back(row.scale);
  }
  // The default schedule has every scale up to 64 and then 15 more up to 4095.
  EXPECT_GE(scales_seen.size(), 60u);
  std::string list;
  for (uint64_t s : scales_short) list += " " + std::to_string(s);
  EXPECT_TRUE(scales_short.empty()) << scales_short.size() << " of " << scales_seen.size()
                                    << " scales have a band top more than 10^-4 below the "
                                       "peak:"
                                    << list;
}

// ---------------------------------------------------------------------------
// 4. Equality at every power of two is not a violation. T(n) = 2T(⌊n/2⌋) +
// n, T(1) = 1: T(2^k) = 2^k (k + 1) = n lg n + n exactly [calc], and T(n) <
// n lg n + n strictly elsewhere [calc: by induction, m = ⌊n/2⌋ is either
// below n/2 (n odd) or itself not a power of two].
const char* kTwoHalves = "T(n) = 2T(n/2) + n\nT(1) = 1";

TEST(WitnessHunt, EqualityAtPowersOfTwoIsNoWitness) {
  ClaimResult r =
      check_one(claim_toml(kTwoHalves, "T(n) <= n lg n + n for n >= 1"), options_with(7, 512));
  EXPECT_EQ(r.verdict, Verdict::kHolds) << verdict_message(r);
  EXPECT_TRUE(r.witnesses.empty());

  ClaimResult far = check_one(claim_toml(kTwoHalves, "T(n) <= n lg n + n for n >= 1000000"),
                              options_with(7, 512));
  EXPECT_EQ(far.verdict, Verdict::kHolds) << verdict_message(far);
}

TEST(WitnessHunt, StrictBoundBreaksExactlyAtAPowerOfTwo) {
  ClaimResult r =
      check_one(claim_toml(kTwoHalves, "T(n) < n lg n + n for n >= 5"), options_with(7, 512));
  ASSERT_EQ(r.verdict, Verdict::kRefuted) << verdict_message(r);
  ASSERT_EQ(r.witnesses.size(), 1u);
  EXPECT_EQ(r.witnesses.front().n, 8);  // calc: T(8) = 32 = 8·3 + 8
  EXPECT_EQ(r.witnesses.front().value, "32");
  EXPECT_EQ(r.witnesses.front().side, Side::kUpper);
  EXPECT_EQ(r.witnesses.front().margin, "0");  // a strict bound met with equality

  // Beyond the exhaustive range: the first power of two at or above 10^6.
  ClaimResult far =
      check_one(claim_toml(kTwoHalves, "T(n) < n lg n + n for n >= 1000000"), options_with(7, 512));
  ASSERT_EQ(far.verdict, Verdict::kRefuted) << verdict_message(far);
  ASSERT_EQ(far.witnesses.size(), 1u);
  EXPECT_EQ(far.witnesses.front().n, pow2(20));
  EXPECT_EQ(far.witnesses.front().value, (pow2(20) * 21).str());  // calc: 2^20 (20 + 1)
}

// ---------------------------------------------------------------------------
// 5. Replay: the same seed gives the same report byte for byte; other seeds
// may find other witnesses but not other verdicts.
std::vector<std::string> replay_claims() {
  return {
      claim_toml(kModThree, "Theta(n)"),
      claim_toml(kOddSquare, "Theta(n)"),
      claim_toml(kMergeSort, "T(n) <= n lg n - 0.91393 n + 1 for n >= 1000000"),
      claim_toml(kMergeSort, "Theta(n lg n)"),
      claim_toml(kTwoHalves, "T(n) < n lg n + n for n >= 1000000"),
  };
}

RunResult run_all(uint64_t seed) {
  RunResult run;
  run.seed = seed;
  for (const std::string& toml : replay_claims())
    run.claims.push_back(check_one(toml, options_with(seed, 128)));
  return run;
}

// Exact counts with floors of lg n and constants against them (issue 19,
// §3): the true ones hold by induction on dyadic blocks, and near misses of
// each are refuted or undecided, never proved. Merge sort's closed form and
// least constant: Suchenek and Flajolet–Golin (docs/sources.md); binary
// search's floor(lg n) + 1: common practice.
TEST(WitnessHunt, DyadicCountsHoldAndTheirNearMissesNeverDo) {
  const char* search = "T(n) = T(floor(n/2)) + 1\nT(1) = 1";
  ClaimResult tight =
      check_one(claim_toml(kMergeSort, "T(n) <= n lg n - 0.9139286 n + 1 for n >= 10^8"),
                options_with(7, 256));
  EXPECT_EQ(tight.verdict, Verdict::kHolds) << verdict_message(tight);
  EXPECT_EQ(proof_name(tight).rfind("induction on dyadic blocks from n = 63: T(n) = ", 0), 0u)
      << proof_name(tight);
  for (const auto& [rec, bound] : std::vector<std::pair<const char*, const char*>>{
           {search, "T(n) = floor(lg(n + 1)) + 1 for n >= 1"},
           {search, "T(n) = ceil(lg n) + 1 for n >= 1"},
           {kMergeSort, "T(n) = n ceil(lg n) - 2^ceil(lg n) for n >= 1"},
           {kMergeSort, "T(n) = n floor(lg n) - 2^floor(lg n) + 1 for n >= 1"},
           {kMergeSort, "T(n) <= n lg n - 0.91392867 n + 1 for n >= 10^8"},
           {kMergeSort, "T(n) >= n lg n - 0.999 n + 1 for n >= 1"}}) {
    ClaimResult r = check_one(claim_toml(rec, bound), options_with(7, 256));
    EXPECT_NE(r.verdict, Verdict::kHolds) << bound << ": " << verdict_message(r);
    EXPECT_NE(r.verdict, Verdict::kError) << bound << ": " << verdict_message(r);
  }
}

TEST(WitnessHunt, SameSeedSameReportByteForByte) {
  std::string first = render_json(run_all(41));
  std::string second = render_json(run_all(41));
  EXPECT_EQ(first, second);
  EXPECT_NE(first.find("\"seed\": 41"), std::string::npos);
}

TEST(WitnessHunt, OtherSeedsReachTheSameVerdicts) {
  RunResult base = run_all(41);
  const std::vector<Verdict> expected = {Verdict::kRefuted, Verdict::kRefuted, Verdict::kRefuted,
                                         Verdict::kHolds, Verdict::kRefuted};
  ASSERT_EQ(base.claims.size(), expected.size());
  for (uint64_t seed : {1, 2}) {
    RunResult other = run_all(seed);
    for (size_t i = 0; i < expected.size(); ++i) {
      EXPECT_STREQ(verdict_name(other.claims[i].verdict), verdict_name(expected[i]))
          << "claim " << i << ", seed " << seed << ": " << verdict_message(other.claims[i]);
      EXPECT_STREQ(verdict_name(base.claims[i].verdict), verdict_name(expected[i]))
          << "claim " << i << ", seed 41: " << verdict_message(base.claims[i]);
    }
  }
}

// ---------------------------------------------------------------------------
// 6. Shrinking. T(n) = T(⌊n/2⌋) + n, T(1) = 1 is Σ_j ⌊n/2^j⌋ = 2n − s₂(n),
// s₂ the binary digit sum [calc: Legendre's formula Σ_{j>=1} ⌊n/2^j⌋ =
// n − s₂(n)]. T(n) − n = n − s₂(n) never decreases, so `T(n) <= n + 500000`
// fails exactly from some N on, past the exhaustive range; N is found here
// by scanning with std::popcount (a reference library, docs/sources.md).
TEST(WitnessHunt, ShrinkingReachesTheSmallestWitness) {
  uint64_t first = 1;
  while (first - std::popcount(first) <= 500000) ++first;
  const uint64_t kSeed = 7, kMaxBits = 256;

  // The shrinker, not the families, must land on N.
  SizePlan plan;
  plan.max_bits = kMaxBits;
  plan.seed = kSeed;
  for (const Size& s : generate_sizes(plan)) ASSERT_NE(s.n, first) << "family " << s.family;

  ClaimResult r =
      check_one(claim_toml("T(n) = T(n/2) + n\nT(1) = 1", "T(n) <= n + 500000 for n >= 1"),
                options_with(kSeed, kMaxBits));
  ASSERT_EQ(r.verdict, Verdict::kRefuted) << verdict_message(r);
  ASSERT_EQ(r.witnesses.size(), 1u);
  const Witness& w = r.witnesses.front();
  EXPECT_EQ(w.n, first);
  EXPECT_EQ(w.value, std::to_string(2 * first - std::popcount(first)));
  EXPECT_NE(w.family.find("shrunk"), std::string::npos) << w.family;
  EXPECT_NE(verdict_message(r).find("n = " + std::to_string(first)), std::string::npos)
      << verdict_message(r);
}

}  // namespace
}  // namespace thetagate::engine

namespace thetagate::engine {
namespace {

// Effort scales the evaluator's per-size limit with the work budget: with a
// small limit and ample work, the limit alone ends the climb at effort 1,
// and four times the effort climbs further.
TEST(WitnessHunt, EffortRaisesThePerSizeLimitWithTheWork) {
  const std::string toml =
      claim_toml("T(n) = 1 if n <= 4\nT(n) = T(n/5) + T(7n/10) + n", "Theta(n)");
  CheckOptions options = options_with(1, 160);
  options.budget.max_steps_per_size = 3000;
  options.work_budget = 600'000;
  ClaimResult base = check_one(toml, options);
  bool stopped_by_limit = false;
  for (const std::string& note : base.notes) {
    stopped_by_limit |= note.find("one size needs more than 3000 subproblems") != std::string::npos;
  }
  EXPECT_TRUE(stopped_by_limit) << verdict_message(base);
  options.effort = 4;
  ClaimResult deeper = check_one(toml, options);
  EXPECT_GT(deeper.largest_bits, base.largest_bits);
}

}  // namespace
}  // namespace thetagate::engine

namespace thetagate::engine {
namespace {

// `--rounding both` (docs/design.md §5): T(n) = 2T(n/2) + n, T(1) = 0 stays within
// n lg n when n/2 is read as a floor [calc: by induction, T(n) <= n lg n],
// but not as a ceiling: T(3) = 2T(2) + 3 = 7 > 3 lg 3 ≈ 4.75 [calc].
TEST(WitnessHunt, RoundingBothNamesTheReadingThatFails) {
  const std::string toml = claim_toml("T(n) = 2T(n/2) + n\nT(1) = 0", "T(n) <= n lg n for n >= 1");
  CheckOptions options = options_with(1, 128);
  options.rounding = Rounding::kFloor;
  ClaimResult floor_only = check_one(toml, options);
  EXPECT_EQ(floor_only.verdict, Verdict::kHolds) << verdict_message(floor_only);
  options.rounding = Rounding::kCeil;
  ClaimResult ceil_only = check_one(toml, options);
  ASSERT_EQ(ceil_only.verdict, Verdict::kRefuted) << verdict_message(ceil_only);

  options.rounding = Rounding::kBoth;
  ClaimResult both = check_one(toml, options);
  ASSERT_EQ(both.verdict, Verdict::kRefuted) << verdict_message(both);
  EXPECT_NE(verdict_message(both).find("read as ceil (the floor reading does not break it)"),
            std::string::npos)
      << verdict_message(both);
  ASSERT_EQ(both.witnesses.size(), 1u);
  EXPECT_EQ(both.witnesses.front().n, 3);
  EXPECT_EQ(both.witnesses.front().value, "7");
  // Both readings ran, so both count.
  EXPECT_EQ(both.sizes_checked, floor_only.sizes_checked + ceil_only.sizes_checked);
}

}  // namespace
}  // namespace thetagate::engine
