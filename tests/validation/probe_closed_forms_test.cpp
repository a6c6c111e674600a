// The probed velocity against two closed forms: the far-wake downwash of an elliptic wing, and the field of a
// single horseshoe vortex on its centre plane.
//
// 1. Source: L. Prandtl, "Tragflügeltheorie. I. Mitteilung", Nachrichten von der Gesellschaft der
//    Wissenschaften zu Göttingen, Math.-Phys. Klasse, 1918 (lifting-line theory): an elliptic loading has a
//    uniform downwash w = -CL / (pi A) V at the wing and twice that, w = -2 CL / (pi A) V, far behind it, where
//    the trailing vortices are doubly infinite (the Trefftz plane). The geometry is that of
//    validation/far_wake_downwash_test.cpp (aspect ratio 6, 40 strips per half dense toward the tips, a flat
//    "x-axis" wake as the theory assumes); the probes sit 20 spans behind, in the plane of the wake, midway
//    between two of the wing's trailing legs (where the discrete legs sample the continuous sheet), over the
//    inner 40 % of the half-span where the lattice's loading is closest to elliptic. The induced part is the
//    probed w less the freestream's sin(alpha). Acceptance: within 4 % at every probe, the bound that file
//    gives for the lattice's loading against the lifting line's. Measured: 1.8 % to 2.7 % above the theory
//    at Mach 0, 2.1 % to 3.2 % at Mach 0.6.
//    The same holds at Mach 0.6 (B. Goethert, "Plane and three-dimensional flow at high subsonic speeds", NACA
//    TM 1105, 1946: the Prandtl-Glauert analogy stretches the wing in x only, so the planform stays elliptic
//    and the far wake's cross-flow, a two-dimensional field of the trailing vortices in y and z, keeps its
//    relation to CL); the probe maps the point and the induced u as SolveBasis does.
//
// 2. Source: J. Katz and A. Plotkin, Low-Speed Aerodynamics, 2nd ed., Cambridge University Press, 2001,
//    sec. 2.11 (eq. 2.68-2.72): a straight vortex segment of circulation Gamma induces, at distance h from its
//    line, |v| = Gamma / (4 pi h) (cos theta1 - cos theta2), normal to the plane of the segment and the point,
//    by the right-hand rule. For a horseshoe (bound vortex from (x_b, -s, 0) to (x_b, s, 0) along +y, legs from
//    there to infinity along +x), at P = (x_b + dx, 0, z) on its centre plane, with h^2 = dx^2 + z^2 and
//    h_l^2 = s^2 + z^2, this sums to
//        u = Gamma / (4 pi) * 2 s z / (h^2 sqrt(s^2 + h^2)),
//        v = 0,
//        w = -Gamma / (4 pi) * [2 s dx / (h^2 sqrt(s^2 + h^2)) + 2 s / h_l^2 (1 + dx / sqrt(dx^2 + h_l^2))].
//    The lattice is one panel (chordwise = spanwise = 1, a non-mirrored surface across y = 0) with a flat
//    "x-axis" wake, so its horseshoe is exactly this one (the legs from the quarter chord to the trailing edge
//    and on to infinity lie on one line); Gamma is the strip's solved circulation. The kernel's regularisation
//    changes each segment's field by the factor h^4 / (h^4 + eps^4) (biot_savart.hpp); with a chord of 1 % of
//    the span the core radius eps is 5e-4 of the span and the probes below are at least 0.15 spans from every
//    line, so it is below 1e-10 there. Acceptance: 1e-9 relative to the largest component. Measured: 4e-13.
#include <algorithm>
#include <cmath>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double kFarWakeTolerance = 0.04;     // lattice loading vs the lifting line's, as in far_wake_downwash_test
constexpr double kHorseshoeTolerance = 1e-9;   // the regularisation's (eps / h)^4 is below 1e-10 at these probes

class FarWake : public ::testing::TestWithParam<double> {};

TEST_P(FarWake, TwentySpansBehindAnEllipticWingTheDownwashIsTwiceCLOverPiA) {
  const double span = 6.0, c0 = 4.0 / kPi;  // aspect ratio 6
  const int segments = 40;
  Case c = testing::WingCase(testing::EllipticWing(span, c0, segments, 6), {4.0});
  c.flight.mach = GetParam();
  std::vector<double> edges;  // the wing's strip edges on the right half, y = s sin(theta_k)
  for (int k = 0; k <= segments; ++k) edges.push_back(0.5 * span * std::sin(0.5 * kPi * k / segments));
  for (std::size_t k = 0; k + 1 < edges.size() && edges[k + 1] <= 0.4 * 0.5 * span; ++k) {
    Probe p;
    p.name = "wake" + std::to_string(k);
    p.point = {20.0 * span, 0.5 * (edges[k] + edges[k + 1]), 0.0};
    c.probes.push_back(p);
  }
  ASSERT_GE(c.probes.size(), 5u);
  const PointResult p = skein::Run(c, {}).points.front();
  const double aspect = c.reference.span * c.reference.span / c.reference.area;
  const double theory = -2.0 * p.CL / (kPi * aspect);  // w / V
  const double onset_w = std::sin(4.0 * kPi / 180.0);
  for (const ProbeResult& pr : p.probes) {
    ASSERT_TRUE(pr.velocity.has_value()) << pr.note;
    const double w = (*pr.velocity)[2] - onset_w;
    EXPECT_NEAR(w / theory, 1.0, kFarWakeTolerance)
        << "Mach " << GetParam() << ", " << pr.name << " at y = " << pr.point[1] << ": w/V " << w << ", -2 CL / (pi A) = " << theory;
    EXPECT_NEAR((*pr.velocity)[1], 0.0, 1e-3 * std::abs(theory)) << pr.name;
  }
}

INSTANTIATE_TEST_SUITE_P(Mach, FarWake, ::testing::Values(0.0, 0.6));

TEST(ProbeClosedForms, OnTheCentrePlaneOfAHorseshoeTheVelocityIsTheBiotSavartClosedForm) {
  const double s = 1.0, chord = 0.02;  // span 2 s; chord 1 % of the span
  Surface wing;
  wing.name = "wing";
  wing.symmetric = false;
  wing.mesh = testing::Mesh(1, 1, Spacing::uniform, Spacing::uniform);
  wing.sections.push_back(testing::MakeSection({0.0, -s, 0.0}, chord));
  wing.sections.push_back(testing::MakeSection({0.0, s, 0.0}, chord));
  const double alpha_deg = 5.0;
  Case c = testing::WingCase(wing, {alpha_deg});
  const double xb = 0.25 * chord;
  const std::vector<std::pair<double, double>> at = {
      {-0.5, 0.0}, {-0.3, 0.2}, {0.4, 0.0}, {1.5, 0.0}, {3.0, -0.5}, {0.0, 0.3}, {0.8, 0.6}, {-2.0, -1.0}};
  for (std::size_t k = 0; k < at.size(); ++k) {
    Probe p;
    p.name = "p" + std::to_string(k);
    p.point = {xb + at[k].first, 0.0, at[k].second};
    c.probes.push_back(p);
  }
  const PointResult r = skein::Run(c, {}).points.front();
  ASSERT_EQ(r.surfaces[0].strips.gamma.size(), 1u);
  const double gamma = r.surfaces[0].strips.gamma[0];
  ASSERT_GT(gamma, 0.0);
  const double a = alpha_deg * kPi / 180.0;
  for (std::size_t k = 0; k < at.size(); ++k) {
    const ProbeResult& pr = r.probes[k];
    ASSERT_TRUE(pr.velocity.has_value()) << pr.note;
    const double dx = at[k].first, z = at[k].second;
    const double h2 = dx * dx + z * z, hl2 = s * s + z * z;
    const double bound = 2.0 * s / (h2 * std::sqrt(s * s + h2));
    const double legs = 2.0 * s / hl2 * (1.0 + dx / std::sqrt(dx * dx + hl2));
    const double u = gamma / (4.0 * kPi) * bound * z;
    const double w = -gamma / (4.0 * kPi) * (bound * dx + legs);
    const Vec3 induced{(*pr.velocity)[0] - std::cos(a), (*pr.velocity)[1], (*pr.velocity)[2] - std::sin(a)};
    const double scale = std::max(std::abs(u), std::abs(w));
    EXPECT_NEAR(induced[0], u, kHorseshoeTolerance * scale) << "at dx " << dx << ", z " << z;
    EXPECT_NEAR(induced[1], 0.0, kHorseshoeTolerance * scale) << "at dx " << dx << ", z " << z;
    EXPECT_NEAR(induced[2], w, kHorseshoeTolerance * scale) << "at dx " << dx << ", z " << z;
  }
}

}  // namespace
}  // namespace skein
