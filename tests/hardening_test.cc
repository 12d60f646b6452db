// Adversarial input, library level: every case here once crashed, hung or
// lost results (issue "Hardening"). Each test fails without its fix.
#include <gtest/gtest.h>
#include <sys/stat.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <functional>
#include <string>

#include "reports/baseline.h"
#include "reports/report_file.h"
#include "reports/text_report.h"
#include "tests/support/diagnostic_matchers.h"
#include "verifier/checking/checker.h"
#include "verifier/checking/run.h"
#include "verifier/derivation/derive.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/bound.h"
#include "verifier/model/claim.h"
#include "verifier/model/claim_discovery.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/input_file.h"
#include "verifier/syntax/parser.h"

namespace thetagate::engine {
namespace {

namespace fs = std::filesystem;

using test_support::located;
using test_support::located_error_of;

// "n + n + ... + n" with `terms` terms (operator `op`).
std::string chain(size_t terms, const std::string& op) {
  std::string s = "n";
  for (size_t i = 1; i < terms; ++i) s += " " + op + " n";
  return s;
}

std::string message_of(const std::function<void()>& f) {
  try {
    f();
  } catch (const InputError& e) {
    return e.diagnostic().message;
  }
  return "(no error)";
}

class TempDir {
 public:
  TempDir() {
    path_ = fs::path(::testing::TempDir()) /
            ("thetagate-hardening-" + std::to_string(::getpid()) + "-" +
             ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::remove_all(path_);
    fs::create_directories(path_);
  }
  ~TempDir() { fs::remove_all(path_); }
  std::string file(const std::string& name, const std::string& text) const {
    std::ofstream(path_ / name, std::ios::binary) << text;
    return (path_ / name).string();
  }
  const fs::path& path() const { return path_; }

 private:
  fs::path path_;
};

// 1. A long flat chain overflowed the stack of every later tree walk (a
// release build crashed near 25,000 terms). Now any tree deeper than
// kMaxTreeDepth is a located error, whatever its shape.
TEST(Hardening, LongFlatChainsAreALocatedErrorNotACrash) {
  struct Case {
    const char* op;
    const char* column;  // the operator where the depth passes the limit
  };
  for (const Case& c : {Case{"+", "4000"}, Case{"*", "4016"}, Case{"-", "4000"}}) {
    std::string text = "T(n) = 2T(n/2) + " + chain(30000, c.op) + "; T(1) = 1";
    EXPECT_EQ(located_error_of([&] { recurrence_from_text(text); }),
              std::string("<recurrence>:1:") + c.column +
                  ": the expression is nested too deeply [hint: more than 1000 levels: a chain of "
                  "terms counts one level per operator, like parentheses; split it with a helper "
                  "function or simplify it]")
        << c.op;
  }
  EXPECT_EQ(located_error_of([] {
              parse_bound(SourceText::whole("<bound>", "O(" + chain(30000, "+") + ")"), "T");
            }),
            "<bound>:1:4001: the expression is nested too deeply [hint: more than 1000 levels: a "
            "chain of terms counts one level per operator, like parentheses; split it with a "
            "helper function or simplify it]");
  // Mixed shapes count too: chains inside parentheses inside chains.
  std::string nested = "n";
  for (int i = 0; i < 40; ++i) nested = "(" + nested + " + " + chain(40, "+") + ")";
  EXPECT_EQ(
      located_error_of([&] { recurrence_from_text("T(n) = T(n/2) + " + nested + "; T(1) = 1"); }),
      "<recurrence>:1:4079: the expression is nested too deeply [hint: more than 1000 levels: a "
      "chain of terms counts one level per operator, like parentheses; split it with a helper "
      "function or simplify it]");
}

TEST(Hardening, ChainsBelowTheDepthLimitStillWork) {
  // 900 terms of n: f(n) = 900 n. T(2) = 2 T(1) + 900 * 2 [calc].
  auto r = recurrence_from_text("T(n) = 2T(n/2) + " + chain(900, "+") + "; T(1) = 1");
  Evaluator ev(r);
  EXPECT_EQ(ev.value_at(BigInt(2)).str(), "1802");
  // Printing and every other walk take the whole depth; derive declines to
  // classify so long a sum (its own limit) but gives its reason.
  EXPECT_NO_THROW(recurrence_from_text("T(n) = " + print(*r->main.fallback->body)));
  Derivation deep = derive(*r);
  EXPECT_FALSE(deep.growth.has_value());
  ASSERT_FALSE(deep.failed_hypotheses.empty());
  // A short chain: T(n) = 2T(n/2) + 20n is Theta(n lg n) (master theorem,
  // case 2; common practice).
  Derivation d = derive(*recurrence_from_text("T(n) = 2T(n/2) + " + chain(20, "+") + "; T(1) = 1"));
  ASSERT_TRUE(d.growth.has_value());
  EXPECT_EQ(to_string(*d.growth), "n lg n");
}

// 2. A dotted key or header of ~50,000 parts overflowed the TOML parser.
TEST(Hardening, HugeDottedKeysAndNestingAreRefusedBeforeParsing) {
  std::string key = "a";
  for (int i = 0; i < 50000; ++i) key += ".a";
  struct Case {
    std::string text;
    const char* where;  // keys.toml:line:column of the 65th part
  };
  for (const Case& c : {Case{key + " = 1\n", "1:128"}, Case{"[" + key + "]\n", "1:129"},
                        Case{"[[claim]]\nname = \"x\"\n" + key + " = 1\n", "3:128"}}) {
    auto entries = load_claim_text(c.text, "keys.toml");
    ASSERT_EQ(entries.size(), 1u);
    EXPECT_EQ(located(entries[0].error),
              std::string("keys.toml:") + c.where +
                  ": a dotted key has more than 64 parts [hint: the keys of a claim file have one "
                  "or two parts, such as sizes.max_bits]");
  }
  std::string deep = "x = " + std::string(100000, '[') + std::string(100000, ']') + "\n";
  auto entries = load_claim_text(deep, "deep.toml");
  EXPECT_EQ(located(entries[0].error),
            "deep.toml:1:69: arrays and tables are nested more than 64 levels deep [hint: claim "
            "files nest at most a few levels: [[claim]], sizes = { ... }]");
  // Dots inside strings and comments, and ordinary keys, are no keys.
  auto fine = load_claim_text("# a.b.c." + std::string(200, '.') + "\n[[claim]]\nname = \"" +
                                  std::string(200, '.') +
                                  "\"\nrecurrence = \"T(n) = T(n/2) + 1; T(1) = 1\"\n"
                                  "bound = \"Theta(lg n)\"\nsizes.max_bits = 64\n",
                              "fine.toml");
  ASSERT_EQ(fine.size(), 1u);
  EXPECT_FALSE(fine[0].error) << format_diagnostic(*fine[0].error);
}

// 4. /dev/zero grew without end; a FIFO blocked forever.
TEST(Hardening, ClaimFilesMustBeRegularAndSmall) {
  auto zero = load_claim_file("/dev/zero");
  EXPECT_EQ(located(zero[0].error),
            "/dev/zero:1:1: '/dev/zero' is not a regular file (a pipe, socket or device) [hint: "
            "save the claim file to a file first and give its path]");
  TempDir dir;
  std::string fifo = (dir.path() / "pipe.toml").string();
  ASSERT_EQ(::mkfifo(fifo.c_str(), 0600), 0);
  auto piped = load_claim_file(fifo);  // returns at once: nobody writes
  // The FIFO lies in a fresh temporary folder, so its path is spliced in.
  EXPECT_EQ(located(piped[0].error),
            fifo + ":1:1: '" + fifo +
                "' is not a regular file (a pipe, socket or device) [hint: save the claim file to "
                "a file first and give its path]");
  std::string big = dir.file("big.toml", "");
  fs::resize_file(big, kMaxClaimFileBytes + 1);  // sparse: no real 16 MiB written
  auto large = load_claim_file(big);
  EXPECT_EQ(located(large[0].error), big +
                                         ":1:1: the claim file is too large: 16777217 bytes, "
                                         "the limit is 16 MiB [hint: split it into several files]");
}

// 11, 13. One bad entry below a folder cost the whole run; an empty folder
// passed as "0 claims".
TEST(Hardening, UnreadableEntriesBelowAFolderAreErrorsOfTheirOwn) {
  TempDir dir;
  fs::create_directories(dir.path() / "sub");
  std::string good = dir.file("sub/good.toml", "# nothing\n");
  fs::create_symlink("loop.toml", dir.path() / "loop.toml");  // a link to itself
  std::vector<ClaimEntry> unreadable;
  auto files = find_claim_files({dir.path().string()}, &unreadable);
  EXPECT_EQ(files, std::vector<std::string>{good});
  ASSERT_EQ(unreadable.size(), 1u);
  EXPECT_EQ(unreadable[0].where.file, (dir.path() / "loop.toml").string());
  // A substring: the rest of the message is the system's own error text.
  EXPECT_NE(unreadable[0].error->message.find("Too many levels of symbolic links"),
            std::string::npos);

  fs::create_directories(dir.path() / "empty");
  unreadable.clear();
  EXPECT_TRUE(find_claim_files({(dir.path() / "empty").string()}, &unreadable).empty());
  ASSERT_EQ(unreadable.size(), 1u);
  EXPECT_EQ(unreadable[0].error->message,
            "no claim files (*.toml) in the folder '" + (dir.path() / "empty").string() + "'");
}

// 12. derive accepted recurrences that eval and check reject.
TEST(Hardening, CallsThatDoNotShrinkAreRejectedBeforeDeriving) {
  struct Case {
    const char* text;
    const char* diagnostic;
  };
  const Case cases[] = {
      {"T(n) = T(n) + 1",
       "<recurrence>:1:8: T(n) at n = 0 calls T(0), which does not shrink [hint: each call must "
       "reach a smaller size, such as T(n/2) or T(n-1)]"},
      {"T(n) = T(n) + 1; T(1) = 1",
       "<recurrence>:1:8: T(n) at n = 0 calls T(0), which does not shrink [hint: each call must "
       "reach a smaller size, such as T(n/2) or T(n-1)]"},
      {"T(n) = T(n+1) + 1; T(1) = 1",
       "<recurrence>:1:8: T(n + 1) at n = 0 calls T(1), which does not shrink [hint: each call "
       "must reach a smaller size, such as T(n/2) or T(n-1)]"},
      {"T(n) = 2T(n+1)",
       "<recurrence>:1:9: T(n + 1) at n = 0 calls T(1), which does not shrink [hint: each call "
       "must reach a smaller size, such as T(n/2) or T(n-1)]"},
  };
  for (const Case& c : cases) {
    const char* text = c.text;
    auto r = recurrence_from_text(text);
    EXPECT_EQ(located_error_of([&] { check_calls_shrink(*r); }), c.diagnostic) << text;
    Evaluator ev(r);
    EXPECT_THROW(ev.value_at(BigInt(5)), InputError) << text;
  }
  check_calls_shrink(*recurrence_from_text("T(n) = T(n-1) + 1 if n odd; T(n) = 2T(n/2) otherwise"));
}

// 9. Point cases were scanned one by one (70,000 took 53 s); now indexed.
// The speed is measured in bench/; this checks the index finds every point.
TEST(Hardening, ManyPointCasesAreEachFound) {
  std::string text = "T(n) = T(n-1) + 1";
  for (int k = 0; k < 20000; ++k)
    text += "; T(" + std::to_string(3 * k) + ") = " + std::to_string(k);
  auto r = recurrence_from_text(text);
  ASSERT_EQ(r->main.points.size(), 20000u);
  Evaluator ev(r);
  // T(3k) = k, T(3k + j) = k + j.
  EXPECT_EQ(ev.value_at(BigInt(59997)).str(), "19999");
  EXPECT_EQ(ev.value_at(BigInt(3001)).str(), "1001");
  EXPECT_EQ(ev.value_at(BigInt(70000)).str(), std::to_string(19999 + 70000 - 59997));
  EXPECT_EQ(
      located_error_of([] { recurrence_from_text("T(n) = T(n-1); T(7) = 1; T(2) = 1; T(7) = 2"); }),
      "<recurrence>:1:36: T(7) is defined twice [hint: keep one definition per point]");
}

// 14. Reports were written in place; a failed write left a cut file.
TEST(Hardening, ReportsAreWrittenWholeOrNotAtAll) {
  TempDir dir;
  std::string a = dir.file("a.txt", "old a\n");
  std::string b = dir.file("b.txt", "old b\n");
  std::string missing = (dir.path() / "no" / "c.txt").string();
  std::string failure = write_files_whole({{a, "new a\n"}, {missing, "c\n"}, {b, "new b\n"}});
  EXPECT_EQ(failure, "cannot write " + missing + ": No such file or directory");
  auto read = [](const std::string& p) {
    std::ifstream in(p);
    return std::string(std::istreambuf_iterator<char>(in), {});
  };
  EXPECT_EQ(read(a), "old a\n");  // nothing replaced when one file fails
  EXPECT_EQ(read(b), "old b\n");
  EXPECT_EQ(write_files_whole({{a, "new a\n"}, {b, "new b\n"}}), "");
  EXPECT_EQ(read(a), "new a\n");
  EXPECT_EQ(read(b), "new b\n");
  size_t entries = 0;
  for ([[maybe_unused]] const auto& e : fs::directory_iterator(dir.path())) ++entries;
  EXPECT_EQ(entries, 2u);  // no temporary file left behind
  // A full device reports the system's reason.
  EXPECT_EQ(write_files_whole({{"/dev/full", "x"}}),
            "cannot write /dev/full: No space left on device");
}

// 3. --out under a regular file failed only after all the work.
TEST(Hardening, OutputLocationIsCheckedUpFront) {
  TempDir dir;
  std::string file = dir.file("plain.txt", "x");
  EXPECT_EQ(message_of([&] { check_output_location(file + "/report.json", false); }),
            "cannot write reports into '" + file + "': it is not a folder");
  // A substring: the rest of the message is the system's own error text.
  EXPECT_NE(message_of([&] {
              check_output_location(file + "/reports/", true);
            }).find("cannot create the report folder"),
            std::string::npos);
  check_output_location((dir.path() / "new" / "deeper").string(), true);
  EXPECT_TRUE(fs::is_directory(dir.path() / "new" / "deeper"));
}

// 15. Messages.
TEST(Hardening, MessagesSayWhatIsWrong) {
  // A starting size past the value limit is "too large", not "not whole".
  EXPECT_EQ(located_error_of([] {
              parse_bound(SourceText::whole("<bound>", "T(n) <= n for n >= 10^100000"), "T");
            }),
            "<bound>:1:20: the starting size is too large: more than 65536 bits [hint: sizes have "
            "at most 65536 bits: write, for example, for n >= 2^4000]");
  // A folder as a file.
  TempDir dir;
  EXPECT_EQ(message_of([&] { read_input_file(dir.path().string(), 100, "baseline report", ""); }),
            "'" + dir.path().string() + "' is a folder, not a baseline report");
  // A divisor that is always zero: no base case helps.
  EXPECT_EQ(located_error_of([] {
              Evaluator(recurrence_from_text("T(n) = T(n/2) + n/0; T(1) = 1")).value_at(BigInt(4));
            }),
            "<recurrence>:1:18: division by zero at n = 2 (in 'n/0') [hint: the divisor '0' does "
            "not depend on n: it is zero at every size; fix the expression]");
}

TEST(Hardening, LongSourceLinesAreShownAroundTheCaret) {
  Diagnostic d;
  d.where = {"long.toml", 1, 5001};
  d.message = "m";
  d.source_line = std::string(5000, 'a') + "X" + std::string(5000, 'b');
  std::string text = format_diagnostic(d);
  EXPECT_LT(text.size(), 400u);
  size_t line_start = text.find('\n') + 1;
  size_t caret_line = text.find('\n', line_start) + 1;
  std::string shown = text.substr(line_start, caret_line - 1 - line_start);
  size_t caret = text.find('^', caret_line) - caret_line;
  EXPECT_EQ(shown.substr(0, 3), "...");
  EXPECT_EQ(shown.substr(shown.size() - 3), "...");
  EXPECT_EQ(shown[caret], 'X');
}

TEST(Hardening, CaretOfACrlfLineStandsWhereAnLfLineHasIt) {
  std::string lf = "[[claim]]\nname = \"x\"\nrecurrence = \"T(n) = T(n/2) +\"\nbound = \"O(1)\"\n";
  std::string crlf;
  for (char c : lf) crlf += c == '\n' ? std::string("\r\n") : std::string(1, c);
  auto a = load_claim_text(lf, "lf.toml");
  auto b = load_claim_text(crlf, "crlf.toml");
  ASSERT_TRUE(a[0].error && b[0].error);
  EXPECT_EQ(a[0].error->where.line, b[0].error->where.line);
  EXPECT_EQ(a[0].error->where.column, b[0].error->where.column);
  std::string multi =
      "[[claim]]\nname = \"x\"\nrecurrence = \"\"\"\nT(n) = T(n/2) +\nT(1) = 1\n\"\"\"\nbound = "
      "\"O(1)\"\n";
  std::string multi_crlf;
  for (char c : multi) multi_crlf += c == '\n' ? std::string("\r\n") : std::string(1, c);
  auto c = load_claim_text(multi, "lf.toml");
  auto e = load_claim_text(multi_crlf, "crlf.toml");
  ASSERT_TRUE(c[0].error && e[0].error);
  EXPECT_EQ(c[0].error->where.line, e[0].error->where.line);
  EXPECT_EQ(c[0].error->where.column, e[0].error->where.column);
}

TEST(Hardening, TextReportsEscapeControlBytesInNames) {
  RunResult run;
  ClaimResult c;
  c.name = std::string("evil\x1b[2J") + '\0' + "name";
  c.file = "x.toml";
  c.verdict = Verdict::kHolds;
  run.claims.push_back(c);
  std::string text = render_text(run, TextStyle{});
  EXPECT_EQ(text.find('\x1b'), std::string::npos);
  EXPECT_EQ(text.find('\0'), std::string::npos);
  EXPECT_NE(text.find("evil\\x1b[2J\\x00name"), std::string::npos);
}

// 7. The work stack of a deep descent was not counted: eval at 10^100000
// peaked at 4.4 GB. Both paths now count it against the memory budget.
TEST(Hardening, TheWorkStackCountsAgainstTheMemoryBudget) {
  Budget budget;
  budget.max_memo_bytes = 4 << 20;
  budget.max_seconds = 0;
  // 10^5000: about 16,600 pending halvings of up to 2 KiB each, 17 MiB.
  const BigInt n = boost::multiprecision::pow(BigInt(10), 5000);
  for (EvaluationPath path : {EvaluationPath::kAuto, EvaluationPath::kGeneral}) {
    Evaluator ev(recurrence_from_text("T(n) = 2T(n/2) + n; T(0) = 0"), budget, path);
    try {
      ev.value_at(n);
      ADD_FAILURE() << "no budget error";
    } catch (const BudgetExceeded& e) {
      EXPECT_NE(std::string(e.what()).find("the sizes waiting to be evaluated"), std::string::npos)
          << e.what();
    }
  }
}

// 8. Workers share one memory limit: --jobs 256 no longer means 256 claims'
// worth of memory at once.
TEST(Hardening, WorkersAreCappedByTheSharedMemoryLimit) {
  RunRequest request;
  request.jobs = 256;
  request.memory_limit = uint64_t{1} << 30;  // 512 MiB per claim by default: two at once
  EXPECT_EQ(workers_for(request, 20), 2u);
  EXPECT_EQ(workers_for(request, 1), 1u);
  request.memory_limit = 1;  // never fewer than one
  EXPECT_EQ(workers_for(request, 20), 1u);
  request.memory_limit = uint64_t{1} << 40;
  EXPECT_EQ(workers_for(request, 20), 20u);
}

// Found by mutation fuzzing of the baseline reader: a number beyond a
// double ended in an uncaught nlohmann::json out_of_range (abort).
TEST(Hardening, BaselineNumbersOutOfRangeAreALocatedError) {
  EXPECT_EQ(located_error_of([] {
              read_json_report("{\"schema_version\": 1,\n \"seed\": 1e3081}", "old.json");
            }),
            "old.json:2:10: not valid JSON here: the number 1e3081 is out of range [hint: a "
            "baseline is a report written by `thetagate check --format json`]");
}

}  // namespace
}  // namespace thetagate::engine
