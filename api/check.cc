// Checking claims through the public API (include/thetagate/check.h).
#include "thetagate/check.h"

#include <map>

#include "api/access.h"
#include "generators/size_family.h"
#include "reports/json_report.h"
#include "reports/verdict_text.h"
#include "verifier/checking/checker.h"
#include "verifier/checking/run.h"
#include "verifier/checking/shard.h"
#include "verifier/model/limits.h"
#include "verifier/recheck/recheck.h"

namespace thetagate {

namespace {

Verdict to_public(engine::Verdict v) {
  switch (v) {
    case engine::Verdict::kHolds:
      return Verdict::kHolds;
    case engine::Verdict::kRefuted:
      return Verdict::kRefuted;
    case engine::Verdict::kUndecided:
      return Verdict::kUndecided;
    case engine::Verdict::kError:
      break;
  }
  return Verdict::kError;
}

Witness to_public(const engine::Witness& w) {
  return Witness{w.n.str(), w.side == engine::Side::kUpper ? Side::kUpper : Side::kLower,
                 w.value,   w.bound,
                 w.ratio,   w.factor,
                 w.margin,  w.family};
}

BandRow to_public(const engine::BandRow& r) {
  return BandRow{r.scale,         r.low,      r.high,      r.low_at.str(),
                 r.high_at.str(), r.low_log2, r.high_log2, r.samples};
}

// The engine's options for `options`. Throws InputError for values out of
// range or an unknown family.
engine::CheckOptions engine_options(const CheckOptions& options) {
  auto bad = [](const std::string& message, const std::string& hint) {
    throw InputError(Diagnostic{Location{"<options>", 1, 1}, message, hint, ""});
  };
  if (options.max_bits &&
      (*options.max_bits < 1 || *options.max_bits > uint64_t{engine::kMaxBitsLimit})) {
    bad("max_bits must be between 1 and " + std::to_string(engine::kMaxBitsLimit) + ", found " +
            std::to_string(*options.max_bits),
        "the default is 4096");
  }
  if (options.effort < 1 || options.effort > uint64_t{engine::kMaxEffort}) {
    bad("effort must be between 1 and " + std::to_string(engine::kMaxEffort) + ", found " +
            std::to_string(options.effort),
        "the default is 1, about 0.2 s of search per claim");
  }
  for (const std::string& family : options.families) {
    if (!engine::is_size_family(family)) {
      bad("unknown size family '" + family + "'", "size_families() lists them");
    }
  }
  engine::CheckOptions e;
  e.seed = options.seed;
  e.costs_root = options.costs_root;
  e.max_bits = options.max_bits;
  e.effort = options.effort;
  if (options.rounding) e.rounding = detail::to_engine(*options.rounding);
  if (options.clock_limit) {
    // !(0 <= x <= 1e6) also refuses NaN, which every comparison would let through.
    if (!(*options.clock_limit >= 0 && *options.clock_limit <= 1e6)) {
      bad("clock_limit must be a number of seconds from 0 to 1000000, found " +
              std::to_string(*options.clock_limit),
          "0 means no clock");
    }
    e.clock_limit = *options.clock_limit;
  }
  return e;
}

// The entries to check: the claims, with `families` applied.
std::vector<engine::ClaimEntry> entries_of(const std::vector<Claim>& claims,
                                           const std::vector<std::string>& families) {
  std::vector<engine::ClaimEntry> entries;
  entries.reserve(claims.size());
  for (const Claim& c : claims) {
    entries.push_back(detail::Access::entry(c));
    if (!families.empty() && entries.back().claim) entries.back().claim->sizes.families = families;
  }
  return entries;
}

// Re-verifies every holds's certificate with the independent re-checker; a
// rejected certificate makes the claim an error from a bug (exit 3), never
// a holds.
void recheck_run(engine::RunResult& run, const std::vector<engine::ClaimEntry>& entries) {
  std::multimap<std::string, engine::Claim> claims;
  for (const engine::ClaimEntry& e : entries)
    if (e.claim) claims.emplace(e.claim->name, *e.claim);
  engine::recheck::RecheckResult result =
      engine::recheck::recheck_report(engine::render_json(run), "<this run>", claims);
  size_t next = 0;
  for (engine::ClaimResult& c : run.claims) {
    if (c.verdict != engine::Verdict::kHolds || next >= result.claims.size()) continue;
    const engine::recheck::RecheckedClaim& r = result.claims[next++];
    if (r.status != engine::recheck::RuleStatus::kRejected) {
      c.recheck = engine::recheck::status_line(r);
      continue;
    }
    std::string proof = engine::proof_name(c);  // while the claim still holds
    c.verdict = engine::Verdict::kError;
    c.basis.kind = engine::BasisKind::kInternalInconsistency;
    c.internal_error = "the independent re-check rejected the certificate of this holds (" + proof +
                       "): " + r.detail;
    c.recheck = engine::recheck::status_line(r);
  }
}

}  // namespace

const char* verdict_name(Verdict v) {
  return engine::verdict_name(static_cast<engine::Verdict>(v));
}
static_assert(static_cast<int>(Verdict::kError) == static_cast<int>(engine::Verdict::kError));

const char* side_name(Side s) { return s == Side::kUpper ? "upper" : "lower"; }

const char* basis_name(Basis b) { return engine::basis_name(static_cast<engine::BasisKind>(b)); }

// The public Basis mirrors the engine's BasisKind one for one.
static_assert(static_cast<int>(Basis::kInternalError) ==
              static_cast<int>(engine::BasisKind::kInternalError));
static_assert(static_cast<int>(Basis::kCodeBreaksModel) ==
              static_cast<int>(engine::BasisKind::kCodeBreaksModel));
static_assert(static_cast<int>(Basis::kCodeSizesMissed) ==
              static_cast<int>(engine::BasisKind::kCodeSizesMissed));
static_assert(static_cast<int>(Basis::kInputError) ==
              static_cast<int>(engine::BasisKind::kInputError));

namespace detail {

ClaimResult to_public(const engine::ClaimResult& r) {
  ClaimResult out;
  out.name = r.name;
  out.file = r.file == "<claim>" ? "" : r.file;
  out.line = r.file == "<claim>" ? 0 : r.line;
  out.verdict = thetagate::to_public(r.verdict);
  out.claimed = r.claimed;
  out.derived = r.derived;
  out.method = r.method;
  out.tight = r.tight;
  out.numeric_only = r.numeric_only;
  for (const engine::Witness& w : r.witnesses) out.witnesses.push_back(thetagate::to_public(w));
  for (const engine::BandRow& b : r.band) out.band.push_back(thetagate::to_public(b));
  out.basis = static_cast<Basis>(r.basis.kind);
  out.proof = engine::proof_name(r);
  out.message = engine::verdict_message(r);
  out.notes = r.notes;
  out.steps = r.steps;
  out.failed_hypotheses = r.failed_hypotheses;
  out.error = r.error;
  out.internal_error = r.internal_error;
  out.recheck = r.recheck;
  out.note = r.note;
  out.sizes_checked = r.sizes_checked;
  out.largest_bits = r.largest_bits;
  return out;
}

Report Access::make_report(engine::RunResult run) {
  auto impl = std::make_shared<Report::Impl>();
  impl->run = std::move(run);
  for (const engine::ClaimResult& c : impl->run.claims) impl->claims.push_back(to_public(c));
  return Report(std::move(impl));
}

}  // namespace detail

Report::Report(std::shared_ptr<const Impl> impl) : impl_(std::move(impl)) {}
uint64_t Report::seed() const { return impl_->run.seed; }
const std::vector<ClaimResult>& Report::claims() const { return impl_->claims; }
bool Report::any_refuted() const { return impl_->run.any_refuted(); }
bool Report::any_error() const {
  for (const ClaimResult& c : impl_->claims) {
    if (c.verdict == Verdict::kError) return true;
  }
  return false;
}
bool Report::any_internal_error() const {
  for (const ClaimResult& c : impl_->claims) {
    if (!c.internal_error.empty()) return true;
  }
  return false;
}

ClaimResult check(const Claim& claim, const CheckOptions& options) {
  engine::CheckOptions engine = engine_options(options);
  std::vector<engine::ClaimEntry> entries = entries_of({claim}, options.families);
  engine::RunResult run;
  run.seed = options.seed;
  run.claims.push_back(engine::check_entry(entries[0], engine));
  if (options.recheck) recheck_run(run, entries);
  return detail::to_public(run.claims[0]);
}

Report check(const std::vector<Claim>& claims, const CheckOptions& options) {
  engine::CheckOptions engine = engine_options(options);
  if (options.shard_count != 0 && (options.shard_count > 1024 || options.shard_index < 1 ||
                                   options.shard_index > options.shard_count)) {
    throw InputError(Diagnostic{Location{"<options>", 1, 1},
                                "shard " + std::to_string(options.shard_index) + " of " +
                                    std::to_string(options.shard_count) + " does not exist",
                                "1 <= shard_index <= shard_count <= 1024", ""});
  }
  std::vector<engine::ClaimEntry> entries = entries_of(claims, options.families);
  if (options.shard_count == 0) {
    engine::RunResult run = engine::check_in_parallel(entries, engine, options.jobs,
                                                      options.progress, options.memory_limit);
    if (options.recheck) recheck_run(run, entries);
    return detail::Access::make_report(std::move(run));
  }
  // One shard: its claims keep their places in the whole run, for the merge.
  std::vector<uint64_t> shard = engine::assign_shards(entries, engine, options.shard_count);
  std::vector<engine::ClaimEntry> mine;
  std::vector<uint64_t> positions;
  for (size_t i = 0; i < entries.size(); ++i) {
    if (shard[i] != options.shard_index) continue;
    mine.push_back(entries[i]);
    positions.push_back(i);
  }
  engine::RunResult run =
      engine::check_in_parallel(mine, engine, options.jobs, options.progress, options.memory_limit);
  for (size_t i = 0; i < run.claims.size(); ++i) run.claims[i].position = positions[i];
  run.shard = engine::ShardInfo{options.shard_index, options.shard_count,
                                engine::run_digest(entries, engine), entries.size()};
  if (options.recheck) recheck_run(run, mine);
  return detail::Access::make_report(std::move(run));
}

}  // namespace thetagate
