// The thetagate command line: picks a subcommand, turns arguments into
// calls of the library, and turns outcomes into exit codes:
// 0 no claim refuted, 1 at least one refuted, 2 bad input or usage (bad
// input wins: a run with a refutation and an input error exits 2).
#include <unistd.h>

#include <CLI/CLI.hpp>
#include <algorithm>
#include <chrono>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <random>
#include <sstream>

#include "generators/size_family.h"
#include "reports/baseline.h"
#include "reports/derivation_report.h"
#include "reports/drift.h"
#include "reports/html_report.h"
#include "reports/json_report.h"
#include "reports/junit_report.h"
#include "reports/report_file.h"
#include "reports/text_report.h"
#include "verifier/checking/run.h"
#include "verifier/derivation/derive.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/input_file.h"
#include "verifier/syntax/spelling.h"

namespace {

using namespace thetagate;

constexpr int kExitRefuted = 1;
constexpr int kExitBadInput = 2;

struct CheckArguments {
  std::vector<std::string> paths;
  std::vector<std::string> claims;
  std::string format = "text";
  std::string out;
  std::string seed = "1";
  std::optional<uint64_t> max_bits;
  uint64_t effort = 1;
  std::string rounding;
  unsigned jobs = 1;
  bool list_families = false;
  bool undecided_fails = false;
  std::string baseline;
  std::vector<std::string> fail_on;
  std::optional<double> clock_limit;
  uint64_t memory_mib = 2048;
};

uint64_t parse_seed(const std::string& text) {
  if (text == "random") {
    std::random_device device;
    return (static_cast<uint64_t>(device()) << 32) ^ device();
  }
  size_t used = 0;
  uint64_t seed = std::stoull(text, &used);
  if (used != text.size() || text.empty() || text[0] == '-') throw std::invalid_argument(text);
  return seed;
}

std::string render(const RunResult& run, const DriftReport* drift, const std::string& format,
                   bool colour, bool undecided_fails) {
  if (format == "json") return drift ? render_json_with_drift(run, *drift) : render_json(run);
  if (format == "junit") return render_junit(run, JunitOptions{undecided_fails});
  if (format == "html") return render_html(run);
  TextStyle style;
  style.colour = colour;
  std::string text = render_text(run, style);
  if (drift) text += render_drift_text(*drift, style);
  return text;
}

std::string read_baseline(const std::string& path) {
  return read_input_file(
      path, kMaxReportFileBytes, "baseline report",
      "give the JSON report of an earlier run: thetagate check --format json --out OLD.json");
}

// A progress line on stderr, only on a terminal and only once a run has
// taken a second: short runs and pipes stay quiet.
class Progress {
 public:
  Progress() : enabled_(isatty(STDERR_FILENO) != 0), start_(std::chrono::steady_clock::now()) {}
  void update(size_t done, size_t total, const std::string& name) {
    if (!enabled_) return;
    if (std::chrono::steady_clock::now() - start_ < std::chrono::seconds(1)) return;
    std::string shown = name.size() > 50 ? name.substr(0, 49) + "…" : name;
    std::cerr << "\r\033[K[" << done << "/" << total << "] " << shown << std::flush;
    drawn_ = true;
  }
  ~Progress() {
    if (drawn_) std::cerr << "\r\033[K" << std::flush;
  }

 private:
  bool enabled_;
  bool drawn_ = false;
  std::chrono::steady_clock::time_point start_;
};

int list_families() {
  for (const FamilyInfo& f : size_families()) {
    std::cout << f.name << std::string(f.name.size() < 18 ? 18 - f.name.size() : 1, ' ')
              << f.description << '\n';
  }
  return 0;
}

int run_check(const CheckArguments& args) {
  if (args.list_families) return list_families();
  FailOn fail_on = args.fail_on.empty() ? FailOn{} : parse_fail_on(args.fail_on);
  if (fail_on.drift && args.baseline.empty()) {
    std::cerr << "thetagate: --fail-on drift needs --baseline OLD.json\n";
    return kExitBadInput;
  }
  std::optional<RunResult> baseline;
  if (!args.baseline.empty()) {
    baseline = read_json_report(read_baseline(args.baseline), args.baseline);
  }
  // Where the reports go is checked before any claim is: a bad --out must
  // not cost the run.
  bool out_is_folder =
      !args.out.empty() && (args.out.back() == '/' || std::filesystem::is_directory(args.out));
  if (!args.out.empty()) check_output_location(args.out, out_is_folder);
  RunRequest request;
  try {
    request.options.seed = parse_seed(args.seed);
  } catch (const std::exception&) {
    std::cerr << "thetagate: --seed takes a whole number or 'random', not '" << args.seed << "'\n";
    return kExitBadInput;
  }
  request.options.max_bits = args.max_bits;
  if (args.clock_limit) request.options.budget.max_seconds = *args.clock_limit;
  request.options.effort = args.effort;
  if (args.rounding == "floor") request.options.rounding = Rounding::kFloor;
  if (args.rounding == "ceil") request.options.rounding = Rounding::kCeil;
  if (args.rounding == "both") request.options.rounding = Rounding::kBoth;
  request.paths = args.paths;
  request.claim_names = args.claims;
  request.jobs = args.jobs;
  request.memory_limit = args.memory_mib << 20;
  Progress progress;
  request.progress = [&progress](size_t done, size_t total, const std::string& name) {
    progress.update(done, total, name);
  };
  RunResult run = run_check(request);
  std::optional<DriftReport> drift;
  if (baseline) drift = compare_runs(*baseline, run);
  const DriftReport* drift_ptr = drift ? &*drift : nullptr;

  std::vector<std::pair<std::string, std::string>> files;
  if (out_is_folder) {
    const std::pair<const char*, const char*> formats[] = {{"text", "report.txt"},
                                                           {"json", "report.json"},
                                                           {"junit", "report.junit.xml"},
                                                           {"html", "report.html"}};
    for (const auto& [format, name] : formats) {
      files.emplace_back((std::filesystem::path(args.out) / name).string(),
                         render(run, drift_ptr, format, false, args.undecided_fails));
    }
  } else {
    bool colour = args.out.empty() && args.format == "text" && want_colour(STDOUT_FILENO);
    std::string text = render(run, drift_ptr, args.format, colour, args.undecided_fails);
    if (args.out.empty()) {
      std::cout << text;
    } else {
      files.emplace_back(args.out, std::move(text));
    }
  }
  if (std::string failure = write_files_whole(files); !failure.empty()) {
    std::cerr << "thetagate: " << failure << '\n';
    return kExitBadInput;
  }
  // Bad input shows in the exit code whatever else happened; the other
  // claims are still in the report.
  for (const auto& c : run.claims) {
    if (c.verdict == Verdict::kError) return kExitBadInput;
  }
  return should_fail(run, drift_ptr, fail_on) ? kExitRefuted : 0;
}

int run_derive(const std::string& recurrence_text, const std::string& format) {
  auto recurrence = recurrence_from_text(recurrence_text);
  check_calls_shrink(*recurrence);  // as eval and check do before evaluating
  Derivation d = derive(*recurrence);
  std::cout << (format == "json" ? render_derivation_json(d) : render_derivation_text(d));
  return 0;
}

int run_eval(const std::string& recurrence_text, const std::vector<std::string>& sizes) {
  auto recurrence = recurrence_from_text(recurrence_text);
  std::vector<BigInt> ns;
  for (const auto& s : sizes) ns.push_back(evaluate_size(s, "<size>"));
  Evaluator evaluator(recurrence);
  for (size_t i = 0; i < ns.size(); ++i) {
    try {
      Value value = evaluator.value_at(ns[i]);  // before printing: no half line on an error
      std::cout << ns[i].str() << ' ' << value.str() << '\n';
    } catch (const BudgetExceeded& e) {
      // Located at the size given, the argument that asked for too much.
      SourceText size = SourceText::whole("<size>", sizes[i]);
      Diagnostic d{size.locate(0),
                   recurrence->main.name + "(" + sizes[i] + ") is out of budget: " + e.what(),
                   "evaluate smaller sizes; check bounds the work per claim by itself", sizes[i]};
      throw InputError(d);
    }
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{"thetagate: checks claimed complexity bounds of recurrences"};
  app.require_subcommand(1);

  CheckArguments check;
  auto* check_command =
      app.add_subcommand("check", "check the claims in files or folders (default: claims/)");
  check_command->add_option("paths", check.paths, "claim files (.toml) or folders");
  check_command->add_option("--format", check.format, "report format: text, json, junit or html")
      ->check(CLI::IsMember({"text", "json", "junit", "html"}));
  check_command->add_option("--out", check.out,
                            "write the report to FILE; to a folder (existing, or ending in '/'): "
                            "every format at once");
  check_command->add_option("--seed", check.seed, "seed for random sizes: a number, or 'random'");
  check_command->add_option("--max-bits", check.max_bits, "largest size in bits (default 4096)")
      ->check(CLI::Range(1, 65536));
  check_command
      ->add_option("--effort", check.effort,
                   "search work per claim, a multiple of the default (about 0.2 s of one "
                   "core): 10 or 100 for deeper nightly runs")
      ->check(CLI::Range(1, 10000));
  check_command
      ->add_option("--clock-limit", check.clock_limit,
                   "wall-clock guard per claim against hangs, in seconds (default 60 x effort); "
                   "0: none, so only the work budgets end a search")
      ->check(CLI::Range(0.0, 1e6));
  check_command->add_option("--claim", check.claims,
                            "check only the claim with this name (repeatable)");
  check_command
      ->add_option("--rounding", check.rounding,
                   "read n/b inside T(...) as floor, ceil, or both (overrides claims)")
      ->check(CLI::IsMember({"floor", "ceil", "both"}));
  check_command->add_option("--jobs,-j", check.jobs, "claims checked in parallel (same report)")
      ->check(CLI::Range(1, 256));
  check_command
      ->add_option("--memory", check.memory_mib,
                   "MiB all workers may hold together (default 2048); each claim may use 512, "
                   "so this caps --jobs")
      ->check(CLI::Range(1, 1 << 24));
  check_command->add_flag("--undecided-fails", check.undecided_fails,
                          "JUnit: report undecided claims as failures, not skipped");
  check_command->add_flag("--list-families", check.list_families,
                          "describe the size families and exit");
  check_command->add_option("--baseline", check.baseline,
                            "an earlier JSON report: mark verdict changes, new or lost witnesses "
                            "and band moves");
  check_command
      ->add_option("--fail-on", check.fail_on,
                   "what exits 1: refuted (default), undecided, drift; comma-separated")
      ->delimiter(',');

  std::string recurrence_text;
  std::string derive_format = "text";
  auto* derive_command = app.add_subcommand("derive", "the derived bound and the reasoning");
  derive_command->add_option("recurrence", recurrence_text, "the recurrence; ';' separates lines")
      ->required();
  derive_command->add_option("--format", derive_format, "text or json")
      ->check(CLI::IsMember({"text", "json"}));

  std::vector<std::string> sizes;
  auto* eval_command = app.add_subcommand("eval", "exact T(N), one 'N VALUE' line each");
  eval_command->add_option("recurrence", recurrence_text, "the recurrence; ';' separates lines")
      ->required();
  eval_command->add_option("sizes", sizes, "sizes N, e.g. 100 2^4096+7")->required();

  // CLI11 would say "a subcommand is required" for a misspelt one.
  if (argc > 1 && argv[1][0] != '-') {
    std::string word = argv[1];
    const std::vector<std::string> commands = {"check", "derive", "eval"};
    if (std::find(commands.begin(), commands.end(), word) == commands.end()) {
      std::string closest = commands.front();
      for (const std::string& c : commands) {
        if (edit_distance(word, c) < edit_distance(word, closest)) closest = c;
      }
      std::cerr << "thetagate: unknown command '" << word << "'\n  hint: "
                << (edit_distance(word, closest) <= 2 ? "did you mean '" + closest + "'? " : "")
                << "commands: check, derive, eval (thetagate --help)\n";
      return kExitBadInput;
    }
  }
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    int status = app.exit(e);
    return status == 0 ? 0 : kExitBadInput;
  }
  try {
    if (*check_command) return run_check(check);
    if (*derive_command) return run_derive(recurrence_text, derive_format);
    if (*eval_command) return run_eval(recurrence_text, sizes);
  } catch (const InputError& e) {
    std::cerr << e.what() << '\n';
    return kExitBadInput;
  } catch (const BudgetExceeded& e) {
    std::cerr << "thetagate: out of budget: " << e.what() << '\n';
    return kExitBadInput;
  } catch (const std::filesystem::filesystem_error& e) {
    std::cerr << "thetagate: " << e.what() << '\n';
    return kExitBadInput;
  }
  return 0;
}
