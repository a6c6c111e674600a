// Skein: the Case, plain data read from a case file (case-format.md). Units and signs: conventions.md.
//
// A Case is what the reader produces and the mesher consumes. Every default is filled in by the reader, so a
// Case never holds an "unset" value: what you see is what will be meshed and solved.
#pragma once

#include <array>
#include <optional>
#include <string>
#include <vector>

#include "skein/error.hpp"

namespace skein {

using Vec3 = std::array<double, 3>;

/// Panel distribution along a chord or a span. `ToString`/`FromString` are the single source of spelling.
enum class Spacing {
  uniform,  ///< equal panels
  cosine,   ///< dense toward both ends (leading and trailing edge; root and tip of each half)
  sine,     ///< dense toward the far end only (the tip); spanwise only
};

/// Direction of the trailing legs behind the trailing edge.
enum class WakeDirection {
  freestream,  ///< parallel to the freestream of each flight point (the wake follows alpha and beta)
  x_axis,      ///< parallel to +x, as in classical hand calculations; one matrix serves every flight point
};

std::string ToString(Spacing s);
std::string ToString(WakeDirection w);
/// Returns std::nullopt for an unknown spelling (the reader turns that into an InputError).
std::optional<Spacing> SpacingFromString(const std::string& s);
std::optional<WakeDirection> WakeDirectionFromString(const std::string& s);

/// A mean camber line. `flat` has zero slope; `naca4` is the NACA 4-digit mean line (Abbott & von Doenhoff,
/// Theory of Wing Sections, sec. 6.4): max camber m (fraction of chord) at p (fraction of chord); `table` is a
/// mean line extracted from an aerofoil coordinate file (airfoil.hpp), tabulated against x/c.
struct Camber {
  enum class Kind { flat, naca4, table };
  Kind kind = Kind::flat;
  double max_camber = 0.0;           ///< m, fraction of chord (first digit / 100)
  double max_camber_position = 0.0;  ///< p, fraction of chord (second digit / 10)
  std::string spelling = "flat";     ///< as the user wrote it, normalised ("flat", "NACA 2412"), or the file path
  /// `table` only: x/c ascending from 0 to 1, mean-line height z/c above the chord line and slope d(z/c)/d(x/c)
  /// there (linear in between), and the section's largest thickness t/c.
  std::vector<double> table_x, table_height, table_slope;
  double table_thickness = 0.0;

  /// Height of the mean line z/c at x/c in [0, 1] (positive toward the panel normal).
  double Height(double x_over_c) const;
  /// Slope d(z/c)/d(x/c) at x/c in [0, 1].
  double Slope(double x_over_c) const;
};

/// Mesh options; surface-level values override the case-level [mesh] table.
struct MeshOptions {
  int chordwise = 6;                            ///< panels along the chord
  int spanwise = 20;                            ///< panels along each half of a symmetric surface, or the whole
  Spacing chordwise_spacing = Spacing::cosine;  ///< cosine resolves the leading-edge load peak
  Spacing spanwise_spacing = Spacing::cosine;
  WakeDirection wake = WakeDirection::freestream;
};

/// Section drag against section lift, as a table (cl strictly increasing, cd >= 0); linear in between.
struct SectionPolar {
  std::vector<double> cl, cd;
};

/// What strip theory needs of a section for profile drag and stall onset (profile_drag.hpp); all optional.
struct SectionViscousData {
  std::optional<SectionPolar> polar;  ///< section drag table; without it, skin friction with a form factor
  std::optional<double> cl_max;       ///< section maximum lift coefficient, for the critical-section estimate
  std::optional<double> thickness;    ///< t/c; default: from a NACA 4-digit name or a coordinate file, else 0
  std::optional<double> transition;   ///< x/c where the boundary layer turns turbulent; default 0 (all turbulent)
};

/// One section (rib) of a surface. Sections run from the root (first) to the tip (last).
struct Section {
  Vec3 leading_edge{0.0, 0.0, 0.0};  ///< m, after the surface offset has been applied
  double chord = 0.0;                ///< m, > 0
  double twist_deg = 0.0;            ///< nose-up rotation about the local spanwise axis through the leading edge
  Camber camber;
  std::optional<int> spanwise;       ///< panels between this section and the next (overrides the share)
  SectionViscousData viscous;        ///< profile drag and cl_max data, blended linearly between sections
  SourceRegion where;                ///< where the section was written (or the trapezoid table)
};

/// A control surface: a hinged trailing-edge portion of a surface (read by a later issue; kept for layout).
struct Control {
  std::string name;
  double hinge = 0.75;                           ///< hinge line at this fraction of the local chord, in (0, 1)
  std::array<double, 2> span_fraction{0.0, 1.0};  ///< along the half-span, 0 root, 1 tip
  double deflection_deg = 0.0;                   ///< positive: trailing edge toward -n
  bool mirror_opposite = false;                  ///< "opposite" (aileron) when true, "same" (flap) otherwise
  SourceRegion where;
};

struct Surface {
  std::string name;
  bool symmetric = true;     ///< given for y >= 0 and mirrored about y = 0
  double incidence_deg = 0.0;  ///< whole-surface nose-up rotation about y through the first leading edge
  Vec3 offset{0.0, 0.0, 0.0};  ///< m, already added to every section's leading edge
  MeshOptions mesh;            ///< resolved: case [mesh] overridden by the surface's own keys
  std::vector<Section> sections;  ///< at least two, root to tip, incidence NOT yet applied (the mesher does it)
  std::vector<Control> controls;
  SourceRegion where;
};

/// Reference quantities for coefficients. Defaults come from the first surface (case-format.md).
struct Reference {
  double area = 0.0;   ///< S_ref, m^2
  double span = 0.0;   ///< b_ref, m
  double chord = 0.0;  ///< c_ref, m
  Vec3 moment_point{0.0, 0.0, 0.0};  ///< m
  bool area_given = false, span_given = false, chord_given = false;  ///< false: the default was used
};

/// The flight condition(s). A sweep is the outer product: for each beta, every alpha (alpha varies fastest).
struct Flight {
  std::vector<double> alpha_deg{0.0};
  std::vector<double> beta_deg{0.0};
  double speed = 1.0;        ///< m/s; coefficients do not depend on it; dimensional loads and rates do
  bool speed_given = false;
  double density = 1.225;    ///< kg/m^3, ISA sea level
  double mach = 0.0;         ///< 0 <= mach < 1
  bool mach_given = false;
  /// m, geopotential (pressure altitude): given instead of density, it sets density and viscosity from the
  /// standard atmosphere (atmosphere.hpp), and ties speed and mach together through the speed of sound.
  std::optional<double> altitude;
  /// Pa s: the standard atmosphere's at `altitude`, or its sea-level value 1.7894e-5 when density is given.
  double dynamic_viscosity = 1.7894e-5;
  Vec3 rates{0.0, 0.0, 0.0};  ///< body rates p, q, r, rad/s
};

/// Ground plane z = height_z, by the image method (added by a later issue; absent means free air).
struct Ground {
  bool enabled = false;
  double height_z = 0.0;  ///< m
};

/// The trim request (added by a later issue).
struct TrimRequest {
  bool enabled = false;
  std::optional<double> lift_coefficient;
  std::optional<double> weight;  ///< N
  std::string adjust;            ///< "<surface>.incidence" or "<control>.deflection"
  SourceRegion where;
};

/// A point where the flow is reported (probe.hpp): a tail, a propeller disc, a pitot boom, a sensor.
struct Probe {
  std::string name;            ///< unique among the case's probes
  Vec3 point{0.0, 0.0, 0.0};   ///< m, geometry axes (the case file's)
  SourceRegion where;          ///< the [[probe]] table, or line 0 for one given on the command line
};

struct Case {
  std::string title;
  std::string source_path;  ///< the file it came from ("" when built in code)
  Reference reference;
  Flight flight;
  Ground ground;
  MeshOptions mesh;  ///< the case-level defaults
  std::vector<Surface> surfaces;
  TrimRequest trim;
  std::vector<Probe> probes;  ///< [[probe]] tables, then `solve --probe` arguments, in the order given
  std::vector<std::string> warnings;  ///< reader warnings (not errors), one sentence each
};

/// Projected area (both halves), tip-to-tip span and mean aerodynamic chord of a surface, from its sections.
/// Used for the reference defaults. Area is projected on the xy plane; a surface with no extent in y (a fin)
/// uses its own plane instead.
struct SurfaceExtent {
  double area = 0.0;
  double span = 0.0;
  double mean_aerodynamic_chord = 0.0;
};
SurfaceExtent MeasureSurface(const Surface& s);

}  // namespace skein
