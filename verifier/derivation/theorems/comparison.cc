#include "verifier/derivation/theorems/comparison.h"

namespace thetagate::engine {

void bound_by_comparison(const DerivationInput& input, const std::string& theorem,
                         const std::function<TheoremOutcome(const GrowthClass*)>& solve,
                         TheoremOutcome& out) {
  std::optional<TheoremOutcome> up, low;
  if (input.driving_upper) {
    up = solve(&*input.driving_upper);
  }
  std::string lower_text = input.driving_lower_zero ? "0" : "";
  if (input.driving_lower) {
    lower_text = to_string(*input.driving_lower);
    low = solve(&*input.driving_lower);
  } else if (input.driving_lower_zero) {
    low = solve(nullptr);
  }
  if (up && !up->applies()) up.reset();
  if (low && !low->applies()) low.reset();
  if (!up && !low) return;
  std::string upper_text = input.driving_upper ? to_string(*input.driving_upper) : "";
  std::string between;
  if (!lower_text.empty() && !upper_text.empty()) {
    between = (lower_text == "0" ? "0" : "c₁ " + lower_text) + " <= f(n) <= c₂ " + upper_text;
  } else if (!upper_text.empty()) {
    between = "0 <= f(n) <= c₂ " + upper_text;
  } else {
    between = "f(n) >= c₁ " + lower_text;
  }
  out.bounds_steps.push_back((input.driving_one_sided
                                  ? "f(n) is bounded by its terms: "
                                  : "every case line of f is of a class "
                                    "between Θ(" +
                                        lower_text + ") and Θ(" + upper_text + "), so ") +
                             between + " for all large n");
  out.bounds_steps.push_back(
      "comparison: the recursion's coefficient a is positive, so T is monotone in f and lies " +
      std::string(up && low ? "between the solutions" : "on that side of the solution") +
      " of the same recursion driven by " + (up && low ? "those bounds" : "that bound") +
      " (their base values adjusted for the finitely many smaller n)");
  std::string conclusion;
  if (up) {
    out.upper = up->growth;
    out.bounds_steps.push_back("driven by " + upper_text + ": " + up->method + ", Θ(" +
                               to_string(*up->growth) + ")");
    conclusion = "T(n) = O(" + to_string(*up->growth) + ")";
  }
  if (low) {
    out.lower = low->growth;
    out.bounds_steps.push_back("driven by " + lower_text + ": " + low->method + ", Θ(" +
                               to_string(*low->growth) + ")");
    conclusion += (conclusion.empty() ? "T(n) = Ω(" : " and Ω(") + to_string(*low->growth) + ")";
  }
  out.bounds_steps.push_back(conclusion);
  std::string drivers = up && low ? "the drivers " + lower_text + " and " + upper_text
                        : up      ? "the driver " + upper_text
                                  : "the driver " + lower_text;
  out.bounds_method = "comparison with " + drivers + ": " + theorem;
}

}  // namespace thetagate::engine
