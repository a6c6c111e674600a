// Profile drag by strip theory: the skin-friction laws, the form factor, and their use over a wing.
//
// Sources:
//  - H. Schlichting, Boundary-Layer Theory, 7th ed., McGraw-Hill, 1979: the Blasius flat plate, laminar,
//    Cf = 1.328 / sqrt(Re) (ch. VII, eq. 7.34), and the Prandtl-Schlichting turbulent law
//    Cf = 0.455 / (log10 Re)^2.58 (ch. XXI, eq. 21.16). Values below: those formulas evaluated at the Reynolds
//    numbers named (to 5 figures), e.g. the turbulent Cf = 0.0044708 at Re = 1e6 of Schlichting's Fig. 21.2.
//  - S. F. Hoerner, Fluid-Dynamic Drag, 1965, ch. 6: form factor of a section 1 + 2 t/c + 60 (t/c)^4
//    (from memory; the figure 1.2524 at t/c = 0.12 is the formula's).
//  - Integral checks (common practice): a wing made of one section has CD_profile = cd S_wet-weighted, i.e. for
//    constant chord and no polar exactly 2 Cf FF, and for a polar of constant cd exactly that cd.
#include <cmath>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/atmosphere.hpp"
#include "skein/profile_drag.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

TEST(SkinFriction, BlasiusLaminar) {
  EXPECT_NEAR(LaminarSkinFriction(1e5) / 4.19950e-3, 1.0, 1e-5);
  EXPECT_NEAR(LaminarSkinFriction(1e6) / 1.32800e-3, 1.0, 1e-5);
  EXPECT_NEAR(LaminarSkinFriction(1e7) / 4.19950e-4, 1.0, 1e-5);
}

TEST(SkinFriction, PrandtlSchlichtingTurbulent) {
  EXPECT_NEAR(TurbulentSkinFriction(1e5) / 7.15598e-3, 1.0, 1e-5);
  EXPECT_NEAR(TurbulentSkinFriction(1e6) / 4.47076e-3, 1.0, 1e-5);
  EXPECT_NEAR(TurbulentSkinFriction(1e7) / 3.00371e-3, 1.0, 1e-5);
}

// Transition: the limits are the pure laws, and in between the friction lies between them, rising as the
// transition moves forward.
TEST(SkinFriction, TransitionBlendsTheLaws) {
  const double re = 3e6;
  EXPECT_DOUBLE_EQ(MixedSkinFriction(re, 0.0), TurbulentSkinFriction(re));
  EXPECT_NEAR(MixedSkinFriction(re, 1.0) / LaminarSkinFriction(re), 1.0, 1e-14);
  double prev = LaminarSkinFriction(re);
  for (double xt : {0.8, 0.6, 0.4, 0.2, 0.05}) {
    const double cf = MixedSkinFriction(re, xt);
    EXPECT_GT(cf, prev) << xt;
    EXPECT_LT(cf, TurbulentSkinFriction(re)) << xt;
    prev = cf;
  }
}

TEST(SkinFriction, HoernerFormFactor) {
  EXPECT_DOUBLE_EQ(ThicknessFormFactor(0.0), 1.0);
  EXPECT_NEAR(ThicknessFormFactor(0.12), 1.2524416, 1e-7);
}

Case Rectangle(Camber camber = {}) {
  Case c = testing::WingCase(testing::RectangularWing(8.0, 1.0, testing::Mesh(4, 12), std::move(camber)), {2.0});
  c.flight.speed = 30.0;
  c.flight.speed_given = true;
  return c;
}

double Reynolds(const Case& c, double chord) {
  return c.flight.speed * chord * c.flight.density / c.flight.dynamic_viscosity;
}

TEST(StripTheoryDrag, FlatPlateWingIsTwiceTheBlasiusFriction) {
  Case c = Rectangle();
  for (Section& s : c.surfaces[0].sections) s.viscous.transition = 1.0;  // all laminar; flat: t/c = 0
  const Results r = skein::Run(c, {});
  ASSERT_TRUE(r.points[0].profile.has_value());
  EXPECT_NEAR(r.points[0].profile->CD_profile / (2.0 * LaminarSkinFriction(Reynolds(c, 1.0))), 1.0, 1e-12);
}

TEST(StripTheoryDrag, Naca0012WingIsTwiceTurbulentFrictionTimesFormFactor) {
  Camber naca0012;
  naca0012.spelling = "NACA 0012";  // a symmetric section: flat mean line, thickness 12 % from the name
  Case c = Rectangle(naca0012);
  c.flight.altitude = 3000.0;
  const AtmosphereState air = StandardAtmosphere(3000.0);
  c.flight.density = air.density;
  c.flight.dynamic_viscosity = air.dynamic_viscosity;
  const Results r = skein::Run(c, {});
  const double expected = 2.0 * TurbulentSkinFriction(Reynolds(c, 1.0)) * ThicknessFormFactor(0.12);
  EXPECT_NEAR(r.points[0].profile->CD_profile / expected, 1.0, 1e-12);
  EXPECT_NEAR(r.points[0].profile->CD_total, r.points[0].CD_induced + r.points[0].profile->CD_profile, 1e-15);
  EXPECT_NEAR(*r.points[0].profile->L_over_D, r.points[0].CL / r.points[0].profile->CD_total, 1e-12);
}

// A tapered wing with a polar of constant cd: the strips' areas add up to the reference area exactly.
TEST(StripTheoryDrag, ConstantPolarGivesItsCd) {
  Case c = testing::WingCase(testing::TaperedWing(10.0, 1.5, 0.4, 20.0, testing::Mesh(4, 16)), {1.0, 5.0});
  for (Section& s : c.surfaces[0].sections) s.viscous.polar = SectionPolar{{-1.0, 2.0}, {0.0125, 0.0125}};
  const Results r = skein::Run(c, {});  // no speed: the polar needs none
  for (const PointResult& p : r.points) EXPECT_NEAR(p.profile->CD_profile, 0.0125, 1e-12);
  ASSERT_TRUE(r.best_lift_to_drag.has_value());
  EXPECT_EQ(r.best_lift_to_drag->point, 1u);  // L/D = CL / (k CL^2 + cd) still rising at 5 deg here
}

TEST(StripTheoryDrag, NoSpeedNoPolarMeansNoEstimate) {
  Case c = Rectangle();
  c.flight.speed_given = false;
  c.surfaces[0].sections[0].viscous.cl_max = 1.2;
  c.surfaces[0].sections[1].viscous.cl_max = 1.2;
  const Results r = skein::Run(c, {});
  EXPECT_FALSE(r.points[0].profile.has_value());
  bool said = false;
  for (const std::string& w : r.points[0].warnings) said = said || w.find("no flight speed") != std::string::npos;
  EXPECT_TRUE(said);
  EXPECT_TRUE(r.points[0].stall_onset.has_value());  // stall onset needs no speed
}

}  // namespace
}  // namespace skein
