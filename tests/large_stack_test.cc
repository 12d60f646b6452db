// Deep parsing on a stack of known size (verifier/syntax/large_stack.h).
#include "verifier/syntax/large_stack.h"

#include <gtest/gtest.h>

#include <stdexcept>
#include <string>
#include <thread>

#include "verifier/syntax/parser.h"
#include "verifier/syntax/source.h"

namespace thetagate::engine {
namespace {

// A recursion that needs about `depth` KiB of stack.
int descend(int depth) {
  volatile char frame[1024];
  frame[0] = static_cast<char>(depth);
  if (depth == 0) return frame[0];
  return descend(depth - 1) + frame[0] - static_cast<char>(depth) + 1;
}

TEST(LargeStack, ReturnsTheResultOfWorkThatNeedsMoreThanTheCallersStack) {
  // 32 MiB of frames: more than a default 8 MiB thread stack holds.
  EXPECT_EQ(on_large_stack([] { return descend(32 * 1024); }), 32 * 1024);
}

TEST(LargeStack, RunsOnAnotherThreadAndWaitsForIt) {
  std::thread::id caller = std::this_thread::get_id();
  std::thread::id worker = on_large_stack([] { return std::this_thread::get_id(); });
  EXPECT_NE(worker, caller);
}

TEST(LargeStack, PassesExceptionsOnToTheCaller) {
  EXPECT_THROW(on_large_stack([]() -> int { throw std::runtime_error("deep"); }),
               std::runtime_error);
}

std::string parenthesised(size_t levels) {
  return std::string(levels, '(') + "n + 1" + std::string(levels, ')');
}

// The promise of docs/decisions.md (1,000 nested parentheses parse) must
// not depend on the stack the parser is called on: here a 512 KiB one,
// far less than ten frames per level need (even unsanitized).
TEST(LargeStack, AThousandParenthesesParseOnASmallCallerStack) {
  std::string depth_error;
  bool parsed = false;
  run_on_large_stack(
      [&] {
        parsed = parse_expression(SourceText::whole("deep", parenthesised(1000))) != nullptr;
        try {
          parse_expression(SourceText::whole("deeper", parenthesised(20000)));
        } catch (const InputError& e) {
          depth_error = e.diagnostic().message;
        }
      },
      512 * 1024);
  EXPECT_TRUE(parsed);
  EXPECT_NE(depth_error.find("nested too deeply"), std::string::npos) << depth_error;
}

}  // namespace
}  // namespace thetagate::engine
