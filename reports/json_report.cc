#include "reports/json_report.h"

#include <cmath>
#include <nlohmann/json.hpp>

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

Json claim_json(const ClaimResult& c) {
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
  j["message"] = c.message;
  // Added in schema version 1.
  j["numeric_only"] = c.numeric_only;
  j["notes"] = c.notes;
  j["reasons"] = c.reasons;
  j["note"] = c.note;
  j["sizes_checked"] = c.sizes_checked;
  j["largest_bits"] = c.largest_bits;
  j["error"] = error_json(c.error);
  return j;
}

}  // namespace

std::string render_json(const RunResult& run) {
  Json j;
  j["schema_version"] = kJsonSchemaVersion;
  j["seed"] = run.seed;
  // The options a replay needs besides the seed, when they were given.
  if (run.max_bits) j["max_bits"] = *run.max_bits;
  if (run.effort) j["effort"] = *run.effort;
  j["claims"] = Json::array();
  for (const ClaimResult& c : run.claims) j["claims"].push_back(claim_json(c));
  return j.dump(2, ' ', false, Json::error_handler_t::replace) + "\n";
}

}  // namespace thetagate::engine
