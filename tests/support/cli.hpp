// Skein tests: run the command-line program (SKEIN_BINARY) in a scratch directory and collect what it did.
//
//   skein::testing::Scratch dir("guards");
//   auto r = skein::testing::RunCli({"solve", dir.Write("a.toml", text), "--json", dir.Path("a.json")});
//   EXPECT_EQ(r.exit_code, 3);
#pragma once

#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>

namespace skein::testing {

/// A fresh directory under the system's temporary directory, removed with its contents at the end of the test.
class Scratch {
 public:
  explicit Scratch(const std::string& name) {
    const auto* info = ::testing::UnitTest::GetInstance()->current_test_info();
    std::string id = name + "-" + (info ? std::string(info->test_suite_name()) + "-" + info->name() : "x");
    for (char& ch : id)
      if (ch == '/') ch = '_';
    dir_ = std::filesystem::temp_directory_path() / ("skein-test-" + id + "-" + std::to_string(::getpid()));
    std::filesystem::remove_all(dir_);
    std::filesystem::create_directories(dir_);
  }
  ~Scratch() {
    std::error_code ec;
    std::filesystem::remove_all(dir_, ec);
  }
  Scratch(const Scratch&) = delete;
  Scratch& operator=(const Scratch&) = delete;

  std::string Path(const std::string& name) const { return (dir_ / name).string(); }
  std::string Write(const std::string& name, const std::string& text) const {
    std::ofstream(dir_ / name, std::ios::binary) << text;
    return Path(name);
  }
  /// Every file name in the directory, sorted.
  std::vector<std::string> Files() const {
    std::vector<std::string> names;
    for (const auto& e : std::filesystem::directory_iterator(dir_)) names.push_back(e.path().filename().string());
    std::sort(names.begin(), names.end());
    return names;
  }
  const std::filesystem::path& dir() const { return dir_; }

 private:
  std::filesystem::path dir_;
};

inline std::string ReadFile(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

struct CliResult {
  int exit_code = -1;  ///< the program's exit status, or 128 + signal if a signal ended it
  std::string out, err;
};

inline std::string ShellQuote(const std::string& s) {
  std::string q = "'";
  for (char ch : s) q += ch == '\'' ? std::string("'\\''") : std::string(1, ch);
  return q + "'";
}

/// Runs SKEIN_BINARY with `args` (and `env`, "NAME=value" settings), standard output and error captured.
inline CliResult RunCli(const std::vector<std::string>& args, const std::vector<std::string>& env = {}) {
  static int counter = 0;
  const auto base = std::filesystem::temp_directory_path() /
                    ("skein-cli-" + std::to_string(::getpid()) + "-" + std::to_string(counter++));
  std::string cmd;
  for (const std::string& e : env) cmd += e + " ";
  cmd += ShellQuote(SKEIN_BINARY);
  for (const std::string& a : args) cmd += " " + ShellQuote(a);
  cmd += " >" + ShellQuote(base.string() + ".out") + " 2>" + ShellQuote(base.string() + ".err");
  const int status = std::system(cmd.c_str());
  CliResult r;
  if (status != -1 && WIFEXITED(status)) {
    // The shell reports a child killed by signal s as 128 + s.
    r.exit_code = WEXITSTATUS(status);
  } else if (status != -1 && WIFSIGNALED(status)) {
    r.exit_code = 128 + WTERMSIG(status);
  }
  r.out = ReadFile(base.string() + ".out");
  r.err = ReadFile(base.string() + ".err");
  std::error_code ec;
  std::filesystem::remove(base.string() + ".out", ec);
  std::filesystem::remove(base.string() + ".err", ec);
  return r;
}

}  // namespace skein::testing
