// The thetagate command line: picks a subcommand, turns arguments into
// calls of the public library API (include/thetagate/), and turns outcomes
// into exit codes (cli/exit_policy.h): 0 fine, 1 refuted (or what --fail-on
// names), 2 bad input or usage (bad input wins over 1), 3 an internal error
// (a bug).
#include <signal.h>
#include <unistd.h>

#include <CLI/CLI.hpp>
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <random>
#include <sstream>

#include "cli/exit_policy.h"
#include "thetagate/thetagate.h"
#include "verifier/model/limits.h"          // constants only
#include "verifier/syntax/spelling.h"       // compiled into the front end, not exported
#include "verifier/syntax/terminal_text.h"  // likewise

namespace {

using namespace thetagate;
using cli::kExitBadInput;
using cli::kExitInternalError;

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
  bool recheck = false;  // --recheck: re-verify each holds's certificate
  std::string baseline;
  std::vector<std::string> fail_on;
  std::optional<double> clock_limit;
  uint64_t memory_mib = 2048;
  std::string costs_root;
  bool format_given = false;  // --format was on the command line
  bool brief = false;
  std::string recurrence;      // a claim given on the command line: --recurrence,
  std::string bound;           // --bound and
  std::string name = "claim";  // --name
  std::string shard;           // --shard K/N
};

struct ShardSpec {
  uint64_t index = 1;
  uint64_t count = 1;
};

// "K/N" with 1 <= K <= N <= 1024.
std::optional<ShardSpec> parse_shard_option(const std::string& text) {
  size_t slash = text.find('/');
  if (slash == std::string::npos || slash == 0 || slash + 1 == text.size() ||
      text.find_first_not_of("0123456789/") != std::string::npos ||
      text.find('/', slash + 1) != std::string::npos || text.size() > 9) {
    return std::nullopt;
  }
  ShardSpec s{std::stoull(text.substr(0, slash)), std::stoull(text.substr(slash + 1))};
  if (s.count < 1 || s.count > 1024 || s.index < 1 || s.index > s.count) return std::nullopt;
  return s;
}

// Standard input holds at most a claim file's worth.
constexpr size_t kMaxStdinBytes = size_t{16} << 20;

// The claims a check run reads: files and folders, '-' for a claim file on
// standard input, or one claim given with --recurrence and --bound.
std::vector<Claim> claims_of(const CheckArguments& args) {
  if (!args.recurrence.empty() || !args.bound.empty()) {
    ClaimSettings settings;
    // A reviewer pastes the right-hand side as often as the whole line:
    // "2T(n/2) + n lg n; T(1) = 1" means T(n) = 2T(n/2) + n lg n.
    std::string recurrence = args.recurrence;
    size_t first_end = recurrence.find_first_of(";\n");
    if (recurrence.substr(0, first_end).find('=') == std::string::npos) {
      recurrence = "T(n) = " + recurrence;
    }
    return {Claim::from_text(args.name, recurrence, args.bound, settings)};
  }
  std::vector<std::string> paths =
      args.paths.empty() ? std::vector<std::string>{"claims"} : args.paths;
  std::vector<Claim> claims;
  std::vector<std::string> files;
  auto flush_files = [&] {
    if (files.empty()) return;
    std::vector<Claim> loaded = load_claims(files);
    claims.insert(claims.end(), loaded.begin(), loaded.end());
    files.clear();
  };
  for (const std::string& path : paths) {
    if (path != "-") {
      files.push_back(path);
      continue;
    }
    flush_files();
    std::string text;
    char buffer[65536];
    while (std::cin.read(buffer, sizeof buffer) || std::cin.gcount() > 0) {
      text.append(buffer, static_cast<size_t>(std::cin.gcount()));
      if (text.size() > kMaxStdinBytes) {
        throw InputError(Diagnostic{Location{"<stdin>", 1, 1},
                                    "standard input holds more than 16 MiB",
                                    "a claim file is a few kilobytes; give a file instead", ""});
      }
    }
    std::vector<Claim> loaded = load_claims_from_text(text, "<stdin>");
    claims.insert(claims.end(), loaded.begin(), loaded.end());
  }
  flush_files();
  return claims;
}

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

// The summary line of a text report, for the log when reports go to files.
std::string summary_line(const Report& report) {
  size_t count[4] = {0, 0, 0, 0};
  for (const ClaimResult& c : report.claims()) ++count[static_cast<size_t>(c.verdict)];
  size_t total = report.claims().size();
  return std::to_string(total) + (total == 1 ? " claim: " : " claims: ") +
         std::to_string(count[0]) + " holds, " + std::to_string(count[1]) + " refuted, " +
         std::to_string(count[2]) + " undecided, " + std::to_string(count[3]) +
         (count[3] == 1 ? " error\n" : " errors\n");
}

// Whether --out names a folder: an existing one, or a path ending in '/'.
bool out_is_folder_path(const std::string& out) {
  std::error_code ec;
  return out.back() == '/' || std::filesystem::is_directory(out, ec);
}

// The format a report file's extension names, if it names one.
std::optional<Format> format_of_extension(const std::string& path) {
  std::string extension = std::filesystem::path(path).extension().string();
  for (char& c : extension) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  if (extension == ".txt") return Format::kText;
  if (extension == ".json") return Format::kJson;
  if (extension == ".xml") return Format::kJunit;
  if (extension == ".html" || extension == ".htm") return Format::kHtml;
  if (extension == ".md") return Format::kMarkdown;
  return std::nullopt;
}

const char* format_name(Format format) {
  switch (format) {
    case Format::kJson:
      return "json";
    case Format::kJunit:
      return "junit";
    case Format::kHtml:
      return "html";
    case Format::kBrief:
      return "brief";
    case Format::kMarkdown:
      return "markdown";
    case Format::kText:
      break;
  }
  return "text";
}

Format format_of(const std::string& name) {
  if (name == "json") return Format::kJson;
  if (name == "junit") return Format::kJunit;
  if (name == "html") return Format::kHtml;
  if (name == "markdown") return Format::kMarkdown;
  return Format::kText;
}

// A progress line on stderr, only on a terminal and only once a run has
// taken a second: short runs and pipes stay quiet.
class Progress {
 public:
  Progress() : enabled_(isatty(STDERR_FILENO) != 0), start_(std::chrono::steady_clock::now()) {}
  void update(size_t done, size_t total, const std::string& name) {
    if (!enabled_) return;
    if (std::chrono::steady_clock::now() - start_ < std::chrono::seconds(1)) return;
    // A claim name is a stranger's text: escaped before it reaches the terminal.
    std::string shown = engine::escape_controls(name);
    if (shown.size() > 50) shown = shown.substr(0, 49) + "…";
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

std::string json_string(const std::string& text) {
  std::string out = "\"";
  for (char c : text) {
    unsigned char u = static_cast<unsigned char>(c);
    if (c == '"' || c == '\\') {
      out += '\\';
      out += c;
    } else if (u < 0x20) {
      char escaped[8];
      std::snprintf(escaped, sizeof escaped, "\\u%04x", u);
      out += escaped;
    } else {
      out += c;
    }
  }
  return out + "\"";
}

// The size families as a table (text) or as a JSON array of {name, description}.
int list_families(const std::string& format) {
  if (format == "json") {
    std::cout << "[";
    bool first = true;
    for (const SizeFamily& f : size_families()) {
      std::cout << (first ? "\n" : ",\n") << "  {\"name\": " << json_string(f.name)
                << ", \"description\": " << json_string(f.description) << "}";
      first = false;
    }
    std::cout << "\n]\n";
    return 0;
  }
  if (format != "text") {
    std::cerr << "thetagate: --list-families prints text or json, not " << format << "\n";
    return kExitBadInput;
  }
  for (const SizeFamily& f : size_families()) {
    std::cout << f.name << std::string(f.name.size() < 18 ? 18 - f.name.size() : 1, ' ')
              << f.description << '\n';
  }
  return 0;
}

// Where a report goes and what fails the run: everything a check or a merge
// settles before its claims are read, so a bad --out does not cost the run.
struct OutputPlan {
  cli::FailOn fail_on;
  std::optional<Report> baseline;
  Format format = Format::kText;
  bool out_is_folder = false;
};

// Returns an exit code when the arguments are refused (the message printed).
std::optional<int> prepare_output(const CheckArguments& args, OutputPlan& plan) {
  cli::FailOn& fail_on = plan.fail_on;
  std::optional<Report>& baseline = plan.baseline;
  fail_on = args.fail_on.empty() ? cli::FailOn{} : cli::parse_fail_on(args.fail_on);
  if (fail_on.drift && args.baseline.empty()) {
    std::cerr << "thetagate: --fail-on drift needs --baseline OLD.json\n";
    return {kExitBadInput};
  }
  if (!args.baseline.empty()) {
    // The first night has no last night: a baseline that does not exist yet
    // is a note, and drift has nothing to fail on. One that exists but cannot
    // be read (a folder, a cut file, not a report) is still an error.
    std::error_code ec;
    if (std::filesystem::symlink_status(args.baseline, ec).type() ==
        std::filesystem::file_type::not_found) {
      std::cerr << "thetagate: no baseline yet at '" << engine::escape_controls(args.baseline)
                << "': this run becomes the first (nothing to compare, no drift)\n";
    } else {
      baseline = read_json_report_file(args.baseline);
    }
  }
  if (args.recurrence.empty() != args.bound.empty()) {
    std::cerr << "thetagate: --recurrence and --bound go together\n  hint: thetagate check "
                 "--recurrence 'T(n) = 2T(n/2) + n; T(1) = 0' --bound 'Theta(n lg n)'\n";
    return {kExitBadInput};
  }
  if (!args.recurrence.empty() && !args.paths.empty()) {
    std::cerr << "thetagate: a claim given with --recurrence and --bound is checked alone\n"
                 "  hint: drop the paths, or put the claim into a claim file\n";
    return {kExitBadInput};
  }
  Format& format = plan.format;
  format = format_of(args.format);
  // One claim on the command line is a reviewer's question: one line answers
  // it, unless a format was asked for.
  if (args.brief || (!args.recurrence.empty() && !args.format_given)) {
    if (args.format_given && format != Format::kText) {
      std::cerr << "thetagate: --brief is a text report; --format says " << args.format << "\n";
      return {kExitBadInput};
    }
    format = Format::kBrief;
  }
  if (!args.out.empty() && !out_is_folder_path(args.out)) {
    // --out FILE: the extension names the format; --format may only agree.
    std::optional<Format> by_extension = format_of_extension(args.out);
    if (by_extension && args.format_given && *by_extension != format) {
      std::cerr << "thetagate: --out '" << engine::escape_controls(args.out)
                << "' asks by its extension for the " << format_name(*by_extension)
                << " format, but --format says " << args.format
                << "\n  hint: drop --format (the extension decides), or change the extension\n";
      return {kExitBadInput};
    }
    if (by_extension) format = *by_extension;
  }
  // Where the reports go is checked before any claim is: a bad --out must
  // not cost the run.
  plan.out_is_folder = !args.out.empty() && out_is_folder_path(args.out);
  if (!args.out.empty()) check_output_location(args.out, plan.out_is_folder);
  return std::nullopt;
}

// Renders `report` as the plan says, writes or prints it, and returns the
// exit code.
int deliver(const Report& report, const CheckArguments& args, const OutputPlan& plan) {
  const cli::FailOn& fail_on = plan.fail_on;
  const std::optional<Report>& baseline = plan.baseline;
  Format format = plan.format;
  bool out_is_folder = plan.out_is_folder;
  std::optional<Drift> changes;
  if (baseline) changes = drift_from_baseline(*baseline, report);
  const Drift* changes_ptr = changes ? &*changes : nullptr;

  RenderOptions render_options;
  render_options.undecided_fails = args.undecided_fails;
  render_options.drift_fails = fail_on.drift;
  std::vector<std::pair<std::string, std::string>> files;
  if (out_is_folder) {
    const std::pair<Format, const char*> formats[] = {{Format::kText, "report.txt"},
                                                      {Format::kJson, "report.json"},
                                                      {Format::kJunit, "report.junit.xml"},
                                                      {Format::kHtml, "report.html"},
                                                      {Format::kMarkdown, "report.md"}};
    for (const auto& [format, name] : formats) {
      files.emplace_back((std::filesystem::path(args.out) / name).string(),
                         render(report, format, render_options, changes_ptr));
    }
  } else {
    render_options.colour = args.out.empty() &&
                            (format == Format::kText || format == Format::kBrief) &&
                            want_colour(STDOUT_FILENO);
    std::string text = render(report, format, render_options, changes_ptr);
    if (args.out.empty()) {
      std::cout << text;
    } else {
      files.emplace_back(args.out, std::move(text));
    }
  }
  if (std::string failure = write_files_whole(files); !failure.empty()) {
    std::cerr << "thetagate: " << engine::terminal_safe(failure) << '\n';
    return kExitBadInput;
  }
  bool to_a_device = args.out.rfind("/dev/", 0) == 0 || args.out.rfind("/proc/", 0) == 0;
  if (!files.empty() && !to_a_device) {
    // Reports went to files: the CI log still shows the outcome and where
    // the reports are (not when "the file" is this very output).
    std::cout << summary_line(report);
    for (const auto& [path, text] : files) {
      std::cout << "wrote " << engine::escape_controls(path) << '\n';
    }
  }
  for (const ClaimResult& c : report.claims()) {
    if (c.internal_error.empty()) continue;
    std::cerr << "thetagate: "
              << engine::terminal_safe(InternalError(c.name, c.internal_error).what())
              << "\n  please report it with the claim file and the command line\n";
  }
  return cli::exit_code(report, changes_ptr, fail_on);
}

int run_check(const CheckArguments& args) {
  if (args.list_families) return list_families(args.format);
  OutputPlan plan;
  if (std::optional<int> refused = prepare_output(args, plan)) return *refused;
  CheckOptions options;
  try {
    options.seed = parse_seed(args.seed);
  } catch (const std::invalid_argument&) {
    std::cerr << "thetagate: --seed takes a whole number or 'random', not '"
              << engine::escape_controls(args.seed) << "'\n";
    return kExitBadInput;
  } catch (const std::out_of_range&) {
    std::cerr << "thetagate: --seed takes a whole number below 2^64 or 'random', not '"
              << engine::escape_controls(args.seed) << "'\n";
    return kExitBadInput;
  }
  options.max_bits = args.max_bits;
  options.clock_limit = args.clock_limit;
  options.effort = args.effort;
  if (args.rounding == "floor") options.rounding = Rounding::kFloor;
  if (args.rounding == "ceil") options.rounding = Rounding::kCeil;
  if (args.rounding == "both") options.rounding = Rounding::kBoth;
  options.jobs = args.jobs;
  options.costs_root = args.costs_root;
  options.recheck = args.recheck;
  options.memory_limit = args.memory_mib << 20;
  Progress progress;
  options.progress = [&progress](size_t done, size_t total, const std::string& name) {
    progress.update(done, total, name);
  };
  if (!args.shard.empty()) {
    std::optional<ShardSpec> shard = parse_shard_option(args.shard);
    if (!shard) {
      std::cerr << "thetagate: --shard takes K/N with 1 <= K <= N <= 1024, not '"
                << engine::escape_controls(args.shard)
                << "'\n  hint: for the second of three machines: --shard 2/3\n";
      return kExitBadInput;
    }
    options.shard_index = shard->index;
    options.shard_count = shard->count;
  }
  Report report = check(select_claims(claims_of(args), args.claims), options);
  return deliver(report, args, plan);
}

// Joins the JSON reports of a run's shards into the run's report, with every
// output, baseline and exit code a check gives.
int run_merge(const CheckArguments& args) {
  OutputPlan plan;
  if (std::optional<int> refused = prepare_output(args, plan)) return *refused;
  return deliver(merge_shards(args.paths), args, plan);
}

int run_derive(const std::string& recurrence_text, const std::string& format) {
  Derivation d = derive(recurrence_text);
  std::cout << (format == "json" ? d.to_json() : engine::terminal_safe(d.to_text()));
  return 0;
}

int run_eval(const std::string& recurrence_text, const std::vector<std::string>& sizes) {
  Recurrence recurrence = Recurrence::parse(recurrence_text);
  std::vector<std::string> ns;
  for (const auto& s : sizes) ns.push_back(exact_size(s, "<size>"));
  Evaluator evaluator(recurrence);
  for (size_t i = 0; i < ns.size(); ++i) {
    try {
      std::string value = evaluator.value_at(ns[i]);  // before printing: no half line on an error
      std::cout << ns[i] << ' ' << value << '\n';
    } catch (const LimitReached& e) {
      // Located at the size given, the argument that asked for too much.
      throw InputError(Diagnostic{
          Location{"<size>", 1, 1},
          recurrence.function() + "(" + sizes[i] + ") is out of budget: " + e.what(),
          "evaluate smaller sizes; check bounds the work per claim by itself", sizes[i]});
    }
  }
  return 0;
}

struct RecheckArguments {
  std::string report;
  std::vector<std::string> claims;
};

// Re-verifies every holds's certificate in a JSON report: one line per
// claim, then a summary. Exit 3 when a certificate is rejected (the report's
// holds cannot be trusted: a bug), else 0.
int run_recheck(const RecheckArguments& args) {
  std::ifstream in(args.report, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  if (!in || std::filesystem::is_directory(args.report)) {
    std::cerr << "thetagate: cannot read the report '" << engine::escape_controls(args.report)
              << "'\n  hint: give the JSON report of 'thetagate check --format json'\n";
    return kExitBadInput;
  }
  std::vector<RecheckedClaim> claims = recheck(text.str(), args.report, args.claims);
  int rechecked = 0, rejected = 0;
  for (const RecheckedClaim& c : claims) {
    rechecked += c.status == RecheckStatus::kRechecked;
    rejected += c.status == RecheckStatus::kRejected;
    std::cout << engine::terminal_safe(c.name) << ": "
              << engine::terminal_safe(recheck_status_line(c)) << '\n';
  }
  std::cout << claims.size() << (claims.size() == 1 ? " holds: " : " holds: ") << rechecked
            << " re-checked, " << rejected << " rejected, " << claims.size() - rechecked - rejected
            << " not re-checked\n";
  return rejected > 0 ? kExitInternalError : 0;
}

struct SizesArguments {
  std::string file;
  std::string claim;
  std::string max_n = "2^16";
  std::string small = "64";
  uint64_t seed = 1;
  std::string format = "text";
};

// The sizes a harness in another language should measure: "N FAMILY" lines,
// or a JSON array of {"n", "family"} (n as a decimal string).
int run_sizes(const SizesArguments& args) {
  std::vector<Claim> claims = load_claims({args.file});
  if (args.claim.empty() && claims.size() != 1) {
    std::string names;
    for (size_t i = 0; i < claims.size() && i < 3; ++i) {
      names += (i ? ", '" : "'") + engine::escape_controls(claims[i].name()) + "'";
    }
    std::cerr << "thetagate: " << engine::escape_controls(args.file) << " holds " << claims.size()
              << " claims: name one with --claim\n  hint: for example --claim " << names << "\n";
    return kExitBadInput;
  }
  if (!args.claim.empty()) claims = select_claims(claims, {args.claim});
  std::vector<SizeToMeasure> sizes =
      sizes_to_measure(claims.front(), args.max_n, args.small, args.seed);
  if (args.format == "json") {
    std::cout << "[";
    for (size_t i = 0; i < sizes.size(); ++i) {
      std::cout << (i ? ",\n  " : "\n  ") << "{\"n\": \"" << sizes[i].n
                << "\", \"family\": " << json_string(sizes[i].family) << "}";
    }
    std::cout << "\n]\n";
    return 0;
  }
  for (const SizeToMeasure& s : sizes) std::cout << s.n << ' ' << s.family << '\n';
  return 0;
}

// SIGTERM, SIGHUP, SIGINT: no half-written report may stay behind. The
// handler removes the temporary files and ends the process by the signal.
extern "C" void end_by_signal(int signal_number) {
  remove_unfinished_reports();
  ::signal(signal_number, SIG_DFL);
  ::raise(signal_number);
}

void install_signal_handlers() {
  // A report over the file size limit (ulimit -f) is a write that fails with
  // "File too large" (exit 2), not a process killed by SIGXFSZ.
  ::signal(SIGXFSZ, SIG_IGN);
  for (int signal_number : {SIGTERM, SIGHUP, SIGINT}) {
    struct sigaction action {};
    // A signal ignored on entry (nohup, a background shell job) stays ignored.
    if (::sigaction(signal_number, nullptr, &action) == 0 && action.sa_handler == SIG_IGN) continue;
    action.sa_handler = end_by_signal;
    sigemptyset(&action.sa_mask);
    ::sigaction(signal_number, &action, nullptr);
  }
}

}  // namespace

// The options that shape a report, shared by check and merge: its format,
// where it goes, the baseline it is compared with and what fails the run.
static void add_report_options(CLI::App* command, CheckArguments& args) {
  command->add_option("--format", args.format, "report format: text, json, junit, html or markdown")
      ->check(CLI::IsMember({"text", "json", "junit", "html", "markdown"}));
  command->add_option("--out", args.out,
                      "write the report to FILE (.txt, .json, .xml, .html or .md picks the "
                      "format); to a folder (existing, or ending in '/'): every format at "
                      "once");
  command->add_option("--baseline", args.baseline,
                      "an earlier JSON report: mark verdict changes, new or lost witnesses "
                      "and band moves");
  command
      ->add_option("--fail-on", args.fail_on,
                   "what exits 1: refuted (default), undecided, drift; comma-separated")
      ->delimiter(',');
  command->add_flag("--undecided-fails", args.undecided_fails,
                    "JUnit: report undecided claims as failures, not skipped");
}

int main(int argc, char** argv) {
  install_signal_handlers();
  CLI::App app{"thetagate: checks claimed complexity bounds of recurrences"};
  app.require_subcommand(1);
  app.set_version_flag("--version", std::string("thetagate ") + version(),
                       "print the version and exit");

  CheckArguments check;
  auto* check_command =
      app.add_subcommand("check", "check the claims in files or folders (default: claims/)");
  check_command->add_option("paths", check.paths,
                            "claim files (.toml) or folders; '-' reads a claim file from standard "
                            "input");
  check_command->add_option("--recurrence", check.recurrence,
                            "check one claim given here: its recurrence ('; ' separates lines), "
                            "with --bound; prints the brief report unless --format is given");
  check_command->add_option("--bound", check.bound,
                            "the claimed bound of --recurrence: 'Theta(n lg n)', "
                            "'T(n) <= 2 n lg n for n >= 2'");
  check_command->add_option("--name", check.name, "the name of the --recurrence claim");
  check_command->add_flag("--brief", check.brief,
                          "one line per claim (its proof or first witness), then the summary");
  add_report_options(check_command, check);
  check_command->add_option("--seed", check.seed, "seed for random sizes: a number, or 'random'");
  check_command->add_option("--max-bits", check.max_bits, "largest size in bits (default 4096)")
      ->check(CLI::Range(int64_t{1}, engine::kMaxBitsLimit));
  check_command
      ->add_option("--effort", check.effort,
                   "search work per claim, a multiple of the default (about 0.2 s of one "
                   "core): 10 or 100 for deeper nightly runs")
      ->check(CLI::Range(int64_t{1}, engine::kMaxEffort));
  check_command
      ->add_option("--clock-limit", check.clock_limit,
                   "wall-clock guard per claim against hangs, in seconds, as given (--effort does "
                   "not scale it; default 60 x effort); 0: none, so only the work budgets end a "
                   "search")
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
                   "MiB of memo tables and pending sizes all workers may hold together "
                   "(default 2048): each claim may hold the smaller of 512 and this, so it also "
                   "caps --jobs; not a cap on the whole process")
      ->check(CLI::Range(1, 1 << 24));
  check_command->add_option("--costs-root", check.costs_root,
                            "a folder whose files claims may name as costs files, besides each "
                            "claim file's own folder tree");
  check_command->add_option("--shard", check.shard,
                            "check only part K of N of the claims (K/N), for one of N CI machines; "
                            "'thetagate merge' joins the N JSON reports");
  check_command->add_flag("--recheck", check.recheck,
                          "re-verify each holds's certificate with the independent re-checker; "
                          "a rejected one is an error (exit 3)");
  check_command->add_flag("--list-families", check.list_families,
                          "describe the size families and exit");

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

  CheckArguments merge;
  auto* merge_command = app.add_subcommand(
      "merge", "join the JSON reports of a run's shards (check --shard K/N) into one report");
  merge_command->add_option("reports", merge.paths, "the N shard reports (JSON)")->required();
  add_report_options(merge_command, merge);

  RecheckArguments recheck_args;
  auto* recheck_command = app.add_subcommand(
      "recheck", "re-verify the certificate of every holds in a JSON report, independently");
  recheck_command->add_option("report", recheck_args.report, "the JSON report")->required();
  recheck_command->add_option("--claims", recheck_args.claims,
                              "claim files or folders (default: the files the report names)");

  SizesArguments sizes_args;
  auto* sizes_command = app.add_subcommand(
      "sizes", "the sizes to measure a claim's code at, for a costs file: 'N FAMILY' lines");
  sizes_command->add_option("file", sizes_args.file, "the claim file")->required();
  sizes_command->add_option("--claim", sizes_args.claim,
                            "the claim, by name (needed when the file holds several)");
  sizes_command->add_option("--max", sizes_args.max_n,
                            "the largest size, a constant expression (default 2^16)");
  sizes_command->add_option("--small", sizes_args.small, "every size up to this one (default 64)");
  sizes_command->add_option("--seed", sizes_args.seed, "seed for the random family (default 1)");
  sizes_command->add_option("--format", sizes_args.format, "text or json")
      ->check(CLI::IsMember({"text", "json"}));

  // CLI11 would say "a subcommand is required" for a misspelt one.
  if (argc > 1 && argv[1][0] != '-') {
    std::string word = argv[1];
    const std::vector<std::string> commands = {"check", "derive",  "eval",
                                               "merge", "recheck", "sizes"};
    if (std::find(commands.begin(), commands.end(), word) == commands.end()) {
      std::string closest = commands.front();
      for (const std::string& c : commands) {
        if (engine::edit_distance(word, c) < engine::edit_distance(word, closest)) closest = c;
      }
      std::cerr << "thetagate: unknown command '" << engine::escape_controls(word) << "'\n  hint: "
                << (engine::edit_distance(word, closest) <= 2 ? "did you mean '" + closest + "'? "
                                                              : "")
                << "commands: check, derive, eval, merge, recheck, sizes (thetagate --help)\n";
      return kExitBadInput;
    }
  }
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    int status = app.exit(e);
    return status == 0 ? 0 : kExitBadInput;
  }
  // The one place that maps outcomes to exit codes; nothing escapes main.
  try {
    check.format_given = check_command->count("--format") > 0;
    merge.format_given = merge_command->count("--format") > 0;
    if (*merge_command) return run_merge(merge);
    if (*check_command) return run_check(check);
    if (*derive_command) return run_derive(recurrence_text, derive_format);
    if (*eval_command) return run_eval(recurrence_text, sizes);
    if (*sizes_command) return run_sizes(sizes_args);
    if (*recheck_command) return run_recheck(recheck_args);
  } catch (const InputError& e) {
    std::cerr << engine::terminal_safe(e.what()) << '\n';
    return kExitBadInput;
  } catch (const LimitReached& e) {
    std::cerr << "thetagate: out of budget (" << limit_name(e.limit())
              << "): " << engine::terminal_safe(e.what()) << '\n';
    return kExitBadInput;
  } catch (const InternalError& e) {
    std::cerr << "thetagate: " << engine::terminal_safe(e.what())
              << "\n  please report it with the command line\n";
    return kExitInternalError;
  } catch (const std::bad_alloc&) {
    // Outside a claim's check (eval, derive, reading input): a limit, like
    // memory inside a check.
    std::cerr << "thetagate: out of budget (memory): memory ran out\n";
    return kExitBadInput;
  } catch (const std::exception& e) {
    std::cerr << "thetagate: " << engine::terminal_safe(InternalError("", e.what()).what())
              << "\n  please report it with the command line\n";
    return kExitInternalError;
  } catch (...) {
    std::cerr << "thetagate: internal error (a bug in thetagate): an unknown exception\n";
    return kExitInternalError;
  }
  return 0;
}
