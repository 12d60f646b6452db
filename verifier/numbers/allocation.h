// GMP's (and so MPFR's and MPFI's) memory functions: an allocation that
// fails throws std::bad_alloc, which check_entry turns into an `undecided`
// verdict for that claim ("memory ran out"), instead of GMP's default,
// which prints "Cannot reallocate memory" and aborts the whole process.
//
// The exception unwinds through GMP and MPFR frames, which are C. GMP's
// manual (section "Custom Allocation") leaves that undefined; what it does
// on the platforms we build for (Linux, GCC or Clang, the distributions'
// libraries, which carry unwind tables) is: the failing operation's own
// temporary blocks leak, and the variable being grown keeps its old block
// (GMP stores the new pointer only after the reallocation returns). MPFR's
// per-thread constant caches may be left half-updated, so whoever catches
// the exception calls mpfr_free_cache() before using MPFR again on that
// thread (check_entry does). docs/decisions.md, "Hardening, second round:
// memory", says why we chose this over aborting.
#ifndef THETAGATE_VERIFIER_NUMBERS_ALLOCATION_H_
#define THETAGATE_VERIFIER_NUMBERS_ALLOCATION_H_

namespace thetagate::engine {

// Installs the memory functions, once per process (thread-safe, idempotent).
// The library calls it when it is loaded and before every check. The
// functions are process-wide: a program that installs its own afterwards
// replaces them, and GMP then fails as that program's functions do.
void install_gmp_memory_functions();

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_NUMBERS_ALLOCATION_H_
