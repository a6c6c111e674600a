// Skein stage 3, assemble. See influence.hpp.
//
// Speed. Both passes spend their time in the horseshoe kernel, so it is evaluated here in a form with the
// divisions merged: per horseshoe four square roots and two divisions instead of the four and twelve of
// AddHorseshoeVelocity (biot_savart.hpp), which stays the reference the tests hold these loops to (1e-12,
// tests/unit/speed_paths_test.cpp). With c = r1 x r2 (|c|^2 = h^2 |r0|^2, h the distance to the segment's
// line) and k = r0 . (r1 |r2| - r2 |r1|) = |r1| |r2| r0 . (r1/|r1| - r2/|r2|), the finite segment's factor is
//     f = k |c|^2 / (4 pi |r1| |r2| (|c|^4 + eps^4 |r0|^4)),
// and a semi-infinite leg's (unit d, c = d x r, |c| = h, s = +1 or -1)
//     f = s (|r| + r . d) |c|^2 / (4 pi |r| (|c|^4 + eps^4)):
// the expressions of biot_savart.hpp multiplied out. eps^4 |r0|^4 belongs to the source and is computed once.
// Of the five denominators (each of order length^10 for a segment, length^5 for a leg, and floored at 1e-100,
// where the reference adds 1e-300), the two legs' and the first segment's share one division and the other
// two segments' another: 1/x = y z / (x y z). So a horseshoe costs four square roots and two divisions, and
// the products stay in range for lengths between about 1e-8 m and 1e14 m.
//
// The assembly goes further, strip by strip. A strip's chordwise panels share their trailing-edge points, so
// their semi-infinite legs are the same lines, and their legs TA -> A and B -> TB lie on the strip's two side
// edges. Only the core radius (each panel's own) differs, and it enters a line's velocity as a factor that
// depends on the distance h to the line alone: a leg is (its velocity without a core) x h^4 / (h^4 + eps^4),
// and a piece X -> Y of a line along the unit vector u is
//     (g(X) - g(Y)) m h^2 / (4 pi (h^4 + eps^4)),   g(Z) = u . (P - Z) / |P - Z|,  m = u x (P - X),  h = |m|,
// where m and h are the same for every piece of the line (Katz & Plotkin's cos theta_1 - cos theta_2 form,
// eq. 2.72, with c = r0 x r1 = (u . r0) m). So ten numbers per target and strip (StripFields) hold the legs
// and the edges; a column then costs its bound segment, the cosines at A and B (from the two distances it
// needs anyway) and one division: per entry two square roots, one division and 58 multiplications and fused
// multiply-adds, where the horseshoe kernel took two square roots (with the strip's |P - TA|, |P - TB|
// shared), two divisions and 139 (counted in the AVX2 loop). The panels' cores, and so the answers, are those
// of the reference. The three grouped denominators are of order length^8, ^10 and ^10 (each floored at 1e-100),
// which keeps their product in range for lengths between about 1e-8 m and 1e10 m.
//
// The loops run over contiguous arrays without branches (the ground plane is a template argument) and are
// compiled twice, for the baseline instruction set and for AVX2 with FMA, chosen at run time by what the
// processor has. An entry is computed by the same instructions whichever thread runs it, so results do not
// depend on the thread count.
//
// InducedVelocityAt evaluates, for a block of target points, every horseshoe's velocity into the rows of a
// (3 x block) x horseshoes matrix and multiplies it by the circulations (one matrix product per block, run
// sequentially inside its thread; blocks are fixed by target index). When the targets are one point per
// panel of an exactly mirrored lattice (every mirrored panel's horseshoe and point are the bit-exact
// reflections of its given panel's, the trailing legs have no sideways component), the reflection
// S = diag(1, -1, 1) gives the mirrored half for free: a mirrored horseshoe runs the other way across the span,
// so V_m(j)(S P) = S V_j(P) and V_j(S P) = S V_m(j)(P), and one lying in the plane y = 0 has
// V_j(S P) = -S V_j(P). The horseshoes are evaluated at the given-half targets only (half the kernel work),
// each given horseshoe together with its mirror, and the rows hold the sum and the difference of the two: the
// sums times the mean of the pair's circulations and the differences times half their difference give the
// velocity at P as their sum and at S P as their difference (half the multiplications too).
#include "skein/influence.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <atomic>
#include <cstdint>
#include <functional>
#include <utility>

#include "skein/biot_savart.hpp"
#include "vec3.hpp"

#if defined(__linux__)
#include <sys/mman.h>
#endif

#if defined(__x86_64__) && (defined(__GNUC__) || defined(__clang__))
#define SKEIN_AVX2_CLONE 1
#define SKEIN_TARGET_AVX2 __attribute__((target("avx2,fma")))
#define SKEIN_TARGET_AVX512 __attribute__((target("avx512f,avx512dq,avx512vl,avx2,fma,prefer-vector-width=512")))
#endif
#if defined(__GNUC__) || defined(__clang__)
#define SKEIN_ALWAYS_INLINE inline __attribute__((always_inline))
#else
#define SKEIN_ALWAYS_INLINE inline
#endif

namespace skein {
namespace {

// ---- the kernel ---------------------------------------------------------------------------------------

/// Smallest denominator of a term's factor (see the file comment): three of them multiply to a normal number.
constexpr double kDenominatorFloor = 1e-100;

/// Finite segment from A to B at P: r1 = P - A, r2 = P - B with lengths n1, n2 (>= kTiny), r0 = B - A,
/// e = eps^4 |r0|^4. Its cross product c and the numerator and denominator of its factor f = num / den.
struct Term {
  double cx, cy, cz, num, den;
};
SKEIN_ALWAYS_INLINE Term SegmentTerm(double r1x, double r1y, double r1z, double n1, double r2x, double r2y,
                                     double r2z, double n2, double r0x, double r0y, double r0z, double e) {
  Term t;
  t.cx = r1y * r2z - r1z * r2y;
  t.cy = r1z * r2x - r1x * r2z;
  t.cz = r1x * r2y - r1y * r2x;
  const double c2 = t.cx * t.cx + t.cy * t.cy + t.cz * t.cz;
  const double k = r0x * (r1x * n2 - r2x * n1) + r0y * (r1y * n2 - r2y * n1) + r0z * (r1z * n2 - r2z * n1);
  t.num = kInv4Pi * k * c2;
  t.den = std::max(n1 * n2 * (c2 * c2 + e), kDenominatorFloor);
  return t;
}

/// Semi-infinite leg from A along the unit vector d at P: r = P - A with length n (>= kTiny), strength s.
SKEIN_ALWAYS_INLINE Term SemiInfiniteTerm(double rx, double ry, double rz, double n, double dx, double dy,
                                          double dz, double eps4, double s) {
  Term t;
  t.cx = dy * rz - dz * ry;
  t.cy = dz * rx - dx * rz;
  t.cz = dx * ry - dy * rx;
  const double h2 = t.cx * t.cx + t.cy * t.cy + t.cz * t.cz;
  t.num = s * kInv4Pi * (n + (rx * dx + ry * dy + rz * dz)) * h2;
  t.den = std::max(n * (h2 * h2 + eps4), kDenominatorFloor);
  return t;
}

SKEIN_ALWAYS_INLINE void AddTerm(const Term& t, double inv_den, double& u, double& v, double& w) {
  const double f = t.num * inv_den;
  u += f * t.cx;
  v += f * t.cy;
  w += f * t.cz;
}

/// One horseshoe (infinity -> TA -> A -> B -> TB -> infinity, legs along d) with its per-source constants.
struct Shoe {
  double ta[3], a[3], b[3], tb[3], d[3];
  double e[3];  ///< eps^4 |r0|^4 of TA -> A, A -> B, B -> TB
  double eps4;
};

/// |P - T|, never below kTiny.
SKEIN_ALWAYS_INLINE double DistanceTo(double px, double py, double pz, double tx, double ty, double tz) {
  const double x = px - tx, y = py - ty, z = pz - tz;
  return std::max(std::sqrt(x * x + y * y + z * z), kTiny);
}

/// Velocity at P of a unit horseshoe given by scalars (the same legs, in the same order, as
/// AddHorseshoeVelocity), with nq = |P - TA| and ns = |P - TB| given (DistanceTo). Adds to (u, v, w). The
/// five denominators take two divisions, in groups of three and two (see the file comment).
SKEIN_ALWAYS_INLINE void ShoeVelocity(double px, double py, double pz, double tax, double tay, double taz,
                                      double ax, double ay, double az, double bx, double by, double bz,
                                      double tbx, double tby, double tbz, double e0, double e1, double e2,
                                      double eps4, double dx, double dy, double dz, double nq, double ns,
                                      double& u, double& v, double& w) {
  const double qx = px - tax, qy = py - tay, qz = pz - taz;
  const double r1x = px - ax, r1y = py - ay, r1z = pz - az;
  const double r2x = px - bx, r2y = py - by, r2z = pz - bz;
  const double sx = px - tbx, sy = py - tby, sz = pz - tbz;
  const double n1 = std::max(std::sqrt(r1x * r1x + r1y * r1y + r1z * r1z), kTiny);
  const double n2 = std::max(std::sqrt(r2x * r2x + r2y * r2y + r2z * r2z), kTiny);
  const Term t0 = SemiInfiniteTerm(qx, qy, qz, nq, dx, dy, dz, eps4, -1.0);
  const Term t1 = SegmentTerm(qx, qy, qz, nq, r1x, r1y, r1z, n1, ax - tax, ay - tay, az - taz, e0);
  const Term t2 = SegmentTerm(r1x, r1y, r1z, n1, r2x, r2y, r2z, n2, bx - ax, by - ay, bz - az, e1);
  const Term t3 = SegmentTerm(r2x, r2y, r2z, n2, sx, sy, sz, ns, tbx - bx, tby - by, tbz - bz, e2);
  const Term t4 = SemiInfiniteTerm(sx, sy, sz, ns, dx, dy, dz, eps4, 1.0);
  // 1/x, 1/y, 1/z from 1/(x y z), and 1/x, 1/y from 1/(x y).
  const double d14 = t1.den * t4.den, inv_a = 1.0 / (t0.den * d14);
  const double inv_b = 1.0 / (t2.den * t3.den);
  AddTerm(t0, inv_a * d14, u, v, w);
  AddTerm(t1, inv_a * t0.den * t4.den, u, v, w);
  AddTerm(t2, inv_b * t3.den, u, v, w);
  AddTerm(t3, inv_b * t2.den, u, v, w);
  AddTerm(t4, inv_a * t0.den * t1.den, u, v, w);
}

/// The same, computing |P - TA| and |P - TB| itself.
SKEIN_ALWAYS_INLINE void ShoeVelocity(double px, double py, double pz, double tax, double tay, double taz,
                                      double ax, double ay, double az, double bx, double by, double bz,
                                      double tbx, double tby, double tbz, double e0, double e1, double e2,
                                      double eps4, double dx, double dy, double dz, double& u, double& v,
                                      double& w) {
  ShoeVelocity(px, py, pz, tax, tay, taz, ax, ay, az, bx, by, bz, tbx, tby, tbz, e0, e1, e2, eps4, dx, dy, dz,
               DistanceTo(px, py, pz, tax, tay, taz), DistanceTo(px, py, pz, tbx, tby, tbz), u, v, w);
}

/// Shoe s at P with |P - TA| = nq and |P - TB| = ns given.
SKEIN_ALWAYS_INLINE void ShoeVelocity(const Shoe& s, double px, double py, double pz, double nq, double ns,
                                      double& u, double& v, double& w) {
  ShoeVelocity(px, py, pz, s.ta[0], s.ta[1], s.ta[2], s.a[0], s.a[1], s.a[2], s.b[0], s.b[1], s.b[2], s.tb[0],
               s.tb[1], s.tb[2], s.e[0], s.e[1], s.e[2], s.eps4, s.d[0], s.d[1], s.d[2], nq, ns, u, v, w);
}

double SegmentConstant(const double* p, const double* q, double eps4) {
  const double x = q[0] - p[0], y = q[1] - p[1], z = q[2] - p[2];
  const double r0sq = x * x + y * y + z * z;
  return eps4 * r0sq * r0sq;
}

Shoe MakeShoe(const double* ta, const double* a, const double* b, const double* tb, const double* d, double eps4) {
  Shoe s{};
  for (int k = 0; k < 3; ++k) {
    s.ta[k] = ta[k];
    s.a[k] = a[k];
    s.b[k] = b[k];
    s.tb[k] = tb[k];
    s.d[k] = d[k];
  }
  s.e[0] = SegmentConstant(ta, a, eps4);
  s.e[1] = SegmentConstant(a, b, eps4);
  s.e[2] = SegmentConstant(b, tb, eps4);
  s.eps4 = eps4;
  return s;
}

/// Horseshoe j of the lattice under the wake.
Shoe LoadShoe(const Lattice& lat, std::size_t j, const WakeGeometry& wake) {
  const double a[3] = {lat.a.x[j], lat.a.y[j], lat.a.z[j]};
  const double b[3] = {lat.b.x[j], lat.b.y[j], lat.b.z[j]};
  const double ta[3] = {lat.te_a.x[j], lat.te_a.y[j], lat.te_a.z[j]};
  const double tb[3] = {lat.te_b.x[j], lat.te_b.y[j], lat.te_b.z[j]};
  const double d[3] = {wake.direction[0], wake.direction[1], wake.direction[2]};
  return MakeShoe(ta, a, b, tb, d, lat.core4[j]);
}

/// Its image in the ground plane z = height_z: reflected points in reversed order, so that it carries the
/// same circulation and makes the flow symmetric about the plane (no air crosses it).
Shoe GroundImage(const Shoe& s, const WakeGeometry& wake) {
  const double h2 = 2.0 * wake.ground.height_z;
  auto refl = [&](const double* p) { return std::array<double, 3>{p[0], p[1], h2 - p[2]}; };
  const auto ga = refl(s.b), gb = refl(s.a), gta = refl(s.tb), gtb = refl(s.ta);
  const double gd[3] = {s.d[0], s.d[1], -s.d[2]};
  return MakeShoe(gta.data(), ga.data(), gb.data(), gtb.data(), gd, s.eps4);
}

// ---- assembly: a strip's columns, the source fixed, the targets vectorised ------------------------------

struct TargetArrays {
  const double *px, *py, *pz, *nx, *ny, *nz;
  std::size_t n;
};

/// What the horseshoes of one strip share at every target P (normal n): the two semi-infinite legs, from TA
/// (the left, strength -1) and TB (the right, +1), and the two side edges, lines through TA and TB along the
/// unit vectors ul and ur, all without their core, whose radius is each panel's own (eps^4 = e). With r = P - TA,
/// c = d x r, h = |c|^2, the left leg gives n . v = wl / (hl + e), wl = -(1 + r . d / |r|) h (c . n) / (4 pi),
/// hl = h^2 (the right one likewise). A segment X -> Y on a line along u is (g(X) - g(Y)) (m . n) h / (4 pi
/// (h^2 + e)), g(Z) = u . (P - Z) / |P - Z|, m = u x (P - X) and h = |m|^2 the same for every piece of the line
/// (the factor k c^2 / (|r1| |r2| (c^4 + e |r0|^4)) of the file comment with c = r0 x r1 = (u . r0) m): so the
/// left edge's TA -> A gives (gl - u . (P - A) / |P - A|) ml / (kl + e), gl = g(TA), ml = (m . n) h / (4 pi),
/// kl = h^2, and the right edge's B -> TB (u . (P - B) / |P - B| - gr) mr / (kr + e). Ten numbers per target
/// and strip; a column then needs only its bound segment's terms and the two distances |P - A|, |P - B|.
struct StripFields {
  double *wl, *hl, *wr, *hr, *gl, *ml, *kl, *gr, *mr, *kr;
};
constexpr std::size_t kStripFields = 10;

/// A column's own numbers: the bound segment A -> B (r0 = B - A, eb = e |r0|^4), the panel's core e and the
/// directions of the strip's side edges.
struct Column {
  double a[3], b[3], r0[3], ul[3], ur[3];
  double e, eb;
};
Column ColumnOf(const Shoe& s, const double* ul, const double* ur) {
  Column c{};
  for (int k = 0; k < 3; ++k) {
    c.a[k] = s.a[k];
    c.b[k] = s.b[k];
    c.r0[k] = s.b[k] - s.a[k];
    c.ul[k] = ul[k];
    c.ur[k] = ur[k];
  }
  c.e = s.eps4;
  c.eb = s.e[1];
  return c;
}

/// The strip's fields at every target of t, for the horseshoe s with side edges along ul and ur.
SKEIN_ALWAYS_INLINE void StripStartImpl(const TargetArrays& t, const Shoe& src, const double* uleft,
                                        const double* uright, StripFields f) {
  const Shoe s = src;
  const double ul[3] = {uleft[0], uleft[1], uleft[2]}, ur[3] = {uright[0], uright[1], uright[2]};
  const double *px = t.px, *py = t.py, *pz = t.pz, *nx = t.nx, *ny = t.ny, *nz = t.nz;
#pragma omp simd
  for (std::size_t i = 0; i < t.n; ++i) {
    const double qx = px[i] - s.ta[0], qy = py[i] - s.ta[1], qz = pz[i] - s.ta[2];
    const double sx = px[i] - s.tb[0], sy = py[i] - s.tb[1], sz = pz[i] - s.tb[2];
    const double inq = 1.0 / std::max(std::sqrt(qx * qx + qy * qy + qz * qz), kTiny);
    const double ins = 1.0 / std::max(std::sqrt(sx * sx + sy * sy + sz * sz), kTiny);
    // Semi-infinite legs: c = d x r.
    const double c0x = s.d[1] * qz - s.d[2] * qy, c0y = s.d[2] * qx - s.d[0] * qz, c0z = s.d[0] * qy - s.d[1] * qx;
    const double c4x = s.d[1] * sz - s.d[2] * sy, c4y = s.d[2] * sx - s.d[0] * sz, c4z = s.d[0] * sy - s.d[1] * sx;
    const double h0 = c0x * c0x + c0y * c0y + c0z * c0z, h4 = c4x * c4x + c4y * c4y + c4z * c4z;
    f.wl[i] = -kInv4Pi * (1.0 + (qx * s.d[0] + qy * s.d[1] + qz * s.d[2]) * inq) * h0 *
              (c0x * nx[i] + c0y * ny[i] + c0z * nz[i]);
    f.hl[i] = h0 * h0;
    f.wr[i] = kInv4Pi * (1.0 + (sx * s.d[0] + sy * s.d[1] + sz * s.d[2]) * ins) * h4 *
              (c4x * nx[i] + c4y * ny[i] + c4z * nz[i]);
    f.hr[i] = h4 * h4;
    // Side edges.
    const double mlx = ul[1] * qz - ul[2] * qy, mly = ul[2] * qx - ul[0] * qz, mlz = ul[0] * qy - ul[1] * qx;
    const double mrx = ur[1] * sz - ur[2] * sy, mry = ur[2] * sx - ur[0] * sz, mrz = ur[0] * sy - ur[1] * sx;
    const double hl = mlx * mlx + mly * mly + mlz * mlz, hr = mrx * mrx + mry * mry + mrz * mrz;
    f.gl[i] = (ul[0] * qx + ul[1] * qy + ul[2] * qz) * inq;
    f.ml[i] = kInv4Pi * hl * (mlx * nx[i] + mly * ny[i] + mlz * nz[i]);
    f.kl[i] = hl * hl;
    f.gr[i] = (ur[0] * sx + ur[1] * sy + ur[2] * sz) * ins;
    f.mr[i] = kInv4Pi * hr * (mrx * nx[i] + mry * ny[i] + mrz * nz[i]);
    f.kr[i] = hr * hr;
  }
}

/// n . v at P of a column's horseshoe, from the strip's fields at target i (see StripFields): two square
/// roots and one division, 1/x = y z / (x y z) over the legs', the edges' and the bound segment's
/// denominators (each floored at kDenominatorFloor; of order length^8, length^10 and length^10).
SKEIN_ALWAYS_INLINE double ColumnAt(const Column& c, const StripFields& f, std::size_t i, double px, double py,
                                    double pz, double nx, double ny, double nz) {
  const double r1x = px - c.a[0], r1y = py - c.a[1], r1z = pz - c.a[2];
  const double r2x = px - c.b[0], r2y = py - c.b[1], r2z = pz - c.b[2];
  const double n1 = std::max(std::sqrt(r1x * r1x + r1y * r1y + r1z * r1z), kTiny);
  const double n2 = std::max(std::sqrt(r2x * r2x + r2y * r2y + r2z * r2z), kTiny);
  const Term tm = SegmentTerm(r1x, r1y, r1z, n1, r2x, r2y, r2z, n2, c.r0[0], c.r0[1], c.r0[2], c.eb);
  const double e = c.e;
  const double fl = f.hl[i] + e, fr = f.hr[i] + e, el = f.kl[i] + e, er = f.kr[i] + e;
  const double a1 = c.ul[0] * r1x + c.ul[1] * r1y + c.ul[2] * r1z;
  const double a2 = c.ur[0] * r2x + c.ur[1] * r2y + c.ur[2] * r2z;
  const double d1 = std::max(fl * fr, kDenominatorFloor);
  const double d2 = std::max(n1 * n2 * el * er, kDenominatorFloor);
  const double d3 = tm.den;
  const double legs = f.wl[i] * fr + f.wr[i] * fl;
  const double edges = (f.gl[i] * n1 - a1) * n2 * f.ml[i] * er + (a2 - f.gr[i] * n2) * n1 * f.mr[i] * el;
  const double bound = tm.num * (tm.cx * nx + tm.cy * ny + tm.cz * nz);
  const double d23 = d2 * d3;
  return (legs * d23 + (edges * d3 + bound * d2) * d1) / (d1 * d23);
}

/// Column of a single system: out[i] = n_i . v(P_i) of the column's horseshoe (and its ground image).
template <bool kGround>
SKEIN_ALWAYS_INLINE void DirectColumnImpl(const TargetArrays& t, const Column& src, const Column& src_ground,
                                          const StripFields* fields, double* out) {
  const Column s = src, g = src_ground;
  const StripFields fs = fields[0], fg = fields[1];
  const double *px = t.px, *py = t.py, *pz = t.pz, *nx = t.nx, *ny = t.ny, *nz = t.nz;
#pragma omp simd
  for (std::size_t i = 0; i < t.n; ++i) {
    double v = ColumnAt(s, fs, i, px[i], py[i], pz[i], nx[i], ny[i], nz[i]);
    if constexpr (kGround) v += ColumnAt(g, fg, i, px[i], py[i], pz[i], nx[i], ny[i], nz[i]);
    out[i] = v;
  }
}

/// Columns of the symmetric/antisymmetric pair: anti[i] = direct - image for every target, sym[i] = direct +
/// image for the first n_sym. fields[0..3]: those of src, src_ground, img, img_ground.
template <bool kGround>
SKEIN_ALWAYS_INLINE void PairColumnImpl(const TargetArrays& t, const Column& src, const Column& src_ground,
                                        const Column& img, const Column& img_ground, const StripFields* fields,
                                        std::size_t n_sym, double* anti, double* sym) {
  const Column s = src, sg = src_ground, m = img, mg = img_ground;
  const StripFields fs = fields[0], fsg = fields[1], fm = fields[2], fmg = fields[3];
  const double *px = t.px, *py = t.py, *pz = t.pz, *nx = t.nx, *ny = t.ny, *nz = t.nz;
#define SKEIN_PAIR_ENTRY                                                                    \
  double direct = ColumnAt(s, fs, i, px[i], py[i], pz[i], nx[i], ny[i], nz[i]);             \
  double image = ColumnAt(m, fm, i, px[i], py[i], pz[i], nx[i], ny[i], nz[i]);              \
  if constexpr (kGround) {                                                                  \
    direct += ColumnAt(sg, fsg, i, px[i], py[i], pz[i], nx[i], ny[i], nz[i]);               \
    image += ColumnAt(mg, fmg, i, px[i], py[i], pz[i], nx[i], ny[i], nz[i]);                \
  }
#pragma omp simd
  for (std::size_t i = 0; i < n_sym; ++i) {
    SKEIN_PAIR_ENTRY
    anti[i] = direct - image;
    sym[i] = direct + image;
  }
#pragma omp simd
  for (std::size_t i = n_sym; i < t.n; ++i) {
    SKEIN_PAIR_ENTRY
    anti[i] = direct - image;
  }
#undef SKEIN_PAIR_ENTRY
}

// ---- velocity pass: one target, the sources vectorised ----------------------------------------------------

/// Horseshoes as structure of arrays sharing one leg direction.
struct ShoeTable {
  enum Field { tax, tay, taz, ax, ay, az, bx, by, bz, tbx, tby, tbz, e0, e1, e2, eps4, kFields };
  std::array<std::vector<double>, kFields> f;
  double d[3] = {0.0, 0.0, 0.0};
  std::size_t size() const { return f[0].size(); }
  void Add(const Shoe& s) {
    const double v[kFields] = {s.ta[0], s.ta[1], s.ta[2], s.a[0], s.a[1], s.a[2], s.b[0], s.b[1],
                               s.b[2],  s.tb[0], s.tb[1], s.tb[2], s.e[0], s.e[1], s.e[2], s.eps4};
    for (int k = 0; k < kFields; ++k) f[static_cast<std::size_t>(k)].push_back(v[k]);
    for (int k = 0; k < 3; ++k) d[k] = s.d[k];
  }
};

/// Table fields as plain pointers for the vectoriser.
#define SKEIN_TABLE_POINTERS                                                                                 \
  using F = ShoeTable::Field;                                                                                \
  const double *tax = t.f[F::tax].data(), *tay = t.f[F::tay].data(), *taz = t.f[F::taz].data();              \
  const double *ax = t.f[F::ax].data(), *ay = t.f[F::ay].data(), *az = t.f[F::az].data();                    \
  const double *bx = t.f[F::bx].data(), *by = t.f[F::by].data(), *bz = t.f[F::bz].data();                    \
  const double *tbx = t.f[F::tbx].data(), *tby = t.f[F::tby].data(), *tbz = t.f[F::tbz].data();              \
  const double *e0 = t.f[F::e0].data(), *e1 = t.f[F::e1].data(), *e2 = t.f[F::e2].data();                    \
  const double* eps4 = t.f[F::eps4].data();                                                                  \
  const double dx = t.d[0], dy = t.d[1], dz = t.d[2];                                                        \
  const double *gtax = g.f[F::tax].data(), *gtay = g.f[F::tay].data(), *gtaz = g.f[F::taz].data();           \
  const double *gax = g.f[F::ax].data(), *gay = g.f[F::ay].data(), *gaz = g.f[F::az].data();                 \
  const double *gbx = g.f[F::bx].data(), *gby = g.f[F::by].data(), *gbz = g.f[F::bz].data();                 \
  const double *gtbx = g.f[F::tbx].data(), *gtby = g.f[F::tby].data(), *gtbz = g.f[F::tbz].data();           \
  const double *ge0 = g.f[F::e0].data(), *ge1 = g.f[F::e1].data(), *ge2 = g.f[F::e2].data();                 \
  const double gdx = g.d[0], gdy = g.d[1], gdz = g.d[2]

/// Velocity at P of table entry s (and its ground image) into (u, v, w), which start at zero.
#define SKEIN_TABLE_ENTRY_VELOCITY(s, u, v, w)                                                                \
  ShoeVelocity(px, py, pz, tax[s], tay[s], taz[s], ax[s], ay[s], az[s], bx[s], by[s], bz[s], tbx[s], tby[s],  \
               tbz[s], e0[s], e1[s], e2[s], eps4[s], dx, dy, dz, u, v, w);                                    \
  if constexpr (kGround)                                                                                      \
  ShoeVelocity(px, py, pz, gtax[s], gtay[s], gtaz[s], gax[s], gay[s], gaz[s], gbx[s], gby[s], gbz[s], gtbx[s], \
               gtby[s], gtbz[s], ge0[s], ge1[s], ge2[s], eps4[s], gdx, gdy, gdz, u, v, w)

/// Velocities at P of the horseshoes first .. last - 1 of `t` (plus their ground images in `g`): ru[s], rv[s],
/// rw[s].
template <bool kGround>
SKEIN_ALWAYS_INLINE void KernelRowImpl(const ShoeTable& t, const ShoeTable& g, std::size_t first,
                                       std::size_t last, double px, double py, double pz, double* ru, double* rv,
                                       double* rw) {
  SKEIN_TABLE_POINTERS;
#pragma omp simd
  for (std::size_t s = first; s < last; ++s) {
    double u = 0.0, v = 0.0, w = 0.0;
    SKEIN_TABLE_ENTRY_VELOCITY(s, u, v, w);
    ru[s] = u;
    rv[s] = v;
    rw[s] = w;
  }
}

/// Mirrored table [given | mirrors | ...]: for s < given, the sum of the velocities at P of entry s and of its
/// mirror given + s into r[s], their difference into r[given + s].
template <bool kGround>
SKEIN_ALWAYS_INLINE void PairedRowImpl(const ShoeTable& t, const ShoeTable& g, std::size_t given, double px,
                                       double py, double pz, double* ru, double* rv, double* rw) {
  SKEIN_TABLE_POINTERS;
#pragma omp simd
  for (std::size_t s = 0; s < given; ++s) {
    double u = 0.0, v = 0.0, w = 0.0, um = 0.0, vm = 0.0, wm = 0.0;
    SKEIN_TABLE_ENTRY_VELOCITY(s, u, v, w);
    SKEIN_TABLE_ENTRY_VELOCITY(given + s, um, vm, wm);
    ru[s] = u + um;
    rv[s] = v + vm;
    rw[s] = w + wm;
    ru[given + s] = u - um;
    rv[given + s] = v - vm;
    rw[given + s] = w - wm;
  }
}

// ---- the product of the velocity pass ------------------------------------------------------------------

/// Y = R G for the kernel rows R (rows x n, row-major, row stride ldr; rows a multiple of kProductRows) and the
/// circulations G (n x kw, row-major, kw a multiple of kProductCols): Y (rows x kw, row-major). Every entry
/// is the sum over the sources in their order, so the bits do not depend on the thread that computes it.
/// Written out (not Eigen's product) so that it is compiled for the processor's instruction set with the
/// kernels, register-blocked kProductRows x kProductCols.
constexpr std::size_t kProductRows = 4, kProductCols = 8;
using Lanes = double __attribute__((vector_size(32), aligned(8)));  // four doubles, unaligned access allowed

SKEIN_ALWAYS_INLINE void ProductImpl(const double* r, std::size_t ldr, std::size_t rows, const double* g,
                                     std::size_t n, std::size_t kw, double* y) {
  for (std::size_t i0 = 0; i0 < rows; i0 += kProductRows) {
    const double *r0 = r + i0 * ldr, *r1 = r0 + ldr, *r2 = r1 + ldr, *r3 = r2 + ldr;
    for (std::size_t k0 = 0; k0 < kw; k0 += kProductCols) {
      Lanes a0 = {0, 0, 0, 0}, b0 = a0, a1 = a0, b1 = a0, a2 = a0, b2 = a0, a3 = a0, b3 = a0;
      const double* gk = g + k0;
      for (std::size_t j = 0; j < n; ++j) {
        const Lanes ga = *reinterpret_cast<const Lanes*>(gk + j * kw);
        const Lanes gb = *reinterpret_cast<const Lanes*>(gk + j * kw + 4);
        a0 += r0[j] * ga;
        b0 += r0[j] * gb;
        a1 += r1[j] * ga;
        b1 += r1[j] * gb;
        a2 += r2[j] * ga;
        b2 += r2[j] * gb;
        a3 += r3[j] * ga;
        b3 += r3[j] * gb;
      }
      double* yk = y + i0 * kw + k0;
      *reinterpret_cast<Lanes*>(yk) = a0;
      *reinterpret_cast<Lanes*>(yk + 4) = b0;
      *reinterpret_cast<Lanes*>(yk + kw) = a1;
      *reinterpret_cast<Lanes*>(yk + kw + 4) = b1;
      *reinterpret_cast<Lanes*>(yk + 2 * kw) = a2;
      *reinterpret_cast<Lanes*>(yk + 2 * kw + 4) = b2;
      *reinterpret_cast<Lanes*>(yk + 3 * kw) = a3;
      *reinterpret_cast<Lanes*>(yk + 3 * kw + 4) = b3;
    }
  }
}

// ---- one instance per instruction set, chosen at run time -------------------------------------------------

/// The kernels compiled for one instruction set (ATTR: a target attribute, or nothing for the baseline).
#define SKEIN_KERNEL_SET(Name, ATTR)                                                                           \
  ATTR void Product##Name(const double* r, std::size_t ldr, std::size_t rows, const double* g, std::size_t n, \
                          std::size_t kw, double* y) {                                                        \
    ProductImpl(r, ldr, rows, g, n, kw, y);                                                                   \
  }                                                                                                           \
  ATTR void StripStart##Name(const TargetArrays& t, const Shoe& s, const double* ul, const double* ur,          \
                             StripFields f) {                                                                 \
    StripStartImpl(t, s, ul, ur, f);                                                                          \
  }                                                                                                           \
  template <bool kGround>                                                                                     \
  ATTR void DirectColumn##Name(const TargetArrays& t, const Column& s, const Column& g,                       \
                               const StripFields* f, double* out) {                                           \
    DirectColumnImpl<kGround>(t, s, g, f, out);                                                               \
  }                                                                                                           \
  template <bool kGround>                                                                                     \
  ATTR void PairColumn##Name(const TargetArrays& t, const Column& s, const Column& sg, const Column& m,       \
                             const Column& mg, const StripFields* f, std::size_t n_sym, double* anti,         \
                             double* sym) {                                                                   \
    PairColumnImpl<kGround>(t, s, sg, m, mg, f, n_sym, anti, sym);                                            \
  }                                                                                                           \
  template <bool kGround>                                                                                     \
  ATTR void KernelRow##Name(const ShoeTable& t, const ShoeTable& g, std::size_t first, std::size_t last,      \
                            double px, double py, double pz, double* ru, double* rv, double* rw) {            \
    KernelRowImpl<kGround>(t, g, first, last, px, py, pz, ru, rv, rw);                                        \
  }                                                                                                           \
  template <bool kGround>                                                                                     \
  ATTR void PairedRow##Name(const ShoeTable& t, const ShoeTable& g, std::size_t given, double px, double py,  \
                            double pz, double* ru, double* rv, double* rw) {                                  \
    PairedRowImpl<kGround>(t, g, given, px, py, pz, ru, rv, rw);                                              \
  }

SKEIN_KERNEL_SET(Base, )
#if defined(SKEIN_AVX2_CLONE)
SKEIN_KERNEL_SET(Avx2, SKEIN_TARGET_AVX2)
SKEIN_KERNEL_SET(Avx512, SKEIN_TARGET_AVX512)
bool HaveAvx2() {
  static const bool have = __builtin_cpu_supports("avx2") && __builtin_cpu_supports("fma");
  return have;
}
bool HaveAvx512() {
  static const bool have = HaveAvx2() && __builtin_cpu_supports("avx512f") && __builtin_cpu_supports("avx512dq") &&
                           __builtin_cpu_supports("avx512vl");
  return have;
}
#endif
#undef SKEIN_KERNEL_SET

KernelIsa Fastest() {
#if defined(SKEIN_AVX2_CLONE)
  if (HaveAvx512()) return KernelIsa::avx512;
  if (HaveAvx2()) return KernelIsa::avx2;
#endif
  return KernelIsa::baseline;
}
std::atomic<int>& IsaCap() {
  static std::atomic<int> cap{static_cast<int>(KernelIsa::avx512)};
  return cap;
}

/// The kernel entry points for this processor and ground setting.
struct Kernels {
  void (*start)(const TargetArrays&, const Shoe&, const double*, const double*, StripFields);
  void (*direct)(const TargetArrays&, const Column&, const Column&, const StripFields*, double*);
  void (*pair)(const TargetArrays&, const Column&, const Column&, const Column&, const Column&, const StripFields*,
               std::size_t, double*, double*);
  void (*row)(const ShoeTable&, const ShoeTable&, std::size_t, std::size_t, double, double, double, double*,
              double*, double*);
  void (*paired)(const ShoeTable&, const ShoeTable&, std::size_t, double, double, double, double*, double*,
                 double*);
  void (*product)(const double*, std::size_t, std::size_t, const double*, std::size_t, std::size_t, double*);
};

template <bool kGround>
Kernels KernelsFor() {
#if defined(SKEIN_AVX2_CLONE)
  if (KernelIsaInUse() == KernelIsa::avx512)
    return {&StripStartAvx512, &DirectColumnAvx512<kGround>, &PairColumnAvx512<kGround>, &KernelRowAvx512<kGround>,
            &PairedRowAvx512<kGround>, &ProductAvx512};
  if (KernelIsaInUse() == KernelIsa::avx2)
    return {&StripStartAvx2, &DirectColumnAvx2<kGround>, &PairColumnAvx2<kGround>, &KernelRowAvx2<kGround>,
            &PairedRowAvx2<kGround>, &ProductAvx2};
#endif
  return {&StripStartBase, &DirectColumnBase<kGround>, &PairColumnBase<kGround>, &KernelRowBase<kGround>, &PairedRowBase<kGround>,
          &ProductBase};
}
Kernels KernelsFor(bool ground) { return ground ? KernelsFor<true>() : KernelsFor<false>(); }

/// Asks the kernel to back a large matrix with transparent huge pages before its first touch (Linux, where
/// they are enabled on request): the assembly's first writes then fault 2 MiB pages instead of 4 KiB ones and
/// the factorisation walks the matrix with far fewer TLB misses. Only the aligned interior is advised; the
/// memory used is the same. Elsewhere, or if the kernel declines, nothing changes.
void AdviseHugePages(Eigen::MatrixXd& m) {
#if defined(__linux__) && defined(MADV_HUGEPAGE)
  constexpr std::uintptr_t kHuge = std::uintptr_t{1} << 21;
  const auto begin = reinterpret_cast<std::uintptr_t>(m.data());
  const std::uintptr_t end = begin + sizeof(double) * static_cast<std::uintptr_t>(m.size());
  const std::uintptr_t first = (begin + kHuge - 1) & ~(kHuge - 1), last = end & ~(kHuge - 1);
  if (last > first) madvise(reinterpret_cast<void*>(first), last - first, MADV_HUGEPAGE);
#else
  (void)m;
#endif
}

// ---- the mirror plan of the velocity pass --------------------------------------------------------------

#pragma GCC diagnostic push
#pragma GCC diagnostic ignored "-Wfloat-equal"
/// Exact comparison: the mirror path needs bit-exact reflections, not nearly equal ones.
bool Exactly(double x, double y) { return x == y; }
#pragma GCC diagnostic pop

/// Order of the sources in the velocity pass and the targets it evaluates. Mirrored: order = [given panels |
/// their mirrors, in the same order | panels in the plane y = 0], and each given target carries its mirror.
struct MirrorPlan {
  bool mirrored = false;
  std::vector<std::size_t> order;
  std::size_t given = 0;
  std::vector<std::pair<std::size_t, std::ptrdiff_t>> targets;  ///< (point, mirrored point or -1)
};

bool MirroredPoint(const PointArray& p, std::size_t m, const PointArray& q, std::size_t g) {
  return Exactly(p.x[m], q.x[g]) && Exactly(p.y[m], -q.y[g]) && Exactly(p.z[m], q.z[g]);
}

MirrorPlan PlanMirror(const Lattice& lat, const PointArray& points, const WakeGeometry& wake) {
  const std::size_t ns = lat.panels();
  MirrorPlan plain;
  for (std::size_t j = 0; j < ns; ++j) plain.order.push_back(j);
  for (std::size_t p = 0; p < points.size(); ++p) plain.targets.emplace_back(p, -1);
  if (points.size() != ns || !Exactly(wake.direction[1], 0.0)) return plain;
  std::vector<std::ptrdiff_t> image_of(ns, -1);
  for (std::size_t i = 0; i < ns; ++i) {
    const int g = lat.mirror_of[i];
    if (g < 0) continue;
    const auto gi = static_cast<std::size_t>(g);
    if (gi >= ns || lat.mirror_of[gi] >= 0 || image_of[gi] >= 0) return plain;
    image_of[gi] = static_cast<std::ptrdiff_t>(i);
  }
  MirrorPlan plan;
  plan.mirrored = true;
  std::vector<std::size_t> self;
  for (std::size_t i = 0; i < ns; ++i) {
    if (lat.mirror_of[i] >= 0) continue;
    if (image_of[i] < 0) {
      // Unpaired: must be its own reflection, every point of its horseshoe in the plane y = 0.
      if (!(Exactly(lat.a.y[i], 0.0) && Exactly(lat.b.y[i], 0.0) && Exactly(lat.te_a.y[i], 0.0) &&
            Exactly(lat.te_b.y[i], 0.0)))
        return plain;
      self.push_back(i);
      continue;
    }
    const auto m = static_cast<std::size_t>(image_of[i]);
    // The mirror runs the other way: its a, b, te_a, te_b reflect the given panel's b, a, te_b, te_a.
    if (!(MirroredPoint(lat.a, m, lat.b, i) && MirroredPoint(lat.b, m, lat.a, i) &&
          MirroredPoint(lat.te_a, m, lat.te_b, i) && MirroredPoint(lat.te_b, m, lat.te_a, i) &&
          Exactly(lat.core4[m], lat.core4[i]) && MirroredPoint(points, m, points, i)))
      return plain;
    plan.order.push_back(i);
    plan.targets.emplace_back(i, static_cast<std::ptrdiff_t>(m));
  }
  plan.given = plan.order.size();
  for (std::size_t k = 0; k < plan.given; ++k) plan.order.push_back(static_cast<std::size_t>(image_of[plan.order[k]]));
  for (std::size_t i : self) {
    plan.order.push_back(i);
    plan.targets.emplace_back(i, -1);
  }
  return plan;
}

bool NormalsMirrorSymmetric(const Lattice& lat) {
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    const int m = lat.mirror_of[i];
    if (m < 0) {
      // A panel on the plane y = 0 is its own image, with the reflected normal (n_x, -n_y, n_z); that is the
      // same boundary condition only if it equals -n, i.e. the normal is purely along y. A deflected rudder or
      // a cambered centre-line fin turns it, and the mirror image is then a different configuration.
      if (lat.surfaces[static_cast<std::size_t>(lat.surface[i])].on_symmetry_plane &&
          (std::abs(lat.normal.x[i]) > 1e-13 || std::abs(lat.normal.z[i]) > 1e-13))
        return false;
      continue;
    }
    const auto g = static_cast<std::size_t>(m);
    if (std::abs(lat.normal.x[i] - lat.normal.x[g]) > 1e-13 || std::abs(lat.normal.y[i] + lat.normal.y[g]) > 1e-13 ||
        std::abs(lat.normal.z[i] - lat.normal.z[g]) > 1e-13)
      return false;
  }
  return true;
}

}  // namespace

std::vector<SystemLayout> ChooseLayouts(const Lattice& lat, const WakeGeometry& wake, bool allow_split) {
  const bool split = allow_split && lat.geometry_symmetric && !(std::abs(wake.direction[1]) > 0.0) &&
                     NormalsMirrorSymmetric(lat);
  if (!split) {
    SystemLayout full;
    full.kind = SystemLayout::Kind::full;
    for (std::size_t i = 0; i < lat.panels(); ++i) {
      full.panel.push_back(i);
      full.image.push_back(-1);
    }
    return {full};
  }
  // Image of each given panel: the mirrored panel that names it.
  std::vector<int> image_of(lat.panels(), -1);
  for (std::size_t i = 0; i < lat.panels(); ++i)
    if (lat.mirror_of[i] >= 0) image_of[static_cast<std::size_t>(lat.mirror_of[i])] = static_cast<int>(i);
  SystemLayout sym, anti;
  sym.kind = SystemLayout::Kind::symmetric;
  anti.kind = SystemLayout::Kind::antisymmetric;
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    const auto& surf = lat.surfaces[static_cast<std::size_t>(lat.surface[i])];
    if (surf.symmetric && lat.mirror_of[i] < 0) {
      sym.panel.push_back(i);
      sym.image.push_back(image_of[i]);
    }
  }
  anti.panel = sym.panel;
  anti.image = sym.image;
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    const auto& surf = lat.surfaces[static_cast<std::size_t>(lat.surface[i])];
    if (surf.on_symmetry_plane) {
      anti.panel.push_back(i);
      anti.image.push_back(-1);
    }
  }
  return {sym, anti};
}

std::vector<Eigen::MatrixXd> AssembleInfluence(const Lattice& lat, const std::vector<SystemLayout>& layouts,
                                               const WakeGeometry& wake) {
  SKEIN_ASSERT(layouts.size() == 1 || layouts.size() == 2);
  // The widest layout lists every unknown; a symmetric layout is a prefix of its antisymmetric partner. A
  // symmetric layout alone (SolveBasis without the lateral columns) runs the same pair kernel and keeps only
  // the sums: the differences go to a scratch column.
  const SystemLayout& wide = layouts.back();
  const bool sym_only = layouts.size() == 1 && wide.kind == SystemLayout::Kind::symmetric;
  SKEIN_ASSERT(layouts.size() == 1 || layouts[0].kind == SystemLayout::Kind::symmetric);
  const std::size_t n = wide.panel.size();
  const std::size_t n_sym = layouts.size() == 2 ? layouts[0].panel.size() : sym_only ? n : 0;
  std::vector<double> px(n), py(n), pz(n), nx(n), ny(n), nz(n);
  for (std::size_t i = 0; i < n; ++i) {
    const std::size_t p = wide.panel[i];
    px[i] = lat.control.x[p];
    py[i] = lat.control.y[p];
    pz[i] = lat.control.z[p];
    nx[i] = lat.normal.x[p];
    ny[i] = lat.normal.y[p];
    nz[i] = lat.normal.z[p];
  }
  std::vector<Eigen::MatrixXd> mats;
  for (const auto& l : layouts) {
    const auto m = static_cast<Eigen::Index>(l.panel.size());
    mats.emplace_back(m, m);
    AdviseHugePages(mats.back());
  }
  const bool split = layouts.size() == 2 || sym_only;
  const bool ground = wake.ground.enabled;
  const Kernels kernels = KernelsFor(ground);
  // Strips: runs of columns whose horseshoes (and images) share their trailing-edge points bit for bit, with
  // every A on the line through TA and the run's first A, and every B on the line through TB and its first
  // B, to rounding: a strip's chordwise panels. What they share at a target (StripFields) is computed once per
  // run and block of targets, and a column's arithmetic is the same whichever run or thread it falls in.
  const auto same_strip = [](const Shoe& x, const Shoe& y) {
    for (int k = 0; k < 3; ++k)
      if (!Exactly(x.ta[k], y.ta[k]) || !Exactly(x.tb[k], y.tb[k])) return false;
    const auto on_line = [](const double* o, const double* p, const double* q) {
      const Vec3 u{p[0] - o[0], p[1] - o[1], p[2] - o[2]}, v{q[0] - o[0], q[1] - o[1], q[2] - o[2]};
      return detail::Norm(detail::Cross(u, v)) <= 1e-13 * detail::Norm(u) * detail::Norm(v);
    };
    return on_line(x.ta, x.a, y.a) && on_line(x.tb, x.b, y.b);
  };
  std::vector<std::size_t> run_start;
  for (std::size_t j = 0; j < n; ++j) {
    const bool has_image = split && wide.image[j] >= 0;
    bool joins = j > 0 && !run_start.empty() && has_image == (split && wide.image[j - 1] >= 0) &&
                 same_strip(LoadShoe(lat, wide.panel[run_start.back()], wake), LoadShoe(lat, wide.panel[j], wake));
    if (joins && has_image)
      joins = same_strip(LoadShoe(lat, static_cast<std::size_t>(wide.image[run_start.back()]), wake),
                         LoadShoe(lat, static_cast<std::size_t>(wide.image[j]), wake));
    if (!joins) run_start.push_back(j);
  }
  run_start.push_back(n);
  const auto nruns = static_cast<std::ptrdiff_t>(run_start.size() - 1);
  // Targets in blocks, so that a run's fields stay in the core's cache while its columns are computed.
  constexpr std::size_t kTargetBlock = 512;
#pragma omp parallel
  {
    std::vector<double> scratch(sym_only ? n : 0);
    std::vector<double> store(4 * kStripFields * kTargetBlock);  // source, its ground image, image, its ground image
    StripFields fields[4];
    for (std::size_t k = 0; k < 4; ++k) {
      double* f = store.data() + k * kStripFields * kTargetBlock;
      fields[k] = {f,
                   f + kTargetBlock,
                   f + 2 * kTargetBlock,
                   f + 3 * kTargetBlock,
                   f + 4 * kTargetBlock,
                   f + 5 * kTargetBlock,
                   f + 6 * kTargetBlock,
                   f + 7 * kTargetBlock,
                   f + 8 * kTargetBlock,
                   f + 9 * kTargetBlock};
    }
    std::vector<std::array<Shoe, 4>> shoes;
    std::vector<std::array<Column, 4>> columns;
#pragma omp for schedule(dynamic, 1)
    for (std::ptrdiff_t run = 0; run < nruns; ++run) {
      const auto r = static_cast<std::size_t>(run);
      const std::size_t first = run_start[r], count = run_start[r + 1] - first;
      const bool paired = split && wide.image[first] >= 0;
      const int variants = paired ? 4 : 2;
      shoes.resize(count);
      columns.resize(count);
      for (std::size_t q = 0; q < count; ++q) {
        std::array<Shoe, 4>& sh = shoes[q];
        sh[0] = LoadShoe(lat, wide.panel[first + q], wake);
        sh[1] = ground ? GroundImage(sh[0], wake) : sh[0];
        if (paired) {
          sh[2] = LoadShoe(lat, static_cast<std::size_t>(wide.image[first + q]), wake);
          sh[3] = ground ? GroundImage(sh[2], wake) : sh[2];
        }
      }
      // Unit vectors along the side edges, from the run's first column (any one would do: they lie on a line).
      double ul[4][3] = {}, ur[4][3] = {};
      for (int k = 0; k < variants; ++k) {
        const Shoe& s0 = shoes[0][static_cast<std::size_t>(k)];
        const Vec3 l = detail::Normalized({s0.a[0] - s0.ta[0], s0.a[1] - s0.ta[1], s0.a[2] - s0.ta[2]});
        const Vec3 rr = detail::Normalized({s0.b[0] - s0.tb[0], s0.b[1] - s0.tb[1], s0.b[2] - s0.tb[2]});
        for (int x = 0; x < 3; ++x) {
          ul[k][x] = l[static_cast<std::size_t>(x)];
          ur[k][x] = rr[static_cast<std::size_t>(x)];
        }
      }
      for (std::size_t q = 0; q < count; ++q)
        for (int k = 0; k < variants; ++k) {
          const auto kk = static_cast<std::size_t>(k);
          columns[q][kk] = ColumnOf(shoes[q][kk], ul[k], ur[k]);
        }
      for (std::size_t b0 = 0; b0 < n; b0 += kTargetBlock) {
        const std::size_t nb = std::min(kTargetBlock, n - b0);
        const TargetArrays block{px.data() + b0, py.data() + b0, pz.data() + b0,
                                 nx.data() + b0, ny.data() + b0, nz.data() + b0, nb};
        for (int k = 0; k < variants; ++k)
          if (ground || k % 2 == 0)
            kernels.start(block, shoes[0][static_cast<std::size_t>(k)], ul[k], ur[k], fields[k]);
        const std::size_t block_sym = n_sym > b0 ? std::min(n_sym - b0, nb) : 0;
        for (std::size_t q = 0; q < count; ++q) {
          const std::size_t j = first + q;
          const auto jj = static_cast<Eigen::Index>(j);
          double* col_wide = (sym_only ? scratch.data() : mats.back().col(jj).data()) + b0;
          double* col_sym = split && j < n_sym ? mats[0].col(jj).data() + b0 : nullptr;
          const std::array<Column, 4>& c = columns[q];
          if (!paired) {
            // Full system, or a centre-line panel (its own image: it enters the antisymmetric system once).
            kernels.direct(block, c[0], c[1], fields, col_wide);
            if (col_sym) std::copy(col_wide, col_wide + block_sym, col_sym);
          } else {
            kernels.pair(block, c[0], c[1], c[2], c[3], fields, col_sym ? block_sym : 0, col_wide, col_sym);
          }
        }
      }
    }
  }
  return mats;
}

bool InducedVelocityUsesMirror(const Lattice& lat, const PointArray& points, const WakeGeometry& wake) {
  return PlanMirror(lat, points, wake).mirrored;
}

KernelIsa KernelIsaInUse() {
  return static_cast<KernelIsa>(std::min(static_cast<int>(Fastest()), IsaCap().load()));
}
KernelIsa CapKernelIsa(KernelIsa cap) {
  IsaCap().store(static_cast<int>(cap));
  return KernelIsaInUse();
}
const char* KernelIsaName(KernelIsa isa) {
  switch (isa) {
    case KernelIsa::avx512: return "avx512";
    case KernelIsa::avx2: return "avx2";
    case KernelIsa::baseline: break;
  }
  return "baseline";
}

InducedVelocity InducedVelocityAt(const Lattice& lat, const PointArray& points, const Eigen::MatrixXd& gamma,
                                  const WakeGeometry& wake, const std::vector<bool>* only) {
  const std::size_t np = points.size(), ns = lat.panels();
  const Eigen::Index k = gamma.cols();
  SKEIN_ASSERT(static_cast<std::size_t>(gamma.rows()) == ns);
  InducedVelocity out;
  out.u.setZero(static_cast<Eigen::Index>(np), k);
  out.v.setZero(static_cast<Eigen::Index>(np), k);
  out.w.setZero(static_cast<Eigen::Index>(np), k);
  if (np == 0 || ns == 0 || k == 0) return out;

  MirrorPlan plan = PlanMirror(lat, points, wake);
  if (only) {  // only the targets asked for (a mirrored pair when either of its points is)
    SKEIN_ASSERT(only->size() == np);
    const auto asked = [&](const std::pair<std::size_t, std::ptrdiff_t>& t) {
      return (*only)[t.first] || (t.second >= 0 && (*only)[static_cast<std::size_t>(t.second)]);
    };
    plan.targets.erase(std::remove_if(plan.targets.begin(), plan.targets.end(),
                                      [&](const auto& t) { return !asked(t); }),
                       plan.targets.end());
  }
  const bool ground = wake.ground.enabled;
  ShoeTable table, table_ground;
  for (std::size_t j : plan.order) {
    const Shoe s = LoadShoe(lat, j, wake);
    table.Add(s);
    if (ground) table_ground.Add(GroundImage(s, wake));
  }
  if (!ground) table_ground = table;  // read by nothing; keeps the pointers valid
  // Circulations in table order, row-major and padded with zero columns to a multiple of kProductCols.
  // Mirrored (see the file comment): with the rows holding, per given horseshoe, the sum and the difference of
  // its and its mirror's velocities, and then the centre-line ones, the velocity at a given point is X + Y and
  // at its mirror X - Y (v: Y - X), X = sums . (g_given + g_mirror) / 2, Y = differences . (g_given -
  // g_mirror) / 2 + centre-line . g_centre.
  const auto kk = static_cast<std::size_t>(k);
  const std::size_t kw = (kk + kProductCols - 1) / kProductCols * kProductCols;
  const std::size_t given = plan.given;
  const auto circulation = [&](std::size_t r, std::size_t c) {
    return gamma(static_cast<Eigen::Index>(plan.order[r]), static_cast<Eigen::Index>(c));
  };
  std::vector<double> g_first(plan.mirrored ? given * kw : ns * kw, 0.0);
  std::vector<double> g_second(plan.mirrored ? (ns - given) * kw : 0, 0.0);
  for (std::size_t c = 0; c < kk; ++c) {
    if (!plan.mirrored) {
      for (std::size_t r = 0; r < ns; ++r) g_first[r * kw + c] = circulation(r, c);
      continue;
    }
    for (std::size_t r = 0; r < given; ++r) {
      g_first[r * kw + c] = 0.5 * (circulation(r, c) + circulation(given + r, c));
      g_second[r * kw + c] = 0.5 * (circulation(r, c) - circulation(given + r, c));
    }
    for (std::size_t r = 2 * given; r < ns; ++r) g_second[(r - given) * kw + c] = circulation(r, c);
  }

  const Kernels kernels = KernelsFor(ground);
  constexpr std::size_t kBlock = 16;
  static_assert((3 * kBlock) % kProductRows == 0, "the product takes whole groups of rows");
  const std::size_t nt = plan.targets.size();
  const auto nblocks = static_cast<std::ptrdiff_t>((nt + kBlock - 1) / kBlock);
  using RowMatrix = Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>;
#pragma omp parallel
  {
    // Zeroed once: a last, short block's product also reads the rows past its own (their results unused).
    RowMatrix rows = RowMatrix::Zero(static_cast<Eigen::Index>(3 * kBlock), static_cast<Eigen::Index>(ns));
    std::vector<double> x(3 * kBlock * kw, 0.0), y(3 * kBlock * kw, 0.0);
#pragma omp for schedule(dynamic, 1)
    for (std::ptrdiff_t blk = 0; blk < nblocks; ++blk) {
      const std::size_t first = static_cast<std::size_t>(blk) * kBlock;
      const std::size_t count = std::min(kBlock, nt - first);
      const auto c = static_cast<Eigen::Index>(count);
      for (std::size_t q = 0; q < count; ++q) {
        const std::size_t p = plan.targets[first + q].first;
        const auto qi = static_cast<Eigen::Index>(q);
        double *ru = rows.row(qi).data(), *rv = rows.row(c + qi).data(), *rw = rows.row(2 * c + qi).data();
        if (plan.mirrored) {
          kernels.paired(table, table_ground, plan.given, points.x[p], points.y[p], points.z[p], ru, rv, rw);
          kernels.row(table, table_ground, 2 * plan.given, ns, points.x[p], points.y[p], points.z[p], ru, rv, rw);
        } else {
          kernels.row(table, table_ground, 0, ns, points.x[p], points.y[p], points.z[p], ru, rv, rw);
        }
      }
      const std::size_t nrows = (3 * count + kProductRows - 1) / kProductRows * kProductRows;
      if (plan.mirrored) {
        kernels.product(rows.data(), ns, nrows, g_first.data(), given, kw, x.data());
        kernels.product(rows.data() + given, ns, nrows, g_second.data(), ns - given, kw, y.data());
      } else {
        kernels.product(rows.data(), ns, nrows, g_first.data(), ns, kw, y.data());
      }
      for (std::size_t q = 0; q < count; ++q) {
        const auto [p, m] = plan.targets[first + q];
        const auto pi = static_cast<Eigen::Index>(p);
        const double *xu = x.data() + q * kw, *xv = xu + count * kw, *xw = xv + count * kw;
        const double *yu = y.data() + q * kw, *yv = yu + count * kw, *yw = yv + count * kw;
        for (Eigen::Index col = 0; col < k; ++col) {
          const auto cc = static_cast<std::size_t>(col);
          if (!plan.mirrored) {
            out.u(pi, col) = yu[cc];
            out.v(pi, col) = yv[cc];
            out.w(pi, col) = yw[cc];
            continue;
          }
          out.u(pi, col) = xu[cc] + yu[cc];
          out.v(pi, col) = xv[cc] + yv[cc];
          out.w(pi, col) = xw[cc] + yw[cc];
          if (m < 0) continue;
          const auto mi = static_cast<Eigen::Index>(m);
          out.u(mi, col) = xu[cc] - yu[cc];
          out.v(mi, col) = yv[cc] - xv[cc];
          out.w(mi, col) = xw[cc] - yw[cc];
        }
      }
    }
  }
  return out;
}

}  // namespace skein
