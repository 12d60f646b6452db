#include "reports/verdict_text.h"

#include <fmt/format.h>

#include <cmath>

#include "reports/code_text.h"

namespace thetagate::engine {

namespace {

// n in decimal, or its first and last ten digits and its length.
std::string short_n(const BigInt& n) {
  std::string s = n.str();
  if (s.size() <= 24) return s;
  return s.substr(0, 10) + "…" + s.substr(s.size() - 10) + " (" + std::to_string(s.size()) +
         " digits)";
}

std::string checked_phrase(const ClaimResult& c) {
  return fmt::format("no violation at {} sizes up to {} bits", c.sizes_checked, c.largest_bits);
}

std::string not_proved_phrase(const ClaimResult& c) {
  return fmt::format("no violation up to 2^{} ({} sizes checked), not proved", c.largest_bits,
                     c.sizes_checked);
}

std::string theorem_versus(const TheoremEvidence& t) {
  return std::string("claimed ") + compared_with_name(t.kind) + "(" + t.claimed + "), derived " +
         bound_kind_symbol(t.relation) + "(" + t.derived + ") by " + t.method;
}

std::string edges_phrase(const TrendEvidence& t) {
  std::string joined;
  if (t.upper_matters) joined = describe_edge(t.upper, "upper");
  if (t.lower_matters) joined += (joined.empty() ? "" : "; ") + describe_edge(t.lower, "lower");
  return joined;
}

// Induction on dyadic blocks: the form carried (the claim's, or T's closed
// form), then the comparison with the claim where there is one.
std::string dyadic_phrase(const InductionProof& p) {
  std::string carried = p.closed_form.empty() ? p.bound : "= " + p.closed_form;
  std::string s = fmt::format(
      "{}(n) {} checked exactly for {} <= n <= {}; the inductive step holds with equality "
      "for every n > {}, on each dyadic block (n = 2m + r, 2^k <= m < 2^(k+1), with "
      "floor(lg m) = k), as an identity in m, 2^k and k",
      p.function, carried, p.checked_from.str(), p.checked_to.str(), p.checked_to.str());
  if (!p.closed_form.empty()) {
    s += fmt::format(
        "; then {}(n) {} on every block 2^k <= n < 2^(k+1) from the claim's start, compared "
        "with that closed form in x = n/2^k in [1, 2] by interval arithmetic ({} blocks one by "
        "one, then the leading term from 2^{})",
        p.function, p.bound, p.blocks, p.tail_log2);
  }
  return s;
}

std::string induction_phrase(const InductionProof& p) {
  if (p.dyadic) return dyadic_phrase(p);
  std::string s = fmt::format("{}(n) {} checked exactly for {} <= n <= {}", p.function, p.bound,
                              p.checked_from.str(), p.checked_to.str());
  if (p.identity) {
    s += "; the inductive step holds with equality for every n > " + p.checked_to.str();
  } else {
    s += "; the inductive step is proved for every real n > " + p.checked_to.str();
    if (p.blocks > 0) {
      s += fmt::format(
          " (interval arithmetic on {} blocks up to 2^{}, then the leading term of "
          "the slack dominates)",
          p.blocks, p.tail_log2);
    } else {
      s += fmt::format(" (the leading term of the slack dominates from 2^{})", p.tail_log2);
    }
  }
  if (p.modulus > 1) s += fmt::format(", per residue of n mod {}", p.modulus);
  return s;
}

std::string basis_message(const ClaimResult& c) {
  const VerdictBasis& b = c.basis;
  switch (b.kind) {
    case BasisKind::kInputError:
      return c.error ? c.error->message : b.detail;
    case BasisKind::kCodeBreaksModel: {
      if (!c.code || c.code->violations.empty()) return "the code breaks its model";
      const CodeResult& code = *c.code;
      const CostViolation& v = code.violations.front();
      int sign = 0;
      for (const CostRow& row : code.rows)
        if (row.n == v.n) sign = row.sign;
      const char* broken =
          code.relation == ModelRelation::kExact
              ? (sign > 0 ? "exceeds the exact model" : "falls short of the exact model")
          : code.relation == ModelRelation::kLowerBound ? "falls below"
                                                        : "exceeds";
      std::string where = v.file.empty() ? "" : " (" + v.file + ":" + std::to_string(v.line) + ")";
      std::string s = "the code breaks its model: at n = " + v.n.str() + where +
                      " the counted cost " + v.cost + " " + broken + " " + c.function +
                      "(n) = " + v.model;
      if (code.violations.size() > 1) {
        s += " (" + std::to_string(code.violations.size()) + " violations)";
      }
      return s;
    }
    case BasisKind::kCodeSizesMissed: {
      std::string missed = c.code ? family_list(c.code->families_missed) : "none";
      return "the measured costs never reach the size families " + missed +
             " (from n = 8 on), where floors and ceilings of n/b part from n/b and halving "
             "chains stay odd; a code measured only where the recurrence is smooth is not "
             "checked against it: measure the sizes `thetagate sizes` lists";
    }
    case BasisKind::kInternalError:
      return "internal error (a bug in thetagate, please report it with this claim): " + b.detail;
    case BasisKind::kCertifiedBreak: {
      if (c.witnesses.empty()) return "bound broken";
      const Witness& w = c.witnesses.front();
      return fmt::format("{} bound broken at n = {} (family {}): {}({}) = {} {} {}{}",
                         side_name(w.side), short_n(w.n), w.family, c.function, short_n(w.n),
                         w.value, w.side == Side::kUpper ? ">" : "<", w.bound,
                         w.margin.empty() ? "" : ", by " + w.margin);
    }
    case BasisKind::kDerivationAgrees: {
      if (!b.theorem) return "proved by a theorem";
      const TheoremEvidence& t = *b.theorem;
      if (t.kind == ComparedWith::kExplicit) {
        return checked_phrase(c) +
               fmt::format("; {} derives Θ({}), which the bound's class {}", t.method, t.derived,
                           t.agreement == Agreement::kSame ? "matches" : "contains");
      }
      return theorem_versus(t) +
             (t.agreement == Agreement::kSame ? ": the same class"
                                              : ": the claim holds but is not tight") +
             "; the exact values agree";
    }
    case BasisKind::kDerivationContradicts: {
      if (!b.theorem) return "a theorem contradicts the claim";
      const TheoremEvidence& t = *b.theorem;
      return theorem_versus(t) + ": " +
             (t.claimed_below ? t.claimed + " = o(" + t.derived + ")"
                              : t.derived + " = o(" + t.claimed + ")") +
             "; the exact values agree with the derivation";
    }
    case BasisKind::kInduction:
      if (!b.induction) return "proved by induction";
      return "proved by induction: " + induction_phrase(*b.induction);
    case BasisKind::kInternalInconsistency: {
      std::string edges;
      for (const EdgeDisagreement& d : b.disagreement) {
        edges += (edges.empty() ? "" : "; ") + describe_edge(d.reading, side_name(d.edge));
      }
      std::string method = b.theorem ? b.theorem->method : c.method;
      std::string derived = b.theorem ? b.theorem->derived : c.derived;
      return "INTERNAL INCONSISTENCY: " + method + " derives Θ(" + derived +
             "), but the exact values disagree: " + edges +
             ". This is a bug or a misapplied theorem; please report it.";
    }
    case BasisKind::kNumericTrend: {
      std::string edges = b.trend ? edges_phrase(*b.trend) : "";
      std::string prefix = b.unproved == Unproved::kClaimUnclassified ? b.detail + "; " : "";
      if (c.verdict == Verdict::kRefuted && b.trend && b.trend->escapes) {
        Side side = *b.trend->escapes;
        const EdgeReading& e = side == Side::kUpper ? b.trend->upper : b.trend->lower;
        return fmt::format(
            "{}numbers only (no theorem applied): T(n)/g(n) {} past a factor of 10^6 {}, with "
            "certified ladder rungs at growing c; {}",
            prefix, side == Side::kUpper ? "climbs" : "falls",
            e.monotone ? "with a monotone trend" : "by its running extreme, wobbling on the way",
            edges);
      }
      if (b.unproved == Unproved::kNumbersOnly || b.unproved == Unproved::kClaimUnclassified) {
        if (b.unproved == Unproved::kClaimUnclassified && c.verdict == Verdict::kUndecided &&
            edges.empty())
          return b.detail;
        return prefix + not_proved_phrase(c) +
               ": numbers only (no theorem applied), and a steady band is evidence, not a "
               "proof; " +
               edges +
               (b.unproved == Unproved::kNumbersOnly && !b.detail.empty() ? "; " + b.detail : "");
      }
      return prefix + "numbers only (no theorem applied), and they do not settle it: " + edges;
    }
    case BasisKind::kBudgetReached:
      switch (b.unproved) {
        case Unproved::kEvaluatorLimit:
          return "out of budget: " + b.detail;
        case Unproved::kDerivedOutgrowsSide:
          if (!b.theorem) return not_proved_phrase(c);
          return checked_phrase(c) +
                 fmt::format(
                     "; T(n) = Θ({}) grows {} than the {} side Θ({}), so the bound must "
                     "break beyond the sizes checked",
                     b.theorem->derived, b.theorem->claimed_below ? "faster" : "slower",
                     compared_with_name(b.theorem->kind), b.theorem->claimed);
        case Unproved::kInductionFailed:
          return not_proved_phrase(c) +
                 (b.theorem ? fmt::format(
                                  ": {} derives Θ({}), which the bound's class {}, but ",
                                  b.theorem->method, b.theorem->derived,
                                  b.theorem->agreement == Agreement::kSame ? "matches" : "contains")
                            : std::string(": ")) +
                 "no induction certificate was found (" + b.detail + ")";
        default:
          return not_proved_phrase(c) + (b.detail.empty() ? "" : ": " + b.detail);
      }
  }
  return "";
}

}  // namespace

std::string verdict_message(const ClaimResult& c) {
  std::string m = basis_message(c);
  const VerdictBasis& b = c.basis;
  if ((b.kind == BasisKind::kCodeBreaksModel || b.kind == BasisKind::kCodeSizesMissed) && c.code &&
      c.code->model_verdict) {
    // Both links: the code against its model, then the model against its bound.
    ClaimResult model = c;
    model.verdict = *c.code->model_verdict;
    model.basis = c.code->model_basis;
    model.code.reset();
    return m + ". The recurrence itself " + verdict_name(model.verdict) + ": " +
           verdict_message(model);
  }
  if (b.reading.empty()) return m;
  if (b.reading == "floor and ceil") return "holds with quotients read as floor and as ceil: " + m;
  std::string reading = b.reading;
  if (c.verdict == Verdict::kRefuted && b.other_reading) {
    std::string other = reading == "floor" ? "ceil" : "floor";
    reading += *b.other_reading == Verdict::kRefuted
                   ? " (and also as " + other + ")"
                   : " (the " + other + " reading does not break it)";
  }
  return "with quotients read as " + reading + ": " + m;
}

std::string proof_name(const ClaimResult& c) {
  if (c.verdict != Verdict::kHolds) return "";
  const VerdictBasis& b = c.basis;
  if (b.kind == BasisKind::kInduction && b.induction) return induction_proof_name(*b.induction);
  if (b.kind == BasisKind::kDerivationAgrees && b.theorem) return b.theorem->method;
  return "";
}

std::string describe_edge(const EdgeReading& e, const char* edge_name) {
  if (e.direction == Direction::kUnclear) {
    return fmt::format("the {} edge of T(n)/g(n) has too few scales to read a trend", edge_name);
  }
  double factor = std::exp2(e.change_log2);
  std::string change = std::fabs(e.change_log2) < 60 ? fmt::format("×{:.3g}", factor)
                                                     : fmt::format("×2^{:.0f}", e.change_log2);
  std::string like;
  if (e.direction != Direction::kSteady) {
    if (std::fabs(e.slope - 1) < 0.25)
      like = ": like a factor lg n";
    else if (std::fabs(e.slope + 1) < 0.25)
      like = ": like a factor 1/lg n";
    else if (std::fabs(e.slope) < 0.35)
      like = ": like a factor lg lg n or a slowly converging term";
    else if (e.slope > 3)
      like = ": faster than any power of lg n";
  }
  return fmt::format(
      "the {} edge of T(n)/g(n) is {} ({} from 2^{} to 2^{}; slope {:.2f} against lg n){}",
      edge_name, direction_name(e.direction), change, e.first_scale, e.last_scale, e.slope, like);
}

}  // namespace thetagate::engine
