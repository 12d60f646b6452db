// The sentences of a verdict, composed from its basis (ClaimResult::basis):
// the engine records why as data, and only this file turns it into words.
#ifndef THETAGATE_REPORTS_VERDICT_TEXT_H_
#define THETAGATE_REPORTS_VERDICT_TEXT_H_

#include <string>

#include "verifier/checking/result.h"

namespace thetagate::engine {

// One or two sentences: why this verdict ("no violation up to 2^4096, not
// proved: ...", "upper bound broken at n = 5 ...").
std::string verdict_message(const ClaimResult& c);

// The proof a `holds` rests on: "master theorem, case 2", "induction from
// n = 64: T(n) <= 3 n^(lg 3) - n (strengthened by - n)". Empty for every
// other verdict.
std::string proof_name(const ClaimResult& c);

// A sentence about one edge of the ratio band: "the upper edge of T(n)/g(n)
// is rising (×12.0 from 2^8 to 2^4095; slope 1.00 against lg n): like a
// factor lg n".
std::string describe_edge(const EdgeReading& e, const char* edge_name);

}  // namespace thetagate::engine

#endif  // THETAGATE_REPORTS_VERDICT_TEXT_H_
