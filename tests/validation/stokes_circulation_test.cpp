// The circulation of the probed velocity around a closed loop equals the circulation of the vortex lines the
// loop encloses.
//
// Source: Stokes' theorem (G. G. Stokes, Smith's Prize examination, Cambridge, 1854; the line integral of a
// vector field around a closed curve equals the flux of its curl through any surface the curve bounds) and
// Kelvin's circulation theorem (W. Thomson, "On vortex motion", Transactions of the Royal Society of Edinburgh
// 25, 1869; both publication details from memory): outside the vortex lines the flow of a lattice is irrotational, so the circulation around a loop is
// the sum of the circulations of the lines that pierce a surface spanning it.
//
// The loop is an ellipse in the plane y = y_m through the middle of one strip (its quarter-chord midpoint),
// enclosing the strip's section. In that plane the only vortex lines that cross it are the strip's bound
// vortices (one per chordwise panel, all running toward +y); the trailing legs run along x in the planes of the
// strip edges and cross no such plane. So the circulation around the loop, taken by the right-hand rule about
// +y (over the top from the leading edge to the trailing edge), is the strip's circulation, which the loads
// stage reports as the sum of its panels' circulations (loads.hpp, StripLoads::gamma, per unit airspeed). The
// freestream adds nothing around a closed loop (no rates are set: a body rotation has a curl of its own).
//
// Quadrature: the trapezoid rule on the ellipse, a smooth periodic integrand, converges geometrically with the
// number of points; 2000 points give round-off accuracy for loops that keep a chord-sized distance from the
// bound vortices.
//
// Why 1e-6 holds and what it needs. The lattice's kernel is regularised (biot_savart.hpp): each segment's field
// is multiplied by h^4 / (h^4 + eps^4), h the distance to its line and eps its core radius (a twentieth of the
// panel's smaller side), so the circulation around a bound vortex at distance h is Gamma h^4 / (h^4 + eps^4):
// Stokes' theorem holds to (eps / h)^4, and 1e-6 needs the loop more than about 32 core radii from every bound
// vortex it encloses and from every other line. The strip's own trailing legs lie half a strip width from the
// plane, i.e. more than 10 core radii, and their spread vorticity runs along x, parallel to the plane; with the
// chordwise panels below a tenth of the strip width that contribution too is below 1e-8. Hence the loops: three
// chords in radius around a single-panel section, 0.85 x 0.35 chords around an eight-panel one. (A loop of
// 0.85 x 0.35 chords around the single-panel section, 7 core radii from its bound vortex, is short by 2e-4,
// the size (eps / h)^4 predicts.) Measured: within 9e-8 on both wings; 1e-11 around nothing.
#include <cmath>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double kStokesTolerance = 1e-6;  // relative to the strip's circulation: the acceptance bound
constexpr int kLoopPoints = 2000;

struct Loop {
  double xc, y, zc, ax, cz;  // centre (xc, y, zc), semi-axes ax along x and cz along z
};

/// The probes of a loop: r(t) = (xc + ax cos t, y, zc - cz sin t), t = 2 pi j / n, which runs over the top
/// toward +x (the right-hand sense about +y).
std::vector<Probe> LoopProbes(const Loop& l, int n) {
  std::vector<Probe> out;
  for (int j = 0; j < n; ++j) {
    const double t = 2.0 * kPi * j / n;
    Probe p;
    p.name = "loop" + std::to_string(j);
    p.point = {l.xc + l.ax * std::cos(t), l.y, l.zc - l.cz * std::sin(t)};
    out.push_back(p);
  }
  return out;
}

/// The trapezoid rule of V . dr/dt over the loop, from the probes of one point.
double Circulation(const Loop& l, const std::vector<ProbeResult>& probes) {
  const int n = static_cast<int>(probes.size());
  double sum = 0.0;
  for (int j = 0; j < n; ++j) {
    const double t = 2.0 * kPi * j / n;
    EXPECT_TRUE(probes[static_cast<std::size_t>(j)].velocity.has_value()) << probes[static_cast<std::size_t>(j)].note;
    if (!probes[static_cast<std::size_t>(j)].velocity) return NAN;
    const Vec3 v = *probes[static_cast<std::size_t>(j)].velocity;
    sum += v[0] * (-l.ax * std::sin(t)) + v[2] * (-l.cz * std::cos(t));
  }
  return sum * 2.0 * kPi / n;
}

/// Solves `c` with the loop's probes and returns (loop circulation, the strip's circulation) for strip k of
/// surface 0, the loop's plane put through that strip's middle.
struct Measured {
  double loop = 0.0, strip = 0.0;
};
Measured AroundStrip(Case c, std::size_t k, double chord, double ax, double cz, double dz) {
  // The strip's middle, from a first solve without probes.
  const PointResult first = Run(c, {}).points.front();
  const double y = first.surfaces[0].strips.y[k];
  const Loop l{0.5 * chord, y, dz, ax, cz};
  c.probes = LoopProbes(l, kLoopPoints);
  const PointResult p = Run(c, {}).points.front();
  return {Circulation(l, p.probes), p.surfaces[0].strips.gamma[k]};
}

TEST(StokesCirculation, LoopAroundAStripOfASingleChordwisePanelWingGivesItsCirculation) {
  // Aspect ratio 80, one panel along the chord: the strips are far wider than the chord.
  const double span = 8.0, chord = 0.1;
  Case c = testing::WingCase(testing::RectangularWing(span, chord, testing::Mesh(1, 8, Spacing::uniform)), {5.0});
  for (std::size_t k : {0u, 3u, 9u, 15u}) {
    const Measured m = AroundStrip(c, k, chord, 3.0 * chord, 3.0 * chord, 0.0);
    ASSERT_GT(std::abs(m.strip), 1e-4);
    EXPECT_NEAR(m.loop / m.strip, 1.0, kStokesTolerance) << "strip " << k << ": loop " << m.loop << ", strip "
                                                         << m.strip;
  }
}

TEST(StokesCirculation, LoopAroundAStripOfAManyChordwisePanelWingGivesTheSumOfItsPanels) {
  const double span = 6.0, chord = 0.5;
  Case c = testing::WingCase(
      testing::RectangularWing(span, chord, testing::Mesh(8, 6, Spacing::uniform, Spacing::uniform), testing::Naca4(4, 4)),
      {3.0});
  for (std::size_t k : {1u, 5u, 8u}) {
    const Measured m = AroundStrip(c, k, chord, 0.85 * chord, 0.35 * chord, 0.02 * chord);
    ASSERT_GT(std::abs(m.strip), 1e-4);
    EXPECT_NEAR(m.loop / m.strip, 1.0, kStokesTolerance) << "strip " << k << ": loop " << m.loop << ", strip "
                                                         << m.strip;
  }
}

TEST(StokesCirculation, LoopThatEnclosesNoVortexGivesZero) {
  const double span = 6.0, chord = 0.5;
  Case c = testing::WingCase(testing::RectangularWing(span, chord, testing::Mesh(8, 6, Spacing::uniform, Spacing::uniform)),
                             {3.0});
  // The same plane as above, the loop lifted clear above the section.
  const Measured m = AroundStrip(c, 2, chord, 0.85 * chord, 0.35 * chord, 2.0 * chord);
  ASSERT_GT(std::abs(m.strip), 1e-4);
  EXPECT_NEAR(m.loop / m.strip, 0.0, kStokesTolerance) << "loop " << m.loop << ", strip " << m.strip;
}

}  // namespace
}  // namespace skein
