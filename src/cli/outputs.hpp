// skein CLI: exit codes and staged output files, shared by every command of the command-line front.
#pragma once

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <functional>
#include <stdexcept>
#include <string>
#include <system_error>
#include <vector>

#include <fmt/format.h>

namespace skein::cli {

namespace fs = std::filesystem;

constexpr int kExitInput = 2, kExitNumerical = 3, kExitOutput = 4, kExitInternal = 70;

struct OutputError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// Files are written under a temporary name beside their target and renamed into place only when every one of
/// them is complete, so an error (or a kill) never leaves a partial file under a requested name.
class StagedOutputs {
 public:
  explicit StagedOutputs(std::vector<fs::path> inputs) : inputs_(std::move(inputs)) {}
  ~StagedOutputs() {
    for (const auto& f : staged_) {
      std::error_code ec;
      fs::remove(f.temp, ec);
    }
  }
  void Add(const fs::path& target, const std::function<void(std::ostream&)>& write) {
    for (const auto& in : inputs_) {
      std::error_code ec;
      if (fs::exists(target, ec) && fs::equivalent(target, in, ec))
        throw OutputError(fmt::format("refusing to write {} over the input file", target.string()));
    }
    fs::path temp = target;
    temp += fmt::format(".skein-partial-{}", staged_.size());
    std::ofstream f(temp, std::ios::binary | std::ios::trunc);
    if (!f) throw OutputError(fmt::format("cannot write {}: the directory is missing or not writable", target.string()));
    staged_.push_back({temp, target});
    write(f);
    f.flush();
    if (!f) throw OutputError(fmt::format("cannot write {} (disk full?)", target.string()));
  }
  void Commit() {
    // Test hook (tests/output/safe_output_test.cpp): die as a kill would, every file written, none renamed.
    if (const char* v = std::getenv("SKEIN_TEST_ABORT_BEFORE_RENAME"); v && std::string(v) == "1") std::abort();
    for (const auto& f : staged_) {
      std::error_code ec;
      fs::rename(f.temp, f.target, ec);
      if (ec) throw OutputError(fmt::format("cannot write {}: {}", f.target.string(), ec.message()));
    }
    staged_.clear();
  }

 private:
  struct File {
    fs::path temp, target;
  };
  std::vector<fs::path> inputs_;
  std::vector<File> staged_;
};

/// Creates an output directory (and its parents), or throws OutputError naming it.
inline void MakeOutputDirectory(const std::string& dir) {
  std::error_code ec;
  fs::create_directories(dir, ec);
  if (ec) throw OutputError(fmt::format("cannot create directory {}: {}", dir, ec.message()));
}

}  // namespace skein::cli
