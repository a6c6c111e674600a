// Skein stage 3, assemble: Lattice -> influence matrices (Biot-Savart kernels in biot_savart.hpp).
//
// Entry (i, j) is the normal velocity at control point i induced by a unit circulation on horseshoe j:
//     A_ij = n_i . v_j(P_i).
// A configuration that is its own mirror image (lattice.geometry_symmetric, a wake with no sideways component,
// mirror-symmetric normals) is split exactly into a symmetric and an antisymmetric half problem: for given-half
// panels i, j with mirrors m(i), m(j),
//     A_sym(i, j)  = A(i, j) + A(i, m(j)),     A_anti(i, j) = A(i, j) - A(i, m(j)),
// each of half the size (an eighth of the factorisation work each). A panel on the plane y = 0 (a centre-line
// fin) carries no symmetric load, so it belongs to the antisymmetric system only, without an image. Both
// matrices come out of one pass over the kernel. A ground plane adds to every horseshoe its image in the plane
// z = height_z with the circulation reversed (equivalently: reflected points, reversed order, same sign).
#pragma once

#include <cstddef>
#include <vector>

#include <Eigen/Core>

#include "skein/case.hpp"
#include "skein/lattice.hpp"

namespace skein {

/// Everything about the flow that fixes the matrix: the direction of the trailing legs and the ground plane.
struct WakeGeometry {
  Vec3 direction{1.0, 0.0, 0.0};  ///< unit vector along the trailing legs
  Ground ground;
};

/// Which lattice panels are the unknowns of a linear system.
struct SystemLayout {
  enum class Kind { full, symmetric, antisymmetric };
  Kind kind = Kind::full;
  std::vector<std::size_t> panel;  ///< lattice index of each unknown
  std::vector<int> image;          ///< lattice index of its mirror image (-1: none)
};

/// The layouts used for a lattice under a wake: {full}, or {symmetric, antisymmetric} when the half-model split
/// is exact (see above). `allow_split` = false forces the full model (tests compare the two).
std::vector<SystemLayout> ChooseLayouts(const Lattice& lat, const WakeGeometry& wake, bool allow_split = true);

/// Assembles the matrices of the given layouts (one, the symmetric/antisymmetric pair, or the symmetric one of
/// the pair alone) in one pass.
/// OpenMP over columns (column-major storage); every entry is computed independently, so the result does not
/// depend on the number of threads.
std::vector<Eigen::MatrixXd> AssembleInfluence(const Lattice& lat, const std::vector<SystemLayout>& layouts,
                                               const WakeGeometry& wake);

/// Velocity induced at the points (x, y, z) by every horseshoe of the lattice carrying the circulations in the
/// columns of `gamma` (panels x K). Returns u, v, w as (points x K) matrices. Ground images are included.
/// OpenMP over points; the sum over horseshoes runs in one fixed order, so results do not depend on threads.
struct InducedVelocity {
  Eigen::MatrixXd u, v, w;
};
/// `only` (one flag per point), when given, limits the work to the points flagged: the rows of the others are
/// zero, except the mirror images of flagged points on the mirror path, which come for free.
InducedVelocity InducedVelocityAt(const Lattice& lat, const PointArray& points, const Eigen::MatrixXd& gamma,
                                  const WakeGeometry& wake, const std::vector<bool>* only = nullptr);

/// True when InducedVelocityAt takes its mirror path for these arguments: `points` holds one point per panel,
/// and the lattice, the points and the wake are bit-exact mirror images of themselves (every mirrored panel's
/// horseshoe and point reflect its given panel's, unpaired panels lie in the plane y = 0, the trailing legs
/// have no sideways component). The horseshoes are then evaluated at the given half's points only and the
/// velocities at the mirrored points follow by reflection (influence.cpp); the answer is the same to
/// round-off, the work about half.
bool InducedVelocityUsesMirror(const Lattice& lat, const PointArray& points, const WakeGeometry& wake);

/// Instruction sets the assembly and velocity kernels are compiled for (x86-64 with GCC or Clang; elsewhere
/// only the baseline). The fastest one the processor has is used.
enum class KernelIsa { baseline, avx2, avx512 };
/// The instruction set the kernels run on now.
KernelIsa KernelIsaInUse();
/// Caps the instruction set at `cap` (never above what the processor has) for every later call, so that tests
/// and benchmarks can run each compiled path on one machine. Returns the set now in use.
KernelIsa CapKernelIsa(KernelIsa cap);
/// "baseline", "avx2" or "avx512".
const char* KernelIsaName(KernelIsa isa);

/// Asks the operating system to back a large matrix with transparent huge pages before its first touch (Linux,
/// where they are enabled on request): the first writes then fault 2 MiB pages instead of 4 KiB ones and the
/// factorisation walks the matrix with far fewer TLB misses. Only the aligned interior is advised; the memory
/// used is the same. Elsewhere, or if the system declines, nothing changes. AssembleInfluence calls it.
void AdviseHugePages(Eigen::MatrixXd& m);

}  // namespace skein
