// Skein: profile drag and stall onset by strip theory, on top of the lattice's span loading.
//
// Each strip takes its section's drag at its own lift coefficient (the strip normal-force coefficient cl):
//  - from the section's polar table when the case gives one (linear in cl between the table's points; the end
//    value, with a warning, outside it), or
//  - from flat-plate skin friction on both faces with a thickness form factor, at the strip's Reynolds number
//    Re = V c / nu (H. Schlichting, Boundary-Layer Theory, 7th ed., 1979, ch. VII and XXI):
//        laminar (Blasius)                Cf = 1.328 / sqrt(Re)
//        turbulent (Prandtl-Schlichting)  Cf = 0.455 / (log10 Re)^2.58
//        transition at x/c = xt           Cf = Cf_turb(Re) - xt (Cf_turb(Re xt) - Cf_lam(Re xt))
//    (the turbulent law over the whole chord, with the part ahead of transition replaced by the laminar one,
//    as in Schlichting's derivation of the A / Re correction), and
//        form factor (S. F. Hoerner, Fluid-Dynamic Drag, 1965, ch. 6)   FF = 1 + 2 (t/c) + 60 (t/c)^4,
//        cd = 2 Cf FF.
// Sections are blended linearly along the span between the two sections a strip lies between.
//   CD_profile = sum_strips cd c w / S_ref,  CD_total = CD_induced + CD_profile,  L/D = CL / CD_total.
// The skin-friction estimate does not depend on lift: it is the drag of the section near its design lift,
// without the rise toward stall; give a polar for that.
//
// Stall onset (critical-section method): raising alpha with the span loading of the inviscid lattice, the first
// strip to reach its section cl_max fixes the wing's CL at stall onset. It is
// optimistic: it ignores the section's own nonlinearity before cl_max, three-dimensional boundary-layer
// effects (spanwise flow on swept wings) and Reynolds-number effects on cl_max; the wing's maximum lift must
// come from test.
#pragma once

#include <functional>
#include <optional>
#include <vector>

#include "skein/case.hpp"
#include "skein/lattice.hpp"
#include "skein/results.hpp"

namespace skein {

double LaminarSkinFriction(double reynolds);    ///< Blasius, both > 0
double TurbulentSkinFriction(double reynolds);  ///< Prandtl-Schlichting
/// Mixed laminar-turbulent plate with transition at fraction `transition` of the length, in [0, 1].
double MixedSkinFriction(double reynolds, double transition);
double ThicknessFormFactor(double thickness_over_chord);  ///< Hoerner

/// The thickness ratio a section's camber implies: the last two digits of "NACA mptt" / 100, the largest
/// thickness of a coordinate file's section, else std::nullopt.
std::optional<double> ThicknessFromName(const Camber& camber);

/// True when any section of the case carries strip-theory data (polar, cl_max, thickness or transition).
bool HasSectionData(const Case& c);

/// Adds profile drag (PointResult::profile, SurfaceLoads::CD_profile and ::sections) and stall onset
/// (PointResult::stall_onset) to `point`, for a case with a speed or with section data. `loads_at(alpha_deg)`
/// gives the loads of the same flight point at another angle of attack with the same flow basis (the wake
/// held); the stall-onset angle is where the most critical strip's cl reaches its cl_max. Appends warnings to
/// `point`. Does nothing when neither a speed nor section data is given.
void AddProfileDrag(const Case& c, const Lattice& lat, const std::function<PointResult(double)>& loads_at,
                    PointResult& point);

/// The point of highest L/D among those with a profile drag estimate (std::nullopt if none).
std::optional<BestLiftToDrag> FindBestLiftToDrag(const std::vector<PointResult>& points);

}  // namespace skein
