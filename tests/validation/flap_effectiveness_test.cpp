// Plain-flap effectiveness: (dCL/d delta) / (dCL/d alpha) of a full-span 25 % chord flap.
//
// Source: thin-aerofoil theory (H. Glauert, The Elements of Aerofoil and Airscrew Theory, 1926; also I. H.
// Abbott and A. E. von Doenhoff, Theory of Wing Sections, 1959, sec. 8.2 (section from memory)): a flap hinged
// at x_h / c deflected by delta changes the zero-lift angle by tau delta with
//     tau = 1 - (theta_h - sin theta_h) / pi,   cos theta_h = 1 - 2 x_h / c,
// 0.6090 for x_h / c = 0.75. In lifting-line theory a full-span flap acts as a uniform change of angle, so the
// ratio of the three-dimensional slopes is tau too. The lattice meshes the hinge line (lattice.cpp), so the
// comparison is of the discretised flap, on a rectangular wing of aspect ratio 20 with 16 cosine-spaced panels
// along the chord. Acceptance: within 5 %. Wake along x, as the theory assumes a flat wake.
#include <cmath>

#include <gtest/gtest.h>

#include "../support/aircraft.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double kTolerance = 0.05;  // the acceptance bound, relative

double ThinAerofoilFlapEffectiveness(double hinge) {
  const double theta = std::acos(1.0 - 2.0 * hinge);
  return 1.0 - (theta - std::sin(theta)) / kPi;
}

TEST(FlapEffectiveness, FullSpanQuarterChordFlapOnAHighAspectRatioWing) {
  ASSERT_NEAR(ThinAerofoilFlapEffectiveness(0.75), 0.6090, 5e-5);
  Surface w = testing::TwoSectionSurface("wing", true, {0.0, 0.0, 0.0}, 1.0, {0.0, 10.0, 0.0}, 1.0,
                                         testing::Mesh(16, 20, Spacing::cosine, Spacing::cosine, WakeDirection::x_axis));
  w.controls.push_back(testing::MakeControl("flap", 0.75, 0.0, 1.0, 0.0, false));
  const PointResult p = skein::Run(testing::WingCase(w, {0.0}), {}).points.front();
  const double cl_delta = *p.control_derivatives.front().second.Get("CL");
  const double cl_alpha = *p.derivatives.Get("CL_alpha");
  EXPECT_NEAR((cl_delta / cl_alpha) / ThinAerofoilFlapEffectiveness(0.75), 1.0, kTolerance)
      << "ratio " << cl_delta / cl_alpha;
}

}  // namespace
}  // namespace skein
