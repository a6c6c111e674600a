// Downwash far behind an elliptic wing: epsilon = 2 CL / (pi A).
//
// Source: Prandtl's lifting-line theory (L. Prandtl, "Tragflügeltheorie. I. Mitteilung", Nachrichten von der
// Gesellschaft der Wissenschaften zu Göttingen, 1918): an elliptic loading has a uniform downwash CL / (pi A)
// (times V) at the wing and twice that far behind it, where the trailing vortices are doubly infinite.
//
// The check reads the downwash the product reports (SurfaceLoads::downwash_deg) on a small probe surface 20
// spans behind the wing, in the plane of a flat wake ("x-axis", as the theory assumes). In that plane the wake
// is a row of discrete trailing legs, whose field between two legs is a good sample of the continuous sheet's
// only midway between them; so the probe's strips are cut at the wing's own strip edges (its control points
// then sit midway between legs), and it spans the inner 40 % of the half-span, where the loading of the lattice
// is closest to elliptic. The lift in the formula is the wing's own (the probe's small lift is not part of the
// loading that makes the downwash). Acceptance: within 4 %.
#include <cmath>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double kTolerance = 0.04;  // the acceptance bound, relative

TEST(FarWakeDownwash, TwentySpansBehindAnEllipticWingItIsTwiceCLOverPiA) {
  const double span = 6.0, c0 = 4.0 / kPi;  // aspect ratio 6
  const int segments = 40;
  Surface wing = testing::EllipticWing(span, c0, segments, 6);
  Surface probe;
  probe.name = "probe";
  probe.symmetric = true;
  probe.mesh = testing::Mesh(2, 1, Spacing::uniform, Spacing::uniform);
  for (int k = 0; k <= segments; ++k) {  // the wing's strip edges, y = s sin(theta_k)
    const double y = 0.5 * span * std::sin(0.5 * kPi * k / segments);
    if (y > 0.4 * 0.5 * span + 1e-9) break;
    Section s = testing::MakeSection({20.0 * span, y, 0.0}, 0.05 * span);
    s.spanwise = 1;
    probe.sections.push_back(s);
  }
  probe.sections.back().spanwise.reset();
  std::vector<Surface> s;
  s.push_back(std::move(wing));
  s.push_back(std::move(probe));
  const Case c = testing::MakeCase(std::move(s), {4.0});
  const PointResult p = skein::Run(c, {}).points.front();
  const double aspect = c.reference.span * c.reference.span / c.reference.area;
  const SurfaceLoads& w = p.surfaces[0];
  const SurfaceLoads& pr = p.surfaces[1];
  ASSERT_EQ(pr.downwash_from, std::vector<std::string>{"wing"});
  const double theory_deg = 2.0 * w.CL / (kPi * aspect) * 180.0 / kPi;
  EXPECT_NEAR(pr.downwash_deg / theory_deg, 1.0, kTolerance)
      << "epsilon " << pr.downwash_deg << " deg, 2 CL / (pi A) = " << theory_deg << " deg";
}

}  // namespace
}  // namespace skein
