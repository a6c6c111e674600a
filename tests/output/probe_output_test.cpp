// The probes in every output: the summary table, the "probes" array of each point in the JSON document (added to
// results-format.md's contract, nothing changed), probes.csv in the --csv directory, and the command line's
// `--probe NAME=X,Y,Z`. Bad probes, in the case file or on the command line, give one line, exit 2 and no file.
// A sweep point that is not solved has no probe values.
#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include <fmt/format.h>
#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "../support/cli_workdir.hpp"
#include "skein/case_file.hpp"
#include "skein/run.hpp"

namespace {

namespace fs = std::filesystem;
using skein::testing::Outcome;
using skein::testing::ReadFile;

constexpr int kExitInput = 2, kExitNumerical = 3;

void WriteFile(const fs::path& p, const std::string& text) { std::ofstream(p, std::ios::binary) << text; }
bool Contains(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }
std::size_t CountLines(const std::string& s) { return static_cast<std::size_t>(std::count(s.begin(), s.end(), '\n')); }

std::vector<std::string> Lines(const std::string& text) {
  std::vector<std::string> out;
  for (std::size_t a = 0, b; (b = text.find('\n', a)) != std::string::npos; a = b + 1) out.push_back(text.substr(a, b - a));
  return out;
}

/// Cells of a CSV line, a quoted cell's commas not counted.
std::size_t Cells(const std::string& line) {
  std::size_t n = 1;
  bool quoted = false;
  for (char ch : line) {
    if (ch == '"') quoted = !quoted;
    if (ch == ',' && !quoted) ++n;
  }
  return n;
}

// A wing of our own with two probes: one behind it (a tail), one on the root trailing edge, where the two root
// strips' trailing legs leave (a vortex core).
const std::string kWing = R"(title = "probe outputs"
[flight]
alpha = [2.0, 5.0]

[mesh]
chordwise = 4
spanwise = 8

[[surface]]
name = "wing"
symmetric = true

  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 0.30

  [[surface.section]]
  leading_edge = [0.04, 1.2, 0.0]
  chord = 0.18

[[probe]]
name = "tail"
point = [1.2, 0.0, 0.1]

[[probe]]
name = "root te"
point = [0.3, 0.0, 0.0]
)";

class ProbeCli : public skein::testing::CliWorkdir {};

TEST_F(ProbeCli, JsonCsvAndSummaryCarryEveryProbeOfEveryPoint) {
  WriteFile(dir_ / "wing.toml", kWing);
  const Outcome o = Skein("solve wing.toml --probe pitot=-0.4,0,0.05 --json out.json --csv tables");
  ASSERT_EQ(o.exit_code, 0) << o.err;

  const auto j = nlohmann::json::parse(ReadFile(dir_ / "out.json"));
  ASSERT_EQ(j["points"].size(), 2u);
  for (const auto& p : j["points"]) {
    ASSERT_EQ(p["probes"].size(), 3u) << p["probes"].dump();
    const auto& tail = p["probes"][0];
    EXPECT_EQ(tail["name"], "tail");
    EXPECT_EQ(tail["point"], nlohmann::json::array({1.2, 0.0, 0.1}));
    for (const char* k : {"u", "v", "w", "downwash_deg", "sidewash_deg", "q_ratio"})
      EXPECT_TRUE(tail[k].is_number()) << k << " in " << tail.dump();
    EXPECT_EQ(tail["in_core"], false);
    EXPECT_EQ(tail["note"], "");
    EXPECT_GT(tail["downwash_deg"].get<double>(), 0.0) << "behind a lifting wing the flow is turned down";
    const auto& core = p["probes"][1];
    EXPECT_EQ(core["name"], "root te");
    EXPECT_EQ(core["in_core"], true);
    for (const char* k : {"u", "v", "w", "downwash_deg", "sidewash_deg", "q_ratio"}) EXPECT_TRUE(core[k].is_null()) << k;
    EXPECT_TRUE(Contains(core["note"].get<std::string>(), "core radii")) << core.dump();
    // results-format.md: a null comes with its reason in the warnings.
    bool warned = false;
    for (const auto& w : p["warnings"]) warned = warned || w.get<std::string>() == core["note"].get<std::string>();
    EXPECT_TRUE(warned) << p["warnings"].dump();
    EXPECT_EQ(p["probes"][2]["name"], "pitot");
    EXPECT_LT(p["probes"][2]["downwash_deg"].get<double>(), 0.0) << "ahead of a lifting wing the flow is turned up";
  }

  const std::vector<std::string> csv = Lines(ReadFile(dir_ / "tables" / "probes.csv"));
  ASSERT_EQ(csv.size(), 1u + 2u * 3u);
  EXPECT_EQ(csv[0], "point,probe,x,y,z,u,v,w,downwash_deg,sidewash_deg,q_ratio,in_core,note");
  for (const std::string& line : csv) EXPECT_EQ(Cells(line), Cells(csv[0])) << line;
  EXPECT_EQ(csv[1].rfind("0,tail,1.2,0,0.1,", 0), 0u) << csv[1];
  EXPECT_TRUE(Contains(csv[1], ",false,")) << csv[1];
  EXPECT_EQ(csv[2].rfind("0,root te,0.3,0,0,,,,,,,true,\"probe \"\"root te\"\" lies within", 0), 0u) << csv[2];
  EXPECT_EQ(csv[6].rfind("1,pitot,-0.4,0,0.05,", 0), 0u) << csv[6];
  // The CSV's numbers are the JSON's.
  EXPECT_TRUE(Contains(csv[4], fmt::format(",{},", j["points"][1]["probes"][0]["w"].get<double>()))) << csv[4];

  EXPECT_TRUE(Contains(o.out, "Flow at the probes")) << o.out;
  EXPECT_TRUE(Contains(o.out, "  pitot    at (-0.4, 0, 0.05) m")) << o.out;
  EXPECT_TRUE(Contains(o.out, "  5.00   0.00  root te  in a vortex core: no values")) << o.out;
  EXPECT_TRUE(Contains(o.out, "Cautions")) << o.out;
}

TEST_F(ProbeCli, ACaseWithoutProbesWritesNoProbesCsvAndEmptyProbeArrays) {
  std::string text = kWing;
  text.erase(text.find("\n[[probe]]"));
  WriteFile(dir_ / "wing.toml", text + "\n");
  const Outcome o = Skein("solve wing.toml --json out.json --csv tables");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  EXPECT_FALSE(fs::exists(dir_ / "tables" / "probes.csv"));
  const auto j = nlohmann::json::parse(ReadFile(dir_ / "out.json"));
  for (const auto& p : j["points"]) EXPECT_EQ(p["probes"], nlohmann::json::array());
  EXPECT_FALSE(Contains(o.out, "Flow at the probes"));
}

TEST_F(ProbeCli, ABadCommandLineProbeGivesOneLineExitTwoAndNoFile) {
  WriteFile(dir_ / "wing.toml", kWing);
  for (const char* arg : {"--probe pitot", "--probe 'pitot=1,2'", "--probe pitot=1,x,2", "--probe tail=1,0,0",
                                 "--probe =1,2,3"}) {
    const Outcome o = Skein(std::string("solve wing.toml ") + arg + " --json out.json --csv tables");
    EXPECT_EQ(o.exit_code, kExitInput) << arg << ": " << o.err;
    EXPECT_EQ(CountLines(o.err), 1u) << arg << ": " << o.err;
    EXPECT_EQ(o.err.rfind("--probe \"", 0), 0u) << arg << ": " << o.err;
    EXPECT_TRUE(o.out.empty()) << o.out;
    EXPECT_EQ(Entries(), (std::vector<std::string>{"wing.toml"})) << arg << ": no output file";
  }
}

TEST_F(ProbeCli, ABadProbeTableGivesOneLineWithFileLineColumnExitTwoAndNoFile) {
  std::string text = kWing;
  text.replace(text.find("point = [1.2, 0.0, 0.1]"), 5, "piont");
  WriteFile(dir_ / "bad.toml", text);
  const Outcome o = Skein("solve bad.toml --json out.json --csv tables");
  EXPECT_EQ(o.exit_code, kExitInput) << o.err;
  EXPECT_EQ(o.err, "bad.toml:23:1: probe \"tail\": unknown key \"piont\" (did you mean \"point\"?)\n");
  EXPECT_EQ(Entries(), (std::vector<std::string>{"bad.toml"}));
}

TEST_F(ProbeCli, ProbesCanBeRepeatedAndAreEchoed) {
  WriteFile(dir_ / "wing.toml", kWing);
  const Outcome o = Skein("solve wing.toml --probe a=1,0,0.2 --probe b=2,0.5,0.2 --echo");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  const skein::Case back = skein::ReadCaseText(o.out, "echo.toml");
  ASSERT_EQ(back.probes.size(), 4u);
  EXPECT_EQ(back.probes[2].name, "a");
  EXPECT_EQ(back.probes[3].name, "b");
  EXPECT_EQ(back.probes[3].point, (skein::Vec3{2.0, 0.5, 0.2}));
}

// The wing and tail of sweep_point_failure_test.cpp: at alpha 6 deg the wing's legs run through the tail's control
// points, and that point is not solved. Its probes have no values: JSON an empty array, no CSV rows.
std::string WingAndTail() {
  const double z_tail = 2.375 * std::tan(6.0 * M_PI / 180.0);
  return fmt::format(R"(title = "sweep with one bad point"
[mesh]
chordwise = 2
spanwise = 2
chordwise_spacing = "uniform"
spanwise_spacing = "uniform"
wake = "freestream"
[flight]
alpha = [0.0, 6.0, 3.0]
[[surface]]
name = "wing"
symmetric = true
  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 1.0
  [[surface.section]]
  leading_edge = [0.0, 1.0, 0.0]
  chord = 1.0
[[surface]]
name = "tail"
symmetric = true
chordwise = 1
spanwise = 1
  [[surface.section]]
  leading_edge = [3.0, 0.0, {0:.17g}]
  chord = 0.5
  [[surface.section]]
  leading_edge = [3.0, 1.0, {0:.17g}]
  chord = 0.5
[[probe]]
name = "boom"
point = [-1.0, 0.3, 0.2]
)",
                     z_tail);
}

TEST_F(ProbeCli, AFailedSweepPointHasNoProbeValues) {
  const skein::Results r = skein::Run(skein::ReadCaseText(WingAndTail(), "sweep.toml"), {});
  ASSERT_EQ(r.points.size(), 3u);
  ASSERT_FALSE(r.points[1].solved());
  EXPECT_TRUE(r.points[1].probes.empty());
  for (std::size_t i : {0u, 2u}) {
    ASSERT_EQ(r.points[i].probes.size(), 1u);
    EXPECT_TRUE(r.points[i].probes[0].velocity.has_value());
  }

  WriteFile(dir_ / "sweep.toml", WingAndTail());
  const Outcome o = Skein("solve sweep.toml --json out.json --csv tables");
  EXPECT_EQ(o.exit_code, kExitNumerical) << o.err;
  const auto j = nlohmann::json::parse(ReadFile(dir_ / "out.json"));
  EXPECT_EQ(j["points"][1]["probes"], nlohmann::json::array());
  EXPECT_EQ(j["points"][0]["probes"].size(), 1u);
  const std::vector<std::string> csv = Lines(ReadFile(dir_ / "tables" / "probes.csv"));
  ASSERT_EQ(csv.size(), 3u);  // the header, point 0 and point 2
  EXPECT_EQ(csv[1].rfind("0,boom,", 0), 0u) << csv[1];
  EXPECT_EQ(csv[2].rfind("2,boom,", 0), 0u) << csv[2];
}

}  // namespace
