// Skein stage 4, solve. See solver.hpp.
// Factorise with the machine's LAPACK (OpenBLAS dgetrf) through Eigen's LAPACKE backend when the build has it
// (SKEIN_USE_OPENBLAS); Eigen's own PartialPivLU otherwise. Only this file factorises, so only it sets this.
#if defined(SKEIN_HAVE_LAPACKE)
#define EIGEN_USE_LAPACKE
#endif
#include "skein/solver.hpp"

#include <chrono>
#include <cmath>

#include <Eigen/LU>
#include <fmt/format.h>

#include "vec3.hpp"

namespace skein {
namespace {

using Clock = std::chrono::steady_clock;
double Since(Clock::time_point t0) { return std::chrono::duration<double>(Clock::now() - t0).count(); }

}  // namespace

std::string ToString(SolveStatus s) {
  switch (s) {
    case SolveStatus::ok: return "ok";
    case SolveStatus::ill_conditioned: return "ill-conditioned";
    case SolveStatus::singular: return "singular";
    case SolveStatus::non_finite: return "non-finite";
  }
  return "?";
}

Vec3 BasisOnset(int k, const Vec3& r, const Vec3& r_ref) {
  using namespace detail;
  Vec3 e{0.0, 0.0, 0.0};
  if (k < 3) {
    e[static_cast<std::size_t>(k)] = 1.0;
    return e;
  }
  Vec3 axis{0.0, 0.0, 0.0};
  axis[static_cast<std::size_t>(k - 3)] = 1.0;
  return -1.0 * Cross(axis, r - r_ref);
}

Eigen::MatrixXd BasisRightHandSides(const Lattice& lat, const Vec3& moment_point) {
  using namespace detail;
  const auto n = static_cast<Eigen::Index>(lat.panels());
  const auto ncols = static_cast<Eigen::Index>(kBasisSize * (1 + lat.controls.size()));
  Eigen::MatrixXd b = Eigen::MatrixXd::Zero(n, ncols);
  for (Eigen::Index i = 0; i < n; ++i) {
    const auto p = static_cast<std::size_t>(i);
    const Vec3 cp = lat.control[p], nrm = lat.normal[p];
    for (int k = 0; k < kBasisSize; ++k) {
      const Vec3 e = BasisOnset(k, cp, moment_point);
      b(i, k) = -Dot(e, nrm);
      if (lat.control_of[p] >= 0)
        b(i, kBasisSize * (1 + lat.control_of[p]) + k) = -Dot(e, lat.normal_rate[p]);
    }
  }
  return b;
}

Lattice StretchForCompressibility(const Lattice& lat, double beta) {
  if (!(beta < 1.0)) return lat;
  Lattice s = lat;
  const double k = 1.0 / beta;
  for (PointArray* p : {&s.a, &s.b, &s.te_a, &s.te_b, &s.control, &s.corner_le_a, &s.corner_le_b, &s.corner_te_a,
                        &s.corner_te_b})
    for (double& x : p->x) x *= k;
  for (double& nx : s.normal.x) nx *= k;
  for (std::size_t i = 0; i < s.panels(); ++i) {
    using namespace detail;
    const Vec3 chord = 0.5 * ((s.corner_te_a[i] - s.corner_le_a[i]) + (s.corner_te_b[i] - s.corner_le_b[i]));
    const double eps = kCoreFraction * std::min(Norm(s.b[i] - s.a[i]), Norm(chord));
    s.core4[i] = eps * eps * eps * eps;
  }
  for (Strip& st : s.strips) {
    st.te_left[0] *= k;
    st.te_right[0] *= k;
    st.quarter_chord[0] *= k;
  }
  return s;
}

BasisSolution SolveBasis(const Lattice& physical, const Vec3& moment_point, const WakeGeometry& wake,
                         const SolverOptions& options, double mach) {
  using namespace detail;
  BasisSolution out;
  out.wake = wake;
  out.mach = mach;
  const double beta = std::sqrt(1.0 - mach * mach);
  const Lattice lat = StretchForCompressibility(physical, beta);
  WakeGeometry swake = wake;  // the same lines in stretched axes
  swake.direction = Normalized(Vec3{wake.direction[0] / beta, wake.direction[1], wake.direction[2]});
  out.layouts = ChooseLayouts(lat, swake, options.allow_half_model);

  auto t0 = Clock::now();
  std::vector<Eigen::MatrixXd> mats = AssembleInfluence(lat, out.layouts, swake);
  out.seconds_assemble = Since(t0);

  // The right-hand side is the physical onset flow through the physical normals.
  const Eigen::MatrixXd rhs = BasisRightHandSides(physical, moment_point);
  const Eigen::Index ncols = rhs.cols();
  out.gamma = Eigen::MatrixXd::Zero(rhs.rows(), ncols);

  for (std::size_t l = 0; l < out.layouts.size(); ++l) {
    const SystemLayout& lay = out.layouts[l];
    const auto m = static_cast<Eigen::Index>(lay.panel.size());
    out.unknowns = std::max(out.unknowns, lay.panel.size());
    if (m == 0) continue;
    // Right-hand side of this system: the symmetric or antisymmetric part of the full one.
    Eigen::MatrixXd b(m, ncols);
    for (Eigen::Index i = 0; i < m; ++i) {
      const auto p = static_cast<Eigen::Index>(lay.panel[static_cast<std::size_t>(i)]);
      const int img = lay.image[static_cast<std::size_t>(i)];
      if (lay.kind == SystemLayout::Kind::full || img < 0) {
        b.row(i) = rhs.row(p);
      } else {
        const double s = lay.kind == SystemLayout::Kind::symmetric ? 1.0 : -1.0;
        b.row(i) = 0.5 * (rhs.row(p) + s * rhs.row(img));
      }
    }
    t0 = Clock::now();
    Eigen::PartialPivLU<Eigen::Ref<Eigen::MatrixXd>> lu(mats[l]);  // in place: no second copy of the matrix
    out.seconds_factorise += Since(t0);
    out.rcond = std::min(out.rcond, lu.rcond());
    t0 = Clock::now();
    const Eigen::MatrixXd x = lu.solve(b);
    out.seconds_solve += Since(t0);
    for (Eigen::Index i = 0; i < m; ++i) {
      const auto p = static_cast<Eigen::Index>(lay.panel[static_cast<std::size_t>(i)]);
      const int img = lay.image[static_cast<std::size_t>(i)];
      out.gamma.row(p) += x.row(i);
      if (lay.kind != SystemLayout::Kind::full && img >= 0) {
        const double s = lay.kind == SystemLayout::Kind::symmetric ? 1.0 : -1.0;
        out.gamma.row(img) += s * x.row(i);
      }
    }
  }
  if (!(out.rcond >= kSingularRcond)) {
    out.status = SolveStatus::singular;
    out.message = fmt::format(
        "the influence system is singular (reciprocal condition {:.2g}): look for coincident or intersecting "
        "surfaces, degenerate panels or a control point lying on a vortex line",
        out.rcond);
    return out;
  }
  if (!out.gamma.allFinite()) {
    out.status = SolveStatus::non_finite;
    out.message = "the circulation contains non-finite values: look for degenerate panels or surfaces that "
                  "touch";
    return out;
  }
  if (out.rcond < kIllConditionedRcond) {
    out.status = SolveStatus::ill_conditioned;
    out.message = fmt::format("the influence system is badly conditioned (reciprocal condition {:.2g})", out.rcond);
  }

  // Velocities at the bound-vortex midpoints for the Kutta-Joukowski loads.
  t0 = Clock::now();
  PointArray mid;
  mid.resize(lat.panels());
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    mid.x[i] = 0.5 * (lat.a.x[i] + lat.b.x[i]);
    mid.y[i] = 0.5 * (lat.a.y[i] + lat.b.y[i]);
    mid.z[i] = 0.5 * (lat.a.z[i] + lat.b.z[i]);
  }
  out.bound_velocity = InducedVelocityAt(lat, mid, out.gamma, swake);
  out.bound_velocity.u /= beta;  // u = d(phi)/dx = (d(phi)/dx') / beta
  out.seconds_velocity = Since(t0);
  return out;
}

}  // namespace skein
