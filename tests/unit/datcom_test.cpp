// Tests for datcom.hpp: the DATCOM lift-curve slope (USAF Stability and Control DATCOM, sec. 4.1.3.2) at a
// point where it is exact by hand, its limits, and the constant-percent-chord sweep relation of a trapezoid
// (common practice geometry).
#include "skein/datcom.hpp"

#include <cmath>
#include <string>

#include <gtest/gtest.h>

#include "skein/error.hpp"

namespace skein {
namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double kDeg = kPi / 180.0;

TEST(DatcomLiftSlope, AspectRatio4At45DegreesIsExactlyPi) {
  // A = 4, tan(45 deg) = 1, M = 0: 8 pi / (2 + sqrt(16 x 2 + 4)) = 8 pi / 8.
  EXPECT_NEAR(datcom::LiftCurveSlope(4.0, 45.0 * kDeg), kPi, 4e-15);
}

TEST(DatcomLiftSlope, ValuesTheValidationUses) {
  // Aspect ratio 6: unswept 12 pi / (2 + sqrt(40)), and at 45 deg half-chord sweep 12 pi / (2 + sqrt(76)).
  EXPECT_NEAR(datcom::LiftCurveSlope(6.0, 0.0), 12.0 * kPi / (2.0 + std::sqrt(40.0)), 1e-14);
  EXPECT_NEAR(datcom::LiftCurveSlope(6.0, 0.0), 4.529, 5e-4);
  EXPECT_NEAR(datcom::LiftCurveSlope(6.0, 45.0 * kDeg), 3.517, 5e-4);
}

TEST(DatcomLiftSlope, HasTheSlenderAndTheTwoDimensionalLimits) {
  // Small aspect ratio: pi A / 2 (slender-wing theory, R. T. Jones; from memory), whatever the sweep.
  const double a = 1e-4;
  EXPECT_NEAR(datcom::LiftCurveSlope(a, 0.0) / (0.5 * kPi * a), 1.0, 1e-8);
  EXPECT_NEAR(datcom::LiftCurveSlope(a, 30.0 * kDeg) / (0.5 * kPi * a), 1.0, 1e-8);
  // Large aspect ratio, unswept: the section's 2 pi kappa, divided by beta at Mach M (Prandtl-Glauert).
  EXPECT_NEAR(datcom::LiftCurveSlope(1e9, 0.0), 2.0 * kPi, 1e-7);
  EXPECT_NEAR(datcom::LiftCurveSlope(1e9, 0.0, 0.0, 0.9), 2.0 * kPi * 0.9, 1e-7);
  const double m = 0.6, beta = std::sqrt(1.0 - m * m);
  EXPECT_NEAR(datcom::LiftCurveSlope(1e9, 0.0, m), 2.0 * kPi / beta, 1e-7);
  // Sweep and compressibility lower and raise it.
  EXPECT_LT(datcom::LiftCurveSlope(6.0, 30.0 * kDeg), datcom::LiftCurveSlope(6.0, 0.0));
  EXPECT_GT(datcom::LiftCurveSlope(6.0, 0.0, 0.5), datcom::LiftCurveSlope(6.0, 0.0));
}

TEST(DatcomLiftSlope, RefusesMeaninglessArguments) {
  EXPECT_THROW(datcom::LiftCurveSlope(0.0, 0.0), InputError);
  EXPECT_THROW(datcom::LiftCurveSlope(-3.0, 0.0), InputError);
  EXPECT_THROW(datcom::LiftCurveSlope(6.0, 0.5 * kPi), InputError);
  EXPECT_THROW(datcom::LiftCurveSlope(6.0, 0.0, 1.0), InputError);
  EXPECT_THROW(datcom::LiftCurveSlope(6.0, 0.0, -0.1), InputError);
  EXPECT_THROW(datcom::LiftCurveSlope(6.0, 0.0, 0.0, 0.0), InputError);
  EXPECT_THROW(datcom::LiftCurveSlope(std::nan(""), 0.0), InputError);
  try {
    datcom::LiftCurveSlope(-3.0, 0.0);
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), "DATCOM estimate: aspect ratio must be > 0 and finite, got -3");
  }
}

TEST(TrapezoidSweep, RectangularWingHasOneSweep) {
  for (const double s : {0.0, 20.0, -35.0})
    EXPECT_NEAR(datcom::SweepAtChordFraction(s * kDeg, 0.0, 0.7, 5.0, 1.0), s * kDeg, 1e-15);
}

TEST(TrapezoidSweep, DeltaWingWithAnUnsweptTrailingEdge) {
  // A delta (taper 0) of aspect ratio A with a straight trailing edge has tan(leading-edge sweep) = 4 / A:
  // half-span b/2, root chord c_r, S = b c_r / 2, tan = c_r / (b/2) = 4 / A.
  const double a = 4.0;
  const double le = std::atan(4.0 / a);
  EXPECT_NEAR(le, 45.0 * kDeg, 1e-15);
  EXPECT_NEAR(datcom::SweepAtChordFraction(le, 0.0, 1.0, a, 0.0), 0.0, 1e-15);
  // Its quarter- and half-chord lines: tan = 1 - 4/4 (n) = 1 - n.
  EXPECT_NEAR(std::tan(datcom::SweepAtChordFraction(le, 0.0, 0.25, a, 0.0)), 0.75, 1e-15);
  EXPECT_NEAR(std::tan(datcom::HalfChordSweep(datcom::SweepAtChordFraction(le, 0.0, 0.25, a, 0.0), a, 0.0)),
              0.5, 1e-15);
}

TEST(TrapezoidSweep, MatchesTheGeometryOfATaperedWing) {
  // A = 6, taper 0.4, quarter-chord sweep 30 deg: build the half-chord line from the corners.
  const double a = 6.0, taper = 0.4, span = 6.0, area = 6.0;
  const double cr = 2.0 * area / (span * (1.0 + taper)), ct = taper * cr, half = 0.5 * span;
  const double x_tip_qc = 0.25 * cr + half * std::tan(30.0 * kDeg);
  const double x_tip_le = x_tip_qc - 0.25 * ct;
  const double expected = std::atan((x_tip_le + 0.5 * ct - 0.5 * cr) / half);
  EXPECT_NEAR(datcom::HalfChordSweep(30.0 * kDeg, a, taper), expected, 1e-14);
  // And back.
  EXPECT_NEAR(datcom::SweepAtChordFraction(expected, 0.5, 0.25, a, taper), 30.0 * kDeg, 1e-14);
}

TEST(TrapezoidSweep, RefusesMeaninglessArguments) {
  EXPECT_THROW(datcom::SweepAtChordFraction(0.0, 0.25, 0.5, 0.0, 0.5), InputError);
  EXPECT_THROW(datcom::SweepAtChordFraction(0.0, 0.25, 0.5, 6.0, -0.1), InputError);
  EXPECT_THROW(datcom::SweepAtChordFraction(2.0, 0.25, 0.5, 6.0, 0.5), InputError);
}

}  // namespace
}  // namespace skein
