// Every test in this binary, and every thetagate it starts, writes its
// reports as a reproducible run: SOURCE_DATE_EPOCH fixes the run's start and
// zeroes the wall times (verifier/checking/run.h), so reports compare byte
// for byte. Tests of the timing itself unset it for their own commands.
#include <cstdlib>

namespace {

const bool kReproducible = [] {
  ::setenv("SOURCE_DATE_EPOCH", "1780000000", /*overwrite=*/0);
  return true;
}();

}  // namespace
