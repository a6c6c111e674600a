// Safe output: a run that dies after writing its files but before renaming them into place leaves nothing under
// the requested names (the test hook SKEIN_TEST_ABORT_BEFORE_RENAME=1 makes the program abort there, as a kill
// would); an ordinary run leaves the requested files and no temporary ones.
//
// Reproducible results: every bundled example in cases/ gives bit-for-bit the same "points" with one thread and
// with two, and on a repeated run (architecture.md: results must not depend on the thread count).
#include <algorithm>
#include <filesystem>
#include <string>
#include <vector>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "../support/cli.hpp"

namespace skein {
namespace {

namespace fs = std::filesystem;
using testing::ReadFile;
using testing::RunCli;
using testing::Scratch;

const fs::path kCases = fs::path(SKEIN_SOURCE_DIR) / "cases";

TEST(SafeOutput, AKillBeforeTheRenameLeavesNoFileUnderARequestedName) {
  Scratch dir("safe");
  const std::string json = dir.Path("result.json"), csv = dir.Path("csv");
  const auto r = RunCli({"solve", (kCases / "survey_drone.toml").string(), "--json", json, "--csv", csv, "--quiet"},
                        {"SKEIN_TEST_ABORT_BEFORE_RENAME=1"});
  EXPECT_NE(r.exit_code, 0) << r.err;
  EXPECT_FALSE(fs::exists(json));
  EXPECT_FALSE(fs::exists(csv + "/points.csv"));
  EXPECT_FALSE(fs::exists(csv + "/strips.csv"));
  // Nothing in the CSV directory under a final name either: only temporary files.
  for (const auto& e : fs::directory_iterator(csv))
    EXPECT_NE(e.path().filename().string().find(".skein-partial"), std::string::npos) << e.path();
  // The files were complete under their temporary names when it died (so the hook fired where it should).
  int partial = 0;
  for (const std::string& f : dir.Files()) partial += f.rfind("result.json.skein-partial", 0) == 0 ? 1 : 0;
  EXPECT_EQ(partial, 1);
}

TEST(SafeOutput, AnOrdinaryRunLeavesTheRequestedFilesOnly) {
  Scratch dir("safe");
  const std::string json = dir.Path("result.json"), csv = dir.Path("csv");
  const auto r = RunCli({"solve", (kCases / "survey_drone.toml").string(), "--json", json, "--csv", csv, "--quiet"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NO_THROW((void)nlohmann::json::parse(ReadFile(json)));
  EXPECT_TRUE(fs::exists(csv + "/points.csv"));
  EXPECT_TRUE(fs::exists(csv + "/strips.csv"));
  EXPECT_EQ(dir.Files(), (std::vector<std::string>{"csv", "result.json"}));
  // Whatever CSV files the program writes, none is left under a temporary name.
  int csv_files = 0;
  for (const auto& e : fs::directory_iterator(csv)) {
    EXPECT_EQ(e.path().filename().string().find(".skein-partial"), std::string::npos) << e.path();
    ++csv_files;
  }
  EXPECT_GE(csv_files, 2);
}

std::vector<std::string> BundledCases() {
  std::vector<std::string> names;
  for (const auto& e : fs::directory_iterator(kCases))
    if (e.path().extension() == ".toml") names.push_back(e.path().filename().string());
  std::sort(names.begin(), names.end());
  return names;
}

class Reproducible : public ::testing::TestWithParam<std::string> {};

nlohmann::json Points(const std::string& case_file, int threads, const Scratch& dir, const std::string& tag) {
  const std::string out = dir.Path(tag + ".json");
  const auto r = RunCli({"solve", (kCases / case_file).string(), "--threads", std::to_string(threads), "--json",
                         out, "--quiet"});
  EXPECT_EQ(r.exit_code, 0) << case_file << ": " << r.err;
  if (r.exit_code != 0) return nullptr;
  const auto j = nlohmann::json::parse(ReadFile(out));
  EXPECT_TRUE(j.contains("points") && j["points"].is_array() && !j["points"].empty()) << case_file;
  return j.value("points", nlohmann::json());
}

TEST_P(Reproducible, SamePointsWithOneAndTwoThreadsAndOnARepeat) {
  Scratch dir("repro");
  const nlohmann::json one = Points(GetParam(), 1, dir, "one");
  const nlohmann::json two = Points(GetParam(), 2, dir, "two");
  const nlohmann::json again = Points(GetParam(), 2, dir, "again");
  ASSERT_FALSE(one.is_null());
  // nlohmann compares numbers exactly; dump() shows the first difference in the failure message.
  EXPECT_TRUE(one == two) << GetParam() << ": 1 vs 2 threads differ";
  EXPECT_TRUE(two == again) << GetParam() << ": a repeated run differs";
}

INSTANTIATE_TEST_SUITE_P(Cases, Reproducible, ::testing::ValuesIn(BundledCases()),
                         [](const ::testing::TestParamInfo<std::string>& p) {
                           std::string id = fs::path(p.param).stem().string();
                           for (char& ch : id)
                             if (!std::isalnum(static_cast<unsigned char>(ch))) ch = '_';
                           return id;
                         });

TEST(Reproducible, ThereAreBundledCases) { EXPECT_GE(BundledCases().size(), 2u); }

}  // namespace
}  // namespace skein
