// Resource limits end to end (issue "Hardening, second round", items 4, 5
// and 10): an address-space limit, a file size limit, signals while reports
// are written, and what --memory caps. The CLI runs through a shell, so
// `ulimit` and `kill` apply to it alone.
#include <gmp.h>
#include <gtest/gtest.h>
#include <mpfr.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <new>
#include <nlohmann/json.hpp>
#include <string>

#include "reports/json_report.h"
#include "tests/support/claim_texts.h"
#include "tests/support/scratch_test.h"
#include "tests/support/test_support.h"
#include "thetagate/thetagate.h"
#include "verifier/checking/run.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/model/recurrence.h"
#include "verifier/numbers/allocation.h"

namespace {

namespace fs = std::filesystem;

namespace support = thetagate::engine::test_support;
using Outcome = support::CommandResult;

Outcome shell(const std::string& line) { return support::run_thetagate_shell(line); }

class ResourceLimits : public support::ScratchTest {
 protected:
  ResourceLimits() : ScratchTest("limits") {}
  // The names in the folder that look like our temporary files.
  std::vector<std::string> temporaries(const std::string& folder) {
    std::vector<std::string> out;
    for (const auto& e : fs::directory_iterator(dir_ / folder)) {
      std::string name = e.path().filename().string();
      if (name.find(".tmp-") != std::string::npos) out.push_back(name);
    }
    return out;
  }
};

const char* const kHolds = support::kHalvingClaim;

// 5. Over the file size limit, without the shell ignoring SIGXFSZ for us:
// "File too large", exit 2, the old report whole, no temporary file.
TEST_F(ResourceLimits, AFileSizeLimitIsAFailedWriteNotASignal) {
  std::string claims = write("ok.toml", kHolds);
  std::string old_report = R"({"old": "complete"})";
  write("out/report.json", old_report);
  // ulimit -f counts 512-byte blocks: 4 KiB, less than any JSON report.
  Outcome r = shell("ulimit -f 8; $TG check --max-bits 64 --clock-limit 0 --out " +
                    (dir_ / "out").string() + "/ " + claims);
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("File too large"), std::string::npos) << r.out;
  EXPECT_EQ(read("out/report.json"), old_report);
  EXPECT_TRUE(temporaries("out").empty());
}

// 5. SIGTERM or SIGHUP while reports are written: the temporary files go,
// the old reports stay, and the process ends by the signal. The third
// report is a FIFO with no reader, so the run waits there with the first
// two staged as temporary files.
TEST_F(ResourceLimits, ASignalDuringTheWriteLeavesNoTemporaryFile) {
  std::string claims = write("ok.toml", kHolds);
  write("out/report.json", "old");
  std::string out = (dir_ / "out").string();
  ASSERT_EQ(::mkfifo((out + "/report.junit.xml").c_str(), 0600), 0);
  for (const std::string signal : {"TERM", "HUP"}) {
    Outcome r = shell("$TG check --max-bits 64 --clock-limit 0 --out " + out + "/ " + claims +
                      " & pid=$!; tries=0; "
                      "until ls -a " +
                      out +
                      " | grep -q 'tmp-'; do "
                      "  sleep 0.05; tries=$((tries + 1)); [ $tries -gt 1200 ] && break; "
                      "done; kill -" +
                      signal + " $pid; wait $pid; echo \"status=$?\"");
    int number = signal == "TERM" ? 15 : 1;
    EXPECT_NE(r.out.find("status=" + std::to_string(128 + number)), std::string::npos)
        << signal << ": " << r.out;
    EXPECT_TRUE(temporaries("out").empty()) << signal;
    EXPECT_EQ(read("out/report.json"), "old") << signal;
  }
}

// 4. GMP's and MPFR's allocations that fail throw std::bad_alloc (which
// check_entry turns into "memory ran out" on the claim) instead of GMP
// printing "Cannot reallocate memory" and aborting. In a child process under
// a 512 MiB address-space limit, so the requests of 1 GiB fail for certain.
TEST(ResourceLimitsGmp, FailedAllocationsThrowBadAlloc) {
#if defined(__SANITIZE_ADDRESS__)
  // AddressSanitizer's own allocator reserves its shadow memory up front and
  // fails ("Failed to mmap") under an address-space limit before GMP asks.
  GTEST_SKIP() << "an address-space limit cannot be tested under AddressSanitizer";
#endif
  pid_t child = ::fork();
  ASSERT_GE(child, 0);
  if (child == 0) {
    thetagate::engine::install_gmp_memory_functions();
    rlimit limit{512ull << 20, 512ull << 20};
    if (::setrlimit(RLIMIT_AS, &limit) != 0) ::_exit(10);
    int caught = 0;
    mpz_t z;
    mpz_init_set_ui(z, 7);
    try {
      mpz_realloc2(z, 8ull << 30);  // 1 GiB of limbs
    } catch (const std::bad_alloc&) {
      ++caught;
    }
    if (mpz_cmp_ui(z, 7) != 0) ::_exit(11);  // the number kept its old block
    try {
      mpz_mul_2exp(z, z, 8ull << 30);  // grows it inside an operation
    } catch (const std::bad_alloc&) {
      ++caught;
    }
    mpz_clear(z);
    mpfr_t f;
    try {
      mpfr_init2(f, 8ll << 30);
    } catch (const std::bad_alloc&) {
      ++caught;
    }
    ::_exit(caught == 3 ? 0 : 12);
  }
  int status = 0;
  ASSERT_EQ(::waitpid(child, &status, 0), child);
  ASSERT_TRUE(WIFEXITED(status)) << "the child was killed by signal " << WTERMSIG(status);
  EXPECT_EQ(WEXITSTATUS(status), 0);
}

// 10. --memory below one claim's budget lowers that budget (it was only a
// cap on the number of workers: --memory 64 --jobs 2 let one claim hold 512
// MiB). The budget does not depend on --jobs, so neither does the report.
TEST(ResourceLimitsMemory, TheMemoryLimitCapsEachClaim) {
  using namespace thetagate::engine;
  // Sizes up to 2^65536: the memo of one evaluation grows past 1 MiB.
  std::vector<ClaimEntry> entries = load_claim_text(R"toml([[claim]]
name = "orchard::merge"
recurrence = "T(n) = 2T(n/2) + n; T(0) = 0"
bound = "Theta(n lg n)"
sizes = { max_bits = 65536 }
)toml",
                                                    "merge.toml");
  CheckOptions options;
  options.budget.max_seconds = 0;  // only work budgets: the same on a loaded machine
  auto memory_notes = [](const RunResult& run) {
    size_t found = 0;
    for (const std::string& note : run.claims.at(0).notes) {
      found += note.find("MiB") != std::string::npos;
    }
    return found;
  };
  RunResult capped = check_in_parallel(entries, options, 2, {}, uint64_t{1} << 20);
  EXPECT_EQ(memory_notes(capped), 1u);
  EXPECT_EQ(capped.claims.at(0).verdict, Verdict::kHolds);  // proved; fewer sizes checked
  RunResult one_job = check_in_parallel(entries, options, 1, {}, uint64_t{1} << 20);
  EXPECT_EQ(render_json(one_job), render_json(capped));
  RunResult roomy = check_in_parallel(entries, options, 2, {});
  EXPECT_EQ(memory_notes(roomy), 0u);
}

// 10. The memory budget counts what the memo and the work stack really
// hold: a long top-down chain from 2^64 used to reach the 512 MiB budget
// only at about 845 MB resident (the nominal costs per value were about
// half the real ones). The peak may exceed the budget only a little.
TEST(ResourceLimitsMemory, TheMemoryBudgetTracksResidentMemory) {
#if defined(__SANITIZE_ADDRESS__)
  GTEST_SKIP() << "AddressSanitizer's shadow memory and quarantine change resident memory";
#else
  using namespace thetagate::engine;
  constexpr uint64_t kBudget = uint64_t{128} << 20;
  Budget budget;
  budget.max_memo_bytes = kBudget;
  budget.max_memo_entries = uint64_t{1} << 40;  // bytes, not entries, decide
  budget.max_steps = uint64_t{1} << 40;
  budget.max_seconds = 0;
  auto peak_bytes = [] {
    rusage usage{};
    getrusage(RUSAGE_SELF, &usage);
    return static_cast<uint64_t>(usage.ru_maxrss) * 1024;
  };
  uint64_t before = peak_bytes();
  {
    Evaluator ev(recurrence_from_text("T(n) = T(n - floor(sqrt(n))) + n; T(1) = 1"), budget);
    try {
      ev.value_at(BigInt(1) << 64);
      ADD_FAILURE() << "2^33 subproblems fit in 128 MiB";
    } catch (const BudgetExceeded& e) {
      EXPECT_EQ(e.limit(), Limit::kMemory) << e.what();
    }
  }
  uint64_t grown = peak_bytes() > before ? peak_bytes() - before : 0;
  // The high-water mark only rises: growth beyond it is this evaluation's.
  EXPECT_LT(grown, kBudget + kBudget / 4) << "peak grew by " << (grown >> 20) << " MiB";
#endif
}

}  // namespace
