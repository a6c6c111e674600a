// `skein study` as a user meets it: the binary (SKEIN_BINARY) run in a fresh temporary directory. A bad path,
// a malformed --vary or a variant the reader refuses is one line on standard error, exit 2 and no output file;
// the JSON document is the same byte for byte on 1 and 2 threads; study.csv has a header and a row per
// variant; no progress bar when standard error is not a terminal.
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "../support/cli_workdir.hpp"

namespace {

using skein::testing::Outcome;
using skein::testing::ReadFile;

class StudyCommand : public skein::testing::CliWorkdir {
 protected:
  void SetUp() override {
    CliWorkdir::SetUp();
    std::ofstream(dir_ / "wing.toml") << kCase;
  }
  void ExpectOneLineAndNothingWritten(const Outcome& o, const std::string& says) {
    EXPECT_EQ(o.exit_code, 2) << o.err;
    EXPECT_EQ(o.out, "");
    ASSERT_FALSE(o.err.empty());
    EXPECT_EQ(o.err.find('\n'), o.err.size() - 1) << o.err;
    EXPECT_NE(o.err.find(says), std::string::npos) << o.err;
    EXPECT_EQ(Entries(), std::vector<std::string>{"wing.toml"});
  }

  // A small tapered wing of our own invention.
  static constexpr const char* kCase = R"(title = "Study command probe"

[flight]
alpha = 3.0

[mesh]
chordwise = 2
spanwise = 8

[[surface]]
name = "wing"
symmetric = true
incidence = 1.0

  [surface.trapezoid]
  root_leading_edge = [0.0, 0.0, 0.0]
  span = 6.0
  root_chord = 0.8
  taper = 0.5
)";
};

constexpr const char* kOutputs = " --json out.json --csv out";

TEST_F(StudyCommand, AWrongPathIsOneLineWithTheNearestKeyExitTwoAndNoOutput) {
  const Outcome o = Skein(std::string("study wing.toml --vary surface.wing.trapezoid.tapr=0.3,0.4 --cl 0.4") + kOutputs);
  ExpectOneLineAndNothingWritten(o, "wing.toml:15:3: --vary \"surface.wing.trapezoid.tapr\": \"surface.wing.trapezoid\" "
                                    "has no key \"tapr\" (did you mean \"surface.wing.trapezoid.taper\"?)");
  ExpectOneLineAndNothingWritten(Skein(std::string("study wing.toml --vary surface.3.incidence=1,2 --cl 0.4") + kOutputs),
                                 "no element named \"3\"");
}

TEST_F(StudyCommand, AMalformedVaryIsOneLineExitTwoAndNoOutput) {
  for (const char* v : {"surface.wing.incidence", "surface.wing.incidence=1:2", "surface.wing.incidence=1:2:x",
                        "surface.wing.incidence=1,,2", "=1,2"})
    ExpectOneLineAndNothingWritten(Skein(std::string("study wing.toml --vary '") + v + "' --cl 0.4" + kOutputs),
                                   "--vary \"");
  ExpectOneLineAndNothingWritten(
      Skein(std::string("study wing.toml --vary surface.wing.incidence=1,2 --vary surface.wing.trapezoid.taper=0.4,0.5 "
                        "--vary surface.wing.trapezoid.span=5,6 --cl 0.4") + kOutputs),
      "at most two --vary");
  ExpectOneLineAndNothingWritten(Skein(std::string("study wing.toml --vary surface.wing.incidence=1,2") + kOutputs),
                                 "give either --cl");
  ExpectOneLineAndNothingWritten(
      Skein(std::string("study wing.toml --vary surface.wing.incidence=1,2 --cl 0.4 --alpha 2") + kOutputs),
      "give either --cl");
}

TEST_F(StudyCommand, AVariantTheReaderRefusesIsNamedExitTwoAndNoOutput) {
  ExpectOneLineAndNothingWritten(
      Skein(std::string("study wing.toml --vary surface.wing.trapezoid.taper=0.5,-0.2 --alpha 3") + kOutputs),
      "wing.toml:19:11: variant surface.wing.trapezoid.taper = -0.2: surface \"wing\" trapezoid: ");
}

TEST_F(StudyCommand, JsonIsTheSameOnOneAndTwoThreadsAndCsvHasARowPerVariant) {
  const std::string args = "study wing.toml --vary surface.wing.trapezoid.taper=0.3:0.7:3 --vary "
                           "surface.wing.incidence=0,2 --cl 0.4 --quiet";
  const Outcome one = Skein(args + " --threads 1 --json one.json --csv one");
  ASSERT_EQ(one.exit_code, 0) << one.err;
  const Outcome two = Skein(args + " --threads 2 --json two.json");
  ASSERT_EQ(two.exit_code, 0) << two.err;
  EXPECT_EQ(ReadFile(dir_ / "one.json"), ReadFile(dir_ / "two.json"));
  EXPECT_EQ(one.err, "");  // standard error is a file here: no progress bar
  const auto doc = nlohmann::json::parse(ReadFile(dir_ / "one.json"));
  EXPECT_EQ(doc["format"], "skein-study");
  EXPECT_EQ(doc["variants"].size(), 6u);
  EXPECT_EQ(doc["variants"][3]["values"], (nlohmann::json{0.3, 2.0}));
  EXPECT_NEAR(doc["variants"][3]["CL"].get<double>(), 0.4, 1e-12);
  std::istringstream csv(ReadFile(dir_ / "one" / "study.csv"));
  std::string line;
  std::getline(csv, line);
  EXPECT_EQ(line.rfind("\"surface.wing.trapezoid.taper\",\"surface.wing.incidence\",alpha_deg,CL,CD_induced,", 0), 0u)
      << line;
  int rows = 0;
  while (std::getline(csv, line)) ++rows;
  EXPECT_EQ(rows, 6);
}

TEST_F(StudyCommand, TheTableNamesTheLeastInducedDragAndCarriesTheCautions) {
  const Outcome o = Skein("study wing.toml --vary surface.wing.trapezoid.taper=0.1:0.9:9 --alpha 3");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  EXPECT_NE(o.out.find("Skein parameter study: Study command probe"), std::string::npos) << o.out;
  EXPECT_NE(o.out.find("Cautions: conceptual-design estimates"), std::string::npos);
  EXPECT_NE(o.out.find("Least induced drag"), std::string::npos);
}

TEST_F(StudyCommand, SvgDrawsInducedDragAndSpanEfficiencyOneLinePerValueOfTheSecondKey) {
  const Outcome o = Skein("study wing.toml --vary surface.wing.trapezoid.taper=0.3:0.7:3 --vary "
                          "surface.wing.incidence=0,2 --alpha 3 --quiet --svg study.svg");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  const std::string svg = ReadFile(dir_ / "study.svg");
  EXPECT_EQ(svg.rfind("<?xml", 0), 0u);
  for (const char* id : {"cd-line-1", "cd-line-2", "e-line-1", "e-line-2"})
    EXPECT_NE(svg.find(std::string("<polyline id=\"") + id + "\""), std::string::npos) << id;
  EXPECT_EQ(svg.find("line-3"), std::string::npos);
  EXPECT_NE(svg.find("incidence = 2"), std::string::npos);
  EXPECT_NE(svg.find("Conceptual-design estimates"), std::string::npos);
  EXPECT_EQ(svg.find("nan"), std::string::npos);
  // A bad path: no plot either.
  const Outcome bad = Skein("study wing.toml --vary surface.wing.trapezoid.tapr=0.3,0.4 --cl 0.4 --svg bad.svg");
  EXPECT_EQ(bad.exit_code, 2);
  EXPECT_FALSE(std::filesystem::exists(dir_ / "bad.svg"));
}

TEST_F(StudyCommand, VaryTakesOneValueEachTimeSoTheCaseMayFollowIt) {
  const Outcome o = Skein("study --vary surface.wing.trapezoid.taper=0.4,0.5 wing.toml --vary surface.wing.incidence=1 "
                          "--alpha 2 --quiet --json out.json");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  const auto doc = nlohmann::json::parse(ReadFile(dir_ / "out.json"));
  EXPECT_EQ(doc["axes"].size(), 2u);
  EXPECT_EQ(doc["variants"].size(), 2u);
}

}  // namespace
