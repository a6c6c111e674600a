// Skein: the Biot-Savart kernels for straight vortex segments, with unit circulation.
//
// These small inline functions are the one place the law is written; the influence matrix, the load pass and
// the Trefftz plane all call them, in loops that the compiler vectorises (no branches, no divisions by zero).
//
// Finite segment A->B, field point P (Katz & Plotkin, Low-Speed Aerodynamics, eq. 2.72, unit circulation):
//     v = 1/(4 pi) * (r1 x r2) / |r1 x r2|^2 * r0 . (r1/|r1| - r2/|r2|),   r0 = B - A, r1 = P - A, r2 = P - B.
// Semi-infinite segment from A along the unit direction d:
//     v = 1/(4 pi) * (d x r) / h^2 * (1 + r.d/|r|),   r = P - A, h = |d x r| the distance to the line.
//
// Regularisation. Both are multiplied by h^4 / (h^4 + eps^4), h the distance from P to the segment's line and
// eps the core radius, so that the velocity is finite everywhere and vanishes on the line itself (a point on
// a bound vortex feels nothing from it). The relative change is (eps/h)^4: with the core radius the lattice
// uses (kCoreFraction of a panel's smaller side), a control point half a panel away from a leg sees 1e-4 of
// that leg's velocity removed, far below the discretisation error. Lengths of zero are guarded by `kTiny`.
//
// Surfaces in another surface's wake. The core belongs to the source horseshoe, so a tail's control point near
// one of the wing's trailing legs feels that leg's full 1/h field down to h of about eps: results stay finite
// everywhere, but they converge with the mesh only when the tail's control points keep a distance from the
// legs that the mesh resolves, i.e. the tail sits off the wake sheet by more than about a strip width, or its
// strips are cut where the wing's legs run (tests/unit/whole_aircraft_test.cpp: a tail a tenth of a chord above
// the wake changes by less than 2 % over the last mesh doubling). A tail in the plane of the wake with its
// control points at arbitrary distances between the legs does not converge (the discrete legs do not stand for
// the continuous sheet there); the geometry check warns about it, and refuses a control point inside a core.
#pragma once

#include <algorithm>
#include <cmath>

namespace skein {

inline constexpr double kPi = 3.14159265358979323846;
inline constexpr double kInv4Pi = 1.0 / (4.0 * kPi);
/// Guards divisions by lengths that can be exactly zero (a field point on an end point); m.
inline constexpr double kTiny = 1e-300;

/// Velocity at P induced by a unit-circulation segment from A to B; adds to (u, v, w).
/// eps4 = core radius to the fourth power.
inline void AddSegmentVelocity(double px, double py, double pz, double ax, double ay, double az, double bx,
                               double by, double bz, double eps4, double& u, double& v, double& w) {
  const double r1x = px - ax, r1y = py - ay, r1z = pz - az;
  const double r2x = px - bx, r2y = py - by, r2z = pz - bz;
  const double r0x = bx - ax, r0y = by - ay, r0z = bz - az;
  const double cx = r1y * r2z - r1z * r2y;
  const double cy = r1z * r2x - r1x * r2z;
  const double cz = r1x * r2y - r1y * r2x;
  const double c2 = cx * cx + cy * cy + cz * cz;  // = h^2 |r0|^2
  const double r0sq = std::max(r0x * r0x + r0y * r0y + r0z * r0z, kTiny);
  const double inv_r1 = 1.0 / std::max(std::sqrt(r1x * r1x + r1y * r1y + r1z * r1z), kTiny);
  const double inv_r2 = 1.0 / std::max(std::sqrt(r2x * r2x + r2y * r2y + r2z * r2z), kTiny);
  const double k = r0x * (r1x * inv_r1 - r2x * inv_r2) + r0y * (r1y * inv_r1 - r2y * inv_r2) +
                   r0z * (r1z * inv_r1 - r2z * inv_r2);
  const double h2 = c2 / r0sq;
  // c/|c|^2 * h^4/(h^4+eps^4) = c * h^2 / (r0sq * (h^4 + eps^4))
  const double f = kInv4Pi * k * h2 / (r0sq * (h2 * h2 + eps4) + kTiny);
  u += f * cx;
  v += f * cy;
  w += f * cz;
}

/// Velocity at P induced by a unit-circulation semi-infinite segment that starts at A and runs to infinity
/// along the unit vector d; adds to (u, v, w). A negative `strength` reverses it (a leg coming from infinity).
inline void AddSemiInfiniteVelocity(double px, double py, double pz, double ax, double ay, double az, double dx,
                                    double dy, double dz, double eps4, double strength, double& u, double& v,
                                    double& w) {
  const double rx = px - ax, ry = py - ay, rz = pz - az;
  const double cx = dy * rz - dz * ry;
  const double cy = dz * rx - dx * rz;
  const double cz = dx * ry - dy * rx;
  const double h2 = cx * cx + cy * cy + cz * cz;
  const double inv_r = 1.0 / std::max(std::sqrt(rx * rx + ry * ry + rz * rz), kTiny);
  const double k = 1.0 + (rx * dx + ry * dy + rz * dz) * inv_r;
  const double f = strength * kInv4Pi * k / (h2 * h2 + eps4 + kTiny) * h2;
  u += f * cx;
  v += f * cy;
  w += f * cz;
}

/// Velocity at P of a unit horseshoe: from infinity (along -d) to TA, TA -> A, the bound segment A -> B,
/// B -> TB, and TB to infinity along d. A and B lie on the panel's quarter-chord line, TA and TB where its side
/// edges meet the trailing edge. Positive circulation gives a Kutta-Joukowski force along (d x (B - A)).
inline void AddHorseshoeVelocity(double px, double py, double pz, const double* a, const double* b,
                                 const double* ta, const double* tb, const double* d, double eps4, double& u,
                                 double& v, double& w) {
  AddSemiInfiniteVelocity(px, py, pz, ta[0], ta[1], ta[2], d[0], d[1], d[2], eps4, -1.0, u, v, w);
  AddSegmentVelocity(px, py, pz, ta[0], ta[1], ta[2], a[0], a[1], a[2], eps4, u, v, w);
  AddSegmentVelocity(px, py, pz, a[0], a[1], a[2], b[0], b[1], b[2], eps4, u, v, w);
  AddSegmentVelocity(px, py, pz, b[0], b[1], b[2], tb[0], tb[1], tb[2], eps4, u, v, w);
  AddSemiInfiniteVelocity(px, py, pz, tb[0], tb[1], tb[2], d[0], d[1], d[2], eps4, 1.0, u, v, w);
}

/// Two-dimensional velocity in the Trefftz plane (normal to d) of a unit vortex pair left by a wake strip
/// from TA to TB: an infinite line along -d through TA and one along +d through TB. (v, w) are the full 3-D
/// components; the component along d is zero. Same regularisation as above.
inline void AddTrefftzPairVelocity(double px, double py, double pz, const double* ta, const double* tb,
                                   const double* d, double eps4, double& u, double& v, double& w) {
  const double inv2pi = 2.0 * kInv4Pi;
  for (int leg = 0; leg < 2; ++leg) {
    const double* q = leg == 0 ? ta : tb;
    const double s = leg == 0 ? -1.0 : 1.0;
    const double rx = px - q[0], ry = py - q[1], rz = pz - q[2];
    const double cx = d[1] * rz - d[2] * ry;
    const double cy = d[2] * rx - d[0] * rz;
    const double cz = d[0] * ry - d[1] * rx;
    const double h2 = cx * cx + cy * cy + cz * cz;
    const double f = s * inv2pi * h2 / (h2 * h2 + eps4 + kTiny);
    u += f * cx;
    v += f * cy;
    w += f * cz;
  }
}

}  // namespace skein
