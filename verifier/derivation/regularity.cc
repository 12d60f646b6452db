#include "verifier/derivation/regularity.h"

#include "verifier/derivation/series.h"

namespace thetagate::engine {

namespace {

// The family starts here: expansions of floors and helpers converge well
// before, and every smaller member is still listed by the sampled sizes.
const BigInt kFamilyFrom = 64;
// The largest modulus tried (residues of n for parity of floor(n/b), ...).
constexpr uint64_t kMaxModulus = 720;

// floor(scale·n), the argument of the recursive call.
ExprPtr floor_argument(const Rational& scale) {
  return make_call("floor", {make_binary(ExprKind::kMul, make_number(scale), make_variable())});
}

// The series of factor_n·f(n) - factor_m·f(floor(scale·n)) on ctx's residue class.
Series weighted_gap(const Expr& driving, const Expr& argument, const Rational& factor_n,
                    const Rational& factor_m, const SeriesContext& c) {
  Series n = variable_series();
  Series m = expand(argument, n, c);
  Series at_m = scale(expand(driving, m, c), Coef::of(factor_m), c.precision);
  Series at_n = scale(expand(driving, n, c), Coef::of(factor_n), c.precision);
  return add(at_n, negate(at_m), c.precision);
}

// What a proof attempt on one residue class asks of the walk over them.
enum class Next { kNextResidue, kStop };

// Walks the residue classes of n modulo a modulus that grows as the floors
// ask (NeedModulus restarts the walk with a finer modulus) and calls
// `attempt(ctx)` on each class, from n = kFamilyFrom, until it says kStop.
// Returns the modulus and the residue it stopped at (residue == modulus when
// it went through every class), or nullopt when the modulus would pass
// kMaxModulus.
struct WalkEnd {
  uint64_t modulus;
  uint64_t residue;
};
template <typename Attempt>
std::optional<WalkEnd> walk_residues(const HelperTable* helpers, Attempt attempt) {
  uint64_t modulus = 1;
  for (;;) {
    try {
      for (uint64_t r = 0; r < modulus; ++r) {
        SeriesContext ctx;
        ctx.from = kFamilyFrom;
        ctx.modulus = modulus;
        ctx.residue = r;
        ctx.helpers = helpers;
        if (attempt(ctx) == Next::kStop) return WalkEnd{modulus, r};
      }
      return WalkEnd{modulus, modulus};
    } catch (const NeedModulus& need) {
      modulus *= need.factor;
      if (modulus > kMaxModulus) return std::nullopt;
    }
  }
}

// Whether c·f(n) >= a·f(floor(scale·n)) is proved on every residue class:
// the modulus used, or nullopt when some class is not proved.
std::optional<uint64_t> proved_on_every_residue(const Expr& driving, const Rational& a,
                                                const Rational& scale, const Rational& c,
                                                const HelperTable* helpers, uint64_t work_budget) {
  ExprPtr argument = floor_argument(scale);
  uint64_t work = 0;
  std::optional<WalkEnd> end = walk_residues(helpers, [&](const SeriesContext& ctx) {
    auto slack = [&](const SeriesContext& sc) {
      return weighted_gap(driving, *argument, c, a, sc);
    };
    try {
      prove_nonnegative(slack, ctx, work, work_budget);
      return Next::kNextResidue;
    } catch (const SeriesUnsupported&) {
      return Next::kStop;  // this residue class is not proved: no bound
    }
  });
  if (!end || end->residue < end->modulus) return std::nullopt;
  return end->modulus;
}

}  // namespace

std::optional<RegularityBound> prove_regularity(const Expr& driving, const Rational& a,
                                                const Rational& scale, const HelperTable* helpers,
                                                uint64_t work_budget) {
  // Simple constants first, so the printed bound reads plainly; a ratio
  // that comes close to 1 on some residue class needs a c closer to 1.
  for (const Rational& c : {Rational(1, 2), Rational(3, 4), Rational(7, 8), Rational(15, 16)}) {
    if (std::optional<uint64_t> modulus =
            proved_on_every_residue(driving, a, scale, c, helpers, work_budget)) {
      return RegularityBound{c, kFamilyFrom, *modulus};
    }
  }
  return std::nullopt;
}

std::optional<RegularityFamily> regularity_failure_family(const Expr& driving, const Rational& a,
                                                          const Rational& scale,
                                                          const HelperTable* helpers,
                                                          uint64_t work_budget) {
  ExprPtr argument = floor_argument(scale);
  uint64_t work = 0;
  bool found = false;
  std::optional<WalkEnd> end = walk_residues(helpers, [&](const SeriesContext& ctx) {
    // a·f(floor(scale·n)) - f(n) >= 0.
    auto gap = [&](const SeriesContext& c) {
      return negate(weighted_gap(driving, *argument, Rational(1), a, c));
    };
    try {
      prove_nonnegative(gap, ctx, work, work_budget);
      found = true;
      return Next::kStop;
    } catch (const SeriesUnsupported&) {
      return work > work_budget ? Next::kStop : Next::kNextResidue;
    }
  });
  if (!end || !found) return std::nullopt;
  return RegularityFamily{end->modulus, end->residue, kFamilyFrom};
}

}  // namespace thetagate::engine
