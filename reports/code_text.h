// The link from a claim's recurrence to its code, as plain text: shared by the
// text and JUnit reports and by the test-suite guard's failure messages.
#ifndef THETAGATE_REPORTS_CODE_TEXT_H_
#define THETAGATE_REPORTS_CODE_TEXT_H_

#include <string>
#include <vector>

#include "verifier/checking/result.h"

namespace thetagate::engine {

// "exact", "an upper bound", "a lower bound": what the model is, in a sentence.
const char* relation_phrase(ModelRelation relation);

// "counted cost 40 > T(n) = 33" and the like, for one violation.
std::string violation_text(const CodeResult& code, const CostViolation& v);

// Several lines, each starting with `indent`, ending with a newline: the
// source and relation, the violations (at most `max_violations`), and at most
// `max_rows` per-size rows (evenly spread, always the first and the last).
// "code -> model: costs.txt (12 measurements at 12 sizes), the model is an
// upper bound", without indent or newline.
std::string code_headline(const CodeResult& code);
// "ones, alternating" ("none" for no name): size family names in a sentence.
std::string family_list(const std::vector<std::string>& names);

// "size families measured: powers, ones; missed: alternating, ..." for a
// costs file, "" for a runner.
std::string code_coverage(const CodeResult& code);

std::string code_link_text(const CodeResult& code, const std::string& indent,
                           size_t max_violations = 5, size_t max_rows = 8);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_CODE_TEXT_H_
