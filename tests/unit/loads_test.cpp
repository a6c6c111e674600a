// Tests for loads.hpp: what symmetry and statics demand of the coefficients, the per-surface and per-strip
// shares, and the exact derivatives of the flow basis against finite differences of complete solutions.
//
// Sources: axes and signs, conventions.md; the transfer of a moment to another point, M' = M - (dr x F)
// (statics, common practice); the neutral point as the point about which Cm does not change with alpha
// (common practice). The finite-difference reference is the discrete model itself, so the tolerances are
// finite-difference and round-off errors, not modelling errors.
#include "skein/loads.hpp"

#include <cmath>
#include <functional>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/lattice.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

using testing::kDeg;
using testing::Mesh;

// Coefficients are sums of a few thousand terms of order one: 1e-12 absolute is round-off.
constexpr double kRoundOff = 1e-12;

/// A wing with dihedral, sweep, taper, camber and washout, and a centre-line fin above the root: a
/// configuration where every force and moment and every derivative is non-zero in sideslip with rates.
Case WingAndFin(WakeDirection wake, std::vector<double> alpha = {4.0}, std::vector<double> beta = {0.0}) {
  const MeshOptions mesh = Mesh(5, 10, Spacing::cosine, Spacing::cosine, wake);
  Surface w = testing::TaperedWing(9.0, 1.4, 0.5, 12.0, mesh, testing::Naca4(2, 4));
  w.sections[1].leading_edge[2] = 0.5;
  w.sections[1].twist_deg = -2.0;
  Surface fin;
  fin.name = "fin";
  fin.symmetric = false;
  fin.mesh = Mesh(4, 5, Spacing::cosine, Spacing::cosine, wake);
  fin.sections.push_back(testing::MakeSection({3.5, 0.0, 0.2}, 1.0));
  fin.sections.push_back(testing::MakeSection({4.1, 0.0, 1.5}, 0.6));
  std::vector<Surface> s{w, fin};
  Case c = testing::MakeCase(s, std::move(alpha), std::move(beta));
  c.reference.moment_point = {0.4, 0.0, 0.1};
  c.flight.speed = 25.0;
  c.flight.speed_given = true;
  return c;
}

PointResult Solve(const Case& c) { return skein::Run(c, {}).points.at(0); }

TEST(Loads, SymmetricWingInSymmetricFlightHasNoLateralLoads) {
  const PointResult p = Solve(testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.5, 20.0, Mesh(4, 10)), {6.0}));
  EXPECT_GT(p.CL, 0.3);
  EXPECT_GT(p.CD_induced, 0.0);
  EXPECT_NEAR(p.CY, 0.0, kRoundOff);
  EXPECT_NEAR(p.Cl, 0.0, kRoundOff);
  EXPECT_NEAR(p.Cn, 0.0, kRoundOff);
  // The swept wing's lift acts behind the moment point at the root leading edge: nose down.
  EXPECT_LT(p.Cm, 0.0);
  // Symmetric span loading: strip i and its mirror carry the same circulation.
  const auto& g = p.surfaces[0].strips.gamma;
  for (std::size_t k = 0; k < g.size(); ++k) EXPECT_NEAR(g[k], g[g.size() - 1 - k], kRoundOff);
}

TEST(Loads, FlatWingAtZeroAlphaCarriesNothing) {
  const PointResult p = Solve(testing::WingCase(testing::RectangularWing(6.0, 1.0, Mesh(4, 8)), {0.0}));
  EXPECT_NEAR(p.CL, 0.0, kRoundOff);
  EXPECT_NEAR(p.Cm, 0.0, kRoundOff);
  EXPECT_NEAR(p.CD_induced, 0.0, kRoundOff);
  EXPECT_FALSE(p.span_efficiency.has_value());  // 0/0 is reported as absent, not NaN
}

TEST(Loads, SideslipToTheOtherSideMirrorsTheLateralLoads) {
  const Case c = WingAndFin(WakeDirection::freestream, {5.0}, {-6.0, 6.0});
  const Results r = skein::Run(c, {});
  ASSERT_EQ(r.points.size(), 2u);
  const PointResult &m = r.points[0], &p = r.points[1];
  EXPECT_GT(std::abs(p.CY), 1e-3);
  EXPECT_GT(std::abs(p.Cl), 1e-3);
  EXPECT_GT(std::abs(p.Cn), 1e-4);
  EXPECT_NEAR(m.CY, -p.CY, kRoundOff);
  EXPECT_NEAR(m.Cl, -p.Cl, kRoundOff);
  EXPECT_NEAR(m.Cn, -p.Cn, kRoundOff);
  EXPECT_NEAR(m.CL, p.CL, kRoundOff);
  EXPECT_NEAR(m.Cm, p.Cm, kRoundOff);
  EXPECT_NEAR(m.CD_induced, p.CD_induced, kRoundOff);
  // Positive beta is wind from the right: the fin (normal -y) is pushed toward -y, side force negative, and
  // the nose yaws into the wind (Cn > 0, weathercock stability, the fin being aft of the moment point); the
  // dihedral rolls the aircraft away from the sideslip (Cl < 0).
  EXPECT_LT(p.CY, 0.0);
  EXPECT_GT(p.Cn, 0.0);
  EXPECT_LT(p.Cl, 0.0);
}

TEST(Loads, SurfaceSharesAddUpToTheTotals) {
  Case c = WingAndFin(WakeDirection::freestream, {5.0}, {4.0});
  c.flight.rates = {0.2, 0.1, -0.15};
  const PointResult p = Solve(c);
  ASSERT_EQ(p.surfaces.size(), 2u);
  double CL = 0, CY = 0, Cl = 0, Cm = 0, Cn = 0, CDi = 0, CDn = 0;
  for (const SurfaceLoads& s : p.surfaces) {
    CL += s.CL;
    CY += s.CY;
    Cl += s.Cl;
    Cm += s.Cm;
    Cn += s.Cn;
    CDi += s.CD_induced;
    CDn += s.CD_induced_nearfield;
  }
  EXPECT_NEAR(CL, p.CL, kRoundOff);
  EXPECT_NEAR(CY, p.CY, kRoundOff);
  EXPECT_NEAR(Cl, p.Cl, kRoundOff);
  EXPECT_NEAR(Cm, p.Cm, kRoundOff);
  EXPECT_NEAR(Cn, p.Cn, kRoundOff);
  EXPECT_NEAR(CDi, p.CD_induced, kRoundOff);
  EXPECT_NEAR(CDn, p.CD_induced_nearfield, kRoundOff);
  EXPECT_GT(std::abs(p.surfaces[1].CY), 1e-3);  // the fin's share is real
}

TEST(Loads, StripsAreConsistentWithTheTotals) {
  // Flat, unswept, planar wing at small alpha: the normal force is the lift to O(alpha), and the strips'
  // normal forces add up to it exactly (sum of cl c w / S over strips = C_N).
  const double alpha = 3.0;
  const Case c = testing::WingCase(testing::TaperedWing(6.0, 1.0, 0.5, 0.0, Mesh(4, 12)), {alpha});
  const PointResult p = Solve(c);
  const Lattice lat = BuildLattice(c);
  const StripLoads& s = p.surfaces[0].strips;
  ASSERT_EQ(s.cl.size(), lat.strips.size());
  double cn = 0.0;
  for (std::size_t k = 0; k < s.cl.size(); ++k) {
    cn += s.cl[k] * s.chord[k] * lat.strips[k].width / c.reference.area;
    EXPECT_NEAR(s.cl_c_over_cref[k], s.cl[k] * s.chord[k] / c.reference.chord, kRoundOff);
    EXPECT_GT(s.gamma[k], 0.0);
  }
  // C_N = CL cos(alpha) + CD_nearfield sin(alpha) for a planar wing in the xy plane.
  EXPECT_NEAR(cn, p.CL * std::cos(alpha * kDeg) + p.CD_induced_nearfield * std::sin(alpha * kDeg), 1e-12);
  // Lift of a planar wing: Kutta-Joukowski sum rho V Gamma b_strip per strip (V = rho = 1), to O(alpha^2).
  double lift = 0.0;
  for (std::size_t k = 0; k < s.gamma.size(); ++k) lift += s.gamma[k] * lat.strips[k].width;
  EXPECT_NEAR(lift / (0.5 * c.reference.area), p.CL, 0.01 * p.CL);
}

TEST(Loads, MovingTheMomentPointTransfersPitchingMomentByStatics) {
  // M' = M - (dr x F): moving the moment point aft by dx adds dx F_z to M_y, so Cm' = Cm + CZ dx / c with
  // CZ = F_z / (q S) = CL cos(alpha) + CD sin(alpha) (CD the near-field drag in F). At alpha = 0, CZ = CL.
  for (const double alpha : {0.0, 6.0}) {
    Case c = testing::WingCase(
        testing::TaperedWing(8.0, 1.2, 0.5, 20.0, Mesh(4, 10), testing::Naca4(4, 4)), {alpha});
    const PointResult p0 = Solve(c);
    const double dx = 0.37;
    c.reference.moment_point[0] += dx;
    const PointResult p1 = Solve(c);
    const double cz = p0.CL * std::cos(alpha * kDeg) + p0.CD_induced_nearfield * std::sin(alpha * kDeg);
    EXPECT_NEAR(p1.Cm - p0.Cm, cz * dx / c.reference.chord, kRoundOff) << "alpha " << alpha;
    if (!(std::abs(alpha) > 0.0)) {
      EXPECT_NEAR(p1.Cm - p0.Cm, p0.CL * dx / c.reference.chord, kRoundOff);
    }
    EXPECT_NEAR(p1.CL, p0.CL, kRoundOff);  // forces do not depend on the moment point
    EXPECT_GT(p0.CL, 0.2);                 // camber lifts at alpha = 0
  }
}

TEST(Loads, NeutralPointDoesNotMoveWithTheMomentPoint) {
  Case c = WingAndFin(WakeDirection::x_axis, {5.0});
  std::vector<double> x_np;
  for (const double x : {-1.0, 0.0, 0.4, 2.5}) {
    c.reference.moment_point = {x, 0.0, 0.1};
    const PointResult p = Solve(c);
    ASSERT_TRUE(p.neutral_point.has_value());
    x_np.push_back((*p.neutral_point)[0]);
    EXPECT_NEAR(*p.static_margin, ((*p.neutral_point)[0] - x) / c.reference.chord, kRoundOff);
  }
  for (double v : x_np) EXPECT_NEAR(v, x_np.front(), 1e-9);
  // A swept wing's neutral point lies aft of the root leading edge, near the mean quarter chord.
  EXPECT_GT(x_np.front(), 0.3);
}

// ---- derivatives against central finite differences --------------------------------------------------------

double Coefficient(const PointResult& p, const std::string& name) {
  if (name == "CL") return p.CL;
  if (name == "CY") return p.CY;
  if (name == "Cl") return p.Cl;
  if (name == "Cm") return p.Cm;
  if (name == "Cn") return p.Cn;
  ADD_FAILURE() << "unknown coefficient " << name;
  return 0.0;
}

// The acceptance figure: 1e-5 relative. Central differences with h = 0.05 deg (8.7e-4 rad) or 1e-3 in a
// non-dimensional rate carry truncation error h^2 f''' / 6, about 1e-7 relative for these smooth (bilinear and
// trigonometric) functions, and round-off of 1e-15 / h = 1e-12.
constexpr double kRelative = 1e-5;
// Derivatives smaller than this (per rad) are compared absolutely at kRelative x kFloor.
constexpr double kFloor = 1e-2;

TEST(Loads, DerivativesMatchCentralFiniteDifferencesOfFullSolutions) {
  // Sideslip and rates at the base point, so that every derivative is non-zero; x-axis wake, so the wake does
  // not move with alpha and beta and the finite differences see the same model the derivatives assume.
  const double alpha = 4.0, beta = 3.0, h_deg = 0.05, h_rate = 1e-3;
  Case base = WingAndFin(WakeDirection::x_axis, {alpha}, {beta});
  base.flight.rates = {0.3, -0.2, 0.25};
  const PointResult p0 = Solve(base);
  const double V = base.flight.speed, b = base.reference.span, cref = base.reference.chord;
  const double ca = std::cos(alpha * kDeg), sa = std::sin(alpha * kDeg);

  // Each variable: how a step of size s changes the case (angles in deg, rates in body axes, rad/s).
  struct Var {
    std::string name;
    double step;  // in the variable's unit (rad, or non-dimensional rate)
    std::function<void(Case&, double)> apply;
  };
  const std::vector<Var> vars = {
      {"alpha", h_deg * kDeg, [&](Case& c, double s) { c.flight.alpha_deg = {alpha + s / kDeg}; }},
      {"beta", h_deg * kDeg, [&](Case& c, double s) { c.flight.beta_deg = {beta + s / kDeg}; }},
      // Stability-axis roll rate p_s = p_hat 2V/b: body p = p_s cos(alpha), r = p_s sin(alpha).
      {"p", h_rate, [&](Case& c, double s) {
         c.flight.rates[0] += s * 2.0 * V / b * ca;
         c.flight.rates[2] += s * 2.0 * V / b * sa;
       }},
      {"q", h_rate, [&](Case& c, double s) { c.flight.rates[1] += s * 2.0 * V / cref; }},
      // Stability-axis yaw rate r_s = r_hat 2V/b: body p = -r_s sin(alpha), r = r_s cos(alpha).
      {"r", h_rate, [&](Case& c, double s) {
         c.flight.rates[0] -= s * 2.0 * V / b * sa;
         c.flight.rates[2] += s * 2.0 * V / b * ca;
       }},
  };
  int nonzero = 0;
  for (const Var& var : vars) {
    Case plus = base, minus = base;
    var.apply(plus, var.step);
    var.apply(minus, -var.step);
    const PointResult pp = Solve(plus), pm = Solve(minus);
    for (const std::string coef : {"CL", "CY", "Cl", "Cm", "Cn"}) {
      const std::string name = coef + "_" + var.name;
      const auto exact = p0.derivatives.Get(name);
      ASSERT_TRUE(exact.has_value()) << name;
      const double fd = (Coefficient(pp, coef) - Coefficient(pm, coef)) / (2.0 * var.step);
      EXPECT_NEAR(*exact, fd, kRelative * std::max(std::abs(fd), kFloor)) << name;
      if (std::abs(fd) > kFloor) ++nonzero;
    }
  }
  EXPECT_GE(nonzero, 20) << "most of the 25 derivatives should be non-trivial at this flight point";
}

TEST(Loads, RollDampingAndLiftSlopeHaveTheirTextbookSigns) {
  // Common practice: a wing lifts with alpha, damps roll (Cl_p < 0), and, about a moment point ahead of its
  // aerodynamic centre (here the root leading edge of a swept wing), damps pitch (Cm_q < 0) and is statically
  // stable (Cm_alpha < 0).
  const PointResult p = Solve(testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.5, 20.0, Mesh(4, 10)), {3.0}));
  EXPECT_GT(*p.derivatives.Get("CL_alpha"), 3.0);
  EXPECT_LT(*p.derivatives.Get("Cl_p"), 0.0);
  EXPECT_LT(*p.derivatives.Get("Cm_q"), 0.0);
  EXPECT_LT(*p.derivatives.Get("Cm_alpha"), 0.0);
}

}  // namespace
}  // namespace skein
