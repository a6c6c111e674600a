// Skein tests: a GoogleTest fixture that runs the skein binary (SKEIN_BINARY) in a fresh temporary working
// directory per test and collects its exit code, standard output and standard error.
//
//   class Cli : public skein::testing::CliWorkdir {};
//   TEST_F(Cli, Version) { EXPECT_EQ(Skein("--version").exit_code, 0); }
#pragma once

#include <sys/wait.h>

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>

namespace skein::testing {

inline std::string ReadFile(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

struct Outcome {
  int exit_code = -1;
  std::string out, err;
};

class CliWorkdir : public ::testing::Test {
 protected:
  void SetUp() override {
    std::string tmpl = (std::filesystem::temp_directory_path() / "skein-cli-XXXXXX").string();
    ASSERT_NE(mkdtemp(tmpl.data()), nullptr);
    dir_ = tmpl;
  }
  void TearDown() override {
    std::error_code ec;
    std::filesystem::remove_all(dir_, ec);
  }

  /// Runs `skein ARGS` in the working directory with no standard input.
  /// `prefix` is shell text run first in the same shell (a resource limit).
  Outcome Skein(const std::string& args, const std::string& prefix = "") const {
    const std::filesystem::path out = dir_ / ".stdout", err = dir_ / ".stderr";
    const std::string cmd = "cd '" + dir_.string() + "' && " + prefix + "'" + std::string(SKEIN_BINARY) + "' " + args +
                            " < /dev/null > '" + out.string() + "' 2> '" + err.string() + "'";
    const int status = std::system(cmd.c_str());
    Outcome o;
    o.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    o.out = ReadFile(out);
    o.err = ReadFile(err);
    std::filesystem::remove(out);
    std::filesystem::remove(err);
    return o;
  }

  /// Names of the files and directories in the working directory (the capture files excluded).
  std::vector<std::string> Entries() const {
    std::vector<std::string> names;
    for (const auto& e : std::filesystem::directory_iterator(dir_)) names.push_back(e.path().filename().string());
    std::sort(names.begin(), names.end());
    return names;
  }

  std::filesystem::path dir_;
};

}  // namespace skein::testing
