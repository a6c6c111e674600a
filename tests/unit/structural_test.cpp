// Spanwise shear force and bending moment (structural.hpp).
//
// Checks:
//  - statics (common practice): the root shear and root bending moment computed station by station from the
//    strip loads equal the normal force of the whole half-wing and its moment about the root, which the loads
//    stage computes independently from every panel's Kutta-Joukowski force (surface CL, CD, CY, Cl, Cn);
//  - the elliptic span loading (common practice): the half-span lift L/2 acts at the centroid of a semi-ellipse,
//    4 s / (3 pi) from the root, so the root bending moment is L b / (3 pi).
#include <cmath>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

constexpr double kPi = 3.14159265358979323846;

Results Solve(const Case& c) { return skein::Run(c, {}); }

// A single swept, tapered half-wing with dihedral (not mirrored), at 5 deg: every force component is there.
TEST(StructuralLoads, RootValuesAreTheHalfWingsForceAndMomentAboutTheRoot) {
  const double rho = 0.9, speed = 60.0, dihedral = 7.0 * testing::kDeg, alpha = 5.0 * testing::kDeg;
  Surface wing = testing::TaperedWing(8.0, 1.4, 0.45, 25.0, testing::Mesh(6, 18));
  wing.symmetric = false;
  const double half = wing.sections[1].leading_edge[1];
  wing.sections[1].leading_edge[2] = half * std::tan(dihedral);
  Case c = testing::WingCase(wing, {5.0});
  c.flight.density = rho;
  c.flight.speed = speed;
  c.flight.speed_given = true;
  const Results r = Solve(c);
  const PointResult& p = r.points.front();
  ASSERT_TRUE(p.surfaces[0].structural.has_value());
  const StructuralLoads& sv = *p.surfaces[0].structural;
  const double qs = 0.5 * rho * speed * speed * c.reference.area;
  // Total force from the coefficients (wind axes at beta = 0: drag (cos a, 0, sin a), lift (-sin a, 0, cos a),
  // side (0, 1, 0)), and the moment about the x axis through the origin (the root) from the stability-axis
  // roll and yaw moments: M_x = -(cos a Cl - sin a Cn) q S b.
  const double ca = std::cos(alpha), sa = std::sin(alpha);
  const double fy = qs * p.CY, fz = qs * (p.CL * ca + p.CD_induced_nearfield * sa);
  const Vec3 n{0.0, -std::sin(dihedral), std::cos(dihedral)};
  const double mx = -(ca * p.Cl - sa * p.Cn) * qs * c.reference.span;
  EXPECT_NEAR(sv.root_shear_N / (fy * n[1] + fz * n[2]), 1.0, 1e-10);
  EXPECT_NEAR(sv.root_bending_Nm / mx, 1.0, 1e-10);
  EXPECT_FALSE(sv.mirrored_root_bending_Nm.has_value());
  // The tables: root to tip, shear and bending falling to zero at the tip.
  ASSERT_EQ(sv.station.size(), 19u);
  EXPECT_DOUBLE_EQ(sv.station.front(), 0.0);
  EXPECT_NEAR(sv.station.back(), half / std::cos(dihedral), 1e-9);
  EXPECT_EQ(sv.shear_N.back(), 0.0);
  for (std::size_t k = 1; k < sv.station.size(); ++k) {
    EXPECT_GT(sv.station[k], sv.station[k - 1]);
    EXPECT_LT(sv.shear_N[k], sv.shear_N[k - 1]);
    EXPECT_LT(sv.bending_Nm[k], sv.bending_Nm[k - 1]);
  }
}

TEST(StructuralLoads, EllipticWingRootBendingIsLiftTimesSpanOverThreePi) {
  const double span = 12.0, c0 = 4.0 * span / (kPi * 10.0);
  Case c = testing::WingCase(testing::EllipticWing(span, c0, 40, 4), {4.0});
  c.flight.density = 1.225;
  c.flight.speed = 40.0;
  c.flight.speed_given = true;
  const Results r = Solve(c);
  const PointResult& p = r.points.front();
  const StructuralLoads& sv = *p.surfaces[0].structural;
  const double lift = p.CL * 0.5 * 1.225 * 40.0 * 40.0 * c.reference.area;
  EXPECT_NEAR(sv.root_shear_N / (0.5 * lift), 1.0, 2e-3);  // normal force vs lift at 4 deg: cos(4 deg) terms
  EXPECT_NEAR(sv.root_bending_Nm / (lift * span / (3.0 * kPi)), 1.0, 0.01);
  // Symmetric flight: the mirrored half carries the same loads.
  ASSERT_TRUE(sv.mirrored_root_bending_Nm.has_value());
  EXPECT_NEAR(*sv.mirrored_root_bending_Nm / sv.root_bending_Nm, 1.0, 1e-9);
}

TEST(StructuralLoads, ScaleWithDynamicPressureAndAbsentWithoutSpeed) {
  Case c = testing::WingCase(testing::RectangularWing(6.0, 1.0, testing::Mesh(4, 10)), {3.0});
  EXPECT_FALSE(Solve(c).points.front().surfaces[0].structural.has_value());
  c.flight.speed_given = true;
  c.flight.speed = 20.0;
  const double m20 = Solve(c).points.front().surfaces[0].structural->root_bending_Nm;
  c.flight.speed = 40.0;
  c.flight.density = 0.5;
  const double m40 = Solve(c).points.front().surfaces[0].structural->root_bending_Nm;
  EXPECT_NEAR(m40 / m20, (0.5 * 1600.0) / (1.225 * 400.0), 1e-12);
}

// In sideslip the halves differ; the mirrored root values follow the other half.
TEST(StructuralLoads, MirroredHalfInRoll) {
  Case c = testing::WingCase(testing::RectangularWing(6.0, 1.0, testing::Mesh(4, 10)), {3.0});
  c.flight.speed_given = true;
  c.flight.speed = 30.0;
  c.flight.rates = {0.5, 0.0, 0.0};  // roll to the right: the right wing goes down and meets more lift
  const StructuralLoads sv = *Solve(c).points.front().surfaces[0].structural;
  EXPECT_GT(sv.root_bending_Nm, *sv.mirrored_root_bending_Nm);
}

}  // namespace
}  // namespace skein
