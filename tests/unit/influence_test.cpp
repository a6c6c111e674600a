// Tests for influence.hpp and the half model: the symmetric + antisymmetric split of a mirror-symmetric
// configuration must give the same circulations as the full system (it is an exact change of basis, not an
// approximation: architecture.md, "A symmetric configuration in symmetric flight solves only one half"), and
// results must not depend on the number of threads (architecture.md, "Parallelism").
#include "skein/influence.hpp"

#include <cmath>
#include <string>
#include <vector>

#include <Eigen/Core>
#include <gtest/gtest.h>
#include <omp.h>

#include "../support/aircraft.hpp"
#include "../support/planforms.hpp"
#include "skein/lattice.hpp"
#include "skein/run.hpp"
#include "skein/solver.hpp"

namespace skein {
namespace {

using testing::Mesh;

// The two models differ only by the order of floating-point operations in assembly and factorisation; the
// circulations are of order 0.1 to 1 (per unit speed) and the systems well conditioned, so they agree to
// round-off amplified by the condition number: 1e-10 absolute (the acceptance figure).
constexpr double kHalfVsFull = 1e-10;

/// A wing with dihedral, sweep, taper, camber and washout: every term of the kernel and the normals.
Surface AwkwardWing(WakeDirection wake) {
  Surface w = testing::TaperedWing(9.0, 1.4, 0.5, 12.0, Mesh(6, 12, Spacing::cosine, Spacing::cosine, wake),
                                   testing::Naca4(2, 4));
  w.sections[1].leading_edge[2] = 0.5;
  w.sections[1].twist_deg = -2.0;
  return w;
}

double MaxAbsDiff(const Eigen::MatrixXd& a, const Eigen::MatrixXd& b) { return (a - b).cwiseAbs().maxCoeff(); }

BasisSolution Solve(const Case& c, bool half, const WakeGeometry& wake) {
  const Lattice lat = BuildLattice(c);
  SolverOptions o;
  o.allow_half_model = half;
  return SolveBasis(lat, c.reference.moment_point, wake, o);
}

void ExpectHalfEqualsFull(const Case& c, const WakeGeometry& wake, const std::string& what) {
  const BasisSolution full = Solve(c, false, wake), half = Solve(c, true, wake);
  ASSERT_EQ(full.layouts.size(), 1u) << what;
  ASSERT_EQ(half.layouts.size(), 2u) << what << ": expected the half model to apply";
  EXPECT_EQ(half.layouts[0].kind, SystemLayout::Kind::symmetric);
  EXPECT_EQ(half.layouts[1].kind, SystemLayout::Kind::antisymmetric);
  EXPECT_LT(half.unknowns, full.unknowns);
  ASSERT_EQ(full.gamma.cols(), half.gamma.cols());
  EXPECT_LT(MaxAbsDiff(full.gamma, half.gamma), kHalfVsFull) << what;
  EXPECT_LT(MaxAbsDiff(full.bound_velocity.w, half.bound_velocity.w), kHalfVsFull) << what;
  // The flow basis is not trivial: the uniform w field (column 2) lifts.
  EXPECT_GT(full.gamma.col(2).cwiseAbs().maxCoeff(), 0.05) << what;
}

TEST(HalfModel, GivesTheFullModelsCirculationsForAnAwkwardWing) {
  const Case c = testing::WingCase(AwkwardWing(WakeDirection::x_axis), {4.0});
  ExpectHalfEqualsFull(c, WakeFor(c, 4.0, 0.0), "x-axis wake");
  Case fs = testing::WingCase(AwkwardWing(WakeDirection::freestream), {4.0});
  ExpectHalfEqualsFull(fs, WakeFor(fs, 4.0, 0.0), "freestream wake at alpha 4");
}

TEST(HalfModel, GivesTheFullModelsCirculationsWithATailAndACentreLineFin) {
  const Case c = testing::TestAircraft(WakeDirection::x_axis);
  ExpectHalfEqualsFull(c, WakeFor(c, 4.0, 0.0), "wing, tail, fin, controls");
}

TEST(HalfModel, GivesTheFullModelsCirculationsInGroundEffect) {
  Case c = testing::WingCase(AwkwardWing(WakeDirection::x_axis), {4.0});
  c.ground.enabled = true;
  c.ground.height_z = -1.5;
  ExpectHalfEqualsFull(c, WakeFor(c, 4.0, 0.0), "ground plane");
}

TEST(HalfModel, FreestreamWakeInSideslipUsesTheFullModel) {
  Case c = testing::WingCase(AwkwardWing(WakeDirection::freestream), {4.0}, {5.0});
  const WakeGeometry wake = WakeFor(c, 4.0, 5.0);
  EXPECT_EQ(Solve(c, true, wake).layouts.size(), 1u) << "a wake with a sideways component is not symmetric";
}

TEST(HalfModel, RunGivesTheSameResultsWithAndWithoutIt) {
  // Sideslip, rates and an x-axis wake: the antisymmetric system carries real load.
  for (const bool aircraft : {false, true}) {
    Case c = aircraft ? testing::TestAircraft(WakeDirection::x_axis)
                      : testing::WingCase(AwkwardWing(WakeDirection::x_axis), {3.0, 7.0}, {-4.0, 6.0});
    if (aircraft) c.flight.beta_deg = {5.0};
    c.flight.speed = 30.0;
    c.flight.rates = {0.3, -0.1, 0.2};
    RunOptions half, full;
    full.allow_half_model = false;
    const Results rh = skein::Run(c, half), rf = skein::Run(c, full);
    EXPECT_TRUE(rh.mesh.half_model);
    EXPECT_FALSE(rf.mesh.half_model);
    ASSERT_EQ(rh.points.size(), rf.points.size());
    for (std::size_t p = 0; p < rh.points.size(); ++p) {
      const PointResult &h = rh.points[p], &f = rf.points[p];
      EXPECT_GT(std::abs(h.CY), 1e-3);  // the sideslip really loads the antisymmetric system
      EXPECT_NEAR(h.CL, f.CL, kHalfVsFull);
      EXPECT_NEAR(h.CY, f.CY, kHalfVsFull);
      EXPECT_NEAR(h.Cl, f.Cl, kHalfVsFull);
      EXPECT_NEAR(h.Cm, f.Cm, kHalfVsFull);
      EXPECT_NEAR(h.Cn, f.Cn, kHalfVsFull);
      EXPECT_NEAR(h.CD_induced, f.CD_induced, kHalfVsFull);
      ASSERT_EQ(h.surfaces.size(), f.surfaces.size());
      for (std::size_t s = 0; s < h.surfaces.size(); ++s)
        for (std::size_t k = 0; k < h.surfaces[s].strips.gamma.size(); ++k)
          EXPECT_NEAR(h.surfaces[s].strips.gamma[k], f.surfaces[s].strips.gamma[k], kHalfVsFull);
      for (const auto& [name, value] : h.derivatives.items)
        EXPECT_NEAR(value, *f.derivatives.Get(name), 1e-9) << name;
    }
  }
}

TEST(HalfModel, ACamberedCentreLineFinIsNotItsOwnMirrorImage) {
  // A fin on y = 0 enters the antisymmetric system as its own image, which needs its normal purely along y.
  // With camber (or a deflected rudder) the normal turns, the mirrored aircraft is a different one, and a
  // split would drop the fin's side force in symmetric flight. The answer must be the full model's.
  Case c = testing::WingCase(AwkwardWing(WakeDirection::x_axis), {4.0});
  Surface fin;
  fin.name = "fin";
  fin.symmetric = false;
  fin.mesh = Mesh(4, 4, Spacing::cosine, Spacing::cosine, WakeDirection::x_axis);
  fin.sections.push_back(testing::MakeSection({4.0, 0.0, 0.1}, 1.0, 0.0, testing::Naca4(4, 4)));
  fin.sections.push_back(testing::MakeSection({4.4, 0.0, 1.3}, 0.6, 0.0, testing::Naca4(4, 4)));
  c.surfaces.push_back(fin);
  RunOptions full;
  full.allow_half_model = false;
  const PointResult h = skein::Run(c, {}).points[0], f = skein::Run(c, full).points[0];
  EXPECT_GT(std::abs(f.CY), 1e-3);  // the cambered fin lifts sideways in symmetric flight
  EXPECT_NEAR(h.CY, f.CY, kHalfVsFull);
  EXPECT_NEAR(h.CL, f.CL, kHalfVsFull);
  EXPECT_NEAR(h.Cn, f.Cn, kHalfVsFull);
}

TEST(HalfModel, IsNotUsedWhenTheMirrorImageIsADifferentAircraft) {
  // A non-symmetric surface off the centre line (a single wing panel on one side): no mirror, full model, and
  // the answer is still that of the full system.
  Case c = testing::WingCase(AwkwardWing(WakeDirection::x_axis), {4.0});
  Surface pod = testing::RectangularWing(1.0, 0.5, Mesh(2, 3));
  pod.name = "winglet";
  pod.symmetric = false;
  for (Section& s : pod.sections) s.leading_edge = {s.leading_edge[0] + 3.0, s.leading_edge[1] + 1.0, 0.8};
  c.surfaces.push_back(pod);
  const Lattice lat = BuildLattice(c);
  EXPECT_FALSE(lat.geometry_symmetric);
  EXPECT_EQ(Solve(c, true, WakeFor(c, 4.0, 0.0)).layouts.size(), 1u);
}

TEST(Influence, NoAirCrossesTheGroundPlaneOrTheSymmetryPlane) {
  // Image method: a horseshoe and its reflection in z = h (reversed, same circulation) induce no velocity
  // normal to that plane on it; and a symmetric load on a mirrored wing induces no sidewash on y = 0.
  for (const WakeDirection wake : {WakeDirection::x_axis, WakeDirection::freestream}) {
    Case c = testing::WingCase(AwkwardWing(wake), {6.0});
    c.ground.enabled = true;
    c.ground.height_z = -0.8;
    const Lattice lat = BuildLattice(c);
    const WakeGeometry w = WakeFor(c, 6.0, 0.0);
    const BasisSolution sol = SolveBasis(lat, c.reference.moment_point, w, {});
    PointArray ground, centre;
    for (double x : {-1.0, 0.3, 1.1, 4.0})
      for (double y : {-3.0, 0.0, 0.7, 4.4}) {
        ground.push_back({x, y, -0.8});
        centre.push_back({x, 0.0, y * 0.1 + 0.2});
      }
    const Eigen::MatrixXd lift = sol.gamma.col(2);  // the uniform w field: symmetric, lifting
    const InducedVelocity vg = InducedVelocityAt(lat, ground, lift, w);
    const InducedVelocity vc = InducedVelocityAt(lat, centre, lift, w);
    EXPECT_LT(vg.w.cwiseAbs().maxCoeff(), 1e-12) << ToString(wake);
    EXPECT_GT(vg.u.cwiseAbs().maxCoeff(), 1e-3);  // the plane does see the wing
    EXPECT_LT(vc.v.cwiseAbs().maxCoeff(), 1e-12);
    EXPECT_GT(vc.w.cwiseAbs().maxCoeff(), 1e-3);
  }
}

TEST(Threads, OneAndTwoThreadsGiveBitIdenticalCirculations) {
  Case c = testing::TestAircraft(WakeDirection::x_axis, 2);
  c.flight.beta_deg = {3.0};
  const Lattice lat = BuildLattice(c);
  const WakeGeometry wake = WakeFor(c, 4.0, 3.0);
  const int saved = omp_get_max_threads();
  std::vector<BasisSolution> sol;
  for (const int threads : {1, 2}) {
    omp_set_num_threads(threads);
    for (const bool half : {true, false}) {
      SolverOptions o;
      o.allow_half_model = half;
      sol.push_back(SolveBasis(lat, c.reference.moment_point, wake, o));
    }
  }
  omp_set_num_threads(saved);
  for (int model = 0; model < 2; ++model) {
    const BasisSolution &one = sol[static_cast<std::size_t>(model)], &two = sol[static_cast<std::size_t>(2 + model)];
    ASSERT_EQ(one.gamma.rows(), two.gamma.rows());
    EXPECT_TRUE((one.gamma.array() == two.gamma.array()).all()) << "model " << model;
    EXPECT_TRUE((one.bound_velocity.u.array() == two.bound_velocity.u.array()).all());
    EXPECT_TRUE((one.bound_velocity.v.array() == two.bound_velocity.v.array()).all());
    EXPECT_TRUE((one.bound_velocity.w.array() == two.bound_velocity.w.array()).all());
  }
  // And the loads of a whole run.
  RunOptions o1, o2;
  o1.threads = 1;
  o2.threads = 2;
  const Results r1 = skein::Run(c, o1), r2 = skein::Run(c, o2);
  omp_set_num_threads(saved);
  const PointResult &p1 = r1.points[0], &p2 = r2.points[0];
  for (const auto& [name, value] : p1.derivatives.items) EXPECT_EQ(value, *p2.derivatives.Get(name)) << name;
  EXPECT_EQ(p1.CL, p2.CL);
  EXPECT_EQ(p1.CD_induced, p2.CD_induced);
  EXPECT_EQ(p1.Cn, p2.Cn);
}

TEST(Influence, EntryIsTheNormalVelocityOfTheHorseshoe) {
  // A_ij = n_i . v_j(P_i): a single flat panel sees a downwash from its own horseshoe, so A_ii < 0 (with the
  // normal up), and a positive circulation solving the boundary condition lifts.
  const Case c = testing::WingCase(testing::RectangularWing(4.0, 1.0, Mesh(1, 1)), {5.0});
  const Lattice lat = BuildLattice(c);
  const WakeGeometry wake = WakeFor(c, 5.0, 0.0);
  const auto layouts = ChooseLayouts(lat, wake, false);
  const auto mats = AssembleInfluence(lat, layouts, wake);
  ASSERT_EQ(mats.size(), 1u);
  ASSERT_EQ(mats[0].rows(), 2);
  EXPECT_LT(mats[0](0, 0), 0.0);
  EXPECT_LT(mats[0](1, 1), 0.0);
  EXPECT_NEAR(mats[0](0, 1), mats[0](1, 0), 1e-14);  // mirror images see each other alike
  // The velocity pass gives the same normal velocity at the control points.
  Eigen::MatrixXd g = Eigen::MatrixXd::Identity(2, 2);
  const InducedVelocity v = InducedVelocityAt(lat, lat.control, g, wake);
  for (Eigen::Index i = 0; i < 2; ++i)
    for (Eigen::Index j = 0; j < 2; ++j) {
      const auto ui = static_cast<std::size_t>(i);
      const double vn = v.u(i, j) * lat.normal.x[ui] + v.v(i, j) * lat.normal.y[ui] + v.w(i, j) * lat.normal.z[ui];
      EXPECT_NEAR(vn, mats[0](i, j), 1e-13);
    }
}

}  // namespace
}  // namespace skein
