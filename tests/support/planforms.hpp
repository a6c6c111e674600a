// Skein tests: Case objects built in code (case.hpp), for unit and validation tests.
//
// Every builder returns a complete Case (reference quantities filled in from the first surface, as the reader
// does: case-format.md, [reference]), so a test can hand it straight to skein::Run or to the stages. Geometry
// axes and signs: conventions.md (x aft, y right, z up; a symmetric surface is given for y >= 0).
//
//   skein::Case c = skein::testing::WingCase(skein::testing::RectangularWing(6.0, 1.0), {5.0});
//   skein::Results r = skein::Run(c, {});
#pragma once

#include <cmath>
#include <string>
#include <utility>
#include <vector>

#include "skein/case.hpp"

namespace skein::testing {

inline constexpr double kDeg = 3.14159265358979323846 / 180.0;

/// A NACA 4-digit mean line, e.g. Naca4(2, 4) for NACA 24xx (Abbott & von Doenhoff, sec. 6.4).
inline Camber Naca4(int m_percent, int p_tenths) {
  Camber c;
  c.kind = Camber::Kind::naca4;
  c.max_camber = m_percent / 100.0;
  c.max_camber_position = p_tenths / 10.0;
  c.spelling = "NACA " + std::to_string(m_percent) + std::to_string(p_tenths) + "12";
  return c;
}

inline Section MakeSection(const Vec3& leading_edge, double chord, double twist_deg = 0.0, Camber camber = {}) {
  Section s;
  s.leading_edge = leading_edge;
  s.chord = chord;
  s.twist_deg = twist_deg;
  s.camber = std::move(camber);
  return s;
}

/// Mesh options with the given counts and spacings (x-axis wake unless told otherwise).
inline MeshOptions Mesh(int chordwise, int spanwise, Spacing span_spacing = Spacing::cosine,
                        Spacing chord_spacing = Spacing::cosine, WakeDirection wake = WakeDirection::x_axis) {
  MeshOptions m;
  m.chordwise = chordwise;
  m.spanwise = spanwise;
  m.spanwise_spacing = span_spacing;
  m.chordwise_spacing = chord_spacing;
  m.wake = wake;
  return m;
}

/// A straight-tapered symmetric wing, given for its right half: root leading edge at the origin, quarter-chord
/// line swept by `sweep_quarter_deg`, `span` tip to tip, tip chord = taper x root chord, flat, no dihedral.
inline Surface TaperedWing(double span, double root_chord, double taper, double sweep_quarter_deg,
                           const MeshOptions& mesh, Camber camber = {}) {
  Surface s;
  s.name = "wing";
  s.symmetric = true;
  s.mesh = mesh;
  const double tip_chord = taper * root_chord, half = 0.5 * span;
  const double x_tip_qc = 0.25 * root_chord + half * std::tan(sweep_quarter_deg * kDeg);
  s.sections.push_back(MakeSection({0.0, 0.0, 0.0}, root_chord, 0.0, camber));
  s.sections.push_back(MakeSection({x_tip_qc - 0.25 * tip_chord, half, 0.0}, tip_chord, 0.0, camber));
  return s;
}

/// A constant-chord wing sheared back so that its leading edge (and every constant-chord line) is swept by
/// `sweep_deg`; `span` tip to tip.
inline Surface ShearedWing(double span, double chord, double sweep_deg, const MeshOptions& mesh) {
  return TaperedWing(span, chord, 1.0, sweep_deg, mesh);
}

inline Surface RectangularWing(double span, double chord, const MeshOptions& mesh, Camber camber = {}) {
  return TaperedWing(span, chord, 1.0, 0.0, mesh, std::move(camber));
}

/// An elliptic planform: chord c0 cos(theta) at y = s sin(theta), s = span/2, with `segments` equal steps in
/// theta per half and one panel strip per segment (`spanwise = 1` per section), a straight unswept
/// quarter-chord line at x = c0/4, and the tip section's chord raised to `tip_fraction` x c0 (a chord of zero
/// cannot be meshed). Strips are therefore dense toward the tip, like the cosine distribution of the loading.
inline Surface EllipticWing(double span, double c0, int segments, int chordwise, double tip_fraction = 0.01,
                            Spacing chord_spacing = Spacing::cosine) {
  Surface s;
  s.name = "wing";
  s.symmetric = true;
  s.mesh = Mesh(chordwise, segments, Spacing::uniform, chord_spacing);
  const double half = 0.5 * span, pi = 3.14159265358979323846;
  for (int k = 0; k <= segments; ++k) {
    const double theta = 0.5 * pi * k / segments;
    const double c = k == segments ? tip_fraction * c0 : std::max(c0 * std::cos(theta), tip_fraction * c0);
    const double y = k == segments ? half : half * std::sin(theta);
    Section sec = MakeSection({0.25 * c0 - 0.25 * c, y, 0.0}, c);
    if (k < segments) sec.spanwise = 1;
    s.sections.push_back(sec);
  }
  return s;
}

/// A Case holding `surfaces`, the reference quantities taken from the first surface (area both halves,
/// tip-to-tip span, mean aerodynamic chord: MeasureSurface), moment point at the origin, the given angles of
/// attack (deg) and zero sideslip.
inline Case MakeCase(std::vector<Surface> surfaces, std::vector<double> alpha_deg = {0.0},
                     std::vector<double> beta_deg = {0.0}) {
  Case c;
  c.title = "built in code";
  c.surfaces = std::move(surfaces);
  c.mesh = c.surfaces.front().mesh;
  const SurfaceExtent e = MeasureSurface(c.surfaces.front());
  c.reference.area = e.area;
  c.reference.span = e.span;
  c.reference.chord = e.mean_aerodynamic_chord;
  c.flight.alpha_deg = std::move(alpha_deg);
  c.flight.beta_deg = std::move(beta_deg);
  return c;
}

inline Case WingCase(Surface wing, std::vector<double> alpha_deg = {0.0}, std::vector<double> beta_deg = {0.0}) {
  std::vector<Surface> s;
  s.push_back(std::move(wing));
  return MakeCase(std::move(s), std::move(alpha_deg), std::move(beta_deg));
}

}  // namespace skein::testing
