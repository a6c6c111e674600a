// Skein: dimensional spanwise loads for structures, shear force and bending moment along each surface.
//
// From the strip normal forces of a flight point (the Kutta-Joukowski forces of a strip's panels, resolved on
// the strip's normal; loads.hpp), made dimensional with rho V^2 (the loads stage works at rho = V = 1):
//     N_m = rho V^2 (cl_m c_m w_m / 2),   F_m = N_m n_m,
// at each station k (the inboard edge of strip k, on its quarter-chord line, point P_k), with everything
// outboard of it:
//     shear    S_k = sum_{m >= k} F_m . n_k,
//     bending  M_k = sum_{m >= k} ((r_m - P_k) x F_m) . e_x,   r_m the strip's quarter-chord midpoint,
// so M is the moment about the axis through the station parallel to x (the usual root-bending axis of a
// conceptual design; for a swept surface the moment about a swept spar axis mixes this with torsion, which is
// not given here). Positive shear and bending go with positive normal force (lift, on a wing). For a symmetric
// surface the tables are of the given (right) half, and the root values of the mirrored half are added.
// The strip's chordwise forces (induced drag, leading-edge suction) are not part of the shear; they give no
// moment about x on an untwisted surface.
#pragma once

#include "skein/lattice.hpp"
#include "skein/results.hpp"

namespace skein {

/// Fills SurfaceLoads::structural of every surface of `point`, computed from its strips (the point must come
/// from ComputeLoads on `lat`). density kg/m^3, speed m/s (true airspeed), both > 0.
void AddStructuralLoads(const Lattice& lat, double density, double speed, PointResult& point);

}  // namespace skein
