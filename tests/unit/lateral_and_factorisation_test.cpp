// Tests for the fast paths of issue 4 at the level of a whole run: the symmetric system alone in symmetric flight
// (RunOptions::lateral = false) against both half systems and against the full lattice, the factorisation the
// solver uses (OpenBLAS through LAPACKE in the default build) against Eigen's own LU, the run's plan and memory
// estimate. Every comparison is to 1e-12 relative, values of coefficients below one compared against one
// (coefficients are of order one; common practice for round-off checks). They never look at times.
#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <limits>
#include <optional>
#include <string>
#include <vector>

#include <Eigen/Core>
#include <Eigen/LU>
#include <gtest/gtest.h>
#if defined(SKEIN_HAVE_LAPACKE)
#include <lapacke.h>
#endif

#include "skein/case_file.hpp"
#include "skein/influence.hpp"
#include "skein/lattice.hpp"
#include "skein/run.hpp"
#include "skein/solver.hpp"

namespace skein {
namespace {

constexpr double kRelative = 1e-12;

/// A wing, a tail with an elevator and a centre-line fin (our own demo layout); `aileron` adds an aileron,
/// `rudder` a rudder. x-axis wake: one factorisation for the sweep.
Case Aircraft(bool aileron, bool rudder, const std::string& flight = "alpha = [0.0, 4.0]") {
  std::string text = R"(title = "fast path aircraft"
[reference]
moment_point = [0.4, 0.0, 0.0]
[flight]
)" + flight + R"(
[mesh]
chordwise = 5
spanwise = 14
wake = "x-axis"
[[surface]]
name = "wing"
symmetric = true
  [surface.trapezoid]
  root_leading_edge = [0.0, 0.0, 0.0]
  span = 8.0
  root_chord = 1.2
  taper = 0.6
  sweep = 4.0
  dihedral = 4.0
  washout = 1.0
  camber = "NACA 2412"
)";
  if (aileron)
    text += R"(
  [[surface.control]]
  name = "aileron"
  hinge = 0.75
  span_fraction = [0.55, 0.92]
  mirror = "opposite"
)";
  text += R"(
[[surface]]
name = "tail"
symmetric = true
chordwise = 4
spanwise = 6
  [surface.trapezoid]
  root_leading_edge = [4.0, 0.1, 0.3]
  span = 2.4
  root_chord = 0.7
  taper = 0.6
  [[surface.control]]
  name = "elevator"
  hinge = 0.65
  span_fraction = [0.0, 1.0]
  mirror = "same"
[[surface]]
name = "fin"
symmetric = false
chordwise = 4
spanwise = 5
  [surface.trapezoid]
  root_leading_edge = [3.8, 0.0, 0.3]
  span = 1.2
  root_chord = 0.9
  taper = 0.5
  sweep = 25.0
  vertical = true
)";
  if (rudder)
    text += R"(
  [[surface.control]]
  name = "rudder"
  hinge = 0.65
  span_fraction = [0.05, 0.95]
)";
  return ReadCaseText(text, "fast-path-aircraft.toml");
}

void ExpectClose(double fast, double ref, const std::string& what) {
  EXPECT_LE(std::abs(fast - ref), kRelative * std::max(1.0, std::abs(ref))) << what << ": " << fast << " vs " << ref;
}

/// Every coefficient, derivative, control derivative and strip load of `ref` is in `fast` and agrees, except
/// the derivatives `fast` does not have when `fast_may_lack_lateral`.
void ExpectSameResults(const Results& fast, const Results& ref, bool fast_may_lack_lateral) {
  ASSERT_EQ(fast.points.size(), ref.points.size());
  for (std::size_t i = 0; i < ref.points.size(); ++i) {
    const PointResult &f = fast.points[i], &r = ref.points[i];
    const std::string at = "point " + std::to_string(i);
    ExpectClose(f.CL, r.CL, at + " CL");
    ExpectClose(f.CD_induced, r.CD_induced, at + " CD_induced");
    ExpectClose(f.CD_induced_nearfield, r.CD_induced_nearfield, at + " CD_induced_nearfield");
    ExpectClose(f.CY, r.CY, at + " CY");
    ExpectClose(f.Cl, r.Cl, at + " Cl");
    ExpectClose(f.Cm, r.Cm, at + " Cm");
    ExpectClose(f.Cn, r.Cn, at + " Cn");
    for (const auto& [name, value] : r.derivatives.items) {
      const std::optional<double> v = f.derivatives.Get(name);
      const bool lateral = name.find("_beta") != std::string::npos || name.find("_p") != std::string::npos ||
                           name.find("_r") != std::string::npos;
      if (!v) {
        EXPECT_TRUE(fast_may_lack_lateral && lateral) << at << " lacks " << name;
        continue;
      }
      ExpectClose(*v, value, at + " " + name);
    }
    ASSERT_EQ(f.control_derivatives.size(), r.control_derivatives.size());
    for (std::size_t m = 0; m < r.control_derivatives.size(); ++m)
      for (const auto& [name, value] : r.control_derivatives[m].second.items)
        ExpectClose(f.control_derivatives[m].second.Get(name).value_or(NAN), value,
                    at + " " + r.control_derivatives[m].first + " " + name);
    ASSERT_EQ(f.surfaces.size(), r.surfaces.size());
    for (std::size_t s = 0; s < r.surfaces.size(); ++s) {
      ExpectClose(f.surfaces[s].CL, r.surfaces[s].CL, at + " " + r.surfaces[s].name + " CL");
      ExpectClose(f.surfaces[s].downwash_deg, r.surfaces[s].downwash_deg, at + " " + r.surfaces[s].name + " downwash");
      ASSERT_EQ(f.surfaces[s].strips.cl.size(), r.surfaces[s].strips.cl.size());
      for (std::size_t k = 0; k < r.surfaces[s].strips.cl.size(); ++k)
        ExpectClose(f.surfaces[s].strips.cl[k], r.surfaces[s].strips.cl[k], at + " strip cl");
    }
  }
}

RunOptions NoLateral() {
  RunOptions o;
  o.lateral = false;
  return o;
}

TEST(LateralOnRequest, SymmetricSystemAloneGivesTheSameLongitudinalResults) {
  const Case c = Aircraft(false, false);
  const Results eager = skein::Run(c, {});
  const Results lazy = skein::Run(c, NoLateral());
  EXPECT_TRUE(eager.mesh.lateral);
  EXPECT_FALSE(lazy.mesh.lateral);
  EXPECT_TRUE(lazy.mesh.half_model);
  EXPECT_LT(lazy.mesh.unknowns, eager.mesh.unknowns) << "the antisymmetric system (with the fin) was not solved";
  ExpectSameResults(lazy, eager, true);
  for (const char* lateral : {"Cl_beta", "Cn_beta", "CY_beta", "Cl_p", "Cn_r"}) {
    EXPECT_TRUE(eager.points.front().derivatives.Get(lateral).has_value()) << lateral;
    EXPECT_FALSE(lazy.points.front().derivatives.Get(lateral).has_value()) << lateral;
  }
  EXPECT_NE(std::find_if(lazy.warnings.begin(), lazy.warnings.end(),
                         [](const std::string& w) { return w.find("lateral derivatives") != std::string::npos; }),
            lazy.warnings.end())
      << "says what it left out";
}

TEST(LateralOnRequest, SymmetricSystemAloneAgreesWithTheFullLattice) {
  const Case c = Aircraft(false, false);
  RunOptions full;
  full.allow_half_model = false;
  ExpectSameResults(skein::Run(c, NoLateral()), skein::Run(c, full), true);
}

TEST(LateralOnRequest, HalfModelAgreesWithTheFullLatticeWithEveryControl) {
  const Case c = Aircraft(true, true);
  RunOptions full;
  full.allow_half_model = false;
  const Results half = skein::Run(c, {});
  EXPECT_TRUE(half.mesh.half_model);
  ExpectSameResults(half, skein::Run(c, full), false);
}

TEST(LateralOnRequest, AnAileronOrARudderKeepsTheAntisymmetricSystem) {
  for (const auto& [aileron, rudder] : {std::pair{true, false}, std::pair{false, true}}) {
    const Case c = Aircraft(aileron, rudder);
    const Results lazy = skein::Run(c, NoLateral());
    EXPECT_TRUE(lazy.mesh.lateral) << "aileron " << aileron << ", rudder " << rudder;
    ExpectSameResults(lazy, skein::Run(c, {}), false);
  }
}

TEST(LateralOnRequest, SideslipOrRollRateInTheSweepKeepsEverything) {
  for (const char* flight : {"alpha = 3.0\nbeta = [0.0, 2.0]", "alpha = 3.0\nrates = [0.2, 0.0, 0.0]"}) {
    const Case c = Aircraft(false, false, flight);
    const Results lazy = skein::Run(c, NoLateral());
    EXPECT_TRUE(lazy.mesh.lateral) << flight;
    ExpectSameResults(lazy, skein::Run(c, {}), false);
  }
}

TEST(LateralOnRequest, SymmetricOnlyAssemblyIsTheSymmetricMatrixOfThePair) {
  const Case c = Aircraft(false, false);
  const Lattice lat = BuildLattice(c);
  const WakeGeometry wake = WakeFor(c, 0.0, 0.0);
  const std::vector<SystemLayout> pair = ChooseLayouts(lat, wake);
  ASSERT_EQ(pair.size(), 2u);
  EXPECT_FALSE(LateralSystemNeeded(lat, pair));
  const std::vector<Eigen::MatrixXd> both = AssembleInfluence(lat, pair, wake);
  const std::vector<Eigen::MatrixXd> sym = AssembleInfluence(lat, {pair.front()}, wake);
  ASSERT_EQ(sym.size(), 1u);
  ASSERT_EQ(sym.front().rows(), both.front().rows());
  // The same kernel calls on the same numbers: the same bits.
  EXPECT_EQ((sym.front() - both.front()).cwiseAbs().maxCoeff(), 0.0);
  EXPECT_TRUE(LateralSystemNeeded(BuildLattice(Aircraft(true, false)), ChooseLayouts(BuildLattice(Aircraft(true, false)), wake)));
  EXPECT_TRUE(LateralSystemNeeded(BuildLattice(Aircraft(false, true)), ChooseLayouts(BuildLattice(Aircraft(false, true)), wake)));
}

// ---- the factorisation ---------------------------------------------------------------------------------------

TEST(Factorisation, SolverLuAgreesWithEigensOwnLu) {
  // This file does not define EIGEN_USE_LAPACKE, so PartialPivLU here is Eigen's own code; InPlaceLu is what
  // the library factorises with (InPlaceLu::Backend()).
  const Case c = Aircraft(true, true);
  const Lattice lat = BuildLattice(c);
  const WakeGeometry wake = WakeFor(c, 0.0, 0.0);
  const Eigen::MatrixXd a = AssembleInfluence(lat, ChooseLayouts(lat, wake, false), wake).front();
  const Eigen::MatrixXd b = BasisRightHandSides(lat, c.reference.moment_point);
  Eigen::MatrixXd work = a;
  const InPlaceLu lu(work);
  const Eigen::MatrixXd x = lu.Solve(b);
  const Eigen::MatrixXd x_eigen = Eigen::PartialPivLU<Eigen::MatrixXd>(a).solve(b);
  for (Eigen::Index k = 0; k < b.cols(); ++k) {
    const double scale = x_eigen.col(k).cwiseAbs().maxCoeff();
    if (!(scale > 0.0)) continue;
    EXPECT_LE((x.col(k) - x_eigen.col(k)).cwiseAbs().maxCoeff(), kRelative * scale)
        << "column " << k << ", " << InPlaceLu::Backend();
  }
  EXPECT_GT(lu.Rcond(), 0.0);
  EXPECT_LE(lu.Rcond(), 1.0);
  // In place: the matrix passed in now holds the factors, not the matrix.
  EXPECT_GT((work - a).cwiseAbs().maxCoeff(), 0.0);
}

TEST(Factorisation, ConditionEstimateBracketsTheExactReciprocalCondition) {
  // The 1-norm estimator (Hager's method as refined by Higham; N. J. Higham, "Accuracy and Stability of
  // Numerical Algorithms", 2nd ed., SIAM 2002, section 15.3) finds a lower bound of ||A^-1||_1, so its
  // reciprocal condition is at least the exact 1/(||A||_1 ||A^-1||_1), and in practice within a factor of a few
  // (there: rarely more than 3). The exact value here comes from the explicit inverse.
  const Case c = Aircraft(true, true);
  const Lattice lat = BuildLattice(c);
  const WakeGeometry wake = WakeFor(c, 0.0, 0.0);
  const Eigen::MatrixXd a = AssembleInfluence(lat, ChooseLayouts(lat, wake, false), wake).front();
  const double exact = 1.0 / (a.cwiseAbs().colwise().sum().maxCoeff() *
                              a.inverse().cwiseAbs().colwise().sum().maxCoeff());
  Eigen::MatrixXd work = a;
  const InPlaceLu lu(work);
  EXPECT_GE(lu.Rcond(), exact * (1.0 - 1e-9)) << InPlaceLu::Backend();
  EXPECT_LE(lu.Rcond(), 10.0 * exact) << InPlaceLu::Backend();
}

#if defined(SKEIN_HAVE_LAPACKE)
TEST(Factorisation, ConditionEstimateIsLapacksDgecon) {
  // InPlaceLu::Rcond drives LAPACK's dlacn2 (Hager's estimator as refined by Higham) with plain solves on the
  // LU factors; LAPACK's dgecon drives the same estimator with overflow-guarded solves (dlatrs; E. Anderson
  // et al., "LAPACK Users' Guide", 3rd ed., SIAM 1999, section 4.4, section number from memory). On the same
  // factors of an ordinary aircraft's matrix the two agree to rounding.
  const Case c = Aircraft(true, true);
  const Lattice lat = BuildLattice(c);
  const WakeGeometry wake = WakeFor(c, 0.0, 0.0);
  const Eigen::MatrixXd a = AssembleInfluence(lat, ChooseLayouts(lat, wake, false), wake).front();
  const auto n = static_cast<lapack_int>(a.rows());
  const double anorm = a.cwiseAbs().colwise().sum().maxCoeff();
  Eigen::MatrixXd lu = a;
  std::vector<lapack_int> ipiv(static_cast<std::size_t>(n));
  ASSERT_EQ(LAPACKE_dgetrf(LAPACK_COL_MAJOR, n, n, lu.data(), n, ipiv.data()), 0);
  double reference = 0.0;
  ASSERT_EQ(LAPACKE_dgecon(LAPACK_COL_MAJOR, '1', n, lu.data(), n, anorm, &reference), 0);
  Eigen::MatrixXd work = a;
  const InPlaceLu ours(work);
  EXPECT_GT(reference, 0.0);
  EXPECT_NEAR(ours.Rcond(), reference, 1e-9 * reference);
}
#endif

TEST(Factorisation, ExactlySingularMatrixHasZeroReciprocalCondition) {
  Eigen::MatrixXd a = Eigen::MatrixXd::Identity(5, 5);
  a.row(3) = a.row(1);  // two equal rows: an exactly zero pivot
  const InPlaceLu lu(a);
  EXPECT_EQ(lu.Rcond(), 0.0) << InPlaceLu::Backend();
}

TEST(Factorisation, NonFiniteMatrixHasZeroReciprocalCondition) {
  // A NaN or an infinity in the matrix (a degenerate panel that slipped through) must end the estimate, never
  // hang it or report it as well conditioned.
  for (const double bad : {std::nan(""), std::numeric_limits<double>::infinity()}) {
    Eigen::MatrixXd a = Eigen::MatrixXd::Identity(6, 6) + 0.1 * Eigen::MatrixXd::Ones(6, 6);
    a(2, 4) = bad;
    const InPlaceLu lu(a);
    EXPECT_EQ(lu.Rcond(), 0.0) << bad << ", " << InPlaceLu::Backend();
  }
}

TEST(Factorisation, BlasKernelRestartIsOfferedOnlyWhenItWouldHelp) {
  // OPENBLAS_CORETYPE set (by the user or by a restart) stops any further restart.
  const char* saved = std::getenv("OPENBLAS_CORETYPE");
  const std::string before = saved ? saved : "";
  setenv("OPENBLAS_CORETYPE", "Haswell", 1);
  EXPECT_EQ(BetterBlasKernel(), nullptr);
  if (saved) {
    setenv("OPENBLAS_CORETYPE", before.c_str(), 1);
  } else {
    unsetenv("OPENBLAS_CORETYPE");
  }
  // Otherwise only an AVX2 or AVX-512 family, and only when OpenBLAS runs a generic one.
  if (const char* k = BetterBlasKernel()) {
    EXPECT_TRUE(std::string(k) == "SkylakeX" || std::string(k) == "Haswell") << k;
    const std::string now = BlasKernelName();
    EXPECT_TRUE(now != "Haswell" && now != "SkylakeX" && now != "Zen") << now;
  }
  if (std::string(InPlaceLu::Backend()) == "OpenBLAS/LAPACKE") {
    EXPECT_STRNE(BlasKernelName(), "");
  }
}

TEST(Factorisation, BlasRestartNeverOverridesTheUsersSettings) {
  const auto saved = [](const char* name) {
    const char* v = std::getenv(name);
    return v ? std::optional<std::string>(v) : std::nullopt;
  };
  const auto restore = [](const char* name, const std::optional<std::string>& v) {
    if (v) {
      setenv(name, v->c_str(), 1);
    } else {
      unsetenv(name);
    }
  };
  const auto coretype = saved("OPENBLAS_CORETYPE"), timeout = saved("OPENBLAS_THREAD_TIMEOUT");
  setenv("OPENBLAS_CORETYPE", "Haswell", 1);
  setenv("OPENBLAS_THREAD_TIMEOUT", "20", 1);
  EXPECT_TRUE(BlasRestartSettings().empty());
  unsetenv("OPENBLAS_THREAD_TIMEOUT");
  // Only the timeout may be asked for now, and only with more than one OpenBLAS thread.
  const auto settings = BlasRestartSettings();
  for (const auto& [name, value] : settings) {
    EXPECT_EQ(name, "OPENBLAS_THREAD_TIMEOUT");
    EXPECT_EQ(value, "4");
  }
  {
    const ScopedBlasThreads one(1);
    EXPECT_TRUE(BlasRestartSettings().empty());
  }
  restore("OPENBLAS_CORETYPE", coretype);
  restore("OPENBLAS_THREAD_TIMEOUT", timeout);
}

// ---- the plan ------------------------------------------------------------------------------------------------

TEST(RunPlan, IsGivenOnceWithTheSystemsAndTheMemoryTheRunUses) {
  for (bool lateral : {true, false}) {
    const Case c = Aircraft(false, false);
    RunOptions o;
    o.lateral = lateral;
    std::vector<RunPlan> plans;
    o.on_plan = [&](const RunPlan& p) { plans.push_back(p); };
    const Results r = skein::Run(c, o);
    ASSERT_EQ(plans.size(), 1u);
    const RunPlan& p = plans.front();
    EXPECT_EQ(p.panels, r.mesh.panels);
    EXPECT_EQ(p.unknowns, r.mesh.unknowns);
    EXPECT_EQ(p.half_model, r.mesh.half_model);
    EXPECT_EQ(p.lateral, r.mesh.lateral);
    EXPECT_EQ(p.factorisations, r.mesh.factorisations);
    EXPECT_EQ(p.threads, r.times.threads_used);
    EXPECT_EQ(p.memory_estimate_bytes, r.mesh.memory_estimate_bytes);
    // The matrices dominate: the estimate holds 8 bytes per entry of every system held at once.
    const Lattice lat = BuildLattice(c);
    std::vector<std::size_t> sizes;
    for (const SystemLayout& l : ChooseLayouts(lat, WakeFor(c, 0.0, 0.0))) sizes.push_back(l.panel.size());
    if (!lateral) sizes.pop_back();
    EXPECT_EQ(p.memory_estimate_bytes, EstimateMemoryBytes(lat.panels(), lat.controls.size(), sizes));
    std::size_t matrices = 0;
    for (std::size_t m : sizes) matrices += 8 * m * m;
    EXPECT_GT(p.memory_estimate_bytes, matrices);
  }
  EXPECT_EQ(EstimateMemoryBytes(3000, 2, false), EstimateMemoryBytes(3000, 2, std::vector<std::size_t>{3000}));
}

}  // namespace
}  // namespace skein
