// Tests for control surfaces: how the mesher places them (lattice.cpp) and the signs of their effect, each
// against the rule conventions.md writes down ("Panel normals and controls"):
//  - a positive deflection turns the control about its hinge line by the right-hand rule about the hinge axis
//    taken from the first section toward the last, so its trailing edge moves toward -n (down on a wing, toward
//    +y on a fin given bottom to top);
//  - on a mirrored surface "same" deflects both halves alike, "opposite" deflects the mirrored half the other
//    way (the given right half takes the given sign);
//  - the hinge line and the ends of span_fraction are mesh lines.
// And the sign consequences in conventions.md's axes: positive elevator (trailing edge down) lifts and pitches
// the nose down; a positive aileron (right trailing edge down, left up) raises the right wing, a negative
// rolling moment (positive Cl is right wing down); a positive rudder (trailing edge to the right) pushes the
// fin to the left and yaws the nose right (positive Cn).
#include <cmath>
#include <vector>

#include <gtest/gtest.h>

#include "../support/aircraft.hpp"
#include "skein/lattice.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

using testing::ControlNamed;
using testing::MakeControl;
using testing::Mesh;
using testing::TwoSectionSurface;

constexpr double kDeg = 3.14159265358979323846 / 180.0;
// Geometry built from exact inputs: round-off of a few operations on lengths of order one.
constexpr double kGeometry = 1e-12;

Vec3 At(const PointArray& p, std::size_t i) { return p[i]; }

/// A flat, unswept rectangular wing 8 m x 1 m with one control, and a case around it.
Case FlatWingWith(const Control& control) {
  Surface w = TwoSectionSurface("wing", true, {0.0, 0.0, 0.0}, 1.0, {0.0, 4.0, 0.0}, 1.0,
                                Mesh(8, 12, Spacing::uniform, Spacing::uniform));
  w.controls.push_back(control);
  std::vector<Surface> s;
  s.push_back(std::move(w));
  return testing::MakeCase(std::move(s), {3.0});
}

TEST(ControlMesh, HingeAndSpanEndsAreMeshLines) {
  const Control flap = MakeControl("flap", 0.7, 0.15, 0.55, 0.0, false);
  const Lattice lat = BuildLattice(FlatWingWith(flap));
  bool saw_start = false, saw_end = false;
  for (const Strip& st : lat.strips) {
    if (st.mirror_of >= 0) continue;  // the given half, y >= 0
    const double y0 = st.te_left[1], y1 = st.te_right[1];
    if (std::abs(y0 - 0.15 * 4.0) < kGeometry) saw_start = true;
    if (std::abs(y1 - 0.55 * 4.0) < kGeometry) saw_end = true;
    const bool inside = 0.5 * (y0 + y1) > 0.15 * 4.0 && 0.5 * (y0 + y1) < 0.55 * 4.0;
    bool hinge_line = false;
    for (int r = 0; r < st.panels; ++r) {
      const std::size_t i = st.first_panel + static_cast<std::size_t>(r);
      const double x_le = At(lat.corner_le_a, i)[0];
      EXPECT_EQ(lat.control_of[i] >= 0, inside && x_le > 0.7 - kGeometry) << "strip at y " << y0 << " panel " << r;
      if (inside && std::abs(x_le - 0.7) < kGeometry) hinge_line = true;
    }
    EXPECT_EQ(hinge_line, inside) << "strip at y " << y0;
  }
  EXPECT_TRUE(saw_start);
  EXPECT_TRUE(saw_end);
}

TEST(ControlMesh, PositiveDeflectionTurnsTheTrailingEdgeDownOnAWing) {
  for (bool opposite : {false, true}) {
    const Lattice lat = BuildLattice(FlatWingWith(MakeControl("c", 0.75, 0.0, 1.0, 10.0, opposite)));
    for (std::size_t i = 0; i < lat.panels(); ++i) {
      if (lat.control_of[i] < 0) continue;
      const bool right = At(lat.control, i)[1] > 0.0;
      // Hinge axis +y (root to tip): the normal (0, 0, 1) turns to (sin d, 0, cos d): the surface behind the
      // hinge slopes down toward the trailing edge. "opposite" turns the left half by -d.
      const double d = (right || !opposite ? 10.0 : -10.0) * kDeg;
      EXPECT_NEAR(lat.normal.x[i], std::sin(d), kGeometry);
      EXPECT_NEAR(lat.normal.y[i], 0.0, kGeometry);
      EXPECT_NEAR(lat.normal.z[i], std::cos(d), kGeometry);
    }
  }
}

TEST(ControlMesh, PositiveRudderTurnsTheTrailingEdgeTowardPlusYOnAFinGivenBottomToTop) {
  Surface fin = TwoSectionSurface("fin", false, {0.0, 0.0, 0.0}, 1.0, {0.3, 0.0, 1.5}, 0.6, Mesh(6, 6));
  fin.controls.push_back(MakeControl("rudder", 0.7, 0.0, 1.0, 8.0, false));
  std::vector<Surface> s;
  s.push_back(std::move(fin));
  const Lattice lat = BuildLattice(testing::MakeCase(std::move(s)));
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    if (lat.control_of[i] < 0) {
      EXPECT_NEAR(lat.normal.y[i], -1.0, kGeometry);  // chord x span = (1,0,0) x (0,0,1) = -y
      continue;
    }
    // Hinge line from (0.7, 0, 0) to (0.3 + 0.7 * 0.6, 0, 1.5), bottom to top: k = (kx, 0, kz). Rodrigues'
    // rotation of n = (0, -1, 0) by +8 deg about k: cos(d) n + sin(d) k x n = (kz sin d, -cos d, -kx sin d),
    // while the chord (1, 0, 0) gains sin(d) k x (1, 0, 0) = (0, kz sin d, 0): the trailing edge moves to +y.
    const double hx = 0.3 + 0.7 * 0.6 - 0.7, hz = 1.5, len = std::hypot(hx, hz);
    const double kx = hx / len, kz = hz / len, d = 8.0 * kDeg;
    EXPECT_NEAR(lat.normal.x[i], kz * std::sin(d), kGeometry);
    EXPECT_NEAR(lat.normal.y[i], -std::cos(d), kGeometry);
    EXPECT_NEAR(lat.normal.z[i], -kx * std::sin(d), kGeometry);
  }
}

// normal_rate is d n / d delta per radian: it must agree with a central difference of the normals of two
// lattices meshed at delta +- h, for the given and the mirrored half, "same" and "opposite", on a surface with
// dihedral and sweep so that the hinge axis is not along a coordinate axis.
TEST(ControlMesh, NormalRateIsTheDerivativeOfTheNormal) {
  constexpr double kStepDeg = 1e-3;
  for (bool opposite : {false, true}) {
    auto mesh_at = [&](double deflection_deg) {
      Surface w = TwoSectionSurface("wing", true, {0.0, 0.0, 0.0}, 1.4, {0.8, 4.0, 0.5}, 0.7, Mesh(6, 10),
                                    testing::Naca4(4, 4), -2.0);
      w.controls.push_back(MakeControl("c", 0.7, 0.3, 0.9, deflection_deg, opposite));
      std::vector<Surface> s;
      s.push_back(std::move(w));
      return BuildLattice(testing::MakeCase(std::move(s)));
    };
    const Lattice at = mesh_at(6.0), plus = mesh_at(6.0 + kStepDeg), minus = mesh_at(6.0 - kStepDeg);
    int controlled = 0;
    for (std::size_t i = 0; i < at.panels(); ++i) {
      const Vec3 fd = {(plus.normal.x[i] - minus.normal.x[i]) / (2.0 * kStepDeg * kDeg),
                       (plus.normal.y[i] - minus.normal.y[i]) / (2.0 * kStepDeg * kDeg),
                       (plus.normal.z[i] - minus.normal.z[i]) / (2.0 * kStepDeg * kDeg)};
      const Vec3 rate = At(at.normal_rate, i);
      for (std::size_t k = 0; k < 3; ++k) EXPECT_NEAR(rate[k], fd[k], 1e-8) << "panel " << i << " axis " << k;
      if (at.control_of[i] >= 0) ++controlled;
    }
    EXPECT_GT(controlled, 0);
  }
}

double ControlValue(const PointResult& p, const std::string& control, const char* coefficient) {
  for (const auto& [name, v] : p.control_derivatives)
    if (name == control) return *v.Get(coefficient);
  ADD_FAILURE() << "no control " << control;
  return NAN;
}

TEST(ControlSigns, ElevatorAileronAndRudderActAsConventionsSay) {
  const Case c = testing::TestAircraft(WakeDirection::x_axis);
  const PointResult p = skein::Run(c, {}).points.front();
  // Elevator, trailing edge down: more tail lift, nose down.
  EXPECT_GT(ControlValue(p, "elevator", "CL"), 0.0);
  EXPECT_LT(ControlValue(p, "elevator", "Cm"), 0.0);
  // Aileron, right trailing edge down: right wing up, negative rolling moment.
  EXPECT_LT(ControlValue(p, "aileron", "Cl"), 0.0);
  // Rudder, trailing edge right: fin pushed left (negative side force), nose right (positive yawing moment).
  EXPECT_LT(ControlValue(p, "rudder", "CY"), 0.0);
  EXPECT_GT(ControlValue(p, "rudder", "Cn"), 0.0);
}

// A mirrored "opposite" pair: the configuration with the deflection reversed is the mirror image of the
// original, and CL and Cm are mirror-invariant, so CL(delta) = CL(-delta): the first derivative vanishes.
TEST(ControlSigns, AnAileronPairChangesNeitherLiftNorPitchingMoment) {
  constexpr double kZero = 1e-10;  // the acceptance bound; round-off is about 1e-15 here
  Case c = testing::TestAircraft(WakeDirection::x_axis);
  const PointResult p = skein::Run(c, {}).points.front();
  EXPECT_NEAR(ControlValue(p, "aileron", "CL"), 0.0, kZero);
  EXPECT_NEAR(ControlValue(p, "aileron", "Cm"), 0.0, kZero);
  EXPECT_LT(ControlValue(p, "aileron", "Cl"), -0.05);  // and it does roll the aircraft

  // Full solutions at +-5 deg: the changes of CL and Cm are equal (even in delta) and second order.
  auto solve_at = [&](double d) {
    Case k = c;
    ControlNamed(k, "aileron").deflection_deg = d;
    return skein::Run(k, {}).points.front();
  };
  const PointResult p0 = solve_at(0.0), pp = solve_at(5.0), pm = solve_at(-5.0), p2 = solve_at(10.0);
  EXPECT_NEAR(pp.CL, pm.CL, kZero);
  EXPECT_NEAR(pp.Cm, pm.Cm, kZero);
  EXPECT_NEAR(pp.Cl, -pm.Cl, kZero);
  // Even function: doubling delta quadruples the change (to within the quartic term, a few percent at 10 deg).
  EXPECT_NEAR((p2.CL - p0.CL) / (pp.CL - p0.CL), 4.0, 0.1);
}

}  // namespace
}  // namespace skein
