#include "verifier/derivation/growth.h"

#include <vector>

namespace thetagate::engine {

GrowthClass GrowthClass::polylog(RealNumber alpha, RealNumber beta, RealNumber gamma) {
  GrowthClass g;
  g.alpha = std::move(alpha);
  g.beta = std::move(beta);
  g.gamma = std::move(gamma);
  return g;
}

GrowthClass GrowthClass::exponential(RealNumber rho) {
  GrowthClass g;
  g.rho = std::move(rho);
  return g;
}

bool GrowthClass::is_subexponential() const { return rho == RealNumber(1L); }

bool GrowthClass::is_constant() const {
  return is_subexponential() && alpha.sign() == 0 && beta.sign() == 0 && gamma.sign() == 0;
}

GrowthClass GrowthClass::times(const GrowthClass& o) const {
  GrowthClass g;
  g.rho = rho * o.rho;
  g.alpha = alpha + o.alpha;
  g.beta = beta + o.beta;
  g.gamma = gamma + o.gamma;
  return g;
}

GrowthClass GrowthClass::over(const GrowthClass& o) const {
  GrowthClass g;
  g.rho = rho / o.rho;
  g.alpha = alpha - o.alpha;
  g.beta = beta - o.beta;
  g.gamma = gamma - o.gamma;
  return g;
}

GrowthClass GrowthClass::power(const RealNumber& r) const {
  GrowthClass g;
  g.rho = pow(rho, r);
  g.alpha = alpha * r;
  g.beta = beta * r;
  g.gamma = gamma * r;
  return g;
}

int compare(const GrowthClass& a, const GrowthClass& b) {
  if (int c = compare(a.rho, b.rho)) return c;
  if (int c = compare(a.alpha, b.alpha)) return c;
  if (int c = compare(a.beta, b.beta)) return c;
  return compare(a.gamma, b.gamma);
}

namespace {

// An exponent as it follows '^': "2", "(3/2)", "(lg 7)", "0.839780…".
std::string exponent_text(const RealNumber& x) {
  std::string s = x.str();
  bool plain = x.is_integer() && x.sign() >= 0;
  bool digits = s.find("…") != std::string::npos && s[0] != '-';
  return plain || digits ? s : "(" + s + ")";
}

std::string rho_text(const RealNumber& rho) {
  std::string s = rho.str();
  bool plain = rho.is_integer() || s.find("…") != std::string::npos;
  return (plain ? s : "(" + s + ")") + "^n";
}

// One factor with a positive exponent; `over` collects the ones that were negative.
void add_factor(std::vector<std::string>& up, std::vector<std::string>& down, const RealNumber& e,
                const std::string& one, const std::string& prefix_power_name, bool prefix_style) {
  int s = e.sign();
  if (s == 0) return;
  RealNumber m = s > 0 ? e : -e;
  std::string text;
  if (m == RealNumber(1L)) {
    text = one;
  } else if (prefix_style) {
    text = prefix_power_name + "^" + exponent_text(m) + " n";  // lg^2 n
  } else {
    text = (one.find(' ') != std::string::npos ? "(" + one + ")" : one) + "^" + exponent_text(m);
  }
  (s > 0 ? up : down).push_back(text);
}

std::string join(const std::vector<std::string>& parts) {
  std::string s;
  for (const auto& p : parts) s += (s.empty() ? "" : " ") + p;
  return s;
}

}  // namespace

std::string to_string(const GrowthClass& g) {
  std::vector<std::string> up, down;
  if (!g.is_subexponential()) up.push_back(rho_text(g.rho));
  add_factor(up, down, g.alpha, "n", "", false);
  add_factor(up, down, g.beta, "lg n", "lg", true);
  add_factor(up, down, g.gamma, "lg lg n", "", false);
  std::string top = up.empty() ? "1" : join(up);
  if (down.empty()) return top;
  std::string bottom = join(down);
  if (down.size() > 1) bottom = "(" + bottom + ")";
  if (up.size() > 1) top = "(" + top + ")";
  return top + "/" + bottom;
}

}  // namespace thetagate::engine
