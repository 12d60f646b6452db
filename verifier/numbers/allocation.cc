#include "verifier/numbers/allocation.h"

#include <gmp.h>

#include <cstdlib>
#include <mutex>
#include <new>

namespace thetagate::engine {

namespace {

void* allocate(size_t bytes) {
  void* p = std::malloc(bytes);
  if (p == nullptr && bytes != 0) throw std::bad_alloc();
  return p;
}

void* reallocate(void* old, size_t /*old_bytes*/, size_t bytes) {
  void* p = std::realloc(old, bytes);
  if (p == nullptr && bytes != 0) throw std::bad_alloc();  // `old` is still valid
  return p;
}

void release(void* p, size_t /*bytes*/) { std::free(p); }

// At load time, before any thread of ours exists. Blocks GMP allocated
// before (with its default functions, also malloc) are freed correctly.
[[maybe_unused]] const bool kInstalledAtLoad = (install_gmp_memory_functions(), true);

}  // namespace

void install_gmp_memory_functions() {
  static std::once_flag once;
  std::call_once(once, [] { mp_set_memory_functions(allocate, reallocate, release); });
}

}  // namespace thetagate::engine
