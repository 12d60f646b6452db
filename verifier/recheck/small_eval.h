// The re-checker's own evaluator of a recurrence at small sizes: T(n) for
// n up to about 10^5, straight from the claim's lines, with the numbers
// library's exact values (certified intervals only where irrational). It
// shares nothing with the engine's evaluator; it is slow and simple on
// purpose, and it is only asked for the base ranges of a certificate.
#ifndef THETAGATE_VERIFIER_RECHECK_SMALL_EVAL_H_
#define THETAGATE_VERIFIER_RECHECK_SMALL_EVAL_H_

#include <map>
#include <string>

#include "verifier/model/recurrence.h"
#include "verifier/numbers/value.h"
#include "verifier/syntax/expr.h"

namespace thetagate::engine::recheck {

class SmallEvaluator {
 public:
  explicit SmallEvaluator(const Recurrence& recurrence);

  // T(n). Throws Unsupported (too large, a comparison the precision cannot
  // decide, a call that does not shrink where no default base applies).
  Value at(const BigInt& n);
  // An expression at size n (T calls evaluated).
  Value value(const Expr& e, const BigInt& n);
  // The sign of a - b: -1, 0, +1; throws Unsupported when undecidable.
  int sign_of_difference(const Value& a, const Value& b) const;
  // Whether a - b >= 0 (or > 0 when strict) for sure: true, false, or
  // Unsupported when the enclosure straddles the boundary.
  bool at_least(const Value& a, const Value& b, bool strict) const;

  static constexpr long kLargestSize = 200000;

 private:
  Value eval(const Expr& e, const Value& n, std::map<std::string, Value>& bound, int depth);
  bool test(const Expr& c, const Value& n, std::map<std::string, Value>& bound, int depth);
  Value call_argument(const Expr& call, const Value& n, std::map<std::string, Value>& bound,
                      int depth);
  const CaseLine& line_at(const Function& f, const Value& n, int depth);

  const Recurrence& recurrence_;
  NumericContext ctx_;
  std::map<BigInt, Value> memo_;
};

}  // namespace thetagate::engine::recheck

#endif  // THETAGATE_VERIFIER_RECHECK_SMALL_EVAL_H_
