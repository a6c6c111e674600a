// Skein: the whole pipeline for one case, mesh -> assemble -> solve -> loads, every flight point of its sweep.
//
//   skein::Case c = skein::ReadCaseFile("cases/survey_drone.toml");
//   skein::Results r = skein::Run(c, {});
//
// Points that share a wake geometry (all of them with wake = "x-axis"; those with the same alpha and beta
// otherwise) share one assembly and one factorisation.
#pragma once

#include <cstddef>
#include <functional>
#include <vector>

#include "skein/case.hpp"
#include "skein/lattice.hpp"
#include "skein/loads.hpp"
#include "skein/results.hpp"
#include "skein/solver.hpp"

namespace skein {

/// What Run is about to do, known once the mesh is built and before the assembly (the long work) starts.
struct RunPlan {
  std::size_t panels = 0;
  std::size_t unknowns = 0;        ///< size of the largest linear system
  bool half_model = false;         ///< the symmetric/antisymmetric split of a mirror-symmetric case
  bool lateral = true;             ///< false: the antisymmetric system is skipped (RunOptions::lateral)
  int factorisations = 0;          ///< one per wake geometry
  int threads = 1;                 ///< OpenMP threads
  std::size_t memory_estimate_bytes = 0;  ///< peak memory of the solve (EstimateMemoryBytes)
};

struct RunOptions {
  int threads = 0;               ///< OpenMP threads; 0 = the OpenMP default (all cores)
  bool allow_half_model = true;  ///< false forces the full lattice (tests compare the two)
  std::size_t max_panels = 0;    ///< refuse a mesh with more panels; 0 = limited by memory only
  std::size_t memory_limit_bytes = 0;  ///< refuse a mesh needing more; 0 = the machine's physical memory
  /// false: in symmetric flight (no sideslip, no roll or yaw rate at any point of the sweep) skip the lateral
  /// stability derivatives (beta, p, r): a half-model case whose controls all deflect symmetrically then
  /// assembles and factorises its symmetric half system only. Ignored when some point is not symmetric.
  bool lateral = true;
  /// Called once, before the assembly, with what the run will do and the memory it will need (the library
  /// prints nothing; the command line shows it).
  std::function<void(const RunPlan&)> on_plan;
};

/// Bytes the solve of a case with this many panels needs at its peak (the influence matrix dominates).
std::size_t EstimateMemoryBytes(std::size_t panels, std::size_t controls, bool half_model);

/// The same for linear systems of the given sizes (one entry per matrix held at once).
std::size_t EstimateMemoryBytes(std::size_t panels, std::size_t controls, const std::vector<std::size_t>& systems);

/// The machine's physical memory in bytes (0 if unknown).
std::size_t PhysicalMemoryBytes();

/// The wake geometry of a flight point.
WakeGeometry WakeFor(const Case& c, double alpha_deg, double beta_deg);

/// Runs every flight point of the case. Throws InputError for a case that cannot be meshed or is too large,
/// NumericalError when the system is singular or the result is not finite.
Results Run(const Case& c, const RunOptions& options);

}  // namespace skein
