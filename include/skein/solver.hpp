// Skein stage 4, solve: influence matrices -> circulations, factorised once, many right-hand sides.
//
// The boundary condition at control point i is (V_onset(P_i) + v_induced(P_i)) . n_i = 0. The onset velocity is
// linear in six flow parameters c = (V_inf / V, omega / V) (conventions.md: V_onset = V_inf - omega x (r - r_ref)),
// so the circulation is Gamma = G c with G the solutions for six unit onset fields: the "flow basis". Every point
// of a sweep, every derivative and every trim iteration is a combination of these columns; the matrices are
// assembled and factorised once per wake geometry. Control derivatives add, per control, six columns solved
// with the normal's derivative d n / d delta in place of n on the right-hand side.
#pragma once

#include <cstddef>
#include <memory>
#include <string>
#include <utility>
#include <vector>

#include <Eigen/Core>

#include "skein/influence.hpp"
#include "skein/lattice.hpp"

namespace skein {

/// The six unit onset fields, in this order: u, v, w (uniform flow along x, y, z) and the rotations about the
/// geometry axes x, y, z (onset -e_k x (r - r_ref)).
inline constexpr int kBasisSize = 6;

/// How a solve ended (a numerical outcome is a status, not an exception).
enum class SolveStatus {
  ok,
  ill_conditioned,  ///< solved, but the reciprocal condition estimate is below kIllConditionedRcond
  singular,         ///< the matrix is singular (or nearly so): no result
  non_finite,       ///< a non-finite value appeared: no result
};
std::string ToString(SolveStatus s);

/// Below this reciprocal condition number the result is flagged: round-off may then reach 1e-6 of the answer.
inline constexpr double kIllConditionedRcond = 1e-10;
/// Below this, the system is treated as singular.
inline constexpr double kSingularRcond = 1e-14;

struct SolverOptions {
  int threads = 0;           ///< OpenMP threads for assembly and loads; 0 = the OpenMP default
  bool allow_half_model = true;  ///< false forces the full lattice even for a mirror-symmetric configuration
  /// false: the caller needs only the longitudinal columns (u, w and the pitch rate, of the basis and of every
  /// control), as in symmetric flight without lateral derivatives. With the half model and controls that all
  /// deflect symmetrically (LateralSystemNeeded), the antisymmetric system is then neither assembled nor
  /// factorised, and the lateral columns (v, roll and yaw rates) of `gamma` are left zero.
  bool lateral = true;
};

/// LU factorisation with partial pivoting of a square matrix, in place: the matrix passed in is overwritten by
/// its factors and must outlive this object (no second copy of it). The factorisation SolveBasis uses:
/// OpenBLAS dgetrf (and dgetrs, dlacn2) through LAPACKE in a build with SKEIN_USE_OPENBLAS, Eigen's own
/// PartialPivLU otherwise.
class InPlaceLu {
 public:
  explicit InPlaceLu(Eigen::MatrixXd& a);
  ~InPlaceLu();
  InPlaceLu(const InPlaceLu&) = delete;
  InPlaceLu& operator=(const InPlaceLu&) = delete;
  /// A^-1 b. With OpenBLAS, on one of its threads: the bits then do not depend on the thread count (its
  /// threaded triangular solves split the columns differently), and the few right-hand sides of a basis (six
  /// per flow field and control) gain little from more.
  Eigen::MatrixXd Solve(const Eigen::MatrixXd& b) const;
  double Rcond() const;  ///< reciprocal condition estimate in the 1-norm; 0 after an exactly zero pivot
  /// "OpenBLAS/LAPACKE" or "Eigen": what factorises in this build.
  static const char* Backend();

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

/// Sets OpenBLAS's thread count for its lifetime and restores it after (a no-op without OpenBLAS).
class ScopedBlasThreads {
 public:
  explicit ScopedBlasThreads(int n);
  ~ScopedBlasThreads();
  ScopedBlasThreads(const ScopedBlasThreads&) = delete;
  ScopedBlasThreads& operator=(const ScopedBlasThreads&) = delete;

 private:
  int previous_ = 0;
};

/// OpenBLAS chooses its kernels from the processor's model number when it loads. Under some hypervisors the
/// model is hidden and it falls back to a generic SSE3 kernel (measured on a 2-core Xeon guest: dgetrf at
/// N = 4000 in 1.9 s instead of 0.5 s). When that happened and OPENBLAS_CORETYPE is not set, returns the
/// kernel family the processor's instruction set supports ("SkylakeX" with AVX-512 F/CD/BW/DQ/VL, "Haswell"
/// with AVX2 and FMA), for a program to restart itself with OPENBLAS_CORETYPE set before OpenBLAS loads;
/// nullptr otherwise, and in a build without OpenBLAS.
const char* BetterBlasKernel();
/// The kernel family OpenBLAS runs ("SkylakeX", "Haswell", "Prescott", ...), or "" without OpenBLAS.
const char* BlasKernelName();

/// The environment OpenBLAS reads only when it loads that this process would run better with, as (name,
/// value) pairs; empty when there is nothing to change (or no OpenBLAS):
/// - OPENBLAS_CORETYPE = BetterBlasKernel(), when that names a kernel;
/// - OPENBLAS_THREAD_TIMEOUT = 4 (its smallest, 2^4 cycles) when OpenBLAS runs more than one thread and the
///   variable is not set: its idle workers then sleep at once instead of yield-spinning for about 2^28 cycles
///   after every call, taking turns on the cores with the OpenMP threads of the assembly and velocity passes
///   (measured on 2 cores: a 20-point half-model sweep 0.51 s instead of 0.58 s, medians of 6).
/// A variable the user has set is never changed.
std::vector<std::pair<std::string, std::string>> BlasRestartSettings();

/// For a program's main, first thing: when BlasRestartSettings() is not empty, sets those variables and
/// replaces the process by the same program with the same arguments (Linux: /proc/self/exe), so that OpenBLAS
/// loads with them (a few milliseconds). Returns only when there is nothing to do or the restart failed (the
/// program then runs on as it is). The variables, once set, stop a second restart.
void RestartWithBlasSettings(char** argv);

/// Circulations of the flow basis on the full lattice, and the velocities they induce at the bound-vortex
/// midpoints (what the Kutta-Joukowski loads need).
struct BasisSolution {
  WakeGeometry wake;  ///< in physical (unstretched) axes
  double mach = 0.0;
  std::vector<SystemLayout> layouts;
  /// Columns: the six flow-basis fields, then six per control (control m: columns 6 (m + 1) .. 6 (m + 1) + 5,
  /// the derivative of the basis circulations with respect to that control's deflection, per radian).
  Eigen::MatrixXd gamma;  ///< panels x columns
  /// At the bound-vortex midpoints, panels x columns; zero at a panel whose circulation is zero in every column
  /// (its loads are zero whatever the velocity there).
  InducedVelocity bound_velocity;
  /// The Trefftz-plane kernel of the wake (TrefftzKernel, loads.hpp), strips x strips; empty when not solved.
  Eigen::MatrixXd trefftz_kernel;
  /// Velocity induced at the control points by each surface alone, for the six basis columns: column
  /// 6 s + k holds surface s's share of basis field k (panels x 6 surfaces). Empty for a single surface
  /// without controls. The downwash a surface sees from the others is a sum of these blocks. Computed only
  /// at the control panels and on the surfaces that have a surface ahead (SurfacesAhead); elsewhere zero.
  InducedVelocity control_point_velocity;
  double rcond = 1.0;   ///< smallest reciprocal condition estimate (1-norm) of the systems factorised
  SolveStatus status = SolveStatus::ok;
  std::string message;  ///< what went wrong, naming the likely cause, when status != ok
  std::size_t unknowns = 0;  ///< size of the largest system factorised
  bool lateral_solved = true;  ///< false: the lateral columns were not solved (SolverOptions::lateral)
  double seconds_assemble = 0.0, seconds_factorise = 0.0, seconds_solve = 0.0, seconds_velocity = 0.0;
};

/// True when the longitudinal columns of a half-model solve need the antisymmetric system: some control
/// deflects the two halves differently (an aileron, say) or turns the normals of panels in the plane y = 0 (a
/// rudder). Elevators and flaps on mirrored halves do not. `layouts` as ChooseLayouts returns them.
bool LateralSystemNeeded(const Lattice& lat, const std::vector<SystemLayout>& layouts);

/// Onset velocity of basis field k (0..5) at point r, for the moment point r_ref.
Vec3 BasisOnset(int k, const Vec3& r, const Vec3& r_ref);

/// Right-hand sides for the flow basis and the controls on the full lattice: panels x (6 + 6 controls),
/// b_ik = -e_k(P_i) . n_i, and for control m the onset part -e_k(P_i) . (d n_i / d delta_m) of its columns
/// (SolveBasis adds the induced part, -(d n_i / d delta_m) . v_k(P_i), once the basis columns are known).
Eigen::MatrixXd BasisRightHandSides(const Lattice& lat, const Vec3& moment_point);

/// The lattice of the Prandtl-Glauert (Goethert) analogy: every x coordinate divided by beta = sqrt(1 - M^2),
/// core radii recomputed, and normals replaced by (n_x / beta, n_y, n_z) so that n . grad(phi) of the
/// compressible flow equals the stretched incompressible one's. beta = 1 returns the lattice unchanged.
Lattice StretchForCompressibility(const Lattice& lat, double beta);

/// Assembles, factorises and solves every column for one wake geometry at Mach number `mach` (0 <= mach < 1).
/// Compressibility by the Prandtl-Glauert transformation (Goethert's rule): the incompressible problem is solved
/// on the geometry stretched by 1/beta in x with the physical onset flow on the right-hand side; circulations
/// carry over unchanged and the induced velocity maps back as (u / beta, v, w). The loads stage then works on
/// the physical lattice as at Mach 0.
BasisSolution SolveBasis(const Lattice& lat, const Vec3& moment_point, const WakeGeometry& wake,
                         const SolverOptions& options, double mach = 0.0);

}  // namespace skein
