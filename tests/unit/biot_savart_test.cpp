// Tests for biot_savart.hpp: the straight-segment kernels against closed forms of the Biot-Savart law.
//
// Closed forms (Katz & Plotkin, Low-Speed Aerodynamics, 2nd ed., sec. 2.11 and eq. 2.68-2.72, the velocity of
// a straight vortex segment, v = Gamma/(4 pi h) (cos theta1 - cos theta2) along the right-hand direction):
//  - an infinite straight vortex:             |v| = Gamma / (2 pi h);
//  - a semi-infinite one, in the plane through its end normal to it: |v| = Gamma / (4 pi h);
//  - a square ring of side a, at its centre:  |v| = 2 sqrt(2) Gamma / (pi a);
//  - far from a small closed ring of area S (a vortex dipole), on its axis: |v| = Gamma S / (2 pi z^3),
//    falling off as 1/r^3 in every direction.
// The regularisation factor h^4 / (h^4 + eps^4) is the kernel's own definition (biot_savart.hpp).
#include "skein/biot_savart.hpp"

#include <array>
#include <cmath>
#include <limits>

#include <gtest/gtest.h>

namespace skein {
namespace {

using V3 = std::array<double, 3>;

V3 Segment(const V3& p, const V3& a, const V3& b, double eps4 = 0.0) {
  double u = 0.0, v = 0.0, w = 0.0;
  AddSegmentVelocity(p[0], p[1], p[2], a[0], a[1], a[2], b[0], b[1], b[2], eps4, u, v, w);
  return {u, v, w};
}

V3 SemiInfinite(const V3& p, const V3& a, const V3& d, double eps4 = 0.0, double strength = 1.0) {
  double u = 0.0, v = 0.0, w = 0.0;
  AddSemiInfiniteVelocity(p[0], p[1], p[2], a[0], a[1], a[2], d[0], d[1], d[2], eps4, strength, u, v, w);
  return {u, v, w};
}

V3 Horseshoe(const V3& p, const V3& a, const V3& b, const V3& ta, const V3& tb, const V3& d, double eps4) {
  double u = 0.0, v = 0.0, w = 0.0;
  AddHorseshoeVelocity(p[0], p[1], p[2], a.data(), b.data(), ta.data(), tb.data(), d.data(), eps4, u, v, w);
  return {u, v, w};
}

V3 TrefftzPair(const V3& p, const V3& ta, const V3& tb, const V3& d, double eps4) {
  double u = 0.0, v = 0.0, w = 0.0;
  AddTrefftzPairVelocity(p[0], p[1], p[2], ta.data(), tb.data(), d.data(), eps4, u, v, w);
  return {u, v, w};
}

double Norm(const V3& v) { return std::sqrt(v[0] * v[0] + v[1] * v[1] + v[2] * v[2]); }

bool AllFinite(const V3& v) { return std::isfinite(v[0]) && std::isfinite(v[1]) && std::isfinite(v[2]); }

// A handful of floating-point operations on order-one numbers.
constexpr double kRoundOff = 1e-14;

TEST(SegmentKernel, LongSegmentIsTheInfiniteLineVortex) {
  // Segment along +y from -L to L, field point at distance h on +x: v = -z Gamma/(2 pi h) L/sqrt(L^2 + h^2).
  const double h = 0.7, L = 1e4;
  const V3 v = Segment({h, 0.0, 0.0}, {0.0, -L, 0.0}, {0.0, L, 0.0});
  const double finite = 1.0 / (2.0 * kPi * h) * L / std::sqrt(L * L + h * h);
  EXPECT_NEAR(v[2], -finite, 1e-12 * finite);
  EXPECT_NEAR(v[2], -1.0 / (2.0 * kPi * h), 1e-8 / (2.0 * kPi * h));  // infinite limit: 1 - L/sqrt(..) = 2.5e-9
  EXPECT_NEAR(v[0], 0.0, kRoundOff);
  EXPECT_NEAR(v[1], 0.0, kRoundOff);
}

TEST(SegmentKernel, FiniteSegmentMatchesTheAngleFormula) {
  // v = Gamma/(4 pi h) (cos theta1 - cos theta2), theta measured from the segment direction.
  const V3 a{0.3, -0.2, 0.1}, b{1.5, 0.9, -0.4}, p{0.2, 1.1, 0.8};
  const V3 v = Segment(p, a, b);
  const V3 r0{b[0] - a[0], b[1] - a[1], b[2] - a[2]}, r1{p[0] - a[0], p[1] - a[1], p[2] - a[2]},
      r2{p[0] - b[0], p[1] - b[1], p[2] - b[2]};
  const double l0 = Norm(r0), cos1 = (r0[0] * r1[0] + r0[1] * r1[1] + r0[2] * r1[2]) / (l0 * Norm(r1)),
               cos2 = (r0[0] * r2[0] + r0[1] * r2[1] + r0[2] * r2[2]) / (l0 * Norm(r2));
  const V3 c{r0[1] * r1[2] - r0[2] * r1[1], r0[2] * r1[0] - r0[0] * r1[2], r0[0] * r1[1] - r0[1] * r1[0]};
  const double h = Norm(c) / l0;
  const double mag = (cos1 - cos2) / (4.0 * kPi * h);
  for (std::size_t k = 0; k < 3; ++k) EXPECT_NEAR(v[k], mag * c[k] / Norm(c), kRoundOff);
}

TEST(SegmentKernel, DirectionFollowsTheRightHandRule) {
  // Along +x, point on +y: velocity along +z; point on +z: velocity along -y.
  const V3 up = Segment({0.0, 1.0, 0.0}, {-1.0, 0.0, 0.0}, {1.0, 0.0, 0.0});
  EXPECT_GT(up[2], 0.0);
  EXPECT_NEAR(up[0], 0.0, kRoundOff);
  EXPECT_NEAR(up[1], 0.0, kRoundOff);
  const V3 side = Segment({0.0, 0.0, 1.0}, {-1.0, 0.0, 0.0}, {1.0, 0.0, 0.0});
  EXPECT_LT(side[1], 0.0);
  // Reversing the segment reverses the velocity.
  const V3 back = Segment({0.0, 1.0, 0.0}, {1.0, 0.0, 0.0}, {-1.0, 0.0, 0.0});
  EXPECT_NEAR(back[2], -up[2], kRoundOff);
}

TEST(SemiInfiniteKernel, IsHalfTheInfiniteLineInThePlaneOfItsEnd) {
  const double h = 0.4;
  const V3 d{1.0, 0.0, 0.0};
  // From the origin along +x, point at (0, h, 0): v = +z Gamma/(4 pi h).
  const V3 v = SemiInfinite({0.0, h, 0.0}, {0.0, 0.0, 0.0}, d);
  EXPECT_NEAR(v[2], 1.0 / (4.0 * kPi * h), kRoundOff);
  EXPECT_NEAR(v[0], 0.0, kRoundOff);
  EXPECT_NEAR(v[1], 0.0, kRoundOff);
  // A negative strength is a leg coming from infinity: the velocity reverses.
  const V3 in = SemiInfinite({0.0, h, 0.0}, {0.0, 0.0, 0.0}, d, 0.0, -1.0);
  EXPECT_NEAR(in[2], -v[2], kRoundOff);
  // Two semi-infinite legs back to back make the infinite line.
  const V3 rear = SemiInfinite({0.0, h, 0.0}, {0.0, 0.0, 0.0}, {-1.0, 0.0, 0.0}, 0.0, -1.0);
  EXPECT_NEAR(v[2] + rear[2], 1.0 / (2.0 * kPi * h), kRoundOff);
}

TEST(SemiInfiniteKernel, MatchesAVeryLongFiniteSegment) {
  const V3 a{0.2, -0.3, 0.1}, p{1.7, 0.4, -0.6};
  const double s = 1.0 / std::sqrt(1.0 + 0.04 + 0.01);
  const V3 d{s, 0.2 * s, -0.1 * s};
  const double L = 1e6;
  const V3 far{a[0] + L * d[0], a[1] + L * d[1], a[2] + L * d[2]};
  const V3 semi = SemiInfinite(p, a, d), fin = Segment(p, a, far);
  for (std::size_t k = 0; k < 3; ++k) EXPECT_NEAR(semi[k], fin[k], 1e-9 * Norm(semi));
}

TEST(SegmentKernel, SquareRingAtItsCentre) {
  // Side a in the plane z = 0, counter-clockwise seen from +z: velocity +z, 2 sqrt(2) Gamma / (pi a).
  const double a = 1.3, s = 0.5 * a;
  const V3 c1{-s, -s, 0.0}, c2{s, -s, 0.0}, c3{s, s, 0.0}, c4{-s, s, 0.0};
  V3 v{0.0, 0.0, 0.0};
  for (const auto& [p, q] : {std::pair{c1, c2}, {c2, c3}, {c3, c4}, {c4, c1}}) {
    const V3 dv = Segment({0.0, 0.0, 0.0}, p, q);
    for (std::size_t k = 0; k < 3; ++k) v[k] += dv[k];
  }
  EXPECT_NEAR(v[2], 2.0 * std::sqrt(2.0) / (kPi * a), kRoundOff);
  EXPECT_NEAR(v[0], 0.0, kRoundOff);
  EXPECT_NEAR(v[1], 0.0, kRoundOff);
}

V3 Ring(const V3& p, double a) {
  const double s = 0.5 * a;
  const V3 c[4] = {{-s, -s, 0.0}, {s, -s, 0.0}, {s, s, 0.0}, {-s, s, 0.0}};
  V3 v{0.0, 0.0, 0.0};
  for (int k = 0; k < 4; ++k) {
    const V3 dv = Segment(p, c[k], c[(k + 1) % 4]);
    for (std::size_t j = 0; j < 3; ++j) v[j] += dv[j];
  }
  return v;
}

TEST(SegmentKernel, ClosedRingFallsOffAsADipole) {
  const double a = 0.1;
  // On the axis: Gamma a^2 / (2 pi z^3) (the field of a dipole of moment Gamma a^2), to O((a/z)^2).
  const double z = 100.0 * a;
  const V3 on_axis = Ring({0.0, 0.0, z}, a);
  const double dipole = a * a / (2.0 * kPi * z * z * z);
  EXPECT_NEAR(on_axis[2], dipole, 1e-3 * dipole);
  // In any direction, doubling the distance divides the velocity by 8 (to O((a/r)^2)).
  for (const V3& dir : {V3{0.0, 0.0, 1.0}, V3{1.0, 0.0, 0.0}, V3{0.6, -0.48, 0.64}}) {
    const double r = 50.0 * a;
    const double v1 = Norm(Ring({r * dir[0], r * dir[1], r * dir[2]}, a));
    const double v2 = Norm(Ring({2 * r * dir[0], 2 * r * dir[1], 2 * r * dir[2]}, a));
    EXPECT_NEAR(v1 / v2, 8.0, 8.0 * 2e-3);
  }
}

TEST(Kernels, StayFiniteOnTheirOwnLinesEndsAndDegenerateSegments) {
  const V3 a{0.0, 0.0, 0.0}, b{1.0, 0.0, 0.0}, d{1.0, 0.0, 0.0};
  for (const double eps4 : {0.0, 1e-8}) {
    for (const V3& p : {V3{0.5, 0.0, 0.0}, V3{2.0, 0.0, 0.0}, V3{-3.0, 0.0, 0.0}, a, b}) {
      const V3 v = Segment(p, a, b, eps4);
      EXPECT_TRUE(AllFinite(v));
      EXPECT_EQ(Norm(v), 0.0) << "a point on the segment's line feels nothing from it";
      const V3 s = SemiInfinite(p, a, d, eps4);
      EXPECT_TRUE(AllFinite(s));
      EXPECT_EQ(Norm(s), 0.0);
    }
    // Zero-length segment, field point elsewhere and on it.
    for (const V3& p : {V3{0.3, 0.2, 0.1}, a}) {
      const V3 v = Segment(p, a, a, eps4);
      EXPECT_TRUE(AllFinite(v));
      EXPECT_EQ(Norm(v), 0.0);
    }
    // A horseshoe seen from the middle of its bound vortex and from its corners.
    const V3 ha{0.0, -0.5, 0.0}, hb{0.0, 0.5, 0.0}, ta{1.0, -0.5, 0.0}, tb{1.0, 0.5, 0.0};
    for (const V3& p : {V3{0.0, 0.0, 0.0}, ha, hb, ta, tb, V3{3.0, 0.5, 0.0}})
      EXPECT_TRUE(AllFinite(Horseshoe(p, ha, hb, ta, tb, d, eps4)));
    for (const V3& p : {ta, tb, V3{5.0, -0.5, 0.0}}) EXPECT_TRUE(AllFinite(TrefftzPair(p, ta, tb, d, eps4)));
  }
}

TEST(Kernels, RegularisationChangesTheValueByEpsOverHToTheFourth) {
  // At h = 10 eps the factor h^4/(h^4 + eps^4) is 1/(1 + 1e-4): a relative change of 1e-4.
  const double h = 0.3, eps = 0.1 * h, eps4 = eps * eps * eps * eps;
  const double expected = 1e-4 / (1.0 + 1e-4);
  const V3 p{0.2, h, 0.0};
  const V3 a{-1.0, 0.0, 0.0}, b{1.5, 0.0, 0.0};
  const V3 plain = Segment(p, a, b), reg = Segment(p, a, b, eps4);
  EXPECT_NEAR((plain[2] - reg[2]) / plain[2], expected, 1e-12);
  const V3 s0 = SemiInfinite(p, {0.0, 0.0, 0.0}, {1.0, 0.0, 0.0}),
           s1 = SemiInfinite(p, {0.0, 0.0, 0.0}, {1.0, 0.0, 0.0}, eps4);
  EXPECT_NEAR((s0[2] - s1[2]) / s0[2], expected, 1e-12);
  // Trefftz pair: one line at distance h, the other far away (its own factor is 1 to 1e-12).
  const V3 t0 = TrefftzPair({0.0, h, 0.0}, {0.0, 0.0, 0.0}, {0.0, 1e3, 0.0}, {1.0, 0.0, 0.0}, 0.0),
           t1 = TrefftzPair({0.0, h, 0.0}, {0.0, 0.0, 0.0}, {0.0, 1e3, 0.0}, {1.0, 0.0, 0.0}, eps4);
  const double near_leg = -1.0 / (2.0 * kPi * h);  // the leg through ta runs along -d: -z at +y
  EXPECT_NEAR((t0[2] - t1[2]) / near_leg, expected, 1e-9);
}

TEST(TrefftzPair, IsTheFarDownstreamLimitOfTheHorseshoeLegs) {
  // A swept, inclined horseshoe and an oblique wake direction; far downstream the bound vortex and the legs'
  // near parts fade (as 1/X^2) and the semi-infinite legs become infinite lines.
  const V3 a{0.1, -0.4, 0.05}, b{0.3, 0.6, 0.1}, ta{0.9, -0.4, 0.0}, tb{1.1, 0.6, 0.02};
  const double n = std::sqrt(1.0 + 0.05 * 0.05 + 0.08 * 0.08);
  const V3 d{1.0 / n, -0.05 / n, 0.08 / n};
  const double X = 1e5, eps4 = std::pow(0.02, 4);
  for (const V3& off : {V3{0.0, 0.1, 0.3}, V3{0.0, 0.55, -0.02}, V3{0.0, -2.0, 1.0}}) {
    const V3 p{ta[0] + X * d[0] + off[0], ta[1] + X * d[1] + off[1], ta[2] + X * d[2] + off[2]};
    const V3 far = Horseshoe(p, a, b, ta, tb, d, eps4);
    const V3 pair = TrefftzPair(p, ta, tb, d, eps4);
    for (std::size_t k = 0; k < 3; ++k) EXPECT_NEAR(pair[k], far[k], 1e-9 * Norm(pair)) << "component " << k;
    // The pair has no component along the wake.
    EXPECT_NEAR(pair[0] * d[0] + pair[1] * d[1] + pair[2] * d[2], 0.0, 1e-12 * Norm(pair));
  }
  // Seen in its own Trefftz plane, a pair on the y axis induces a downwash between its legs (positive
  // circulation: lift up, air pushed down), 2 x 1/(2 pi (w/2)) at the centre for legs w apart.
  const V3 mid = TrefftzPair({5.0, 0.0, 0.0}, {0.0, -0.5, 0.0}, {0.0, 0.5, 0.0}, {1.0, 0.0, 0.0}, 0.0);
  EXPECT_NEAR(mid[2], -2.0 / (2.0 * kPi * 0.5), kRoundOff);
}

TEST(HorseshoeKernel, IsTheSumOfItsFiveSegments) {
  const V3 a{0.0, -0.5, 0.0}, b{0.1, 0.5, 0.05}, ta{1.0, -0.5, 0.0}, tb{1.1, 0.5, 0.05}, d{1.0, 0.0, 0.0};
  const V3 p{0.4, 0.1, 0.2};
  const double eps4 = 1e-6;
  const V3 h = Horseshoe(p, a, b, ta, tb, d, eps4);
  V3 sum{0.0, 0.0, 0.0};
  for (const V3& v : {SemiInfinite(p, ta, d, eps4, -1.0), Segment(p, ta, a, eps4), Segment(p, a, b, eps4),
                      Segment(p, b, tb, eps4), SemiInfinite(p, tb, d, eps4, 1.0)})
    for (std::size_t k = 0; k < 3; ++k) sum[k] += v[k];
  for (std::size_t k = 0; k < 3; ++k) EXPECT_NEAR(h[k], sum[k], kRoundOff);
  // Seen from behind its bound vortex, a unit horseshoe along +y with legs to +x induces downwash.
  EXPECT_LT(Horseshoe({0.5, 0.0, 0.0}, {0.0, -0.5, 0.0}, {0.0, 0.5, 0.0}, {0.0, -0.5, 0.0}, {0.0, 0.5, 0.0}, d,
                      0.0)[2],
            0.0);
}

}  // namespace
}  // namespace skein
