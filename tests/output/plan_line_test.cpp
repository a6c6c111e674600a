// The command line's plan line (panels, systems, threads and the memory estimate, printed before the assembly)
// and `solve --no-lateral`: what they print and what the JSON says. No times are checked.
#include <filesystem>
#include <fstream>
#include <string>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "../support/cli_workdir.hpp"

namespace {

namespace fs = std::filesystem;

// A symmetric wing with a flap (a control that deflects both halves the same way): our own demo data.
const std::string kWing = R"(title = "plan line wing"
[flight]
alpha = [1.0, 3.0]
[mesh]
chordwise = 4
spanwise = 10
[[surface]]
name = "wing"
symmetric = true
  [surface.trapezoid]
  root_leading_edge = [0.0, 0.0, 0.0]
  span = 3.0
  root_chord = 0.4
  taper = 0.6
  [[surface.control]]
  name = "flap"
  hinge = 0.75
  span_fraction = [0.1, 0.5]
  mirror = "same"
)";

class PlanLine : public skein::testing::CliWorkdir {
 protected:
  void SetUp() override {
    CliWorkdir::SetUp();
    std::ofstream(dir_ / "wing.toml") << kWing;
  }
};

TEST_F(PlanLine, ComesFirstWithTheMemoryEstimateAndMatchesTheJson) {
  const skein::testing::Outcome o = Skein("solve wing.toml --json out.json");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  EXPECT_EQ(o.out.rfind("Plan: 80 panels, half model, largest system 40 unknowns", 0), 0u) << o.out.substr(0, 300);
  EXPECT_NE(o.out.substr(0, o.out.find('\n')).find("memory estimate"), std::string::npos);
  const nlohmann::json doc = nlohmann::json::parse(skein::testing::ReadFile(dir_ / "out.json"));
  EXPECT_GT(doc.at("solver").at("memory_estimate_bytes").get<double>(), 2.0 * 8.0 * 40.0 * 40.0);
  EXPECT_TRUE(doc.at("solver").at("lateral_derivatives").get<bool>());
  EXPECT_TRUE(doc.at("points").at(0).at("derivatives").contains("Cl_beta"));
  EXPECT_GE(doc.at("timings").at("threads").get<int>(), 1);
}

TEST_F(PlanLine, NoLateralSolvesTheSymmetricSystemOnlyAndLeavesTheLateralDerivativesOut) {
  const skein::testing::Outcome o = Skein("solve wing.toml --no-lateral --json -");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  EXPECT_EQ(o.err.rfind("Plan: 80 panels, half model, symmetric system only", 0), 0u) << o.err.substr(0, 300);
  const nlohmann::json doc = nlohmann::json::parse(o.out);
  EXPECT_FALSE(doc.at("solver").at("lateral_derivatives").get<bool>());
  const nlohmann::json& d = doc.at("points").at(0).at("derivatives");
  EXPECT_TRUE(d.contains("CL_alpha"));
  EXPECT_TRUE(d.contains("Cm_q"));
  EXPECT_FALSE(d.contains("Cl_beta"));
  EXPECT_FALSE(d.contains("Cn_r"));
  EXPECT_TRUE(d.at("controls").contains("flap"));
}

TEST_F(PlanLine, QuietPrintsNoPlan) {
  const skein::testing::Outcome o = Skein("solve wing.toml --quiet");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  EXPECT_TRUE(o.out.empty()) << o.out;
  EXPECT_TRUE(o.err.empty()) << o.err;
}

}  // namespace
