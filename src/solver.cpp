// Skein stage 4, solve. See solver.hpp.
// Factorise and solve with the machine's LAPACK (OpenBLAS dgetrf and dgetrs, and dlacn2 for the condition
// estimate, through LAPACKE's _work entry points, which skip LAPACKE's O(N^2) NaN scan: a NaN still reaches
// the reciprocal condition and is reported as a singular system) when the build has it (SKEIN_USE_OPENBLAS);
// Eigen's own PartialPivLU otherwise.
#include "skein/solver.hpp"

#include <array>
#include <chrono>
#include <cmath>
#include <cstdlib>
#include <memory>
#include <strings.h>
#if defined(__linux__)
#include <unistd.h>
#endif
#include <vector>

#include <Eigen/LU>
#include <fmt/format.h>
#if defined(SKEIN_HAVE_LAPACKE)
#include <lapacke.h>
#endif

#include "skein/loads.hpp"
#include "vec3.hpp"

// OpenBLAS's own entry points (weak: null with another BLAS, or none).
extern "C" {
char* openblas_get_corename(void) __attribute__((weak));
void openblas_set_num_threads(int) __attribute__((weak));
int openblas_get_num_threads(void) __attribute__((weak));
}

namespace skein {
namespace {

using Clock = std::chrono::steady_clock;
double Since(Clock::time_point t0) { return std::chrono::duration<double>(Clock::now() - t0).count(); }

}  // namespace

ScopedBlasThreads::ScopedBlasThreads(int n) {
  if (openblas_set_num_threads != nullptr && openblas_get_num_threads != nullptr) {
    previous_ = openblas_get_num_threads();
    if (previous_ != n) {
      openblas_set_num_threads(n);
    } else {
      previous_ = 0;  // nothing to restore
    }
  }
}
ScopedBlasThreads::~ScopedBlasThreads() {
  if (previous_ > 0) openblas_set_num_threads(previous_);
}

#if defined(SKEIN_HAVE_LAPACKE)
struct InPlaceLu::Impl {
  explicit Impl(Eigen::MatrixXd& a) : lu(a), ipiv(static_cast<std::size_t>(a.rows())) {
    SKEIN_ASSERT(a.rows() == a.cols());
    const auto n = static_cast<lapack_int>(a.rows());
    if (n == 0) return;
    // The 1-norm of A, for the condition estimate, before the factors overwrite it.
    anorm = a.cwiseAbs().colwise().sum().maxCoeff();
    info = LAPACKE_dgetrf_work(LAPACK_COL_MAJOR, n, n, a.data(), n, ipiv.data());
  }
  Eigen::MatrixXd& lu;
  std::vector<lapack_int> ipiv;
  double anorm = 0.0;
  lapack_int info = 0;  ///< > 0: an exactly zero pivot
};
InPlaceLu::InPlaceLu(Eigen::MatrixXd& a) : impl_(std::make_unique<Impl>(a)) {}
InPlaceLu::~InPlaceLu() = default;
Eigen::MatrixXd InPlaceLu::Solve(const Eigen::MatrixXd& b) const {
  SKEIN_ASSERT(b.rows() == impl_->lu.rows());
  Eigen::MatrixXd x = b;
  const auto n = static_cast<lapack_int>(impl_->lu.rows());
  if (n == 0 || x.cols() == 0) return x;
  const ScopedBlasThreads one(1);
  LAPACKE_dgetrs_work(LAPACK_COL_MAJOR, 'N', n, static_cast<lapack_int>(x.cols()), impl_->lu.data(), n,
                      impl_->ipiv.data(), x.data(), n);
  return x;
}
double InPlaceLu::Rcond() const {
  const auto n = static_cast<lapack_int>(impl_->lu.rows());
  if (n == 0) return 1.0;
  if (impl_->info != 0 || !(impl_->anorm > 0.0)) return 0.0;
  // ||A^-1||_1 by Hager's estimator as refined by Higham (LAPACK's dlacn2, which dgecon drives too), each
  // product with A^-1 or A^-T a dgetrs on the LU factors (one OpenBLAS thread, as Solve): plain triangular
  // solves, where dgecon's overflow-guarded ones (dlatrs) make extra passes over the factors and took 2.5
  // times as long (70 against 28 ms for the two systems of a 4000-panel half model). An overflow gives an
  // infinite estimate, a NaN a NaN: both are reported as a zero reciprocal condition.
  const auto nn = static_cast<std::size_t>(n);
  std::vector<double> v(nn), x(nn);
  std::vector<lapack_int> isgn(nn);
  std::array<lapack_int, 3> isave{};
  double est = 0.0;
  lapack_int kase = 0;
  const ScopedBlasThreads one(1);
  do {
    LAPACKE_dlacn2_work(n, v.data(), x.data(), isgn.data(), &est, &kase, isave.data());
    if (kase != 0)
      LAPACKE_dgetrs_work(LAPACK_COL_MAJOR, kase == 1 ? 'N' : 'T', n, 1, impl_->lu.data(), n, impl_->ipiv.data(),
                          x.data(), n);
  } while (kase != 0);
  if (!(std::isfinite(est) && est > 0.0)) return 0.0;
  return std::min(1.0 / (est * impl_->anorm), 1.0);  // est <= ||A^-1||_1: at most 1 in exact arithmetic
}
const char* InPlaceLu::Backend() { return "OpenBLAS/LAPACKE"; }
#else
struct InPlaceLu::Impl {
  explicit Impl(Eigen::MatrixXd& a) : lu(a) {}
  Eigen::PartialPivLU<Eigen::Ref<Eigen::MatrixXd>> lu;
};
InPlaceLu::InPlaceLu(Eigen::MatrixXd& a) : impl_(std::make_unique<Impl>(a)) {}
InPlaceLu::~InPlaceLu() = default;
Eigen::MatrixXd InPlaceLu::Solve(const Eigen::MatrixXd& b) const { return impl_->lu.solve(b); }
double InPlaceLu::Rcond() const {
  const double r = impl_->lu.rcond();  // NaN after an exactly zero pivot
  return r >= 0.0 ? r : 0.0;
}
const char* InPlaceLu::Backend() { return "Eigen"; }
#endif


const char* BetterBlasKernel() {
#if defined(SKEIN_HAVE_LAPACKE) && defined(__x86_64__)
  if (!openblas_get_corename || std::getenv("OPENBLAS_CORETYPE")) return nullptr;
  const char* name = openblas_get_corename();
  if (!name) return nullptr;
  // OpenBLAS's x86-64 kernel families older than AVX2 (its names, compared without case).
  static const char* const kGeneric[] = {"unknown",  "katmai",  "coppermine", "northwood", "prescott",
                                         "banias",   "atom",    "core2",      "penryn",    "dunnington",
                                         "nehalem",  "athlon",  "opteron",    "opteron_sse3", "barcelona",
                                         "nano",     "sandybridge", "bobcat", "bulldozer", "piledriver"};
  bool generic = false;
  for (const char* g : kGeneric) generic = generic || strcasecmp(name, g) == 0;
  if (!generic) return nullptr;
  __builtin_cpu_init();
  if (__builtin_cpu_supports("avx512f") && __builtin_cpu_supports("avx512cd") && __builtin_cpu_supports("avx512bw") &&
      __builtin_cpu_supports("avx512dq") && __builtin_cpu_supports("avx512vl"))
    return "SkylakeX";
  if (__builtin_cpu_supports("avx2") && __builtin_cpu_supports("fma")) return "Haswell";
#endif
  return nullptr;
}

const char* BlasKernelName() {
#if defined(SKEIN_HAVE_LAPACKE)
  if (openblas_get_corename && openblas_get_corename()) return openblas_get_corename();
#endif
  return "";
}

std::vector<std::pair<std::string, std::string>> BlasRestartSettings() {
  std::vector<std::pair<std::string, std::string>> out;
  if (const char* kernel = BetterBlasKernel()) out.emplace_back("OPENBLAS_CORETYPE", kernel);
  if (openblas_get_num_threads != nullptr && openblas_get_num_threads() > 1 &&
      !std::getenv("OPENBLAS_THREAD_TIMEOUT"))
    out.emplace_back("OPENBLAS_THREAD_TIMEOUT", "4");
  return out;
}

void RestartWithBlasSettings(char** argv) {
#if defined(__linux__)
  const auto settings = BlasRestartSettings();
  if (settings.empty()) return;
  for (const auto& [name, value] : settings) setenv(name.c_str(), value.c_str(), 1);
  execv("/proc/self/exe", argv);
  for (const auto& [name, value] : settings) unsetenv(name.c_str());  // the restart failed: carry on as we are
#else
  (void)argv;
#endif
}

bool LateralSystemNeeded(const Lattice& lat, const std::vector<SystemLayout>& layouts) {
  if (layouts.size() != 2) return false;
  const SystemLayout& sym = layouts[0];
  const SystemLayout& anti = layouts[1];
  constexpr double kTol = 1e-13;
  for (std::size_t k = 0; k < anti.panel.size(); ++k) {
    const std::size_t p = anti.panel[k];
    const int img = anti.image[k];
    if (k >= sym.panel.size() || img < 0) {
      // Its own image: only the antisymmetric system holds it, so any control on it is lateral.
      if (lat.control_of[p] >= 0 && (std::abs(lat.normal_rate.x[p]) > kTol || std::abs(lat.normal_rate.y[p]) > kTol ||
                                     std::abs(lat.normal_rate.z[p]) > kTol))
        return true;
      continue;
    }
    const auto m = static_cast<std::size_t>(img);
    if (lat.control_of[p] != lat.control_of[m]) return true;
    if (lat.control_of[p] < 0) continue;
    if (std::abs(lat.normal_rate.x[p] - lat.normal_rate.x[m]) > kTol ||
        std::abs(lat.normal_rate.y[p] + lat.normal_rate.y[m]) > kTol ||
        std::abs(lat.normal_rate.z[p] - lat.normal_rate.z[m]) > kTol)
      return true;
  }
  return false;
}

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
  // Symmetric flight without lateral derivatives: the longitudinal columns have symmetric right-hand sides
  // (to round-off), so the symmetric system alone gives them.
  if (!options.lateral && out.layouts.size() == 2 && !LateralSystemNeeded(lat, out.layouts)) {
    out.layouts.pop_back();
    out.lateral_solved = false;
  }

  auto t0 = Clock::now();
  std::vector<Eigen::MatrixXd> mats = AssembleInfluence(lat, out.layouts, swake);
  out.seconds_assemble = Since(t0);

  // The right-hand side is the physical onset flow through the physical normals.
  Eigen::MatrixXd rhs = BasisRightHandSides(physical, moment_point);
  const Eigen::Index ncols = rhs.cols();
  out.gamma = Eigen::MatrixXd::Zero(rhs.rows(), ncols);

  // Factorise each system once (in place: no second copy of the matrix), then solve column blocks with it.
  std::vector<std::unique_ptr<InPlaceLu>> lus(out.layouts.size());
  auto solve_columns = [&](Eigen::Index first, Eigen::Index count) {
    const std::size_t nl = out.layouts.size();
    std::vector<Eigen::MatrixXd> b(nl), x(nl);
    std::vector<double> rcond(nl, 1.0);
    std::vector<std::pair<std::size_t, bool>> tasks;  // (system, true: its condition estimate / false: its solve)
    for (std::size_t l = 0; l < nl; ++l) {
      const SystemLayout& lay = out.layouts[l];
      const auto m = static_cast<Eigen::Index>(lay.panel.size());
      out.unknowns = std::max(out.unknowns, lay.panel.size());
      if (m == 0) continue;
      // Right-hand side of this system: the symmetric or antisymmetric part of the full one.
      b[l].resize(m, count);
      for (Eigen::Index i = 0; i < m; ++i) {
        const auto p = static_cast<Eigen::Index>(lay.panel[static_cast<std::size_t>(i)]);
        const int img = lay.image[static_cast<std::size_t>(i)];
        if (lay.kind == SystemLayout::Kind::full || img < 0) {
          b[l].row(i) = rhs.block(p, first, 1, count);
        } else {
          const double s = lay.kind == SystemLayout::Kind::symmetric ? 1.0 : -1.0;
          b[l].row(i) = 0.5 * (rhs.block(p, first, 1, count) + s * rhs.block(img, first, 1, count));
        }
      }
      if (!lus[l]) {
        t0 = Clock::now();
        lus[l] = std::make_unique<InPlaceLu>(mats[l]);  // dgetrf on every thread
        out.seconds_factorise += Since(t0);
        tasks.emplace_back(l, true);
      }
      tasks.emplace_back(l, false);
    }
    // The condition estimates (they use the factors, as the solves do: timed with them) and the solves are
    // independent tasks on one OpenBLAS thread each, run side by side on the OpenMP threads: a task's
    // arithmetic is the same whichever thread takes it, so the bits do not depend on the thread count.
    t0 = Clock::now();
    {
      const ScopedBlasThreads one(1);  // here, not inside the tasks: they would restore each other's setting
      const auto ntasks = static_cast<std::ptrdiff_t>(tasks.size());
#pragma omp parallel for schedule(dynamic, 1)
      for (std::ptrdiff_t t = 0; t < ntasks; ++t) {
        const auto [l, condition] = tasks[static_cast<std::size_t>(t)];
        if (condition)
          rcond[l] = lus[l]->Rcond();
        else
          x[l] = lus[l]->Solve(b[l]);
      }
    }
    out.seconds_solve += Since(t0);
    for (std::size_t l = 0; l < nl; ++l) {
      const SystemLayout& lay = out.layouts[l];
      out.rcond = std::min(out.rcond, rcond[l]);
      for (Eigen::Index i = 0; i < x[l].rows(); ++i) {
        const auto p = static_cast<Eigen::Index>(lay.panel[static_cast<std::size_t>(i)]);
        const int img = lay.image[static_cast<std::size_t>(i)];
        out.gamma.block(p, first, 1, count) += x[l].row(i);
        if (lay.kind != SystemLayout::Kind::full && img >= 0) {
          const double s = lay.kind == SystemLayout::Kind::symmetric ? 1.0 : -1.0;
          out.gamma.block(img, first, 1, count) += s * x[l].row(i);
        }
      }
    }
    // Without the antisymmetric system the lateral columns (v, roll and yaw rates; antisymmetric right-hand
    // sides) are not solved: leave them zero rather than the symmetric part of nothing.
    if (!out.lateral_solved)
      for (Eigen::Index col = first; col < first + count; ++col)
        if (col % kBasisSize == 1 || col % kBasisSize == 3 || col % kBasisSize == 5) out.gamma.col(col).setZero();
  };
  solve_columns(0, kBasisSize);
  if (!(out.rcond >= kSingularRcond)) {
    out.status = SolveStatus::singular;
    out.message = fmt::format(
        "the influence system is singular (reciprocal condition {:.2g}): look for coincident or intersecting "
        "surfaces, degenerate panels or a control point lying on a vortex line",
        out.rcond);
    return out;
  }

  // Velocities induced at the control points by each surface for the six basis columns (the downwash one
  // surface sees from another), and what the controls need: a deflection turns the normals, A_ij = n_i . v_j
  // changes with them, and differentiating n_i . (V_onset + sum_j Gamma_j v_j) = 0 gives
  //     A dGamma/d delta = -(d n_i / d delta) . (V_onset(P_i) + v_induced(P_i)),
  // the whole local velocity, not the onset alone (in the plane of a flat panel the induced part vanishes, so
  // it matters on dihedral, non-planar and deflected configurations).
  const std::size_t nsurf = physical.surfaces.size();
  const std::size_t ncontrols = physical.controls.size();
  if (nsurf > 1 || ncontrols > 0) {
    t0 = Clock::now();
    const auto n = static_cast<Eigen::Index>(physical.panels());
    Eigen::MatrixXd by_surface = Eigen::MatrixXd::Zero(n, static_cast<Eigen::Index>(kBasisSize * nsurf));
    for (Eigen::Index i = 0; i < n; ++i) {
      const auto s = static_cast<Eigen::Index>(physical.surface[static_cast<std::size_t>(i)]);
      by_surface.block(i, kBasisSize * s, 1, kBasisSize) = out.gamma.block(i, 0, 1, kBasisSize);
    }
    // Only the rows something reads: the control panels (below) and the surfaces whose downwash from the
    // surfaces ahead is reported (loads.cpp, SurfacesAhead); the other rows stay zero.
    const std::vector<std::vector<int>> ahead = SurfacesAhead(physical);
    std::vector<bool> rows(physical.panels(), false);
    for (std::size_t i = 0; i < physical.panels(); ++i)
      rows[i] = physical.control_of[i] >= 0 || !ahead[static_cast<std::size_t>(physical.surface[i])].empty();
    out.control_point_velocity = InducedVelocityAt(lat, lat.control, by_surface, swake, &rows);
    out.control_point_velocity.u /= beta;  // back to physical axes, as for the bound velocities below
    out.seconds_velocity += Since(t0);
  }
  if (ncontrols > 0) {
    for (Eigen::Index i = 0; i < rhs.rows(); ++i) {
      const auto p = static_cast<std::size_t>(i);
      const int m = physical.control_of[p];
      if (m < 0) continue;
      const Vec3 dn = physical.normal_rate[p];
      for (int k = 0; k < kBasisSize; ++k) {
        Vec3 v{0.0, 0.0, 0.0};
        for (std::size_t s = 0; s < nsurf; ++s) {
          const auto col = static_cast<Eigen::Index>(kBasisSize * s) + k;
          v = v + Vec3{out.control_point_velocity.u(i, col), out.control_point_velocity.v(i, col),
                       out.control_point_velocity.w(i, col)};
        }
        rhs(i, kBasisSize * (1 + m) + k) -= Dot(dn, v);
      }
    }
    solve_columns(kBasisSize, ncols - kBasisSize);
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
  // Only where some column's circulation is nonzero: a panel with none carries no load whatever the velocity
  // there (the centre-line fin when only the symmetric system was solved), and its velocities stay zero.
  std::vector<bool> loaded(lat.panels());
  for (std::size_t i = 0; i < lat.panels(); ++i)
    loaded[i] = !(out.gamma.row(static_cast<Eigen::Index>(i)).array() == 0.0).all();
  out.bound_velocity = InducedVelocityAt(lat, mid, out.gamma, swake, &loaded);
  out.bound_velocity.u /= beta;  // u = d(phi)/dx = (d(phi)/dx') / beta
  out.trefftz_kernel = TrefftzKernel(physical, wake);  // in the physical axes, as ComputeLoads reads it
  out.seconds_velocity += Since(t0);
  return out;
}

}  // namespace skein
