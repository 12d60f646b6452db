// The thetagate command line: picks a subcommand, turns arguments into
// calls of the library, and turns outcomes into exit codes:
// 0 no claim refuted, 1 at least one refuted, 2 bad input or usage.
#include <unistd.h>

#include <fstream>
#include <iostream>
#include <random>

#include <CLI/CLI.hpp>

#include "reports/json_report.h"
#include "reports/junit_report.h"
#include "reports/text_report.h"
#include "verifier/checker.h"
#include "verifier/claim.h"
#include "verifier/evaluator.h"
#include "verifier/recurrence.h"

namespace {

using namespace thetagate;

constexpr int kExitRefuted = 1;
constexpr int kExitBadInput = 2;

struct CheckArguments {
  std::vector<std::string> paths;
  std::string format = "text";
  std::string out;
  std::string seed = "1";
  std::optional<uint64_t> max_bits;
};

uint64_t parse_seed(const std::string& text) {
  if (text == "random") return std::random_device{}() * 0x100000001ull ^ std::random_device{}();
  size_t used = 0;
  uint64_t seed = std::stoull(text, &used);
  if (used != text.size()) throw std::invalid_argument(text);
  return seed;
}

int write_output(const std::string& text, const std::string& out) {
  if (out.empty()) {
    std::cout << text;
    return 0;
  }
  std::ofstream file(out, std::ios::binary);
  file << text;
  if (!file) {
    std::cerr << "thetagate: cannot write " << out << '\n';
    return kExitBadInput;
  }
  return 0;
}

int run_check(const CheckArguments& args) {
  CheckOptions options;
  try {
    options.seed = parse_seed(args.seed);
  } catch (const std::exception&) {
    std::cerr << "thetagate: --seed takes a whole number or 'random', not '" << args.seed << "'\n";
    return kExitBadInput;
  }
  options.max_bits = args.max_bits;
  std::vector<std::string> paths = args.paths.empty() ? std::vector<std::string>{"claims"} : args.paths;
  std::vector<ClaimEntry> entries;
  for (const std::string& file : find_claim_files(paths)) {
    std::vector<ClaimEntry> loaded = load_claim_file(file);
    entries.insert(entries.end(), loaded.begin(), loaded.end());
  }
  RunResult run = check_entries(entries, options);

  std::string text;
  if (args.format == "json") {
    text = render_json(run);
  } else if (args.format == "junit") {
    text = render_junit(run, JunitOptions{});
  } else {
    TextStyle style;
    style.colour = args.out.empty() && want_colour(STDOUT_FILENO);
    text = render_text(run, style);
  }
  if (int status = write_output(text, args.out)) return status;
  bool any_error = false;
  for (const auto& c : run.claims) any_error |= c.verdict == Verdict::kError;
  if (run.any_refuted()) return kExitRefuted;
  return any_error ? kExitBadInput : 0;
}

int run_eval(const std::string& recurrence_text, const std::vector<std::string>& sizes) {
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

  CheckArguments check;
  auto* check_command = app.add_subcommand("check", "check the claims in files or folders (default: claims/)");
  check_command->add_option("paths", check.paths, "claim files (.toml) or folders");
  check_command->add_option("--format", check.format, "report format")
      ->check(CLI::IsMember({"text", "json", "junit"}));
  check_command->add_option("--out", check.out, "write the report to FILE instead of stdout");
  check_command->add_option("--seed", check.seed, "seed for random sizes (a number, or 'random')");
  check_command->add_option("--max-bits", check.max_bits, "largest size in bits (default 4096)")
      ->check(CLI::Range(1, 65536));

  std::string recurrence_text;
  std::vector<std::string> sizes;
  auto* eval_command = app.add_subcommand("eval", "exact T(N), one 'N VALUE' line each");
  eval_command->add_option("recurrence", recurrence_text, "the recurrence; ';' separates lines")->required();
  eval_command->add_option("sizes", sizes, "sizes N, e.g. 100 2^4096+7")->required();

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    int status = app.exit(e);
    return status == 0 ? 0 : kExitBadInput;
  }
  try {
    if (*check_command) return run_check(check);
    if (*eval_command) return run_eval(recurrence_text, sizes);
  } catch (const InputError& e) {
    std::cerr << e.what() << '\n';
    return kExitBadInput;
  } catch (const BudgetExceeded& e) {
    std::cerr << "thetagate: out of budget: " << e.what() << '\n';
    return kExitBadInput;
  }
  return 0;
}
