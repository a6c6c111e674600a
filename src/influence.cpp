// Skein stage 3, assemble. See influence.hpp.
#include "skein/influence.hpp"

#include <cmath>

#include "skein/biot_savart.hpp"
#include "vec3.hpp"

namespace skein {
namespace {

/// One horseshoe's geometry, loaded once and reused across many field points (loop-invariant for the
/// vectoriser). `image` holds its reflection in the ground plane, if any.
struct Source {
  double a[3], b[3], ta[3], tb[3];
  double d[3];
  double core4;
  bool has_ground = false;
  double ga[3], gb[3], gta[3], gtb[3], gd[3];
};

Source LoadSource(const Lattice& lat, std::size_t j, const WakeGeometry& wake) {
  Source s{};
  auto load = [&](double* dst, const PointArray& p) {
    dst[0] = p.x[j];
    dst[1] = p.y[j];
    dst[2] = p.z[j];
  };
  load(s.a, lat.a);
  load(s.b, lat.b);
  load(s.ta, lat.te_a);
  load(s.tb, lat.te_b);
  for (int k = 0; k < 3; ++k) s.d[k] = wake.direction[static_cast<std::size_t>(k)];
  s.core4 = lat.core4[j];
  if (wake.ground.enabled) {
    // Mirror in z = h with the order reversed: the image carries the same circulation and makes the flow
    // symmetric about the ground plane, so no air crosses it.
    const double h2 = 2.0 * wake.ground.height_z;
    auto refl = [&](double* dst, const double* src) {
      dst[0] = src[0];
      dst[1] = src[1];
      dst[2] = h2 - src[2];
    };
    s.has_ground = true;
    refl(s.ga, s.b);
    refl(s.gb, s.a);
    refl(s.gta, s.tb);
    refl(s.gtb, s.ta);
    s.gd[0] = s.d[0];
    s.gd[1] = s.d[1];
    s.gd[2] = -s.d[2];
  }
  return s;
}

inline void SourceVelocity(const Source& s, double px, double py, double pz, double& u, double& v, double& w) {
  AddHorseshoeVelocity(px, py, pz, s.a, s.b, s.ta, s.tb, s.d, s.core4, u, v, w);
  if (s.has_ground) AddHorseshoeVelocity(px, py, pz, s.ga, s.gb, s.gta, s.gtb, s.gd, s.core4, u, v, w);
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
  // The widest layout lists every unknown; a symmetric layout is a prefix of its antisymmetric partner.
  const SystemLayout& wide = layouts.back();
  const std::size_t n = wide.panel.size();
  const std::size_t n_sym = layouts.size() == 2 ? layouts[0].panel.size() : 0;
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
  }
  const bool split = layouts.size() == 2;
  const auto ni = static_cast<std::ptrdiff_t>(n);
#pragma omp parallel for schedule(static)
  for (std::ptrdiff_t jj = 0; jj < ni; ++jj) {
    const auto j = static_cast<std::size_t>(jj);
    const Source src = LoadSource(lat, wide.panel[j], wake);
    const bool has_image = wide.image[j] >= 0;
    const Source img = has_image ? LoadSource(lat, static_cast<std::size_t>(wide.image[j]), wake) : Source{};
    double* col_wide = mats.back().col(jj).data();
    double* col_sym = split && j < n_sym ? mats[0].col(jj).data() : nullptr;
    if (!split) {
#pragma omp simd
      for (std::size_t i = 0; i < n; ++i) {
        double u = 0.0, v = 0.0, w = 0.0;
        SourceVelocity(src, px[i], py[i], pz[i], u, v, w);
        col_wide[i] = u * nx[i] + v * ny[i] + w * nz[i];
      }
      continue;
    }
    if (!has_image) {
      // A centre-line panel: its own image, so it enters the antisymmetric system once.
      for (std::size_t i = 0; i < n; ++i) {
        double u = 0.0, v = 0.0, w = 0.0;
        SourceVelocity(src, px[i], py[i], pz[i], u, v, w);
        col_wide[i] = u * nx[i] + v * ny[i] + w * nz[i];
      }
      continue;
    }
#pragma omp simd
    for (std::size_t i = 0; i < n; ++i) {
      double u = 0.0, v = 0.0, w = 0.0, ui = 0.0, vi = 0.0, wi = 0.0;
      SourceVelocity(src, px[i], py[i], pz[i], u, v, w);
      SourceVelocity(img, px[i], py[i], pz[i], ui, vi, wi);
      const double direct = u * nx[i] + v * ny[i] + w * nz[i];
      const double image = ui * nx[i] + vi * ny[i] + wi * nz[i];
      col_wide[i] = direct - image;
      if (i < n_sym) col_sym[i] = direct + image;
    }
  }
  return mats;
}

InducedVelocity InducedVelocityAt(const Lattice& lat, const PointArray& points, const Eigen::MatrixXd& gamma,
                                  const WakeGeometry& wake) {
  const std::size_t np = points.size(), ns = lat.panels();
  const auto k = static_cast<std::size_t>(gamma.cols());
  SKEIN_ASSERT(static_cast<std::size_t>(gamma.rows()) == ns);
  // Circulations row-major (panel-major) so the accumulation over columns is contiguous.
  std::vector<double> g(ns * k);
  for (std::size_t j = 0; j < ns; ++j)
    for (std::size_t c = 0; c < k; ++c)
      g[j * k + c] = gamma(static_cast<Eigen::Index>(j), static_cast<Eigen::Index>(c));
  InducedVelocity out;
  out.u.setZero(static_cast<Eigen::Index>(np), static_cast<Eigen::Index>(k));
  out.v.setZero(static_cast<Eigen::Index>(np), static_cast<Eigen::Index>(k));
  out.w.setZero(static_cast<Eigen::Index>(np), static_cast<Eigen::Index>(k));
  std::vector<Source> sources(ns);
  for (std::size_t j = 0; j < ns; ++j) sources[j] = LoadSource(lat, j, wake);
  const auto npi = static_cast<std::ptrdiff_t>(np);
#pragma omp parallel
  {
    std::vector<double> ku(ns), kv(ns), kw(ns), acc(3 * k);
#pragma omp for schedule(static)
    for (std::ptrdiff_t pp = 0; pp < npi; ++pp) {
      const auto p = static_cast<std::size_t>(pp);
      const double x = points.x[p], y = points.y[p], z = points.z[p];
      for (std::size_t j = 0; j < ns; ++j) {
        double u = 0.0, v = 0.0, w = 0.0;
        SourceVelocity(sources[j], x, y, z, u, v, w);
        ku[j] = u;
        kv[j] = v;
        kw[j] = w;
      }
      std::fill(acc.begin(), acc.end(), 0.0);
      for (std::size_t j = 0; j < ns; ++j) {
        const double* gj = &g[j * k];
        for (std::size_t c = 0; c < k; ++c) {
          acc[c] += ku[j] * gj[c];
          acc[k + c] += kv[j] * gj[c];
          acc[2 * k + c] += kw[j] * gj[c];
        }
      }
      for (std::size_t c = 0; c < k; ++c) {
        out.u(pp, static_cast<Eigen::Index>(c)) = acc[c];
        out.v(pp, static_cast<Eigen::Index>(c)) = acc[k + c];
        out.w(pp, static_cast<Eigen::Index>(c)) = acc[2 * k + c];
      }
    }
  }
  return out;
}

}  // namespace skein
