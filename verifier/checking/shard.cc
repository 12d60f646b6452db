#include "verifier/checking/shard.h"

#include <algorithm>
#include <cstdio>
#include <numeric>

namespace thetagate::engine {
namespace {

// FNV-1a, 64 bits: stable across machines and compilers (std::hash is not).
uint64_t fnv1a(const std::string& text, uint64_t h = 14695981039346656037ull) {
  for (unsigned char c : text) {
    h ^= c;
    h *= 1099511628211ull;
  }
  return h;
}

// A final mix, so that neighbouring inputs give unrelated ranks.
uint64_t mix(uint64_t x) {
  x ^= x >> 33;
  x *= 0xff51afd7ed558ccdull;
  x ^= x >> 33;
  x *= 0xc4ceb9fe1a85ec53ull;
  x ^= x >> 33;
  return x;
}

std::string identity(const ClaimEntry& e) {
  // Names are unique in a run; an entry whose name could not be read is
  // known by its place.
  if (!e.name.empty()) return e.name;
  return e.where.file + ":" + std::to_string(e.where.line);
}

}  // namespace

double expected_cost(const ClaimEntry& entry, const CheckOptions& options) {
  if (!entry.claim) return 0.01;  // an error entry costs next to nothing
  const Claim& c = *entry.claim;
  double effort = static_cast<double>(options.effort) * static_cast<double>(c.sizes.effort);
  double bits = static_cast<double>(options.max_bits.value_or(c.sizes.max_bits.value_or(4096)));
  Rounding rounding = options.rounding.value_or(c.rounding.value_or(Rounding::kFloor));
  double readings = rounding == Rounding::kBoth ? 2 : 1;
  return effort * std::max(bits / 4096.0, 1.0 / 16) * readings;
}

std::vector<uint64_t> assign_shards(const std::vector<ClaimEntry>& entries,
                                    const CheckOptions& options, uint64_t count) {
  std::vector<uint64_t> shard(entries.size(), 1);
  if (count <= 1) return shard;
  std::vector<double> cost(entries.size());
  std::vector<uint64_t> key(entries.size());
  double total = 0, largest = 0;
  for (size_t i = 0; i < entries.size(); ++i) {
    cost[i] = expected_cost(entries[i], options);
    key[i] = mix(fnv1a(identity(entries[i])));
    total += cost[i];
    largest = std::max(largest, cost[i]);
  }
  double cap = std::max(1.25 * total / static_cast<double>(count), largest);
  std::vector<size_t> order(entries.size());
  std::iota(order.begin(), order.end(), 0);
  std::sort(order.begin(), order.end(), [&](size_t a, size_t b) {
    return key[a] != key[b] ? key[a] < key[b] : identity(entries[a]) < identity(entries[b]);
  });
  std::vector<double> load(count + 1, 0);
  for (size_t i : order) {
    std::vector<uint64_t> ranking(count);
    std::iota(ranking.begin(), ranking.end(), 1);
    std::sort(ranking.begin(), ranking.end(), [&](uint64_t a, uint64_t b) {
      uint64_t ra = mix(key[i] ^ mix(a)), rb = mix(key[i] ^ mix(b));
      return ra != rb ? ra > rb : a < b;
    });
    uint64_t chosen = ranking.front();
    bool placed = false;
    for (uint64_t s : ranking) {
      if (load[s] + cost[i] <= cap) {
        chosen = s;
        placed = true;
        break;
      }
    }
    if (!placed) {
      for (uint64_t s : ranking)
        if (load[s] < load[chosen]) chosen = s;
    }
    load[chosen] += cost[i];
    shard[i] = chosen;
  }
  return shard;
}

std::string run_digest(const std::vector<ClaimEntry>& entries, const CheckOptions& options) {
  // Each claim by name and text: a shard from another version of the claim
  // files differs.
  std::vector<std::string> names;
  for (const ClaimEntry& e : entries) {
    std::string text = identity(e);
    if (e.claim) text += '\x1f' + e.claim->recurrence->text() + '\x1f' + e.claim->bound.text();
    names.push_back(text);
  }
  std::sort(names.begin(), names.end());
  uint64_t h = fnv1a("thetagate run");
  for (const std::string& n : names) h = fnv1a(n + '\n', h);
  std::string opts = std::to_string(options.seed) + "/" + std::to_string(options.effort) + "/" +
                     (options.max_bits ? std::to_string(*options.max_bits) : "-") + "/" +
                     (options.rounding ? rounding_name(*options.rounding) : "-") + "/" +
                     (options.clock_limit ? std::to_string(*options.clock_limit) : "-");
  h = fnv1a(opts, h);
  char text[17];
  std::snprintf(text, sizeof text, "%016llx", static_cast<unsigned long long>(h));
  return text;
}

RunResult merge_shards(std::vector<RunResult> shards, const std::vector<std::string>& names) {
  auto refuse = [&](size_t i, const std::string& message, const std::string& hint) {
    throw InputError(
        Diagnostic{Location{i < names.size() ? names[i] : "<shard>", 1, 1}, message, hint, ""});
  };
  if (shards.empty()) refuse(0, "no shard reports to merge", "give the N reports of one run");
  for (size_t i = 0; i < shards.size(); ++i) {
    if (!shards[i].shard)
      refuse(i, "this report is not a shard of a run", "merge the reports of 'check --shard K/N'");
  }
  const RunResult& first = shards.front();
  const ShardInfo& info = *first.shard;
  std::vector<int> seen(info.count + 1, -1);
  for (size_t i = 0; i < shards.size(); ++i) {
    const RunResult& r = shards[i];
    const ShardInfo& s = *r.shard;
    if (r.seed != first.seed)
      refuse(i,
             "this shard ran with seed " + std::to_string(r.seed) + ", the first with " +
                 std::to_string(first.seed),
             "merge the shards of one run: the same seed and options on every machine");
    if (s.count != info.count || s.digest != info.digest || s.claims != info.claims ||
        r.max_bits != first.max_bits || r.effort != first.effort ||
        r.tool_version != first.tool_version)
      refuse(i, "this shard belongs to another run (other claims, options or thetagate version)",
             "merge the shards of one run: the same claim files, options and version everywhere");
    if (s.index < 1 || s.index > info.count) refuse(i, "shard number out of range", "");
    if (seen[s.index] >= 0)
      refuse(i,
             "shard " + std::to_string(s.index) + "/" + std::to_string(s.count) +
                 " is given twice (also " + names[seen[s.index]] + ")",
             "give each shard once");
    seen[s.index] = static_cast<int>(i);
  }
  for (uint64_t k = 1; k <= info.count; ++k) {
    if (seen[k] < 0)
      refuse(0, "shard " + std::to_string(k) + "/" + std::to_string(info.count) + " is missing",
             "give all " + std::to_string(info.count) + " shard reports of the run");
  }
  RunResult whole;
  whole.tool_version = first.tool_version;
  whole.seed = first.seed;
  // The run started when its first shard did.
  for (const RunResult& r : shards) {
    if (whole.started.empty() || (!r.started.empty() && r.started < whole.started))
      whole.started = r.started;
  }
  whole.max_bits = first.max_bits;
  whole.effort = first.effort;
  std::vector<std::optional<ClaimResult>> placed(info.claims);
  for (size_t i = 0; i < shards.size(); ++i) {
    for (ClaimResult& c : shards[i].claims) {
      if (c.position >= info.claims || placed[c.position])
        refuse(i, "the claim '" + c.name + "' has a place that is out of range or taken",
               "the shard reports were edited: rerun the shards");
      placed[c.position] = std::move(c);
    }
  }
  for (auto& c : placed) {
    if (!c) refuse(0, "the shards do not hold every claim of the run", "rerun the shards");
    whole.claims.push_back(std::move(*c));
  }
  return whole;
}

}  // namespace thetagate::engine
