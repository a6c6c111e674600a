// Tests for run.hpp: the order of sweep points, one factorisation per wake geometry, a sweep point equal to
// the same point solved alone, what the airspeed does and does not change, and the size checks made before
// anything is allocated. Conventions: conventions.md; the sweep order and grouping: run.hpp.
#include "skein/run.hpp"

#include <cmath>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/error.hpp"

namespace skein {
namespace {

using testing::Mesh;

// Coefficients are sums of a few hundred terms of order one.
constexpr double kRoundOff = 1e-12;

Case Wing(WakeDirection wake, std::vector<double> alpha, std::vector<double> beta = {0.0}) {
  Surface w = testing::TaperedWing(7.0, 1.3, 0.5, 15.0, Mesh(4, 8, Spacing::cosine, Spacing::cosine, wake),
                                   testing::Naca4(2, 4));
  w.sections[1].leading_edge[2] = 0.3;
  Case c = testing::WingCase(w, std::move(alpha), std::move(beta));
  c.mesh.wake = wake;
  return c;
}

TEST(Run, PointsComeInSweepOrderAlphaFastest) {
  const Results r = skein::Run(Wing(WakeDirection::x_axis, {-2.0, 3.0, 8.0}, {0.0, 5.0}), {});
  ASSERT_EQ(r.points.size(), 6u);
  const double alpha[] = {-2.0, 3.0, 8.0, -2.0, 3.0, 8.0}, beta[] = {0.0, 0.0, 0.0, 5.0, 5.0, 5.0};
  for (std::size_t p = 0; p < 6; ++p) {
    EXPECT_EQ(r.points[p].alpha_deg, alpha[p]);
    EXPECT_EQ(r.points[p].beta_deg, beta[p]);
  }
  // Lift grows with alpha.
  EXPECT_LT(r.points[0].CL, r.points[1].CL);
  EXPECT_LT(r.points[1].CL, r.points[2].CL);
}

TEST(Run, OneFactorisationPerWakeGeometry) {
  const Results fixed = skein::Run(Wing(WakeDirection::x_axis, {-2.0, 3.0, 8.0}, {0.0, 5.0}), {});
  EXPECT_EQ(fixed.mesh.factorisations, 1);
  const Results follows = skein::Run(Wing(WakeDirection::freestream, {-2.0, 3.0, 8.0}, {0.0, 5.0}), {});
  EXPECT_EQ(follows.mesh.factorisations, 6);
  // A symmetric wing: the half model halves the unknowns.
  EXPECT_TRUE(fixed.mesh.half_model);
  EXPECT_EQ(fixed.mesh.unknowns, fixed.mesh.panels / 2);
}

TEST(Run, ASweepPointEqualsThePointSolvedAlone) {
  for (const WakeDirection wake : {WakeDirection::x_axis, WakeDirection::freestream}) {
    const Results sweep = skein::Run(Wing(wake, {-2.0, 3.0, 8.0}, {4.0}), {});
    const Results alone = skein::Run(Wing(wake, {8.0}, {4.0}), {});
    const PointResult &s = sweep.points[2], &a = alone.points[0];
    EXPECT_NEAR(s.CL, a.CL, kRoundOff);
    EXPECT_NEAR(s.CY, a.CY, kRoundOff);
    EXPECT_NEAR(s.Cl, a.Cl, kRoundOff);
    EXPECT_NEAR(s.Cm, a.Cm, kRoundOff);
    EXPECT_NEAR(s.Cn, a.Cn, kRoundOff);
    EXPECT_NEAR(s.CD_induced, a.CD_induced, kRoundOff);
  }
}

TEST(Run, TheFreestreamWakeFollowsAlphaAndTheXAxisWakeDoesNot) {
  // At alpha = 0 and beta = 0 both wakes run along +x: the same answer. At 10 deg they differ a little.
  const PointResult x0 = skein::Run(Wing(WakeDirection::x_axis, {0.0}), {}).points[0];
  const PointResult f0 = skein::Run(Wing(WakeDirection::freestream, {0.0}), {}).points[0];
  EXPECT_NEAR(x0.CL, f0.CL, kRoundOff);
  const PointResult x10 = skein::Run(Wing(WakeDirection::x_axis, {10.0}), {}).points[0];
  const PointResult f10 = skein::Run(Wing(WakeDirection::freestream, {10.0}), {}).points[0];
  EXPECT_GT(std::abs(x10.CL - f10.CL), 1e-5);
  EXPECT_LT(std::abs(x10.CL - f10.CL), 0.02 * x10.CL);  // a second-order effect
  const WakeGeometry w = WakeFor(Wing(WakeDirection::freestream, {10.0}), 10.0, 0.0);
  EXPECT_NEAR(w.direction[0], std::cos(10.0 * testing::kDeg), 1e-15);
  EXPECT_NEAR(w.direction[2], std::sin(10.0 * testing::kDeg), 1e-15);
  EXPECT_EQ(w.direction[1], 0.0);  // exactly, so that the half model applies
}

TEST(Run, CoefficientsDependOnRatesOnlyThroughRateOverSpeed) {
  Case slow = Wing(WakeDirection::x_axis, {4.0}, {2.0});
  slow.flight.speed = 20.0;
  slow.flight.rates = {0.4, 0.1, -0.2};
  Case fast = slow;
  fast.flight.speed = 50.0;
  for (double& r : fast.flight.rates) r *= 2.5;
  const PointResult a = skein::Run(slow, {}).points[0], b = skein::Run(fast, {}).points[0];
  EXPECT_NEAR(a.CL, b.CL, kRoundOff);
  EXPECT_NEAR(a.Cl, b.Cl, kRoundOff);
  EXPECT_NEAR(a.Cn, b.Cn, kRoundOff);
  // And the rates do something: roll rate against roll damping.
  Case still = slow;
  still.flight.rates = {0.0, 0.0, 0.0};
  EXPECT_GT(std::abs(skein::Run(still, {}).points[0].Cl - a.Cl), 1e-3);
}

TEST(Run, RefusesATooLargeMeshBeforeAllocating) {
  const Case c = Wing(WakeDirection::x_axis, {4.0});
  RunOptions few;
  few.max_panels = 10;
  EXPECT_THROW(skein::Run(c, few), InputError);
  RunOptions small_memory;
  small_memory.memory_limit_bytes = 1000;
  EXPECT_THROW(skein::Run(c, small_memory), InputError);
  // The estimate: the matrix dominates, and the half model needs about half of it.
  EXPECT_GT(EstimateMemoryBytes(2000, 0, false), 8u * 2000u * 2000u);
  EXPECT_LT(EstimateMemoryBytes(2000, 0, true), EstimateMemoryBytes(2000, 0, false));
  EXPECT_LT(EstimateMemoryBytes(1000, 0, false), EstimateMemoryBytes(2000, 0, false));
}

}  // namespace
}  // namespace skein
