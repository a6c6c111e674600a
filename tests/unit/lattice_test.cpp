// Tests for lattice.hpp: spacing, panel counts and order, normals, mirror images, twist and incidence, camber,
// and how sections and controls break the spanwise mesh. Signs and storage order are conventions.md's
// ("Panel normals and controls", "The lattice") and lattice.hpp's; the NACA mean line is Abbott &
// von Doenhoff, Theory of Wing Sections, sec. 6.4.
#include "skein/lattice.hpp"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"

namespace skein {
namespace {

using testing::kDeg;
using testing::MakeCase;
using testing::MakeSection;
using testing::Mesh;
using testing::WingCase;

// Geometry is built from a few products of order-one numbers: agreement to a few ulps of the lengths.
constexpr double kGeom = 1e-12;

TEST(SpacingFractions, UniformIsEven) {
  const auto f = SpacingFractions(Spacing::uniform, 4);
  ASSERT_EQ(f.size(), 5u);
  for (std::size_t i = 0; i <= 4; ++i) EXPECT_NEAR(f[i], 0.25 * static_cast<double>(i), 1e-15);
}

TEST(SpacingFractions, CosineIsDenseAtBothEndsAndSymmetric) {
  const int n = 10;
  const auto f = SpacingFractions(Spacing::cosine, n);
  ASSERT_EQ(f.size(), 11u);
  EXPECT_EQ(f.front(), 0.0);
  EXPECT_EQ(f.back(), 1.0);
  for (int i = 0; i <= n; ++i) {
    const auto k = static_cast<std::size_t>(i);
    EXPECT_NEAR(f[k], 0.5 * (1.0 - std::cos(3.14159265358979323846 * i / n)), 1e-15);
    EXPECT_NEAR(f[k] + f[static_cast<std::size_t>(n - i)], 1.0, 1e-15);  // mirror-symmetric about 1/2
  }
  // Panels grow from each end to the middle.
  for (int i = 0; i + 1 < n / 2; ++i) {
    const auto k = static_cast<std::size_t>(i);
    EXPECT_LT(f[k + 1] - f[k], f[k + 2] - f[k + 1]);
  }
}

TEST(SpacingFractions, SineIsDenseAtTheFarEndOnly) {
  const int n = 8;
  const auto f = SpacingFractions(Spacing::sine, n);
  ASSERT_EQ(f.size(), 9u);
  EXPECT_EQ(f.front(), 0.0);
  EXPECT_EQ(f.back(), 1.0);
  for (int i = 0; i + 1 < n; ++i) {
    const auto k = static_cast<std::size_t>(i);
    EXPECT_GT(f[k + 1] - f[k], f[k + 2] - f[k + 1]);  // shrinking toward t = 1
  }
  // The first panel is about as wide as a uniform one, the last much narrower.
  EXPECT_NEAR(f[1], std::sin(3.14159265358979323846 / 16.0), 1e-15);
}

TEST(Lattice, PanelAndStripCountsOfASymmetricWing) {
  const Case c = WingCase(testing::RectangularWing(6.0, 1.0, Mesh(4, 10)));
  const Lattice lat = BuildLattice(c);
  EXPECT_EQ(lat.panels(), 2u * 4u * 10u);
  EXPECT_EQ(lat.strips.size(), 20u);
  EXPECT_EQ(CountPanels(c), lat.panels());
  ASSERT_EQ(lat.surfaces.size(), 1u);
  EXPECT_EQ(lat.surfaces[0].panels, 80u);
  EXPECT_TRUE(lat.geometry_symmetric);
  for (const Strip& s : lat.strips) EXPECT_EQ(s.panels, 4);
  // Every panel belongs to a strip that lists it, leading edge first.
  for (std::size_t k = 0; k < lat.strips.size(); ++k)
    for (int r = 0; r < lat.strips[k].panels; ++r)
      EXPECT_EQ(lat.strip[lat.strips[k].first_panel + static_cast<std::size_t>(r)], static_cast<int>(k));
}

TEST(Lattice, StripsRunFromLeftTipToRightTipAndPanelsFromLeadingEdge) {
  const Lattice lat = BuildLattice(WingCase(testing::TaperedWing(8.0, 1.5, 0.5, 20.0, Mesh(5, 7))));
  ASSERT_EQ(lat.strips.size(), 14u);
  for (std::size_t k = 0; k + 1 < lat.strips.size(); ++k)
    EXPECT_LT(lat.strips[k].quarter_chord[1], lat.strips[k + 1].quarter_chord[1]);
  EXPECT_NEAR(lat.strips.front().te_left[1], -4.0, kGeom);
  EXPECT_NEAR(lat.strips.back().te_right[1], 4.0, kGeom);
  for (const Strip& s : lat.strips)
    for (int r = 0; r + 1 < s.panels; ++r) {
      const std::size_t i = s.first_panel + static_cast<std::size_t>(r);
      EXPECT_LT(lat.control.x[i], lat.control.x[i + 1]);
    }
}

TEST(Lattice, NormalsPointUpOnBothHalvesOfAWing) {
  // 5 deg dihedral so that the halves' normals differ: (0, -sin, cos) on the right, (0, +sin, cos) on the left.
  Surface w = testing::RectangularWing(6.0, 1.0, Mesh(3, 4));
  w.sections[1].leading_edge[2] = 3.0 * std::tan(5.0 * kDeg);
  const Lattice lat = BuildLattice(WingCase(w));
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    EXPECT_NEAR(lat.normal.z[i], std::cos(5.0 * kDeg), kGeom);
    const double side = lat.control.y[i] > 0.0 ? -1.0 : 1.0;
    EXPECT_NEAR(lat.normal.y[i], side * std::sin(5.0 * kDeg), kGeom);
    EXPECT_NEAR(lat.normal.x[i], 0.0, kGeom);
  }
}

TEST(Lattice, FinGivenBottomToTopHasNormalsToMinusY) {
  Surface fin;
  fin.name = "fin";
  fin.symmetric = false;
  fin.mesh = Mesh(3, 4);
  fin.sections.push_back(MakeSection({4.0, 0.0, 0.0}, 1.0));
  fin.sections.push_back(MakeSection({4.5, 0.0, 1.2}, 0.6));
  std::vector<Surface> s;
  s.push_back(testing::RectangularWing(6.0, 1.0, Mesh(3, 4)));
  s.push_back(fin);
  const Lattice lat = BuildLattice(MakeCase(s));
  ASSERT_EQ(lat.surfaces.size(), 2u);
  EXPECT_TRUE(lat.surfaces[1].on_symmetry_plane);
  EXPECT_TRUE(lat.geometry_symmetric);
  const LatticeSurface& f = lat.surfaces[1];
  EXPECT_EQ(f.panels, 12u);
  for (std::size_t i = f.first_panel; i < f.first_panel + f.panels; ++i) {
    EXPECT_NEAR(lat.normal.y[i], -1.0, kGeom);
    EXPECT_EQ(lat.mirror_of[i], -1);
  }
  // Its strips run root to tip (first section to last).
  for (std::size_t k = f.first_strip; k + 1 < f.first_strip + f.strips; ++k)
    EXPECT_LT(lat.strips[k].quarter_chord[2], lat.strips[k + 1].quarter_chord[2]);
}

TEST(Lattice, MirrorOfPairsReflectEachOther) {
  Surface w = testing::TaperedWing(7.0, 1.2, 0.6, 15.0, Mesh(4, 6), testing::Naca4(4, 4));
  w.sections[1].leading_edge[2] = 0.4;
  w.sections[1].twist_deg = -3.0;
  const Lattice lat = BuildLattice(WingCase(w));
  std::size_t mirrored = 0;
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    const int m = lat.mirror_of[i];
    if (m < 0) {
      EXPECT_GE(lat.control.y[i], 0.0);
      continue;
    }
    ++mirrored;
    const auto g = static_cast<std::size_t>(m);
    EXPECT_EQ(lat.mirror_of[g], -1);
    auto reflects = [&](const PointArray& mine, const PointArray& given) {
      EXPECT_NEAR(mine.x[i], given.x[g], kGeom);
      EXPECT_NEAR(mine.y[i], -given.y[g], kGeom);
      EXPECT_NEAR(mine.z[i], given.z[g], kGeom);
    };
    reflects(lat.control, lat.control);
    reflects(lat.normal, lat.normal);
    // The mirrored horseshoe runs the other way across the span, so that its lift stays along its normal.
    reflects(lat.a, lat.b);
    reflects(lat.b, lat.a);
    reflects(lat.te_a, lat.te_b);
    reflects(lat.te_b, lat.te_a);
    EXPECT_DOUBLE_EQ(lat.area[i], lat.area[g]);
    EXPECT_DOUBLE_EQ(lat.core4[i], lat.core4[g]);
    // Bound segment a -> b runs toward +y on both halves of a wing.
    EXPECT_GT(lat.b.y[i] - lat.a.y[i], 0.0);
    EXPECT_GT(lat.b.y[g] - lat.a.y[g], 0.0);
  }
  EXPECT_EQ(mirrored, lat.panels() / 2);
  for (std::size_t k = 0; k < lat.strips.size(); ++k)
    if (lat.strips[k].mirror_of >= 0) {
      const Strip& g = lat.strips[static_cast<std::size_t>(lat.strips[k].mirror_of)];
      EXPECT_NEAR(lat.strips[k].quarter_chord[1], -g.quarter_chord[1], kGeom);
      EXPECT_NEAR(lat.strips[k].te_left[1], -g.te_right[1], kGeom);
    }
}

TEST(Lattice, TwistAndIncidenceRotateTheChordNoseUp) {
  for (const bool use_incidence : {false, true}) {
    Surface w = testing::RectangularWing(6.0, 1.0, Mesh(4, 3));
    const double angle = 8.0;
    if (use_incidence) {
      w.incidence_deg = angle;
    } else {
      w.sections[0].twist_deg = angle;
      w.sections[1].twist_deg = angle;
    }
    const Lattice lat = BuildLattice(WingCase(w));
    for (std::size_t i = 0; i < lat.panels(); ++i) {
      // Trailing edge down: the trailing-edge corners sit below the leading edge (z = 0 there).
      EXPECT_NEAR(lat.corner_te_a.z[i] - lat.corner_le_a.z[i],
                  -(lat.corner_te_a.x[i] - lat.corner_le_a.x[i]) * std::tan(angle * kDeg), kGeom);
      EXPECT_LT(lat.corner_te_a.z[i], lat.corner_le_a.z[i]);
      // The normal tilts forward with the chord: (sin, 0, cos).
      EXPECT_NEAR(lat.normal.x[i], std::sin(angle * kDeg), kGeom);
      EXPECT_NEAR(lat.normal.z[i], std::cos(angle * kDeg), kGeom);
    }
  }
}

TEST(Lattice, ATwistedRootWithDihedralKeepsItsTrailingEdgeOnTheSymmetryPlane) {
  // The root of a symmetric surface is shared with its mirror image, so twisting it must not open a gap or an
  // overlap at y = 0 (conventions.md: a symmetric surface is mirrored about y = 0).
  Surface w = testing::RectangularWing(6.0, 1.0, Mesh(4, 6));
  w.sections[1].leading_edge[2] = 3.0 * std::tan(10.0 * kDeg);  // 10 deg dihedral
  w.sections[0].twist_deg = 6.0;
  const Lattice lat = BuildLattice(WingCase(w));
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    if (lat.mirror_of[i] >= 0 || lat.strip[i] != static_cast<int>(lat.strips.size() / 2)) continue;
    // The right half's first strip: its inboard (a-side) corners lie on y = 0.
    EXPECT_NEAR(lat.corner_te_a.y[i], 0.0, kGeom);
    EXPECT_NEAR(lat.corner_le_a.y[i], 0.0, kGeom);
    EXPECT_NEAR(lat.te_a.y[i], 0.0, kGeom);
  }
}

TEST(Lattice, NacaCamberTiltsNormalsByTheMeanLineSlope) {
  const Camber camber = testing::Naca4(4, 3);
  const double chord = 2.0;
  const Lattice lat = BuildLattice(WingCase(testing::RectangularWing(6.0, chord, Mesh(10, 3), camber)));
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    const double x_over_c = lat.control.x[i] / chord;  // leading edge at x = 0
    const double slope = camber.Slope(x_over_c);
    // n = (-dz/dx, 0, 1) / sqrt(1 + (dz/dx)^2): the mean line rises where the slope is positive.
    EXPECT_NEAR(lat.normal.x[i], -slope / std::sqrt(1.0 + slope * slope), kGeom);
    EXPECT_NEAR(lat.normal.z[i], 1.0 / std::sqrt(1.0 + slope * slope), kGeom);
    EXPECT_NEAR(lat.normal.y[i], 0.0, kGeom);
  }
  // Ahead of the maximum camber the normals lean forward, behind it aft.
  EXPECT_LT(lat.normal.x[lat.strips[0].first_panel], 0.0);
  EXPECT_GT(lat.normal.x[lat.strips[0].first_panel + 9], 0.0);
}

/// A three-section wing: root at y = 0, a kink at y = 1.3 (chord change), tip at y = 3.
Surface KinkedWing(const MeshOptions& mesh) {
  Surface w;
  w.name = "wing";
  w.symmetric = true;
  w.mesh = mesh;
  w.sections.push_back(MakeSection({0.0, 0.0, 0.0}, 1.6));
  w.sections.push_back(MakeSection({0.2, 1.3, 0.0}, 1.2));
  w.sections.push_back(MakeSection({0.5, 3.0, 0.0}, 0.7));
  return w;
}

TEST(Lattice, EverySectionIsAMeshLine) {
  const Lattice lat = BuildLattice(WingCase(KinkedWing(Mesh(2, 11))));
  int found = 0;
  for (const Strip& s : lat.strips) {
    const std::size_t i = s.first_panel;  // the leading-edge panel
    for (const double side : {-1.0, 1.0})
      if (std::abs(lat.corner_le_b.y[i] - side * 1.3) < kGeom) {
        ++found;
        EXPECT_NEAR(lat.corner_le_b.x[i], 0.2, kGeom);  // on the kink section's leading edge
      }
  }
  EXPECT_EQ(found, 2) << "a strip edge on the section at y = +-1.3 on each half";
}

TEST(Lattice, AMultiSectionSurfaceSpreadsItsCountOverTheSegments) {
  const MeshOptions mesh = Mesh(2, 20, Spacing::uniform);
  const Lattice lat = BuildLattice(WingCase(KinkedWing(mesh)));
  ASSERT_EQ(lat.strips.size(), 40u);  // 20 per half, shared by the segments
  std::size_t inboard = 0;
  for (const Strip& s : lat.strips)
    if (s.quarter_chord[1] > 0.0 && s.quarter_chord[1] < 1.3) ++inboard;
  // Uniform spacing: the shares follow the segments' spans, 1.3 : 1.7 of 20 = 8.67 : 11.33 -> 9 : 11.
  EXPECT_EQ(inboard, 9u);
  // An explicit per-section count is kept and the rest of the surface count goes to the other segment.
  Surface w = KinkedWing(mesh);
  w.sections[0].spanwise = 4;
  const Lattice lat2 = BuildLattice(WingCase(w));
  std::size_t inboard2 = 0;
  for (const Strip& s : lat2.strips)
    if (s.quarter_chord[1] > 0.0 && s.quarter_chord[1] < 1.3) ++inboard2;
  EXPECT_EQ(inboard2, 4u);
  EXPECT_EQ(lat2.strips.size(), 40u);
  EXPECT_EQ(CountPanels(WingCase(w)), lat2.panels());
}

// Regression: the first strip of every segment after the first took its mid-strip station at the previous
// segment's end, which put its control point on its own side edge (on its trailing leg) and its strip station,
// chord and camber slope at that section. Every control point must sit mid-way across its panel.
TEST(Lattice, ControlPointsSitMidWayAcrossTheirPanelsOnEverySegment) {
  for (Spacing sp : {Spacing::uniform, Spacing::cosine}) {
    Surface w = KinkedWing(Mesh(3, 9, sp));
    w.sections[1].camber = testing::Naca4(2, 4);
    const Lattice lat = BuildLattice(WingCase(w));
    for (std::size_t i = 0; i < lat.panels(); ++i) {
      const double y_mid = 0.5 * (lat.corner_le_a.y[i] + lat.corner_le_b.y[i]);
      EXPECT_NEAR(lat.control.y[i], y_mid, kGeom) << "panel " << i;
    }
    for (const Strip& s : lat.strips) {
      EXPECT_NEAR(s.quarter_chord[1], 0.5 * (s.te_left[1] + s.te_right[1]), kGeom);
      // Local chord at mid-strip: linear in y on each segment (1.6 -> 1.2 on 0..1.3, 1.2 -> 0.7 on 1.3..3).
      const double y = std::abs(s.quarter_chord[1]);
      const double c = y < 1.3 ? 1.6 + (1.2 - 1.6) * y / 1.3 : 1.2 + (0.7 - 1.2) * (y - 1.3) / 1.7;
      EXPECT_NEAR(s.chord, c, 1e-9);
    }
  }
}

TEST(Lattice, CoreRadiusIsAFractionOfThePanelsSmallerSide) {
  const Lattice lat = BuildLattice(WingCase(testing::RectangularWing(4.0, 1.0, Mesh(2, 2, Spacing::uniform,
                                                                                     Spacing::uniform))));
  // Panels 1.0 wide and 0.5 long: eps = 0.05 x 0.5.
  for (std::size_t i = 0; i < lat.panels(); ++i) EXPECT_NEAR(lat.core4[i], std::pow(kCoreFraction * 0.5, 4), 1e-18);
}

}  // namespace
}  // namespace skein
