// Skein stage 3, assemble. See influence.hpp.
//
// Speed. Both passes spend their time evaluating horseshoes, AddHorseshoeVelocity of biot_savart.hpp (five
// segments, four square roots and twelve divisions), which stays the reference the tests hold these loops to
// (1e-12, tests/unit/speed_paths_test.cpp). Here they are evaluated strip by strip. A strip's chordwise panels
// share their trailing-edge points, so their semi-infinite legs are the same two lines, and their legs
// TA -> A and B -> TB lie on the strip's two side edges. Only the core radius (each panel's own) differs, and
// it enters a line's velocity as a factor that depends on the distance to the line alone. With h = |c|^2:
//   a semi-infinite leg from T along the unit d (c = d x r, r = P - T, s = -1 or +1) gives
//     v = s (1 + r . d / |r|) h c / (4 pi (h^2 + eps^4)),
//   a piece X -> Y of a line along the unit u (c = u x (P - X), the same for every piece of the line) gives
//     v = (g(X) - g(Y)) h c / (4 pi (h^2 + eps^4)),   g(Z) = u . (P - Z) / |P - Z|
// (Katz & Plotkin's cos theta_1 - cos theta_2 form, eq. 2.72, with r1 x r2 = (u . r0) c, regularised as in
// biot_savart.hpp). So a few numbers per target and strip (StripFields, VelocityFields) hold the legs and the
// edges without their core; a panel's horseshoe then costs its bound segment, the cosines at A and B (from
// the two distances the bound segment needs anyway) and one division over three grouped denominators
// (1/x = y z / (x y z); of order length^8, ^10 and ^10, each floored at 1e-100, which keeps the product in
// range for lengths between about 1e-8 m and 1e10 m). Counted in the AVX2 loops: per matrix entry two square
// roots, one division and 58 multiplications and fused multiply-adds, where a whole horseshoe took two, two
// and 139 (its trailing-edge distances shared); per velocity 71 against four, two and 142. The panels' cores,
// and so the answers, are those of the reference. A run of panels counts as a strip only if its ends lie on
// the two lines to rounding (SameStrip); any other lattice is evaluated a panel at a time, as its own strip.
//
// The loops run over contiguous arrays without branches (the ground plane is a template argument) and are
// compiled twice, for the baseline instruction set and for AVX2 with FMA, chosen at run time by what the
// processor has. An entry is computed by the same instructions whichever thread runs it, so results do not
// depend on the thread count.
//
// InducedVelocityAt evaluates, for a block of 16 target points, every horseshoe's velocity into the columns of
// a (3 x 16) x horseshoes matrix and multiplies it by the circulations (one matrix product per block, run
// sequentially inside its thread; blocks are fixed by target index). When the targets are one point per
// panel of an exactly mirrored lattice (every mirrored panel's horseshoe and point are the bit-exact
// reflections of its given panel's, the trailing legs have no sideways component), the reflection
// S = diag(1, -1, 1) gives the mirrored half for free: a mirrored horseshoe runs the other way across the span,
// so V_m(j)(S P) = S V_j(P) and V_j(S P) = S V_m(j)(P), and one lying in the plane y = 0 has
// V_j(S P) = -S V_j(P). The horseshoes are evaluated at the given-half targets only (half the kernel work),
// each given horseshoe together with its mirror, and the columns hold the sum and the difference of the two: the
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
/// Smallest distance whose inverse the strip fields take, m: two of them multiply to a normal number.
constexpr double kTinyDistance = 1e-150;

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

/// One horseshoe (infinity -> TA -> A -> B -> TB -> infinity, legs along d) with its per-source constants.
struct Shoe {
  double ta[3], a[3], b[3], tb[3], d[3];
  double eb;    ///< eps^4 |r0|^4 of the bound segment A -> B
  double eps4;  ///< eps^4, the panel's core (Lattice::core4)
};

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
  s.eb = SegmentConstant(a, b, eps4);
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

// ---- strips ----------------------------------------------------------------------------------------------

#pragma GCC diagnostic push
#pragma GCC diagnostic ignored "-Wfloat-equal"
/// Exact comparison: the mirror path needs bit-exact reflections, not nearly equal ones.
bool Exactly(double x, double y) { return x == y; }
#pragma GCC diagnostic pop

/// Whether horseshoe y continues the strip of horseshoe x: the same trailing-edge points bit for bit, y's A
/// on the line through TA and x's A and y's B on the line through TB and x's B, to rounding. The horseshoes of a
/// strip's chordwise panels do; both passes share the legs and side edges of such a run (StripFields).
bool SameStrip(const Shoe& x, const Shoe& y) {
  for (int k = 0; k < 3; ++k)
    if (!Exactly(x.ta[k], y.ta[k]) || !Exactly(x.tb[k], y.tb[k])) return false;
  const auto on_line = [](const double* o, const double* p, const double* q) {
    const Vec3 u{p[0] - o[0], p[1] - o[1], p[2] - o[2]}, v{q[0] - o[0], q[1] - o[1], q[2] - o[2]};
    return detail::Norm(detail::Cross(u, v)) <= 1e-13 * detail::Norm(u) * detail::Norm(v);
  };
  return on_line(x.ta, x.a, y.a) && on_line(x.tb, x.b, y.b);
}

/// Unit vectors along the side edges of the strip of horseshoe s: TA -> A and TB -> B.
void EdgeDirections(const Shoe& s, double* ul, double* ur) {
  const Vec3 l = detail::Normalized({s.a[0] - s.ta[0], s.a[1] - s.ta[1], s.a[2] - s.ta[2]});
  const Vec3 r = detail::Normalized({s.b[0] - s.tb[0], s.b[1] - s.tb[1], s.b[2] - s.tb[2]});
  for (std::size_t k = 0; k < 3; ++k) {
    ul[k] = l[k];
    ur[k] = r[k];
  }
}

/// Runs [first, last) of the positions from .. to - 1, each as long as joins(first, j) holds for its every j:
/// the strips both passes evaluate together.
template <class Joins>
std::vector<std::pair<std::size_t, std::size_t>> StripRuns(std::size_t from, std::size_t to, const Joins& joins) {
  std::vector<std::pair<std::size_t, std::size_t>> runs;
  for (std::size_t r = from; r < to;) {
    std::size_t e = r + 1;
    while (e < to && joins(r, e)) ++e;
    runs.emplace_back(r, e);
    r = e;
  }
  return runs;
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
  c.eb = s.eb;
  return c;
}

/// What a strip's legs and side edges give at P without their core (the common part of StripFields and
/// VelocityFields): for the left leg the vector c0 = d x (P - TA) and w0 = -(1 + r . d / |r|) |c0|^2 / (4 pi),
/// so that it induces w0 c0 / (h0 + eps^4), h0 = |c0|^4 (the right leg likewise, strength +1); for the left
/// edge the vector ml = ul x (P - TA) with its scale sl = |ml|^2 / (4 pi), kl = |ml|^4 and the cosine gl at TA
/// (the right edge likewise, through TB).
struct StripGeometry {
  double c0[3], w0, h0, c4[3], w4, h4;
  double ml[3], sl, kl, gl, mr[3], sr, kr, gr;
};
SKEIN_ALWAYS_INLINE StripGeometry StripGeometryAt(const Shoe& s, const double* ul, const double* ur, double px,
                                                  double py, double pz) {
  StripGeometry g;
  const double qx = px - s.ta[0], qy = py - s.ta[1], qz = pz - s.ta[2];
  const double sx = px - s.tb[0], sy = py - s.tb[1], sz = pz - s.tb[2];
  // 1/|P - TA| and 1/|P - TB| from one division (GCC 12 leaves the calling loops scalar with two, or with a
  // floor on the product). The distances' floor keeps the product normal; a target on TA (or TB) has r = 0
  // there, so the large inverse it gets multiplies zero.
  const double nq = std::max(std::sqrt(qx * qx + qy * qy + qz * qz), kTinyDistance);
  const double ns = std::max(std::sqrt(sx * sx + sy * sy + sz * sz), kTinyDistance);
  const double inv = 1.0 / (nq * ns), inq = ns * inv, ins = nq * inv;
  g.c0[0] = s.d[1] * qz - s.d[2] * qy;
  g.c0[1] = s.d[2] * qx - s.d[0] * qz;
  g.c0[2] = s.d[0] * qy - s.d[1] * qx;
  g.c4[0] = s.d[1] * sz - s.d[2] * sy;
  g.c4[1] = s.d[2] * sx - s.d[0] * sz;
  g.c4[2] = s.d[0] * sy - s.d[1] * sx;
  const double h0 = g.c0[0] * g.c0[0] + g.c0[1] * g.c0[1] + g.c0[2] * g.c0[2];
  const double h4 = g.c4[0] * g.c4[0] + g.c4[1] * g.c4[1] + g.c4[2] * g.c4[2];
  g.w0 = -kInv4Pi * (1.0 + (qx * s.d[0] + qy * s.d[1] + qz * s.d[2]) * inq) * h0;
  g.w4 = kInv4Pi * (1.0 + (sx * s.d[0] + sy * s.d[1] + sz * s.d[2]) * ins) * h4;
  g.h0 = h0 * h0;
  g.h4 = h4 * h4;
  g.ml[0] = ul[1] * qz - ul[2] * qy;
  g.ml[1] = ul[2] * qx - ul[0] * qz;
  g.ml[2] = ul[0] * qy - ul[1] * qx;
  g.mr[0] = ur[1] * sz - ur[2] * sy;
  g.mr[1] = ur[2] * sx - ur[0] * sz;
  g.mr[2] = ur[0] * sy - ur[1] * sx;
  const double hl = g.ml[0] * g.ml[0] + g.ml[1] * g.ml[1] + g.ml[2] * g.ml[2];
  const double hr = g.mr[0] * g.mr[0] + g.mr[1] * g.mr[1] + g.mr[2] * g.mr[2];
  g.sl = kInv4Pi * hl;
  g.sr = kInv4Pi * hr;
  g.kl = hl * hl;
  g.kr = hr * hr;
  g.gl = (ul[0] * qx + ul[1] * qy + ul[2] * qz) * inq;
  g.gr = (ur[0] * sx + ur[1] * sy + ur[2] * sz) * ins;
  return g;
}

/// v . n, v given by value (a pointer into the caller's StripGeometry would keep its loop from vectorising).
SKEIN_ALWAYS_INLINE double Along(double vx, double vy, double vz, double nx, double ny, double nz) {
  return vx * nx + vy * ny + vz * nz;
}

/// The strip's fields at every target of t, for the horseshoe s with side edges along ul and ur.
SKEIN_ALWAYS_INLINE void StripStartImpl(const TargetArrays& t, const Shoe& src, const double* uleft,
                                        const double* uright, StripFields f) {
  const Shoe s = src;
  const double ul[3] = {uleft[0], uleft[1], uleft[2]}, ur[3] = {uright[0], uright[1], uright[2]};
  const double *px = t.px, *py = t.py, *pz = t.pz, *nx = t.nx, *ny = t.ny, *nz = t.nz;
#pragma omp simd
  for (std::size_t i = 0; i < t.n; ++i) {
    const StripGeometry g = StripGeometryAt(s, ul, ur, px[i], py[i], pz[i]);
    f.wl[i] = g.w0 * Along(g.c0[0], g.c0[1], g.c0[2], nx[i], ny[i], nz[i]);
    f.hl[i] = g.h0;
    f.wr[i] = g.w4 * Along(g.c4[0], g.c4[1], g.c4[2], nx[i], ny[i], nz[i]);
    f.hr[i] = g.h4;
    f.gl[i] = g.gl;
    f.ml[i] = g.sl * Along(g.ml[0], g.ml[1], g.ml[2], nx[i], ny[i], nz[i]);
    f.kl[i] = g.kl;
    f.gr[i] = g.gr;
    f.mr[i] = g.sr * Along(g.mr[0], g.mr[1], g.mr[2], nx[i], ny[i], nz[i]);
    f.kr[i] = g.kr;
  }
}

/// What a column's horseshoe needs at P beside the strip's fields (hl, hr, kl, kr: the legs' and the edges'
/// denominators there, without the core): its bound segment's term, |P - A| and |P - B|, the cores added,
/// the projections of P - A and P - B on the side edges, and the three grouped denominators (each floored at
/// kDenominatorFloor; of order length^8, length^10 and length^10), whose product takes the one division.
struct ColumnTerms {
  Term tm;
  double n1, n2, fl, fr, el, er, a1, a2, d1, d2, d3;
};
SKEIN_ALWAYS_INLINE ColumnTerms ColumnTermsAt(const Column& c, double hl, double hr, double kl, double kr,
                                              double px, double py, double pz) {
  ColumnTerms t;
  const double r1x = px - c.a[0], r1y = py - c.a[1], r1z = pz - c.a[2];
  const double r2x = px - c.b[0], r2y = py - c.b[1], r2z = pz - c.b[2];
  t.n1 = std::max(std::sqrt(r1x * r1x + r1y * r1y + r1z * r1z), kTiny);
  t.n2 = std::max(std::sqrt(r2x * r2x + r2y * r2y + r2z * r2z), kTiny);
  t.tm = SegmentTerm(r1x, r1y, r1z, t.n1, r2x, r2y, r2z, t.n2, c.r0[0], c.r0[1], c.r0[2], c.eb);
  const double e = c.e;
  t.fl = hl + e;
  t.fr = hr + e;
  t.el = kl + e;
  t.er = kr + e;
  t.a1 = c.ul[0] * r1x + c.ul[1] * r1y + c.ul[2] * r1z;
  t.a2 = c.ur[0] * r2x + c.ur[1] * r2y + c.ur[2] * r2z;
  t.d1 = std::max(t.fl * t.fr, kDenominatorFloor);
  t.d2 = std::max(t.n1 * t.n2 * t.el * t.er, kDenominatorFloor);
  t.d3 = t.tm.den;
  return t;
}

/// n . v at P of a column's horseshoe, from the strip's fields at target i (see StripFields): two square
/// roots and one division (ColumnTermsAt).
SKEIN_ALWAYS_INLINE double ColumnAt(const Column& c, const StripFields& f, std::size_t i, double px, double py,
                                    double pz, double nx, double ny, double nz) {
  const ColumnTerms t = ColumnTermsAt(c, f.hl[i], f.hr[i], f.kl[i], f.kr[i], px, py, pz);
  const double legs = f.wl[i] * t.fr + f.wr[i] * t.fl;
  const double edges =
      (f.gl[i] * t.n1 - t.a1) * t.n2 * f.ml[i] * t.er + (t.a2 - f.gr[i] * t.n2) * t.n1 * f.mr[i] * t.el;
  const double bound = t.tm.num * (t.tm.cx * nx + t.tm.cy * ny + t.tm.cz * nz);
  const double d23 = t.d2 * t.d3;
  return (legs * d23 + (edges * t.d3 + bound * t.d2) * t.d1) / (t.d1 * d23);
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

/// n . v at target i of a column's horseshoe and of its image, each with its ground image (fields f[0..3]:
/// those of src, src_ground, img, img_ground).
template <bool kGround>
SKEIN_ALWAYS_INLINE void PairAt(const Column& s, const Column& sg, const Column& m, const Column& mg,
                                const StripFields* f, std::size_t i, double px, double py, double pz, double nx,
                                double ny, double nz, double& direct, double& image) {
  direct = ColumnAt(s, f[0], i, px, py, pz, nx, ny, nz);
  image = ColumnAt(m, f[2], i, px, py, pz, nx, ny, nz);
  if constexpr (kGround) {
    direct += ColumnAt(sg, f[1], i, px, py, pz, nx, ny, nz);
    image += ColumnAt(mg, f[3], i, px, py, pz, nx, ny, nz);
  }
}

/// Columns of the symmetric/antisymmetric pair: anti[i] = direct - image for every target, sym[i] = direct +
/// image for the first n_sym. fields[0..3]: those of src, src_ground, img, img_ground.
template <bool kGround>
SKEIN_ALWAYS_INLINE void PairColumnImpl(const TargetArrays& t, const Column& src, const Column& src_ground,
                                        const Column& img, const Column& img_ground, const StripFields* fields,
                                        std::size_t n_sym, double* anti, double* sym) {
  const Column s = src, sg = src_ground, m = img, mg = img_ground;
  const StripFields f[4] = {fields[0], fields[1], fields[2], fields[3]};
  const double *px = t.px, *py = t.py, *pz = t.pz, *nx = t.nx, *ny = t.ny, *nz = t.nz;
#pragma omp simd
  for (std::size_t i = 0; i < n_sym; ++i) {
    double direct, image;
    PairAt<kGround>(s, sg, m, mg, f, i, px[i], py[i], pz[i], nx[i], ny[i], nz[i], direct, image);
    anti[i] = direct - image;
    sym[i] = direct + image;
  }
#pragma omp simd
  for (std::size_t i = n_sym; i < t.n; ++i) {
    double direct, image;
    PairAt<kGround>(s, sg, m, mg, f, i, px[i], py[i], pz[i], nx[i], ny[i], nz[i], direct, image);
    anti[i] = direct - image;
  }
}

// ---- velocity pass: a block of targets, the sources of a strip ---------------------------------------------

/// The velocity pass takes its targets kVelocityBlock at a time (a short last block repeats its last point).
constexpr std::size_t kVelocityBlock = 16;
constexpr std::size_t kVelocityRows = 3 * kVelocityBlock;  ///< u of the block's targets, then v, then w

struct BlockPoints {
  alignas(64) double x[kVelocityBlock];
  alignas(64) double y[kVelocityBlock];
  alignas(64) double z[kVelocityBlock];
};

/// StripFields for the velocity pass, at a block of targets: the legs' and the edges' vectors, where the
/// assembly keeps only their components along the target's normal.
struct VelocityFields {
  alignas(64) double wl[3][kVelocityBlock];
  alignas(64) double hl[kVelocityBlock];
  alignas(64) double wr[3][kVelocityBlock];
  alignas(64) double hr[kVelocityBlock];
  alignas(64) double gl[kVelocityBlock];
  alignas(64) double ml[3][kVelocityBlock];
  alignas(64) double kl[kVelocityBlock];
  alignas(64) double gr[kVelocityBlock];
  alignas(64) double mr[3][kVelocityBlock];
  alignas(64) double kr[kVelocityBlock];
};

SKEIN_ALWAYS_INLINE void VelocityStartImpl(const BlockPoints& p, const Shoe& src, const double* uleft,
                                           const double* uright, VelocityFields& f) {
  const Shoe s = src;
  const double ul[3] = {uleft[0], uleft[1], uleft[2]}, ur[3] = {uright[0], uright[1], uright[2]};
#pragma omp simd
  for (std::size_t i = 0; i < kVelocityBlock; ++i) {
    const StripGeometry g = StripGeometryAt(s, ul, ur, p.x[i], p.y[i], p.z[i]);
    for (std::size_t k = 0; k < 3; ++k) {
      f.wl[k][i] = g.w0 * g.c0[k];
      f.wr[k][i] = g.w4 * g.c4[k];
      f.ml[k][i] = g.sl * g.ml[k];
      f.mr[k][i] = g.sr * g.mr[k];
    }
    f.hl[i] = g.h0;
    f.hr[i] = g.h4;
    f.gl[i] = g.gl;
    f.kl[i] = g.kl;
    f.gr[i] = g.gr;
    f.kr[i] = g.kr;
  }
}

/// Velocity at target i of a column's horseshoe from the strip's fields, added to (u, v, w): ColumnAt with
/// vectors (two square roots, one division).
SKEIN_ALWAYS_INLINE void ColumnVelocityAt(const Column& c, const VelocityFields& f, std::size_t i, double px,
                                          double py, double pz, double& u, double& v, double& w) {
  const ColumnTerms t = ColumnTermsAt(c, f.hl[i], f.hr[i], f.kl[i], f.kr[i], px, py, pz);
  const double d23 = t.d2 * t.d3, inv = 1.0 / (t.d1 * d23);
  const double legs = d23 * inv, edges = t.d1 * t.d3 * inv;
  const double sl = t.fr * legs, sr = t.fl * legs;
  const double tl = (f.gl[i] * t.n1 - t.a1) * t.n2 * t.er * edges, tr = (t.a2 - f.gr[i] * t.n2) * t.n1 * t.el * edges;
  const double sb = t.tm.num * t.d1 * t.d2 * inv;
  u += sl * f.wl[0][i] + sr * f.wr[0][i] + tl * f.ml[0][i] + tr * f.mr[0][i] + sb * t.tm.cx;
  v += sl * f.wl[1][i] + sr * f.wr[1][i] + tl * f.ml[1][i] + tr * f.mr[1][i] + sb * t.tm.cy;
  w += sl * f.wl[2][i] + sr * f.wr[2][i] + tl * f.ml[2][i] + tr * f.mr[2][i] + sb * t.tm.cz;
}

/// Velocities at the block's targets of one source (and its ground image): out[0..kVelocityRows).
template <bool kGround>
SKEIN_ALWAYS_INLINE void VelocityColumnImpl(const BlockPoints& p, const Column& src, const Column& src_ground,
                                            const VelocityFields* f, double* out) {
  const Column s = src, g = src_ground;
#pragma omp simd
  for (std::size_t i = 0; i < kVelocityBlock; ++i) {
    double u = 0.0, v = 0.0, w = 0.0;
    ColumnVelocityAt(s, f[0], i, p.x[i], p.y[i], p.z[i], u, v, w);
    if constexpr (kGround) ColumnVelocityAt(g, f[1], i, p.x[i], p.y[i], p.z[i], u, v, w);
    out[i] = u;
    out[kVelocityBlock + i] = v;
    out[2 * kVelocityBlock + i] = w;
  }
}

/// A given source and its mirror (each with its ground image; fields f[0..3] in that order): the sums of
/// their velocities into sum[0..kVelocityRows), the differences into diff.
template <bool kGround>
SKEIN_ALWAYS_INLINE void PairedVelocityColumnImpl(const BlockPoints& p, const Column& src,
                                                  const Column& src_ground, const Column& img,
                                                  const Column& img_ground, const VelocityFields* f, double* sum,
                                                  double* diff) {
  const Column s = src, sg = src_ground, m = img, mg = img_ground;
#pragma omp simd
  for (std::size_t i = 0; i < kVelocityBlock; ++i) {
    double u = 0.0, v = 0.0, w = 0.0, um = 0.0, vm = 0.0, wm = 0.0;
    ColumnVelocityAt(s, f[0], i, p.x[i], p.y[i], p.z[i], u, v, w);
    if constexpr (kGround) ColumnVelocityAt(sg, f[1], i, p.x[i], p.y[i], p.z[i], u, v, w);
    ColumnVelocityAt(m, f[2], i, p.x[i], p.y[i], p.z[i], um, vm, wm);
    if constexpr (kGround) ColumnVelocityAt(mg, f[3], i, p.x[i], p.y[i], p.z[i], um, vm, wm);
    sum[i] = u + um;
    sum[kVelocityBlock + i] = v + vm;
    sum[2 * kVelocityBlock + i] = w + wm;
    diff[i] = u - um;
    diff[kVelocityBlock + i] = v - vm;
    diff[2 * kVelocityBlock + i] = w - wm;
  }
}

// ---- the product of the velocity pass ------------------------------------------------------------------

/// Y += R G for the kernel columns R (kVelocityRows x n, column-major) and the circulations G (n x kw,
/// row-major, kw a multiple of kProductCols): Y (kVelocityRows x kw, column-major). Every entry is the sum over
/// the sources in their order, so the bits do not depend on the thread that computes it. Written out (not
/// Eigen's product) so that it is compiled for the processor's instruction set with the kernels, register-
/// blocked 12 x 4, over chunks of sources that keep R's and G's share in the core's cache.
constexpr std::size_t kProductCols = 4, kProductChunk = 256;
using Lanes = double __attribute__((vector_size(32), aligned(8)));  // four doubles, unaligned access allowed
static_assert(kVelocityRows % 12 == 0, "the product takes the rows 12 at a time");

SKEIN_ALWAYS_INLINE void ProductImpl(const double* r, const double* g, std::size_t n, std::size_t kw, double* y) {
  for (std::size_t s0 = 0; s0 < n; s0 += kProductChunk) {
    const std::size_t s1 = std::min(n, s0 + kProductChunk);
    for (std::size_t i0 = 0; i0 < kVelocityRows; i0 += 12) {
      for (std::size_t k0 = 0; k0 < kw; k0 += kProductCols) {
        double* y0 = y + k0 * kVelocityRows + i0;
        Lanes acc[3][4];
        for (std::size_t c = 0; c < 4; ++c)
          for (std::size_t t = 0; t < 3; ++t)
            acc[t][c] = *reinterpret_cast<const Lanes*>(y0 + c * kVelocityRows + 4 * t);
        for (std::size_t s = s0; s < s1; ++s) {
          const double* rs = r + s * kVelocityRows + i0;
          const Lanes ra = *reinterpret_cast<const Lanes*>(rs), rb = *reinterpret_cast<const Lanes*>(rs + 4),
                      rc = *reinterpret_cast<const Lanes*>(rs + 8);
          const double* gs = g + s * kw + k0;
          for (std::size_t c = 0; c < 4; ++c) {
            acc[0][c] += ra * gs[c];
            acc[1][c] += rb * gs[c];
            acc[2][c] += rc * gs[c];
          }
        }
        for (std::size_t c = 0; c < 4; ++c)
          for (std::size_t t = 0; t < 3; ++t)
            *reinterpret_cast<Lanes*>(y0 + c * kVelocityRows + 4 * t) = acc[t][c];
      }
    }
  }
}

// ---- one instance per instruction set, chosen at run time -------------------------------------------------

/// The kernels compiled for one instruction set (ATTR: a target attribute, or nothing for the baseline).
#define SKEIN_KERNEL_SET(Name, ATTR)                                                                          \
  ATTR void Product##Name(const double* r, const double* g, std::size_t n, std::size_t kw, double* y) {       \
    ProductImpl(r, g, n, kw, y);                                                                              \
  }                                                                                                           \
  ATTR void StripStart##Name(const TargetArrays& t, const Shoe& s, const double* ul, const double* ur,        \
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
  ATTR void VelocityStart##Name(const BlockPoints& p, const Shoe& s, const double* ul, const double* ur,      \
                                VelocityFields& f) {                                                          \
    VelocityStartImpl(p, s, ul, ur, f);                                                                       \
  }                                                                                                           \
  template <bool kGround>                                                                                     \
  ATTR void VelocityColumn##Name(const BlockPoints& p, const Column& s, const Column& g,                      \
                                 const VelocityFields* f, double* out) {                                      \
    VelocityColumnImpl<kGround>(p, s, g, f, out);                                                             \
  }                                                                                                           \
  template <bool kGround>                                                                                     \
  ATTR void PairedVelocityColumn##Name(const BlockPoints& p, const Column& s, const Column& sg,               \
                                       const Column& m, const Column& mg, const VelocityFields* f,            \
                                       double* sum, double* diff) {                                           \
    PairedVelocityColumnImpl<kGround>(p, s, sg, m, mg, f, sum, diff);                                         \
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
  void (*vstart)(const BlockPoints&, const Shoe&, const double*, const double*, VelocityFields&);
  void (*vcolumn)(const BlockPoints&, const Column&, const Column&, const VelocityFields*, double*);
  void (*vpaired)(const BlockPoints&, const Column&, const Column&, const Column&, const Column&,
                  const VelocityFields*, double*, double*);
  void (*product)(const double*, const double*, std::size_t, std::size_t, double*);
};

/// The kernel set compiled for instruction set Name, with or without the ground images.
#define SKEIN_KERNELS_OF(Name)                                                                                \
  Kernels{&StripStart##Name,     &DirectColumn##Name<kGround>,         &PairColumn##Name<kGround>,            \
          &VelocityStart##Name,  &VelocityColumn##Name<kGround>,       &PairedVelocityColumn##Name<kGround>,  \
          &Product##Name}

template <bool kGround>
Kernels KernelsFor() {
#if defined(SKEIN_AVX2_CLONE)
  if (KernelIsaInUse() == KernelIsa::avx512) return SKEIN_KERNELS_OF(Avx512);
  if (KernelIsaInUse() == KernelIsa::avx2) return SKEIN_KERNELS_OF(Avx2);
#endif
  return SKEIN_KERNELS_OF(Base);
}
#undef SKEIN_KERNELS_OF
Kernels KernelsFor(bool ground) { return ground ? KernelsFor<true>() : KernelsFor<false>(); }

// ---- the mirror plan of the velocity pass --------------------------------------------------------------

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
  std::vector<Shoe> direct(n), image(n);  // column j's horseshoe, and its mirror image's in a split layout
  const auto has_image = [&](std::size_t j) { return split && wide.image[j] >= 0; };
  for (std::size_t j = 0; j < n; ++j) {
    direct[j] = LoadShoe(lat, wide.panel[j], wake);
    if (has_image(j)) image[j] = LoadShoe(lat, static_cast<std::size_t>(wide.image[j]), wake);
  }
  const std::vector<std::pair<std::size_t, std::size_t>> runs = StripRuns(0, n, [&](std::size_t r, std::size_t j) {
    return has_image(r) == has_image(j) && SameStrip(direct[r], direct[j]) &&
           (!has_image(j) || SameStrip(image[r], image[j]));
  });
  const auto nruns = static_cast<std::ptrdiff_t>(runs.size());
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
      const auto [first, last] = runs[static_cast<std::size_t>(run)];
      const std::size_t count = last - first;
      const bool paired = has_image(first);
      const int variants = paired ? 4 : 2;
      shoes.resize(count);
      columns.resize(count);
      for (std::size_t q = 0; q < count; ++q) {
        std::array<Shoe, 4>& sh = shoes[q];
        sh[0] = direct[first + q];
        sh[1] = ground ? GroundImage(sh[0], wake) : sh[0];
        if (paired) {
          sh[2] = image[first + q];
          sh[3] = ground ? GroundImage(sh[2], wake) : sh[2];
        }
      }
      // The side edges, from the run's first column (any one would do: its horseshoes' ends lie on them).
      double ul[4][3] = {}, ur[4][3] = {};
      for (int k = 0; k < variants; ++k) EdgeDirections(shoes[0][static_cast<std::size_t>(k)], ul[k], ur[k]);
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
  const std::size_t given = plan.given;
  // The sources in table order with their ground images, their strips (on the mirror path, a strip of given
  // horseshoes whose mirrors form a strip too: both are evaluated together) and their columns.
  std::vector<std::array<Shoe, 2>> shoes(ns);
  for (std::size_t r = 0; r < ns; ++r) {
    shoes[r][0] = LoadShoe(lat, plan.order[r], wake);
    shoes[r][1] = ground ? GroundImage(shoes[r][0], wake) : shoes[r][0];
  }
  struct Run {
    std::size_t first, last;
    bool paired;
    double ul[4][3], ur[4][3];  ///< side edges of the source, its ground image, its mirror, the mirror's image
  };
  std::vector<Run> runs;
  std::vector<std::array<Column, 2>> columns(ns);
  const auto add_runs = [&](std::size_t from, std::size_t to, bool paired) {
    const auto joins = [&](std::size_t r, std::size_t e) {
      return SameStrip(shoes[r][0], shoes[e][0]) && (!paired || SameStrip(shoes[given + r][0], shoes[given + e][0]));
    };
    for (const auto& [r, e] : StripRuns(from, to, joins)) {
      Run run{r, e, paired, {}, {}};
      for (std::size_t v = 0; v < (paired ? 4u : 2u); ++v)
        EdgeDirections(shoes[r + (v / 2) * given][v % 2], run.ul[v], run.ur[v]);
      for (std::size_t q = r; q < e; ++q)
        for (std::size_t v = 0; v < (paired ? 4u : 2u); ++v)
          columns[q + (v / 2) * given][v % 2] = ColumnOf(shoes[q + (v / 2) * given][v % 2], run.ul[v], run.ur[v]);
      runs.push_back(run);
    }
  };
  if (plan.mirrored) {
    add_runs(0, given, true);
    add_runs(2 * given, ns, false);
  } else {
    add_runs(0, ns, false);
  }
  // The products' weights, row-major, a row per source in table order. Mirrored (see the file comment): with
  // the kernel columns holding, per given horseshoe, the sum and the difference of its and its mirror's
  // velocities, and then the centre-line ones, the velocity at a given point is X + Y and at its mirror X - Y
  // (v: Y - X), X = sums . (g_given + g_mirror) / 2, Y = differences . (g_given - g_mirror) / 2 + centre-line .
  // g_centre. A circulation column that is exactly zero in a product's weights induces nothing there and stays
  // out of it: a symmetric flow's differences, an antisymmetric one's sums, a lateral column that was not
  // solved. Each column's sums are its own, so the other columns' bits do not change.
  struct Weights {
    std::vector<Eigen::Index> live;  ///< the circulation columns kept, in order
    std::size_t kw = 0;              ///< their number padded to a multiple of kProductCols
    std::vector<double> g;           ///< rows x kw
  };
  const auto circulation = [&](std::size_t r, Eigen::Index c) {
    return gamma(static_cast<Eigen::Index>(plan.order[r]), c);
  };
  const auto weights = [&](std::size_t rows, const auto& value) {
    Weights w;
    for (Eigen::Index c = 0; c < k; ++c) {
      bool zero = true;
      for (std::size_t r = 0; r < rows && zero; ++r) zero = Exactly(value(r, c), 0.0);
      if (!zero) w.live.push_back(c);
    }
    w.kw = (w.live.size() + kProductCols - 1) / kProductCols * kProductCols;
    w.g.assign(rows * w.kw, 0.0);
    for (std::size_t j = 0; j < w.live.size(); ++j)
      for (std::size_t r = 0; r < rows; ++r) w.g[r * w.kw + j] = value(r, w.live[j]);
    return w;
  };
  const auto mean = [&](std::size_t r, Eigen::Index c) {
    return 0.5 * (circulation(r, c) + circulation(given + r, c));
  };
  const auto half_difference = [&](std::size_t r, Eigen::Index c) {
    return r < given ? 0.5 * (circulation(r, c) - circulation(given + r, c)) : circulation(given + r, c);
  };
  const Weights first_w = plan.mirrored ? weights(given, mean) : weights(ns, circulation);
  const Weights second_w = plan.mirrored ? weights(ns - given, half_difference) : Weights{};
  if (first_w.live.empty() && second_w.live.empty()) return out;
  // A source whose weights are zero in both products induces nothing (the centre-line fin's, when only
  // symmetric columns were solved): a strip of such sources is not evaluated, its kernel columns stay zero
  // from the start, and they add zero to the products.
  const auto zero_row = [](const Weights& w, std::size_t r) {
    for (std::size_t j = 0; j < w.kw; ++j)
      if (!Exactly(w.g[r * w.kw + j], 0.0)) return false;
    return true;
  };
  std::vector<bool> idle(runs.size(), true);
  for (std::size_t i = 0; i < runs.size(); ++i)
    for (std::size_t r = runs[i].first; r < runs[i].last && idle[i]; ++r)
      idle[i] = !plan.mirrored          ? zero_row(first_w, r)
                : runs[i].paired        ? zero_row(first_w, r) && zero_row(second_w, r)
                                        : zero_row(second_w, r - given);

  const Kernels kernels = KernelsFor(ground);
  const std::size_t nt = plan.targets.size();
  const auto nblocks = static_cast<std::ptrdiff_t>((nt + kVelocityBlock - 1) / kVelocityBlock);
#pragma omp parallel
  {
    // Kernel columns (kVelocityRows x ns, column-major) and the products, per thread.
    std::vector<double> rows(kVelocityRows * ns), x(kVelocityRows * first_w.kw), y(kVelocityRows * second_w.kw);
    BlockPoints block;
    VelocityFields fields[4];
#pragma omp for schedule(dynamic, 1)
    for (std::ptrdiff_t blk = 0; blk < nblocks; ++blk) {
      const std::size_t first = static_cast<std::size_t>(blk) * kVelocityBlock;
      const std::size_t count = std::min(kVelocityBlock, nt - first);
      for (std::size_t q = 0; q < kVelocityBlock; ++q) {
        const std::size_t p = plan.targets[first + std::min(q, count - 1)].first;
        block.x[q] = points.x[p];
        block.y[q] = points.y[p];
        block.z[q] = points.z[p];
      }
      for (std::size_t i = 0; i < runs.size(); ++i) {
        if (idle[i]) continue;
        const Run& run = runs[i];
        for (std::size_t v = 0; v < (run.paired ? 4u : 2u); ++v)
          if (ground || v % 2 == 0)
            kernels.vstart(block, shoes[run.first + (v / 2) * given][v % 2], run.ul[v], run.ur[v], fields[v]);
        for (std::size_t r = run.first; r < run.last; ++r) {
          if (run.paired)
            kernels.vpaired(block, columns[r][0], columns[r][1], columns[given + r][0], columns[given + r][1], fields,
                            rows.data() + r * kVelocityRows, rows.data() + (given + r) * kVelocityRows);
          else
            kernels.vcolumn(block, columns[r][0], columns[r][1], fields, rows.data() + r * kVelocityRows);
        }
      }
      std::fill(x.begin(), x.end(), 0.0);
      std::fill(y.begin(), y.end(), 0.0);
      const std::size_t n_first = plan.mirrored ? given : ns;
      if (first_w.kw > 0) kernels.product(rows.data(), first_w.g.data(), n_first, first_w.kw, x.data());
      if (second_w.kw > 0)
        kernels.product(rows.data() + given * kVelocityRows, second_w.g.data(), ns - given, second_w.kw, y.data());
      // Into the zeroed output, X and then Y: 0 + X + Y has the bits of X + Y.
      for (std::size_t q = 0; q < count; ++q) {
        const auto [p, m] = plan.targets[first + q];
        const auto pi = static_cast<Eigen::Index>(p), mi = static_cast<Eigen::Index>(m);
        for (std::size_t j = 0; j < first_w.live.size(); ++j) {
          const Eigen::Index col = first_w.live[j];
          const std::size_t at = j * kVelocityRows + q;
          const double xu = x[at], xv = x[at + kVelocityBlock], xw = x[at + 2 * kVelocityBlock];
          out.u(pi, col) += xu;
          out.v(pi, col) += xv;
          out.w(pi, col) += xw;
          if (!plan.mirrored || m < 0) continue;
          out.u(mi, col) += xu;
          out.v(mi, col) -= xv;
          out.w(mi, col) += xw;
        }
        for (std::size_t j = 0; j < second_w.live.size(); ++j) {
          const Eigen::Index col = second_w.live[j];
          const std::size_t at = j * kVelocityRows + q;
          const double yu = y[at], yv = y[at + kVelocityBlock], yw = y[at + 2 * kVelocityBlock];
          out.u(pi, col) += yu;
          out.v(pi, col) += yv;
          out.w(pi, col) += yw;
          if (m < 0) continue;
          out.u(mi, col) -= yu;
          out.v(mi, col) += yv;
          out.w(mi, col) -= yw;
        }
      }
    }
  }
  return out;
}

}  // namespace skein
