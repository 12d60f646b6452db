#include "verifier/evaluation/size_expression.h"

#include "verifier/evaluation/expression_eval.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {

BigInt evaluate_size(const std::string& text, const std::string& origin) {
  SourceText source = SourceText::whole(origin, text);
  ExprPtr e = parse_expression(source);
  if (mentions_n(*e)) {
    fail_at(source, 0, "a size must be a number, not an expression in n", "for example 2^4096 + 7");
  }
  NumericContext ctx;
  ctx.max_value_bits = 1u << 24;
  EvalScope s;
  s.source = &source;
  s.ctx = &ctx;
  Value v;
  try {
    v = evaluate_expr(*e, Value(int64_t{0}), s);
  } catch (const BudgetExceeded& error) {
    fail_at(source, 0, std::string("the size is too large: ") + error.what());
  } catch (const PrecisionShortfall&) {
    fail_at(source, 0, "the size is not a whole number", "sizes are whole numbers: 10^6, 3*2^50");
  }
  if (!v.is_integer()) {
    fail_at(source, 0, "the size " + v.str() + " is not a whole number",
            "sizes are whole numbers: 10^6, 3*2^50");
  }
  if (v.integer() < 0) fail_at(source, 0, "the size " + v.str() + " is negative", "sizes are >= 0");
  return v.integer();
}

}  // namespace thetagate::engine
