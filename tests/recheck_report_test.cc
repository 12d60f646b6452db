// The re-checker on whole reports (issue 20): it re-reads the claims,
// refuses reports about another claim, and — a property over random
// divide-and-conquer claims — accepts every true certificate and rejects
// every mutant that makes one false.
#include <gtest/gtest.h>
#include <rapidcheck/gtest.h>

#include <cmath>
#include <map>
#include <nlohmann/json.hpp>
#include <string>

#include "verifier/model/claim.h"
#include "verifier/recheck/recheck.h"

namespace thetagate::engine::recheck {
namespace {

using Json = nlohmann::json;

std::multimap<std::string, Claim> claims_of(const std::string& toml) {
  std::multimap<std::string, Claim> out;
  for (ClaimEntry& e : load_claim_text(toml, "orchard.toml")) {
    EXPECT_TRUE(e.claim) << (e.error ? e.error->message : e.internal_error);
    if (e.claim) out.emplace(e.name, *e.claim);
  }
  return out;
}

Json holds(const std::string& name, const std::string& claimed, Json certificate,
           Json induction = nullptr) {
  return Json{{"name", name},
              {"file", "orchard.toml"},
              {"verdict", "holds"},
              {"claimed", claimed},
              {"basis", {{"certificate", certificate}, {"induction", induction}}}};
}

std::vector<RecheckedClaim> recheck_json(const Json& claims,
                                         const std::multimap<std::string, Claim>& table) {
  Json report{{"schema_version", 3}, {"seed", 1}, {"claims", claims}};
  return recheck_report(report.dump(), "<test>.json", table).claims;
}

const char* kOrchard = R"toml([[claim]]
name = "orchard::merge_rows / comparisons"
recurrence = """
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
"""
bound = "Theta(n lg n)"

[[claim]]
name = "orchard::merge_rows / comparisons, at most"
recurrence = """
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
"""
bound = "T(n) <= 2 n lg n for n >= 2"

[[claim]]
name = "orchard::prune / work"
recurrence = """
T(n) = T(n/2) + f(n)
T(1) = 1
f(n) = n^2 if n even
f(n) = n^2/8
"""
bound = "Theta(n^2)"
)toml";

Json divide_certificate(const std::string& proof, const std::string& g, const std::string& low,
                        const std::string& high) {
  return Json{{"method", "divide"},          {"proof", proof},      {"driver_class", g},
              {"driver_low", low},           {"driver_high", high}, {"driver_from", "64"},
              {"obligations", Json::array()}};
}

TEST(RecheckReport, EachHoldsIsAnsweredFromTheClaimFile) {
  auto table = claims_of(kOrchard);
  Json parity = divide_certificate("master theorem, case 3", "n^2", "1/8", "1");
  parity["regularity_c"] = "1/2";
  parity["regularity_from"] = "64";
  Json claims = Json::array(
      {holds("orchard::merge_rows / comparisons", "Theta(n lg n)",
             divide_certificate("master theorem, case 2", "n", "1/2", "1")),
       holds("orchard::merge_rows / comparisons, at most", "T(n) <= 2 n lg n for n >= 2",
             Json{{"method", "induction"}, {"proof", "induction"}},
             Json{{"sides", {"upper"}},
                  {"bound", "<= 2n*lg(n)"},
                  {"checked_to", "130"},
                  {"modulus", 2}}),
       holds("orchard::prune / work", "Theta(n^2)", parity)});
  claims.push_back(Json{{"name", "orchard::prune / work"}, {"verdict", "refuted"}});
  auto out = recheck_json(claims, table);
  ASSERT_EQ(out.size(), 3u);  // the refuted one is not re-checked
  EXPECT_EQ(out[0].status, RuleStatus::kRechecked) << out[0].detail;
  EXPECT_EQ(out[1].status, RuleStatus::kRechecked) << out[1].detail;
  // The false regularity statement of the parity driver (issue 20, §3).
  EXPECT_EQ(out[2].status, RuleStatus::kRejected);
  EXPECT_NE(out[2].detail.find("n ≡ 1 (mod 4)"), std::string::npos) << out[2].detail;
  EXPECT_EQ(status_line(out[0]).rfind("re-checked (", 0), 0u) << status_line(out[0]);
}

TEST(RecheckReport, AReportAboutAnotherClaimIsRejected) {
  auto table = claims_of(kOrchard);
  auto out = recheck_json(
      Json::array({holds("orchard::merge_rows / comparisons", "O(n)",
                         divide_certificate("master theorem, case 2", "n", "1/2", "1")),
                   holds("orchard::no_such_claim", "O(n)",
                         divide_certificate("master theorem, case 2", "n", "1/2", "1"))}),
      table);
  ASSERT_EQ(out.size(), 2u);
  EXPECT_EQ(out[0].status, RuleStatus::kRejected);
  EXPECT_NE(out[0].detail.find("differs from the claim file"), std::string::npos) << out[0].detail;
  EXPECT_EQ(out[1].status, RuleStatus::kRejected);
}

const char* kDyadic = R"toml([[claim]]
name = "orchard::find_sorted / probes, exact"
recurrence = """
T(n) = T(floor(n/2)) + 1
T(1) = 1
"""
bound = "T(n) = floor(lg n) + 1 for n >= 1"

[[claim]]
name = "orchard::stable_sort / comparisons, tight"
recurrence = """
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
"""
bound = "T(n) <= n lg n - 0.9139286 n + 1 for n >= 10^8"
)toml";

// A dyadic holds as the JSON report writes it: the numbers and T's closed
// form in basis.induction.
Json dyadic_holds(const std::string& name, const std::string& claimed, const std::string& bound,
                  const std::string& closed_form) {
  Json sides = closed_form.empty() ? Json{"upper", "lower"} : Json{"upper"};
  return holds(name, claimed,
               Json{{"method", "dyadic-induction"},
                    {"proof", "induction on dyadic blocks"},
                    {"obligations", Json::array()}},
               Json{{"sides", sides},
                    {"bound", bound},
                    {"checked_from", "1"},
                    {"checked_to", "63"},
                    {"modulus", 1},
                    {"dyadic", true},
                    {"closed_form", closed_form}});
}

TEST(RecheckReport, DyadicProofsAreReadFromTheInductionObject) {
  auto table = claims_of(kDyadic);
  // Binary search probes floor(lg n) + 1 (docs/sources.md: from memory;
  // calc); merge sort's worst case n lg n - theta n + 1 with theta >=
  // 0.9139286 (P. Flajolet, M. Golin, "Mellin transforms and asymptotics:
  // the mergesort recurrence", 1994), against its closed form (M. A.
  // Suchenek, arXiv:1702.08443, 2017). The exact range starts at
  // checked_from = 1, below the claim's 10^8.
  const char* tight = "T(n) <= n lg n - 0.9139286 n + 1 for n >= 10^8";
  const char* form = "n*floor(lg(n)) + n - 2*2^floor(lg(n)) + 1";
  Json claims =
      Json::array({dyadic_holds("orchard::find_sorted / probes, exact",
                                "T(n) = floor(lg n) + 1 for n >= 1", "= floor(lg(n)) + 1", ""),
                   dyadic_holds("orchard::stable_sort / comparisons, tight", tight,
                                "<= n*lg(n) - 0.9139286*n + 1", form),
                   // Mutants: the report's claim edited, T's closed form off by one.
                   dyadic_holds("orchard::find_sorted / probes, exact",
                                "T(n) = floor(lg n) + 2 for n >= 1", "= floor(lg(n)) + 2", ""),
                   dyadic_holds("orchard::stable_sort / comparisons, tight", tight,
                                "<= n*lg(n) - 0.9139286*n + 1", std::string(form) + " + 1")});
  auto out = recheck_json(claims, table);
  ASSERT_EQ(out.size(), 4u);
  EXPECT_EQ(out[0].status, RuleStatus::kRechecked) << out[0].detail;
  EXPECT_EQ(out[1].status, RuleStatus::kRechecked) << out[1].detail;
  EXPECT_EQ(out[2].status, RuleStatus::kRejected);
  EXPECT_NE(out[2].detail.find("differs from the claim file"), std::string::npos) << out[2].detail;
  EXPECT_EQ(out[3].status, RuleStatus::kRejected);
  EXPECT_NE(out[3].detail.find("fails at n = 1"), std::string::npos) << out[3].detail;
}

TEST(RecheckReport, AHoldsWithoutACertificateIsNotReChecked) {
  auto table = claims_of(kOrchard);
  Json c = holds("orchard::merge_rows / comparisons", "Theta(n lg n)", nullptr);
  c["proof"] = "linear recurrence, dominant characteristic root";
  auto out = recheck_json(Json::array({c}), table);
  ASSERT_EQ(out.size(), 1u);
  EXPECT_EQ(out[0].status, RuleStatus::kNotRechecked);
  EXPECT_NE(out[0].detail.find("no certificate"), std::string::npos);
}

TEST(RecheckReport, NotAReportIsAnInputError) {
  auto table = claims_of(kOrchard);
  EXPECT_THROW(recheck_report("[1, 2", "<test>.json", table), InputError);
  EXPECT_THROW(recheck_report("{\"claims\": 3}", "<test>.json", table), InputError);
}

// --- Mutants ---------------------------------------------------------------

// T(n) = a T(n/b) + c n^k with T(n) = 1 below b: the master theorem with a
// true certificate (f = c n^k exactly, so low = high = c).
struct DivideClaim {
  int a, b, c, k;
  std::string recurrence() const {
    return "T(n) = " + std::to_string(a) + "T(n/" + std::to_string(b) + ") + " + std::to_string(c) +
           "*n^" + std::to_string(k) + "\nT(n) = 1 if n < " + std::to_string(b);
  }
  // The class: log_b a against k (common practice: a < b^k case 3, = case 2, > case 1).
  int which_case() const {
    long long bk = 1;
    for (int i = 0; i < k; ++i) bk *= b;
    return a < bk ? 3 : (a == bk ? 2 : 1);
  }
  std::string bound() const {
    std::string nk = "n^" + std::to_string(k);
    switch (which_case()) {
      case 3:
        return "Theta(" + nk + ")";
      case 2:
        return "Theta(" + nk + " lg n)";
      default:
        return "Theta(n^(log(" + std::to_string(b) + ", " + std::to_string(a) + ")))";
    }
  }
};

RuleOutcome check(const DivideClaim& d, const std::string& bound, const CertificateData& c) {
  auto r = recurrence_from_text(d.recurrence());
  return check_certificate(*r, parse_bound(SourceText::whole("<bound>", bound)), c);
}

CertificateData truthful(const DivideClaim& d) {
  CertificateData c;
  c.method = "divide";
  c.proof = "master theorem, case " + std::to_string(d.which_case());
  c.driver_class = "n^" + std::to_string(d.k);
  c.driver_low = std::to_string(d.c);
  c.driver_high = std::to_string(d.c);
  c.driver_from = "64";
  return c;
}

RC_GTEST_PROP(RecheckMutants, TrueCertificatesPassAndEveryMutantIsRejected, ()) {
  DivideClaim d{*rc::gen::inRange(1, 17), *rc::gen::inRange(2, 5), *rc::gen::inRange(1, 9),
                *rc::gen::inRange(0, 4)};
  RC_TAG(d.which_case());
  CertificateData good = truthful(d);
  RuleOutcome ok = check(d, d.bound(), good);
  RC_ASSERT(ok.status == RuleStatus::kRechecked);

  // One number changed past the truth: a lower constant above c, an upper
  // one below it.
  int bump = *rc::gen::inRange(1, 5);
  CertificateData low = good;
  low.driver_low = std::to_string(d.c) + "+" + std::to_string(bump) + "/8";
  RC_ASSERT(check(d, d.bound(), low).status == RuleStatus::kRejected);
  CertificateData high = good;
  high.driver_high = std::to_string(d.c) + "-" + std::to_string(bump) + "/16";
  RC_ASSERT(check(d, d.bound(), high).status == RuleStatus::kRejected);
  // Another driver exponent.
  CertificateData exponent = good;
  exponent.driver_class = "n^" + std::to_string(d.k + 1);
  RC_ASSERT(check(d, d.bound(), exponent).status == RuleStatus::kRejected);
  // A swapped case.
  CertificateData swapped = good;
  swapped.proof = "master theorem, case " + std::to_string(d.which_case() % 3 + 1);
  RuleOutcome s = check(d, d.bound(), swapped);
  RC_ASSERT(s.status == RuleStatus::kRejected);
  // A claim one class off, with the same certificate.
  std::string off = "Theta(n^" + std::to_string(d.k + 3) + " lg n)";
  RC_ASSERT(check(d, off, good).status == RuleStatus::kRejected);
  // A regularity constant that is too small (case 3 only): a/b^k <= c must hold.
  if (d.which_case() == 3) {
    CertificateData reg = good;
    reg.regularity_c = "1/" + std::to_string(100 * d.b * d.b * d.b * d.b);
    reg.regularity_from = "64";
    RC_ASSERT(check(d, d.bound(), reg).status == RuleStatus::kRejected);
  }
}

// Induction: T(n) = T(floor(n/2)) + T(ceil(n/2)) + n - 1 <= 2 n lg n; the
// mutants shrink the modulus, weaken the hypothesis below the truth, or
// claim what the step cannot carry.
RC_GTEST_PROP(RecheckMutants, InductionMutantsAreRejected, ()) {
  auto r = recurrence_from_text("T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1\nT(1) = 0");
  Bound b = parse_bound(SourceText::whole("<bound>", "T(n) <= 2 n lg n for n >= 2"));
  CertificateData c;
  c.method = "induction";
  c.sides = {"upper"};
  c.hypothesis = "<= 2n*lg(n)";
  c.checked_to = std::to_string(*rc::gen::inRange(64, 300));
  c.modulus = "2";
  RC_ASSERT(check_certificate(*r, b, c).status == RuleStatus::kRechecked);
  CertificateData one = c;
  one.modulus = "1";
  RC_ASSERT(check_certificate(*r, b, one).status == RuleStatus::kRejected);
  // n lg n - n + 1 is the exact worst case at powers of two (common practice):
  // a hypothesis below it fails.
  CertificateData tight = c;
  int shift = *rc::gen::inRange(1, 40);
  tight.hypothesis = "<= n*lg(n) - n + 1 - " + std::to_string(shift) + "/1000";
  RC_ASSERT(check_certificate(*r, b, tight).status == RuleStatus::kRejected);
  CertificateData above = c;
  above.hypothesis = "<= 3n*lg(n)";  // true of T, but not inside the claim
  RC_ASSERT(check_certificate(*r, b, above).status == RuleStatus::kRejected);
}

// Linear recurrences T(n) = a T(n - 1) + b T(n - 2) + c, T(0) = T(1) = 1:
// Θ(rho^n), rho = (a + sqrt(a^2 + 4b))/2 the positive root of x^2 - a x - b
// (common practice). Mutants move the isolating interval off the root or onto
// the negative one, change the polynomial, or claim another base.
RC_GTEST_PROP(RecheckMutants, LinearRootMutantsAreRejected, ()) {
  int a = *rc::gen::inRange(1, 6), b = *rc::gen::inRange(1, 6), c = *rc::gen::inRange(0, 6);
  auto r = recurrence_from_text("T(n) = " + std::to_string(a) + "T(n - 1) + " + std::to_string(b) +
                                "T(n - 2) + " + std::to_string(c) + "\nT(0) = 1\nT(1) = 1");
  auto claim = [&](int d) {
    return parse_bound(SourceText::whole(
        "<bound>", "Theta(((" + std::to_string(a) + " + sqrt(" + std::to_string(d) + "))/2)^n)"));
  };
  auto around = [](double x) {  // (k/1000, (k + 2)/1000] around x
    long k = static_cast<long>(std::floor(x * 1000)) - 1;
    return std::pair{std::to_string(k) + "/1000", std::to_string(k + 2) + "/1000"};
  };
  auto cert = [&](int bb, std::pair<std::string, std::string> box) {
    CertificateData d;
    d.method = "linear";
    d.root_polynomial = {std::to_string(-bb), std::to_string(-a), "1"};
    d.root_low = box.first;
    d.root_high = box.second;
    return d;
  };
  int disc = a * a + 4 * b;
  double rho = (a + std::sqrt(disc)) / 2, sigma = (a - std::sqrt(disc)) / 2;
  RC_ASSERT(check_certificate(*r, claim(disc), cert(b, around(rho))).status ==
            RuleStatus::kRechecked);
  RC_ASSERT(check_certificate(*r, claim(disc), cert(b, around(rho + 1))).status ==
            RuleStatus::kRejected);
  RC_ASSERT(check_certificate(*r, claim(disc), cert(b, around(sigma))).status ==
            RuleStatus::kRejected);
  double rho1 = (a + std::sqrt(disc + 4)) / 2;
  RC_ASSERT(check_certificate(*r, claim(disc), cert(b + 1, around(rho1))).status ==
            RuleStatus::kRejected);
  RC_ASSERT(check_certificate(*r, claim(disc + 1), cert(b, around(rho))).status ==
            RuleStatus::kRejected);
}

// Subtract-and-conquer with an exponential driver, T(n) = a T(n - 1) + r^n:
// Θ(n r^n) for a = r, Θ(r^n) for a < r, Θ(a^n) for a > r (common practice:
// unroll and sum the geometric series). Mutants: another driver base, another class.
RC_GTEST_PROP(RecheckMutants, ExponentialDriverMutantsAreRejected, ()) {
  int a = *rc::gen::inRange(1, 5), base = *rc::gen::inRange(1, 5);
  auto r = recurrence_from_text("T(n) = " + std::to_string(a) + "T(n - 1) + " +
                                std::to_string(base) + "^n\nT(0) = 1");
  std::string rn = std::to_string(base) + "^n";
  std::string truth = a == base  ? "Theta(n " + rn + ")"
                      : a < base ? "Theta(" + rn + ")"
                                 : "Theta(" + std::to_string(a) + "^n)";
  auto bound = [](const std::string& text) { return parse_bound(SourceText::whole("<b>", text)); };
  CertificateData c;
  c.method = "subtract";
  c.proof = "subtract-and-conquer, exponential driver";
  c.driver_class = rn;
  c.driver_low = "1/2";
  c.driver_high = "2";
  c.driver_from = "4";
  RC_ASSERT(check_certificate(*r, bound(truth), c).status == RuleStatus::kRechecked);
  RC_ASSERT(check_certificate(*r, bound("Theta(n^2 " + rn + ")"), c).status ==
            RuleStatus::kRejected);
  CertificateData other = c;
  other.driver_class = std::to_string(base + 1) + "^n";
  RC_ASSERT(check_certificate(*r, bound(truth), other).status == RuleStatus::kRejected);
}

// Full-history: quicksort's average, C(n) ~ (2 ln 2) n lg n with 2 ln 2 =
// 1.386... and C(64) = 360.7... (Knuth, The Art of Computer Programming,
// vol. 3, §5.2.2). Constants on the right side of those pass; an upper one
// below 2 ln 2 or a lower one above C(64)/(64 lg 64) = 0.939... is rejected.
RC_GTEST_PROP(RecheckMutants, FullHistoryMutantsAreRejected, ()) {
  auto r = recurrence_from_text("C(n) = n - 1 + (2/n) sum(k, 0, n - 1, C(k))\nC(0) = 0");
  Bound b = parse_bound(SourceText::whole("<bound>", "Theta(n lg n)"));
  CertificateData c;
  c.method = "full-history";
  c.bound_class = "n*lg(n)";
  c.bound_from = "64";
  c.bound_low = std::to_string(*rc::gen::inRange(1, 15)) + "/16";
  c.bound_high = std::to_string(*rc::gen::inRange(2, 6));
  RC_ASSERT(check_certificate(*r, b, c).status == RuleStatus::kRechecked);
  CertificateData high = c;
  high.bound_high = std::to_string(*rc::gen::inRange(1, 11)) + "/8";
  RC_ASSERT(check_certificate(*r, b, high).status == RuleStatus::kRejected);
  CertificateData low = c;
  low.bound_low = std::to_string(*rc::gen::inRange(9, 17)) + "/8";
  RC_ASSERT(check_certificate(*r, b, low).status == RuleStatus::kRejected);
}

}  // namespace
}  // namespace thetagate::engine::recheck
