// Geometry checks before assembly (geometry_check.hpp): coincident, intersecting, folded and degenerate
// surfaces, and control points on trailing legs, each named with its cause and the surfaces involved.
//
// Where a check guards the solve, the test also shows what it guards against: with the check bypassed, the
// coincident pair gives a singular influence matrix (two identical rows; linear algebra, common practice).
#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/geometry_check.hpp"
#include "skein/lattice.hpp"
#include "skein/run.hpp"
#include "skein/solver.hpp"

namespace skein {
namespace {

using testing::MakeCase;
using testing::MakeSection;
using testing::Mesh;
using testing::RectangularWing;

bool Contains(const std::string& s, const std::string& part) { return s.find(part) != std::string::npos; }

/// The InputError message CheckGeometry throws, or "" if it does not throw.
std::string GeometryError(const Case& c) {
  try {
    CheckGeometry(c, BuildLattice(c));
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

Surface Named(Surface s, const std::string& name) {
  s.name = name;
  return s;
}

Case CoincidentWings() {
  return MakeCase({RectangularWing(4.0, 1.0, Mesh(4, 6)), Named(RectangularWing(4.0, 1.0, Mesh(4, 6)), "copy")});
}

TEST(GeometryCheck, AnOrdinaryWingAndTailPass) {
  Surface tail = Named(testing::TaperedWing(1.6, 0.4, 0.7, 5.0, Mesh(4, 6)), "tail");
  for (Section& s : tail.sections) s.leading_edge = {s.leading_edge[0] + 3.0, s.leading_edge[1], 0.3};
  const Case c = MakeCase({testing::TaperedWing(8.0, 1.2, 0.5, 10.0, Mesh(6, 12)), tail}, {2.0});
  const Lattice lat = BuildLattice(c);
  EXPECT_NO_THROW(CheckGeometry(c, lat));
  EXPECT_TRUE(CheckWakeClearance(c, lat, {1.0, 0.0, 0.0}).empty());
}

TEST(GeometryCheck, CoincidentSurfacesAreNamed) {
  Case c = CoincidentWings();
  c.source_path = "twins.toml";
  c.surfaces[1].where = {14, 1};
  const std::string msg = GeometryError(c);
  EXPECT_EQ(msg.rfind("twins.toml:14:1: surface \"copy\": coincides with surface \"wing\"", 0), 0u) << msg;
  EXPECT_TRUE(Contains(msg, "singular")) << msg;
  EXPECT_EQ(msg.find('\n'), std::string::npos);
}

TEST(GeometryCheck, CoincidentSurfacesWouldMakeTheSystemSingular) {
  // Bypass the check: the solver itself finds the matrix singular, and the diagnosis names both surfaces.
  const Case c = CoincidentWings();
  const Lattice lat = BuildLattice(c);
  const WakeGeometry wake = WakeFor(c, 0.0, 0.0);
  const BasisSolution b = SolveBasis(lat, c.reference.moment_point, wake, {});
  EXPECT_TRUE(b.status == SolveStatus::singular || b.status == SolveStatus::non_finite) << b.rcond;
  const std::string why = DiagnoseCloseApproach(lat, wake.direction);
  EXPECT_TRUE(Contains(why, "surfaces \"wing\" and \"copy\"")) << why;
  EXPECT_TRUE(Contains(why, "coincident")) << why;
}

TEST(GeometryCheck, RunRefusesCoincidentSurfaces) {
  const Case c = CoincidentWings();
  EXPECT_THROW(skein::Run(c, RunOptions{}), InputError);
}

TEST(GeometryCheck, ShiftedCopyIsNotCoincident) {
  // The same wing a chord above the first is a biplane, not a coincidence.
  Case c = CoincidentWings();
  for (Section& s : c.surfaces[1].sections) s.leading_edge[2] += 1.0;
  EXPECT_EQ(GeometryError(c), "");
}

TEST(GeometryCheck, WingFoldedBackOnItself) {
  // Root to y = 2, then back inward to y = 1 a little higher: the outer segment lies over the inner one, its
  // normal pointing down.
  Surface w;
  w.name = "wing";
  w.symmetric = true;
  w.mesh = Mesh(4, 8, Spacing::uniform);
  w.sections = {MakeSection({0.0, 0.0, 0.0}, 1.0), MakeSection({0.0, 2.0, 0.0}, 1.0),
                MakeSection({0.0, 1.0, 0.05}, 1.0)};
  Case c = MakeCase({w});
  c.source_path = "fold.toml";
  c.surfaces[0].where = {3, 1};
  const std::string msg = GeometryError(c);
  EXPECT_EQ(msg.rfind("fold.toml:3:1: surface \"wing\": the surface folds back on itself between strips", 0), 0u)
      << msg;
}

TEST(GeometryCheck, CrankedWingWithWingletIsNotAFold) {
  // A 90 deg winglet turns the normal by 90 deg, well short of a fold.
  Surface w;
  w.name = "wing";
  w.symmetric = true;
  w.mesh = Mesh(4, 10, Spacing::uniform);
  w.sections = {MakeSection({0.0, 0.0, 0.0}, 1.0), MakeSection({0.2, 3.0, 0.0}, 0.6),
                MakeSection({0.4, 3.0, 0.5}, 0.4)};
  EXPECT_EQ(GeometryError(MakeCase({w})), "");
}

TEST(GeometryCheck, FinThroughTheWingIntersects) {
  Surface fin;
  fin.name = "fin";
  fin.symmetric = false;
  fin.mesh = Mesh(4, 3, Spacing::uniform);
  fin.sections = {MakeSection({0.2, 0.3, -0.5}, 0.5), MakeSection({0.2, 0.3, 0.5}, 0.5)};
  const std::string msg = GeometryError(MakeCase({RectangularWing(4.0, 1.0, Mesh(4, 6, Spacing::uniform)), fin}));
  EXPECT_TRUE(Contains(msg, "surface \"fin\": intersects surface \"wing\"")) << msg;
  EXPECT_TRUE(Contains(msg, "passes through")) << msg;
}

TEST(GeometryCheck, FinStandingOnTheWingIsNotAnIntersection) {
  // Surfaces that meet along an edge (a centre-line fin on the wing) are allowed.
  Surface fin;
  fin.name = "fin";
  fin.symmetric = false;
  fin.mesh = Mesh(4, 3, Spacing::uniform);
  fin.sections = {MakeSection({0.5, 0.0, 0.0}, 0.5), MakeSection({0.7, 0.0, 0.6}, 0.3)};
  EXPECT_EQ(GeometryError(MakeCase({RectangularWing(4.0, 1.0, Mesh(4, 6, Spacing::uniform)), fin})), "");
}

/// A wing (2 uniform strips per half: strip edges at y = 0, 0.5, 1) and, behind it at height z, a tail with one
/// strip per half, so that the tail's control points lie at y = +-0.5, behind the wing's legs from y = +-0.5.
Case TailBehindWing(double tail_z) {
  Surface tail;
  tail.name = "tail";
  tail.symmetric = true;
  tail.mesh = Mesh(1, 1, Spacing::uniform, Spacing::uniform);
  tail.sections = {MakeSection({3.0, 0.0, tail_z}, 0.5), MakeSection({3.0, 1.0, tail_z}, 0.5)};
  return MakeCase({RectangularWing(2.0, 1.0, Mesh(2, 2, Spacing::uniform, Spacing::uniform)), tail});
}

TEST(GeometryCheck, ControlPointOnAnotherSurfacesTrailingLeg) {
  Case c = TailBehindWing(0.0);
  c.source_path = "tail.toml";
  c.surfaces[1].where = {20, 1};
  const Lattice lat = BuildLattice(c);
  EXPECT_NO_THROW(CheckGeometry(c, lat));
  try {
    CheckWakeClearance(c, lat, {1.0, 0.0, 0.0}, "at alpha 0 deg, beta 0 deg");
    FAIL() << "a control point on a trailing leg was accepted";
  } catch (const InputError& e) {
    const std::string msg = e.what();
    EXPECT_EQ(msg.rfind("tail.toml:20:1: surface \"tail\": the control point of strip", 0), 0u) << msg;
    EXPECT_TRUE(Contains(msg, "lies on a trailing leg of surface \"wing\" at alpha 0 deg, beta 0 deg")) << msg;
  }
  EXPECT_THROW(skein::Run(c, RunOptions{}), InputError);
}

TEST(GeometryCheck, ControlPointNearAnotherSurfacesTrailingLegWarns) {
  // Tail panel size 0.5 m (its chord): 0.05 m above the leg is 0.1 of it, outside the core, inside the margin.
  const Case c = TailBehindWing(0.05);
  const Lattice lat = BuildLattice(c);
  const std::vector<WakeWarning> w = CheckWakeClearance(c, lat, {1.0, 0.0, 0.0});
  ASSERT_EQ(w.size(), 1u);
  EXPECT_EQ(w[0].surface, 1);
  EXPECT_EQ(w[0].leg_surface, 0);
  EXPECT_TRUE(Contains(w[0].message, "surface \"tail\": the control point of")) << w[0].message;
  const Results r = skein::Run(c, RunOptions{});
  int found = 0;
  for (const std::string& s : r.warnings) found += Contains(s, "trailing leg of surface \"wing\"") ? 1 : 0;
  EXPECT_EQ(found, 1);
  // Half a chord above, no warning.
  EXPECT_TRUE(CheckWakeClearance(TailBehindWing(0.5), BuildLattice(TailBehindWing(0.5)), {1.0, 0.0, 0.0}).empty());
}

TEST(GeometryCheck, TheWarningMarginIsAQuarterOfThePanelSize) {
  // Tail panel size 0.5 m: the margin is 0.125 m above the leg. Just inside it warns, just outside it does not
  // (the quick pre-filter over all panels and legs must not hide a panel at the edge).
  const auto warnings_at = [](double height) {
    const Case c = TailBehindWing(height);
    return CheckWakeClearance(c, BuildLattice(c), {1.0, 0.0, 0.0}).size();
  };
  EXPECT_EQ(warnings_at(0.124), 1u);
  EXPECT_EQ(warnings_at(0.126), 0u);
}

TEST(GeometryCheck, TheWakeDirectionDecides) {
  // Tilted 10 deg, the legs pass 2.6 m behind the wing at 0.46 m above the tail: clear.
  const Case c = TailBehindWing(0.0);
  const double a = 10.0 * testing::kDeg;
  EXPECT_TRUE(CheckWakeClearance(c, BuildLattice(c), {std::cos(a), 0.0, std::sin(a)}).empty());
}

TEST(GeometryCheck, DegenerateAndNonFiniteLatticesAreRefused) {
  const Case c = MakeCase({RectangularWing(4.0, 1.0, Mesh(4, 6))});
  {
    Lattice lat = BuildLattice(c);
    lat.control.x[3] = std::numeric_limits<double>::quiet_NaN();
    try {
      CheckGeometry(c, lat);
      FAIL();
    } catch (const InputError& e) {
      EXPECT_TRUE(Contains(e.what(), "non-finite coordinates")) << e.what();
    }
  }
  {
    // Squash a panel's trailing corners onto its leading ones' line: sides parallel, area zero.
    Lattice lat = BuildLattice(c);
    const std::size_t i = 5;
    lat.corner_te_b.x[i] = lat.corner_le_b.x[i];
    lat.corner_te_b.y[i] = lat.corner_le_b.y[i] + 1e-3;
    lat.corner_te_a.x[i] = lat.corner_le_a.x[i];
    lat.corner_te_a.y[i] = lat.corner_le_a.y[i] + 1e-3;
    lat.area[i] = 1e-12;
    try {
      CheckGeometry(c, lat);
      FAIL();
    } catch (const InputError& e) {
      EXPECT_TRUE(Contains(e.what(), "surface \"wing\": degenerate panel at strip")) << e.what();
    }
  }
}

TEST(GeometryCheck, CoordinatesBeyondAnyAircraftAreRefused) {
  Case c = MakeCase({RectangularWing(4.0, 1.0, Mesh(4, 6))});
  for (Section& s : c.surfaces[0].sections) s.leading_edge[0] += 1e7;
  const std::string msg = GeometryError(c);
  EXPECT_TRUE(Contains(msg, "beyond the 1e+06 m")) << msg;
}

}  // namespace
}  // namespace skein
