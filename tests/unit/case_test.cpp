// Tests for case.hpp and error.hpp: enum spellings, the NACA 4-digit mean line, the measures of a surface,
// and the InputError message format.
#include "skein/case.hpp"

#include <cmath>
#include <string>

#include <gtest/gtest.h>

#include "skein/error.hpp"

namespace skein {
namespace {

// Tolerance for closed-form checks: a few ulps of values of order one.
constexpr double kTight = 1e-14;

Section MakeSection(double x, double y, double z, double chord) {
  Section s;
  s.leading_edge = {x, y, z};
  s.chord = chord;
  return s;
}

Camber Naca4(int m, int p) {
  Camber c;
  c.kind = Camber::Kind::naca4;
  c.max_camber = m / 100.0;
  c.max_camber_position = p / 10.0;
  return c;
}

TEST(EnumSpelling, RoundTripsEverySpacingAndWake) {
  for (Spacing s : {Spacing::uniform, Spacing::cosine, Spacing::sine}) EXPECT_EQ(SpacingFromString(ToString(s)), s);
  for (WakeDirection w : {WakeDirection::freestream, WakeDirection::x_axis})
    EXPECT_EQ(WakeDirectionFromString(ToString(w)), w);
  EXPECT_EQ(ToString(WakeDirection::x_axis), "x-axis");  // case-format.md spelling
  EXPECT_EQ(ToString(Spacing::cosine), "cosine");
}

TEST(EnumSpelling, UnknownSpellingIsNullopt) {
  EXPECT_FALSE(SpacingFromString("Cosine").has_value());
  EXPECT_FALSE(SpacingFromString("").has_value());
  EXPECT_FALSE(WakeDirectionFromString("x_axis").has_value());
}

// NACA 4-digit mean line: Abbott & von Doenhoff, Theory of Wing Sections, sec. 6.4.
TEST(Camber, FlatHasNoHeightOrSlope) {
  const Camber flat;
  for (double x : {0.0, 0.3, 1.0}) {
    EXPECT_EQ(flat.Height(x), 0.0);
    EXPECT_EQ(flat.Slope(x), 0.0);
  }
}

TEST(Camber, Naca00xxIsFlat) {
  const Camber c = Naca4(0, 0);  // NACA 0012: symmetric section, m = 0
  for (double x : {0.0, 0.4, 1.0}) {
    EXPECT_EQ(c.Height(x), 0.0);
    EXPECT_EQ(c.Slope(x), 0.0);
  }
}

TEST(Camber, Naca2412PeaksAtFortyPercentChord) {
  // Abbott & von Doenhoff sec. 6.4: max camber m = 0.02 at p = 0.4, zero slope there, slope 2m/p = 0.1 at the
  // leading edge and -2m/(1-p) at the trailing edge; the line runs from z = 0 at x = 0 to z = 0 at x = 1.
  const Camber c = Naca4(2, 4);
  EXPECT_NEAR(c.Height(0.4), 0.02, kTight);
  EXPECT_NEAR(c.Slope(0.4), 0.0, kTight);
  EXPECT_NEAR(c.Slope(0.0), 0.1, kTight);
  EXPECT_NEAR(c.Slope(1.0), -2.0 * 0.02 / 0.6, kTight);
  EXPECT_NEAR(c.Height(0.0), 0.0, kTight);
  EXPECT_NEAR(c.Height(1.0), 0.0, kTight);
}

TEST(Camber, Naca4415MatchesClosedFormOnBothBranches) {
  // Abbott & von Doenhoff sec. 6.4, evaluated by hand: m = 0.04, p = 0.4.
  const Camber c = Naca4(4, 4);
  const double m = 0.04, p = 0.4;
  const double xf = 0.1, xa = 0.7;  // fore and aft of p
  EXPECT_NEAR(c.Height(xf), m / (p * p) * (2 * p * xf - xf * xf), kTight);
  EXPECT_NEAR(c.Height(xa), m / ((1 - p) * (1 - p)) * ((1 - 2 * p) + 2 * p * xa - xa * xa), kTight);
  EXPECT_NEAR(c.Slope(xf), 2 * m / (p * p) * (p - xf), kTight);
  EXPECT_NEAR(c.Slope(xa), 2 * m / ((1 - p) * (1 - p)) * (p - xa), kTight);
}

TEST(Camber, SlopeIsTheDerivativeOfHeight) {
  // Central differences of the closed form (common practice); step h, error O(h^2) away from x = p.
  const Camber c = Naca4(6, 3);
  const double h = 1e-6;
  for (double x : {0.05, 0.2, 0.5, 0.8, 0.95})
    EXPECT_NEAR(c.Slope(x), (c.Height(x + h) - c.Height(x - h)) / (2 * h), 1e-8) << "x = " << x;
}

TEST(Camber, HeightIsContinuousAtMaxCamberPosition) {
  const Camber c = Naca4(2, 4);
  EXPECT_NEAR(c.Height(0.4 - 1e-12), c.Height(0.4), 1e-13);
}

// Trapezoid planform: area = b (c_r + c_t)/2 and mean aerodynamic chord = 2/3 c_r (1 + l + l^2)/(1 + l)
// with l = c_t/c_r (common practice).
TEST(MeasureSurface, RectangleIsSpanTimesChord) {
  Surface s;
  s.symmetric = true;
  s.sections = {MakeSection(0, 0, 0, 0.3), MakeSection(0, 1.2, 0, 0.3)};
  const SurfaceExtent e = MeasureSurface(s);
  EXPECT_NEAR(e.area, 2.4 * 0.3, kTight);
  EXPECT_NEAR(e.span, 2.4, kTight);
  EXPECT_NEAR(e.mean_aerodynamic_chord, 0.3, kTight);
}

TEST(MeasureSurface, TrapezoidMatchesTextbookFormulas) {
  const double cr = 0.4, ct = 0.16, b = 3.0, l = ct / cr;
  Surface s;
  s.symmetric = true;
  s.sections = {MakeSection(0, 0, 0, cr), MakeSection(0.3, b / 2, 0.1, ct)};  // sweep and dihedral: no effect
  const SurfaceExtent e = MeasureSurface(s);
  EXPECT_NEAR(e.area, b * (cr + ct) / 2, kTight);
  EXPECT_NEAR(e.span, b, kTight);
  EXPECT_NEAR(e.mean_aerodynamic_chord, 2.0 / 3.0 * cr * (1 + l + l * l) / (1 + l), kTight);
}

TEST(MeasureSurface, CrankedWingSumsItsPanels) {
  // Two trapezoids end to end: area and MAC add as integrals of c and c^2 over the span (common practice).
  Surface s;
  s.symmetric = true;
  s.sections = {MakeSection(0, 0, 0, 0.5), MakeSection(0.1, 0.5, 0, 0.5), MakeSection(0.3, 1.5, 0, 0.2)};
  const double int_c = 0.5 * 0.5 + 1.0 * (0.5 + 0.2) / 2;
  const double int_c2 = 0.5 * 0.25 + 1.0 * (0.25 + 0.1 + 0.04) / 3;
  const SurfaceExtent e = MeasureSurface(s);
  EXPECT_NEAR(e.area, 2 * int_c, kTight);
  EXPECT_NEAR(e.mean_aerodynamic_chord, int_c2 / int_c, kTight);
  EXPECT_NEAR(e.span, 3.0, kTight);
}

TEST(MeasureSurface, WingOffTheCentreLineSpansTipToTip) {
  // Root at y = 0.2 (a fuselage between the halves): the tip-to-tip span includes the gap, the area does not.
  Surface s;
  s.symmetric = true;
  s.sections = {MakeSection(0, 0.2, 0, 0.3), MakeSection(0, 1.2, 0, 0.3)};
  const SurfaceExtent e = MeasureSurface(s);
  EXPECT_NEAR(e.span, 2.4, kTight);
  EXPECT_NEAR(e.area, 2 * 1.0 * 0.3, kTight);
}

TEST(MeasureSurface, SingleSurfaceIsNotDoubled) {
  Surface s;
  s.symmetric = false;
  s.sections = {MakeSection(0, -1.0, 0, 0.2), MakeSection(0, 0.0, 0, 0.4), MakeSection(0, 1.0, 0, 0.2)};
  const SurfaceExtent e = MeasureSurface(s);
  EXPECT_NEAR(e.area, 2 * 1.0 * (0.2 + 0.4) / 2, kTight);
  EXPECT_NEAR(e.span, 2.0, kTight);
}

TEST(MeasureSurface, FinUsesItsOwnPlane) {
  // A fin in the xz plane has no projected area on xy: its area and span are taken in its own plane.
  const double cr = 0.3, ct = 0.15, h = 0.5, l = ct / cr;
  Surface s;
  s.symmetric = false;
  s.sections = {MakeSection(1.0, 0, 0, cr), MakeSection(1.2, 0, h, ct)};
  const SurfaceExtent e = MeasureSurface(s);
  EXPECT_NEAR(e.area, h * (cr + ct) / 2, kTight);
  EXPECT_NEAR(e.span, h, kTight);
  EXPECT_NEAR(e.mean_aerodynamic_chord, 2.0 / 3.0 * cr * (1 + l + l * l) / (1 + l), kTight);
}

TEST(InputError, FormatsFileLineAndColumn) {
  const InputError e("survey.toml", {14, 9}, "surface \"wing\" section 2: chord must be > 0, got -0.18");
  EXPECT_STREQ(e.what(), "survey.toml:14:9: surface \"wing\" section 2: chord must be > 0, got -0.18");
  EXPECT_EQ(e.file(), "survey.toml");
  EXPECT_EQ(e.where().line, 14);
  EXPECT_EQ(e.where().column, 9);
  EXPECT_EQ(e.message(), "surface \"wing\" section 2: chord must be > 0, got -0.18");
}

TEST(InputError, LeavesOutUnknownParts) {
  EXPECT_STREQ(InputError("a.toml", {3, 0}, "m").what(), "a.toml:3: m");
  EXPECT_STREQ(InputError("a.toml", {}, "m").what(), "a.toml: m");
  EXPECT_STREQ(InputError("", {3, 4}, "m").what(), "3:4: m");
  EXPECT_STREQ(InputError("only the message").what(), "only the message");
}

TEST(AssertionFailedDeathTest, PrintsExpressionAndPlaceThenAborts) {
  EXPECT_DEATH(SKEIN_ASSERT(1 + 1 == 3), "skein: internal error: 1 \\+ 1 == 3 at .*case_test.cpp:[0-9]+");
}

}  // namespace
}  // namespace skein
