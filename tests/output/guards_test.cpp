// The command-line program on geometry that cannot be solved: two coincident wings, a wing folded back on
// itself, and a tail whose control points lie on the wing's trailing legs. Each must end with one line naming
// the case file, line and column, the cause and the surfaces, a non-zero exit, and no output file. A good case
// reports the reciprocal condition estimate of its system in the JSON ("solver": {"rcond"}).
#include <string>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "../support/cli.hpp"

namespace skein {
namespace {

using testing::RunCli;
using testing::Scratch;

bool Contains(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }

const char* const kWing = R"(title = "guards"
[mesh]
chordwise = 2
spanwise = 2
chordwise_spacing = "uniform"
spanwise_spacing = "uniform"
wake = "x-axis"

[[surface]]
name = "wing"
symmetric = true

  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 1.0

  [[surface.section]]
  leading_edge = [0.0, 1.0, 0.0]
  chord = 1.0
)";

/// Runs `solve` on `text` asking for JSON and CSV; checks the refusal and that nothing was written.
std::string ExpectRefused(const std::string& text, int exit_code) {
  Scratch dir("guards");
  const std::string path = dir.Write("bad.toml", text);
  const auto r = RunCli({"solve", path, "--json", dir.Path("out.json"), "--csv", dir.Path("csv")});
  EXPECT_EQ(r.exit_code, exit_code) << r.err;
  EXPECT_TRUE(r.out.empty()) << r.out;
  EXPECT_EQ(r.err.find('\n'), r.err.size() - 1) << "one line: " << r.err;
  EXPECT_EQ(r.err.rfind(path + ":", 0), 0u) << r.err;
  EXPECT_FALSE(std::filesystem::exists(dir.Path("out.json")));
  EXPECT_FALSE(std::filesystem::exists(dir.Path("csv/points.csv")));
  EXPECT_FALSE(std::filesystem::exists(dir.Path("csv/strips.csv")));
  for (const std::string& f : dir.Files()) EXPECT_TRUE(f == "bad.toml" || f == "csv") << "left behind: " << f;
  return r.err;
}

TEST(Guards, TwoCoincidentWings) {
  const std::string twin = std::string(kWing) + R"(
[[surface]]
name = "twin"
symmetric = true

  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 1.0

  [[surface.section]]
  leading_edge = [0.0, 1.0, 0.0]
  chord = 1.0
)";
  const std::string err = ExpectRefused(twin, 2);
  EXPECT_TRUE(Contains(err, ":21:1: surface \"twin\": coincides with surface \"wing\"")) << err;
  EXPECT_TRUE(Contains(err, "singular")) << err;
}

TEST(Guards, WingFoldedBackOnItself) {
  const std::string folded = std::string(kWing) + R"(
  [[surface.section]]
  leading_edge = [0.0, 0.5, 0.05]
  chord = 1.0
)";
  const std::string err = ExpectRefused(folded, 2);
  EXPECT_TRUE(Contains(err, ":9:1: surface \"wing\": the surface folds back on itself")) << err;
}

TEST(Guards, ControlPointOnAnotherSurfacesTrailingLeg) {
  // The wing's strip edges are at y = 0, +-0.5, +-1 and its legs run along +x; the tail's control points sit at
  // y = +-0.5 behind it, in its plane.
  const std::string tail = std::string(kWing) + R"(
[[surface]]
name = "tail"
symmetric = true
chordwise = 1
spanwise = 1

  [[surface.section]]
  leading_edge = [3.0, 0.0, 0.0]
  chord = 0.5

  [[surface.section]]
  leading_edge = [3.0, 1.0, 0.0]
  chord = 0.5
)";
  const std::string err = ExpectRefused(tail, 2);
  EXPECT_TRUE(Contains(err, ":21:1: surface \"tail\": the control point of strip")) << err;
  EXPECT_TRUE(Contains(err, "lies on a trailing leg of surface \"wing\"")) << err;
}

TEST(Guards, TheConditionEstimateIsInTheJson) {
  Scratch dir("guards");
  const auto r = RunCli({"solve", dir.Write("good.toml", kWing), "--json", dir.Path("out.json"), "--quiet"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto j = nlohmann::json::parse(testing::ReadFile(dir.Path("out.json")));
  ASSERT_TRUE(j.contains("solver")) << j.dump();
  ASSERT_TRUE(j["solver"]["rcond"].is_number()) << j["solver"].dump();
  const double rcond = j["solver"]["rcond"].get<double>();
  // A well-posed lattice of 8 panels: far from singular, and an estimate is never above 1.
  EXPECT_GT(rcond, 1e-6);
  EXPECT_LE(rcond, 1.0);
}

}  // namespace
}  // namespace skein
