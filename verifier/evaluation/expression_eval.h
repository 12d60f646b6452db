// Evaluates expressions of the language at a size n: arithmetic, builtins,
// conditions, helper functions. Calls of the recurrence itself are handed to
// a CallResolver (the recurrence evaluator's memo).
#ifndef THETAGATE_VERIFIER_EVALUATION_EXPRESSION_EVAL_H_
#define THETAGATE_VERIFIER_EVALUATION_EXPRESSION_EVAL_H_

#include <functional>
#include <utility>

#include "verifier/model/recurrence.h"
#include "verifier/numbers/value.h"

namespace thetagate::engine {

class CallResolver {
 public:
  virtual ~CallResolver() = default;
  // The value of the recurrence's `call` (a kCall node of it) at size n;
  // call_argument() below gives the argument it stands for.
  virtual Value resolve(const Expr& call, const Value& n, const struct EvalScope& scope) = 0;
  // The value of a sum node at n. The default adds its terms one by one
  // (sum_directly); the recurrence evaluator keeps running sums instead.
  virtual Value sum(const Expr& sum, const Value& n, const struct EvalScope& scope);
  // The value of helper `f` at `argument` (the value of the call's
  // argument). The default evaluates its line (evaluate_helper); the
  // recurrence evaluator remembers values by argument and charges each one
  // it computes to its step budget and clock.
  virtual Value helper(const Function& f, const Value& argument, const struct EvalScope& scope);
};

// The value of a variable bound by an enclosing sum; a chain, innermost first.
struct Binding {
  const std::string* name = nullptr;
  Value value;
  const Binding* outer = nullptr;
};

struct EvalScope {
  const SourceText* source = nullptr;  // locates errors
  const NumericContext* ctx = nullptr;
  const Recurrence* recurrence = nullptr;  // for helper functions; may be null
  CallResolver* resolver = nullptr;        // for the recurrence's calls; may be null
  const Binding* bound = nullptr;          // the enclosing sums' variables
};

// The limits of a sum at n as whole numbers. Throws InputError (located at
// the limit) when one is not a whole number, BudgetExceeded when one is
// beyond 2^62.
std::pair<int64_t, int64_t> sum_limits(const Expr& sum, const Value& n, const EvalScope& scope);
// The sum's body at its variable = k.
Value sum_term(const Expr& sum, int64_t k, const Value& n, const EvalScope& scope);
// The sum term by term; `charge` is called once per term (it may throw
// BudgetExceeded). Without a charge, more than 2^22 terms is a budget error.
Value sum_directly(const Expr& sum, const Value& n, const EvalScope& scope,
                   const std::function<void()>& charge = nullptr);

// The value of `e` at n. Throws InputError (located) for domain errors,
// unknown functions and recurrence calls where none are allowed;
// PrecisionShortfall and BudgetExceeded pass through.
Value evaluate_expr(const Expr& e, const Value& n, const EvalScope& scope);

// Helper `f` at `argument`: its applicable line, evaluated with the
// argument as n (and no enclosing sum variables: helpers cannot see them).
Value evaluate_helper(const Function& f, const Value& argument, const EvalScope& scope);

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
