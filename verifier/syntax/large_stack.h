// Running deeply recursive work on a stack of known size.
//
// The parser recurses about ten frames per parenthesis, and 1,000 nested
// parentheses must parse (docs/decisions.md). A thread's stack is whatever
// the process was given (ulimit -s, a worker thread's default, a
// sanitizer's larger frames), so deep input moves onto a thread whose stack
// size we choose, and the caller waits for it: the work stays sequential.
#ifndef THETAGATE_VERIFIER_SYNTAX_LARGE_STACK_H_
#define THETAGATE_VERIFIER_SYNTAX_LARGE_STACK_H_

#include <cstddef>
#include <functional>
#include <optional>

namespace thetagate::engine {

inline constexpr size_t kLargeStackBytes = size_t{64} << 20;

// Runs `work` on a fresh thread with a stack of `bytes` and returns when it
// has finished; an exception it throws is rethrown here. When no such
// thread can be started (no memory, no threads left), runs `work` on the
// calling thread instead: the callers bound their own depth, so that is
// still safe wherever the default stack suffices.
void run_on_large_stack(const std::function<void()>& work, size_t bytes = kLargeStackBytes);

template <class F>
auto on_large_stack(F work) -> decltype(work()) {
  std::optional<decltype(work())> result;
  run_on_large_stack([&] { result.emplace(work()); });
  return std::move(*result);
}

}  // namespace thetagate::engine

#endif  // THETAGATE_VERIFIER_SYNTAX_LARGE_STACK_H_
