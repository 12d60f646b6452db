// Proof certificates: what a `holds` rests on, as data an independent
// checker re-verifies from the claim's own recurrence and bound without
// running the prover (docs/design.md, "Proofs"; the JSON report's
// basis.certificate, docs/json-schema.md).
#ifndef THETAGATE_VERIFIER_DERIVATION_CERTIFICATE_H_
#define THETAGATE_VERIFIER_DERIVATION_CERTIFICATE_H_

#include <optional>
#include <string>
#include <vector>

#include "verifier/derivation/derive.h"
#include "verifier/derivation/growth.h"
#include "verifier/derivation/induction_proof.h"
#include "verifier/model/recurrence.h"

namespace thetagate::engine {

struct Certificate {
  // "divide", "subtract", "change-of-variables", "normalised-change-of-variables",
  // "linear", "full-history" or "induction"
  std::string method;
  std::string proof;  // the proof as the report names it: "master theorem, case 2"
  // divide and subtract: the driving function f (the non-recursive part of
  // T's recursive line; every line's body when f is given by case lines or
  // by a helper with case lines) lies between driver_low·g(n) and
  // driver_high·g(n) for every integer n >= driver_from, g = driver_class.
  std::string driver_class;  // g in the claim language: "n", "n^2", "n*lg(n)", "1/n", "1"
  std::string driver_low;    // positive rationals in decimal: "1/2", "3"
  std::string driver_high;
  std::string driver_from;  // a whole number in decimal
  // A comparison with two drivers (f has no single class): driver_low
  // bounds f from below by this class instead of driver_class, which then
  // bounds it from above only. "" when both bounds use driver_class.
  std::string driver_class_low;
  // Case 3 concluded through a regularity bound proved on f itself:
  // a f(floor(n/b)) <= c f(n) for every n >= regularity_from. "" when unused.
  std::string regularity_c;
  std::string regularity_from;
  // linear: the growing root rho, given as the only real root of
  // root_polynomial (coefficients in decimal, x^0 first) in (root_low, root_high].
  std::vector<std::string> root_polynomial;
  std::string root_low, root_high;
  // full-history: bound_low·g(n) <= T(n) <= bound_high·g(n) at n = bound_from,
  // carried by the differenced recurrence to every n > bound_from; g = bound_class.
  std::string bound_class, bound_low, bound_high, bound_from;
  // normalised-change-of-variables: T was divided by normaliser = n^q; the
  // factor r(n) left on the root term lies in [factor_low, factor_high] at
  // every n >= factor_from where the recursive line applies and tends to
  // factor_limit (a0); the product of r/a0 along one chain of sizes lies in
  // [chain_low, chain_high]. The driver keys bound f itself, as for
  // change-of-variables.
  std::string normaliser, factor_limit, factor_low, factor_high, factor_from;
  std::string chain_low, chain_high;
  // The proof's hypotheses, one statement each, in words and formulas:
  // "f(n) >= (1/2) n for every n >= 64", "T(n) > 0 for 31 <= n <= 63", ...
  std::vector<std::string> obligations;
};

// The certificate of a Θ class that the master theorem (any case, the
// polylog extension, case 3 by comparison), Akra–Bazzi ("divide"),
// subtract-and-conquer ("subtract"), a change of variables m = lg n
// ("change-of-variables"; after dividing T by a power of n,
// "normalised-change-of-variables"), a linear recurrence with constant coefficients
// ("linear": the growing root) or a full-history sum ("full-history": the
// constants at a start) derived; nullopt for any other method, and where f is not between constant
// multiples of one class n^q lg^k n (q rational, k whole): f = 0, lg lg n factors, case lines of
// different classes, growth classes written as terms (any member would do,
// so no constants hold for all of them), f with no class. The constants are
// found from exact or certified values of f/g at sizes from driver_from on
// (a range, and 2^k, 2^k ± 1, 2^k ± 2, 3·2^k and b^k ± 1 up to 256 bits),
// with a factor 2 of room each way. Evaluates f, g and T under its own small
// budget; `clock_limit` as derive() takes it. Never throws for a valid model.
// REQUIRES: derivation is derive(recurrence).
std::optional<Certificate> theorem_certificate(const Recurrence& recurrence,
                                               const Derivation& derivation,
                                               std::optional<double> clock_limit = std::nullopt);

// The certificate of a proof by induction: one obligation per exact check,
// per residue class of each side's step, and per strengthened bound (B' <= B).
Certificate induction_certificate(const InductionProof& proof);

// g = n^alpha lg^beta n in the claim language ("n*lg(n)", "n^(1/2)",
// "n/lg(n)", "1/n", "1"), text that parse_expression reads back; nullopt
// when g is not of that form with alpha rational and beta whole (an
// exponential factor, lg lg n, an irrational exponent).
std::optional<std::string> driver_class_text(const GrowthClass& g);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_DERIVATION_CERTIFICATE_H_
