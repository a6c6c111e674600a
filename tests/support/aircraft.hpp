// Skein tests: whole-aircraft Case objects built in code (wing, tail, fin and their controls).
//
// The configurations are our own invention, sized like a light two-seater, with deliberately awkward features
// so that a test exercises every term of the boundary condition: dihedral, sweep, camber, a tail above the
// wing plane, a fin on the centre line, and ailerons, elevator and rudder. Geometry axes and signs:
// conventions.md (x aft, y right, z up; a symmetric surface is given for y >= 0; a fin bottom to top).
//
//   skein::Case c = skein::testing::TestAircraft(skein::WakeDirection::x_axis);
#pragma once

#include <stdexcept>
#include <string>
#include <utility>
#include <vector>

#include "planforms.hpp"
#include "skein/case.hpp"

namespace skein::testing {

inline Control MakeControl(std::string name, double hinge, double from, double to, double deflection_deg,
                           bool opposite) {
  Control c;
  c.name = std::move(name);
  c.hinge = hinge;
  c.span_fraction = {from, to};
  c.deflection_deg = deflection_deg;
  c.mirror_opposite = opposite;
  return c;
}

/// A two-section surface from root and tip leading edges and chords.
inline Surface TwoSectionSurface(std::string name, bool symmetric, const Vec3& root_le, double root_chord,
                                 const Vec3& tip_le, double tip_chord, const MeshOptions& mesh,
                                 Camber camber = {}, double tip_twist_deg = 0.0) {
  Surface s;
  s.name = std::move(name);
  s.symmetric = symmetric;
  s.mesh = mesh;
  s.sections.push_back(MakeSection(root_le, root_chord, 0.0, camber));
  s.sections.push_back(MakeSection(tip_le, tip_chord, tip_twist_deg, camber));
  return s;
}

/// Wing (10 m span, 4 deg dihedral, a little sweep, NACA 2412, 1 deg washout) with ailerons; tail 0.5 m above
/// the wing plane with an elevator; centre-line fin with a rudder. Moment point near a quarter of the mean
/// chord. `fine` multiplies the panel counts.
inline Case TestAircraft(WakeDirection wake, int fine = 1) {
  const MeshOptions wing_mesh = Mesh(4 * fine, 8 * fine, Spacing::cosine, Spacing::cosine, wake);
  const MeshOptions tail_mesh = Mesh(4 * fine, 4 * fine, Spacing::cosine, Spacing::cosine, wake);
  Surface wing = TwoSectionSurface("wing", true, {0.0, 0.0, 0.0}, 1.6, {0.25, 5.0, 0.35}, 1.0, wing_mesh,
                                   Naca4(2, 4), -1.0);
  wing.controls.push_back(MakeControl("aileron", 0.75, 0.6, 0.95, 0.0, true));
  Surface tail = TwoSectionSurface("tail", true, {5.0, 0.0, 0.5}, 0.8, {5.2, 1.7, 0.5}, 0.5, tail_mesh);
  tail.incidence_deg = -2.0;
  tail.controls.push_back(MakeControl("elevator", 0.7, 0.0, 1.0, 0.0, false));
  Surface fin = TwoSectionSurface("fin", false, {4.8, 0.0, 0.1}, 1.0, {5.3, 0.0, 1.5}, 0.55, tail_mesh);
  fin.controls.push_back(MakeControl("rudder", 0.7, 0.0, 0.9, 0.0, false));
  std::vector<Surface> s;
  s.push_back(std::move(wing));
  s.push_back(std::move(tail));
  s.push_back(std::move(fin));
  Case c = MakeCase(std::move(s), {4.0}, {0.0});
  c.mesh = wing_mesh;
  c.reference.moment_point = {0.45, 0.0, 0.0};
  c.flight.speed = 40.0;
  c.flight.speed_given = true;
  return c;
}

/// Index of a control by name in a Case (surface, control); aborts the test on a wrong name.
inline Control& ControlNamed(Case& c, const std::string& name) {
  for (Surface& s : c.surfaces)
    for (Control& ct : s.controls)
      if (ct.name == name) return ct;
  throw std::runtime_error("no control " + name);
}

inline Surface& SurfaceNamed(Case& c, const std::string& name) {
  for (Surface& s : c.surfaces)
    if (s.name == name) return s;
  throw std::runtime_error("no surface " + name);
}

}  // namespace skein::testing
