// Ground effect on induced drag and lift, by the image method (a ground plane z = height_z).
//
// Source: C. Wieselsberger, "Wing resistance near the ground", NACA TM 77, 1922 (translated from Zeitschrift
// fuer Flugtechnik und Motorluftschiffahrt, 1921). A wing at height h above the ground behaves as one half of
// a biplane of gap 2h with its mirror image; with Prandtl's approximation of the biplane interference factor
// the induced drag at a given lift, relative to free air, is
//     CDi(h) / CDi(free) = 1 - (1 - 1.32 h/b) / (1.05 + 7.4 h/b),
// b the span. The same image makes the wing meet less downwash, so the lift-curve slope rises near the ground.
//
// The wing: an elliptic planform (the loading the formula assumes), flat, with the trailing legs parallel to
// the ground (wake = "x-axis"), so the Trefftz-plane wake lies at the height of the bound vortices.
#include <cmath>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

double Wieselsberger(double h_over_b) { return 1.0 - (1.0 - 1.32 * h_over_b) / (1.05 + 7.4 * h_over_b); }

struct Aero {
  double CL, CD_induced, CL_alpha;
};

Aero Solve(double span, double height) {
  // Aspect ratio 4 b / (pi c0) = 12.
  const double c0 = 4.0 * span / (3.14159265358979323846 * 12.0);
  Case c = testing::WingCase(testing::EllipticWing(span, c0, 40, 4), {4.0});
  if (height > 0.0) {
    c.ground.enabled = true;
    c.ground.height_z = -height;  // the wing lies in z = 0
  }
  const Results r = Run(c, {});
  const PointResult& p = r.points.front();
  return {p.CL, p.CD_induced, *p.derivatives.Get("CL_alpha")};
}

TEST(WieselsbergerGroundEffect, InducedDragRatioAtFixedLift) {
  const double span = 10.0;
  const Aero free = Solve(span, 0.0);
  // The lattice's own free-air figure first: an elliptic wing has e close to 1 (sanity of the reference).
  const double aspect = 12.0;
  EXPECT_NEAR(free.CL * free.CL / (3.14159265358979323846 * aspect * free.CD_induced), 1.0, 0.02);
  for (double h_over_b : {0.05, 0.1, 0.15, 0.2, 0.25}) {
    const Aero g = Solve(span, h_over_b * span);
    // CDi / CL^2 is independent of the angle for this flat wing, so the ratio is the one at fixed CL.
    const double ratio = (g.CD_induced / (g.CL * g.CL)) / (free.CD_induced / (free.CL * free.CL));
    const double published = Wieselsberger(h_over_b);
    RecordProperty("ratio_h_over_b_" + std::to_string(h_over_b), std::to_string(ratio) + " vs " + std::to_string(published));
    EXPECT_NEAR(ratio / published, 1.0, 0.03)
        << "h/b " << h_over_b << ": lattice " << ratio << ", Wieselsberger " << published;
    EXPECT_GT(g.CL_alpha, free.CL_alpha) << "h/b " << h_over_b;
  }
}

// Closer to the ground, less induced drag and more lift per degree: both monotonic in h.
TEST(WieselsbergerGroundEffect, MonotonicInHeight) {
  const double span = 10.0;
  double prev_ratio = 0.0, prev_slope = 1e9;
  for (double h_over_b : {0.05, 0.1, 0.2, 0.4, 0.8}) {
    const Aero g = Solve(span, h_over_b * span);
    const double ratio = g.CD_induced / (g.CL * g.CL);
    EXPECT_GT(ratio, prev_ratio) << "h/b " << h_over_b;
    EXPECT_LT(g.CL_alpha, prev_slope) << "h/b " << h_over_b;
    prev_ratio = ratio;
    prev_slope = g.CL_alpha;
  }
}

}  // namespace
}  // namespace skein
