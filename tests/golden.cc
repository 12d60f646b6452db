#include "tests/golden.h"

#include <gtest/gtest.h>

#include <cstdlib>
#include <fstream>
#include <sstream>

namespace thetagate::engine::test_support {

namespace {

bool updating() {
  const char* flag = std::getenv("THETAGATE_UPDATE_GOLDEN");
  return flag != nullptr && std::string(flag) == "1";
}

// "line N: expected <...> got <...>" for the first line that differs.
std::string first_difference(const std::string& expected, const std::string& actual) {
  std::istringstream e(expected), a(actual);
  std::string el, al;
  for (int line = 1;; ++line) {
    bool more_e = static_cast<bool>(std::getline(e, el));
    bool more_a = static_cast<bool>(std::getline(a, al));
    if (!more_e && !more_a) return "only the final newline differs";
    if (!more_e) return "line " + std::to_string(line) + ": expected end of file, got\n  " + al;
    if (!more_a) return "line " + std::to_string(line) + ": got end of file, expected\n  " + el;
    if (el != al) {
      return "line " + std::to_string(line) + ":\n  expected: " + el + "\n  actual:   " + al;
    }
  }
}

}  // namespace

std::string golden_path(const std::string& name) {
  return std::string(THETAGATE_SOURCE_DIR) + "/tests/golden/" + name;
}

void expect_matches_golden(const std::string& name, const std::string& actual) {
  std::string path = golden_path(name);
  if (updating()) {
    std::ofstream out(path, std::ios::binary);
    out << actual;
    ASSERT_TRUE(out.good()) << "could not write " << path;
    return;
  }
  std::ifstream in(path, std::ios::binary);
  ASSERT_TRUE(in.good()) << "missing golden file " << path
                         << " (regenerate with THETAGATE_UPDATE_GOLDEN=1)";
  std::stringstream buffer;
  buffer << in.rdbuf();
  std::string expected = buffer.str();
  if (expected != actual) {
    ADD_FAILURE() << path << " differs from the output; " << first_difference(expected, actual)
                  << "\nIf the change is intended, rerun with THETAGATE_UPDATE_GOLDEN=1.";
  }
}

}  // namespace thetagate::engine::test_support
