// A sweep whose single point cannot be solved keeps the rest (issue "hostile input", item 5). The case is a wing
// and a tail behind it, with the wake trailing along the freestream (conventions.md): at one angle of attack the
// wing's trailing legs pass exactly through the tail's control points, which the geometry check refuses
// (a control point on a vortex line). That point must carry its error in its place - the summary, the JSON
// (null values and an "error" string) and points.csv - while the other points are solved exactly as they are
// when solved alone, and the exit status is 3. When every point fails, the run fails as a single point does:
// one line, exit 2, no file.
#include <cmath>
#include <string>
#include <vector>

#include <fmt/format.h>
#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "../support/cli.hpp"
#include "skein/case_file.hpp"
#include "skein/error.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

using testing::RunCli;
using testing::Scratch;

constexpr double kBadAlphaDeg = 6.0;

bool Contains(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }

/// Wing chord 1 m from x = 0 (trailing edge x = 1), strip edges at y = 0, +-0.5, +-1. The tail's single strip per
/// half has its control point at x = 3 + 0.75 * 0.5 = 3.375 m, y = +-0.5: on the wing's leg from (1, +-0.5, 0)
/// when that leg rises at kBadAlphaDeg, that is when z = 2.375 tan(alpha).
std::string WingAndTail(const std::string& alphas) {
  const double z_tail = 2.375 * std::tan(kBadAlphaDeg * M_PI / 180.0);
  return fmt::format(R"(title = "sweep with one bad point"
[mesh]
chordwise = 2
spanwise = 2
chordwise_spacing = "uniform"
spanwise_spacing = "uniform"
wake = "freestream"

[flight]
alpha = {}

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
  leading_edge = [3.0, 0.0, {:.17g}]
  chord = 0.5

  [[surface.section]]
  leading_edge = [3.0, 1.0, {:.17g}]
  chord = 0.5
)",
                     alphas, z_tail, z_tail);
}

TEST(SweepPointFailure, TheOtherPointsAreSolvedAsTheyAreAlone) {
  const Results sweep = skein::Run(ReadCaseText(WingAndTail("[0.0, 6.0, 3.0]"), "sweep.toml"), {});
  ASSERT_EQ(sweep.points.size(), 3u);
  EXPECT_EQ(sweep.FailedPoints(), 1u);
  const PointResult& bad = sweep.points[1];
  EXPECT_FALSE(bad.solved());
  EXPECT_EQ(bad.alpha_deg, kBadAlphaDeg);
  EXPECT_TRUE(Contains(bad.error, "lies on a trailing leg of surface \"wing\"")) << bad.error;
  EXPECT_TRUE(Contains(bad.error, "at alpha 6 deg")) << bad.error;
  EXPECT_TRUE(bad.surfaces.empty());
  // The sweep's warnings say which point was lost.
  bool named = false;
  for (const std::string& w : sweep.warnings) named = named || Contains(w, "point 2 (alpha 6 deg, beta 0 deg)");
  EXPECT_TRUE(named);

  // Each good point equals the same point solved on its own, bit for bit (one factorisation per alpha either way).
  for (const auto& [index, alpha] : std::vector<std::pair<std::size_t, const char*>>{{0, "[0.0]"}, {2, "[3.0]"}}) {
    const Results alone = skein::Run(ReadCaseText(WingAndTail(alpha), "alone.toml"), {});
    const PointResult& p = sweep.points[index];
    ASSERT_TRUE(p.solved()) << p.error;
    EXPECT_EQ(p.CL, alone.points.front().CL);
    EXPECT_EQ(p.CD_induced, alone.points.front().CD_induced);
    EXPECT_EQ(p.Cm, alone.points.front().Cm);
    EXPECT_EQ(p.derivatives.Get("CL_alpha"), alone.points.front().derivatives.Get("CL_alpha"));
  }
  EXPECT_GT(sweep.points[2].CL, sweep.points[0].CL);  // a real solution: lift rises with alpha
  EXPECT_EQ(&sweep.FirstSolved(), &sweep.points[0]);
}

TEST(SweepPointFailure, EveryPointFailingIsTheSingleError) {
  EXPECT_THROW(skein::Run(ReadCaseText(WingAndTail("[6.0]"), "bad.toml"), {}), InputError);
}

TEST(SweepPointFailure, TheCommandLineMarksThePointAndExitsThree) {
  Scratch dir("sweepfail");
  const std::string path = dir.Write("sweep.toml", WingAndTail("[0.0, 6.0, 3.0]"));
  const auto r = RunCli({"solve", path, "--json", dir.Path("out.json"), "--csv", dir.Path("csv")});
  EXPECT_EQ(r.exit_code, 3) << r.err;
  EXPECT_TRUE(Contains(r.err, "skein: point 2 (alpha 6 deg, beta 0 deg) was not solved: " + path + ":")) << r.err;
  EXPECT_TRUE(Contains(r.out, "NOT SOLVED")) << r.out;

  const auto j = nlohmann::json::parse(testing::ReadFile(dir.Path("out.json")));
  ASSERT_EQ(j["points"].size(), 3u);
  const auto& bad = j["points"][1];
  EXPECT_EQ(bad["alpha_deg"].get<double>(), kBadAlphaDeg);
  EXPECT_TRUE(bad["CL"].is_null());
  EXPECT_TRUE(bad["CD_induced"].is_null());
  EXPECT_TRUE(bad["derivatives"].is_null());
  EXPECT_TRUE(Contains(bad["error"].get<std::string>(), "lies on a trailing leg")) << bad.dump();
  for (std::size_t i : {0u, 2u}) {
    EXPECT_TRUE(j["points"][i]["CL"].is_number()) << j["points"][i].dump();
    EXPECT_FALSE(j["points"][i].contains("error"));
  }

  // points.csv: the bad row has the flight condition, empty values and the error in the last column, and
  // every row has as many cells as the header (no comma inside the quoted error is counted).
  const std::string csv = testing::ReadFile(dir.Path("csv/points.csv"));
  std::vector<std::string> lines;
  for (std::size_t a = 0, b; (b = csv.find('\n', a)) != std::string::npos; a = b + 1) lines.push_back(csv.substr(a, b - a));
  ASSERT_EQ(lines.size(), 4u) << csv;
  const auto cells = [](const std::string& line) {
    std::size_t n = 1;
    bool quoted = false;
    for (char ch : line) {
      if (ch == '"') quoted = !quoted;
      if (ch == ',' && !quoted) ++n;
    }
    return n;
  };
  EXPECT_EQ(lines[0].substr(lines[0].rfind(',') + 1), "error");
  for (const std::string& line : lines) EXPECT_EQ(cells(line), cells(lines[0])) << line;
  EXPECT_EQ(lines[2].rfind("1,6,", 0), 0u) << lines[2];
  EXPECT_TRUE(Contains(lines[2], ",,\"" + path + ":")) << lines[2];
  EXPECT_EQ(lines[1].back(), ',') << "a solved point has an empty error cell: " << lines[1];
}

TEST(SweepPointFailure, EveryPointFailingLeavesNoFile) {
  Scratch dir("sweepfail");
  const std::string path = dir.Write("bad.toml", WingAndTail("[6.0]"));
  const auto r = RunCli({"solve", path, "--json", dir.Path("out.json")});
  EXPECT_EQ(r.exit_code, 2) << r.err;
  EXPECT_EQ(r.err.find('\n'), r.err.size() - 1) << "one line: " << r.err;
  EXPECT_FALSE(std::filesystem::exists(dir.Path("out.json")));
}

}  // namespace
}  // namespace skein
