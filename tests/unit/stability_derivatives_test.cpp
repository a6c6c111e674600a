// Tests for the derivatives of loads.cpp: every derivative that comes from the unit right-hand sides of one
// factorisation (alpha, beta, the stability-axis rates p, q, r and every control) against a central finite
// difference of complete solutions, each re-meshed and re-solved from its own Case; and the neutral point,
// which must not move when the moment point moves along x.
//
// The reference is the discrete model itself (a finite difference of full solutions), so the tolerance is
// the finite-difference error, not a modelling error. Angles and rates per conventions.md.
#include <cmath>
#include <functional>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "../support/aircraft.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

using testing::ControlNamed;
using testing::TestAircraft;

// The agreement the acceptance test asks for: 1e-5 relative.
constexpr double kRelative = 1e-5;
// Below this magnitude (per rad) a derivative counts as zero and the comparison is absolute at
// kRelative * kZeroDerivative = 1e-8: a central difference with h = 0.01 deg carries round-off of about
// 1e-14 / 3.5e-4 = 3e-11, and truncation error of about (h^2 / 6) f''' = 5e-9 f''' relative.
constexpr double kZeroDerivative = 1e-3;
// Finite-difference steps: 0.01 deg for angles and deflections, 1e-4 for non-dimensional rates.
constexpr double kAngleStepDeg = 0.01;
constexpr double kRateStep = 1e-4;
constexpr double kDeg = 3.14159265358979323846 / 180.0;

const char* const kCoefficients[] = {"CL", "CY", "Cl", "Cm", "Cn"};

double Coefficient(const PointResult& p, const std::string& name) {
  if (name == "CL") return p.CL;
  if (name == "CY") return p.CY;
  if (name == "Cl") return p.Cl;
  if (name == "Cm") return p.Cm;
  return p.Cn;
}

PointResult Solve(const Case& c) {
  Results r = Run(c, {});
  EXPECT_EQ(r.points.size(), 1u);
  return r.points.front();
}

void ExpectClose(double analytic, double fd, const std::string& what) {
  const double tol = kRelative * std::max(std::abs(fd), kZeroDerivative);
  EXPECT_NEAR(analytic, fd, tol) << what << ": unit right-hand side " << analytic << ", finite difference " << fd;
}

/// A flight point away from every symmetry: sideslip, all three rates, every control deflected, so that the
/// terms that vanish in symmetric flight (and at zero deflection) are exercised too.
Case AwkwardPoint(WakeDirection wake) {
  Case c = TestAircraft(wake);
  c.flight.alpha_deg = {4.0};
  c.flight.beta_deg = {3.0};
  c.flight.rates = {0.15, -0.05, 0.08};  // rad/s at 40 m/s
  ControlNamed(c, "aileron").deflection_deg = 3.0;
  ControlNamed(c, "elevator").deflection_deg = -4.0;
  ControlNamed(c, "rudder").deflection_deg = 2.0;
  return c;
}

/// Central difference of every coefficient over a change applied to the case by `apply(case, +-1)`.
template <typename Apply>
std::vector<double> CentralDifference(const Case& base, double step, Apply apply) {
  Case plus = base, minus = base;
  apply(plus, +1.0);
  apply(minus, -1.0);
  const PointResult p = Solve(plus), m = Solve(minus);
  std::vector<double> d;
  for (const char* k : kCoefficients) d.push_back((Coefficient(p, k) - Coefficient(m, k)) / (2.0 * step));
  return d;
}

void CheckVariable(const Case& base, const PointResult& at, const std::string& var, double step,
                   const std::function<void(Case&, double)>& apply) {
  const std::vector<double> fd = CentralDifference(base, step, apply);
  for (std::size_t k = 0; k < 5; ++k) {
    const std::string name = std::string(kCoefficients[k]) + "_" + var;
    const auto analytic = at.derivatives.Get(name);
    ASSERT_TRUE(analytic.has_value()) << name;
    ExpectClose(*analytic, fd[k], name);
  }
}

void CheckRates(const Case& base, const PointResult& at) {
  // Stability-axis rates (conventions.md): p_s about x_s = -(cos a, 0, sin a), r_s about z_s = (sin a, 0, -cos a);
  // in body rates (p, q, r) with omega_geometry = (-p, q, -r): p_s -> (cos a, 0, sin a) p_s and
  // r_s -> (-sin a, 0, cos a) r_s. Non-dimensional: p b/2V, q c/2V, r b/2V.
  const double a = base.flight.alpha_deg.front() * kDeg, v = base.flight.speed;
  const double pb = 2.0 * v / base.reference.span, qc = 2.0 * v / base.reference.chord;
  CheckVariable(base, at, "p", kRateStep, [&](Case& c, double s) {
    c.flight.rates[0] += s * kRateStep * pb * std::cos(a);
    c.flight.rates[2] += s * kRateStep * pb * std::sin(a);
  });
  CheckVariable(base, at, "q", kRateStep, [&](Case& c, double s) { c.flight.rates[1] += s * kRateStep * qc; });
  CheckVariable(base, at, "r", kRateStep, [&](Case& c, double s) {
    c.flight.rates[0] -= s * kRateStep * pb * std::sin(a);
    c.flight.rates[2] += s * kRateStep * pb * std::cos(a);
  });
}

void CheckControls(const Case& base, const PointResult& at) {
  ASSERT_EQ(at.control_derivatives.size(), 3u);
  for (const auto& [name, values] : at.control_derivatives) {
    const std::vector<double> fd = CentralDifference(base, kAngleStepDeg * kDeg, [&](Case& c, double s) {
      ControlNamed(c, name).deflection_deg += s * kAngleStepDeg;
    });
    for (std::size_t k = 0; k < 5; ++k) {
      const auto analytic = values.Get(kCoefficients[k]);
      ASSERT_TRUE(analytic.has_value());
      ExpectClose(*analytic, fd[k], name + "." + kCoefficients[k]);
    }
  }
}

// With the x-axis wake the lattice does not depend on the flight condition, so every derivative of the
// discrete model is exact, alpha and beta included.
TEST(StabilityDerivatives, EveryDerivativeMatchesFiniteDifferencesWithXAxisWake) {
  const Case base = AwkwardPoint(WakeDirection::x_axis);
  const PointResult at = Solve(base);
  CheckVariable(base, at, "alpha", kAngleStepDeg * kDeg,
                [](Case& c, double s) { c.flight.alpha_deg[0] += s * kAngleStepDeg; });
  CheckVariable(base, at, "beta", kAngleStepDeg * kDeg,
                [](Case& c, double s) { c.flight.beta_deg[0] += s * kAngleStepDeg; });
  CheckRates(base, at);
  CheckControls(base, at);
}

// With the freestream wake a change of alpha or beta also turns the wake, which the derivatives hold fixed
// (loads.hpp); rates and deflections leave the wake where it is, so those derivatives stay exact.
TEST(StabilityDerivatives, RateAndControlDerivativesMatchFiniteDifferencesWithFreestreamWake) {
  const Case base = AwkwardPoint(WakeDirection::freestream);
  const PointResult at = Solve(base);
  CheckRates(base, at);
  CheckControls(base, at);
}

// A flat mid-wing with no dihedral at zero deflection has its induced velocities normal to its own plane, so
// a control's normal rate (in that plane) sees none of them; the dihedral, the tail above the wing and the
// deflections of AwkwardPoint make them matter. The same check on a symmetric point exercises the half model.
TEST(StabilityDerivatives, ControlDerivativesMatchFiniteDifferencesInSymmetricFlight) {
  Case base = TestAircraft(WakeDirection::x_axis);
  ControlNamed(base, "elevator").deflection_deg = -3.0;
  const PointResult at = Solve(base);
  CheckControls(base, at);
  CheckVariable(base, at, "alpha", kAngleStepDeg * kDeg,
                [](Case& c, double s) { c.flight.alpha_deg[0] += s * kAngleStepDeg; });
}

// The neutral point is where Cm stops changing with alpha: moving the moment point along x (or y) must leave
// it in place, at any alpha and with any camber, deflection or incidence.
TEST(NeutralPoint, DoesNotMoveWhenTheMomentPointMovesAlongX) {
  for (WakeDirection wake : {WakeDirection::x_axis, WakeDirection::freestream}) {
    Case a = TestAircraft(wake);
    a.flight.alpha_deg = {6.0};
    ControlNamed(a, "elevator").deflection_deg = -5.0;
    Case b = a;
    b.reference.moment_point = {1.85, 0.3, 0.0};
    const PointResult pa = Solve(a), pb = Solve(b);
    ASSERT_TRUE(pa.neutral_point && pb.neutral_point);
    EXPECT_NEAR((*pa.neutral_point)[0], (*pb.neutral_point)[0], 1e-9 * a.reference.chord);
    // The static margins then differ by exactly the shift over the reference chord.
    EXPECT_NEAR(*pa.static_margin - *pb.static_margin, (1.85 - 0.45) / a.reference.chord, 1e-9);
    // And Cm taken about the neutral point does not change with alpha.
    Case n = a;
    n.reference.moment_point = *pa.neutral_point;
    EXPECT_NEAR(*Solve(n).derivatives.Get("Cm_alpha"), 0.0, 1e-9);
  }
}

}  // namespace
}  // namespace skein
