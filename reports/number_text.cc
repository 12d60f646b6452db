#include "reports/number_text.h"

#include <fmt/format.h>

#include <cctype>
#include <cmath>
#include <optional>

namespace thetagate::engine {

namespace {

constexpr size_t kMaxVerbatimDigits = 30;
constexpr size_t kEdgeDigits = 6;
// An offset counts as "near" when it fits in 12 digits and is at least 2^16
// times smaller than n: then the power form says more than the digits do.
const BigInt kMaxOffset("1000000000000");
constexpr uint64_t kOffsetHeadroomBits = 16;

struct PowerForm {
  unsigned coefficient = 1;  // c in c*base^k
  unsigned base = 2;
  uint64_t exponent = 0;
  BigInt offset;  // n - c*base^k
};

std::string render(const PowerForm& p) {
  std::string out;
  if (p.coefficient != 1) out += std::to_string(p.coefficient) + "*";
  out += std::to_string(p.base) + "^" + std::to_string(p.exponent);
  if (p.offset > 0) out += "+" + p.offset.str();
  if (p.offset < 0) out += p.offset.str();  // str() carries the minus sign
  return out;
}

bool is_near(const BigInt& n, const BigInt& offset) {
  BigInt magnitude = abs(offset);
  return magnitude <= kMaxOffset && bit_length(magnitude) + kOffsetHeadroomBits <= bit_length(n);
}

// Keeps the candidate with the smaller offset; on a tie the earlier one,
// so plain powers beat multiples and base 2 beats base 10.
void consider(std::optional<PowerForm>& best, const BigInt& n, PowerForm candidate) {
  if (!is_near(n, candidate.offset)) return;
  if (!best || abs(candidate.offset) < abs(best->offset)) best = std::move(candidate);
}

std::optional<PowerForm> nearest_power_form(const BigInt& n) {
  std::optional<PowerForm> best;
  uint64_t bits = bit_length(n);
  if (bits <= kOffsetHeadroomBits) return best;  // too small for any offset to be "near"
  for (unsigned c = 1; c < 16; c += 2) {
    uint64_t c_bits = bit_length(BigInt(c));
    for (uint64_t k = bits > c_bits + 1 ? bits - c_bits - 1 : 0; k <= bits - c_bits + 1; ++k) {
      BigInt power = BigInt(c) << k;
      consider(best, n, PowerForm{c, 2, k, n - power});
    }
  }
  uint64_t digits = n.str().size();
  for (uint64_t k = digits - 1; k <= digits; ++k) {
    BigInt power = boost::multiprecision::pow(BigInt(10), static_cast<unsigned>(k));
    consider(best, n, PowerForm{1, 10, k, n - power});
  }
  return best;
}

std::string edge_digits(const std::string& digits) {
  if (digits.size() <= kMaxVerbatimDigits) return digits;
  return digits.substr(0, kEdgeDigits) + "\u2026" + digits.substr(digits.size() - kEdgeDigits) +
         " (" + std::to_string(digits.size()) + " digits)";
}

}  // namespace

std::string short_decimal(const BigInt& n) {
  if (n < 0) return "-" + short_decimal(BigInt(-n));
  if (n > 0) {
    if (auto form = nearest_power_form(n)) return render(*form);
  }
  return edge_digits(n.str());
}

std::string short_value(const std::string& text) {
  std::string out;
  size_t i = 0;
  while (i < text.size()) {
    if (!std::isdigit(static_cast<unsigned char>(text[i]))) {
      out += text[i++];
      continue;
    }
    size_t end = i;
    while (end < text.size() && std::isdigit(static_cast<unsigned char>(text[end]))) ++end;
    std::string run = text.substr(i, end - i);
    bool fraction_digits = i > 0 && text[i - 1] == '.';
    bool part_of_decimal = end < text.size() && text[end] == '.';
    if (run.size() <= kMaxVerbatimDigits) {
      out += run;
    } else if (fraction_digits || part_of_decimal) {
      out += edge_digits(run);
    } else {
      out += short_decimal(BigInt(run));
    }
    i = end;
  }
  return out;
}

std::string approximate_fraction(const BigInt& p, const BigInt& q) {
  if (p == 0) return "0";
  BigInt a = p < 0 ? BigInt(-p) : p;
  // e = floor(log10(a/q)), found from the digit counts and corrected once.
  auto digits = [](const BigInt& x) { return static_cast<long>(x.str().size()); };
  long e = digits(a) - digits(q);
  auto scaled = [&](long exponent) {  // round(a / q * 10^(5 - exponent))
    long shift = 5 - exponent;
    BigInt num = a, den = q;
    if (shift >= 0)
      num *= boost::multiprecision::pow(BigInt(10), static_cast<unsigned>(shift));
    else
      den *= boost::multiprecision::pow(BigInt(10), static_cast<unsigned>(-shift));
    return BigInt((2 * num + den) / (2 * den));
  };
  BigInt m = scaled(e);
  if (m < 100000) m = scaled(--e);
  if (m >= 1000000) m = scaled(++e);
  if (m >= 1000000) {  // 999999.5 rounded up
    m /= 10;
    ++e;
  }
  std::string d = m.str();  // six digits: d.ddddd × 10^e
  std::string sign = p < 0 ? "-" : "";
  auto trim = [](std::string s) {
    if (s.find('.') == std::string::npos) return s;
    while (s.back() == '0') s.pop_back();
    if (s.back() == '.') s.pop_back();
    return s;
  };
  if (e >= -4 && e < 6) {
    std::string s;
    if (e >= 0) {
      s = d.substr(0, static_cast<size_t>(e) + 1) + "." + d.substr(static_cast<size_t>(e) + 1);
    } else {
      s = "0." + std::string(static_cast<size_t>(-e - 1), '0') + d;
    }
    return sign + trim(s);
  }
  return sign + trim(d.substr(0, 1) + "." + d.substr(1)) + "e" + (e < 0 ? "-" : "+") +
         (std::abs(e) < 10 ? "0" : "") + std::to_string(std::abs(e));
}

std::string readable_value(const std::string& text) {
  size_t slash = text.find('/');
  bool fraction = slash != std::string::npos && slash > 0 && slash + 1 < text.size();
  size_t start = !text.empty() && text[0] == '-' ? 1 : 0;
  for (size_t i = start; fraction && i < text.size(); ++i) {
    if (i != slash && !std::isdigit(static_cast<unsigned char>(text[i]))) fraction = false;
  }
  if (!fraction || slash == start) return short_value(text);
  BigInt p(text.substr(0, slash));
  BigInt q(text.substr(slash + 1));
  if (q <= 0) return short_value(text);
  std::string approx = "≈ " + approximate_fraction(p, q);
  if (text.size() <= kMaxVerbatimDigits) return approx + " (= " + text + ")";
  return approx + " (exact: a fraction of " + std::to_string(slash - start) + " and " +
         std::to_string(text.size() - slash - 1) + " digits)";
}

std::string format_ratio(double ratio) {
  if (std::isnan(ratio)) return "nan";
  if (std::isinf(ratio)) return ratio > 0 ? "inf" : "-inf";
  return fmt::format("{:.4g}", ratio);
}

std::string format_band_ratio(double ratio, double log2_ratio) {
  // A zero ratio with a zero log2 is a row whose log2 was never filled in.
  bool ratio_usable = std::isfinite(ratio) && (ratio != 0 || log2_ratio == 0);
  if (ratio_usable || !std::isfinite(log2_ratio)) return format_ratio(ratio);
  return fmt::format("2^{:.4g}", log2_ratio);
}

}  // namespace thetagate::engine
