// The rule for an explicit bound proved by induction: the exact range, and
// the step's slack >= 0 past it on every residue class, re-derived from the
// claim's line and the certificate's hypothesis.
#include <algorithm>
#include <optional>

#include "verifier/recheck/rule_support.h"

namespace thetagate::engine::recheck {

void induction(const Recurrence& r, const Bound& bound, const CertificateData& c, int& count) {
  if (bound.is_asymptotic()) throw Unsupported("an asymptotic bound proved by induction");
  if (r.full_history) throw Unsupported("a sum over earlier values of T");
  if (!r.class_terms.empty()) throw Unsupported("a growth class written inside the recurrence");
  BigInt m = parse_size(c.checked_to, "end of the exact range");
  BigInt modulus = parse_size(c.modulus, "modulus");
  if (modulus < 1 || modulus > 4096)
    throw Rejected{"the modulus " + modulus.str() + " is out of range"};
  uint64_t L = static_cast<uint64_t>(modulus);
  BigInt from = m + 1;
  if (from < 4) throw Rejected{"the step must start at n >= 4"};
  SmallEvaluator eval(r);
  for (const SideProof& sp : sides_of(bound, c)) {
    const char* op = sp.side == Side::kUpper ? "<=" : ">=";
    // The exact checks first: they are certain either way.
    require_range(eval, sp, sp.claimed, bound.n0, m, count);
    BigInt lowest = m;
    // A step the re-checker cannot finish waits until the exact check where
    // the step lands has had its say (a false hypothesis fails there for sure).
    std::optional<Unsupported> unfinished;
    for (uint64_t res = 0; res < L; ++res) try {
        Context ctx{from, L, res, &r.helpers};
        std::string where = class_name(ctx);
        const CaseLine& line = line_on_class(r.main, ctx);
        Linear lin;
        linearize(line.body, 1, r.main.name, lin);
        if (sp.strict && lin.calls.empty())
          throw Rejected{"a strict bound needs a recursive term" + where};
        BigInt first = from + floor_mod(BigInt(res) - from, modulus);
        struct Arg {
          Rational a, s, t;
        };
        std::vector<Arg> args;
        for (const Call& call : lin.calls) {
          if (call.a <= 0) throw Rejected{"a recursive term with a coefficient <= 0" + where};
          auto aff = as_affine(expand(*make_call("floor", {call.arg}), ctx));
          if (!aff)
            throw Rejected{"the argument " + print(*call.arg) + " is not exact modulo " +
                           modulus.str() + where};
          auto [s, t] = *aff;
          if (s <= 0 || s > 1 || (1 - s) * Rational(first) - t <= 0)
            throw Rejected{"the argument " + print(*call.arg) + " does not shrink for n > " +
                           m.str() + where};
          Rational low = s * Rational(first) + t;
          if (denominator(low) != 1 || low < 0)
            throw Rejected{"the argument " + print(*call.arg) + " is not a size"};
          lowest = std::min(lowest, numerator(low));
          args.push_back({call.a, s, t});
        }
        // The step's slack, expanded in x = n + shift: H(n) = 3 (n - 1)^(lg 3)
        // is a single term in x = n - 1, so an identity stays exact there.
        auto slack_in = [&](const Context& shifted, const Rational& shift) {
          Expansion rhs = driver_of(lin, shifted, 1, -shift);
          for (const Arg& arg : args)
            rhs = add(rhs, scale(expand(*sp.carried, shifted, arg.s, arg.t - arg.s * shift),
                                 Coef::of(arg.a)));
          Expansion slack = add(expand(*sp.carried, shifted, 1, -shift), negate(rhs));
          return sp.side == Side::kLower ? negate(slack) : slack;
        };
        require_shifted(slack_in, ctx,
                        std::string("step: ") +
                            (sp.side == Side::kUpper ? "H(n) - (the right side with H)"
                                                     : "(the right side with H) - H(n)") +
                            " >= 0 for every real n > " + m.str() + where +
                            ", H(n) = " + print(*sp.carried),
                        count);
        if (!same_tree(*sp.carried, *sp.claimed)) {
          auto inside_in = [&](const Context& shifted, const Rational& shift) {
            Expansion inside = add(expand(*sp.claimed, shifted, 1, -shift),
                                   negate(expand(*sp.carried, shifted, 1, -shift)));
            return sp.side == Side::kLower ? negate(inside) : inside;
          };
          require_shifted(inside_in, ctx,
                          print(*sp.carried) + " " + op + " " + print(*sp.claimed) +
                              " for every n > " + m.str() + where,
                          count);
        }
      } catch (const Unsupported& u) {
        if (!unfinished) unfinished = u;
      }
    require_range(eval, sp, sp.carried, lowest, m, count);
    if (unfinished) throw *unfinished;
  }
}

}  // namespace thetagate::engine::recheck
