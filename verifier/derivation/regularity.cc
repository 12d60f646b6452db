#include "verifier/derivation/regularity.h"

#include "verifier/derivation/series.h"

namespace thetagate::engine {

namespace {

// The family starts here: expansions of floors and helpers converge well
// before, and every smaller member is still listed by the sampled sizes.
const BigInt kFamilyFrom = 64;
// The largest modulus tried (residues of n for parity of floor(n/b), ...).
constexpr uint64_t kMaxModulus = 720;

}  // namespace

std::optional<RegularityFamily> regularity_failure_family(const Expr& driving, const Rational& a,
                                                          const Rational& scale,
                                                          const HelperTable* helpers,
                                                          uint64_t work_budget) {
  ExprPtr argument =
      make_call("floor", {make_binary(ExprKind::kMul, make_number(scale), make_variable())});
  uint64_t work = 0;
  uint64_t modulus = 1;
  for (;;) {
    try {
      for (uint64_t r = 0; r < modulus; ++r) {
        SeriesContext ctx;
        ctx.from = kFamilyFrom;
        ctx.modulus = modulus;
        ctx.residue = r;
        ctx.helpers = helpers;
        auto gap = [&](const SeriesContext& c) {
          Series n = variable_series();
          Series m = expand(*argument, n, c);
          Series lhs = thetagate::engine::scale(expand(driving, m, c), Coef::of(a), c.precision);
          return add(lhs, negate(expand(driving, n, c)), c.precision);
        };
        try {
          prove_nonnegative(gap, ctx, work, work_budget);
          return RegularityFamily{modulus, r, kFamilyFrom};
        } catch (const SeriesUnsupported& e) {
          if (work > work_budget) return std::nullopt;
        }
      }
      return std::nullopt;
    } catch (const NeedModulus& need) {
      modulus *= need.factor;
      if (modulus > kMaxModulus) return std::nullopt;
    }
  }
}

}  // namespace thetagate::engine
