#include "verifier/derivation/certificate.h"

#include <algorithm>
#include <memory>
#include <set>
#include <utility>

#include "verifier/derivation/classify.h"
#include "verifier/derivation/shape.h"
#include "verifier/derivation/theorems/akra_bazzi.h"
#include "verifier/derivation/theorems/normalised_roots.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {

namespace {

// The driver bounds start at kFirstFrom, or at the first of its doublings up
// to kLastFrom where f and T are positive (f = n - 100 needs a later start).
const BigInt kFirstFrom = 64;
const BigInt kLastFrom = 4096;
// The sizes f/g is evaluated at: every n in [from, from + kRangeLength], and
// the size families up to kLargestBits bits.
constexpr uint64_t kRangeLength = 2048;
constexpr uint64_t kLargestBits = 256;
// How far the recursive calls' arguments are followed from `from` to find
// the smallest size the recursion reaches (every residue of small moduli).
constexpr uint64_t kArgumentProbes = 64;

Budget certificate_budget(std::optional<double> clock_limit) {
  // As derive's: the step limit ends a long evaluation deterministically;
  // the clock only guards against hangs.
  Budget b;
  b.max_seconds = 60.0;
  b.max_steps = 2'000'000;
  b.max_memo_entries = 200'000;
  if (clock_limit) b.max_seconds = *clock_limit;
  return b;
}

Rational power_of_two(int64_t j) {
  if (j >= 0) return Rational(BigInt(1) << static_cast<unsigned>(j));
  return Rational(BigInt(1), BigInt(1) << static_cast<unsigned>(-j));
}

// The largest power of two <= x, and the smallest >= x. REQUIRES: x > 0.
Rational power_of_two_at_most(const Rational& x) {
  int64_t j = static_cast<int64_t>(bit_length(numerator(x))) -
              static_cast<int64_t>(bit_length(denominator(x)));
  while (power_of_two(j) > x) --j;
  while (power_of_two(j + 1) <= x) ++j;
  return power_of_two(j);
}

Rational power_of_two_at_least(const Rational& x) {
  Rational p = power_of_two_at_most(x);
  return p == x ? p : p * 2;
}

// A rational a reader takes in at a glance: numerator and denominator of
// at most 32 bits.
bool simple(const Rational& x) {
  return bit_length(numerator(x)) <= 32 && bit_length(denominator(x)) <= 32;
}

// "(1/2) n", "2 n*lg(n)", "4 (1/n)", "1/2" (g = 1), "n" (c = 1).
std::string times_class(const Rational& c, const std::string& g) {
  if (g == "1") return to_string(c);
  if (c == 1) return g;
  std::string factor = g.find('/') == std::string::npos ? g : "(" + g + ")";
  if (denominator(c) == 1) return to_string(c) + " " + factor;
  return "(" + to_string(c) + ") " + factor;
}

std::string join(const std::vector<std::string>& parts, const std::string& separator) {
  std::string out;
  for (const std::string& p : parts) out += (out.empty() ? "" : separator) + p;
  return out;
}

// "n/2", "2n/3": the argument n·scale of a recursive term.
std::string scaled_n(const Rational& scale) {
  std::string top = numerator(scale) == 1 ? "n" : numerator(scale).str() + "n";
  return denominator(scale) == 1 ? top : top + "/" + denominator(scale).str();
}

// f as the certificate bounds it: the driving function itself, and, where f
// is given by case lines (of T, or of a helper that is all of f), every
// line's body on its own.
struct Driver {
  std::vector<ExprPtr> bodies;  // every one is bounded at every size
  bool lines = false;           // f is given by case lines
};

std::optional<Driver> driver_of(const Shape& shape, const Recurrence& rec) {
  Driver d;
  if (shape.has_driving_cases()) {
    for (const DrivingCase& c : shape.driving_cases) {
      if (!c.f) return std::nullopt;  // 0 on a line: no positive lower bound
      d.bodies.push_back(c.f);
    }
    d.lines = true;
    return d;
  }
  if (!shape.driving) return std::nullopt;
  d.bodies.push_back(shape.driving);
  const Expr& f = *shape.driving;
  if (f.kind == ExprKind::kCall && f.args.size() == 1) {
    auto it = rec.helpers.find(f.name);
    if (it != rec.helpers.end() && it->second.lines_in_order().size() > 1) {
      // Lines for finitely many n (points, n <= 3) do not apply from
      // `from` on; f itself, evaluated above, covers any that still might.
      for (const CaseLine* line : it->second.lines_in_order()) {
        if (line->point || (line->condition && condition_reach(*line->condition) < 0)) continue;
        d.bodies.push_back(substitute(line->body, f.args[0]));
      }
      d.lines = true;
    }
  }
  return d;
}

// The sizes from `from` on where f/g is evaluated.
std::vector<BigInt> sample_sizes(const BigInt& from, const std::vector<BigInt>& bases) {
  std::set<BigInt> sizes;
  for (uint64_t i = 0; i <= kRangeLength; ++i) sizes.insert(from + i);
  for (const BigInt& base : bases) {
    for (BigInt power = base; bit_length(power) <= kLargestBits; power *= base) {
      for (int offset = -2; offset <= 2; ++offset) {
        if (base != 2 && (offset == -2 || offset == 2)) continue;
        sizes.insert(power + offset);
      }
      if (base == 2) sizes.insert(3 * power);
    }
  }
  std::vector<BigInt> out;
  for (const BigInt& n : sizes) {
    if (n >= from) out.push_back(n);
  }
  return out;
}

// The smallest and largest f/g over the sizes (certified: the ends of
// interval enclosures), or nullopt where a body is not positive, or cannot
// be evaluated, at one of them.
struct RatioRange {
  Rational low, high;
};

class Sampler {
 public:
  Sampler(const Recurrence& rec, std::optional<double> clock_limit)
      : rec_(rec),
        evaluator_(std::shared_ptr<const Recurrence>(std::shared_ptr<const Recurrence>(), &rec),
                   certificate_budget(clock_limit)) {}

  std::optional<RatioRange> ratios(const Driver& driver, const Expr& g, const SourceText& g_source,
                                   const std::vector<BigInt>& sizes) {
    std::optional<RatioRange> range;
    NumericContext ctx;
    for (const BigInt& n : sizes) {
      Value gv = evaluator_.evaluate(g, g_source, n);
      if (gv.sign() <= 0) return std::nullopt;
      for (const ExprPtr& body : driver.bodies) {
        Value fv = evaluator_.evaluate(*body, rec_.source, n);
        if (fv.sign() <= 0) return std::nullopt;
        Interval r = div(fv, gv, ctx).interval(128);
        Rational lo = r.lower(), hi = r.upper();
        if (lo <= 0) return std::nullopt;
        if (!range) {
          range = RatioRange{lo, hi};
        } else {
          range->low = std::min(range->low, lo);
          range->high = std::max(range->high, hi);
        }
      }
    }
    return range;
  }

  // The smallest size the recursive calls reach from n >= from (at least 1).
  BigInt smallest_argument(const BigInt& from) {
    BigInt smallest = from;
    for (const CaseLine* line : rec_.main.lines_in_order()) {
      if (line->point || line->calls.empty()) continue;
      if (line->condition && condition_reach(*line->condition) < 0) continue;
      for (const Expr* call : line->calls) {
        if (call->args.size() != 1) continue;
        for (uint64_t i = 0; i < kArgumentProbes; ++i) {
          Value v = evaluator_.evaluate(*call->args[0], rec_.source, from + i);
          smallest = std::min(smallest, floor_value(v).integer());
        }
      }
    }
    return std::max(smallest, BigInt(1));
  }

  // T(n)/g(n), certified, or nullopt where g(n) <= 0.
  std::optional<Interval> t_over(const Expr& g, const SourceText& g_source, const BigInt& n) {
    Value gv = evaluator_.evaluate(g, g_source, n);
    if (gv.sign() <= 0) return std::nullopt;
    NumericContext ctx;
    return div(evaluator_.value_at(n), gv, ctx).interval(128);
  }

  // Whether T(n) > 0 for every lo <= n <= hi.
  bool positive(const BigInt& lo, const BigInt& hi) {
    for (BigInt n = lo; n <= hi; ++n) {
      if (evaluator_.value_at(n).sign() <= 0) return false;
    }
    return true;
  }

 private:
  const Recurrence& rec_;
  Evaluator evaluator_;
};

// What every divide or subtract certificate states about f and T.
struct DriverBounds {
  Rational low, high;
  BigInt from;
  BigInt positive_from;  // T(n) > 0 for positive_from <= n < from
};

std::optional<DriverBounds> driver_bounds(Sampler& sampler, const Driver& driver,
                                          const Classification& f, const Expr& g,
                                          const SourceText& g_source,
                                          const std::vector<BigInt>& bases) {
  // From the leading constant where it is known (f ~ C·g): C/2 and 2C,
  // powers of two around them when C is not a simple rational.
  std::optional<std::pair<Rational, Rational>> from_coefficient;
  if (f.coefficient_known && f.coefficient.sign() > 0) {
    if (f.coefficient.is_rational() && simple(f.coefficient.rational())) {
      const Rational& c = f.coefficient.rational();
      from_coefficient = {c / 2, 2 * c};
    } else {
      Interval c = f.coefficient.enclose(128);
      if (c.certainly_positive()) {
        from_coefficient = {power_of_two_at_most(c.lower() / 2),
                            power_of_two_at_least(2 * c.upper())};
      }
    }
  }
  std::optional<DriverBounds> first;  // the first start where f and T are positive
  for (BigInt from = kFirstFrom; from <= kLastFrom; from *= 2) {
    std::optional<RatioRange> r = sampler.ratios(driver, g, g_source, sample_sizes(from, bases));
    if (!r) continue;
    BigInt lowest = sampler.smallest_argument(from);
    if (lowest >= from || !sampler.positive(lowest, from - 1)) continue;
    if (from_coefficient && from_coefficient->first <= r->low &&
        r->high <= from_coefficient->second) {
      return DriverBounds{from_coefficient->first, from_coefficient->second, from, lowest};
    }
    if (!first) {
      first = DriverBounds{power_of_two_at_most(r->low / 2), power_of_two_at_least(2 * r->high),
                           from, lowest};
    }
    // Without a leading constant, nothing is gained by starting later.
    if (!from_coefficient) break;
  }
  return first;
}

// The recurrence's one scaled term (the master theorem merges equal b).
struct Split {
  Rational a;
  Rational scale;  // b of T(b n): in (0, 1)
};

std::optional<Split> one_split(const Shape& shape) {
  if (shape.scaled.empty()) return std::nullopt;
  Split s{0, shape.scaled[0].b};
  for (const ScaledTerm& t : shape.scaled) {
    if (t.b != s.scale) return std::nullopt;
    s.a += t.a;
  }
  return s;
}

const char* order_sign(int c) { return c < 0 ? "<" : c > 0 ? ">" : "="; }

// "lg 3 > 1, the exponent of n in g", "1, equal to the exponent of n in g".
std::string against_exponent(const std::string& p, int c, const RealNumber& q) {
  if (c == 0) return p + ", equal to the exponent of n in g";
  return p + " " + order_sign(c) + " " + q.str() + ", the exponent of n in g";
}

// The master theorem's case, as the exponents compare.
std::vector<std::string> master_obligations(const Split& split, const GrowthClass& g,
                                            const Derivation& d) {
  std::vector<std::string> out;
  Rational divisor = Rational(1) / split.scale;
  RealNumber p = RealNumber::log(divisor, split.a);
  int c = compare(p, g.alpha);
  std::string head = "a = " + to_string(split.a) + ", b = " + to_string(divisor) +
                     ": log_b a = " + against_exponent(p.str(), c, g.alpha);
  if (c == 0 && g.beta.sign() != 0) {
    int k = compare(g.beta, RealNumber(-1L));
    head += ", and the exponent of lg n in g is " + g.beta.str() +
            (k == 0 ? std::string() : std::string(" ") + order_sign(k) + " -1");
  }
  out.push_back(head);
  if (c < 0) {
    // Case 3: regularity, on f itself where the proof used that, and on g
    // (which the comparison with the drivers c₁ g and c₂ g needs) always.
    if (d.regularity) {
      out.push_back(to_string(split.a) + " f(floor(" + scaled_n(split.scale) + ")) <= (" +
                    to_string(d.regularity->c) +
                    ") f(n) for every n >= " + d.regularity->from.str());
    }
    RealNumber limit = RealNumber(split.a) / pow(RealNumber(divisor), g.alpha);
    out.push_back("a/b^q = " + limit.str() + " < 1 for q = " + g.alpha.str() +
                  ", the exponent of n in g: a g(n/b) <= c g(n) with c < 1 for large n");
  }
  return out;
}

// Akra–Bazzi: the critical exponent against g's.
std::vector<std::string> akra_bazzi_obligations(const Shape& shape, const GrowthClass& g) {
  std::vector<std::pair<Rational, Rational>> terms;
  std::vector<std::string> equation;
  for (const ScaledTerm& t : shape.scaled) {
    terms.emplace_back(t.a, t.b);
    equation.push_back((t.a == 1 ? "" : to_string(t.a) + "*") + "(" + to_string(t.b) + ")^p");
  }
  RealNumber p = critical_exponent(terms);
  int c = compare(p, g.alpha);
  return {join(equation, " + ") + " = 1 gives p = " +
          against_exponent(p.str() + (p.is_rational() || p.kind() == RealNumber::Kind::kEnclosed
                                          ? ""
                                          : " = " + p.digits()),
                           c, g.alpha)};
}

}  // namespace

std::optional<std::string> driver_class_text(const GrowthClass& g) {
  if (!g.rho.is_rational() || g.gamma.sign() != 0) return std::nullopt;
  if (!g.alpha.is_rational() || !g.beta.is_integer()) return std::nullopt;
  const Rational& q = g.alpha.rational();
  const Rational& k = g.beta.rational();
  std::vector<std::string> top, bottom;
  auto power = [](const std::string& base, const Rational& e) {
    if (e == 1) return base;
    if (denominator(e) == 1) return base + "^" + to_string(e);
    return base + "^(" + to_string(e) + ")";
  };
  if (q > 0) top.push_back(power("n", q));
  if (q < 0) bottom.push_back(power("n", -q));
  if (k > 0) top.push_back(power("lg(n)", k));
  if (k < 0) bottom.push_back(power("lg(n)", -k));
  if (!g.is_subexponential()) {
    const Rational& r = g.rho.rational();
    top.insert(top.begin(), (denominator(r) == 1 ? to_string(r) : "(" + to_string(r) + ")") + "^n");
  }
  std::string text = top.empty() ? "1" : join(top, "*");
  if (bottom.size() == 1) text += "/" + bottom[0];
  if (bottom.size() > 1) text += "/(" + join(bottom, "*") + ")";
  return text;
}

namespace {

// Runs `make`; what evaluating f, g and T may meet on valid input (a bad
// class text, a budget, an undecidable comparison, lg 0) means no certificate.
template <typename Make>
std::optional<Certificate> or_none(Make make) {
  try {
    return make();
  } catch (const InputError&) {
  } catch (const LimitReached&) {
  } catch (const PrecisionShortfall&) {
  } catch (const DomainError&) {
  }
  return std::nullopt;
}

// f lies between c₁·g_low and c₂·g_high, each a class of f's case lines:
// T is then between the solutions driven by those two (a comparison), and a
// checker proves both driver bounds and applies Akra–Bazzi to each side.
std::optional<Certificate> comparison_certificate(const Recurrence& recurrence, const Derivation& d,
                                                  std::optional<double> clock_limit) {
  if (!d.driving_upper || !d.driving_lower || d.driving_is_class || d.driving_one_sided)
    return std::nullopt;
  std::optional<std::string> high_text = driver_class_text(*d.driving_upper);
  std::optional<std::string> low_text = driver_class_text(*d.driving_lower);
  if (!high_text || !low_text) return std::nullopt;
  Shape shape = extract_shape(recurrence);
  if (!shape.ok || !one_split(shape)) return std::nullopt;
  std::optional<Driver> driver = driver_of(shape, recurrence);
  if (!driver) return std::nullopt;
  // A sum as the driver (its class by the integral comparison, classify.cc):
  // its values at the sampled sizes up to 2^256 are out of reach, so no
  // constants are found and the proof is not re-checked.
  for (const ExprPtr& body : driver->bodies) {
    if (contains_sum(*body)) return std::nullopt;
  }
  std::vector<BigInt> bases = {2};
  return or_none([&]() -> std::optional<Certificate> {
    SourceText high_source = SourceText::whole("<certificate>", *high_text);
    SourceText low_source = SourceText::whole("<certificate>", *low_text);
    ExprPtr g_high = parse_expression(high_source);
    ExprPtr g_low = parse_expression(low_source);
    Sampler sampler(recurrence, clock_limit);
    for (BigInt from = kFirstFrom; from <= kLastFrom; from *= 2) {
      std::vector<BigInt> sizes = sample_sizes(from, bases);
      std::optional<RatioRange> above = sampler.ratios(*driver, *g_high, high_source, sizes);
      std::optional<RatioRange> below = sampler.ratios(*driver, *g_low, low_source, sizes);
      if (!above || !below) continue;
      BigInt lowest = sampler.smallest_argument(from);
      if (lowest >= from || !sampler.positive(lowest, from - 1)) continue;
      Certificate cert;
      cert.method = "divide";
      cert.proof = d.method;
      cert.driver_class = *high_text;
      cert.driver_class_low = *low_text;
      cert.driver_low = to_string(power_of_two_at_most(below->low / 2));
      cert.driver_high = to_string(power_of_two_at_least(2 * above->high));
      cert.driver_from = from.str();
      cert.obligations = {
          "f(n) >= " + times_class(power_of_two_at_most(below->low / 2), *low_text) +
              " for every n >= " + cert.driver_from + ", on every line of f",
          "f(n) <= " + times_class(power_of_two_at_least(2 * above->high), *high_text) +
              " for every n >= " + cert.driver_from + ", on every line of f",
          "T lies between the solutions driven by those two bounds (a > 0: T is monotone in f)",
          "T(n) > 0 for " + lowest.str() + " <= n <= " + BigInt(from - 1).str()};
      return cert;
    }
    return std::nullopt;
  });
}

// A linear recurrence's growing root rho (Θ(rho^n), a simple root > 1): its
// polynomial and an isolating interval; a checker rebuilds the rest.
std::optional<Certificate> linear_certificate(const Derivation& d) {
  const GrowthClass& g = *d.growth;
  if (g.alpha.sign() != 0 || g.beta.sign() != 0 || g.gamma.sign() != 0) return std::nullopt;
  try {
    if (compare(g.rho, RealNumber(1L)) <= 0) return std::nullopt;
    Polynomial p = g.rho.is_rational()  ? Polynomial({-g.rho.rational(), Rational(1)})
                   : g.rho.polynomial() ? *g.rho.polynomial()
                                        : Polynomial();
    if (p.is_zero()) return std::nullopt;
    // Six decimals either side of a 96-bit enclosure: readable, and still
    // isolating for roots at least 10^-6 apart (the checker makes sure).
    Interval box = g.rho.enclose(96);
    const BigInt million = 1000000;
    Certificate cert;
    cert.method = "linear";
    cert.proof = d.method;
    for (const Rational& c : p.coefficients()) cert.root_polynomial.push_back(to_string(c));
    cert.root_low = to_string(Rational(floor_of(box.lower() * million) - 1, million));
    cert.root_high = to_string(Rational(ceil_of(box.upper() * million) + 1, million));
    cert.obligations = {
        "rho, the only root of " + p.str() + " in (" + cert.root_low + ", " + cert.root_high +
            "], is a root > 1 of the characteristic polynomial",
        "with a polynomial Q solving Q(n) - sum c_i Q(n - i) = -f(n), S = T + Q satisfies the "
        "homogeneous recurrence, every c_i >= 0",
        "S(n) > 0 on k consecutive sizes, so S = Θ(rho^n) and T = Θ(rho^n)"};
    return cert;
  } catch (const PrecisionShortfall&) {
    return std::nullopt;
  }
}

// A full-history recurrence T(n) = f(n) + (c/n) sum_{k<n} T(k): T over its
// class g at sizes from 64 to 2^12, a factor 2 of room each way; a checker
// differences the sum and carries the bounds from 64 on.
std::optional<Certificate> full_history_certificate(const Recurrence& recurrence,
                                                    const Derivation& d,
                                                    std::optional<double> clock_limit) {
  std::optional<std::string> g_text = driver_class_text(*d.growth);
  if (!g_text || !d.growth->is_subexponential()) return std::nullopt;
  return or_none([&]() -> std::optional<Certificate> {
    SourceText g_source = SourceText::whole("<certificate>", *g_text);
    ExprPtr g = parse_expression(g_source);
    Sampler sampler(recurrence, clock_limit);
    std::optional<RatioRange> range;
    for (BigInt n = kFirstFrom; n <= kLastFrom; n *= 2) {
      std::optional<Interval> r = sampler.t_over(*g, g_source, n);
      if (!r || !r->certainly_positive()) return std::nullopt;
      if (!range) range = RatioRange{r->lower(), r->upper()};
      range->low = std::min(range->low, r->lower());
      range->high = std::max(range->high, r->upper());
    }
    Rational low = power_of_two_at_most(range->low / 2),
             high = power_of_two_at_least(2 * range->high);
    Certificate cert;
    cert.method = "full-history";
    cert.proof = d.method;
    cert.bound_class = *g_text;
    cert.bound_low = to_string(low);
    cert.bound_high = to_string(high);
    cert.bound_from = kFirstFrom.str();
    const std::string& from = cert.bound_from;
    cert.obligations = {
        "n T(n) - (n - 1) T(n - 1): the sum differenced, T(n) from T(n - 1) alone for n > " + from,
        "T(" + from + ") between " + times_class(low, *g_text) + " and " +
            times_class(high, *g_text),
        "step, upper: the differenced recurrence keeps T(n) <= " + times_class(high, *g_text) +
            " for every n > " + from,
        "step, lower: the differenced recurrence keeps T(n) >= " + times_class(low, *g_text) +
            " for every n > " + from};
    return cert;
  });
}

}  // namespace

std::optional<Certificate> theorem_certificate(const Recurrence& recurrence,
                                               const Derivation& derivation,
                                               std::optional<double> clock_limit) {
  const Derivation& d = derivation;
  if (!d.growth && d.one_sided() && d.method.rfind("comparison with the drivers", 0) == 0)
    return comparison_certificate(recurrence, d, clock_limit);
  if (!d.growth) return std::nullopt;
  if (d.theorem == "linear recurrence with constant coefficients") return linear_certificate(d);
  if (d.theorem == "full-history summation factor")
    return full_history_certificate(recurrence, d, clock_limit);
  bool divide = d.theorem == "master theorem" || d.theorem == "Akra–Bazzi";
  bool subtract = d.theorem == "subtract-and-conquer";
  bool normalised = d.theorem == kNormalisedRootsTheorem && d.normalisation;
  bool substitute = d.theorem == "change of variables" || normalised;
  if (!divide && !subtract && !substitute) return std::nullopt;
  // A class written as a term stands for any member, and O or Ω terms bound
  // f on one side only: no constants hold for every function they allow.
  if (d.driving_is_class || d.driving_one_sided || !d.driving.growth) return std::nullopt;
  // lg lg n factors, irrational exponents: g has no text of the supported form.
  std::optional<std::string> g_text = driver_class_text(*d.driving.growth);
  if (!g_text) return std::nullopt;
  Shape shape = extract_shape(recurrence);
  if (!shape.ok) return std::nullopt;
  std::optional<Driver> driver = driver_of(shape, recurrence);
  if (!driver) return std::nullopt;
  // A sum as the driver (its class by the integral comparison, classify.cc):
  // its values at the sampled sizes up to 2^256 are out of reach, so no
  // constants are found and the proof is not re-checked.
  for (const ExprPtr& body : driver->bodies) {
    if (contains_sum(*body)) return std::nullopt;
  }

  Certificate cert;
  cert.method = divide       ? "divide"
                : subtract   ? "subtract"
                : normalised ? "normalised-change-of-variables"
                             : "change-of-variables";
  cert.proof = d.method;
  cert.driver_class = *g_text;
  SourceText g_source = SourceText::whole("<certificate>", *g_text);
  // An exponential driver is sampled on the range only (2^n at n = 2^256 is out of reach).
  std::vector<BigInt> bases;
  if (d.driving.growth->is_subexponential()) bases.push_back(2);
  for (const ScaledTerm& t : shape.scaled) {
    Rational divisor = Rational(1) / t.b;
    if (denominator(divisor) == 1 && numerator(divisor) > 2 && numerator(divisor) <= 1'000'000 &&
        std::find(bases.begin(), bases.end(), numerator(divisor)) == bases.end()) {
      bases.push_back(numerator(divisor));
    }
  }
  std::optional<DriverBounds> bounds;
  // What evaluating f, g and T may meet on valid input: no certificate then.
  try {
    ExprPtr g = parse_expression(g_source);
    Sampler sampler(recurrence, clock_limit);
    bounds = driver_bounds(sampler, *driver, d.driving, *g, g_source, bases);
  } catch (const InputError&) {
  } catch (const LimitReached&) {
  } catch (const PrecisionShortfall&) {
  } catch (const DomainError&) {
  }
  if (!bounds) return std::nullopt;
  cert.driver_low = to_string(bounds->low);
  cert.driver_high = to_string(bounds->high);
  cert.driver_from = bounds->from.str();
  std::string lines = driver->lines ? ", on every line of f" : "";
  cert.obligations.push_back("f(n) >= " + times_class(bounds->low, *g_text) +
                             " for every n >= " + cert.driver_from + lines);
  cert.obligations.push_back("f(n) <= " + times_class(bounds->high, *g_text) +
                             " for every n >= " + cert.driver_from + lines);
  std::vector<std::string> theorem;
  try {
    if (subtract) {
      if (shape.subtractive.size() != 1) return std::nullopt;
      const SubtractiveTerm& t = shape.subtractive[0];
      std::string a = to_string(t.a), b = t.c.str();
      theorem.push_back("a = " + a + ", b = " + b + ": T(n) = " + (t.a == 1 ? "" : a + " ") +
                        "T(n - " + b + ") + f(n), unrolled: a^(j/b) f(n - j) summed");
    } else if (normalised) {
      const RootNormalisation& r = *d.normalisation;
      const RootTerm& t = shape.roots.at(0);
      std::string a0 = to_string(r.limit);
      cert.normaliser = r.normaliser;
      cert.factor_limit = a0;
      cert.factor_low = to_string(r.factor_low);
      cert.factor_high = to_string(r.factor_high);
      cert.factor_from = r.from.str();
      cert.chain_low = to_string(r.chain_low);
      cert.chain_high = to_string(r.chain_high);
      std::string g =
          r.normaliser.find('/') == std::string::npos ? r.normaliser : "(" + r.normaliser + ")";
      theorem.push_back("U(n) = T(n)/" + g + ": U(n) = r(n) U(" + t.argument + ") + f(n)/" + g +
                        " with r(n) = " + r.factor);
      theorem.push_back(cert.factor_low + " <= r(n) <= " + cert.factor_high +
                        " for every n >= " + cert.factor_from +
                        " where the recursive line applies (floor(x) in (x - 1, " +
                        "x], ceil(x) in [x, x + 1))");
      theorem.push_back("the product of r(n)/" + a0 + " along every chain of sizes lies in [" +
                        cert.chain_low + ", " + cert.chain_high + "]");
      theorem.push_back("V(n) = " + a0 + " V(" + t.argument + ") + f(n)/" + g +
                        ": m = lg n, Akra–Bazzi on S(m) = V(2^m), back to n; T = Θ(" + g + " V)");
    } else if (substitute) {
      theorem.push_back("m = lg n, S(m) = T(2^m): Akra–Bazzi on S with f(2^m), back to n");
    } else if (d.theorem == "master theorem") {
      std::optional<Split> split = one_split(shape);
      if (!split) return std::nullopt;
      theorem = master_obligations(*split, *d.driving.growth, d);
    } else {
      theorem = akra_bazzi_obligations(shape, *d.driving.growth);
    }
  } catch (const PrecisionShortfall&) {
    return std::nullopt;
  } catch (const LimitReached&) {
    return std::nullopt;
  }
  if (d.regularity) {
    cert.regularity_c = to_string(d.regularity->c);
    cert.regularity_from = d.regularity->from.str();
  }
  cert.obligations.insert(cert.obligations.end(), theorem.begin(), theorem.end());
  cert.obligations.push_back("T(n) > 0 for " + bounds->positive_from.str() +
                             " <= n <= " + BigInt(bounds->from - 1).str());
  return cert;
}

Certificate induction_certificate(const InductionProof& proof) {
  Certificate cert;
  cert.method = proof.dyadic           ? "dyadic-induction"
                : proof.method.empty() ? "induction"
                                       : proof.method;
  cert.proof = induction_proof_name(proof);
  if (proof.dyadic || !proof.method.empty()) {
    cert.obligations = proof.obligations;
    return cert;
  }
  for (const InductionSideProof& s : proof.side_proofs) {
    std::string side = side_name(s.side);
    cert.obligations.push_back("T(n) " + s.relation + " " + s.claimed + " checked exactly for " +
                               s.claimed_from.str() + " <= n <= " + s.to.str());
    if (s.strengthened()) {
      cert.obligations.push_back("T(n) " + s.relation + " " + s.carried + " checked exactly for " +
                                 s.carried_from.str() + " <= n <= " + s.to.str());
    }
    for (uint64_t r = 0; r < s.modulus; ++r) {
      cert.obligations.push_back(
          "step (" + side + " side, " + s.carried + "): slack " + (s.identity ? "= 0" : ">= 0") +
          " for every real n > " + s.to.str() +
          (s.modulus > 1 ? ", n mod " + std::to_string(s.modulus) + " = " + std::to_string(r)
                         : std::string()));
    }
    if (s.strengthened()) {
      cert.obligations.push_back(s.carried + (s.side == Side::kUpper ? " <= " : " >= ") +
                                 s.claimed + " for every real n > " + s.to.str());
    }
  }
  return cert;
}

}  // namespace thetagate::engine
