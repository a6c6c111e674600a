// Skein: the flow-field probe, the velocity of the air at points the user names (where a tail, a propeller, a
// pitot boom or a sensor would go), from the solved circulations.
//
//   skein::ProbeSample s = skein::SampleProbes(lat, basis, c.probes);          // once per wake geometry
//   std::vector<skein::ProbeResult> r = skein::EvaluateProbes(s, c.reference.moment_point, fp);  // per point
//   // r[0].velocity = (u, v, w) / V, r[0].downwash_deg, r[0].sidewash_deg, r[0].q_ratio
//
// Velocity. The local velocity at P, per unit airspeed V, in geometry axes (conventions.md: x aft, y right,
// z up), is the onset flow plus the velocity the lattice induces, both linear in the six flow parameters c of
// the flight point (solver.hpp):
//     V(P) / V = sum_k c_k (e_k(P) + v_k(P)),
// e_k the unit onset fields (BasisOnset: freestream and the body rotation about the moment point) and v_k the
// velocity induced by the basis circulations (every horseshoe of the full lattice, both halves of a mirrored
// surface, and their images in a ground plane). v_k is computed as the solver computes the velocities at the
// bound-vortex midpoints for the loads: InducedVelocityAt (influence.hpp) with the same regularised kernel,
// and for Mach > 0 on the Prandtl-Glauert lattice (StretchForCompressibility: x / beta) at the point
// (x / beta, y, z), the induced u mapped back as u / beta. At a control point, then, V . n = 0 to the
// solver's round-off.
//
// Angles (conventions.md defines the wind axes d, l, s = l x d but no probe angles; these are Skein's):
//     downwash  epsilon = atan2(-V . l, V . d),  positive when the local flow is turned down (toward -l) from
//                         the freestream, in the plane of d and l: a tail there sees alpha - epsilon;
//     sidewash  sigma   = atan2( V . s, V . d),  positive when it is turned toward +s (toward the right wing at
//                         beta = 0), in the plane of d and s: a fin there sees the sideslip beta - sigma.
// Both are of the whole local velocity: with zero rates they are the turning by the induced flow alone, with
// rates the rotation of the onset flow at P is included (what a vane at P would read).
// Dynamic pressure ratio q / q_inf = |V(P)|^2 / V^2 (the density change of compressible flow is not included).
//
// Vortex cores. Near a discrete vortex line the velocity grows like 1/h and then, inside the core, falls to
// zero with the kernel's regularisation (biot_savart.hpp): a number there says nothing about the flow. A probe
// within kProbeCoreRadii core radii of any bound segment, trailing leg or ground image of the lattice gets no
// values, `in_core` and a note naming the segment. Outside the cores the regularisation changes the nearest
// segment's velocity by less than 1 / (1 + kProbeCoreRadii^4). Near a wake sheet the discrete trailing legs
// stand for the continuous sheet only at distances the spanwise mesh resolves (more than about a strip width),
// as for a tail's control points (biot_savart.hpp).
#pragma once

#include <string>
#include <vector>

#include "skein/case.hpp"
#include "skein/influence.hpp"
#include "skein/lattice.hpp"
#include "skein/loads.hpp"
#include "skein/results.hpp"
#include "skein/solver.hpp"

namespace skein {

/// A probe this many core radii (Lattice::core4) or closer to a vortex segment gets no values. At 3 the
/// regularisation has removed 1.2 % of that segment's velocity (1 / (1 + 3^4)); closer in it soon dominates
/// and the velocity falls to zero on the line. The solver itself uses velocities this close (a narrow strip's
/// control point next to a wider strip's leg lies at about 3.3 of that leg's core radii in a cosine mesh), and
/// the geometry check refuses a control point only inside one core radius (geometry_check.hpp).
inline constexpr double kProbeCoreRadii = 3.0;

/// The flow-basis velocities at a set of points, for one wake geometry (one BasisSolution).
struct ProbeSample {
  std::vector<Probe> probes;
  /// Induced velocity per unit c_k at each probe, physical axes: probes x kBasisSize.
  InducedVelocity induced;
  /// Per probe: empty, or the vortex segment whose core it lies in (then it gets no values).
  std::vector<std::string> core;
};

/// Velocity induced at the physical points by the basis circulations of `basis` (the first kBasisSize
/// columns), in physical axes: points x kBasisSize. Mirrored halves and ground images are included; for
/// Mach > 0 the Prandtl-Glauert mapping of SolveBasis is applied.
InducedVelocity InducedVelocityOfBasis(const Lattice& lat, const BasisSolution& basis, const PointArray& points);

/// Samples the probes for one wake geometry: the basis velocities and the vortex-core check.
ProbeSample SampleProbes(const Lattice& lat, const BasisSolution& basis, const std::vector<Probe>& probes);

/// The probes' flow at one flight point (velocity, downwash, sidewash, dynamic-pressure ratio), one result per
/// probe, in order. A probe in a vortex core has no values and its note says why.
std::vector<ProbeResult> EvaluateProbes(const ProbeSample& sample, const Vec3& moment_point, const FlightPoint& fp);

/// Parses a command-line probe, `NAME=X,Y,Z` (metres, geometry axes), e.g. `pitot=-0.4,0,0.05`. Throws
/// InputError with a one-line message that starts with `--probe`.
Probe ParseProbeArgument(const std::string& text);

/// Appends a probe given on the command line to the case, after the checks the reader makes of a [[probe]]
/// table (a name not used by another probe; a point above the ground plane). Throws InputError.
void AddProbe(Case& c, Probe p);

}  // namespace skein
