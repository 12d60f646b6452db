#include "reports/json_report.h"

#include <cmath>
#include <nlohmann/json.hpp>

#include "reports/verdict_text.h"
#include "verifier/syntax/terminal_text.h"

namespace thetagate::engine {

namespace {

using Json = nlohmann::ordered_json;

// JSON has no infinity or NaN; null says "no finite ratio" explicitly.
Json ratio(double r) { return std::isfinite(r) ? Json(r) : Json(nullptr); }

}  // namespace

Json witness_to_json(const Witness& w) {
  Json j;
  j["n"] = w.n.str();
  j["ratio"] = ratio(w.ratio);
  j["side"] = side_name(w.side);
  j["value"] = w.value;
  j["bound"] = w.bound;
  j["family"] = w.family;
  j["factor"] = w.factor;
  j["margin"] = w.margin;
  return j;
}

Json band_row_to_json(const BandRow& r) {
  Json j;
  j["scale"] = r.scale;
  j["low"] = ratio(r.low);
  j["high"] = ratio(r.high);
  j["low_at"] = r.low_at.str();
  j["high_at"] = r.high_at.str();
  j["samples"] = r.samples;
  j["low_log2"] = ratio(r.low_log2);
  j["high_log2"] = ratio(r.high_log2);
  return j;
}

namespace {

Json error_json(const std::optional<Diagnostic>& d) {
  if (!d) return nullptr;
  Json j;
  j["file"] = d->where.file;
  j["line"] = d->where.line;
  j["column"] = d->where.column;
  j["message"] = d->message;
  j["hint"] = d->hint;
  j["text"] = format_diagnostic(*d);
  return j;
}

Json edge_json(const EdgeReading& e) {
  Json j;
  j["direction"] = direction_name(e.direction);
  j["slope"] = ratio(e.slope);
  j["change_log2"] = ratio(e.change_log2);
  j["envelope_log2"] = ratio(e.envelope_log2);
  j["monotone"] = e.monotone;
  j["first_scale"] = e.first_scale;
  j["last_scale"] = e.last_scale;
  return j;
}

// Schema version 3. The driver and regularity keys appear only where the
// proof uses them (docs/json-schema.md, "Certificate").
Json certificate_json(const std::optional<Certificate>& c) {
  if (!c) return nullptr;
  Json j;
  j["method"] = c->method;
  j["proof"] = c->proof;
  for (const auto& [key, value] :
       {std::pair<const char*, const std::string&>{"driver_class", c->driver_class},
        {"driver_class_low", c->driver_class_low},
        {"driver_low", c->driver_low},
        {"driver_high", c->driver_high},
        {"driver_from", c->driver_from},
        {"regularity_c", c->regularity_c},
        {"regularity_from", c->regularity_from},
        {"root_low", c->root_low},
        {"root_high", c->root_high},
        {"bound_class", c->bound_class},
        {"bound_low", c->bound_low},
        {"bound_high", c->bound_high},
        {"bound_from", c->bound_from},
        {"normaliser", c->normaliser},
        {"factor_limit", c->factor_limit},
        {"factor_low", c->factor_low},
        {"factor_high", c->factor_high},
        {"factor_from", c->factor_from},
        {"chain_low", c->chain_low},
        {"chain_high", c->chain_high}}) {
    if (!value.empty()) j[key] = value;
  }
  if (!c->root_polynomial.empty()) j["root_polynomial"] = c->root_polynomial;
  j["obligations"] = c->obligations;
  return j;
}

Json basis_json(const VerdictBasis& b) {
  Json j;
  j["kind"] = basis_name(b.kind);
  j["unproved"] = unproved_name(b.unproved);
  j["detail"] = b.detail;
  if (b.theorem) {
    const TheoremEvidence& t = *b.theorem;
    Json th;
    th["method"] = t.method;
    th["derived"] = t.derived;
    // Only a one-sided derivation says how it bounds T (absent: Θ).
    if (t.relation != BoundKind::kTheta) th["relation"] = bound_kind_name(t.relation);
    th["claimed"] = t.claimed;
    th["kind"] = compared_with_name(t.kind);
    th["agreement"] = agreement_name(t.agreement);
    th["claimed_below"] = t.claimed_below;
    j["theorem"] = th;
  } else {
    j["theorem"] = nullptr;
  }
  if (b.induction) {
    const InductionProof& p = *b.induction;
    Json in;
    in["sides"] = Json::array();
    for (Side s : p.sides) in["sides"].push_back(side_name(s));
    in["bound"] = p.bound;
    in["strengthening"] = p.strengthening;
    in["checked_from"] = p.checked_from.str();
    in["checked_to"] = p.checked_to.str();
    in["modulus"] = p.modulus;
    in["tail_log2"] = p.tail_log2;
    in["blocks"] = p.blocks;
    in["identity"] = p.identity;
    in["dyadic"] = p.dyadic;
    in["closed_form"] = p.closed_form;
    in["method"] = p.method;
    in["function"] = p.function;
    j["induction"] = in;
  } else {
    j["induction"] = nullptr;
  }
  if (b.trend) {
    Json tr;
    tr["upper"] = b.trend->upper_matters ? edge_json(b.trend->upper) : Json(nullptr);
    tr["lower"] = b.trend->lower_matters ? edge_json(b.trend->lower) : Json(nullptr);
    tr["escapes"] = b.trend->escapes ? Json(side_name(*b.trend->escapes)) : Json(nullptr);
    j["trend"] = tr;
  } else {
    j["trend"] = nullptr;
  }
  j["disagreement"] = Json::array();
  for (const EdgeDisagreement& d : b.disagreement) {
    Json e = edge_json(d.reading);
    e["edge"] = side_name(d.edge);
    j["disagreement"].push_back(e);
  }
  j["reading"] = b.reading;
  j["other_reading"] = b.other_reading ? Json(verdict_name(*b.other_reading)) : Json(nullptr);
  j["certificate"] = certificate_json(b.certificate);
  return j;
}

Json code_json(const std::optional<CodeResult>& code) {
  if (!code) return nullptr;
  Json j;
  j["relation"] = relation_name(code->relation);
  j["source"] = code->source;
  j["measurements"] = code->measurements;
  j["families_measured"] = code->families_measured;
  j["families_missed"] = code->families_missed;
  // The recurrence's own verdict when the code's costs refuted the claim.
  j["model_verdict"] =
      code->model_verdict ? Json(verdict_name(*code->model_verdict)) : Json(nullptr);
  j["model_basis"] = code->model_verdict ? basis_json(code->model_basis) : Json(nullptr);
  j["rows"] = Json::array();
  for (const CostRow& r : code->rows) {
    Json row;
    row["n"] = r.n.str();
    row["cost"] = r.cost;
    row["model"] = r.model;
    row["sign"] = r.sign;
    row["runs"] = r.runs;
    row["from"] = r.from;
    j["rows"].push_back(row);
  }
  j["violations"] = Json::array();
  for (const CostViolation& v : code->violations) {
    Json violation;
    violation["n"] = v.n.str();
    violation["cost"] = v.cost;
    violation["model"] = v.model;
    violation["file"] = v.file;
    violation["line"] = v.line;
    violation["input"] = v.input;
    violation["replay"] = v.replay;
    j["violations"].push_back(violation);
  }
  return j;
}

Json claim_json(const ClaimResult& c, bool shard) {
  Json j;
  // The docs/design.md §6 keys first, in that order.
  j["name"] = c.name;
  j["file"] = c.file;
  j["line"] = c.line;
  j["verdict"] = verdict_name(c.verdict);
  j["claimed"] = c.claimed;
  j["derived"] = c.derived;
  j["method"] = c.method;
  j["tight"] = c.tight;
  j["witnesses"] = Json::array();
  for (const Witness& w : c.witnesses) j["witnesses"].push_back(witness_to_json(w));
  j["band"] = Json::array();
  for (const BandRow& r : c.band) j["band"].push_back(band_row_to_json(r));
  j["message"] = verdict_message(c);
  // Added in schema version 1.
  j["numeric_only"] = c.numeric_only;
  j["notes"] = c.notes;
  std::vector<std::string> reasons = c.steps;
  reasons.insert(reasons.end(), c.failed_hypotheses.begin(), c.failed_hypotheses.end());
  j["reasons"] = reasons;
  j["note"] = c.note;
  j["sizes_checked"] = c.sizes_checked;
  j["largest_bits"] = c.largest_bits;
  j["error"] = error_json(c.error);
  // Added in schema version 2.
  j["function"] = c.function;
  j["proof"] = proof_name(c);
  j["basis"] = basis_json(c.basis);
  j["steps"] = c.steps;
  j["failed_hypotheses"] = c.failed_hypotheses;
  j["code"] = code_json(c.code);
  // Added without a version bump (readers ignore keys they do not know).
  j["recurrence"] = c.recurrence;
  // Added in schema version 3.
  j["recheck"] = c.recheck;
  j["sizes"] = c.sizes;
  j["rounding"] = c.rounding;
  j["seconds"] = c.seconds;
  if (shard) j["position"] = c.position;
  return j;
}

}  // namespace

std::string render_json(const RunResult& run) {
  Json j;
  j["schema_version"] = kJsonSchemaVersion;
  j["tool_version"] = run.tool_version;
  j["started"] = run.started;
  j["seed"] = run.seed;
  // The options a replay needs besides the seed, when they were given.
  if (run.max_bits) j["max_bits"] = *run.max_bits;
  if (run.effort) j["effort"] = *run.effort;
  // One shard of a run: which, and of what, so that a merge can join them.
  if (run.shard) {
    j["shard"] = {{"index", run.shard->index},
                  {"count", run.shard->count},
                  {"digest", run.shard->digest},
                  {"claims", run.shard->claims}};
  }
  j["claims"] = Json::array();
  for (const ClaimResult& c : run.claims)
    j["claims"].push_back(claim_json(c, run.shard.has_value()));
  return json_escape_controls(j.dump(2, ' ', false, Json::error_handler_t::replace)) + "\n";
}

}  // namespace thetagate::engine
