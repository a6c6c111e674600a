// Skein: geometry checks before assembly. See geometry_check.hpp.
#include "skein/geometry_check.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>
#include <set>
#include <utility>

#include <fmt/format.h>

#include "vec3.hpp"

namespace skein {
namespace {

using namespace detail;

/// m: coordinates beyond this are not an aircraft, and their products in the kernels would overflow.
constexpr double kMaxCoordinate = 1e6;
/// m: panels smaller than this are below any model's scale, and their core radius^4 would underflow.
constexpr double kMinPanelSize = 1e-12;
/// Relative tolerance of the segment-panel intersection test (fractions of the segment and of the panel).
constexpr double kIntersectTolerance = 1e-6;

struct Box {
  Vec3 lo{HUGE_VAL, HUGE_VAL, HUGE_VAL}, hi{-HUGE_VAL, -HUGE_VAL, -HUGE_VAL};
  void Add(const Vec3& p) {
    for (std::size_t k = 0; k < 3; ++k) {
      lo[k] = std::min(lo[k], p[k]);
      hi[k] = std::max(hi[k], p[k]);
    }
  }
  bool Overlaps(const Box& o, double pad) const {
    for (std::size_t k = 0; k < 3; ++k)
      if (lo[k] > o.hi[k] + pad || o.lo[k] > hi[k] + pad) return false;
    return true;
  }
};

/// Where a panel is, in words a user can find in the case: surface, strip and panel (1-based), half.
std::string DescribePanel(const Lattice& lat, std::size_t i) {
  const auto s = static_cast<std::size_t>(lat.surface[i]);
  const LatticeSurface& ls = lat.surfaces[s];
  const auto strip = static_cast<std::size_t>(lat.strip[i]);
  const std::size_t strip_in_surface = strip - ls.first_strip + 1;
  const std::size_t panel_in_strip = i - lat.strips[strip].first_panel + 1;
  const Vec3 p = lat.control[i];
  return fmt::format("strip {} panel {}{} (control point at ({:.4g}, {:.4g}, {:.4g}) m)", strip_in_surface,
                     panel_in_strip, lat.mirror_of[i] >= 0 ? " of the mirrored half" : "", p[0], p[1], p[2]);
}

const std::string& SurfaceName(const Lattice& lat, std::size_t i) {
  return lat.surfaces[static_cast<std::size_t>(lat.surface[i])].name;
}

[[noreturn]] void Fail(const Case& c, std::size_t surface, const std::string& message) {
  const SourceRegion where = surface < c.surfaces.size() ? c.surfaces[surface].where : SourceRegion{};
  const std::string name = surface < c.surfaces.size() ? c.surfaces[surface].name : std::string("?");
  throw InputError(c.source_path, where, fmt::format("surface \"{}\": {}", name, message));
}

bool Finite(const PointArray& p, std::size_t i) {
  return std::isfinite(p.x[i]) && std::isfinite(p.y[i]) && std::isfinite(p.z[i]);
}

double MaxAbs(const PointArray& p, std::size_t i) {
  return std::max({std::abs(p.x[i]), std::abs(p.y[i]), std::abs(p.z[i])});
}

Vec3 ChordSide(const Lattice& lat, std::size_t i) {
  return 0.5 * ((lat.corner_te_a[i] - lat.corner_le_a[i]) + (lat.corner_te_b[i] - lat.corner_le_b[i]));
}

Vec3 SpanSide(const Lattice& lat, std::size_t i) {
  return 0.5 * ((lat.corner_le_b[i] - lat.corner_le_a[i]) + (lat.corner_te_b[i] - lat.corner_te_a[i]));
}

/// Does the open segment p -> q cross the triangle (v0, v1, v2) away from its edges (Moller-Trumbore)?
bool SegmentCrossesTriangle(const Vec3& p, const Vec3& q, const Vec3& v0, const Vec3& v1, const Vec3& v2) {
  const Vec3 dir = q - p, e1 = v1 - v0, e2 = v2 - v0;
  const Vec3 h = Cross(dir, e2);
  const double det = Dot(e1, h);
  // Nearly parallel (coplanar surfaces are the coincidence check's business).
  if (!(std::abs(det) > 1e-12 * Norm(dir) * Norm(e1) * Norm(e2))) return false;
  const double inv = 1.0 / det;
  const Vec3 s = p - v0;
  const double u = inv * Dot(s, h);
  const Vec3 qv = Cross(s, e1);
  const double v = inv * Dot(dir, qv);
  const double t = inv * Dot(e2, qv);
  const double tol = kIntersectTolerance;
  return t > tol && t < 1.0 - tol && u > tol && v > tol && u + v < 1.0 - tol;
}

void CheckFiniteAndScale(const Case& c, const Lattice& lat) {
  for (const PointArray* p : {&lat.a, &lat.b, &lat.te_a, &lat.te_b, &lat.control, &lat.normal, &lat.corner_le_a,
                              &lat.corner_le_b, &lat.corner_te_a, &lat.corner_te_b, &lat.normal_rate})
    for (std::size_t i = 0; i < p->size(); ++i)
      if (!Finite(*p, i))
        Fail(c, static_cast<std::size_t>(lat.surface[i]),
             fmt::format("the mesh has non-finite coordinates at strip {}; check the sections' positions, chords "
                         "and angles",
                         static_cast<std::size_t>(lat.strip[i]) -
                             lat.surfaces[static_cast<std::size_t>(lat.surface[i])].first_strip + 1));
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    const double extent = std::max({MaxAbs(lat.corner_le_a, i), MaxAbs(lat.corner_le_b, i),
                                    MaxAbs(lat.corner_te_a, i), MaxAbs(lat.corner_te_b, i)});
    if (extent > kMaxCoordinate)
      Fail(c, static_cast<std::size_t>(lat.surface[i]),
           fmt::format("the geometry reaches {:.3g} m from the origin, beyond the {:.0e} m that Skein's kernels "
                       "accept; check the units of the coordinates",
                       extent, kMaxCoordinate));
    if (!std::isfinite(lat.area[i]) || !std::isfinite(lat.core4[i]))
      Fail(c, static_cast<std::size_t>(lat.surface[i]), "the mesh has a non-finite panel area or core radius");
  }
}

void CheckDegenerate(const Case& c, const Lattice& lat) {
  for (std::size_t s = 0; s < lat.surfaces.size(); ++s) {
    const LatticeSurface& ls = lat.surfaces[s];
    double largest_chord = 0.0;
    for (std::size_t k = ls.first_strip; k < ls.first_strip + ls.strips; ++k)
      largest_chord = std::max(largest_chord, lat.strips[k].chord);
    for (std::size_t i = ls.first_panel; i < ls.first_panel + ls.panels; ++i) {
      const double chord = Norm(ChordSide(lat, i)), span = Norm(SpanSide(lat, i));
      const double side = std::min(chord, span);
      if (side < kMinPanelSize || side < kDegenerateSideFraction * largest_chord)
        Fail(c, s,
             fmt::format("degenerate panel at {}: a side is {:.3g} m long, against a largest chord of {:.3g} m; "
                         "check the sections' positions and chords",
                         DescribePanel(lat, i), side, largest_chord));
      if (lat.area[i] < kSliverFraction * chord * span)
        Fail(c, s,
             fmt::format("degenerate panel at {}: its chordwise and spanwise sides are almost parallel "
                         "(area {:.3g} m^2 for sides {:.3g} m and {:.3g} m); check the twist and the sections' "
                         "positions",
                         DescribePanel(lat, i), lat.area[i], chord, span));
    }
  }
}

void CheckFolds(const Case& c, const Lattice& lat) {
  const double cos_fold = std::cos(kFoldAngleDeg * kDegToRad);
  for (std::size_t s = 0; s < lat.surfaces.size(); ++s) {
    const LatticeSurface& ls = lat.surfaces[s];
    for (std::size_t k = ls.first_strip; k < ls.first_strip + ls.strips; ++k) {
      const Strip& st = lat.strips[k];
      // Chordwise neighbours within the strip.
      for (int r = 0; r + 1 < st.panels; ++r) {
        const std::size_t i = st.first_panel + static_cast<std::size_t>(r);
        if (Dot(lat.normal[i], lat.normal[i + 1]) < cos_fold)
          Fail(c, s,
               fmt::format("the surface folds back on itself between panels {} and {} of strip {}: their normals "
                           "turn by more than {:.0f} deg; check the camber and the control deflections",
                           r + 1, r + 2, k - ls.first_strip + 1, kFoldAngleDeg));
      }
      // Spanwise neighbours within one half (the two halves of a symmetric surface meet at y = 0 at any angle).
      if (k + 1 < ls.first_strip + ls.strips) {
        const Strip& nx = lat.strips[k + 1];
        const bool across_root = st.mirror_of >= 0 && nx.mirror_of < 0;
        if (!across_root && Dot(st.normal, nx.normal) < cos_fold)
          Fail(c, s,
               fmt::format("the surface folds back on itself between strips {} and {}{} (near y = {:.4g} m, "
                           "z = {:.4g} m): their normals turn by more than {:.0f} deg, so the sections double "
                           "back; check the order and positions of the sections",
                           k - ls.first_strip + 1, k - ls.first_strip + 2,
                           st.mirror_of >= 0 ? " of the mirrored half" : "", st.te_right[1], st.te_right[2],
                           kFoldAngleDeg));
      }
    }
  }
}

void CheckCoincident(const Case& c, const Lattice& lat) {
  const std::size_t n = lat.panels();
  if (n < 2) return;
  std::vector<double> size(n);
  double largest = 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    size[i] = PanelSize(lat, i);
    largest = std::max(largest, size[i]);
  }
  std::vector<std::size_t> order(n);
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::sort(order.begin(), order.end(), [&](std::size_t l, std::size_t r) {
    return lat.control.x[l] < lat.control.x[r] || (!(lat.control.x[r] < lat.control.x[l]) && l < r);
  });
  const double window = kCoincidentFraction * largest;
  for (std::size_t oi = 0; oi < n; ++oi) {
    const std::size_t i = order[oi];
    for (std::size_t oj = oi + 1; oj < n && lat.control.x[order[oj]] - lat.control.x[i] <= window; ++oj) {
      const std::size_t j = order[oj];
      const double tol = kCoincidentFraction * std::min(size[i], size[j]);
      const double d = Norm(lat.control[i] - lat.control[j]);
      if (!(d < tol)) continue;
      const std::size_t lo = std::min(i, j), hi = std::max(i, j);
      const auto s_lo = static_cast<std::size_t>(lat.surface[lo]), s_hi = static_cast<std::size_t>(lat.surface[hi]);
      if (s_lo != s_hi)
        Fail(c, s_hi,
             fmt::format("coincides with surface \"{}\": the control points of {} and of {} of \"{}\" are {:.3g} m "
                         "apart (less than {} of the panel size), which makes the influence system singular; move "
                         "or remove one of the two surfaces",
                         SurfaceName(lat, lo), DescribePanel(lat, hi), DescribePanel(lat, lo), SurfaceName(lat, lo),
                         d, kCoincidentFraction));
      if ((lat.mirror_of[lo] >= 0) != (lat.mirror_of[hi] >= 0))
        Fail(c, s_hi,
             fmt::format("its mirrored half coincides with the given half at {} ({:.3g} m apart), which makes the "
                         "influence system singular; a surface in the plane y = 0 (a fin) needs symmetric = false",
                         DescribePanel(lat, hi), d));
      Fail(c, s_hi,
           fmt::format("overlaps itself: the control points of {} and of {} are {:.3g} m apart, which makes the "
                       "influence system singular; check the order and positions of the sections",
                       DescribePanel(lat, lo), DescribePanel(lat, hi), d));
    }
  }
}

void CheckIntersections(const Case& c, const Lattice& lat) {
  // Strip bounding boxes prune the pairs; only strips of different surfaces whose boxes overlap are tested.
  std::vector<Box> box(lat.strips.size());
  double scale = 0.0;
  for (std::size_t k = 0; k < lat.strips.size(); ++k) {
    const Strip& st = lat.strips[k];
    for (int r = 0; r < st.panels; ++r) {
      const std::size_t i = st.first_panel + static_cast<std::size_t>(r);
      for (const PointArray* p : {&lat.corner_le_a, &lat.corner_le_b, &lat.corner_te_a, &lat.corner_te_b})
        box[k].Add((*p)[i]);
    }
    for (std::size_t d = 0; d < 3; ++d) scale = std::max(scale, box[k].hi[d] - box[k].lo[d]);
  }
  const double pad = 1e-9 * scale;
  for (std::size_t p = 0; p < lat.strips.size(); ++p) {
    for (std::size_t q = 0; q < lat.strips.size(); ++q) {
      const Strip &sp = lat.strips[p], &sq = lat.strips[q];
      if (sp.surface == sq.surface || !box[p].Overlaps(box[q], pad)) continue;
      for (int r = 0; r < sp.panels; ++r) {
        const std::size_t i = sp.first_panel + static_cast<std::size_t>(r);
        const Vec3 a = lat.a[i], b = lat.b[i];
        for (int m = 0; m < sq.panels; ++m) {
          const std::size_t j = sq.first_panel + static_cast<std::size_t>(m);
          const Vec3 la = lat.corner_le_a[j], lb = lat.corner_le_b[j], ta = lat.corner_te_a[j],
                     tb = lat.corner_te_b[j];
          if (SegmentCrossesTriangle(a, b, la, lb, tb) || SegmentCrossesTriangle(a, b, la, tb, ta)) {
            const std::size_t later = static_cast<std::size_t>(std::max(sp.surface, sq.surface));
            Fail(c, later,
                 fmt::format("intersects surface \"{}\": the bound vortex of {} of \"{}\" passes through {} of "
                             "\"{}\"; surfaces may meet at their edges but not cross (split the surface where "
                             "they meet)",
                             lat.surfaces[static_cast<std::size_t>(sp.surface) == later
                                              ? static_cast<std::size_t>(sq.surface)
                                              : static_cast<std::size_t>(sp.surface)]
                                 .name,
                             DescribePanel(lat, i), SurfaceName(lat, i), DescribePanel(lat, j), SurfaceName(lat, j)));
          }
        }
      }
    }
  }
}

}  // namespace

std::string DiagnoseCloseApproach(const Lattice& lat, const Vec3& wake_direction) {
  const std::size_t n = lat.panels();
  const Vec3 d = Normalized(wake_direction);
  double best_pair = HUGE_VAL, best_leg = HUGE_VAL;
  std::size_t pi = 0, pj = 0, li = 0, lk = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const double size = PanelSize(lat, i);
    if (!(size > 0.0)) continue;
    for (std::size_t j = i + 1; j < n; ++j) {
      const double rel = Norm(lat.control[i] - lat.control[j]) / std::min(size, PanelSize(lat, j));
      if (rel < best_pair) {
        best_pair = rel;
        pi = i;
        pj = j;
      }
    }
    for (std::size_t k = 0; k < lat.strips.size(); ++k) {
      if (static_cast<int>(k) == lat.strip[i]) continue;
      for (const Vec3* start : {&lat.strips[k].te_left, &lat.strips[k].te_right}) {
        const Vec3 r = lat.control[i] - *start;
        const double t = Dot(r, d);
        if (!(t > 0.0)) continue;
        const double rel = Norm(r - t * d) / size;
        if (rel < best_leg) {
          best_leg = rel;
          li = i;
          lk = k;
        }
      }
    }
  }
  if (!(best_pair < HUGE_VAL) && !(best_leg < HUGE_VAL)) return "the likeliest cause is degenerate panels";
  if (best_pair <= best_leg) {
    const std::string &a = SurfaceName(lat, pi), &b = SurfaceName(lat, pj);
    return fmt::format("the likeliest cause is {}: the control points of {} of \"{}\" and {} of \"{}\" are "
                       "{:.2g} panel sizes apart (coincident or overlapping surfaces)",
                       a == b ? fmt::format("surface \"{}\"", a) : fmt::format("surfaces \"{}\" and \"{}\"", a, b),
                       DescribePanel(lat, pi), a, DescribePanel(lat, pj), b, best_pair);
  }
  const std::string& a = SurfaceName(lat, li);
  const std::string& b = lat.surfaces[static_cast<std::size_t>(lat.strips[lk].surface)].name;
  return fmt::format("the likeliest cause is {}: the control point of {} of \"{}\" is {:.2g} panel sizes from a "
                     "trailing leg of \"{}\" (a control point on a vortex line)",
                     a == b ? fmt::format("surface \"{}\"", a) : fmt::format("surfaces \"{}\" and \"{}\"", a, b),
                     DescribePanel(lat, li), a, best_leg, b);
}

double PanelSize(const Lattice& lat, std::size_t i) {
  return std::min(Norm(lat.b[i] - lat.a[i]), Norm(ChordSide(lat, i)));
}

void CheckGeometry(const Case& c, const Lattice& lat) {
  CheckFiniteAndScale(c, lat);
  CheckDegenerate(c, lat);
  CheckFolds(c, lat);
  CheckCoincident(c, lat);
  CheckIntersections(c, lat);
}

namespace {

/// Squared distance from P to the nearest of the legs first .. last - 1 (starting at (lx, ly, lz)[k], along the
/// unit vector d) that P lies beside, downstream of the leg's start; infinity when there is none.
double NearestLegSquared(const double* lx, const double* ly, const double* lz, const Vec3& d, const Vec3& p,
                         std::size_t first, std::size_t last) {
  constexpr double kFar = std::numeric_limits<double>::infinity();
  const double px = p[0], py = p[1], pz = p[2], dx = d[0], dy = d[1], dz = d[2];
  double closest = kFar;
#pragma omp simd reduction(min : closest)
  for (std::size_t k = first; k < last; ++k) {
    const double rx = px - lx[k], ry = py - ly[k], rz = pz - lz[k];
    const double t = rx * dx + ry * dy + rz * dz;
    const double hx = rx - t * dx, hy = ry - t * dy, hz = rz - t * dz;
    closest = std::min(closest, t > 0.0 ? hx * hx + hy * hy + hz * hz : kFar);
  }
  return closest;
}

/// For each panel, whether its control point comes within the larger of kOnLegFraction and kNearLegFraction
/// (a little more, for rounding) of its panel size of a trailing leg of another strip (downstream of the leg's
/// start, leg along d): the panels CheckWakeClearance looks at closely. Squared distances, no square roots,
/// the panels in parallel: every panel is tested against every leg, O(panels x strips).
std::vector<char> PanelsNearALeg(const Lattice& lat, const Vec3& d) {
  const std::size_t n = lat.panels(), nlegs = 2 * lat.strips.size();
  std::vector<double> sx(nlegs), sy(nlegs), sz(nlegs);  // strip k's legs: 2 k (left) and 2 k + 1 (right)
  for (std::size_t k = 0; k < lat.strips.size(); ++k)
    for (std::size_t e = 0; e < 2; ++e) {
      const Vec3& p = e == 0 ? lat.strips[k].te_left : lat.strips[k].te_right;
      sx[2 * k + e] = p[0];
      sy[2 * k + e] = p[1];
      sz[2 * k + e] = p[2];
    }
  const auto nearest = [&](const Vec3& p, std::size_t first, std::size_t last) {
    return NearestLegSquared(sx.data(), sy.data(), sz.data(), d, p, first, last);
  };
  const double fraction = 1.01 * std::max(kOnLegFraction, kNearLegFraction);
  std::vector<char> near(n, 0);
#pragma omp parallel for schedule(static)
  for (std::ptrdiff_t ii = 0; ii < static_cast<std::ptrdiff_t>(n); ++ii) {
    const auto i = static_cast<std::size_t>(ii);
    const double limit = fraction * PanelSize(lat, i);
    // Every leg but the two of the panel's own strip (none left out when it has no strip).
    const std::size_t own = lat.strip[i] >= 0 ? 2 * static_cast<std::size_t>(lat.strip[i]) : nlegs;
    const double closest =
        std::min(nearest(lat.control[i], 0, own), nearest(lat.control[i], std::min(own + 2, nlegs), nlegs));
    near[i] = static_cast<char>(closest < limit * limit);
  }
  return near;
}

}  // namespace

std::vector<WakeWarning> CheckWakeClearance(const Case& c, const Lattice& lat, const Vec3& wake_direction,
                                            const std::string& flight) {
  std::vector<WakeWarning> warnings;
  const Vec3 d = Normalized(wake_direction);
  std::set<std::pair<int, int>> warned;  // (surface of the control point, surface of the leg)
  const std::string when = flight.empty() ? "" : " " + flight;
  const std::vector<char> near = PanelsNearALeg(lat, d);
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    if (!near[i]) continue;  // no leg within either fraction of the panel size: nothing to report
    const Vec3 cp = lat.control[i];
    const double size = PanelSize(lat, i);
    for (std::size_t k = 0; k < lat.strips.size(); ++k) {
      if (static_cast<int>(k) == lat.strip[i]) continue;
      const Strip& st = lat.strips[k];
      for (const Vec3* start : {&st.te_left, &st.te_right}) {
        const Vec3 r = cp - *start;
        const double t = Dot(r, d);
        if (!(t > 0.0)) continue;  // upstream of the leg's start: not beside the leg
        const double h = Norm(r - t * d);
        const bool other_surface = st.surface != lat.surface[i];
        if (h < kOnLegFraction * size) {
          const LatticeSurface& leg_surface = lat.surfaces[static_cast<std::size_t>(st.surface)];
          Fail(c, static_cast<std::size_t>(lat.surface[i]),
               fmt::format("the control point of {} lies on a trailing leg of surface \"{}\"{} ({:.3g} m from it, "
                           "inside the vortex core of {} of the panel size), so the boundary condition there is "
                           "meaningless; move the surface off the wake of \"{}\" (for example in z)",
                           DescribePanel(lat, i), leg_surface.name, when, h, kOnLegFraction, leg_surface.name));
        }
        if (other_surface && h < kNearLegFraction * size &&
            warned.insert({lat.surface[i], st.surface}).second)
          warnings.push_back({lat.surface[i], st.surface, fmt::format(
              "surface \"{}\": the control point of {} is {:.3g} m from a trailing leg of surface \"{}\" (less "
              "than {} of its panel size); the local loads there are unreliable",
              SurfaceName(lat, i), DescribePanel(lat, i), h,
              lat.surfaces[static_cast<std::size_t>(st.surface)].name, kNearLegFraction)});
      }
    }
  }
  return warnings;
}

}  // namespace skein
