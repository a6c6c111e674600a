// Skein: spanwise shear force and bending moment. See structural.hpp.
#include "skein/structural.hpp"

#include <cmath>

#include "vec3.hpp"

namespace skein {
namespace {

using namespace detail;

/// The quarter-chord point of a strip's inboard edge (the A side, toward the first section, of the given half).
Vec3 InboardQuarterChord(const Lattice& lat, const Strip& st) {
  const std::size_t first = st.first_panel, last = st.first_panel + static_cast<std::size_t>(st.panels) - 1;
  return 0.75 * lat.corner_le_a[first] + 0.25 * lat.corner_te_a[last];
}

/// The quarter-chord point of a strip's outboard edge (the B side).
Vec3 OutboardQuarterChord(const Lattice& lat, const Strip& st) {
  const std::size_t first = st.first_panel, last = st.first_panel + static_cast<std::size_t>(st.panels) - 1;
  return 0.75 * lat.corner_le_b[first] + 0.25 * lat.corner_te_b[last];
}

/// Shear and bending along the given strips (root to tip) carrying normal forces `n_force` (N, one per strip).
StructuralLoads Half(const Lattice& lat, const std::vector<std::size_t>& strips, const std::vector<double>& n_force) {
  StructuralLoads out;
  const std::size_t n = strips.size();
  double s = 0.0;
  for (std::size_t k = 0; k <= n; ++k) {
    if (k == n) {  // the tip: nothing outboard
      const Strip& last = lat.strips[strips[n - 1]];
      const Vec3 d = OutboardQuarterChord(lat, last) - InboardQuarterChord(lat, last);
      s += std::hypot(d[1], d[2]);
      out.station.push_back(s);
      out.shear_N.push_back(0.0);
      out.bending_Nm.push_back(0.0);
      break;
    }
    const Strip& here = lat.strips[strips[k]];
    const Vec3 p = InboardQuarterChord(lat, here);
    if (k > 0) {
      const Vec3 d = p - InboardQuarterChord(lat, lat.strips[strips[k - 1]]);
      s += std::hypot(d[1], d[2]);
    }
    double shear = 0.0, bending = 0.0;
    for (std::size_t m = k; m < n; ++m) {
      const Strip& st = lat.strips[strips[m]];
      const Vec3 f = n_force[m] * st.normal;
      shear += Dot(f, here.normal);
      bending += Cross(st.quarter_chord - p, f)[0];
    }
    out.station.push_back(s);
    out.shear_N.push_back(shear);
    out.bending_Nm.push_back(bending);
  }
  out.root_shear_N = out.shear_N.front();
  out.root_bending_Nm = out.bending_Nm.front();
  return out;
}

}  // namespace

void AddStructuralLoads(const Lattice& lat, double density, double speed, PointResult& point) {
  SKEIN_ASSERT(density > 0.0 && speed > 0.0);
  SKEIN_ASSERT(point.surfaces.size() == lat.surfaces.size());
  const double rho_v2 = density * speed * speed;
  for (std::size_t si = 0; si < lat.surfaces.size(); ++si) {
    const LatticeSurface& ls = lat.surfaces[si];
    SurfaceLoads& sl = point.surfaces[si];
    SKEIN_ASSERT(sl.strips.cl.size() == ls.strips);
    // Normal force of every strip of the surface, N; the given strips in order (root to tip), and, for a
    // symmetric surface, the normal force of each one's mirror image.
    std::vector<std::size_t> given;
    std::vector<double> force_given, force_mirror;
    std::vector<double> normal_force(ls.strips);
    for (std::size_t k = 0; k < ls.strips; ++k) {
      const Strip& st = lat.strips[ls.first_strip + k];
      normal_force[k] = rho_v2 * 0.5 * sl.strips.cl[k] * st.chord * st.width;
    }
    std::vector<double> mirror_of_given(lat.strips.size(), NAN);
    for (std::size_t k = 0; k < ls.strips; ++k) {
      const Strip& st = lat.strips[ls.first_strip + k];
      if (st.mirror_of >= 0) mirror_of_given[static_cast<std::size_t>(st.mirror_of)] = normal_force[k];
    }
    for (std::size_t k = 0; k < ls.strips; ++k) {
      const std::size_t m = ls.first_strip + k;
      if (lat.strips[m].mirror_of >= 0) continue;
      given.push_back(m);
      force_given.push_back(normal_force[k]);
      force_mirror.push_back(mirror_of_given[m]);
    }
    if (given.empty()) continue;
    StructuralLoads loads = Half(lat, given, force_given);
    if (ls.symmetric) {
      // The mirrored half, reflected in y = 0, is the given half's geometry carrying the mirrored strips' forces.
      const StructuralLoads left = Half(lat, given, force_mirror);
      loads.mirrored_root_shear_N = left.root_shear_N;
      loads.mirrored_root_bending_Nm = left.root_bending_Nm;
    }
    sl.structural = std::move(loads);
  }
}

}  // namespace skein
