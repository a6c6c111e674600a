// Lift-curve slope of flat constant-chord wings of aspect ratio 2, unswept and sheared back 30 and 45 deg.
//
// Source: V. M. Falkner's vortex-lattice lifting-plane calculations (Aeronautical Research Council, 1948
// tables), as quoted in the lifting-surface literature: CL_alpha = 2.524, 2.480 and 2.359 per radian at 0,
// 30 and 45 deg sweep. These three values are second-hand (quoted, not read from the original report).
// Falkner's lattice was coarse (a few spanwise stations), and coarse lattices sit a few percent above
// converged lifting-surface values, so a converged lattice should land below them, within 5% (the acceptance
// figure). Helmbold's formula and lifting-line theory overestimate a rectangular wing of this aspect ratio
// (2 pi A / (2 + sqrt(A^2 + 4)) = 2.603 here): a lattice that matched them would be suspect, so the check also
// asks for a clear margin below that value.
//
// Geometry: "swept" means sheared back at constant chord, every constant-chord line (leading edge included)
// swept by the angle. The lifting-surface theory behind the tables assumes a planar wake: wake = "x-axis".
#include <cmath>
#include <map>
#include <string>

#include <fmt/format.h>
#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double kFalknerTolerance = 0.05;  // acceptance: within 5% of Falkner's values

double ClAlpha(double sweep_deg) {
  // Solved once per sweep angle for all the tests of this file.
  static std::map<double, double> solved;
  const auto it = solved.find(sweep_deg);
  if (it != solved.end()) return it->second;
  // Span 2, chord 1: A = 2. 16 chordwise x 80 spanwise per half, cosine both ways (2560 panels).
  const Case c = testing::WingCase(testing::ShearedWing(2.0, 1.0, sweep_deg, testing::Mesh(16, 80)), {0.0});
  const double a = *skein::Run(c, {}).points.at(0).derivatives.Get("CL_alpha");
  solved[sweep_deg] = a;
  return a;
}

void ExpectFalkner(double sweep_deg, double falkner) {
  const double a = ClAlpha(sweep_deg);
  ::testing::Test::RecordProperty(fmt::format("CL_alpha_{:.0f}deg", sweep_deg), fmt::format("{:.4f}", a));
  ::testing::Test::RecordProperty(fmt::format("relative_to_falkner_{:.0f}deg", sweep_deg),
                                  fmt::format("{:+.4f}", a / falkner - 1));
  EXPECT_NEAR(a / falkner, 1.0, kFalknerTolerance) << "CL_alpha " << a << " vs Falkner " << falkner;
  EXPECT_LT(a, falkner) << "a converged lattice lands below Falkner's coarse one";
}

TEST(Falkner1948, AspectRatio2Unswept) { ExpectFalkner(0.0, 2.524); }
TEST(Falkner1948, AspectRatio2Swept30) { ExpectFalkner(30.0, 2.480); }
TEST(Falkner1948, AspectRatio2Swept45) { ExpectFalkner(45.0, 2.359); }

TEST(Falkner1948, RectangularWingDoesNotReproduceHelmbold) {
  const double helmbold = 2.0 * kPi * 2.0 / (2.0 + std::sqrt(4.0 + 4.0));
  EXPECT_NEAR(helmbold, 2.603, 5e-4);
  // Measured 2.483 (4.6% below): more than 3% below is the "clear margin".
  EXPECT_LT(ClAlpha(0.0), 0.97 * helmbold);
}

TEST(Falkner1948, SweepLowersTheLiftSlope) {
  const double a0 = ClAlpha(0.0), a30 = ClAlpha(30.0), a45 = ClAlpha(45.0);
  EXPECT_GT(a0, a30);
  EXPECT_GT(a30, a45);
}

}  // namespace
}  // namespace skein
