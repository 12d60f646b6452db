#include "verifier/recheck/recheck.h"

#include <algorithm>
#include <map>
#include <nlohmann/json.hpp>

#include "verifier/model/claim.h"
#include "verifier/model/claim_discovery.h"

namespace thetagate::engine::recheck {
namespace {

using Json = nlohmann::json;

[[noreturn]] void bad_report(const std::string& report_name, const std::string& what) {
  Diagnostic d;
  d.where = Location{report_name, 1, 1};
  d.message = "cannot re-check this report: " + what;
  d.hint = "give the JSON report of 'thetagate check --format json' (schema 3 or later)";
  throw InputError(d);
}

std::string text_at(const Json& o, const char* key) {
  auto it = o.find(key);
  if (it == o.end() || !it->is_string()) return "";
  return it->get<std::string>();
}

std::string number_text_at(const Json& o, const char* key) {
  auto it = o.find(key);
  if (it == o.end()) return "";
  if (it->is_string()) return it->get<std::string>();
  if (it->is_number_unsigned()) return std::to_string(it->get<uint64_t>());
  if (it->is_number_integer()) return std::to_string(it->get<int64_t>());
  return "";
}

CertificateData certificate_of(const Json& basis) {
  CertificateData c;
  const Json& cert = basis.at("certificate");
  c.method = text_at(cert, "method");
  c.proof = text_at(cert, "proof");
  // The same keys as reports/baseline.cc reads: the re-checker may not
  // include reports/, so it keeps its own list. (Not the normalised change of
  // variables' normaliser, factor_* and chain_* keys: no rule reads them yet.)
  for (auto [field, key] : {std::pair{&c.driver_class, "driver_class"},
                            {&c.driver_class_low, "driver_class_low"},
                            {&c.driver_low, "driver_low"},
                            {&c.driver_high, "driver_high"},
                            {&c.driver_from, "driver_from"},
                            {&c.regularity_c, "regularity_c"},
                            {&c.regularity_from, "regularity_from"},
                            {&c.root_low, "root_low"},
                            {&c.root_high, "root_high"},
                            {&c.bound_class, "bound_class"},
                            {&c.bound_low, "bound_low"},
                            {&c.bound_high, "bound_high"},
                            {&c.bound_from, "bound_from"}})
    *field = text_at(cert, key);
  for (const Json& x : cert.value("root_polynomial", Json::array()))
    if (x.is_string()) c.root_polynomial.push_back(x.get<std::string>());
  auto induction = basis.find("induction");
  if (induction != basis.end() && induction->is_object()) {
    for (const Json& s : induction->value("sides", Json::array()))
      if (s.is_string()) c.sides.push_back(s.get<std::string>());
    c.hypothesis = text_at(*induction, "bound");
    c.checked_to = number_text_at(*induction, "checked_to");
    c.modulus = number_text_at(*induction, "modulus");
    c.checked_from = number_text_at(*induction, "checked_from");
    c.closed_form = text_at(*induction, "closed_form");
  }
  return c;
}

// The claims of the files, by name (a name may repeat across files).
std::multimap<std::string, Claim> load_claims(const std::vector<std::string>& paths) {
  std::multimap<std::string, Claim> out;
  for (const std::string& file : find_claim_files(paths)) {
    for (ClaimEntry& entry : load_claim_file(file)) {
      if (entry.claim) out.emplace(entry.name, std::move(*entry.claim));
    }
  }
  return out;
}

RecheckedClaim recheck_one(const Json& c, const std::multimap<std::string, Claim>& claims) {
  RecheckedClaim out;
  out.name = text_at(c, "name");
  out.file = text_at(c, "file");
  const Json* basis = c.contains("basis") && c["basis"].is_object() ? &c["basis"] : nullptr;
  if (!basis || !basis->contains("certificate") || !(*basis)["certificate"].is_object()) {
    out.detail = "no certificate (proof: " + text_at(c, "proof") + ")";
    return out;
  }
  auto [first, last] = claims.equal_range(out.name);
  const Claim* claim = nullptr;
  for (auto it = first; it != last; ++it) {
    if (!claim || it->second.where.file == out.file) claim = &it->second;
  }
  if (!claim) {
    out.status = RuleStatus::kRejected;
    out.detail = "no claim of this name in the claim files";
    return out;
  }
  // The report must be about the claim as written in the file.
  std::string recurrence = text_at(c, "recurrence");
  if (!recurrence.empty() && recurrence != claim->recurrence->text()) {
    out.status = RuleStatus::kRejected;
    out.detail = "the report's recurrence differs from the claim file's";
    return out;
  }
  if (text_at(c, "claimed") != claim->bound.text()) {
    out.status = RuleStatus::kRejected;
    out.detail = "the report's bound " + text_at(c, "claimed") + " differs from the claim file's " +
                 claim->bound.text();
    return out;
  }
  CertificateData data = certificate_of(*basis);
  // Each reading of n/b inside T(...) the claim asks for.
  std::vector<std::shared_ptr<const Recurrence>> readings;
  Rounding rounding = claim->rounding.value_or(Rounding::kFloor);
  if (rounding != Rounding::kCeil) readings.push_back(claim->recurrence);
  if (rounding != Rounding::kFloor && has_unrounded_calls(*claim->recurrence))
    readings.push_back(read_quotients_as_ceilings(*claim->recurrence));
  if (readings.empty()) readings.push_back(claim->recurrence);
  out.status = RuleStatus::kRechecked;
  for (const auto& reading : readings) {
    RuleOutcome r = check_certificate(*reading, claim->bound, data);
    out.obligations += r.obligations;
    if (r.status != RuleStatus::kRechecked) {
      out.status = r.status;
      out.detail = r.detail;
      break;
    }
  }
  return out;
}

}  // namespace

int RecheckResult::rechecked() const {
  int n = 0;
  for (const auto& c : claims) n += c.status == RuleStatus::kRechecked;
  return n;
}
int RecheckResult::rejected() const {
  int n = 0;
  for (const auto& c : claims) n += c.status == RuleStatus::kRejected;
  return n;
}
int RecheckResult::not_rechecked() const {
  int n = 0;
  for (const auto& c : claims) n += c.status == RuleStatus::kNotRechecked;
  return n;
}

RecheckResult recheck_report(const std::string& report_text, const std::string& report_name,
                             const std::vector<std::string>& claim_paths) {
  Json root = Json::parse(report_text, nullptr, false);
  if (root.is_discarded() || !root.is_object()) bad_report(report_name, "it is not JSON");
  auto version = root.find("schema_version");
  if (version == root.end() || !version->is_number_integer() || version->get<int64_t>() < 3)
    bad_report(report_name, "its schema_version is not 3 or later (no certificates)");
  auto list = root.find("claims");
  if (list == root.end() || !list->is_array()) bad_report(report_name, "it has no claims list");
  std::vector<std::string> paths = claim_paths;
  if (paths.empty()) {
    for (const Json& c : *list) {
      std::string file = text_at(c, "file");
      if (!file.empty() && std::find(paths.begin(), paths.end(), file) == paths.end() &&
          text_at(c, "verdict") == "holds" && file.front() != '<')
        paths.push_back(file);
    }
  }
  std::multimap<std::string, Claim> claims;
  if (!paths.empty()) claims = load_claims(paths);
  return recheck_report(report_text, report_name, claims);
}

RecheckResult recheck_report(const std::string& report_text, const std::string& report_name,
                             const std::multimap<std::string, Claim>& claims) {
  Json root = Json::parse(report_text, nullptr, false);
  if (root.is_discarded() || !root.is_object() || !root.contains("claims") ||
      !root["claims"].is_array())
    bad_report(report_name, "it is not a JSON report");
  RecheckResult result;
  for (const Json& c : root["claims"]) {
    if (!c.is_object() || text_at(c, "verdict") != "holds") continue;
    result.claims.push_back(recheck_one(c, claims));
  }
  return result;
}

std::string status_line(const RecheckedClaim& claim) {
  switch (claim.status) {
    case RuleStatus::kRechecked:
      return "re-checked (" + std::to_string(claim.obligations) + " checks)";
    case RuleStatus::kRejected:
      return "REJECTED: " + claim.detail;
    case RuleStatus::kNotRechecked:
      break;
  }
  return "not re-checked: " + claim.detail;
}

}  // namespace thetagate::engine::recheck
