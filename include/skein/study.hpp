// Skein design studies: work that runs the pipeline several times, or works on its pieces, to answer a design
// question. All of it is library code over plain data; nothing here prints.
//
//  - Mesh convergence: the case solved on three nested meshes, with Richardson extrapolation of CL,
//    CD_induced, Cm and span efficiency and an error estimate (Roache's grid convergence index).
//  - The Trefftz plane as a quadratic form: induced drag D = g' Q g of the strip circulations g, lift and root
//    bending moment as linear functionals of g, prescribed span loadings, and the minimum-drag loading at a
//    given lift (optionally at a given root bending moment).
//  - Twist design: the section twists of one surface that give the least induced drag at a target CL.
//
// Units and signs: conventions.md. As in loads.hpp, Trefftz-plane quantities are for V = 1 and rho = 1.
#pragma once

#include <array>
#include <cstddef>
#include <functional>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include <Eigen/Core>

#include "skein/case.hpp"
#include "skein/influence.hpp"
#include "skein/lattice.hpp"
#include "skein/results.hpp"
#include "skein/run.hpp"

namespace skein::study {

// ---------------------------------------------------------------------------------------------------------
// Richardson extrapolation

/// Factor of safety of the grid convergence index: 1.25 when the order is observed from three meshes, 3 when
/// it is assumed (P. J. Roache, "Perspective: a method for uniform reporting of grid refinement studies",
/// J. Fluids Eng. 116, 1994).
inline constexpr double kSafetyObserved = 1.25;
inline constexpr double kSafetyAssumed = 3.0;
/// An observed order outside this range is not trusted and the assumed order is used instead (common practice).
inline constexpr double kMinTrustedOrder = 0.5;
inline constexpr double kMaxTrustedOrder = 4.0;

struct Extrapolation {
  double value = 0.0;           ///< Richardson-extrapolated value (the mesh-converged estimate)
  double order = 0.0;           ///< order of convergence used
  bool order_observed = false;  ///< true: the order came from the three values; false: it was assumed
  double error_estimate = 0.0;  ///< grid convergence index of the finest result, in the quantity's own units
  std::string note;             ///< why the order was assumed, or "" when observed
};

/// Richardson extrapolation from three values on meshes refined by a constant ratio r (> 1) in every
/// direction: f_coarse (spacing r^2 h), f_medium (r h), f_fine (h). With e21 = f_medium - f_fine and
/// e32 = f_coarse - f_medium, the observed order is p = ln(e32 / e21) / ln r when e32 / e21 > 0 (monotone) and
/// p lies in [kMinTrustedOrder, kMaxTrustedOrder]; otherwise `assumed_order` is used and the note says why.
/// The extrapolated value is f_fine + (f_fine - f_medium) / (r^p - 1); the error estimate is the grid
/// convergence index Fs |f_fine - f_medium| / (r^p - 1). When e21 is at round-off the sequence has converged:
/// the value is f_fine and the error estimate is zero.
Extrapolation RichardsonExtrapolate(double f_coarse, double f_medium, double f_fine, double ratio,
                                    double assumed_order);

// ---------------------------------------------------------------------------------------------------------
// Mesh convergence

/// The order assumed when a sequence is not monotone: first order. Refining a swept, tapered wing here shows
/// observed orders of 0.75 to 1.0 for CL, Cm and span efficiency and 1.2 to 1.6 for CD_induced, rising toward
/// 1 and above as the mesh is refined (tests/unit/study_test.cpp); first order is the low end of that, so the
/// correction and the error estimate it gives are the larger ones.
inline constexpr double kAssumedMeshOrder = 1.0;

struct ConvergenceOptions {
  std::size_t point = 0;             ///< flight point of the case's sweep (alpha fastest, as in Run)
  std::size_t max_panels = 6000;     ///< the finest mesh may not exceed this (unless it is the case's own)
  double assumed_order = kAssumedMeshOrder;
  RunOptions run;
};

struct MeshLevel {
  double scale = 1.0;  ///< panel counts relative to the case's mesh, in each direction
  int chordwise = 0, spanwise = 0;  ///< the case-level [mesh] counts at this level
  std::size_t panels = 0;
};

struct ConvergenceQuantity {
  std::string name;                ///< "CL", "CD_induced", "Cm", "span_efficiency"
  std::array<double, 3> values{};  ///< coarse, medium, fine
  Extrapolation extrapolation;
};

struct ConvergenceStudy {
  double alpha_deg = 0.0, beta_deg = 0.0;
  double ratio = 2.0;                ///< refinement ratio between levels
  std::array<MeshLevel, 3> meshes;   ///< coarse, medium, fine
  std::vector<ConvergenceQuantity> quantities;
  std::vector<std::string> warnings;
};

/// The case with every panel count (case, surface and section level) multiplied by `scale`. Throws
/// InputError when a count would not be a whole number >= 1.
Case ScaleMesh(const Case& c, double scale);

/// Solves one flight point of the case on three nested meshes, each direction refined by 2 between levels:
/// the case's mesh x {1, 2, 4} when the finest fits in options.max_panels, else x {1/2, 1, 2}, else
/// x {1/4, 1/2, 1} (counts must halve exactly). Throws InputError when no set can be built.
ConvergenceStudy MeshConvergence(const Case& c, const ConvergenceOptions& options);

// ---------------------------------------------------------------------------------------------------------
// The Trefftz plane as a quadratic form

/// Induced drag as a quadratic form of the strip circulations: D = g' Q g (V = rho = 1), Q symmetric, built
/// from TrefftzKernel (loads.hpp), as TrefftzDrag is, so it agrees with the drag every solve reports, ground images included.
Eigen::MatrixXd TrefftzDragMatrix(const Lattice& lat, const WakeGeometry& wake);

/// Lift (along l = (-sin alpha, 0, cos alpha)) of the strip circulations in the Trefftz plane, per unit g:
/// L = sum_m g_m ((d x (TB_m - TA_m)) . l) (Kutta-Joukowski on the wake's starting line; V = rho = 1).
Eigen::VectorXd TrefftzLiftVector(const Lattice& lat, const WakeGeometry& wake, double alpha_deg);

/// Root bending moment of the right half (y > 0) of surface `surface`, per unit g, from the same forces:
/// M = sum_{m right} g_m ((d x (TB_m - TA_m)) . l) (y_m - y_root), y_m the strip's quarter-chord station and
/// y_root the surface's smallest |y| (its root).
Eigen::VectorXd TrefftzRootBendingVector(const Lattice& lat, const WakeGeometry& wake, double alpha_deg,
                                         int surface);

/// Strip circulations g_m = shape(eta_m) of a prescribed loading, eta_m = y_m / s the strip's quarter-chord
/// station over the semi-span s of surface `surface` (its largest |y|); zero on other surfaces.
std::vector<double> PrescribedLoading(const Lattice& lat, int surface, const std::function<double(double)>& shape);

/// The strip circulations of least induced drag g' Q g at lift `lift` (lift_vector . g = lift) and, when
/// given, at root bending moment `bending` (bending_vector . g = bending), carried by surface `surface` alone
/// (other strips carry none). On a symmetric surface the loading is held symmetric (each mirrored strip
/// carries its given strip's circulation); otherwise a bending constraint measured on one half could be met by
/// loading the other. Solved exactly: one linear KKT system.
std::vector<double> MinimumDragLoading(const Lattice& lat, int surface, const Eigen::MatrixXd& Q,
                                       const Eigen::VectorXd& lift_vector, double lift,
                                       const Eigen::VectorXd* bending_vector, double bending);

// ---------------------------------------------------------------------------------------------------------
// Root bending moment

/// Root bending moment coefficient of the right half (y > 0) of surface `surface`: the moment about the
/// x axis through the surface's root (its first section's leading edge) of the strips' normal forces
/// (Kutta-Joukowski, from the point's strip cl), over q S_ref b_ref. Positive when the right wing's load
/// bends it up. `lat` must be the lattice the point was solved on.
double RootBendingCoefficient(const Lattice& lat, const Case& c, const PointResult& p, int surface);

// ---------------------------------------------------------------------------------------------------------
// Twist design

struct TwistDesignOptions {
  double target_CL = 0.5;
  std::string surface;              ///< surface whose twist is designed; "" = the first surface
  int stations = 6;                 ///< design sections per half, equally spaced root to tip (inserted as needed)
  bool keep_root_bending = false;   ///< hold the root bending moment at or below the wing-as-given's at target_CL
  std::optional<double> root_bending_limit;  ///< with keep_root_bending: this coefficient instead of the wing-as-given's
  double step_deg = 0.05;           ///< finite-difference step of the twist sensitivities
  int max_iterations = 15;
  double tolerance_deg = 1e-6;      ///< stop when no twist moves by more than this in an iteration
  RunOptions run;
};

/// One solved state of the design problem (symmetric flight, beta = 0).
struct DesignState {
  double alpha_deg = 0.0, CL = 0.0, CD_induced = 0.0, root_bending = 0.0;
  std::optional<double> span_efficiency;
};

struct TwistDesign {
  Case designed;                   ///< the case with the designed twists; its flight point is the design point
  std::vector<double> station_eta;  ///< y / semi-span of each section of the designed surface
  std::vector<double> twist_before_deg, twist_after_deg;  ///< per section of the designed surface (root kept)
  DesignState before;              ///< the wing as given (with the inserted sections), alpha set for target_CL
  DesignState after;               ///< the designed wing at its own angle of attack
  bool bending_constraint_active = false;
  int iterations = 0;
  bool converged = false;
  std::vector<std::string> warnings;
};

/// Designs the spanwise twist of one symmetric surface for least induced drag at options.target_CL.
/// Sections are inserted in the surface (geometry unchanged: leading edge, chord and twist interpolated
/// linearly, in segments whose two ends share a camber line and carry no fixed panel count) so that it has
/// about options.stations design sections per half, equally spaced in span. The wing as given is first
/// solved at the angle of attack that gives target_CL ("before"); then the angle of attack and the twist of
/// every section but the root (which keeps its twist) are the unknowns. The strip
/// circulations depend linearly on the twists and alpha (through the flow-basis solve, up to the small movement of the
/// geometry), so the drag is a quadratic in the twists with Hessian 2 S' Q S (S the sensitivities, Q the
/// Trefftz form) and the lift (and bending) constraints are linear: each iteration solves that KKT system
/// exactly, with sensitivities by central differences of full solves, until the twists stop moving.
/// Throws InputError for an unknown or non-symmetric surface, or a target the wing cannot reach.
TwistDesign DesignTwist(const Case& c, const TwistDesignOptions& options);

// ---------------------------------------------------------------------------------------------------------
// Comparing configurations

/// The point of a case at a given lift coefficient: the angle of attack is moved (secant steps on CL_alpha)
/// until CL matches to 1e-12; beta and the rest of the flight condition are the case's first point's.
/// Throws InputError when CL does not respond to alpha or the lift needs |alpha| >= 89 deg.
struct PointAtLift {
  Case at;             ///< the case with the one flight point found
  PointResult point;
  Lattice lattice;
};
PointAtLift SolveAtLift(const Case& c, double target_CL, const RunOptions& run);

/// Every case carrying the same aircraft: the same weight at the same speed and air density. Each case then
/// flies at its own CL = W / (q S_ref) and is ranked by its induced drag force D_i = q S_ref CD_induced (N),
/// which is what the aircraft pays; comparing coefficients of cases with different reference areas would not be.
struct SameAircraft {
  double weight_N = 0.0;   ///< N, > 0
  double speed = 0.0;      ///< m/s, true airspeed, > 0
  double density = 0.0;    ///< kg/m^3, > 0
};

struct CompareOptions {
  std::optional<double> target_CL;  ///< default: the first case's CL at its first flight point
  std::optional<SameAircraft> same_aircraft;  ///< instead of target_CL: each case at W / (q S_ref)
  RunOptions run;                   ///< run.threads: the threads of the whole comparison (PlanThreads)
};

struct SpanLoadingSeries;

struct CompareEntry {
  std::string title, source;
  double alpha_deg = 0.0;           ///< needed for the target CL
  double CL = 0.0, CD_induced = 0.0;
  std::optional<double> span_efficiency;
  double CL_alpha = 0.0;            ///< per rad
  double root_bending = 0.0;        ///< RootBendingCoefficient of the first surface (NaN if not symmetric)
  double cl_peak_eta = 0.0;         ///< where the first surface's local cl peaks, |y| / semi-span
  double cl_peak_over_CL = 0.0;     ///< that peak cl over the configuration CL
  std::optional<double> neutral_point_x;  ///< m
  std::optional<double> induced_drag_N;   ///< q S_ref CD_induced, with CompareOptions::same_aircraft only
  int rank = 0;                     ///< 1 = least induced drag; equal drags share a rank
  std::vector<SpanLoadingSeries> span_loading;  ///< at the target CL (SpanLoadingWithElliptic), for compare's overlay plot (empty in a study)
};

struct Comparison {
  double target_CL = 0.0;  ///< the common CL; with same_aircraft, the first case's (each entry has its own CL)
  std::optional<SameAircraft> same_aircraft;  ///< set when the cases were compared at one weight and speed
  std::vector<CompareEntry> entries;  ///< in the order given
  std::vector<std::size_t> ranked;    ///< indices into entries, least induced drag first (stable for ties)
};

/// Solves every case at the same CL and ranks them by induced drag, the cases in parallel (PlanThreads); with
/// options.same_aircraft, each case at the CL that carries that weight and ranked by induced drag force.
/// Throws InputError (naming the case) when a case cannot reach the target: the first such case in the order
/// given.
Comparison CompareCases(const std::vector<Case>& cases, const CompareOptions& options);

// ---------------------------------------------------------------------------------------------------------
// Span loading with its elliptic reference (for plots)

/// The span loading cl c / c_ref of one surface at one point, and the elliptic loading of the same lift and
/// span for reference: cl c / c_ref = A sqrt(1 - (2 (y - y_c) / b)^2), A = 4 S_ref CL_s / (pi b c_ref), with
/// CL_s the surface's share of CL, b its tip-to-tip extent and y_c its centre (the area under it is the
/// surface's lift, S_ref CL_s / c_ref).
struct SpanLoadingSeries {
  std::string surface;
  std::vector<double> y;         ///< m, strip stations, left to right
  std::vector<double> width;     ///< m, strip widths in y
  std::vector<double> loading;   ///< cl c / c_ref at each strip
  std::vector<double> elliptic;  ///< the elliptic reference at each strip
  double span = 0.0, centre = 0.0, amplitude = 0.0;  ///< b, y_c, A of the elliptic reference
  double CL = 0.0;               ///< the surface's CL
};

/// One series per surface that spans in y (a fin on the plane of symmetry has no span loading in y and is
/// left out). `lat` must be the lattice the point was solved on.
std::vector<SpanLoadingSeries> SpanLoadingWithElliptic(const Lattice& lat, const PointResult& p,
                                                       const Reference& ref);

// ---------------------------------------------------------------------------------------------------------
// Parallel work over several cases (compare, parameter studies)

/// How the threads are shared among independent cases (variants of a study, cases of a comparison): with
/// `total` threads (0 = every core of the machine) and `cases` cases, min(cases, total) cases run at once,
/// each on total / that many threads (OpenMP and, where the build links OpenBLAS, the BLAS threads too). So
/// with at least as many cases as cores every case runs single-threaded and the cores take a case each; with
/// fewer cases the cores go to the cases. Results do not depend on it (each case is solved the same way on
/// any number of threads).
struct ThreadPlan {
  int concurrent_cases = 1;
  int threads_per_case = 1;
};
ThreadPlan PlanThreads(std::size_t cases, int total);

// ---------------------------------------------------------------------------------------------------------
// Parameter studies

/// One varied key of a study: a dotted path into the case file (case_edit.hpp) and the values it takes.
struct StudyAxis {
  std::string path;
  std::vector<double> values;
};

/// Most variants a study may have (the product of its axes' counts): a typo such as 0:1:10000 is refused.
inline constexpr std::size_t kMaxStudyVariants = 2000;

/// Parses `PATH=FROM:TO:COUNT` (COUNT >= 2 values equally spaced from FROM to TO, both included) or
/// `PATH=V1,V2,...` (the values as given). Range values are rounded to 12 significant digits (0.2:0.6:17 gives
/// 0.225, not 0.22500000000000003). Throws InputError naming the option text and what was expected.
StudyAxis ParseStudyAxis(const std::string& spec);

struct StudyOptions {
  std::vector<StudyAxis> axes;       ///< one or two; two make a grid (the first varies fastest)
  std::optional<double> target_CL;   ///< solve each variant at this CL ...
  std::optional<double> alpha_deg;   ///< ... or at this angle of attack (exactly one of the two)
  RunOptions run;                    ///< run.threads: the threads of the whole study (0 = every core), see PlanThreads
  /// Called after each variant is solved with (variants done, variants in all), from the thread that solved
  /// it, one call at a time. Optional.
  std::function<void(std::size_t, std::size_t)> progress;
};

/// The results of one variant, at the first flight condition of the case (beta as written) with alpha set by
/// the study.
struct StudyVariant {
  std::vector<double> values;         ///< one per axis
  double alpha_deg = 0.0, CL = 0.0, CD_induced = 0.0, Cm = 0.0;
  std::optional<double> span_efficiency;
  std::optional<double> CL_alpha;     ///< per rad
  std::optional<double> root_bending; ///< RootBendingCoefficient of the first surface (when it is symmetric)
  std::optional<double> neutral_point_x;  ///< m
  std::optional<double> cl_peak_eta;  ///< where the first surface's local cl peaks, |y| / semi-span
  double cl_peak_over_CL = 0.0;       ///< that peak cl over the configuration CL
};

struct Study {
  std::string title, source;
  std::vector<StudyAxis> axes;
  std::optional<double> target_CL, alpha_deg;
  std::vector<StudyVariant> variants;  ///< first axis fastest: variant i has values[a] = axes[a].values[...]
  ThreadPlan threads;                  ///< how the study was run
  std::vector<std::string> warnings;   ///< the case's reader warnings
};

/// The abscissa of the least y, refined by the parabola through the least y and its two neighbours:
/// x_v = x2 - ((x2-x1)^2 (y2-y3) - (x2-x3)^2 (y2-y1)) / (2 ((x2-x1)(y2-y3) - (x2-x3)(y2-y1))) (common practice).
/// x must be strictly monotone; nullopt when the least y is at an end (the minimum may lie outside the range),
/// there are fewer than three points, or the three are collinear.
std::optional<double> ParabolicMinimum(const std::vector<double>& x, const std::vector<double>& y);

/// Runs a parameter study of the case whose text is `text` (`file` names it in messages and resolves
/// coordinate files beside it): every variant is the text with the varied numbers replaced in place
/// (EditCaseText), read by the ordinary reader, then solved at options.target_CL (SolveAtLift) or at
/// options.alpha_deg. Every variant is read before any is solved. Throws InputError for a bad path or option
/// (one line naming it and the nearest valid key), for a variant the reader refuses (naming the variant:
/// `file:line:column: variant surface.wing.trapezoid.taper = -0.1: ...`) or one that cannot reach the
/// target CL; NumericalError (naming the variant) for a singular system. The error reported is the first
/// variant's that fails, in variant order, whatever the threads.
Study RunStudy(std::string_view text, const std::string& file, const StudyOptions& options);

}  // namespace skein::study
