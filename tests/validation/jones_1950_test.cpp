// Validation: minimum induced drag at a given lift and a given root bending moment.
//
// Source: R. T. Jones, "The spanwise distribution of lift for minimum induced drag of wings having a given
// lift and a given bending moment", NACA TN 2249 (1950). Its summary result: with the root bending moment held
// to that of an elliptically loaded reference wing, a span 15 % greater with the best loading gives about
// 15 % less induced drag (the figure quoted from memory; checked here within 2 percentage points).
//
// Second, an exact value derived for this test from Glauert's Fourier series of the lifting line
// (H. Glauert, The Elements of Aerofoil and Airscrew Theory, 1926, ch. XI): with
// Gamma = 2 b V sum A_n sin(n theta), y = (b/2) cos(theta), the half-wing root bending moment is
// q b^3 sum A_n m_n with m_n = sigma_n / (n^2 - 4) (m_1 = 1/3), the lift q pi b^2 A_1 and the drag
// q pi b^2 sum n A_n^2. Holding lift and root bending moment at span k b_0 gives
//     D / D_0 = (1 + c^2 / S) / k^2,   c = (1/k - 1) / 3,   S = sum_{n = 3, 5, ...} 1 / (n (n^2 - 4)^2).
#include <cmath>
#include <cstdio>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/run.hpp"
#include "skein/study.hpp"

namespace skein {
namespace {

constexpr double kPi = 3.14159265358979323846;

double SeriesDragRatio(double k) {
  double S = 0.0;
  for (int n = 3; n < 200001; n += 2) {
    const double d = static_cast<double>(n) * n - 4.0;
    S += 1.0 / (n * d * d);
  }
  const double c = (1.0 / k - 1.0) / 3.0;
  return (1.0 + c * c / S) / (k * k);
}

/// Least induced drag at lift 1 and the elliptic reference wing's root bending moment, span k b_0, over the
/// reference wing's drag D_0 = 2 L^2 / (pi b_0^2) (V = rho = 1), on strips_per_half strips (sine spacing).
double DragRatio(double k, int strips_per_half) {
  const double b0 = 10.0, lift = 1.0;
  const double m0 = lift * b0 / (3.0 * kPi);  // half the lift at 4 s / (3 pi) from the root, s = b0 / 2
  const Case c = testing::WingCase(
      testing::RectangularWing(k * b0, 1.0, testing::Mesh(1, strips_per_half, Spacing::sine)), {0.0});
  const Lattice lat = BuildLattice(c);
  const WakeGeometry wake = WakeFor(c, 0.0, 0.0);
  const Eigen::MatrixXd Q = study::TrefftzDragMatrix(lat, wake);
  const Eigen::VectorXd l = study::TrefftzLiftVector(lat, wake, 0.0);
  const Eigen::VectorXd bm = study::TrefftzRootBendingVector(lat, wake, 0.0, 0);
  const std::vector<double> g = study::MinimumDragLoading(lat, 0, Q, l, lift, &bm, m0);
  const Eigen::Map<const Eigen::VectorXd> gv(g.data(), static_cast<Eigen::Index>(g.size()));
  EXPECT_NEAR(l.dot(gv), lift, 1e-12);
  EXPECT_NEAR(bm.dot(gv), m0, 1e-12);
  return gv.dot(Q * gv) / (2.0 * lift * lift / (kPi * b0 * b0));
}

TEST(Jones1950, FifteenPercentMoreSpanAtTheSameRootBendingGivesAboutFifteenPercentLessDrag) {
  const double r50 = DragRatio(1.15, 50), r100 = DragRatio(1.15, 100), r200 = DragRatio(1.15, 200);
  // Measured: 0.8523, 0.8557, 0.8574; the series value is 0.8591.
  EXPECT_NEAR(r200, 0.85, 0.02);  // Jones: about 15 % less
  const double series = SeriesDragRatio(1.15);
  EXPECT_NEAR(series, 0.85, 0.02);
  EXPECT_NEAR(r200, series, 3e-3);
  const auto ex = study::RichardsonExtrapolate(r50, r100, r200, 2.0, 1.0);
  EXPECT_NEAR(ex.value, series, 3e-4);
}

TEST(Jones1950, AtTheReferenceSpanTheBestLoadingIsTheEllipse) {
  // k = 1: the bending constraint is met by the elliptic loading itself, so the drag ratio is 1.
  EXPECT_NEAR(SeriesDragRatio(1.0), 1.0, 1e-15);
  EXPECT_NEAR(DragRatio(1.0, 100), 1.0, 1e-2);
}

TEST(Jones1950, TwistDesignOfAWingWithFifteenPercentMoreSpanAtTheSameRootBending) {
  // The same comparison through the whole pipeline: a flat elliptic planform (span b0 = 10 m, root chord
  // 1 m, our own invention) as the reference at CL 0.5, and a straight-tapered wing of the same area with
  // 15 % more span (taper 0.5), whose twist is designed for least induced drag at the same lift with its
  // root bending moment held to the reference's. Coefficients of both use the reference wing's S, b, c, so
  // equal CL is equal lift and equal root bending coefficient is equal moment. The design has six twist
  // stations per half, so it can only approach the best loading: the check is Jones's figure within 2
  // points and the series value (0.8591) within 2 points as well.
  const Case reference = testing::WingCase(testing::EllipticWing(10.0, 1.0, 32, 4), {4.0});
  const study::PointAtLift r = study::SolveAtLift(reference, 0.5, {});
  const double bending = study::RootBendingCoefficient(r.lattice, r.at, r.point, 0);
  const double area = reference.reference.area, span = 1.15 * 10.0, taper = 0.5;
  const double root_chord = 2.0 * area / (span * (1.0 + taper));
  Case longer = testing::WingCase(
      testing::TaperedWing(span, root_chord, taper, 0.0, testing::Mesh(4, 32, Spacing::sine)), {4.0});
  longer.reference = reference.reference;
  longer.reference.area_given = longer.reference.span_given = longer.reference.chord_given = true;
  study::TwistDesignOptions o;
  o.target_CL = 0.5;
  o.keep_root_bending = true;
  o.root_bending_limit = bending;
  const study::TwistDesign d = study::DesignTwist(longer, o);
  EXPECT_TRUE(d.converged);
  EXPECT_TRUE(d.bending_constraint_active);
  EXPECT_NEAR(d.after.CL, 0.5, 1e-9);
  EXPECT_NEAR(d.after.root_bending, bending, 1e-9 * bending);
  const double ratio = d.after.CD_induced / r.point.CD_induced;
  EXPECT_NEAR(ratio, 0.85, 0.02);
  EXPECT_NEAR(ratio, SeriesDragRatio(1.15), 0.02);
  std::printf("Jones through the pipeline: reference e %.4f CDi %.6f; longer wing CDi %.6f, ratio %.4f\n",
              *r.point.span_efficiency, r.point.CD_induced, d.after.CD_induced, ratio);
}

}  // namespace
}  // namespace skein
