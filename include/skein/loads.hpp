// Skein stage 5, loads: circulations -> forces, moments, Trefftz-plane drag, strips and derivatives.
//
// Near field: the Kutta-Joukowski force on each bound segment, F_i = rho Gamma_i (V_onset + v_induced) x (b - a),
// with the full local velocity at the segment's midpoint. Far field: the induced drag in the Trefftz plane,
//     D = -(rho / 2) sum_m Gamma_m  w(P_m) . (d x (TB_m - TA_m)),
// with Gamma_m a strip's circulation, P_m the midpoint of its wake segment and w the two-dimensional velocity
// of the surface's own vortex pairs there (the discrete form of D = (rho/2) int Gamma(s) w_n ds); the
// vortices of other surfaces enter through the exact integral of their normal velocity along the segment, so
// that a tail's wake close to the wing's does not make the drag jump with the mesh (loads.cpp).
// All of it is computed for V = 1 and rho = 1; coefficients divide by q = 1/2 and S_ref.
//
// Every quantity is a bilinear function of the flow parameters c (solver.hpp), so the derivatives are exact
// derivatives of the discrete forces with respect to alpha, beta, the rates and the controls, the axes turning
// with alpha and beta as conventions.md defines them (the wake is held in place).
//
// Neutral point: x_np = x_ref - c_ref Cm_alpha / CZ_alpha, CZ_alpha the alpha derivative of the force along
// geometry z over q S. It is the point on the line through the moment point parallel to x about which Cm does
// not change with alpha, so it is exactly independent of the moment point's x and y; conventions.md's
// CL_alpha in the denominator agrees to first order in alpha. Static margin = (x_np - x_ref) / c_ref.
#pragma once

#include <vector>

#include "skein/case.hpp"
#include "skein/lattice.hpp"
#include "skein/results.hpp"
#include "skein/solver.hpp"

namespace skein {

struct FlightPoint {
  double alpha_deg = 0.0, beta_deg = 0.0, mach = 0.0;
  Vec3 rates{0.0, 0.0, 0.0};  ///< body rates p, q, r, rad/s
  double speed = 1.0;         ///< m/s, only to make the rates non-dimensional
};

/// The six flow parameters c = (V_inf/V, omega/V) of a flight point (omega in geometry axes, rad/m).
std::array<double, kBasisSize> FlowParameters(const FlightPoint& fp);

/// Induced drag of the wake in the Trefftz plane, per strip, for strip circulations `strip_gamma` (V = rho = 1):
/// D_m = -(1/2) Gamma_m w(P_m) . (d x (TB_m - TA_m)). The sum over strips is the total.
std::vector<double> TrefftzDrag(const Lattice& lat, const std::vector<double>& strip_gamma,
                                const WakeGeometry& wake);

/// The Trefftz-plane kernel K of the lattice's wake (strips x strips): D_m = -(1/2) Gamma_m (K Gamma)_m, the
/// drag TrefftzDrag reports. It depends on the geometry and the wake only, so a sweep computes it once.
Eigen::MatrixXd TrefftzKernel(const Lattice& lat, const WakeGeometry& wake);
/// TrefftzDrag with a kernel from TrefftzKernel.
std::vector<double> TrefftzDrag(const Eigen::MatrixXd& kernel, const std::vector<double>& strip_gamma);

/// For each surface, the surfaces "ahead" of it whose downwash it reports (SurfaceLoads::downwash_deg): those
/// whose area-weighted mean bound-vortex x is smaller (further forward). Indices into Lattice::surfaces.
std::vector<std::vector<int>> SurfacesAhead(const Lattice& lat);

/// Loads, coefficients and derivatives of one flight point.
PointResult ComputeLoads(const Lattice& lat, const Reference& ref, const BasisSolution& basis,
                         const FlightPoint& fp);

}  // namespace skein
