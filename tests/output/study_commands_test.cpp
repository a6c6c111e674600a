// The design-study commands as a user meets them: `skein solve --refine / --svg`, `skein twist` and
// `skein compare`, run as the binary (SKEIN_BINARY) in a fresh temporary directory. Checks the exit codes,
// the files left behind, and that a bad input gives one line naming the file and no output of any kind.
#include <sys/wait.h>

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "skein/case_file.hpp"
#include "skein/run.hpp"
#include "../support/cli_workdir.hpp"

namespace {

namespace fs = std::filesystem;
using skein::testing::Outcome;
using skein::testing::ReadFile;

class StudyCli : public skein::testing::CliWorkdir {
 protected:
  void SetUp() override {
    CliWorkdir::SetUp();
    std::ofstream(dir_ / "wing.toml") << kCase;
  }

  // A small tapered wing of our own invention, coarse enough to refine twice quickly.
  static constexpr const char* kCase = R"(title = "Study probe wing"

[flight]
alpha = 3.0

[mesh]
chordwise = 2
spanwise = 8
spanwise_spacing = "sine"

[[surface]]
name = "wing"
symmetric = true

  [surface.trapezoid]
  root_leading_edge = [0.0, 0.0, 0.0]
  span = 6.0
  root_chord = 0.8
  taper = 0.4
  sweep = 10.0
)";
};

TEST_F(StudyCli, RefineAddsAConvergenceObjectAndATable) {
  const Outcome o = Skein("solve wing.toml --refine --json out.json");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  EXPECT_NE(o.out.find("Mesh convergence"), std::string::npos);
  EXPECT_NE(o.out.find("extrapolated"), std::string::npos);
  const auto doc = nlohmann::json::parse(ReadFile(dir_ / "out.json"));
  ASSERT_TRUE(doc.contains("convergence"));
  const auto& cv = doc["convergence"];
  EXPECT_EQ(cv["meshes"].size(), 3u);
  EXPECT_EQ(cv["meshes"][2]["chordwise"], 8);
  for (const char* q : {"CL", "CD_induced", "Cm", "span_efficiency"}) {
    ASSERT_TRUE(cv["quantities"].contains(q)) << q;
    EXPECT_EQ(cv["quantities"][q]["values"].size(), 3u);
    EXPECT_TRUE(cv["quantities"][q]["extrapolated"].is_number()) << q;
  }
  // The rest of the document is the ordinary results document.
  EXPECT_EQ(doc["format"], "skein-result");
  EXPECT_EQ(doc["points"][0]["CL"].get<double>(), cv["quantities"]["CL"]["values"][0].get<double>());
}

TEST_F(StudyCli, SvgIsWrittenWithTheSpanLoading) {
  const Outcome o = Skein("solve wing.toml --quiet --svg loading.svg");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  const std::string svg = ReadFile(dir_ / "loading.svg");
  EXPECT_NE(svg.find("<svg"), std::string::npos);
  EXPECT_NE(svg.find("id=\"loading-wing\""), std::string::npos);
  EXPECT_NE(svg.find("id=\"elliptic-wing\""), std::string::npos);
}

TEST_F(StudyCli, TwistWritesACaseThatSolvesToTheTargetLift) {
  const Outcome o = Skein("twist wing.toml --cl 0.4 --out twisted.toml --json design.json");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  const auto design = nlohmann::json::parse(ReadFile(dir_ / "design.json"));
  EXPECT_EQ(design["format"], "skein-twist-design");
  EXPECT_EQ(design["sections"].size(), 6u);
  EXPECT_LT(design["after"]["CD_induced"].get<double>(), design["before"]["CD_induced"].get<double>());
  EXPECT_NE(o.out.find("CD_induced"), std::string::npos);
  EXPECT_NE(o.out.find("Cautions"), std::string::npos);
  const skein::Case c = skein::ReadCaseFile((dir_ / "twisted.toml").string());
  EXPECT_EQ(c.surfaces[0].sections.size(), 6u);
  const skein::Results r = skein::Run(c, {});
  EXPECT_NEAR(r.points.front().CL, 0.4, 1e-8);
  // And compare ranks it ahead of the wing as given at that lift.
  const Outcome cmp = Skein("compare wing.toml twisted.toml --cl 0.4 --csv cmp");
  ASSERT_EQ(cmp.exit_code, 0) << cmp.err;
  const std::string csv = ReadFile(dir_ / "cmp" / "compare.csv");
  const std::size_t first_row = csv.find('\n') + 1;
  EXPECT_EQ(csv.compare(first_row, 16, "1,\"twisted.toml\""), 0) << csv;
}

TEST_F(StudyCli, CompareOneAircraftRanksByInducedDragForce) {
  // D_i = q S_ref CD_induced at CL = W / (q S_ref) (the definition of the coefficients; common practice).
  const Outcome o = Skein("compare wing.toml wing.toml --weight 900 --speed 35 --density 1.1 --csv cmp --json cmp.json");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  EXPECT_NE(o.out.find("weight 900 N at 35 m/s, density 1.1 kg/m^3"), std::string::npos) << o.out;
  const skein::Case c = skein::ReadCaseFile((dir_ / "wing.toml").string());
  const double q = 0.5 * 1.1 * 35.0 * 35.0, CL = 900.0 / (q * c.reference.area);
  const nlohmann::json doc = nlohmann::json::parse(ReadFile(dir_ / "cmp.json"));
  EXPECT_TRUE(doc["CL"].is_null());
  for (const auto& e : doc["cases"]) {
    EXPECT_EQ(e["rank"], 1);
    EXPECT_NEAR(e["CL"].get<double>(), CL, 1e-9);
    EXPECT_NEAR(e["induced_drag_N"].get<double>(), q * c.reference.area * e["CD_induced"].get<double>(), 1e-12);
  }
  EXPECT_NE(ReadFile(dir_ / "cmp" / "compare.csv").find(",induced_drag_N\n"), std::string::npos);
  // --weight needs --speed, and excludes --cl: refused before any work, no file written.
  for (const char* args : {"compare wing.toml --weight 900 --json bad.json", "compare wing.toml --weight 900 --speed 35 --cl 0.4 --json bad.json",
                           "compare wing.toml --weight -1 --speed 35 --json bad.json"}) {
    const Outcome b = Skein(args);
    EXPECT_EQ(b.exit_code, 2) << args;
    EXPECT_FALSE(std::filesystem::exists(dir_ / "bad.json")) << args;
  }
}

TEST_F(StudyCli, BadInputGivesOneLineAndNoOutput) {
  const Outcome t = Skein("twist wing.toml --cl 0 --out twisted.toml --json design.json");
  EXPECT_EQ(t.exit_code, 2);
  EXPECT_EQ(std::count(t.err.begin(), t.err.end(), '\n'), 1) << t.err;
  EXPECT_EQ(t.err.rfind("wing.toml: ", 0), 0u) << t.err;
  const Outcome c = Skein("compare wing.toml missing.toml --json cmp.json");
  EXPECT_EQ(c.exit_code, 2);
  EXPECT_EQ(std::count(c.err.begin(), c.err.end(), '\n'), 1) << c.err;
  EXPECT_NE(c.err.find("missing.toml"), std::string::npos) << c.err;
  const Outcome r = Skein("solve wing.toml --refine --refine-max-panels 10 --json out.json --svg out.svg");
  EXPECT_EQ(r.exit_code, 2);  // 2 and 8 halve to 1 and 4 but not to 0.5 and 2: no three meshes fit in 10 panels
  EXPECT_EQ(std::count(r.err.begin(), r.err.end(), '\n'), 1) << r.err;
  EXPECT_EQ(Entries(), std::vector<std::string>{"wing.toml"});
}

}  // namespace
