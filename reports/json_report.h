// The report for programs: one JSON object, schema documented in
// docs/json-schema.md. The keys of docs/design.md §6 are a contract; new keys may
// be added, none renamed or removed without bumping "schema_version".
#ifndef THETAGATE_REPORTS_JSON_REPORT_H_
#define THETAGATE_REPORTS_JSON_REPORT_H_

#include <nlohmann/json.hpp>
#include <string>

#include "verifier/checking/result.h"

namespace thetagate::engine {

// The JSON objects of one witness and one band row, as they appear inside
// claims (docs/json-schema.md); other writers (drift) reuse them.
nlohmann::ordered_json witness_to_json(const Witness& w);
nlohmann::ordered_json band_row_to_json(const BandRow& r);

// Version of the layout render_json writes; docs/json-schema.md says what
// each version holds.
inline constexpr int kJsonSchemaVersion = 3;

// Pretty-printed JSON (2-space indent, keys in a fixed order, UTF-8 kept as
// is, invalid UTF-8 replaced by U+FFFD), ending with a newline. Sizes and
// exact values are decimal strings with every digit; ratios are numbers, or
// null when not finite. Deterministic.
std::string render_json(const RunResult& run);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_JSON_REPORT_H_
