// Skein: Results, the plain data every reporter formats (results-format.md is the JSON contract).
// Coefficients use the configuration's reference quantities; angles in degrees; derivatives per radian or per
// unit non-dimensional rate (p b/2V, q c/2V, r b/2V).
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "skein/case.hpp"

namespace skein {

/// An ordered list of named values: the order is the order of output, and new names can be added freely.
struct NamedValues {
  std::vector<std::pair<std::string, double>> items;
  void Set(const std::string& name, double v);
  std::optional<double> Get(const std::string& name) const;
};

/// Strip loads across a surface: left tip to right tip for a symmetric surface, first section to last otherwise.
struct StripLoads {
  std::vector<double> y, z;            ///< m, the strip's quarter-chord midpoint
  std::vector<double> chord;           ///< m
  std::vector<double> gamma;           ///< Gamma / V, m (the strip's circulation per unit airspeed)
  std::vector<double> cl;              ///< sectional normal-force coefficient
  std::vector<double> cl_c_over_cref;  ///< span loading cl c / c_ref
};

/// Dimensional shear force and bending moment along one half of a surface (structural.hpp), from the strips'
/// normal forces at the case's speed and density. Stations run from the root (first) to the tip (last), at the
/// strip edges; the tip values are zero.
struct StructuralLoads {
  std::vector<double> station;     ///< m, distance from the root along the span, in the yz plane
  std::vector<double> shear_N;     ///< N, normal force of everything outboard, along the station's normal
  std::vector<double> bending_Nm;  ///< N m, moment of everything outboard about the x-parallel axis there
  double root_shear_N = 0.0, root_bending_Nm = 0.0;
  /// The mirrored (left) half of a symmetric surface, which differs in sideslip, roll or with an aileron.
  std::optional<double> mirrored_root_shear_N, mirrored_root_bending_Nm;
};

/// Strip-theory section data of a surface's strips (profile_drag.hpp), in the order of StripLoads.
struct StripSectionLoads {
  std::vector<double> cd_profile;  ///< section profile drag coefficient
  std::vector<double> reynolds;    ///< V c / nu (0 when the speed is not given)
  std::vector<double> cl_max;      ///< section maximum lift (empty unless every strip of the surface has one)
};

struct SurfaceLoads {
  std::string name;
  double CL = 0.0, CD_induced = 0.0, CD_induced_nearfield = 0.0, CY = 0.0, Cl = 0.0, Cm = 0.0, Cn = 0.0;
  StripLoads strips;
  /// Load coefficient of each panel, Delta Cp = (F . n) / (q A): the Kutta-Joukowski force along the panel
  /// normal over dynamic pressure and panel area (positive pushes along n: lift on a wing). In lattice order,
  /// panel Lattice::surfaces[s].first_panel + k at index k. For plots; not in the JSON document.
  std::vector<double> panel_delta_cp;
  std::optional<StructuralLoads> structural;  ///< present when the case gives a speed
  std::optional<double> CD_profile;           ///< the surface's share of PointResult::profile->CD_profile
  std::optional<StripSectionLoads> sections;  ///< present with profile drag
  /// Downwash from the surfaces ahead: the angle (deg) by which the velocity they induce at this surface's
  /// control points turns the local flow down, away from the freestream, in the plane of the drag and lift
  /// directions, averaged over the control points weighted by panel area; and its derivative with respect to
  /// alpha (d epsilon / d alpha, per radian per radian). "Ahead" means an area-weighted mean quarter-chord x
  /// smaller than this surface's. Both are zero, and `downwash_from` empty, when no surface is ahead.
  double downwash_deg = 0.0;
  double downwash_gradient = 0.0;
  std::vector<std::string> downwash_from;  ///< names of the surfaces ahead, in case order
};

/// Profile drag by strip theory and the total drag polar of a point (profile_drag.hpp).
struct ProfileDrag {
  double CD_profile = 0.0;  ///< sum over strips of cd c w / S_ref
  double CD_total = 0.0;    ///< CD_induced (Trefftz plane) + CD_profile
  std::optional<double> L_over_D;  ///< CL / CD_total
};

/// Critical-section stall onset: the configuration CL at which the first strip reaches its section cl_max,
/// with the inviscid span loading of the lattice. Optimistic: a wing stalls progressively, and the real CL_max is
/// usually found below this figure only by test.
struct StallOnset {
  double CL = 0.0;
  double alpha_deg = 0.0;
  std::string surface;
  double y = 0.0;              ///< m, the strip's station
  double span_fraction = 0.0;  ///< |y| / (tip |y|) of that surface's half (height fraction for a fin)
  bool already_beyond = false;  ///< true when some strip is above its cl_max at this point
};

/// The highest L/D over the points of a sweep that have a profile drag estimate.
struct BestLiftToDrag {
  std::size_t point = 0;
  double L_over_D = 0.0, CL = 0.0, alpha_deg = 0.0;
};

/// The flow at one probe of one flight point (probe.hpp). Velocities are per unit airspeed V, in geometry axes
/// (x aft, y right, z up): the local velocity of the air relative to the aircraft, onset flow (freestream and
/// body rotation) plus the velocity the lattice induces. The values are absent when the probe lies in a vortex
/// core (`note` says which), and for a point that was not solved (which has no probes at all).
struct ProbeResult {
  std::string name;
  Vec3 point{0.0, 0.0, 0.0};              ///< m, geometry axes
  std::optional<Vec3> velocity;           ///< (u, v, w) / V
  std::optional<double> downwash_deg;     ///< deg, positive: the local flow turned down from the freestream
  std::optional<double> sidewash_deg;     ///< deg, positive: turned toward the side direction (right wing)
  std::optional<double> q_ratio;          ///< q / q_inf = |V_local|^2 / V^2
  bool in_core = false;                   ///< true: within kProbeCoreRadii core radii of a vortex segment
  std::string note;                       ///< why there are no values (empty when there are)
};

/// One flight point of a sweep.
struct PointResult {
  double alpha_deg = 0.0, beta_deg = 0.0, mach = 0.0;
  Vec3 rates{0.0, 0.0, 0.0};  ///< body rates p, q, r, rad/s
  double CL = 0.0, CD_induced = 0.0, CD_induced_nearfield = 0.0, CY = 0.0, Cl = 0.0, Cm = 0.0, Cn = 0.0;
  std::optional<double> span_efficiency;  ///< absent when CD_induced is too small to divide by
  NamedValues derivatives;                ///< CL_alpha, Cm_alpha, ... (results-format.md)
  std::vector<std::pair<std::string, NamedValues>> control_derivatives;  ///< per control: CL, CY, Cl, Cm, Cn
  std::optional<Vec3> neutral_point;      ///< m; absent when CL_alpha is zero
  std::optional<double> static_margin;    ///< fraction of c_ref, positive = stable
  std::vector<SurfaceLoads> surfaces;
  std::optional<ProfileDrag> profile;      ///< present when the case gives section data or a speed
  std::optional<StallOnset> stall_onset;   ///< present when the sections give cl_max
  std::vector<ProbeResult> probes;         ///< one per Case::probes entry, in order (empty when not solved)
  std::vector<std::string> warnings;
  /// Non-empty when this point of a sweep could not be solved (its wake met another surface, say): the
  /// message says why, and every value above other than the flight condition is absent. Run() throws instead
  /// when no point at all could be solved, so a Results always holds at least one solved point.
  std::string error;
  bool solved() const { return error.empty(); }
};

/// Wall-clock seconds per stage, and threads.
struct StageTimes {
  double read = 0.0, mesh = 0.0, assemble = 0.0, factorise = 0.0, solve = 0.0, loads = 0.0, output = 0.0;
  double total = 0.0;
  int threads_given = 0, threads_used = 1;
};

struct MeshSummary {
  std::size_t panels = 0;
  std::size_t unknowns = 0;  ///< size of the largest linear system (half of the panels with the half model)
  bool half_model = false;
  int factorisations = 0;    ///< one per wake geometry
  bool lateral = true;       ///< false: lateral derivatives skipped on request (RunOptions::lateral)
  std::size_t memory_estimate_bytes = 0;  ///< the run's memory estimate, given before the assembly
  struct Surface {
    std::string name;
    std::size_t panels = 0, strips = 0;
  };
  std::vector<Surface> surfaces;
};

/// How a trim ended (trim.hpp) and what it found. Present only in the results of Trim(), which throws rather
/// than return an unconverged trim, so `converged` is true whenever this is written.
struct TrimResult {
  bool converged = false;
  int iterations = 0;             ///< Newton steps taken (0: the starting point was already trimmed); each
                                  ///< step is one exact solution, plus one for an incidence's Jacobian
  double alpha_deg = 0.0;         ///< the trimmed angle of attack
  std::string adjust;             ///< "<surface>.incidence" or "<control>.deflection", as in the case
  std::string adjusted_surface;   ///< the surface that setting belongs to
  double value_deg = 0.0;         ///< the trimmed incidence or deflection
  double CL = 0.0, Cm = 0.0;      ///< of the trimmed point's exact solution
  double CL_target = 0.0;         ///< from lift_coefficient, or weight / (q S_ref)
  double CD_induced = 0.0;        ///< Trefftz-plane induced drag at trim
  std::optional<double> static_margin;  ///< at trim, fraction of c_ref (positive = stable)
  /// Each surface's share of the lift, CL_surface / CL (absent when CL is zero).
  std::vector<std::pair<std::string, double>> lift_share;
  std::vector<double> residual_history;  ///< max(|CL - target|, |Cm|) at each iterate, first to last
};

struct Results {
  std::string title;
  std::string source_path;
  Reference reference;
  MeshSummary mesh;
  double rcond = 1.0;  ///< smallest reciprocal condition estimate of the systems factorised
  std::vector<std::string> warnings;
  std::vector<PointResult> points;
  std::optional<BestLiftToDrag> best_lift_to_drag;  ///< over the sweep, when profile drag was estimated
  StageTimes times;
  std::optional<TrimResult> trim;  ///< set by Trim() only

  /// The first point that was solved (Run() guarantees one): the point whose derivatives, shares and
  /// loadings a report shows when it shows one point.
  const PointResult& FirstSolved() const {
    for (const PointResult& p : points)
      if (p.solved()) return p;
    return points.front();
  }
  /// How many points of the sweep could not be solved.
  std::size_t FailedPoints() const {
    std::size_t n = 0;
    for (const PointResult& p : points)
      if (!p.solved()) ++n;
    return n;
  }
};

}  // namespace skein
