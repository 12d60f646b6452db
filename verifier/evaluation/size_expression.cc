#include "verifier/evaluation/size_expression.h"

#include "verifier/evaluation/expression_eval.h"
#include "verifier/evaluation/precision.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {

namespace {
// The most precision a size written with irrationals is computed at: enough
// to settle the floor of one of about 19,700 digits.
constexpr long kMaxSizePrecisionBits = long{1} << 16;
}  // namespace

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
  // floor(sqrt(2) * 10^40) needs more than the starting 128 bits to settle:
  // the precision doubles until it does, up to kMaxSizePrecisionBits.
  PrecisionOutcome<Value> outcome;
  try {
    outcome = run_at_increasing_precision(
        ctx, kMaxSizePrecisionBits, [&] { return evaluate_expr(*e, Value(int64_t{0}), s); }, [] {});
  } catch (const BudgetExceeded& error) {
    fail_at(source, 0, std::string("the size is too large: ") + error.what());
  }
  if (!outcome.decided()) {
    fail_at(source, 0,
            "the size could not be settled as a whole number at " + std::to_string(outcome.bits) +
                " bits of precision: " + outcome.shortfall,
            "sizes are whole numbers: 10^6, 3*2^50, floor(sqrt(2) * 10^40)");
  }
  const Value& v = *outcome.value;
  if (!v.is_integer()) {
    fail_at(source, 0, "the size " + v.str() + " is not a whole number",
            "sizes are whole numbers: 10^6, 3*2^50");
  }
  if (v.integer() < 0) fail_at(source, 0, "the size " + v.str() + " is negative", "sizes are >= 0");
  return v.integer();
}

}  // namespace thetagate::engine
