// The thetagate command line: picks a subcommand and calls the library.
#include <iostream>

#include <CLI/CLI.hpp>

#include "verifier/evaluator.h"
#include "verifier/recurrence.h"

namespace {

int run_eval(const std::string& recurrence_text, const std::vector<std::string>& sizes) {
  using namespace thetagate;
  auto recurrence = recurrence_from_text(recurrence_text);
  std::vector<BigInt> ns;
  for (const auto& s : sizes) ns.push_back(evaluate_size(s, "<size>"));
  Evaluator evaluator(recurrence);
  for (const auto& n : ns) {
    std::cout << n.str() << ' ' << evaluator.value_at(n).str() << '\n';
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{"thetagate: checks claimed complexity bounds of recurrences"};
  app.require_subcommand(1);
  std::string recurrence_text;
  std::vector<std::string> sizes;
  auto* eval = app.add_subcommand("eval", "exact T(N), one 'N VALUE' line each");
  eval->add_option("recurrence", recurrence_text, "the recurrence; ';' separates lines")->required();
  eval->add_option("sizes", sizes, "sizes N, e.g. 100 2^4096+7")->required();
  CLI11_PARSE(app, argc, argv);
  try {
    if (*eval) return run_eval(recurrence_text, sizes);
  } catch (const thetagate::InputError& e) {
    std::cerr << e.what() << '\n';
    return 2;
  } catch (const thetagate::BudgetExceeded& e) {
    std::cerr << "thetagate: out of budget: " << e.what() << '\n';
    return 2;
  }
  return 0;
}
