// What the re-checker's rules share (rules.h is the entry point): reading a
// certificate's text, splitting a line into its calls of T and its driver,
// the obligations "E(n) >= 0 for every n past a point" and "T against a
// bound on a range", and the declarations of the rules themselves, one per
// certificate method: theorem_rules.cc (a theorem's hypotheses and
// conclusion), induction_rule.cc (an explicit bound by induction) and
// sum_rules.cc (explicit bounds over a sum of earlier values) and
// dyadic_rule.cc (induction on dyadic blocks).
#ifndef THETAGATE_VERIFIER_RECHECK_RULE_SUPPORT_H_
#define THETAGATE_VERIFIER_RECHECK_RULE_SUPPORT_H_

#include <functional>
#include <map>
#include <string>
#include <vector>

#include "verifier/model/bound.h"
#include "verifier/model/recurrence.h"
#include "verifier/recheck/expansion.h"
#include "verifier/recheck/rules.h"
#include "verifier/recheck/small_eval.h"

namespace thetagate::engine::recheck {

// An obligation that fails: the certificate is rejected. (Unsupported, from
// expansion.h, is the other way out: the claim is then not re-checked.)
struct Rejected {
  std::string why;
};

// The certificate's texts, read strictly: anything else rejects it.
ExprPtr parse_text(const std::string& text, const std::string& what);
Rational parse_rational(const std::string& text, const std::string& what);
BigInt parse_size(const std::string& text, const std::string& what);

// A line's body as sum of a_i T(arg_i) + f(n), every a_i a rational.
struct Call {
  Rational a;
  ExprPtr arg;
};
struct Linear {
  std::vector<Call> calls;
  ExprPtr f;  // null: no driver
};
bool calls_function(const Expr& e, const std::string& name);
// Adds coef · e to `out`; throws Unsupported where T is not linear.
void linearize(const ExprPtr& e, const Rational& coef, const std::string& name, Linear& out);
// A line that sums over earlier values, A(n) + W(n)·sum(k, lo, hi, T(k)):
// A (zero when absent) and W as expressions, and the sum's node inside the
// line. Throws Unsupported for any other shape (T outside the one sum, a
// sum whose body is not T(k), T twice).
struct SumLine {
  ExprPtr a, w;
  const Expr* sum = nullptr;
};
SumLine sum_line_of(const ExprPtr& body, const std::string& name);
// The driver's enclosure with the size read as s·n + t (zero without one).
Expansion driver_of(const Linear& lin, const Context& ctx, const Rational& s = 1,
                    const Rational& t = 0);

// The leading key of a growth function with a positive coefficient, and of
// a class written in the claim language.
Key leading_key(const Expansion& e, const std::string& what);
Key growth_key(const Expr& g, const std::string& what);
std::string key_text(const Key& k);

// Rejects unless a class ordered `upper` and `lower` (-1, 0, +1) against the
// claimed one from above and below establishes the claim's kind.
void require_establishes(const Bound& bound, int upper, int lower, const std::string& gives);

// e(n) >= 0 for every real n >= ctx.from on ctx's class: a proof that fails
// for sure rejects the certificate; one the re-checker cannot finish leaves
// the claim not re-checked. `count` counts the obligations checked.
void require(const Expansion& e, const Context& ctx, const std::string& statement, int& count);
// The same with E expanded in x = n + shift for the first small shift that
// proves it; rejected only when the unshifted attempt fails for sure.
void require_shifted(const std::function<Expansion(const Context&, const Rational&)>& build,
                     const Context& ctx, const std::string& statement, int& count);

// ", n ≡ r (mod L)" for messages ("" when L = 1).
std::string class_name(const Context& ctx);

// Runs `body` on every residue class mod L for the first L on which the
// re-checker can follow everything.
void on_some_modulus(const std::function<void(const Context&, int&)>& body, const BigInt& from,
                     const std::map<std::string, Function>* helpers, int& count);

// The recursive structure shared by every line that applies at large n,
// and the threshold beyond which only such lines apply.
struct Structure {
  std::vector<Call> calls;  // of the first recursive line
  std::vector<const CaseLine*> recursive;
  BigInt threshold = 1;  // lines without calls apply only at n < threshold
};
Structure structure_of(const Recurrence& r);

// Every size from lo to hi: T(n) > 0 (or >= 0).
void require_positive(SmallEvaluator& eval, const BigInt& lo, const BigInt& hi, bool strict,
                      int& count);

// One side of an explicit bound: its expression and strictness, and the
// hypothesis carried through the step (the certificate's `hypothesis`).
struct SideProof {
  Side side;
  ExprPtr claimed;
  bool strict;
  ExprPtr carried;
};
std::vector<SideProof> sides_of(const Bound& bound, const CertificateData& c);
// T(n) against e, on sp's side, for every n in [lo, hi] (exactly).
void require_range(SmallEvaluator& eval, const SideProof& sp, const ExprPtr& e, const BigInt& lo,
                   const BigInt& hi, int& count);

// The rules, one per certificate method. Each throws Rejected or
// Unsupported, and adds the obligations it checked to `count`.
using Rule = void (*)(const Recurrence&, const Bound&, const CertificateData&, int& count);
void divide(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count);
void subtract(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count);
void linear(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count);
void full_history(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count);
void change_of_variables(const Recurrence& r, const Bound& bound, const CertificateData& c,
                         int& count);
void induction(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count);
void sum_difference(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count);
void sum_step(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count);
void dyadic_induction(const Recurrence& r, const Bound& bound, const CertificateData& c,
                      int& count);

}  // namespace thetagate::engine::recheck

#endif  // THETAGATE_VERIFIER_RECHECK_RULE_SUPPORT_H_
