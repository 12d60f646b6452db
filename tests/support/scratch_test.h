// A test fixture with a folder of its own: created empty before each test
// (under the system's temporary folder, named after the fixture's tag, the
// process and the test), removed after it, with helpers to write and read
// files in it. For tests that run the command line on files they write.
#ifndef THETAGATE_TESTS_SUPPORT_SCRATCH_TEST_H_
#define THETAGATE_TESTS_SUPPORT_SCRATCH_TEST_H_

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>

namespace thetagate::engine::test_support {

class ScratchTest : public ::testing::Test {
 protected:
  // `tag` keeps the folders of different fixtures apart ("hcli", "limits").
  explicit ScratchTest(std::string tag) : tag_(std::move(tag)) {}

  void SetUp() override {
    dir_ = std::filesystem::temp_directory_path() /
           ("thetagate-" + tag_ + "-" + std::to_string(::getpid()) + "-" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    std::filesystem::remove_all(dir_);
    std::filesystem::create_directories(dir_);
  }
  void TearDown() override { std::filesystem::remove_all(dir_); }

  // Writes `text` to `name` below the folder (creating its parents); returns
  // the file's path.
  std::string write(const std::string& name, const std::string& text) {
    std::filesystem::create_directories((dir_ / name).parent_path());
    std::ofstream(dir_ / name, std::ios::binary) << text;
    return (dir_ / name).string();
  }
  // The file `name` below the folder, whole; "" when it cannot be read.
  std::string read(const std::string& name) {
    std::ifstream in(dir_ / name, std::ios::binary);
    return std::string(std::istreambuf_iterator<char>(in), {});
  }

  std::filesystem::path dir_;

 private:
  std::string tag_;
};

}  // namespace thetagate::engine::test_support

#endif  // THETAGATE_TESTS_SUPPORT_SCRATCH_TEST_H_
