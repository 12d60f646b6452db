// Claims from strings and files (include/thetagate/claim.h).
#include "thetagate/claim.h"

#include "api/access.h"
#include "generators/size_family.h"
#include "verifier/checking/checker.h"
#include "verifier/checking/run.h"
#include "verifier/evaluation/evaluator.h"
#include "verifier/evaluation/size_expression.h"
#include "verifier/model/bound.h"
#include "verifier/model/limits.h"
#include "verifier/model/recurrence.h"
#include "verifier/syntax/spelling.h"

namespace thetagate {

namespace {

[[noreturn]] void bad_setting(const std::string& message, const std::string& hint) {
  throw InputError(Diagnostic{Location{"<claim>", 1, 1}, message, hint, ""});
}

}  // namespace

namespace detail {

Claim Access::make_claim(engine::ClaimEntry entry) {
  return Claim(std::make_shared<const Claim::Impl>(Claim::Impl{std::move(entry)}));
}

engine::Rounding to_engine(Rounding r) {
  switch (r) {
    case Rounding::kCeil:
      return engine::Rounding::kCeil;
    case Rounding::kBoth:
      return engine::Rounding::kBoth;
    case Rounding::kFloor:
      break;
  }
  return engine::Rounding::kFloor;
}

}  // namespace detail

const char* rounding_name(Rounding r) { return engine::rounding_name(detail::to_engine(r)); }

Claim::Claim(std::shared_ptr<const Impl> impl) : impl_(std::move(impl)) {}

Claim Claim::from_text(const std::string& name, const std::string& recurrence,
                       const std::string& bound, const ClaimSettings& settings) {
  if (name.find_first_not_of(" \t") == std::string::npos) {
    bad_setting("the claim name is empty", "name it, e.g. \"orchard::stable_sort / comparisons\"");
  }
  engine::Claim claim;
  claim.name = name;
  claim.where = Location{"<claim>", 1, 1};
  claim.recurrence = engine::recurrence_from_text(recurrence, "<recurrence>");
  claim.bound =
      engine::parse_bound(engine::SourceText::whole("<bound>", bound), claim.recurrence->main.name);
  engine::check_bound_fits(*claim.recurrence, claim.bound);
  claim.note = settings.note;
  if (settings.max_bits &&
      (*settings.max_bits < 1 || *settings.max_bits > uint64_t{engine::kMaxBitsLimit})) {
    bad_setting("max_bits must be between 1 and " + std::to_string(engine::kMaxBitsLimit) +
                    ", found " + std::to_string(*settings.max_bits),
                "the default is 4096");
  }
  claim.sizes.max_bits = settings.max_bits;
  if (settings.effort < 1 || settings.effort > uint64_t{engine::kMaxEffort}) {
    bad_setting("effort must be between 1 and " + std::to_string(engine::kMaxEffort) + ", found " +
                    std::to_string(settings.effort),
                "the default is 1, about 0.2 s of search per claim");
  }
  claim.sizes.effort = settings.effort;
  for (const std::string& family : settings.families) {
    if (!engine::is_size_family(family)) {
      bad_setting("unknown size family '" + family + "'", "size_families() lists them");
    }
  }
  claim.sizes.families = settings.families;
  if (!settings.min_n.empty()) claim.sizes.min_n = engine::evaluate_size(settings.min_n, "<min_n>");
  if (settings.rounding) claim.rounding = detail::to_engine(*settings.rounding);
  engine::ClaimEntry entry;
  entry.name = claim.name;
  entry.where = claim.where;
  entry.claim = std::move(claim);
  return detail::Access::make_claim(std::move(entry));
}

const std::string& Claim::name() const { return impl_->entry.name; }
Location Claim::where() const { return impl_->entry.where; }
const std::optional<Diagnostic>& Claim::error() const { return impl_->entry.error; }

std::vector<Claim> load_claims(const std::vector<std::string>& paths) {
  std::vector<Claim> claims;
  for (engine::ClaimEntry& entry : engine::load_entries(paths)) {
    claims.push_back(detail::Access::make_claim(std::move(entry)));
  }
  return claims;
}

std::vector<Claim> load_claims_from_text(const std::string& toml, const std::string& display_name) {
  std::vector<Claim> claims;
  for (engine::ClaimEntry& entry : engine::load_claim_text(toml, display_name)) {
    claims.push_back(detail::Access::make_claim(std::move(entry)));
  }
  return claims;
}

std::vector<Claim> select_claims(const std::vector<Claim>& claims,
                                 const std::vector<std::string>& names) {
  if (names.empty()) return claims;
  std::vector<std::string> all;
  for (const Claim& c : claims) all.push_back(c.name());
  std::vector<Claim> picked;
  for (size_t i : engine::select_names(all, names)) picked.push_back(claims[i]);
  return picked;
}

std::vector<SizeFamily> size_families() {
  std::vector<SizeFamily> out;
  for (const engine::FamilyInfo& f : engine::size_families()) {
    out.push_back({f.name, f.description});
  }
  return out;
}

std::vector<SizeToMeasure> sizes_to_measure(const Claim& claim, const std::string& max_n,
                                            const std::string& small, uint64_t seed) {
  const engine::ClaimEntry& entry = detail::Access::entry(claim);
  if (!entry.claim) throw InputError(entry.error.value_or(Diagnostic{}));
  std::vector<SizeToMeasure> out;
  for (const engine::Size& s :
       engine::harness_sizes(*entry.claim, engine::evaluate_size(max_n, "<max>"),
                             engine::evaluate_size(small, "<small>"), seed)) {
    out.push_back({s.n.str(), s.family});
  }
  return out;
}

}  // namespace thetagate
