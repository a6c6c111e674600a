// The flow-field probe (probe.hpp): invariants of the velocity it reports, the vortex-core flag, and the
// command-line form of a probe. The closed-form checks are in validation/probe_closed_forms_test.cpp and
// validation/stokes_circulation_test.cpp.
#include <algorithm>
#include <cmath>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/case_file.hpp"
#include "skein/lattice.hpp"
#include "skein/probe.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

constexpr double kPi = 3.14159265358979323846;
/// Round-off of a solve and a velocity sum over a few hundred horseshoes, relative to V.
constexpr double kRoundOff = 1e-10;

/// A cambered, tapered, swept wing with dihedral: the boundary condition is not trivially met by symmetry.
Case SweptWing(double alpha_deg, double beta_deg = 0.0) {
  Surface w = testing::TaperedWing(5.0, 0.8, 0.5, 20.0, testing::Mesh(4, 10), testing::Naca4(2, 4));
  w.sections.back().leading_edge[2] = 0.2;
  return testing::WingCase(w, {alpha_deg}, {beta_deg});
}

std::vector<Probe> ProbesAt(const PointArray& points) {
  std::vector<Probe> out;
  for (std::size_t i = 0; i < points.size(); ++i) out.push_back({"p" + std::to_string(i), points[i], {}});
  return out;
}

double Dot(const Vec3& a, const Vec3& b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }

// Flow tangency is what the solve imposes at the control points (conventions.md, "The lattice"): the probed
// velocity there must have no component along the normal, with sideslip, body rates and Prandtl-Glauert
// compressibility (whose induced u maps back as u / beta) alike.
TEST(Probe, VelocityAtTheControlPointsIsTangentToTheSurface) {
  struct Flow {
    double alpha, beta, mach;
    Vec3 rates;
  };
  for (const Flow& f : {Flow{4.0, 0.0, 0.0, {0.0, 0.0, 0.0}}, Flow{6.0, 5.0, 0.0, {0.3, -0.2, 0.1}},
                        Flow{3.0, 0.0, 0.6, {0.0, 0.0, 0.0}}, Flow{3.0, -4.0, 0.5, {0.0, 0.4, 0.0}}}) {
    Case c = SweptWing(f.alpha, f.beta);
    c.flight.mach = f.mach;
    c.flight.rates = f.rates;
    c.flight.speed = 20.0;
    const Lattice lat = BuildLattice(c);
    c.probes = ProbesAt(lat.control);
    const PointResult p = skein::Run(c, {}).points.front();
    ASSERT_EQ(p.probes.size(), lat.panels());
    for (std::size_t i = 0; i < lat.panels(); ++i) {
      ASSERT_TRUE(p.probes[i].velocity.has_value()) << p.probes[i].note;
      EXPECT_NEAR(Dot(*p.probes[i].velocity, lat.normal[i]), 0.0, kRoundOff)
          << "panel " << i << " at alpha " << f.alpha << ", beta " << f.beta << ", mach " << f.mach;
    }
  }
}

// The half model (symmetric and antisymmetric systems) and the full lattice give the same flow everywhere,
// mirrored halves and ground images included: the probe sums over every horseshoe of the full lattice.
TEST(Probe, HalfModelAndFullModelGiveTheSameFlow) {
  Case c = SweptWing(5.0);
  c.ground.enabled = true;
  c.ground.height_z = -0.6;
  c.probes = {{"tail", {3.0, 0.4, 0.3}, {}}, {"left", {1.0, -1.7, -0.2}, {}}, {"nose", {-1.0, 0.0, 0.0}, {}},
              {"below", {0.5, 0.9, -0.5}, {}}};
  RunOptions half, full;
  full.allow_half_model = false;
  const Results a = skein::Run(c, half), b = skein::Run(c, full);
  ASSERT_TRUE(a.mesh.half_model);
  ASSERT_FALSE(b.mesh.half_model);
  for (std::size_t k = 0; k < c.probes.size(); ++k) {
    const ProbeResult &pa = a.points[0].probes[k], &pb = b.points[0].probes[k];
    ASSERT_TRUE(pa.velocity && pb.velocity) << pa.note << pb.note;
    for (std::size_t j = 0; j < 3; ++j) EXPECT_NEAR((*pa.velocity)[j], (*pb.velocity)[j], kRoundOff) << pa.name;
    EXPECT_NEAR(*pa.downwash_deg, *pb.downwash_deg, 1e-8) << pa.name;
  }
}

// The image method (C. Wieselsberger, "Wing resistance near the ground", NACA TM 77, 1922): the image
// horseshoes make the induced flow symmetric about the ground plane, so it has no component through it.
TEST(Probe, InducedFlowDoesNotCrossTheGroundPlane) {
  Case c = SweptWing(6.0);
  c.ground.enabled = true;
  c.ground.height_z = -0.4;
  for (double x : {-1.0, 0.3, 1.0, 4.0})
    for (double y : {-2.0, 0.35, 1.1})
      c.probes.push_back({"g" + std::to_string(c.probes.size()), {x, y, c.ground.height_z}, {}});
  const PointResult p = skein::Run(c, {}).points.front();
  const double onset_w = std::sin(6.0 * kPi / 180.0);
  double largest = 0.0;
  for (const ProbeResult& pr : p.probes) {
    ASSERT_TRUE(pr.velocity.has_value()) << pr.note;
    EXPECT_NEAR((*pr.velocity)[2] - onset_w, 0.0, kRoundOff) << pr.name;
    largest = std::max(largest, std::abs((*pr.velocity)[0] - std::cos(6.0 * kPi / 180.0)));
  }
  EXPECT_GT(largest, 1e-3) << "the probes feel the wing";
}

// Far from the aircraft the air moves with the freestream: V = V_inf / V, no turning, q / q_inf = 1 (common
// practice: the induced velocity of a lattice decays with distance).
TEST(Probe, FarAheadTheFlowIsTheFreestream) {
  Case c = SweptWing(5.0, 3.0);
  c.probes = {{"far", {-2000.0, 10.0, 5.0}, {}}};
  const PointResult p = skein::Run(c, {}).points.front();
  const ProbeResult& pr = p.probes[0];
  ASSERT_TRUE(pr.velocity.has_value());
  const double a = 5.0 * kPi / 180.0, b = 3.0 * kPi / 180.0;
  EXPECT_NEAR((*pr.velocity)[0], std::cos(a) * std::cos(b), 1e-6);
  EXPECT_NEAR((*pr.velocity)[1], -std::sin(b), 1e-6);
  EXPECT_NEAR((*pr.velocity)[2], std::sin(a) * std::cos(b), 1e-6);
  EXPECT_NEAR(*pr.downwash_deg, 0.0, 1e-4);
  EXPECT_NEAR(*pr.sidewash_deg, 0.0, 1e-4);
  EXPECT_NEAR(*pr.q_ratio, 1.0, 1e-6);
}

// The downwash's sign (probe.hpp): behind a lifting wing the flow is turned down (positive downwash), ahead of it
// up (common practice: the upwash ahead of a bound vortex, the downwash behind it).
TEST(Probe, DownwashIsPositiveBehindALiftingWingAndNegativeAheadOfIt) {
  Case c = SweptWing(5.0);
  c.probes = {{"behind", {4.0, 0.5, 0.0}, {}}, {"ahead", {-0.6, 0.5, 0.0}, {}}};
  const PointResult p = skein::Run(c, {}).points.front();
  ASSERT_GT(p.CL, 0.1);
  ASSERT_TRUE(p.probes[0].downwash_deg && p.probes[1].downwash_deg) << p.probes[0].note << p.probes[1].note;
  EXPECT_GT(*p.probes[0].downwash_deg, 0.5);
  EXPECT_LT(*p.probes[1].downwash_deg, -0.1);
  // The local velocity's own components say the same: its angle below the freestream direction.
  const Vec3 v = *p.probes[0].velocity;
  const double a = 5.0 * kPi / 180.0;
  EXPECT_NEAR(*p.probes[0].downwash_deg, (a - std::atan2(v[2], v[0])) * 180.0 / kPi, 1e-9);
  EXPECT_NEAR(*p.probes[0].q_ratio, Dot(v, v), 1e-15);
}

// The sidewash's sign (probe.hpp): the right wing's tip vortex of a lifting wing turns about +x (its circulation
// runs downstream), so behind the wing the air above it moves inboard (toward -y: negative sidewash) and the air
// below it outboard (common practice: the rolling-up tip vortices).
TEST(Probe, SidewashTurnsInboardAboveAndOutboardBelowTheRightTipVortex) {
  Case c = SweptWing(6.0);
  c.mesh.wake = WakeDirection::x_axis;
  const double tip_y = 2.5, tip_z = 0.2;
  c.probes = {{"above", {6.0, tip_y, tip_z + 0.3}, {}}, {"below", {6.0, tip_y, tip_z - 0.3}, {}}};
  const PointResult p = skein::Run(c, {}).points.front();
  ASSERT_TRUE(p.probes[0].sidewash_deg && p.probes[1].sidewash_deg);
  EXPECT_LT(*p.probes[0].sidewash_deg, -0.5) << "above the right tip vortex the air moves toward -y (inboard)";
  EXPECT_GT(*p.probes[1].sidewash_deg, 0.5) << "below it toward +y (outboard)";
}

// A probe on a vortex line gets a note and no values, never a NaN; one just outside the core gets values.
TEST(Probe, AProbeInAVortexCoreGetsANoteAndNoValues) {
  Case c = SweptWing(4.0);
  const Lattice lat = BuildLattice(c);
  const std::size_t j = lat.panels() / 2 + 1;
  const Vec3 mid{0.5 * (lat.a.x[j] + lat.b.x[j]), 0.5 * (lat.a.y[j] + lat.b.y[j]), 0.5 * (lat.a.z[j] + lat.b.z[j])};
  const Vec3 te = lat.te_b[j];
  const double eps = std::sqrt(std::sqrt(lat.core4[j]));
  c.probes = {{"bound", mid, {}},
              {"corner", lat.a[j], {}},
              {"leg", {te[0] + 3.0, te[1], te[2]}, {}},  // on the semi-infinite leg (x-axis wake below)
              {"near", {mid[0], mid[1], mid[2] + 2.0 * eps}, {}},
              {"clear", {mid[0], mid[1], mid[2] + 0.2}, {}}};
  c.mesh.wake = WakeDirection::x_axis;
  c.surfaces[0].mesh.wake = WakeDirection::x_axis;
  const PointResult p = skein::Run(c, {}).points.front();
  for (std::size_t k = 0; k < 4; ++k) {
    const ProbeResult& pr = p.probes[k];
    EXPECT_TRUE(pr.in_core) << pr.name;
    EXPECT_FALSE(pr.velocity || pr.downwash_deg || pr.sidewash_deg || pr.q_ratio) << pr.name;
    EXPECT_NE(pr.note.find("probe \"" + pr.name + "\" lies within 3 core radii of"), std::string::npos) << pr.note;
    EXPECT_NE(pr.note.find("surface \"wing\""), std::string::npos) << pr.note;
  }
  EXPECT_NE(p.probes[0].note.find("the bound vortex"), std::string::npos) << p.probes[0].note;
  EXPECT_NE(p.probes[2].note.find("a trailing leg"), std::string::npos) << p.probes[2].note;
  EXPECT_FALSE(p.probes[4].in_core);
  ASSERT_TRUE(p.probes[4].velocity.has_value());
  for (double v : *p.probes[4].velocity) EXPECT_TRUE(std::isfinite(v));
  // The point says so in its warnings, once per probe in a core.
  std::size_t noted = 0;
  for (const std::string& w : p.warnings) if (w.find("core radii") != std::string::npos) ++noted;
  EXPECT_EQ(noted, 4u);
}

TEST(Probe, ACommandLineProbeIsNameEqualsThreeCoordinates) {
  const Probe p = ParseProbeArgument("pitot=-0.4,0,5e-2");
  EXPECT_EQ(p.name, "pitot");
  EXPECT_EQ(p.point, (Vec3{-0.4, 0.0, 0.05}));
  EXPECT_EQ(p.where.line, 0);
  EXPECT_EQ(ParseProbeArgument("prop disc=1,2,3").name, "prop disc");
}

TEST(Probe, ABadCommandLineProbeIsOneLineNamingWhatWasExpected) {
  const std::string syntax = "expected NAME=X,Y,Z (metres, geometry axes), e.g. --probe pitot=-0.4,0,0.05";
  const std::vector<std::pair<std::string, std::string>> bad = {
      {"pitot", "--probe \"pitot\": " + syntax},
      {"=1,2,3", "--probe \"=1,2,3\": the name before '=' is empty; " + syntax},
      {"pitot=1,2", "--probe \"pitot=1,2\": expected 3 coordinates X,Y,Z after '=', got 2; " + syntax},
      {"pitot=1,2,3,4", "--probe \"pitot=1,2,3,4\": expected 3 coordinates X,Y,Z after '=', got 4; " + syntax},
      {"pitot=1,a,3", "--probe \"pitot=1,a,3\": coordinate Y (\"a\") is not a finite number; " + syntax},
      {"pitot=1,,3", "--probe \"pitot=1,,3\": coordinate Y (\"\") is not a finite number; " + syntax},
      {"pitot=nan,0,0", "--probe \"pitot=nan,0,0\": coordinate X (\"nan\") is not a finite number; " + syntax},
      {"pitot=1,2,1e999", "--probe \"pitot=1,2,1e999\": coordinate Z (\"1e999\") is not a finite number; " + syntax},
      {"a\nb=1,2,3x", "--probe \"a\\u000Ab=1,2,3x\": coordinate Z (\"3x\") is not a finite number; " + syntax},
  };
  for (const auto& [text, message] : bad) {
    try {
      ParseProbeArgument(text);
      ADD_FAILURE() << text << ": accepted";
    } catch (const InputError& e) {
      EXPECT_EQ(std::string(e.what()), message);
      EXPECT_EQ(std::string(e.what()).find('\n'), std::string::npos);
    }
  }
}

TEST(Probe, ACommandLineProbeMustHaveANewNameAndLieAboveTheGround) {
  Case c = ReadCaseText(R"([ground]
height_z = -1.0
[[surface]]
name = "wing"
  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 0.3
  [[surface.section]]
  leading_edge = [0.0, 1.0, 0.0]
  chord = 0.3

[[probe]]
name = "pitot"
point = [-0.5, 0.0, 0.0]
)",
                        "g.toml");
  ASSERT_EQ(c.probes.size(), 1u);
  try {
    AddProbe(c, ParseProbeArgument("pitot=1,0,0"));
    ADD_FAILURE() << "a second probe named pitot was accepted";
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), "--probe \"pitot\": name already used by the [[probe]] at line 12 of the case file");
  }
  AddProbe(c, ParseProbeArgument("tail=2,0,0.1"));
  try {
    AddProbe(c, ParseProbeArgument("tail=1,0,0"));
    ADD_FAILURE();
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), "--probe \"tail\": name already used by an earlier --probe");
  }
  try {
    AddProbe(c, ParseProbeArgument("low=1,0,-1.5"));
    ADD_FAILURE();
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), "--probe \"low\": point z = -1.5 is not above the ground plane z = -1");
  }
  EXPECT_EQ(c.probes.size(), 2u);
}

TEST(Probe, TheEchoOfACaseKeepsItsProbes) {
  const Case c = ReadCaseText(R"([[surface]]
name = "wing"
  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 0.3
  [[surface.section]]
  leading_edge = [0.0, 1.0, 0.0]
  chord = 0.3
[[probe]]
name = "pitot"
point = [-0.5, 0.0, 0.02]
[[probe]]
name = "fin \"top\""
point = [1.5, 0, 0.4]
)",
                              "e.toml");
  std::ostringstream echo;
  WriteCaseToml(c, echo);
  const Case back = ReadCaseText(echo.str(), "echo.toml");
  ASSERT_EQ(back.probes.size(), 2u);
  for (std::size_t k = 0; k < 2; ++k) {
    EXPECT_EQ(back.probes[k].name, c.probes[k].name);
    EXPECT_EQ(back.probes[k].point, c.probes[k].point);
  }
}

}  // namespace
}  // namespace skein
