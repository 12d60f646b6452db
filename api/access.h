// The bridge between the public value layer (include/thetagate/) and the
// engine: what each public handle holds, and conversions of results into
// public values. Private: only api/*.cc include it.
#ifndef THETAGATE_API_ACCESS_H_
#define THETAGATE_API_ACCESS_H_

#include <memory>
#include <string>

#include "reports/drift.h"
#include "thetagate/check.h"
#include "thetagate/claim.h"
#include "thetagate/derive.h"
#include "thetagate/evaluate.h"
#include "thetagate/report.h"
#include "verifier/checking/result.h"
#include "verifier/derivation/derive.h"
#include "verifier/model/claim.h"

namespace thetagate {

struct Claim::Impl {
  engine::ClaimEntry entry;
};

struct Report::Impl {
  engine::RunResult run;
  std::vector<ClaimResult> claims;  // the public values of run.claims
};

struct Drift::Impl {
  engine::DriftReport drift;
};

struct Derivation::Impl {
  engine::Derivation derivation;
};

struct Recurrence::Impl {
  std::string text;
  std::shared_ptr<const engine::Recurrence> recurrence;
};

namespace detail {

// The one friend of every public handle.
struct Access {
  static Claim make_claim(engine::ClaimEntry entry);
  static const engine::ClaimEntry& entry(const Claim& c) { return c.impl_->entry; }
  static Report make_report(engine::RunResult run);
  static const engine::RunResult& run(const Report& r) { return r.impl_->run; }
  static Drift make_drift(engine::DriftReport drift);
  static const engine::DriftReport& drift(const Drift& c) { return c.impl_->drift; }
  static Derivation make_derivation(engine::Derivation d);
  static const std::shared_ptr<const engine::Recurrence>& recurrence(const Recurrence& r) {
    return r.impl_->recurrence;
  }
};

// Public values of engine results (exact integers as decimal strings).
ClaimResult to_public(const engine::ClaimResult& r);
engine::Rounding to_engine(Rounding r);

}  // namespace detail
}  // namespace thetagate

#endif  // THETAGATE_API_ACCESS_H_
