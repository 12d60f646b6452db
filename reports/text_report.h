// The report for a person at a terminal: one line per claim, then detail for
// every claim that did not hold, then a summary line. Deterministic: the same
// RunResult always gives the same bytes (no clock, no environment).
#ifndef THETAGATE_REPORTS_TEXT_REPORT_H_
#define THETAGATE_REPORTS_TEXT_REPORT_H_

#include <string>

#include "verifier/checking/result.h"

namespace thetagate::engine {

struct TextStyle {
  bool colour = false;  // ANSI colour and bold; the front end decides (want_colour)
};

// The whole report, ending with a newline. Layout:
//   seed 42 · rerun with --seed 42 to replay
//
//   holds      <name>   claimed Θ(n lg n) · derived Θ(n lg n) by master theorem
//   refuted    <name>   claimed O(n) · derived Θ(n lg n) by master theorem
//       <file:line, message, witnesses, ratio band, notes, reasons, diagnostic>
//
//   2 claims: 1 holds, 1 refuted, 0 undecided, 0 errors
// Huge sizes and values are shortened (reports/number_text.h); the JSON and
// JUnit writers keep every digit.
std::string render_text(const RunResult& run, const TextStyle& style);

// The brief report: one line per claim (its verdict line, and for a claim
// that did not hold the first witness, or the first clause of why), then the
// summary line. For a reviewer pasting a bound into a pull request.
//   refuted    <name>   claimed O(n) · derived Θ(n lg n) by master theorem · witness n = 2^19:
//              T(n)/g(n) = 10.3
std::string render_brief(const RunResult& run, const TextStyle& style);

// "3 claims: 1 holds, 1 refuted, 1 undecided, 0 errors\n".
std::string summary_line(const RunResult& run);

// The options that replay the run: "--seed 1 --max-bits 64 --effort 20".
std::string replay_options(const RunResult& run);

// The one fact a claim's verdict rests on, for one-line reports: the proof
// of a holds ("proof: master theorem, case 2"), else the first witness
// ("witness n = 2^19: T(n)/g(n) = 10.3"), the located error, or the first
// clause of why. Not escaped: the caller escapes for its medium.
std::string brief_evidence(const ClaimResult& c);

// True when output to `fd` should be coloured: `fd` is a terminal and the
// NO_COLOR environment variable is unset or empty (no-color.org convention).
bool want_colour(int fd);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_TEXT_REPORT_H_
