// A hand-built RunResult that exercises every part of every report: claims
// that hold (tight and loose), a refutation with ladder witnesses at huge
// sizes, an undecided numeric-only claim with a long ratio band, an input
// error with its diagnostic, and names that need escaping. Shared by the
// text, JSON and JUnit report tests and their golden files.
#ifndef THETAGATE_TESTS_SUPPORT_REPORT_FIXTURE_H_
#define THETAGATE_TESTS_SUPPORT_REPORT_FIXTURE_H_

#include <cmath>
#include <utility>
#include <vector>

#include "verifier/checking/result.h"

namespace thetagate::engine::test_support {

// Claims, in order: 0 holds, 1 refuted, 2 holds (not tight), 3 undecided,
// 4 error, 5 holds (name with XML specials). Seed 20240611.

inline BigInt pow2(unsigned k) { return BigInt(1) << k; }

inline ClaimResult stable_sort() {
  ClaimResult c;
  c.name = "orchard::stable_sort / comparisons, worst case";
  c.file = "claims/sorting.toml";
  c.line = 1;
  c.verdict = Verdict::kHolds;
  c.claimed = "Θ(n lg n)";
  c.derived = "Θ(n lg n)";
  c.method = "master theorem, case 2";
  c.basis.kind = BasisKind::kDerivationAgrees;
  c.basis.theorem = TheoremEvidence{"master theorem, case 2", "n lg n",         "n lg n",
                                    ComparedWith::kTheta,     Agreement::kSame, false};
  // As the engine certifies T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1, T(1) = 0.
  Certificate cert;
  cert.method = "divide";
  cert.proof = "master theorem, case 2";
  cert.driver_class = "n";
  cert.driver_low = "1/2";
  cert.driver_high = "2";
  cert.driver_from = "64";
  cert.obligations = {"f(n) >= (1/2) n for every n >= 64", "f(n) <= 2 n for every n >= 64",
                      "a = 2, b = 2: log_b a = 1, equal to the exponent of n in g",
                      "T(n) > 0 for 32 <= n <= 63"};
  c.basis.certificate = cert;
  c.steps = {"a = 2, b = 2: critical exponent lg 2 = 1",
             "f(n) = n - 1 is Θ(n^1 lg^0 n): case 2 with k = 0 gives Θ(n lg n)",
             "Akra–Bazzi with Leighton's condition covers ⌈n/2⌉ and ⌊n/2⌋"};
  c.sizes_checked = 5120;
  c.largest_bits = 4096;
  return c;
}

inline ClaimResult rope_concat() {
  ClaimResult c;
  c.name = "orchard::rope::concat / rebalancing steps";
  c.file = "claims/ropes.toml";
  c.line = 3;
  c.verdict = Verdict::kRefuted;
  c.claimed = "O(n)";
  c.derived = "Θ(n lg n)";
  c.method = "master theorem, case 2";
  c.basis.kind = BasisKind::kDerivationContradicts;
  c.basis.theorem = TheoremEvidence{"master theorem, case 2", "n lg n", "n", ComparedWith::kBigO,
                                    Agreement::kContradicts,  true};
  // T(n) = n lg n + n on these sizes: above c·n once lg n passes c - 1.
  Witness w1;
  w1.n = 2048;
  w1.value = "24576";
  w1.bound = "20480";
  w1.ratio = 12.0;
  w1.factor = "10";
  w1.family = "powers of 2";
  Witness w2;
  w2.n = pow2(1000) + 1;
  w2.value = BigInt(w2.n * 1001 + 1000).str();
  w2.bound = BigInt(w2.n * 1000).str();
  w2.ratio = 1001.0;
  w2.factor = "1000";
  w2.family = "2^k + 1";
  Witness w3;
  w3.n = pow2(4095) + boost::multiprecision::pow(BigInt(3), 2000);
  w3.value = BigInt(w3.n * 4096).str();
  w3.bound = BigInt(w3.n * 1000).str();
  w3.ratio = 4.096;
  w3.side = Side::kUpper;
  w3.family = "random in [2^4095, 2^4096)";
  c.witnesses = {w1, w2, w3};
  for (uint64_t k = 1; k <= 4; ++k) {
    BandRow r;
    r.scale = k;
    r.low = static_cast<double>(k) + 1.0;
    r.high = static_cast<double>(k) + 1.5;
    r.low_log2 = std::log2(r.low);
    r.high_log2 = std::log2(r.high);
    r.low_at = pow2(static_cast<unsigned>(k));
    r.high_at = pow2(static_cast<unsigned>(k + 1)) - 1;
    r.samples = 1u << k;
    c.band.push_back(r);
  }
  c.steps = {"a = 2, b = 2, f(n) = n: case 2 of the master theorem gives Θ(n lg n)"};
  c.sizes_checked = 4800;
  c.largest_bits = 4096;
  return c;
}

inline ClaimResult binary_search() {
  ClaimResult c;
  c.name = "orchard::lower_bound / probes";
  c.file = "claims/sorting.toml";
  c.line = 9;
  c.verdict = Verdict::kHolds;
  c.claimed = "O(n)";
  c.derived = "Θ(lg n)";
  c.method = "master theorem, case 2";
  c.tight = false;
  c.basis.kind = BasisKind::kDerivationAgrees;
  c.basis.theorem = TheoremEvidence{"master theorem, case 2", "lg n", "n", ComparedWith::kBigO,
                                    Agreement::kLoose,        false};
  c.sizes_checked = 3000;
  c.largest_bits = 4096;
  return c;
}

inline ClaimResult kd_tree() {
  ClaimResult c;
  c.name = "orchard::kd_tree::range_query / nodes visited";
  c.file = "claims/spatial.toml";
  c.line = 4;
  c.verdict = Verdict::kUndecided;
  c.claimed = "Θ(sqrt(n))";
  c.method = "numeric";
  c.numeric_only = true;
  c.basis.kind = BasisKind::kNumericTrend;
  c.basis.unproved = Unproved::kTrendUnsettled;
  TrendEvidence trend;
  trend.upper_matters = trend.lower_matters = true;
  trend.upper.direction = Direction::kRising;
  trend.upper.slope = 0.12;
  trend.upper.change_log2 = 0.5;
  trend.upper.first_scale = 101;
  trend.upper.last_scale = 3901;
  trend.lower.direction = Direction::kSteady;
  trend.lower.slope = 0.01;
  trend.lower.change_log2 = 0.06;
  trend.lower.first_scale = 101;
  trend.lower.last_scale = 3901;
  c.basis.trend = trend;
  c.notes = {"no base case covers n = 1: T(n) = 1 assumed where the argument would not shrink",
             "n/4 read as ⌊n/4⌋"};
  c.failed_hypotheses = {"master theorem: T(n) = 2T(n/4) + T(n/2) + 1 has two kinds of subproblem",
                         "Akra–Bazzi: the driving function is constant but the critical exponent\n"
                         "p with 2·4^(-p) + 2^(-p) = 1 has no closed form we compare exactly"};
  c.note = "visits at most two children per level";
  for (uint64_t k = 0; k < 40; ++k) {
    BandRow r;
    r.scale = k * 100 + 1;
    r.low = 0.7 + 0.001 * static_cast<double>(k);
    r.high = 1.5 + 0.01 * static_cast<double>(k);
    r.low_log2 = std::log2(r.low);
    r.high_log2 = std::log2(r.high);
    r.low_at = pow2(static_cast<unsigned>(r.scale));
    r.high_at = pow2(static_cast<unsigned>(r.scale) + 1) - 1;
    r.samples = 24;
    c.band.push_back(r);
  }
  c.sizes_checked = 960;
  c.largest_bits = 3901;
  return c;
}

inline ClaimResult broken_quadtree() {
  ClaimResult c;
  c.name = "orchard::quadtree::insert / splits";
  c.file = "claims/spatial.toml";
  c.line = 12;
  c.verdict = Verdict::kError;
  Diagnostic d;
  d.where = Location{"claims/spatial.toml", 14, 27};
  d.message = "expected ')' after 'n/4'";
  d.hint = "close the call: T(n/4)";
  d.source_line = "recurrence = \"T(n) = 4T(n/4 + 1\"";
  c.error = d;
  c.basis.kind = BasisKind::kInputError;
  return c;
}

inline ClaimResult karatsuba() {
  ClaimResult c;
  c.name = "orchard::bignum::mul<karatsuba> & \"schoolbook\" fallback";
  c.file = "claims/bignum.toml";
  c.line = 2;
  c.verdict = Verdict::kHolds;
  c.claimed = "Θ(n^(lg 3))";
  c.derived = "Θ(n^(lg 3))";
  c.method = "master theorem, case 1";
  c.basis.kind = BasisKind::kDerivationAgrees;
  c.basis.theorem = TheoremEvidence{"master theorem, case 1", "n^(lg 3)",       "n^(lg 3)",
                                    ComparedWith::kTheta,     Agreement::kSame, false};
  c.note = "limbs, not bits; <32 limbs use the schoolbook loop";
  c.sizes_checked = 4400;
  c.largest_bits = 4096;
  return c;
}

// A run of just these claims (seed 1): the two sides of a drift comparison.
inline RunResult run_of(std::vector<ClaimResult> claims) {
  RunResult run;
  run.seed = 1;
  run.claims = std::move(claims);
  return run;
}

inline RunResult sample_run() {
  RunResult run;
  run.seed = 20240611;
  run.claims = {stable_sort(), rope_concat(),     binary_search(),
                kd_tree(),     broken_quadtree(), karatsuba()};
  return run;
}

}  // namespace thetagate::engine::test_support

#endif  // THETAGATE_TESTS_SUPPORT_REPORT_FIXTURE_H_
