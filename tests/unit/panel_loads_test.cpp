// Tests for the per-panel load coefficient SurfaceLoads::panel_delta_cp = (F . n) / (q A) (loads.hpp): on a
// flat wing the panel loads of a strip add up to the strip's normal-force coefficient, mirror panels carry the
// same load in symmetric flight, and along each strip the load falls from the leading edge to the trailing
// edge as thin-aerofoil theory's flat-plate load 4 alpha sqrt((1 - x) / x) does.
#include <cmath>
#include <cstddef>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/lattice.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

struct Solved {
  Case c;
  Lattice lat;
  PointResult p;
};

Solved FlatTaperedWing() {
  Solved s;
  s.c = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.45, 10.0, testing::Mesh(6, 12)), {5.0});
  s.lat = BuildLattice(s.c);
  s.p = skein::Run(s.c, {}).points.front();
  return s;
}

TEST(PanelLoads, AddUpToTheStripNormalForce) {
  // cl_strip = N_strip / (q c w) and Delta Cp_k = N_k / (q A_k), N the force along the normal; with the panels
  // of a flat strip sharing its normal, sum_k Delta Cp_k A_k = cl c w (statics of the strip: common practice).
  const Solved s = FlatTaperedWing();
  const LatticeSurface& ls = s.lat.surfaces[0];
  const SurfaceLoads& sl = s.p.surfaces[0];
  ASSERT_EQ(sl.panel_delta_cp.size(), ls.panels);
  for (std::size_t m = 0; m < ls.strips; ++m) {
    const Strip& st = s.lat.strips[ls.first_strip + m];
    double sum = 0.0;
    for (int k = 0; k < st.panels; ++k) {
      const std::size_t i = st.first_panel + static_cast<std::size_t>(k);
      sum += sl.panel_delta_cp[i - ls.first_panel] * s.lat.area[i];
    }
    const double expected = sl.strips.cl[m] * st.chord * st.width;
    constexpr double kRoundOff = 1e-12;  // the same forces summed in another order
    EXPECT_NEAR(sum, expected, kRoundOff * std::abs(expected) + 1e-15) << "strip " << m;
  }
}

TEST(PanelLoads, MirrorPanelsCarryTheSameLoadInSymmetricFlight) {
  // Symmetric flight over a mirror-symmetric wing gives a symmetric load (common practice).
  const Solved s = FlatTaperedWing();
  const SurfaceLoads& sl = s.p.surfaces[0];
  std::size_t mirrored = 0;
  for (std::size_t i = 0; i < s.lat.panels(); ++i) {
    if (s.lat.mirror_of[i] < 0) continue;
    ++mirrored;
    const double a = sl.panel_delta_cp[i], b = sl.panel_delta_cp[static_cast<std::size_t>(s.lat.mirror_of[i])];
    EXPECT_NEAR(a, b, 1e-12 * std::abs(b)) << "panel " << i;
  }
  EXPECT_EQ(mirrored, s.lat.panels() / 2);
}

TEST(PanelLoads, FallFromLeadingToTrailingEdgeOnAFlatWing) {
  // Thin-aerofoil theory: a flat plate at incidence carries Delta Cp = 4 alpha sqrt((1 - x/c) / (x/c)), positive
  // and falling monotonically along the chord (J. Katz and A. Plotkin, Low-Speed Aerodynamics, 2nd ed., 2001,
  // the symmetric-aerofoil solution of thin-aerofoil theory; section number not given here, from memory).
  const Solved s = FlatTaperedWing();
  const LatticeSurface& ls = s.lat.surfaces[0];
  const SurfaceLoads& sl = s.p.surfaces[0];
  for (std::size_t m = 0; m < ls.strips; ++m) {
    const Strip& st = s.lat.strips[ls.first_strip + m];
    for (int k = 0; k < st.panels; ++k) {
      const std::size_t j = st.first_panel + static_cast<std::size_t>(k) - ls.first_panel;
      EXPECT_GT(sl.panel_delta_cp[j], 0.0) << "strip " << m << " panel " << k;
      if (k > 0) {
        EXPECT_LT(sl.panel_delta_cp[j], sl.panel_delta_cp[j - 1]) << "strip " << m << " panel " << k;
      }
    }
  }
}

}  // namespace
}  // namespace skein
