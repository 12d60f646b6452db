// Proof certificates (verifier/derivation/certificate.h) as the JSON report
// carries them (basis.certificate, docs/json-schema.md). For claims of our
// own, the certificate's statements are checked here independently of the
// prover: f, g, T and the regularity bound are written out in this file and
// evaluated with exact rationals, at every n from driver_from to
// driver_from + 2000 and at n = 2^k - 1, 2^k, 2^k + 1 for k <= 200; and the
// independent re-checker (verifier/recheck) re-verifies each. For the demo
// library, every holds proved by a supported method carries one, and the
// texts a checker parses (driver_class, the induction bound) read back with
// parse_expression.
#include "verifier/derivation/certificate.h"

#include <gtest/gtest.h>

#include <fstream>
#include <functional>
#include <map>
#include <nlohmann/json.hpp>
#include <regex>
#include <sstream>
#include <string>
#include <vector>

#include "reports/baseline.h"
#include "reports/json_report.h"
#include "verifier/checking/checker.h"
#include "verifier/model/claim.h"
#include "verifier/recheck/recheck.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {
namespace {

using Json = nlohmann::json;
using Exact = std::function<Rational(const BigInt&)>;

// Claims of the orchard library, each proved by a different route.
const char* const kClaims = R"toml(
[[claim]]
name       = "orchard::merge_runs / comparisons"
recurrence = """
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
"""
bound      = "Theta(n lg n)"

[[claim]]
name       = "orchard::trie3 / split work"
recurrence = """
T(n) = 3T(n/3) + n^2
T(n) = 1 if n < 3
"""
bound      = "Theta(n^2)"

[[claim]]
name       = "orchard::bisect / probes"
recurrence = """
T(n) = T(floor(n/2)) + 1
T(1) = 1
"""
bound      = "Theta(lg n)"

[[claim]]
name       = "orchard::chain / relinks"
recurrence = """
T(n) = T(n - 1) + 2n + 3
T(0) = 0
"""
bound      = "Theta(n^2)"

[[claim]]
name       = "orchard::pack / moves, parity-weighted"
recurrence = """
T(n) = 2T(n/2) + h(n)
h(n) = n^2 if n even
h(n) = 3n^2/4 otherwise
T(1) = 1
"""
bound      = "Theta(n^2)"

[[claim]]
name       = "orchard::pack / moves, odd sizes cheap"
recurrence = """
T(n) = T(n/2) + f(n)
f(n) = n^2 if n even
f(n) = n^2/8 otherwise
T(1) = 1
"""
bound      = "Theta(n^2)"

[[claim]]
name       = "orchard::kd_split / comparisons, uneven split"
recurrence = """
T(n) = 1 if n < 3
T(n) = T(floor(n/3)) + T(floor(2n/3)) + n
"""
bound      = "Theta(n lg n)"

[[claim]]
name       = "orchard::merge_runs / comparisons, documented"
recurrence = """
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
"""
bound      = "T(n) <= n lg n for n >= 1"

[[claim]]
name       = "orchard::chain / relinks, exact"
recurrence = """
T(n) = T(n - 1) + 2n + 3
T(0) = 0
"""
bound      = "T(n) = n^2 + 4n for n >= 0"

[[claim]]
name       = "orchard::pack / moves, class written"
recurrence = """
T(n) = 2T(n/2) + Θ(n^2)
T(1) = 1
"""
bound      = "Theta(n^2)"
)toml";

CheckOptions test_options() {
  CheckOptions options;
  options.seed = 11;
  options.max_bits = 1024;
  // Time never decides: only the deterministic limits stop a search.
  options.budget.max_seconds = 86400;
  return options;
}

RunResult check_claims() {
  return check_entries(load_claim_text(kClaims, "certificate.toml"), test_options());
}

// One run shared by the tests below.
const RunResult& run_result() {
  static const RunResult run = check_claims();
  return run;
}

const Json& report() {
  static const Json json = Json::parse(render_json(run_result()));
  return json;
}

const Json& claim(const std::string& name) {
  for (const Json& c : report()["claims"]) {
    if (c["name"] == name) return c;
  }
  static const Json none;
  ADD_FAILURE() << "no claim " << name;
  return none;
}

// "3", "1/2": a positive rational in decimal.
Rational rational_of(const Json& text) {
  std::string s = text.get<std::string>();
  EXPECT_TRUE(std::regex_match(s, std::regex("[0-9]+(/[0-9]+)?"))) << s;
  size_t slash = s.find('/');
  if (slash == std::string::npos) return Rational(BigInt(s));
  return Rational(BigInt(s.substr(0, slash)), BigInt(s.substr(slash + 1)));
}

BigInt floor_half(const BigInt& n) { return n / 2; }  // n >= 0
bool even(const BigInt& n) { return n % 2 == 0; }
Rational square(const BigInt& n) { return Rational(n * n); }

// The sizes the driver bounds are checked at: every n in [from, from + 2000],
// and 2^k - 1, 2^k, 2^k + 1 (k <= 200) from `from` on.
std::vector<BigInt> sizes_from(const BigInt& from) {
  std::vector<BigInt> out;
  for (BigInt n = from; n <= from + 2000; ++n) out.push_back(n);
  for (unsigned k = 1; k <= 200; ++k) {
    BigInt p = BigInt(1) << k;
    for (const BigInt& n : {BigInt(p - 1), p, BigInt(p + 1)}) {
      if (n >= from) out.push_back(n);
    }
  }
  return out;
}

// low·g(n) <= f(n) <= high·g(n) for every line f of the driver, exactly.
void expect_driver_bounds(const Json& cert, const std::vector<Exact>& lines, const Exact& g) {
  Rational low = rational_of(cert["driver_low"]);
  Rational high = rational_of(cert["driver_high"]);
  BigInt from(cert["driver_from"].get<std::string>());
  EXPECT_GT(low, 0);
  EXPECT_LE(low, high);
  EXPECT_GE(from, 1);
  for (const BigInt& n : sizes_from(from)) {
    Rational gn = g(n);
    for (size_t i = 0; i < lines.size(); ++i) {
      Rational fn = lines[i](n);
      if (low * gn > fn || fn > high * gn) {
        ADD_FAILURE() << "line " << i << " at n = " << n << ": f(n) = " << fn << ", g(n) = " << gn
                      << ", not within [" << low << ", " << high << "] g(n)";
        return;
      }
    }
  }
}

// T(n) for 1 <= n <= last, bottom up: `step` gets n and the values below it
// (index m holds T(m); index 0 is unused).
using Step = std::function<Rational(const BigInt& n, const std::vector<Rational>& below)>;

// T(n) > 0 over the range the certificate's last obligation names, with T
// computed here by its recurrence.
void expect_positive_base(const Json& cert, const Step& step) {
  std::string last = cert["obligations"].back().get<std::string>();
  std::smatch m;
  ASSERT_TRUE(std::regex_match(last, m, std::regex("T\\(n\\) > 0 for ([0-9]+) <= n <= ([0-9]+)")))
      << last;
  BigInt lo(m[1].str()), hi(m[2].str());
  EXPECT_EQ(hi + 1, BigInt(cert["driver_from"].get<std::string>()));
  std::vector<Rational> t(1);
  for (BigInt n = 1; n <= hi; ++n) t.push_back(step(n, t));
  for (BigInt n = lo; n <= hi; ++n) {
    EXPECT_GT(t[static_cast<size_t>(n)], 0) << "T(" << n << ")";
  }
}

size_t at(const BigInt& n) { return static_cast<size_t>(n); }

TEST(Certificate, MergeOfTwoHalvesIsDivideWithDriverN) {
  const Json& c = claim("orchard::merge_runs / comparisons");
  ASSERT_EQ(c["verdict"], "holds");
  const Json& cert = c["basis"]["certificate"];
  ASSERT_TRUE(cert.is_object());
  // Common practice: n - 1 comparisons per merge of two halves is the
  // master theorem's case 2.
  EXPECT_EQ(cert["method"], "divide");
  EXPECT_EQ(cert["proof"], "master theorem, case 2");
  EXPECT_EQ(cert["proof"], c["proof"]);
  EXPECT_EQ(cert["driver_class"], "n");
  EXPECT_FALSE(cert.contains("regularity_c"));
  EXPECT_EQ(cert["obligations"].size(), 4u);
  expect_driver_bounds(cert, {[](const BigInt& n) { return Rational(n - 1); }},
                       [](const BigInt& n) { return Rational(n); });
  expect_positive_base(cert, [](const BigInt& n, const std::vector<Rational>& t) -> Rational {
    if (n == 1) return 0;
    return t[at(n - floor_half(n))] + t[at(floor_half(n))] + Rational(n - 1);
  });
}

TEST(Certificate, ThreeWaySplitWithQuadraticWorkIsCase3WithDriverNSquared) {
  const Json& c = claim("orchard::trie3 / split work");
  ASSERT_EQ(c["verdict"], "holds");
  const Json& cert = c["basis"]["certificate"];
  ASSERT_TRUE(cert.is_object());
  // Common practice: 3 T(n/3) + n^2 is case 3 (log_3 3 = 1 < 2).
  EXPECT_EQ(cert["method"], "divide");
  EXPECT_EQ(cert["proof"], "master theorem, case 3");
  EXPECT_EQ(cert["driver_class"], "n^2");
  // Regularity from the limit a/b^2 = 1/3, not from a bound proved on f.
  EXPECT_FALSE(cert.contains("regularity_c"));
  EXPECT_EQ(cert["obligations"].size(), 5u);
  expect_driver_bounds(cert, {square}, square);
}

TEST(Certificate, BinarySearchProbesAreCase2WithAConstantDriver) {
  const Json& c = claim("orchard::bisect / probes");
  ASSERT_EQ(c["verdict"], "holds");
  const Json& cert = c["basis"]["certificate"];
  ASSERT_TRUE(cert.is_object());
  EXPECT_EQ(cert["method"], "divide");
  EXPECT_EQ(cert["proof"], "master theorem, case 2");
  EXPECT_EQ(cert["driver_class"], "1");
  expect_driver_bounds(cert, {[](const BigInt&) { return Rational(1); }},
                       [](const BigInt&) { return Rational(1); });
  expect_positive_base(cert, [](const BigInt& n, const std::vector<Rational>& t) -> Rational {
    if (n == 1) return 1;
    return t[at(floor_half(n))] + 1;
  });
}

TEST(Certificate, SubtractOneWithLinearDriverIsSubtract) {
  const Json& c = claim("orchard::chain / relinks");
  ASSERT_EQ(c["verdict"], "holds");
  const Json& cert = c["basis"]["certificate"];
  ASSERT_TRUE(cert.is_object());
  EXPECT_EQ(cert["method"], "subtract");
  EXPECT_EQ(cert["proof"], "subtract-and-conquer, a = 1");
  EXPECT_EQ(cert["driver_class"], "n");
  expect_driver_bounds(cert, {[](const BigInt& n) { return Rational(2 * n + 3); }},
                       [](const BigInt& n) { return Rational(n); });
}

TEST(Certificate, ProvedRegularityIsCarriedAndHoldsOnEveryLine) {
  const Json& c = claim("orchard::pack / moves, parity-weighted");
  ASSERT_EQ(c["verdict"], "holds");
  const Json& cert = c["basis"]["certificate"];
  ASSERT_TRUE(cert.is_object());
  EXPECT_EQ(cert["method"], "divide");
  EXPECT_EQ(cert["proof"], "master theorem, case 3");
  EXPECT_EQ(cert["driver_class"], "n^2");
  Exact h = [](const BigInt& n) { return even(n) ? square(n) : Rational(3) * square(n) / 4; };
  // Both lines' bodies, at every size: n^2 and 3n^2/4.
  expect_driver_bounds(cert, {square, [](const BigInt& n) { return Rational(3) * square(n) / 4; }},
                       square);
  ASSERT_TRUE(cert.contains("regularity_c"));
  ASSERT_TRUE(cert.contains("regularity_from"));
  Rational rc = rational_of(cert["regularity_c"]);
  EXPECT_LT(rc, 1);
  BigInt from(cert["regularity_from"].get<std::string>());
  // a h(floor(n/2)) <= c h(n), a = 2, checked exactly.
  for (const BigInt& n : sizes_from(from)) {
    if (2 * h(floor_half(n)) > rc * h(n)) {
      ADD_FAILURE() << "regularity fails at n = " << n;
      break;
    }
  }
}

TEST(Certificate, CaseThreeByComparisonHasNoRegularityOfF) {
  const Json& c = claim("orchard::pack / moves, odd sizes cheap");
  ASSERT_EQ(c["verdict"], "holds");
  const Json& cert = c["basis"]["certificate"];
  ASSERT_TRUE(cert.is_object());
  EXPECT_EQ(cert["method"], "divide");
  EXPECT_EQ(cert["proof"], "comparison with the driver n^2: master theorem, case 3");
  EXPECT_FALSE(cert.contains("regularity_c"));
  EXPECT_FALSE(cert.contains("regularity_from"));
  expect_driver_bounds(cert, {square, [](const BigInt& n) { return square(n) / 8; }}, square);
}

TEST(Certificate, UnevenSplitIsAkraBazzi) {
  const Json& c = claim("orchard::kd_split / comparisons, uneven split");
  ASSERT_EQ(c["verdict"], "holds");
  const Json& cert = c["basis"]["certificate"];
  ASSERT_TRUE(cert.is_object());
  // Common practice: T(n/3) + T(2n/3) + n has p = 1 and is Θ(n lg n).
  EXPECT_EQ(cert["method"], "divide");
  EXPECT_EQ(cert["proof"], "Akra–Bazzi");
  EXPECT_EQ(cert["driver_class"], "n");
  expect_driver_bounds(cert, {[](const BigInt& n) { return Rational(n); }},
                       [](const BigInt& n) { return Rational(n); });
}

// Every side's bound as the JSON induction object prints it ("<= n*lg(n)",
// "= n^2 + 4n", "<= lg(n) + 1 and >= lg(n + 1)"), each parsed back.
std::vector<std::string> induction_bounds(const std::string& printed) {
  std::vector<std::string> out;
  std::regex side("(<=|<|>=|>|=) (.*?)(?= and (<=|<|>=|>) |$)");
  for (std::sregex_iterator it(printed.begin(), printed.end(), side), end; it != end; ++it) {
    out.push_back((*it)[2].str());
  }
  return out;
}

void expect_parses_back(const std::string& text) {
  ExprPtr e = parse_expression(SourceText::whole("<test>", text));
  ASSERT_TRUE(e);
  ExprPtr again = parse_expression(SourceText::whole("<test>", print(*e)));
  EXPECT_TRUE(same_tree(*e, *again)) << text;
}

TEST(Certificate, InductionListsChecksAndOneStepPerResidue) {
  const Json& c = claim("orchard::merge_runs / comparisons, documented");
  ASSERT_EQ(c["verdict"], "holds");
  const Json& cert = c["basis"]["certificate"];
  const Json& induction = c["basis"]["induction"];
  ASSERT_TRUE(cert.is_object());
  ASSERT_TRUE(induction.is_object());
  EXPECT_EQ(cert["method"], "induction");
  EXPECT_EQ(cert["proof"], c["proof"]);
  EXPECT_FALSE(cert.contains("driver_class"));
  // One side, not strengthened: the exact check, then the step per residue.
  ASSERT_EQ(induction["strengthening"], "");
  uint64_t modulus = induction["modulus"].get<uint64_t>();
  ASSERT_EQ(cert["obligations"].size(), 1 + modulus);
  EXPECT_EQ(cert["obligations"][0], "T(n) <= n*lg(n) checked exactly for " +
                                        induction["checked_from"].get<std::string>() +
                                        " <= n <= " + induction["checked_to"].get<std::string>());
  std::vector<std::string> bounds = induction_bounds(induction["bound"]);
  ASSERT_EQ(bounds, (std::vector<std::string>{"n*lg(n)"}));
  for (const std::string& b : bounds) expect_parses_back(b);
}

TEST(Certificate, InductionOnAnIdentityHasBothSides) {
  const Json& c = claim("orchard::chain / relinks, exact");
  ASSERT_EQ(c["verdict"], "holds");
  const Json& cert = c["basis"]["certificate"];
  ASSERT_TRUE(cert.is_object());
  EXPECT_EQ(cert["method"], "induction");
  // T(n) = n^2 + 4n: (n - 1)^2 + 4(n - 1) + 2n + 3 = n^2 + 4n, so the slack
  // vanishes on both sides [calc].
  ASSERT_EQ(cert["obligations"].size(), 4u);
  EXPECT_NE(cert["obligations"][1].get<std::string>().find("slack = 0"), std::string::npos);
  std::vector<std::string> bounds = induction_bounds(c["basis"]["induction"]["bound"]);
  ASSERT_EQ(bounds, (std::vector<std::string>{"n^2 + 4n"}));
  for (const std::string& b : bounds) expect_parses_back(b);
}

TEST(Certificate, AClassWrittenAsATermGetsNone) {
  // Θ(n^2) as a term is any function of the class: no constants hold for
  // all of them, so the holds carries no certificate.
  const Json& c = claim("orchard::pack / moves, class written");
  ASSERT_EQ(c["verdict"], "holds");
  EXPECT_TRUE(c["basis"]["certificate"].is_null());
}

TEST(Certificate, OnlyHoldsCarriesOne) {
  RunResult run = check_entries(load_claim_text(R"toml(
[[claim]]
name       = "orchard::merge_runs / comparisons (deliberately wrong)"
recurrence = """
T(n) = T(ceil(n/2)) + T(floor(n/2)) + n - 1
T(1) = 0
"""
bound      = "O(n)"
)toml",
                                                "certificate.toml"),
                                test_options());
  ASSERT_EQ(run.claims.size(), 1u);
  EXPECT_EQ(run.claims[0].verdict, Verdict::kRefuted);
  EXPECT_FALSE(run.claims[0].basis.certificate.has_value());
}

TEST(Certificate, SameClaimsSameBytesAndTheyReadBack) {
  std::string json = render_json(run_result());
  EXPECT_EQ(render_json(check_claims()), json);
  EXPECT_EQ(render_json(read_json_report(json, "old.json")), json);
}

// The independent re-checker (verifier/recheck, written apart from the
// prover) re-verifies every certificate these claims carry.
TEST(Certificate, TheIndependentRecheckerAcceptsThem) {
  std::multimap<std::string, Claim> claims;
  for (const ClaimEntry& e : load_claim_text(kClaims, "certificate.toml")) {
    ASSERT_TRUE(e.claim);
    claims.emplace(e.claim->name, *e.claim);
  }
  recheck::RecheckResult result =
      recheck::recheck_report(render_json(run_result()), "certificate.json", claims);
  ASSERT_EQ(result.claims.size(), 10u);  // every claim above holds
  for (const recheck::RecheckedClaim& c : result.claims) {
    if (c.name == "orchard::pack / moves, class written") {
      EXPECT_EQ(c.status, recheck::RuleStatus::kNotRechecked) << recheck::status_line(c);
      continue;
    }
    EXPECT_EQ(c.status, recheck::RuleStatus::kRechecked)
        << c.name << ": " << recheck::status_line(c);
  }
}

TEST(DriverClassText, ReadsBackAsTheClass) {
  EXPECT_EQ(driver_class_text(GrowthClass::polylog(1)), "n");
  EXPECT_EQ(driver_class_text(GrowthClass::polylog(2)), "n^2");
  EXPECT_EQ(driver_class_text(GrowthClass::polylog(1, 1)), "n*lg(n)");
  EXPECT_EQ(driver_class_text(GrowthClass::polylog(Rational(1, 2))), "n^(1/2)");
  EXPECT_EQ(driver_class_text(GrowthClass::polylog(0, 2)), "lg(n)^2");
  EXPECT_EQ(driver_class_text(GrowthClass::polylog(1, -1)), "n/lg(n)");
  EXPECT_EQ(driver_class_text(GrowthClass::polylog(-1)), "1/n");
  EXPECT_EQ(driver_class_text(GrowthClass::polylog(-2, -1)), "1/(n^2*lg(n))");
  EXPECT_EQ(driver_class_text(GrowthClass::constant()), "1");
  // A rational base in front (subtract-and-conquer's exponential drivers).
  EXPECT_EQ(driver_class_text(GrowthClass::exponential(2)), "2^n");
  EXPECT_EQ(driver_class_text(GrowthClass::exponential(2).times(GrowthClass::polylog(1))), "2^n*n");
  EXPECT_EQ(driver_class_text(GrowthClass::exponential(Rational(3, 2))), "(3/2)^n");
  // No text of the form r^n n^q lg^k n: lg lg n, an irrational base, lg^(1/2) n.
  EXPECT_FALSE(driver_class_text(GrowthClass::polylog(1, 0, 1)).has_value());
  EXPECT_FALSE(driver_class_text(GrowthClass::exponential(RealNumber::root(2, 2))).has_value());
  EXPECT_FALSE(driver_class_text(GrowthClass::polylog(0, Rational(1, 2))).has_value());
  for (const char* text : {"n", "n^2", "n*lg(n)", "n^(1/2)", "lg(n)^2", "n/lg(n)", "1/n",
                           "1/(n^2*lg(n))", "1", "2^n", "2^n*n", "(3/2)^n"}) {
    expect_parses_back(text);
  }
}

// ---------------------------------------------------------------------------
// The demo library: every holds carries a certificate with its method's data
// (the master theorem, Akra–Bazzi, subtract-and-conquer, a change of
// variables, a linear recurrence, a full-history sum, a comparison with two
// drivers or induction).

class DemoCertificates : public testing::TestWithParam<const char*> {};

TEST_P(DemoCertificates, EveryHoldsWithASupportedProofHasOne) {
  std::string path = std::string(THETAGATE_SOURCE_DIR) + "/claims/" + GetParam();
  CheckOptions options;
  options.budget.max_seconds = 86400;
  RunResult run = check_entries(load_claim_file(path), options);
  Json j = Json::parse(render_json(run));
  int holds = 0;
  for (const Json& c : j["claims"]) {
    const Json& cert = c["basis"]["certificate"];
    if (c["verdict"] != "holds") {
      EXPECT_TRUE(cert.is_null()) << c["name"];
      continue;
    }
    ++holds;
    std::string proof = c["proof"];
    ASSERT_TRUE(cert.is_object()) << c["name"] << ": " << proof;
    EXPECT_EQ(cert["proof"], proof);
    EXPECT_FALSE(cert["obligations"].empty());
    if (c["basis"]["kind"] == "induction") {
      // The substitution method, induction on dyadic blocks (T's closed
      // forms with floors of lg n), or a proof over a sum of earlier values.
      if (c["basis"]["induction"]["dyadic"]) {
        EXPECT_EQ(cert["method"], "dyadic-induction");
      } else {
        EXPECT_TRUE(cert["method"] == "induction" || cert["method"] == "sum-difference" ||
                    cert["method"] == "sum-step")
            << cert["method"];
      }
      std::vector<std::string> bounds = induction_bounds(c["basis"]["induction"]["bound"]);
      EXPECT_FALSE(bounds.empty()) << c["basis"]["induction"]["bound"];
      for (const std::string& b : bounds) expect_parses_back(b);
    } else if (cert["method"] == "linear") {
      ASSERT_GE(cert["root_polynomial"].size(), 2u) << c["name"];
      EXPECT_LT(rational_of(cert["root_low"]), rational_of(cert["root_high"]));
    } else if (cert["method"] == "full-history") {
      expect_parses_back(cert["bound_class"]);
      EXPECT_GT(rational_of(cert["bound_low"]), 0);
      EXPECT_LE(rational_of(cert["bound_low"]), rational_of(cert["bound_high"]));
    } else {
      EXPECT_TRUE(cert["method"] == "divide" || cert["method"] == "subtract" ||
                  cert["method"] == "change-of-variables")
          << cert["method"];
      expect_parses_back(cert["driver_class"]);
      EXPECT_GT(rational_of(cert["driver_low"]), 0);
      EXPECT_LE(rational_of(cert["driver_low"]), rational_of(cert["driver_high"]));
    }
  }
  EXPECT_GT(holds, 0);
}

INSTANTIATE_TEST_SUITE_P(Claims, DemoCertificates,
                         testing::Values("average.toml", "bignum.toml", "ropes.toml", "search.toml",
                                         "sorting.toml", "spatial.toml", "trees.toml"),
                         [](const testing::TestParamInfo<const char*>& info) {
                           std::string name = info.param;
                           return name.substr(0, name.find('.'));
                         });

}  // namespace
}  // namespace thetagate::engine
