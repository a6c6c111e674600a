// Tests for study.hpp: Richardson extrapolation, mesh scaling and the mesh-convergence study, and the Trefftz
// plane as a quadratic form.
#include "skein/study.hpp"

#include <cmath>
#include <iostream>
#include <random>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/loads.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

using study::RichardsonExtrapolate;

// ----- Richardson extrapolation on synthetic sequences f(h) = f0 + C h^p (exact recovery) -----

TEST(Richardson, RecoversLimitAndOrderOfAnExactPowerLaw) {
  // Published method: L. F. Richardson (1911), "The approximate arithmetical solution by finite differences of
  // physical problems", Phil. Trans. R. Soc. A 210: f(h) = f0 + C h^p is extrapolated exactly from three
  // meshes with a constant ratio.
  for (double p : {1.0, 1.5, 2.0, 3.0}) {
    for (double ratio : {2.0, 1.5}) {
      const double f0 = 0.4321, C = -0.37, h = 0.1;
      auto f = [&](double hh) { return f0 + C * std::pow(hh, p); };
      const auto e = RichardsonExtrapolate(f(ratio * ratio * h), f(ratio * h), f(h), ratio, 1.0);
      EXPECT_TRUE(e.order_observed) << "p " << p;
      EXPECT_NEAR(e.order, p, 1e-9) << "p " << p << " r " << ratio;
      EXPECT_NEAR(e.value, f0, 1e-12) << "p " << p << " r " << ratio;
      // Grid convergence index (Roache 1994): 1.25 |f_fine - f0| when the order is observed.
      EXPECT_NEAR(e.error_estimate, study::kSafetyObserved * std::abs(f(h) - f0), 1e-12);
      EXPECT_TRUE(e.note.empty());
    }
  }
}

TEST(Richardson, OscillatingSequenceUsesTheAssumedOrderAndSaysSo) {
  // Coarse 1.10, medium 0.90, fine 1.00: the differences change sign.
  const auto e = RichardsonExtrapolate(1.10, 0.90, 1.00, 2.0, 1.0);
  EXPECT_FALSE(e.order_observed);
  EXPECT_EQ(e.order, 1.0);
  EXPECT_NEAR(e.value, 1.00 + (1.00 - 0.90) / (2.0 - 1.0), 1e-15);
  EXPECT_NEAR(e.error_estimate, study::kSafetyAssumed * 0.10, 1e-15);
  EXPECT_NE(e.note.find("not monotone"), std::string::npos);
}

TEST(Richardson, ImplausibleObservedOrderFallsBackToAssumed) {
  // e32 / e21 = 100 gives p = log2(100) = 6.6, outside the trusted range.
  const auto e = RichardsonExtrapolate(1.0 + 100e-3 + 1e-3, 1.0 + 1e-3, 1.0, 2.0, 2.0);
  EXPECT_FALSE(e.order_observed);
  EXPECT_EQ(e.order, 2.0);
  EXPECT_NEAR(e.value, 1.0 - 1e-3 / 3.0, 1e-13);
  EXPECT_NE(e.note.find("outside"), std::string::npos);
}

TEST(Richardson, ConvergedSequenceReturnsTheFineValue) {
  const auto e = RichardsonExtrapolate(0.7, 0.5, 0.5, 2.0, 1.0);
  EXPECT_EQ(e.value, 0.5);
  EXPECT_EQ(e.error_estimate, 0.0);
  EXPECT_NE(e.note.find("round-off"), std::string::npos);
}

// ----- Mesh scaling -----

TEST(ScaleMesh, ScalesEveryCountAndRefusesFractions) {
  Case c = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.5, 5.0, testing::Mesh(4, 12)), {4.0});
  c.surfaces[0].sections[0].spanwise = 8;
  const Case d = study::ScaleMesh(c, 2.0);
  EXPECT_EQ(d.mesh.chordwise, 8);
  EXPECT_EQ(d.surfaces[0].mesh.chordwise, 8);
  EXPECT_EQ(d.surfaces[0].mesh.spanwise, 24);
  EXPECT_EQ(*d.surfaces[0].sections[0].spanwise, 16);
  const Case h = study::ScaleMesh(c, 0.25);
  EXPECT_EQ(h.surfaces[0].mesh.chordwise, 1);
  EXPECT_EQ(h.surfaces[0].mesh.spanwise, 3);
  EXPECT_THROW(study::ScaleMesh(c, 0.125), InputError);  // 4 / 8 is not a whole count
}

// ----- The mesh-convergence study on a real case -----

TEST(MeshConvergence, ExtrapolationLiesAlongTheTrendBeyondTheFinestMesh) {
  // A tapered, swept wing (our own invention) at 4 deg; meshes 2x6, 4x12, 8x24 per half, and a check mesh
  // 16x48 solved apart. The extrapolated value must continue the trend beyond the finest of the three, and the
  // next refinement must land between that finest result and the extrapolated value: the extrapolation
  // predicted both the direction and that the sequence has further to go.
  const Case c = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.45, 15.0, testing::Mesh(2, 6)), {4.0});
  study::ConvergenceOptions o;
  const study::ConvergenceStudy s = study::MeshConvergence(c, o);
  ASSERT_EQ(s.quantities.size(), 4u);
  EXPECT_EQ(s.meshes[0].scale, 1.0);
  EXPECT_EQ(s.meshes[2].scale, 4.0);
  EXPECT_EQ(s.meshes[2].chordwise, 8);
  EXPECT_EQ(s.meshes[2].spanwise, 24);
  EXPECT_EQ(s.meshes[2].panels, 16 * s.meshes[0].panels);
  const PointResult check = skein::Run(study::ScaleMesh(c, 8.0), {}).points.front();
  const double check_values[4] = {check.CL, check.CD_induced, check.Cm, *check.span_efficiency};
  for (std::size_t k = 0; k < 4; ++k) {
    const auto& q = s.quantities[k];
    SCOPED_TRACE(q.name);
    const double fine = q.values[2], medium = q.values[1], coarse = q.values[0];
    const double step = fine - medium;  // the trend of the sequence at its finest step
    ASSERT_GT(std::abs(step), 0.0);
    EXPECT_GT((medium - coarse) * step, 0.0);  // monotone on this wing
    EXPECT_TRUE(q.extrapolation.order_observed);
    EXPECT_GT((q.extrapolation.value - fine) * step, 0.0);
    const double next = check_values[k];
    EXPECT_GT((next - fine) * step, 0.0);
    EXPECT_LT(std::abs(next - fine), std::abs(q.extrapolation.value - fine));
    EXPECT_GT(q.extrapolation.error_estimate, 0.0);
  }
}

TEST(MeshConvergence, HalvesTheMeshWhenRefiningWouldBeTooLarge) {
  const Case c = testing::WingCase(testing::RectangularWing(6.0, 1.0, testing::Mesh(4, 16)), {3.0});
  study::ConvergenceOptions o;
  o.max_panels = 600;  // 4x16x2 = 128 panels: x4 (2048) and x2 (512) ... x2 fits, so {1/2, 1, 2}
  const study::ConvergenceStudy s = study::MeshConvergence(c, o);
  EXPECT_EQ(s.meshes[0].scale, 0.5);
  EXPECT_EQ(s.meshes[1].scale, 1.0);
  EXPECT_EQ(s.meshes[2].scale, 2.0);
  EXPECT_EQ(s.meshes[2].panels, 512u);
  o.max_panels = 100;
  const study::ConvergenceStudy t = study::MeshConvergence(c, o);
  EXPECT_EQ(t.meshes[2].scale, 1.0);
  EXPECT_EQ(t.meshes[0].chordwise, 1);
  EXPECT_FALSE(t.warnings.empty());
}

TEST(MeshConvergence, RefusesMeshesThatCannotBeNested) {
  const Case c = testing::WingCase(testing::RectangularWing(6.0, 1.0, testing::Mesh(5, 15)), {3.0});
  study::ConvergenceOptions o;
  o.max_panels = 200;  // x4 and x2 too large; 5 and 15 do not halve
  EXPECT_THROW(study::MeshConvergence(c, o), InputError);
  o.point = 3;
  o.max_panels = 100000;
  EXPECT_THROW(study::MeshConvergence(c, o), InputError);  // one flight point only
}

// ----- The Trefftz plane as a quadratic form -----

TEST(TrefftzForm, QuadraticFormEqualsTheSumOfStripDrags) {
  const Case c = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.45, 15.0, testing::Mesh(2, 10)), {4.0});
  const Lattice lat = BuildLattice(c);
  const WakeGeometry wake = WakeFor(c, 4.0, 0.0);
  const Eigen::MatrixXd Q = study::TrefftzDragMatrix(lat, wake);
  std::mt19937 rng(7);
  std::uniform_real_distribution<double> u(-1.0, 1.0);
  for (int trial = 0; trial < 5; ++trial) {
    std::vector<double> g(lat.strips.size());
    Eigen::VectorXd gv(static_cast<Eigen::Index>(g.size()));
    for (std::size_t m = 0; m < g.size(); ++m) gv(static_cast<Eigen::Index>(m)) = g[m] = u(rng);
    double d = 0.0;
    for (double dm : TrefftzDrag(lat, g, wake)) d += dm;
    EXPECT_NEAR(gv.dot(Q * gv), d, 1e-12 * std::abs(d) + 1e-15);
  }
  EXPECT_LT((Q - Q.transpose()).norm(), 1e-14 * Q.norm());
}

TEST(TrefftzForm, QuadraticFormHoldsForTwoSurfaces) {
  // A wing and a tail behind it (our own invention): the wake of one crosses the other's in the Trefftz plane.
  Surface wing = testing::TaperedWing(8.0, 1.2, 0.45, 5.0, testing::Mesh(2, 10));
  Surface tail = testing::TaperedWing(3.0, 0.6, 0.6, 10.0, testing::Mesh(2, 6));
  tail.name = "tail";
  for (Section& sec : tail.sections) sec.leading_edge = {sec.leading_edge[0] + 4.0, sec.leading_edge[1], 0.3};
  std::vector<Surface> both;
  both.push_back(wing);
  both.push_back(tail);
  const Case c = testing::MakeCase(both, {4.0});
  const Lattice lat = BuildLattice(c);
  const WakeGeometry wake = WakeFor(c, 4.0, 0.0);
  const Eigen::MatrixXd Q = study::TrefftzDragMatrix(lat, wake);
  std::mt19937 rng(11);
  std::uniform_real_distribution<double> u(-1.0, 1.0);
  for (int trial = 0; trial < 5; ++trial) {
    std::vector<double> g(lat.strips.size());
    Eigen::VectorXd gv(static_cast<Eigen::Index>(g.size()));
    for (std::size_t m = 0; m < g.size(); ++m) gv(static_cast<Eigen::Index>(m)) = g[m] = u(rng);
    double d = 0.0;
    for (double dm : TrefftzDrag(lat, g, wake)) d += dm;
    EXPECT_NEAR(gv.dot(Q * gv), d, 1e-11 * std::abs(d) + 1e-15);
  }
}

TEST(TrefftzForm, FormAgreesWithTheSolvedDragAndLift) {
  // The solve's CD_induced is the same form evaluated at its strip circulations; its far-field lift agrees
  // with the near-field CL to a fraction of a percent on a planar wing with an x-axis wake.
  const Case c = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.45, 15.0, testing::Mesh(4, 16)), {4.0});
  const Results r = skein::Run(c, {});
  const Lattice lat = BuildLattice(c);
  const WakeGeometry wake = WakeFor(c, 4.0, 0.0);
  Eigen::VectorXd g(static_cast<Eigen::Index>(lat.strips.size()));
  for (std::size_t m = 0; m < lat.strips.size(); ++m)
    g(static_cast<Eigen::Index>(m)) = r.points[0].surfaces[0].strips.gamma[m];
  const double qs = 0.5 * c.reference.area;
  EXPECT_NEAR(g.dot(study::TrefftzDragMatrix(lat, wake) * g) / qs, r.points[0].CD_induced,
              1e-12 * r.points[0].CD_induced);
  EXPECT_NEAR(study::TrefftzLiftVector(lat, wake, 4.0).dot(g) / qs, r.points[0].CL, 5e-3 * r.points[0].CL);
}

// ----- Twist design -----

/// A tapered, swept wing of our own invention (span 10 m, root chord 1.5 m, taper 0.3, 25 deg quarter-chord
/// sweep), flat, untwisted, 4 x 32 panels per half with "sine" spanwise spacing (dense toward the tips only;
/// see the note in DesignedTwistReachesEllipticSpanEfficiency), x-axis wake.
Case DesignWing() {
  return testing::WingCase(testing::TaperedWing(10.0, 1.5, 0.3, 25.0, testing::Mesh(4, 32, Spacing::sine)), {4.0});
}

const study::TwistDesign& DesignedWing() {
  static const study::TwistDesign d = [] {
    study::TwistDesignOptions o;
    o.target_CL = 0.5;
    return study::DesignTwist(DesignWing(), o);
  }();
  return d;
}

/// The point at CL `target`, moving the angle of attack (secant steps on CL_alpha: CL is almost linear).
PointResult AtLift(Case c, double target) {
  for (int it = 0; it < 4; ++it) {
    const PointResult p = skein::Run(c, {}).points.front();
    if (std::abs(p.CL - target) < 1e-12) return p;
    c.flight.alpha_deg = {c.flight.alpha_deg.front() +
                          (target - p.CL) / *p.derivatives.Get("CL_alpha") * 180.0 / 3.14159265358979323846};
  }
  return skein::Run(c, {}).points.front();
}

TEST(TwistDesign, DesignedTwistReachesEllipticSpanEfficiencyAtTheTargetLift) {
  // Elliptic loading has the least induced drag of a planar wing at given lift and span, span efficiency 1
  // (L. Prandtl, lifting-line theory, "Tragflügeltheorie", 1918-1919): the designed wing must come within
  // half a percent of it. On one mesh the span efficiency carries a first-order discretisation error of
  // about +1 % here (the near-field CL converges from above), enough to put even the untwisted wing above
  // 0.995; so the check is on the mesh-converged value: Richardson extrapolation over three nested meshes
  // (study::MeshConvergence), and the untwisted wing must fail the same check.
  // Note: with "cosine" spanwise spacing (dense at the root as well) the designed twist reaches only 0.990
  // mesh-converged: the discrete Trefftz-plane drag is biased where strips shrink toward the root, and the
  // optimiser follows the bias (the elliptic loading sampled on cosine strips gives e = 0.993 at 800 strips
  // per half, against 1.0005 on uniform and 1.0008 on sine strips).
  const study::TwistDesign& d = DesignedWing();
  EXPECT_TRUE(d.converged);
  EXPECT_EQ(d.station_eta.size(), 6u);  // root, 0.2, 0.4, 0.6, 0.8, tip
  EXPECT_NEAR(d.before.CL, 0.5, 1e-10);
  EXPECT_NEAR(d.after.CL, 0.5, 1e-9);
  EXPECT_EQ(d.twist_after_deg[0], d.twist_before_deg[0]);  // the root keeps its twist; alpha is designed
  EXPECT_EQ(d.designed.flight.alpha_deg.front(), d.after.alpha_deg);
  EXPECT_LT(d.after.CD_induced, d.before.CD_induced);
  EXPECT_GE(*d.after.span_efficiency, 0.995);
  // The case written out solves to the same state.
  const PointResult p = skein::Run(d.designed, {}).points.front();
  EXPECT_NEAR(p.CL, d.after.CL, 1e-12);
  EXPECT_NEAR(p.CD_induced, d.after.CD_induced, 1e-12 * d.after.CD_induced);
  // Mesh-converged span efficiency: designed and as given (measured values in the commit message).
  study::ConvergenceOptions co;
  const auto designed = study::MeshConvergence(d.designed, co).quantities[3];
  Case untwisted = d.designed;
  for (Section& s : untwisted.surfaces[0].sections) s.twist_deg = 0.0;
  untwisted.flight.alpha_deg = {d.before.alpha_deg};
  const auto given = study::MeshConvergence(untwisted, co).quantities[3];
  ASSERT_EQ(designed.name, "span_efficiency");
  EXPECT_TRUE(designed.extrapolation.order_observed);
  EXPECT_GE(designed.extrapolation.value, 0.995);
  EXPECT_LE(designed.extrapolation.value, 1.0 + designed.extrapolation.error_estimate);
  EXPECT_LT(given.extrapolation.value, 0.995);
}

TEST(TwistDesign, NoSmallPerturbationOfTheDesignedTwistLowersTheDragAtTheSameLift) {
  const study::TwistDesign& d = DesignedWing();
  std::mt19937 rng(2026);
  std::uniform_real_distribution<double> u(-0.25, 0.25);  // deg
  for (int trial = 0; trial < 6; ++trial) {
    Case p = d.designed;
    for (Section& s : p.surfaces[0].sections) s.twist_deg += u(rng);
    const PointResult r = AtLift(p, 0.5);
    ASSERT_NEAR(r.CL, 0.5, 1e-9);
    EXPECT_GT(r.CD_induced, d.after.CD_induced) << "trial " << trial;
  }
}

TEST(TwistDesign, HoldingRootBendingKeepsItAtOrBelowTheWingAsGiven) {
  // A strongly tapered, unswept wing (taper 0.2) carries more of its load inboard than the elliptic loading:
  // the free design moves load outboard and raises the root bending moment, so holding it binds.
  const Case c =
      testing::WingCase(testing::TaperedWing(10.0, 1.5, 0.2, 0.0, testing::Mesh(4, 32, Spacing::sine)), {4.0});
  study::TwistDesignOptions o;
  o.target_CL = 0.5;
  const study::TwistDesign free = study::DesignTwist(c, o);
  o.keep_root_bending = true;
  const study::TwistDesign held = study::DesignTwist(c, o);
  EXPECT_GT(free.after.root_bending, free.before.root_bending);
  EXPECT_TRUE(held.converged);
  EXPECT_TRUE(held.bending_constraint_active);
  EXPECT_NEAR(held.after.root_bending, held.before.root_bending, 1e-9 * held.before.root_bending);
  EXPECT_LT(held.after.CD_induced, held.before.CD_induced);
  EXPECT_GT(held.after.CD_induced, free.after.CD_induced);
  EXPECT_NEAR(held.after.CL, 0.5, 1e-9);
}

TEST(TwistDesign, RefusesAnUnknownSurfaceAndAZeroTarget) {
  const Case c = DesignWing();
  study::TwistDesignOptions o;
  o.surface = "tail";
  EXPECT_THROW(study::DesignTwist(c, o), InputError);
  o.surface = "";
  o.target_CL = 0.0;
  EXPECT_THROW(study::DesignTwist(c, o), InputError);
}

// ----- Comparing configurations -----

TEST(Compare, ACaseComparedWithItselfRanksEqual) {
  const Case c = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.45, 15.0, testing::Mesh(4, 12)), {3.0});
  const study::Comparison cmp = study::CompareCases({c, c}, {});
  ASSERT_EQ(cmp.entries.size(), 2u);
  EXPECT_EQ(cmp.entries[0].rank, 1);
  EXPECT_EQ(cmp.entries[1].rank, 1);
  EXPECT_EQ(cmp.entries[0].CD_induced, cmp.entries[1].CD_induced);
  EXPECT_EQ(cmp.entries[0].root_bending, cmp.entries[1].root_bending);
  // The default lift is the first case's at its first point, reached at that point's alpha.
  const PointResult p = skein::Run(c, {}).points.front();
  EXPECT_EQ(cmp.target_CL, p.CL);
  EXPECT_NEAR(cmp.entries[0].alpha_deg, 3.0, 1e-9);
}

TEST(Compare, RanksByInducedDragAtTheSameLift) {
  // The designed twist against the wing as given: the design must rank first, both at the same CL.
  const study::TwistDesign& d = DesignedWing();
  Case given = d.designed;
  for (std::size_t k = 0; k < given.surfaces[0].sections.size(); ++k)
    given.surfaces[0].sections[k].twist_deg = d.twist_before_deg[k];
  study::CompareOptions o;
  o.target_CL = 0.5;
  const study::Comparison cmp = study::CompareCases({given, d.designed}, o);
  ASSERT_EQ(cmp.ranked.size(), 2u);
  EXPECT_EQ(cmp.ranked[0], 1u);
  EXPECT_EQ(cmp.entries[1].rank, 1);
  EXPECT_EQ(cmp.entries[0].rank, 2);
  for (const auto& e : cmp.entries) EXPECT_NEAR(e.CL, 0.5, 1e-11);
  EXPECT_NEAR(cmp.entries[1].CD_induced, d.after.CD_induced, 1e-9 * d.after.CD_induced);
  EXPECT_NEAR(cmp.entries[0].CD_induced, d.before.CD_induced, 1e-9 * d.before.CD_induced);
}

TEST(Compare, OneAircraftOnTwoWingsOfOneShapePaysInducedDragAsTheSquareOfTheSpanRatio) {
  // Source: L. Prandtl, "Tragflügeltheorie", 1918: D_i = L^2 / (q pi b^2 e). The same weight on a wing scaled by
  // k in every direction flies at CL / k^2; its induced drag force is about 1 / k^2 of the smaller wing's, and
  // the ranking follows the force, where at one CL the two rank equal.
  const double k = 1.25;
  const Case small = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.45, 15.0, testing::Mesh(4, 12)), {3.0});
  const Case large = testing::WingCase(testing::TaperedWing(8.0 * k, 1.2 * k, 0.45, 15.0, testing::Mesh(4, 12)), {3.0});
  study::CompareOptions o;
  o.same_aircraft = study::SameAircraft{4000.0, 40.0, 1.1};
  const study::Comparison cmp = study::CompareCases({small, large}, o);
  ASSERT_EQ(cmp.entries.size(), 2u);
  const double q = 0.5 * 1.1 * 40.0 * 40.0;
  for (std::size_t i = 0; i < 2; ++i) {
    const study::CompareEntry& e = cmp.entries[i];
    const Case& c = i == 0 ? small : large;
    EXPECT_NEAR(e.CL, 4000.0 / (q * c.reference.area), 1e-10);
    ASSERT_TRUE(e.induced_drag_N && e.span_efficiency);
    const double b = c.reference.span;
    EXPECT_NEAR(*e.induced_drag_N, 4000.0 * 4000.0 / (q * M_PI * b * b * *e.span_efficiency), 1e-9 * *e.induced_drag_N);
  }
  // The span efficiencies differ a little (0.4 % here): the larger wing flies at a smaller angle, and the lift
  // is the force normal to the freestream, so e carries a cos(alpha) the linear theory keeps. The force ratio is
  // then (b_small / b_large)^2 e_small / e_large, within a percent of 1 / k^2.
  const double e_ratio = *cmp.entries[0].span_efficiency / *cmp.entries[1].span_efficiency;
  EXPECT_NEAR(*cmp.entries[1].induced_drag_N / *cmp.entries[0].induced_drag_N, e_ratio / (k * k), 1e-9);
  EXPECT_NEAR(e_ratio, 1.0, 0.01);
  EXPECT_EQ(cmp.ranked.front(), 1u);  // the larger wing pays less
  EXPECT_EQ(cmp.entries[1].rank, 1);
  EXPECT_EQ(cmp.entries[0].rank, 2);
  // At one CL instead, the two rank equal: the same CD_induced.
  study::CompareOptions at_cl;
  at_cl.target_CL = 0.4;
  const study::Comparison same_cl = study::CompareCases({small, large}, at_cl);
  EXPECT_EQ(same_cl.entries[0].rank, same_cl.entries[1].rank);
  EXPECT_FALSE(same_cl.entries[0].induced_drag_N);
}

TEST(Compare, RootBendingOfAnEllipticLoadIsItsCentroidMoment) {
  // Half the lift at 4 s / (3 pi) from the root for an elliptic loading (common practice: the centroid of a
  // half ellipse); the elliptic planform of an untwisted flat wing carries a near-elliptic load, so the root
  // bending coefficient is CL (S/2) (4 s / 3 pi) / (S b) = CL / (3 pi) within the mesh's departure from it.
  const Case c = testing::WingCase(testing::EllipticWing(10.0, 1.0, 40, 4), {4.0});
  const Lattice lat = BuildLattice(c);
  const PointResult p = skein::Run(c, {}).points.front();
  EXPECT_NEAR(study::RootBendingCoefficient(lat, c, p, 0), p.CL / (3.0 * 3.14159265358979323846), 0.01 * p.CL / 9.42);
}

}  // namespace
}  // namespace skein
