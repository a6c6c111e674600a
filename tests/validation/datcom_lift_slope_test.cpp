// Lift-curve slope of a straight-tapered wing against the handbook formula.
//
// Source: USAF Stability and Control DATCOM (D. E. Hoak et al., Air Force Flight Dynamics Laboratory,
// Wright-Patterson AFB, 1960, revised 1978), section 4.1.3.2, the subsonic wing lift-curve slope
//     CL_alpha = 2 pi A / (2 + sqrt(A^2 beta^2 / kappa^2 (1 + tan^2(Lambda_c/2) / beta^2) + 4))
// (skein::datcom::LiftCurveSlope). For A = 6 at M = 0, kappa = 1: 4.529 per radian unswept and 3.517 at
// 45 deg half-chord sweep. The formula is semi-empirical (Helmbold's form with a sweep term) and, like
// lifting-line theory, sits above lifting-surface results at moderate aspect ratio; the acceptance band is
// therefore asymmetric: from 6% below to 2% above DATCOM.
//
// Geometry: aspect ratio 6, taper 0.4, flat, no dihedral; the half-chord sweep is converted to the
// quarter-chord sweep the test planform takes with the trapezoid relation (common practice geometry,
// skein::datcom::SweepAtChordFraction). DATCOM's data come from planar-wake theory and tests at small
// angles: wake = "x-axis".
#include <cmath>
#include <string>

#include <fmt/format.h>
#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/datcom.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

constexpr double kDeg = 3.14159265358979323846 / 180.0;
constexpr double kBelow = 0.06, kAbove = 0.02;  // acceptance band relative to DATCOM

void ExpectDatcom(double half_chord_sweep_deg, double published) {
  const double aspect = 6.0, taper = 0.4, span = 6.0;
  const double root_chord = 2.0 * (span * span / aspect) / (span * (1.0 + taper));  // S = b^2 / A
  const double quarter = datcom::SweepAtChordFraction(half_chord_sweep_deg * kDeg, 0.5, 0.25, aspect, taper);
  const Case c = testing::WingCase(
      testing::TaperedWing(span, root_chord, taper, quarter / kDeg, testing::Mesh(8, 60)), {0.0});
  ASSERT_NEAR(c.reference.span * c.reference.span / c.reference.area, aspect, 1e-12);
  const double formula = datcom::LiftCurveSlope(aspect, half_chord_sweep_deg * kDeg);
  EXPECT_NEAR(formula, published, 5e-4) << "the formula is the one the published figure comes from";
  const double a = *skein::Run(c, {}).points.at(0).derivatives.Get("CL_alpha");
  ::testing::Test::RecordProperty(fmt::format("CL_alpha_{:.0f}deg", half_chord_sweep_deg), fmt::format("{:.4f}", a));
  ::testing::Test::RecordProperty(fmt::format("relative_to_datcom_{:.0f}deg", half_chord_sweep_deg),
                 fmt::format("{:+.4f}", a / formula - 1.0));
  EXPECT_GT(a, (1.0 - kBelow) * formula) << "CL_alpha " << a << " vs DATCOM " << formula;
  EXPECT_LT(a, (1.0 + kAbove) * formula) << "CL_alpha " << a << " vs DATCOM " << formula;
}

TEST(Datcom4132, AspectRatio6Taper04Unswept) { ExpectDatcom(0.0, 4.529); }
TEST(Datcom4132, AspectRatio6Taper04HalfChordSweep45) { ExpectDatcom(45.0, 3.517); }

}  // namespace
}  // namespace skein
