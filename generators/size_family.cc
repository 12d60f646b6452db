#include "generators/size_family.h"

#include <algorithm>
#include <functional>
#include <utility>

#include "generators/random_bits.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {
namespace {

// One exponent of a divisor chosen by the scale schedule.
struct Power {
  uint64_t k;
  BigInt value;  // b^k
};

struct Context {
  const SizePlan& plan;
  std::vector<uint64_t> scales;
  // Per divisor: b, and the exponents k_s = max{k : b^k < 2^(s+1)} over the
  // schedule's scales s, ascending and unique.
  std::vector<std::pair<BigInt, std::vector<Power>>> divisors;
};

using Emit = std::function<void(const BigInt&)>;

// n with L base-b digits 1,0,1,0,… (leading 1): ⌊b^(L+1)/(b²−1)⌋.
BigInt alternating_digits(const BigInt& b, uint64_t digits) {
  BigInt top = pow(b, static_cast<unsigned>(digits + 1));
  return top / (b * b - 1);
}

void small(const Context& c, const Emit& emit) {
  BigInt n = c.plan.min_n < 0 ? BigInt(0) : c.plan.min_n;
  for (; n <= c.plan.exhaustive_limit; ++n) emit(n);
}

void powers(const Context& c, const Emit& emit) {
  for (const auto& [b, exponents] : c.divisors)
    for (const Power& p : exponents) emit(p.value);
}

void ones(const Context& c, const Emit& emit) {
  for (const auto& [b, exponents] : c.divisors)
    for (const Power& p : exponents) emit((p.value * b - 1) / (b - 1));
}

void alternating(const Context& c, const Emit& emit) {
  for (const auto& [b, exponents] : c.divisors) {
    // k+1 digits, like b^k. The parity of the first halving follows k, so
    // both parities occur across the schedule's exponents.
    for (const Power& p : exponents) emit(alternating_digits(b, p.k + 1));
  }
}

void power_neighbours(const Context& c, const Emit& emit) {
  for (const auto& [b, exponents] : c.divisors) {
    for (const Power& p : exponents) {
      if (p.k == 0) continue;  // b^0 ± 1 = 0, 2: no power to neighbour
      emit(p.value - 1);
      emit(p.value + 1);
    }
  }
}

void power_multiples(const Context& c, const Emit& emit) {
  // 3 catches mod-3 drivers on b = 2; 5 and 7 are the next odd cofactors;
  // 6 = 2·3 puts a factor 3 one halving deeper.
  static const int kCofactors[] = {3, 5, 6, 7};
  for (const auto& [b, exponents] : c.divisors)
    for (const Power& p : exponents)
      for (int m : kCofactors)
        if (b != m) emit(p.value * m);  // m·b^k would be a plain power
}

void random(const Context& c, const Emit& emit) {
  for (uint64_t s : c.scales) {
    SplitMix64 rng = SplitMix64::stream(c.plan.seed, s);
    for (uint64_t i = 0; i < c.plan.random_per_scale; ++i) emit(random_in_scale(rng, s));
  }
}

struct Family {
  FamilyInfo info;
  void (*generate)(const Context&, const Emit&);
};

// Priority order: a size produced by several families keeps the first name.
// The shape-specific families come before the generic ones so a report names
// the most telling shape (2^k − 1 is reported as "ones", not as a neighbour).
const std::vector<Family>& families() {
  static const std::vector<Family> kFamilies = {
      {{"small", "every n from min_n to the exhaustive limit (10^4 by default)"}, small},
      {{"powers", "b^k for every divisor b: all-zero digits below the lead, every halving exact"},
       powers},
      {{"ones",
        "(b^(k+1) - 1)/(b - 1): all digits 1 in base b; for b = 2 every floor halving is odd"},
       ones},
      {{"alternating",
        "digits 1010... in base b: for b = 2 the floor halvings alternate odd and even"},
       alternating},
      {{"power-neighbours", "b^k - 1 and b^k + 1: one off a power, floor and ceiling differ"},
       power_neighbours},
      {{"power-multiples", "c * b^k for c = 3, 5, 6, 7 (c != b): non-powers with a small cofactor"},
       power_multiples},
      {{"random", "uniform in [2^k, 2^(k+1)) for each scheduled scale k, drawn from the seed"},
       random},
  };
  return kFamilies;
}

std::vector<std::pair<BigInt, std::vector<Power>>> divisor_exponents(
    const std::vector<BigInt>& divisors, const std::vector<uint64_t>& scales) {
  std::vector<BigInt> bases = divisors.empty() ? std::vector<BigInt>{2} : divisors;
  std::sort(bases.begin(), bases.end());
  bases.erase(std::unique(bases.begin(), bases.end()), bases.end());
  std::vector<std::pair<BigInt, std::vector<Power>>> out;
  for (const BigInt& b : bases) {
    std::vector<Power> exponents;
    uint64_t k = 0;
    BigInt p = 1;
    for (uint64_t s : scales) {
      BigInt limit = BigInt(1) << (s + 1);
      while (p * b < limit) {
        p *= b;
        ++k;
      }
      if (exponents.empty() || exponents.back().k != k) exponents.push_back({k, p});
    }
    out.emplace_back(b, std::move(exponents));
  }
  return out;
}

[[noreturn]] void fail_unknown(const std::string& name) {
  std::string known;
  for (const Family& f : families()) known += (known.empty() ? "" : ", ") + f.info.name;
  throw InputError(Diagnostic{Location{"<sizes>", 1, 1}, "unknown size family '" + name + "'",
                              "known families: " + known, ""});
}

}  // namespace

std::vector<uint64_t> scales(uint64_t max_bits) {
  std::vector<uint64_t> out;
  uint64_t top = max_bits - 1;
  for (uint64_t k = 0; k <= std::min<uint64_t>(64, top); ++k) out.push_back(k);
  for (uint64_t s = 64 + 22; s < top; s += (s + 2) / 3) out.push_back(s);
  if (out.back() != top) out.push_back(top);
  return out;
}

std::vector<Size> generate_sizes(const SizePlan& plan) {
  if (auto unknown = unknown_size_family(plan.families)) fail_unknown(*unknown);
  Context context{plan, scales(plan.max_bits), {}};
  context.divisors = divisor_exponents(plan.divisors, context.scales);

  const BigInt limit = BigInt(1) << plan.max_bits;
  // (n, priority) pairs; sorting puts the highest-priority family first.
  std::vector<std::pair<BigInt, size_t>> found;
  const auto& all = families();
  for (size_t i = 0; i < all.size(); ++i) {
    const auto& wanted = plan.families;
    if (!wanted.empty() &&
        std::find(wanted.begin(), wanted.end(), all[i].info.name) == wanted.end())
      continue;
    all[i].generate(context, [&](const BigInt& n) {
      if (n >= plan.min_n && n < limit) found.emplace_back(n, i);
    });
  }
  std::sort(found.begin(), found.end());
  std::vector<Size> sizes;
  for (auto& [n, i] : found) {
    if (!sizes.empty() && sizes.back().n == n) continue;
    sizes.push_back({std::move(n), all[i].info.name});
  }
  return sizes;
}

namespace {

// Whether x = b^k for some k >= 1.
bool is_power_of(BigInt x, const BigInt& b) {
  if (x < b) return false;
  while (x % b == 0) x /= b;
  return x == 1;
}

std::string shape_in_base(const BigInt& n, const BigInt& b) {
  if (is_power_of(n, b)) return "powers";
  if (is_power_of(n * (b - 1) + 1, b) && n > b) return "ones";
  uint64_t digits = 0;
  for (BigInt x = n; x > 0; x /= b) ++digits;
  if (digits >= 3 && n == alternating_digits(b, digits)) return "alternating";
  if (is_power_of(n - 1, b) || is_power_of(n + 1, b)) return "power-neighbours";
  for (int m : {3, 5, 6, 7}) {
    if (b != m && n % m == 0 && is_power_of(n / m, b)) return "power-multiples";
  }
  return "";
}

}  // namespace

std::string shape_family_of(const BigInt& n, const std::vector<BigInt>& divisors) {
  if (n < 8) return "";
  std::vector<BigInt> bases = divisors.empty() ? std::vector<BigInt>{2} : divisors;
  std::vector<std::string> shapes;
  for (const BigInt& b : bases)
    if (b >= 2) shapes.push_back(shape_in_base(n, b));
  // Priority across bases: the earliest in the family table any base gives.
  for (const Family& f : families()) {
    if (std::find(shapes.begin(), shapes.end(), f.info.name) != shapes.end()) return f.info.name;
  }
  return "";
}

const std::vector<std::string>& adversarial_families() {
  static const std::vector<std::string> kFamilies = {"ones", "alternating", "power-neighbours",
                                                     "power-multiples"};
  return kFamilies;
}

const std::vector<FamilyInfo>& size_families() {
  static const std::vector<FamilyInfo> kInfo = [] {
    std::vector<FamilyInfo> info;
    for (const Family& f : families()) info.push_back(f.info);
    return info;
  }();
  return kInfo;
}

bool is_size_family(const std::string& name) {
  for (const Family& f : families())
    if (f.info.name == name) return true;
  return false;
}

std::optional<std::string> unknown_size_family(const std::vector<std::string>& names) {
  for (const std::string& name : names)
    if (!is_size_family(name)) return name;
  return std::nullopt;
}

}  // namespace thetagate::engine
