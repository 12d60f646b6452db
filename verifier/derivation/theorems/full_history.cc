#include "verifier/derivation/theorems/full_history.h"

#include "verifier/derivation/classify.h"
#include "verifier/derivation/theorems/akra_bazzi.h"

namespace thetagate::engine {

namespace {

bool is_n_minus_one(const Expr& e) {
  return e.kind == ExprKind::kSub && e.args[0]->kind == ExprKind::kVariable &&
         e.args[1]->kind == ExprKind::kNumber && e.args[1]->number == 1;
}

RealNumber ln2() {
  return RealNumber::enclosed([](long prec) { return Interval(Rational(2), prec).log(); });
}

// "2 n ln n", "3/2 n^2": a constant before a class's text.
std::string times(const RealNumber& c, const std::string& g) {
  std::string s = c.str();
  if (c == RealNumber(1L)) return g;
  if (!c.is_rational() && s.find("…") == std::string::npos) s = "(" + s + ")";
  return g == "1" ? s : s + " " + g;
}

}  // namespace

TheoremOutcome full_history(const DerivationInput& input) {
  TheoremOutcome out;
  out.theorem = "full-history summation factor";
  const Shape& s = *input.shape;
  if (s.sums.size() != 1 || !s.scaled.empty() || !s.subtractive.empty() || !s.roots.empty()) {
    out.failure = "needs exactly one sum over earlier values and no other recursive term";
    return out;
  }
  const HistorySum& h = s.sums[0];
  const Expr& sum = *h.sum;
  const Expr& body = *sum.args[2];
  if (h.n_power != -1 || h.scale <= 0) {
    out.failure = "needs the sum's coefficient to be c/n with c > 0";
    return out;
  }
  if (body.kind != ExprKind::kCall || body.args.size() != 1 ||
      body.args[0]->kind != ExprKind::kBound || body.args[0]->name != sum.name) {
    out.failure = "needs the sum's body to be the recurrence at the summation variable, " +
                  std::string("such as T(") + sum.name + "); here it is " + print(body);
    return out;
  }
  auto lo = constant_value(*sum.args[0]);
  if (!lo || !lo->is_integer() || lo->sign() < 0 || !is_n_minus_one(*sum.args[1])) {
    out.failure = "needs the sum to run from a constant k0 >= 0 to n - 1; here from " +
                  print(*sum.args[0]) + " to " + print(*sum.args[1]);
    return out;
  }
  ExprPtr f = s.driving ? s.driving : make_number(0);
  if (s.has_driving_cases()) {
    out.failure = "needs one driving function f(n) for all large n";
    return out;
  }
  // g(n) = n f(n) - (n - 1) f(n - 1), classified exactly.
  ExprPtr n = make_variable();
  ExprPtr n1 = make_binary(ExprKind::kSub, n, make_number(1));
  ExprPtr g = make_binary(ExprKind::kSub, make_binary(ExprKind::kMul, n, f),
                          make_binary(ExprKind::kMul, n1, substitute(f, n1)));
  Classification gc = classify(*g, input.helpers);
  const RealNumber c(h.scale);
  std::string cs = to_string(h.scale);
  std::string form = "T(n) = f(n) + (" + cs + "/n) sum(" + sum.name + ", " + print(*sum.args[0]) +
                     ", n - 1, T(" + sum.name + ")) with f(n) = " + print(*f);
  out.steps.push_back(form + " (a full-history recurrence; Knuth, TAOCP vol. 3, §5.2.2)");
  if (!gc || !gc.coefficient_known || !gc.growth->is_subexponential()) {
    out.failure = "the difference g(n) = n f(n) - (n-1) f(n-1) has no exact leading term" +
                  (gc.reason.empty() ? std::string() : ": " + gc.reason);
    return out;
  }
  const GrowthClass& gg = *gc.growth;
  const RealNumber& a = gc.coefficient;
  std::string g_text = times(a, to_string(gg));
  Rational shift = h.scale - 1;
  std::string factor = shift == 0  ? "n"
                       : shift > 0 ? "(n + " + to_string(shift) + ")"
                                   : "(n - " + to_string(Rational(-shift)) + ")";
  out.steps.push_back("differencing n T(n) - (n-1) T(n-1) gives n T(n) = " + factor +
                      " T(n-1) + g(n) with g(n) = n f(n) - (n-1) f(n-1) ~ " + g_text);
  RealNumber c1 = c - RealNumber(1L);
  out.steps.push_back("summation factor pi(n) = prod_{j<=n} (j - 1 + " + cs + ")/j = Θ(" +
                      to_string(GrowthClass::polylog(c1)) +
                      "): T(n)/pi(n) = T(n0)/pi(n0) + sum_{j<=n} g(j)/(j pi(j)), whose terms are "
                      "Θ(" +
                      to_string(gg.over(GrowthClass::polylog(c))) + ")");
  int order = compare(gg.alpha, c1);
  if (order < 0) {
    out.failure = "g(n) = Θ(" + to_string(gg) +
                  ") grows slower than n^(c-1) = " + to_string(GrowthClass::polylog(c1)) +
                  ": the sum converges and the leading constant depends on the initial values";
    return out;
  }
  GrowthClass result;
  std::string leading;
  if (order > 0) {
    RealNumber k = a / (gg.alpha - c1);
    result = gg;
    out.steps.push_back(
        "the exponent of g exceeds c - 1: the sum grows like n^(γ - c + 1), so "
        "T(n) ~ A/(γ - c + 1) n^γ ...");
    leading = "T(n) ~ " + times(k, to_string(gg));
  } else {
    auto integral = akra_bazzi_integral(gg, c1);
    if (!integral) {
      out.failure = "the sum of g(j)/(j pi(j)) grows like lg lg lg n, outside the normal form";
      return out;
    }
    result = GrowthClass::polylog(c1).times(*integral);
    out.steps.push_back("g(n) = Θ(n^(c-1) ...): the sum is harmonic-like, Θ(" +
                        to_string(*integral) + ")");
    if (gg.gamma.sign() == 0 && gg.beta > RealNumber(-1L)) {
      RealNumber k = a / (gg.beta + RealNumber(1L));
      GrowthClass rest = GrowthClass::polylog(gg.alpha, gg.beta);
      std::string with_ln = rest.is_constant() ? "ln n" : to_string(rest) + " ln n";
      leading = "T(n) ~ " + times(k, with_ln) + " (≈ " + times(k * ln2(), to_string(result)) + ")";
    }
  }
  if (!leading.empty()) out.steps.push_back("leading term: " + leading);
  out.steps.push_back("T(n) = Θ(" + to_string(result) + ")");
  out.method = "full-history recurrence (summation factor)";
  out.growth = result;
  return out;
}

}  // namespace thetagate::engine
