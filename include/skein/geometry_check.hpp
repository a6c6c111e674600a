// Skein: geometry checks between mesh and assembly. They catch the lattices whose influence system is singular
// or meaningless before any matrix is built, and say why in terms of the case file:
//   - two surfaces (or the two halves of one) that coincide: control points closer than a tiny fraction of the
//     panel size (two identical rows: the matrix is singular);
//   - surfaces that intersect: a bound vortex passing through a panel of another surface;
//   - a surface folded back on itself: the normals of neighbouring strips, or neighbouring panels of a strip,
//     turning by more than kFoldAngleDeg;
//   - degenerate panels: a side far smaller than the surface, or sides (nearly) parallel;
//   - non-finite coordinates;
//   - a control point lying on another horseshoe's trailing leg (the straight leg from te_a or te_b along the
//     wake direction), inside the leg's vortex core, where the regularised kernel no longer models the flow.
// Each throws InputError naming the case file and the [[surface]] table the geometry came from, the cause and
// the surfaces involved. Milder findings (a control point near, but not on, another surface's leg) come back as
// warnings. Library code: nothing is printed.
#pragma once

#include <string>
#include <vector>

#include "skein/case.hpp"
#include "skein/lattice.hpp"

namespace skein {

/// Two control points closer than this fraction of the smaller panel size are coincident.
inline constexpr double kCoincidentFraction = 1e-3;
/// A control point closer to a trailing leg than this fraction of its panel size is on the leg: the vortex
/// core of the regularised kernel (kCoreFraction, biot_savart.hpp) has the same radius.
inline constexpr double kOnLegFraction = kCoreFraction;
/// Closer than this fraction (but not on the leg) gives a warning (case-format.md, "Warnings").
inline constexpr double kNearLegFraction = 0.25;
/// Normals of neighbouring strips or panels turning by more than this angle: the surface folds back.
inline constexpr double kFoldAngleDeg = 120.0;
/// A panel side shorter than this fraction of the surface's largest chord is degenerate.
inline constexpr double kDegenerateSideFraction = 1e-9;
/// A panel whose area is below this fraction of (chord side x span side) is a sliver (sides parallel).
inline constexpr double kSliverFraction = 1e-4;

/// Checks that need only the lattice (coincidence, intersection, folds, degenerate panels, finiteness).
/// Throws InputError at the first problem found.
void CheckGeometry(const Case& c, const Lattice& lat);

/// A control point near (not on) another surface's trailing leg: a warning, one per pair of surfaces.
struct WakeWarning {
  int surface = 0;      ///< surface of the control point
  int leg_surface = 0;  ///< surface whose leg passes close by
  std::string message;  ///< one sentence
};

/// Checks the trailing legs for the wake direction `wake_direction` (a unit vector): a control point on a leg
/// (any strip's but its own) throws InputError; one near another surface's leg gives a warning.
/// `flight` describes the flight point for the message ("at alpha 2 deg, beta 0 deg"; "" when the wake does
/// not depend on it).
std::vector<WakeWarning> CheckWakeClearance(const Case& c, const Lattice& lat, const Vec3& wake_direction,
                                            const std::string& flight = "");

/// For a system found singular or ill-conditioned although the checks above passed: the closest approach of
/// the lattice (two control points, or a control point and another strip's trailing leg, relative to the
/// panel size) as one clause naming the likely cause and the surfaces involved, e.g.
/// `the likeliest cause is surfaces "wing" and "canard": control points 2.1e-06 panel sizes apart (...)`.
std::string DiagnoseCloseApproach(const Lattice& lat, const Vec3& wake_direction);

/// The size of panel i used by the checks: the smaller of its bound-segment length and its chord, m.
double PanelSize(const Lattice& lat, std::size_t i);

}  // namespace skein
