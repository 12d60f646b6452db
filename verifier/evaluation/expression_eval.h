// Evaluates expressions of the language at a size n: arithmetic, builtins,
// conditions, helper functions. Calls of the recurrence itself are handed to
// a CallResolver (the recurrence evaluator's memo).
#ifndef THETAGATE_VERIFIER_EVALUATION_EXPRESSION_EVAL_H_
#define THETAGATE_VERIFIER_EVALUATION_EXPRESSION_EVAL_H_

#include "verifier/model/recurrence.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine {

class CallResolver {
 public:
  virtual ~CallResolver() = default;
  // The value of the recurrence's `call` (a kCall node of it) at size n;
  // call_argument() below gives the argument it stands for.
  virtual Value resolve(const Expr& call, const Value& n, const struct EvalScope& scope) = 0;
};

struct EvalScope {
  const SourceText* source = nullptr;  // locates errors
  const NumericContext* ctx = nullptr;
  const Recurrence* recurrence = nullptr;  // for helper functions; may be null
  CallResolver* resolver = nullptr;        // for the recurrence's calls; may be null
};

// The value of `e` at n. Throws InputError (located) for domain errors,
// unknown functions and recurrence calls where none are allowed;
// PrecisionShortfall and BudgetExceeded pass through.
Value evaluate_expr(const Expr& e, const Value& n, const EvalScope& scope);

// The truth of a condition at n.
bool test_condition(const Expr& cond, const Value& n, const EvalScope& scope);

// The case line of `f` that applies at n: points, then conditional lines in
// order, then the line without a condition. Throws InputError if none.
const CaseLine& select_case(const Function& f, const Value& n, const EvalScope& scope);

// The argument of a recurrence call at n, rounded down to an integer.
BigInt call_argument(const Expr& call, const Value& n, const EvalScope& scope);
// The same argument as a canonical integer value (see canonical_integer):
// no big-integer copy, ready as a memo key.
Value call_argument_value(const Expr& call, const Value& n, const EvalScope& scope);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_EVALUATION_EXPRESSION_EVAL_H_
