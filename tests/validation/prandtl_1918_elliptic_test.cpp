// Elliptic loading gives the least induced drag: span efficiency e = 1, CD_induced = CL^2 / (pi A).
//
// Source: L. Prandtl, "Tragflügeltheorie. I. Mitteilung", Nachrichten von der Gesellschaft der Wissenschaften
// zu Göttingen, Mathematisch-Physikalische Klasse, 1918, pp. 451-477 (lifting-line theory: an untwisted flat
// wing of elliptic planform carries an elliptic span loading, with constant downwash and the minimum induced
// drag CD_i = CL^2 / (pi A) for its span and lift); the textbook form is in H. Glauert, The Elements of
// Aerofoil and Airscrew Theory, Cambridge University Press, 1926, ch. XI (chapter from memory).
//
// The lattice is a lifting-surface model, so its loading on an elliptic planform need not be exactly
// elliptic; the check allows 1.5% (the acceptance figure). The theory assumes a flat wake behind a planar
// wing, so the wake is "x-axis". Planform: chord c0 cos(theta) at y = s sin(theta), theta uniform per
// half (strips dense toward the tip), straight unswept quarter-chord line, tip chord 1% of c0.
#include <cmath>
#include <string>
#include <vector>

#include <fmt/format.h>
#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

constexpr double kPi = 3.14159265358979323846;
// Acceptance tolerance on e and on CD_induced / (CL^2 / (pi A)).
constexpr double kEllipticTolerance = 0.015;

struct Measured {
  double e, drag_ratio, CL, CDi;
};

/// Aspect ratio 8 (S = pi b c0 / 4, so c0 = b / (2 pi)), `segments` strips per half, 8 chordwise panels.
Measured EllipticWing(int segments) {
  const double span = 8.0, c0 = span / (2.0 * kPi);
  const Case c = testing::WingCase(testing::EllipticWing(span, c0, segments, 8), {5.0});
  const PointResult p = skein::Run(c, {}).points.at(0);
  const double aspect = c.reference.span * c.reference.span / c.reference.area;  // 8 to 1e-4
  return {*p.span_efficiency, p.CD_induced / (p.CL * p.CL / (kPi * aspect)), p.CL, p.CD_induced};
}

TEST(PrandtlElliptic, SpanEfficiencyIsOneAt8By64) {
  const Measured m = EllipticWing(64);
  RecordProperty("e", fmt::format("{:.5f}", m.e));
  RecordProperty("CDi_over_CL2_piA", fmt::format("{:.5f}", m.drag_ratio));
  EXPECT_NEAR(m.e, 1.0, kEllipticTolerance) << "CL " << m.CL << " CDi " << m.CDi;
  EXPECT_NEAR(m.drag_ratio, 1.0, kEllipticTolerance);
}

TEST(PrandtlElliptic, SpanEfficiencyConvergesTowardOneAsTheMeshRefines) {
  // Measured (8 chordwise): e = 1.036, 1.015, 1.006, 1.001 at 16, 32, 64, 128 strips per half; the lattice
  // converges at first order in the strip count (each difference about half the one before), so the limit is
  // e_128 - (e_64 - e_128) r / (1 - r), r the ratio of successive differences.
  std::vector<double> e;
  for (const int n : {16, 32, 64, 128}) e.push_back(EllipticWing(n).e);
  for (std::size_t k = 0; k < e.size(); ++k)
    RecordProperty("e_" + std::to_string(16 << k), fmt::format("{:.5f}", e[k]));
  for (std::size_t k = 0; k + 1 < e.size(); ++k) EXPECT_LT(e[k + 1], e[k]) << "monotone";
  const double d1 = e[1] - e[2], d2 = e[2] - e[3];
  const double r = d2 / d1;
  EXPECT_GT(r, 0.4);  // first order: about 1/2
  EXPECT_LT(r, 0.6);
  const double limit = e[3] - d2 * r / (1.0 - r);
  RecordProperty("e_extrapolated", fmt::format("{:.5f}", limit));
  EXPECT_NEAR(limit, 1.0, kEllipticTolerance) << "extrapolated span efficiency " << limit;
  // Each refinement brings e closer to 1 down to 128 strips (the extrapolated limit lies 0.5% below 1).
  for (std::size_t k = 0; k + 1 < e.size(); ++k) EXPECT_LT(std::abs(e[k + 1] - 1.0), std::abs(e[k] - 1.0));
}

}  // namespace
}  // namespace skein
