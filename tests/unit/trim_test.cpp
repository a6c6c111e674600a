// Tests for trim.hpp: the trimmed point is an exact solution with |Cm| and |CL - target| below 1e-8 (the
// acceptance bound; the trim's own tolerance is 1e-10), checked again by an independent solve of the case at
// the trimmed alpha and setting; each unreachable target ends with its own message, as a TrimError pointing at
// the [trim] table; the CLI maps that to exit 3 and writes no output; every example in cases/ with a [trim]
// table trims.
#include "skein/trim.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <utility>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "../support/aircraft.hpp"
#include "skein/case_file.hpp"
#include "skein/report/json.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

namespace fs = std::filesystem;
using testing::ControlNamed;
using testing::SurfaceNamed;
using testing::TestAircraft;

constexpr double kTrimmed = 1e-8;  // the acceptance bound on |Cm| and |CL - target|

Case WithTrim(Case c, double lift_coefficient, const std::string& adjust) {
  c.trim.enabled = true;
  c.trim.lift_coefficient = lift_coefficient;
  c.trim.adjust = adjust;
  c.trim.where = {40, 1};
  c.source_path = "aircraft.toml";
  return c;
}

/// Solves the case at the trimmed alpha and setting from scratch and checks the residuals there.
void ExpectIndependentlyTrimmed(const Case& c, const Results& r, double target) {
  ASSERT_TRUE(r.trim.has_value());
  const TrimResult& t = *r.trim;
  EXPECT_TRUE(t.converged);
  EXPECT_LT(std::abs(t.Cm), kTrimmed);
  EXPECT_LT(std::abs(t.CL - target), kTrimmed);
  ASSERT_EQ(r.points.size(), 1u);
  EXPECT_EQ(r.points.front().CL, t.CL);
  EXPECT_EQ(r.points.front().alpha_deg, t.alpha_deg);
  Case check = c;
  check.flight.alpha_deg = {t.alpha_deg};
  const std::size_t dot = t.adjust.rfind('.');
  const std::string owner = t.adjust.substr(0, dot);
  if (t.adjust.substr(dot + 1) == "incidence")
    SurfaceNamed(check, owner).incidence_deg = t.value_deg;
  else
    ControlNamed(check, owner).deflection_deg = t.value_deg;
  const PointResult p = skein::Run(check, {}).points.front();
  EXPECT_LT(std::abs(p.Cm), kTrimmed);
  EXPECT_LT(std::abs(p.CL - target), kTrimmed);
}

TEST(Trim, ElevatorDeflectionWithXAxisWake) {
  const Case c = WithTrim(TestAircraft(WakeDirection::x_axis), 0.5, "elevator.deflection");
  const Results r = Trim(c, {});
  ExpectIndependentlyTrimmed(c, r, 0.5);
  EXPECT_LE(r.trim->iterations, 4);  // Newton with the exact Jacobian of the discrete model
  EXPECT_EQ(r.trim->adjusted_surface, "tail");
  double share = 0.0;
  for (const auto& [name, v] : r.trim->lift_share) share += v;
  EXPECT_NEAR(share, 1.0, 1e-12);
}

TEST(Trim, TailIncidenceWithFreestreamWake) {
  const Case c = WithTrim(TestAircraft(WakeDirection::freestream), 0.35, "tail.incidence");
  const Results r = Trim(c, {});
  ExpectIndependentlyTrimmed(c, r, 0.35);
  EXPECT_EQ(r.trim->adjust, "tail.incidence");
  ASSERT_TRUE(r.trim->static_margin.has_value());
  EXPECT_GT(*r.trim->static_margin, 0.0);
}

// weight / (q S_ref) is the target: 1/2 rho V^2 S CL = W.
TEST(Trim, WeightSetsTheLiftCoefficient) {
  Case c = TestAircraft(WakeDirection::x_axis);
  c.trim.enabled = true;
  c.trim.weight = 8000.0;
  c.trim.adjust = "elevator.deflection";
  const double q = 0.5 * c.flight.density * c.flight.speed * c.flight.speed;
  const Results r = Trim(c, {});
  EXPECT_NEAR(r.trim->CL_target, 8000.0 / (q * c.reference.area), 1e-15);
  ExpectIndependentlyTrimmed(c, r, r.trim->CL_target);
}

std::string TrimFailure(const Case& c, const TrimOptions& o = {}) {
  try {
    Trim(c, {}, o);
  } catch (const TrimError& e) {
    return e.what();
  }
  return "(no error)";
}

void ExpectMessage(const std::string& what, const std::string& part) {
  EXPECT_EQ(what.rfind("aircraft.toml:40:1: trim: ", 0), 0u) << what;
  EXPECT_NE(what.find(part), std::string::npos) << what;
}

TEST(TrimFailures, AnAileronHasNoPitchControl) {
  ExpectMessage(TrimFailure(WithTrim(TestAircraft(WakeDirection::x_axis), 0.5, "aileron.deflection")),
                "aileron.deflection gives no pitch control independent of alpha");
}

TEST(TrimFailures, ALiftCoefficientBeyondLinearTheoryNeedsTooMuchAlpha) {
  ExpectMessage(TrimFailure(WithTrim(TestAircraft(WakeDirection::x_axis), 2.5, "elevator.deflection")),
                "the target CL = 2.5 needs alpha of about");
}

TEST(TrimFailures, ASmallElevatorNeedsMoreThanThirtyDegrees) {
  Case c = WithTrim(TestAircraft(WakeDirection::x_axis), 0.4, "elevator.deflection");
  ControlNamed(c, "elevator").span_fraction = {0.0, 0.15};  // a sliver of elevator
  c.reference.moment_point = {-0.4, 0.0, 0.0};               // and a nose-heavy aircraft
  ExpectMessage(TrimFailure(c), "the trim needs elevator.deflection of about");
  EXPECT_NE(TrimFailure(c).find("beyond the 30 deg allowed"), std::string::npos);
}

// Behind the neutral point the elevator must hold the nose down harder as alpha grows: this one runs out of
// elevator (beyond 30 deg) before alpha reaches its bound, and the message says why.
TEST(TrimFailures, AnUnstableAircraftThatTrimsOnlyAtAbsurdAnglesSaysSo) {
  Case c = WithTrim(TestAircraft(WakeDirection::x_axis), 1.8, "elevator.deflection");
  c.reference.moment_point = {2.2, 0.0, 0.0};  // far behind the neutral point
  const std::string what = TrimFailure(c);
  ExpectMessage(what, "beyond the 30 deg allowed; the configuration is statically unstable (static margin -");
}

TEST(TrimFailures, NoConvergenceInTheIterationsAllowed) {
  TrimOptions o;
  o.max_iterations = 1;
  ExpectMessage(TrimFailure(WithTrim(TestAircraft(WakeDirection::x_axis), 0.4, "elevator.deflection"), o),
                "no convergence in 1 iterations");
}

TEST(TrimFailures, ACaseWithoutTrimTableIsAnInputError) {
  const Case c = TestAircraft(WakeDirection::x_axis);
  EXPECT_THROW(Trim(c, {}), InputError);
  TrimOptions bad;
  bad.tolerance = -1.0;
  EXPECT_THROW(Trim(WithTrim(c, 0.4, "elevator.deflection"), {}, bad), InputError);
}

// The examples of cases/ that have a [trim] table: each trims, and its JSON carries the "trim" object.
TEST(TrimExamples, EveryExampleWithATrimTableTrims) {
  int trimmed = 0;
  for (const auto& entry : fs::directory_iterator(fs::path(SKEIN_SOURCE_DIR) / "cases")) {
    if (entry.path().extension() != ".toml") continue;
    const Case c = ReadCaseFile(entry.path().string());
    if (!c.trim.enabled) continue;
    const Results r = Trim(c, {});
    ASSERT_TRUE(r.trim) << entry.path();
    EXPECT_LT(std::abs(r.trim->Cm), kTrimmed) << entry.path();
    EXPECT_LT(std::abs(r.trim->CL - r.trim->CL_target), kTrimmed) << entry.path();
    ASSERT_TRUE(r.trim->static_margin) << entry.path();
    EXPECT_GT(*r.trim->static_margin, 0.0) << entry.path() << ": an example should be stable";
    std::ostringstream json;
    report::WriteJson(r, json);
    const auto doc = nlohmann::json::parse(json.str());
    ASSERT_TRUE(doc.contains("trim")) << entry.path();
    for (const char* key : {"converged", "iterations", "alpha_deg", "adjust", "value_deg", "CL", "Cm"})
      EXPECT_TRUE(doc["trim"].contains(key)) << entry.path() << " " << key;
    EXPECT_EQ(doc["points"].size(), 1u);
    ++trimmed;
  }
  EXPECT_GE(trimmed, 3);
}

// The command line: exit 0 with a JSON document; exit 3 and one located line, and no output file, when the
// target cannot be reached; exit 2 for a case without a [trim] table.
int RunCli(const std::string& args, std::string& err) {
  const fs::path out = fs::temp_directory_path() / "skein_trim_test_stderr.txt";
  const int status = std::system((std::string(SKEIN_BINARY) + " " + args + " 2> " + out.string() + " > /dev/null").c_str());
  std::ifstream f(out);
  err.assign(std::istreambuf_iterator<char>(f), std::istreambuf_iterator<char>());
  return WEXITSTATUS(status);
}

TEST(TrimCli, ExitCodesAndNoPartialOutput) {
  const fs::path dir = fs::temp_directory_path() / "skein_trim_test";
  fs::create_directories(dir);
  const std::string trainer = (fs::path(SKEIN_SOURCE_DIR) / "cases" / "trainer_two_seat.toml").string();
  std::string err;
  const fs::path good = dir / "good.json";
  ASSERT_EQ(RunCli("trim " + trainer + " --quiet --json " + good.string(), err), 0) << err;
  std::ifstream gj(good);
  const auto doc = nlohmann::json::parse(gj);
  EXPECT_TRUE(doc["trim"]["converged"].get<bool>());

  // The same aircraft asked for a lift coefficient it cannot reach. The wake is put along x, so that the
  // wing's trailing legs stay where they are while the trim's alpha climbs to its bound (with the freestream
  // wake they sweep through the fin's control points on the way, which the geometry check refuses).
  std::ifstream in(trainer);
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  for (const auto& [from, to] : {std::pair<std::string, std::string>{"weight = 7350.0", "lift_coefficient = 3.0"},
                                 {"wake = \"freestream\"", "wake = \"x-axis\""}}) {
    ASSERT_NE(text.find(from), std::string::npos) << from;
    text.replace(text.find(from), from.size(), to);
  }
  const fs::path bad_case = dir / "unreachable.toml", bad_json = dir / "unreachable.json";
  std::ofstream(bad_case) << text;
  fs::remove(bad_json);
  EXPECT_EQ(RunCli("trim " + bad_case.string() + " --json " + bad_json.string(), err), 3);
  EXPECT_NE(err.find(bad_case.string() + ":"), std::string::npos) << err;
  EXPECT_NE(err.find("trim: the target CL = 3 needs alpha of about"), std::string::npos) << err;
  EXPECT_EQ(std::count(err.begin(), err.end(), '\n'), 1) << err;
  EXPECT_FALSE(fs::exists(bad_json));

  const fs::path no_trim = dir / "no_trim.toml";
  std::ofstream(no_trim) << text.substr(0, text.find("\n[trim]\n"));
  EXPECT_EQ(RunCli("trim " + no_trim.string(), err), 2);
  EXPECT_NE(err.find("no [trim] table"), std::string::npos) << err;
}

}  // namespace
}  // namespace skein
