// Tests for the fast paths of influence.cpp: the assembly and the induced-velocity pass give the answers of a
// straightforward implementation written out here (one AddHorseshoeVelocity call per source and target), to
// 1e-12 of the largest value in each column, and bit-for-bit the same answers on 1 and 2 threads. They never
// look at times.
#include <algorithm>
#include <cmath>
#include <cstring>
#include <string>
#include <vector>

#include <Eigen/Core>
#include <gtest/gtest.h>
#include <omp.h>

#include "skein/biot_savart.hpp"
#include "skein/case.hpp"
#include "skein/influence.hpp"
#include "skein/lattice.hpp"

namespace skein {
namespace {

constexpr double kRelative = 1e-12;

// ---- configurations ------------------------------------------------------------------------------------

Section At(double x, double y, double z, double chord, double twist_deg = 0.0) {
  Section s;
  s.leading_edge = {x, y, z};
  s.chord = chord;
  s.twist_deg = twist_deg;
  return s;
}

MeshOptions Mesh(int chordwise, int spanwise) {
  MeshOptions m;
  m.chordwise = chordwise;
  m.spanwise = spanwise;
  m.chordwise_spacing = Spacing::cosine;
  m.spanwise_spacing = Spacing::cosine;
  m.wake = WakeDirection::x_axis;
  return m;
}

/// A tapered, swept, twisted wing with dihedral and NACA 2412 camber (symmetric unless told otherwise).
Surface Wing(int chordwise, int spanwise, bool symmetric = true, double root_y = 0.0) {
  Surface s;
  s.name = "wing";
  s.symmetric = symmetric;
  s.mesh = Mesh(chordwise, spanwise);
  Camber c;
  c.kind = Camber::Kind::naca4;
  c.max_camber = 0.02;
  c.max_camber_position = 0.4;
  c.spelling = "NACA 2412";
  Section root = At(0.0, root_y, 0.0, 1.2, 2.0);
  Section tip = At(0.9, 4.0, 0.35, 0.5, -1.5);
  root.camber = c;
  tip.camber = c;
  s.sections = {root, tip};
  return s;
}

/// A fin in the plane y = 0 behind the wing (a surface whose horseshoes are their own mirror images).
Surface Fin(int chordwise, int spanwise) {
  Surface s;
  s.name = "fin";
  s.symmetric = false;
  s.mesh = Mesh(chordwise, spanwise);
  s.sections = {At(4.0, 0.0, 0.1, 1.0), At(4.6, 0.0, 1.4, 0.6)};
  return s;
}

Case CaseOf(std::vector<Surface> surfaces) {
  Case c;
  c.title = "speed paths";
  c.mesh = surfaces.front().mesh;
  c.surfaces = std::move(surfaces);
  c.reference.area = 6.0;
  c.reference.span = 8.0;
  c.reference.chord = 0.9;
  return c;
}

WakeGeometry XAxisWake(bool ground = false) {
  WakeGeometry w;
  if (ground) {
    w.ground.enabled = true;
    w.ground.height_z = -0.8;
  }
  return w;
}

WakeGeometry SideslipWake() {
  WakeGeometry w;
  const double a = 0.07, b = 0.05;
  w.direction = {std::cos(a) * std::cos(b), -std::sin(b), std::sin(a) * std::cos(b)};
  return w;
}

// ---- the straightforward implementation ------------------------------------------------------------------

struct Velocity {
  double u = 0.0, v = 0.0, w = 0.0;
};

/// Velocity at P of lattice horseshoe j and, with a ground plane, of its image (reflected in z = h, points in
/// reversed order, legs along the reflected direction), one AddHorseshoeVelocity call each.
Velocity ReferenceHorseshoe(const Lattice& lat, std::size_t j, const WakeGeometry& wake, double px, double py,
                            double pz) {
  const double a[3] = {lat.a.x[j], lat.a.y[j], lat.a.z[j]};
  const double b[3] = {lat.b.x[j], lat.b.y[j], lat.b.z[j]};
  const double ta[3] = {lat.te_a.x[j], lat.te_a.y[j], lat.te_a.z[j]};
  const double tb[3] = {lat.te_b.x[j], lat.te_b.y[j], lat.te_b.z[j]};
  const double d[3] = {wake.direction[0], wake.direction[1], wake.direction[2]};
  Velocity out;
  AddHorseshoeVelocity(px, py, pz, a, b, ta, tb, d, lat.core4[j], out.u, out.v, out.w);
  if (wake.ground.enabled) {
    const double h2 = 2.0 * wake.ground.height_z;
    const double ga[3] = {b[0], b[1], h2 - b[2]}, gb[3] = {a[0], a[1], h2 - a[2]};
    const double gta[3] = {tb[0], tb[1], h2 - tb[2]}, gtb[3] = {ta[0], ta[1], h2 - ta[2]};
    const double gd[3] = {d[0], d[1], -d[2]};
    AddHorseshoeVelocity(px, py, pz, ga, gb, gta, gtb, gd, lat.core4[j], out.u, out.v, out.w);
  }
  return out;
}

/// A_ij = n_i . v_j(P_i) over a layout's panels; a mirrored layout adds (symmetric) or subtracts
/// (antisymmetric) the image column, a panel without an image enters once.
Eigen::MatrixXd ReferenceMatrix(const Lattice& lat, const SystemLayout& layout, const WakeGeometry& wake) {
  const std::size_t n = layout.panel.size();
  Eigen::MatrixXd m(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(n));
  const double sign = layout.kind == SystemLayout::Kind::symmetric ? 1.0 : -1.0;
  for (std::size_t i = 0; i < n; ++i) {
    const std::size_t p = layout.panel[i];
    const double px = lat.control.x[p], py = lat.control.y[p], pz = lat.control.z[p];
    for (std::size_t j = 0; j < n; ++j) {
      const Velocity v = ReferenceHorseshoe(lat, layout.panel[j], wake, px, py, pz);
      double entry = v.u * lat.normal.x[p] + v.v * lat.normal.y[p] + v.w * lat.normal.z[p];
      if (layout.kind != SystemLayout::Kind::full && layout.image[j] >= 0) {
        const Velocity vi = ReferenceHorseshoe(lat, static_cast<std::size_t>(layout.image[j]), wake, px, py, pz);
        entry += sign * (vi.u * lat.normal.x[p] + vi.v * lat.normal.y[p] + vi.w * lat.normal.z[p]);
      }
      m(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j)) = entry;
    }
  }
  return m;
}

InducedVelocity ReferenceVelocity(const Lattice& lat, const PointArray& points, const Eigen::MatrixXd& gamma,
                                  const WakeGeometry& wake) {
  const auto np = static_cast<Eigen::Index>(points.size());
  InducedVelocity out;
  out.u.setZero(np, gamma.cols());
  out.v.setZero(np, gamma.cols());
  out.w.setZero(np, gamma.cols());
  for (Eigen::Index p = 0; p < np; ++p) {
    const auto pp = static_cast<std::size_t>(p);
    for (std::size_t j = 0; j < lat.panels(); ++j) {
      const Velocity v = ReferenceHorseshoe(lat, j, wake, points.x[pp], points.y[pp], points.z[pp]);
      for (Eigen::Index c = 0; c < gamma.cols(); ++c) {
        const double g = gamma(static_cast<Eigen::Index>(j), c);
        out.u(p, c) += v.u * g;
        out.v(p, c) += v.v * g;
        out.w(p, c) += v.w * g;
      }
    }
  }
  return out;
}

// ---- helpers ---------------------------------------------------------------------------------------------

/// Largest |fast - reference| in any column, divided by that column's largest |reference|.
double WorstColumnError(const Eigen::MatrixXd& fast, const Eigen::MatrixXd& ref) {
  EXPECT_EQ(fast.rows(), ref.rows());
  EXPECT_EQ(fast.cols(), ref.cols());
  if (fast.rows() != ref.rows() || fast.cols() != ref.cols()) return 1.0;
  double worst = 0.0;
  for (Eigen::Index c = 0; c < ref.cols(); ++c) {
    const double scale = ref.col(c).cwiseAbs().maxCoeff();
    const double err = (fast.col(c) - ref.col(c)).cwiseAbs().maxCoeff();
    if (scale > 0.0) {
      worst = std::max(worst, err / scale);
    } else if (err > 0.0) {
      return 1.0;  // a column that should be zero is not
    }
  }
  return worst;
}

bool BitIdentical(const Eigen::MatrixXd& a, const Eigen::MatrixXd& b) {
  return a.rows() == b.rows() && a.cols() == b.cols() &&
         std::memcmp(a.data(), b.data(), sizeof(double) * static_cast<std::size_t>(a.size())) == 0;
}

/// Circulations with no symmetry at all (and one column that is exactly symmetric, one antisymmetric).
Eigen::MatrixXd SomeCirculations(const Lattice& lat, int columns) {
  const auto n = static_cast<Eigen::Index>(lat.panels());
  Eigen::MatrixXd g(n, columns);
  for (Eigen::Index j = 0; j < n; ++j)
    for (Eigen::Index c = 0; c < columns; ++c)
      g(j, c) = std::sin(0.37 * static_cast<double>(j) + 1.3 * static_cast<double>(c)) + 0.2 * static_cast<double>(c);
  for (std::size_t j = 0; j < lat.panels(); ++j) {
    const int m = lat.mirror_of[j];
    if (m < 0) continue;
    const auto ji = static_cast<Eigen::Index>(j), mi = static_cast<Eigen::Index>(m);
    g(ji, 0) = g(mi, 0);
    g(ji, 1) = -g(mi, 1);
  }
  return g;
}

PointArray BoundMidpoints(const Lattice& lat) {
  PointArray mid;
  mid.resize(lat.panels());
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    mid.x[i] = 0.5 * (lat.a.x[i] + lat.b.x[i]);
    mid.y[i] = 0.5 * (lat.a.y[i] + lat.b.y[i]);
    mid.z[i] = 0.5 * (lat.a.z[i] + lat.b.z[i]);
  }
  return mid;
}

/// Points off the lattice, with no mirror structure: above, below and beside it, and behind it in the wake.
PointArray ScatteredPoints(std::size_t n) {
  PointArray p;
  for (std::size_t k = 0; k < n; ++k) {
    const double t = static_cast<double>(k);
    p.push_back({-1.0 + 0.061 * t, -4.5 + 0.093 * t, 0.6 * std::sin(0.7 * t)});
  }
  return p;
}

void ExpectVelocityMatches(const Lattice& lat, const PointArray& points, const WakeGeometry& wake,
                           const std::string& what) {
  const Eigen::MatrixXd gamma = SomeCirculations(lat, 7);
  const InducedVelocity fast = InducedVelocityAt(lat, points, gamma, wake);
  const InducedVelocity ref = ReferenceVelocity(lat, points, gamma, wake);
  EXPECT_LE(WorstColumnError(fast.u, ref.u), kRelative) << what << ": u";
  EXPECT_LE(WorstColumnError(fast.v, ref.v), kRelative) << what << ": v";
  EXPECT_LE(WorstColumnError(fast.w, ref.w), kRelative) << what << ": w";
}

void ExpectAssemblyMatches(const Lattice& lat, const WakeGeometry& wake, bool allow_split,
                           std::size_t expected_layouts, const std::string& what) {
  const std::vector<SystemLayout> layouts = ChooseLayouts(lat, wake, allow_split);
  ASSERT_EQ(layouts.size(), expected_layouts) << what;
  const std::vector<Eigen::MatrixXd> fast = AssembleInfluence(lat, layouts, wake);
  ASSERT_EQ(fast.size(), layouts.size());
  for (std::size_t l = 0; l < layouts.size(); ++l) {
    const Eigen::MatrixXd ref = ReferenceMatrix(lat, layouts[l], wake);
    EXPECT_LE(WorstColumnError(fast[l], ref), kRelative) << what << ", layout " << l;
  }
}

// ---- assembly --------------------------------------------------------------------------------------------

TEST(SpeedPaths, AssemblyMatchesReferenceForTheHalfModelPair) {
  const Lattice lat = BuildLattice(CaseOf({Wing(6, 14)}));
  ExpectAssemblyMatches(lat, XAxisWake(), true, 2, "wing, free air");
  ExpectAssemblyMatches(lat, XAxisWake(true), true, 2, "wing, ground plane");
}

TEST(SpeedPaths, AssemblyMatchesReferenceForTheFullModel) {
  const Lattice lat = BuildLattice(CaseOf({Wing(5, 12)}));
  ExpectAssemblyMatches(lat, XAxisWake(), false, 1, "wing, split refused");
  ExpectAssemblyMatches(lat, SideslipWake(), true, 1, "wing, sideslipping wake");
  WakeGeometry ground = SideslipWake();
  ground.ground.enabled = true;
  ground.ground.height_z = -0.6;
  ExpectAssemblyMatches(lat, ground, true, 1, "wing, sideslipping wake over the ground");
}

TEST(SpeedPaths, AssemblyMatchesReferenceWithACentreLineFin) {
  const Lattice lat = BuildLattice(CaseOf({Wing(5, 12), Fin(4, 6)}));
  ExpectAssemblyMatches(lat, XAxisWake(), true, 2, "wing and fin");
  ExpectAssemblyMatches(lat, XAxisWake(true), true, 2, "wing and fin, ground plane");
}

TEST(SpeedPaths, AssemblyMatchesReferenceForAnAsymmetricLattice) {
  const Lattice lat = BuildLattice(CaseOf({Wing(5, 16, false, 0.3)}));
  ExpectAssemblyMatches(lat, XAxisWake(), true, 1, "one-sided wing");
}

TEST(SpeedPaths, AssemblyMatchesReferenceAcrossBlocksOfTargets) {
  // More targets than one block of the assembly (influence.cpp: kTargetBlock, 512), in both layouts.
  const Lattice lat = BuildLattice(CaseOf({Wing(10, 60), Fin(4, 6)}));
  ASSERT_GT(lat.panels(), 1200u);
  ExpectAssemblyMatches(lat, XAxisWake(true), false, 1, "full model, ground plane");
  ExpectAssemblyMatches(lat, XAxisWake(), true, 2, "half model pair");
}

TEST(SpeedPaths, BothPassesMatchTheReferenceWhenAStripsPanelsAreNotInLine) {
  // Both passes share a strip's legs and side edges between its panels only while their bound-segment ends
  // lie on the lines through the trailing-edge points; a lattice whose panel ends leave those lines (here, one
  // panel's end moved up by a tenth of its chord) must still give the reference answers, whole strips or not.
  Lattice lat = BuildLattice(CaseOf({Wing(6, 10, false, 0.3)}));
  const Strip& st = lat.strips[4];
  const std::size_t j = st.first_panel + 2;
  lat.a.z[j] += 0.1 * lat.strips[4].chord / st.panels;
  ExpectAssemblyMatches(lat, XAxisWake(), false, 1, "one panel's end out of line");
  ExpectAssemblyMatches(lat, XAxisWake(true), false, 1, "one panel's end out of line, ground plane");
  ExpectVelocityMatches(lat, BoundMidpoints(lat), XAxisWake(), "velocity, one panel's end out of line");
  PointArray over_the_wing = ScatteredPoints(41);  // they pass through the wing's side, y > 0
  for (double& y : over_the_wing.y) y = -y;
  ExpectVelocityMatches(lat, over_the_wing, XAxisWake(true), "velocity, out of line, ground plane");
}

// ---- induced velocity ------------------------------------------------------------------------------------

TEST(SpeedPaths, MirrorPathIsTakenExactlyWhenTheTargetsAreMirrorImages) {
  const Lattice lat = BuildLattice(CaseOf({Wing(5, 12), Fin(4, 6)}));
  const PointArray mid = BoundMidpoints(lat);
  EXPECT_TRUE(InducedVelocityUsesMirror(lat, mid, XAxisWake()));
  EXPECT_TRUE(InducedVelocityUsesMirror(lat, lat.control, XAxisWake(true)));
  EXPECT_FALSE(InducedVelocityUsesMirror(lat, mid, SideslipWake()));
  EXPECT_FALSE(InducedVelocityUsesMirror(lat, ScatteredPoints(lat.panels()), XAxisWake()));
  PointArray nudged = mid;  // one mirrored point off by one unit in the last place: no longer a mirror image
  const auto m = static_cast<std::size_t>(std::find_if(lat.mirror_of.begin(), lat.mirror_of.end(),
                                                       [](int g) { return g >= 0; }) -
                                          lat.mirror_of.begin());
  ASSERT_LT(m, lat.panels());
  nudged.x[m] = std::nextafter(nudged.x[m], 1e9);
  EXPECT_FALSE(InducedVelocityUsesMirror(lat, nudged, XAxisWake()));
  const Lattice one_sided = BuildLattice(CaseOf({Wing(4, 8, false, 0.3)}));
  EXPECT_FALSE(InducedVelocityUsesMirror(one_sided, BoundMidpoints(one_sided), XAxisWake()));
}

TEST(SpeedPaths, VelocityMatchesReferenceOnTheMirrorPath) {
  const Lattice lat = BuildLattice(CaseOf({Wing(6, 14), Fin(4, 6)}));
  ExpectVelocityMatches(lat, BoundMidpoints(lat), XAxisWake(), "bound midpoints");
  ExpectVelocityMatches(lat, lat.control, XAxisWake(), "control points");
  ExpectVelocityMatches(lat, BoundMidpoints(lat), XAxisWake(true), "bound midpoints, ground plane");
}

TEST(SpeedPaths, VelocityMatchesReferenceOnTheGeneralPath) {
  const Lattice lat = BuildLattice(CaseOf({Wing(6, 14), Fin(4, 6)}));
  ExpectVelocityMatches(lat, BoundMidpoints(lat), SideslipWake(), "bound midpoints, sideslipping wake");
  ExpectVelocityMatches(lat, ScatteredPoints(37), XAxisWake(), "scattered points");
  ExpectVelocityMatches(lat, ScatteredPoints(53), XAxisWake(true), "scattered points, ground plane");
  const Lattice one_sided = BuildLattice(CaseOf({Wing(5, 16, false, 0.3)}));
  ExpectVelocityMatches(one_sided, BoundMidpoints(one_sided), XAxisWake(), "one-sided wing");
}

TEST(SpeedPaths, VelocityAtTheAskedPointsOnly) {
  const Lattice lat = BuildLattice(CaseOf({Wing(6, 14), Fin(4, 6)}));
  const Eigen::MatrixXd gamma = SomeCirculations(lat, 7);
  const PointArray mid = BoundMidpoints(lat);
  std::vector<bool> only(lat.panels(), false);
  for (std::size_t i = 0; i < lat.panels(); i += 3) only[i] = true;  // every third point, some on each side
  for (const WakeGeometry& wake : {XAxisWake(), XAxisWake(true), SideslipWake()}) {
    const InducedVelocity some = InducedVelocityAt(lat, mid, gamma, wake, &only);
    const InducedVelocity ref = ReferenceVelocity(lat, mid, gamma, wake);
    const bool mirrored = InducedVelocityUsesMirror(lat, mid, wake);
    for (std::size_t i = 0; i < lat.panels(); ++i) {
      const auto ii = static_cast<Eigen::Index>(i);
      const int g = lat.mirror_of[i];
      // Asked for, or (on the mirror path) the mirror image of a point asked for: computed; otherwise zero.
      bool computed = only[i];
      if (mirrored) {
        if (g >= 0) computed = computed || only[static_cast<std::size_t>(g)];
        for (std::size_t k = 0; k < lat.panels(); ++k)
          if (lat.mirror_of[k] == static_cast<int>(i) && only[k]) computed = true;
      }
      for (const auto& [f, r] : {std::pair{&some.u, &ref.u}, std::pair{&some.v, &ref.v}, std::pair{&some.w, &ref.w}})
        for (Eigen::Index c = 0; c < gamma.cols(); ++c) {
          if (!computed) {
            EXPECT_EQ((*f)(ii, c), 0.0) << "row " << i << " was not asked for";
            continue;
          }
          const double scale = r->col(c).cwiseAbs().maxCoeff();
          EXPECT_LE(std::abs((*f)(ii, c) - (*r)(ii, c)), kRelative * scale) << "row " << i << ", column " << c;
        }
    }
  }
}

TEST(SpeedPaths, VelocityOfEachColumnIsItsOwnWhateverTheOtherColumns) {
  // The velocity pass leaves out of each product the columns that are zero there (a symmetric column has no
  // mirror differences, an antisymmetric one no sums, an unsolved one neither); a column's velocities must not
  // depend on which other columns came with it, to the bit, and must still match the reference.
  const Lattice lat = BuildLattice(CaseOf({Wing(6, 14)}));  // mirrored, no centre-line surface
  const PointArray mid = BoundMidpoints(lat);
  ASSERT_TRUE(InducedVelocityUsesMirror(lat, mid, XAxisWake()));
  Eigen::MatrixXd gamma = SomeCirculations(lat, 5);  // column 0 symmetric, 1 antisymmetric
  gamma.col(3).setZero();
  const InducedVelocity all = InducedVelocityAt(lat, mid, gamma, XAxisWake());
  const InducedVelocity ref = ReferenceVelocity(lat, mid, gamma, XAxisWake());
  EXPECT_LE(WorstColumnError(all.u, ref.u), kRelative);
  EXPECT_LE(WorstColumnError(all.v, ref.v), kRelative);
  EXPECT_LE(WorstColumnError(all.w, ref.w), kRelative);
  EXPECT_TRUE(all.u.col(3).isZero(0.0) && all.v.col(3).isZero(0.0) && all.w.col(3).isZero(0.0));
  for (Eigen::Index c = 0; c < gamma.cols(); ++c) {
    const InducedVelocity one = InducedVelocityAt(lat, mid, gamma.col(c), XAxisWake());
    EXPECT_TRUE(BitIdentical(one.u, all.u.col(c))) << "column " << c;
    EXPECT_TRUE(BitIdentical(one.v, all.v.col(c))) << "column " << c;
    EXPECT_TRUE(BitIdentical(one.w, all.w.col(c))) << "column " << c;
  }
}

TEST(SpeedPaths, VelocityOfStripsWithoutCirculationIsLeftOutExactly) {
  // Strips whose circulation is zero in every column are not evaluated (a centre-line fin when only the
  // symmetric system was solved): the velocities must still be the reference's, on the mirror path and off it.
  const Lattice lat = BuildLattice(CaseOf({Wing(6, 14), Fin(4, 6)}));
  Eigen::MatrixXd gamma = SomeCirculations(lat, 4);
  const std::size_t fin = lat.surfaces[1].first_panel;
  for (std::size_t i = fin; i < fin + lat.surfaces[1].panels; ++i)
    gamma.row(static_cast<Eigen::Index>(i)).setZero();
  // A strip and its mirror without circulation (left out), and a pair with antisymmetric circulation: no
  // sums, but differences (it must be evaluated).
  const auto rows_of = [&](std::size_t strip, int r) {
    const Strip& m = lat.strips[strip];
    const Strip& g = lat.strips[static_cast<std::size_t>(m.mirror_of)];
    return std::pair<Eigen::Index, Eigen::Index>{static_cast<Eigen::Index>(m.first_panel) + r,
                                                 static_cast<Eigen::Index>(g.first_panel) + r};
  };
  ASSERT_GE(lat.strips[3].mirror_of, 0);
  ASSERT_GE(lat.strips[5].mirror_of, 0);
  for (int r = 0; r < lat.strips[3].panels; ++r) {
    const auto [m, g] = rows_of(3, r);
    gamma.row(m).setZero();
    gamma.row(g).setZero();
  }
  for (int r = 0; r < lat.strips[5].panels; ++r) {
    const auto [m, g] = rows_of(5, r);
    gamma.row(m) = -gamma.row(g);
  }
  const PointArray mid = BoundMidpoints(lat), scattered = ScatteredPoints(29);
  for (const PointArray* points : {&mid, &scattered}) {
    for (const WakeGeometry& wake : {XAxisWake(), XAxisWake(true)}) {
      const InducedVelocity fast = InducedVelocityAt(lat, *points, gamma, wake);
      const InducedVelocity ref = ReferenceVelocity(lat, *points, gamma, wake);
      EXPECT_LE(WorstColumnError(fast.u, ref.u), kRelative);
      EXPECT_LE(WorstColumnError(fast.v, ref.v), kRelative);
      EXPECT_LE(WorstColumnError(fast.w, ref.w), kRelative);
    }
  }
}

TEST(SpeedPaths, VelocityOfNoColumnsOrNoPointsIsEmpty) {
  const Lattice lat = BuildLattice(CaseOf({Wing(3, 4)}));
  const InducedVelocity none = InducedVelocityAt(lat, BoundMidpoints(lat), Eigen::MatrixXd(static_cast<Eigen::Index>(lat.panels()), 0),
                                                 XAxisWake());
  EXPECT_EQ(none.u.rows(), static_cast<Eigen::Index>(lat.panels()));
  EXPECT_EQ(none.u.cols(), 0);
  const InducedVelocity nowhere = InducedVelocityAt(lat, PointArray{}, SomeCirculations(lat, 3), XAxisWake());
  EXPECT_EQ(nowhere.w.rows(), 0);
  EXPECT_EQ(nowhere.w.cols(), 3);
}

// ---- thread independence ---------------------------------------------------------------------------------

/// Runs f with 1 and then 2 OpenMP threads and restores the previous setting.
template <class F>
auto OnThreads(int threads, F f) {
  const int before = omp_get_max_threads();
  omp_set_num_threads(threads);
  auto r = f();
  omp_set_num_threads(before);
  return r;
}

TEST(SpeedPaths, EveryCompiledInstructionSetMatchesTheReference) {
  // The processor runs the fastest set it has; capping it runs the others (those it has) on this machine.
  struct Restore {
    ~Restore() { CapKernelIsa(KernelIsa::avx512); }
  } restore;
  const Lattice lat = BuildLattice(CaseOf({Wing(5, 12), Fin(4, 6)}));
  for (KernelIsa isa : {KernelIsa::baseline, KernelIsa::avx2, KernelIsa::avx512}) {
    const KernelIsa used = CapKernelIsa(isa);
    EXPECT_LE(static_cast<int>(used), static_cast<int>(isa));
    const std::string name = KernelIsaName(used);
    ExpectAssemblyMatches(lat, XAxisWake(), true, 2, "wing and fin, " + name);
    ExpectAssemblyMatches(lat, SideslipWake(), true, 1, "wing and fin, sideslipping wake, " + name);
    ExpectVelocityMatches(lat, BoundMidpoints(lat), XAxisWake(true), "bound midpoints, ground plane, " + name);
    ExpectVelocityMatches(lat, ScatteredPoints(29), SideslipWake(), "scattered points, " + name);
  }
}

TEST(SpeedPaths, AssemblyIsBitIdenticalOnOneAndTwoThreads) {
  const Lattice lat = BuildLattice(CaseOf({Wing(6, 20), Fin(4, 6)}));
  for (const WakeGeometry& wake : {XAxisWake(), XAxisWake(true), SideslipWake()}) {
    const std::vector<SystemLayout> layouts = ChooseLayouts(lat, wake);
    const auto one = OnThreads(1, [&] { return AssembleInfluence(lat, layouts, wake); });
    const auto two = OnThreads(2, [&] { return AssembleInfluence(lat, layouts, wake); });
    ASSERT_EQ(one.size(), two.size());
    for (std::size_t l = 0; l < one.size(); ++l) EXPECT_TRUE(BitIdentical(one[l], two[l])) << "layout " << l;
  }
}

TEST(SpeedPaths, VelocityIsBitIdenticalOnOneAndTwoThreads) {
  const Lattice lat = BuildLattice(CaseOf({Wing(6, 20), Fin(4, 6)}));
  const Eigen::MatrixXd gamma = SomeCirculations(lat, 13);
  const PointArray mid = BoundMidpoints(lat), scattered = ScatteredPoints(301);
  for (const WakeGeometry& wake : {XAxisWake(), XAxisWake(true), SideslipWake()}) {
    for (const PointArray* points : {&mid, &scattered}) {
      const auto one = OnThreads(1, [&] { return InducedVelocityAt(lat, *points, gamma, wake); });
      const auto two = OnThreads(2, [&] { return InducedVelocityAt(lat, *points, gamma, wake); });
      EXPECT_TRUE(BitIdentical(one.u, two.u));
      EXPECT_TRUE(BitIdentical(one.v, two.v));
      EXPECT_TRUE(BitIdentical(one.w, two.w));
    }
  }
}

}  // namespace
}  // namespace skein
