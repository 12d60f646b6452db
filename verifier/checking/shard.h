// Spreading one run over several machines (issue 18, §3): `--shard K/N`
// checks a deterministic part of the claims, and merging the N shard
// reports gives the report of the whole run. Every claim's result depends
// only on the claim and the options, never on the other claims, so a
// claim checked in any shard reads as it would in one run.
//
// Which shard a claim goes to: consistent hashing with bounded loads
// (common practice; Mirrokni, Thorup & Zadimoghaddam 2018, "Consistent
// hashing with bounded loads"). Each claim ranks the shards by a hash of
// its name and the shard's number and goes to the first of its ranking
// whose expected cost stays under 1.25 times the mean; claims are placed in
// the order of their own hash. Adding or removing a claim moves few others,
// and expensive claims (high effort, many bits, both roundings) spread out.
#ifndef THETAGATE_VERIFIER_CHECKING_SHARD_H_
#define THETAGATE_VERIFIER_CHECKING_SHARD_H_

#include <cstdint>
#include <string>
#include <vector>

#include "verifier/checking/checker.h"
#include "verifier/checking/result.h"
#include "verifier/model/claim.h"

namespace thetagate::engine {

// The claim's relative cost: effort x largest size in bits / 4096 x readings.
double expected_cost(const ClaimEntry& entry, const CheckOptions& options);

// The shard (1..count) of each entry, in entry order.
std::vector<uint64_t> assign_shards(const std::vector<ClaimEntry>& entries,
                                    const CheckOptions& options, uint64_t count);

// A digest of the run's claim set and options, the same in every shard of
// one run: merging refuses shards whose digests differ.
std::string run_digest(const std::vector<ClaimEntry>& entries, const CheckOptions& options);

// Joins the reports of the N shards of one run into the run's report, the
// claims in their places as one unsharded run gives them. `names` name the
// reports in messages. Throws InputError for a report that is not a shard,
// shards of different runs (seed, options, claim set), and a shard missing
// or given twice.
RunResult merge_shards(std::vector<RunResult> shards, const std::vector<std::string>& names);

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_CHECKING_SHARD_H_
