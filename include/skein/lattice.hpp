// Skein stage 2, mesh: Case -> Lattice, the horseshoe-vortex panels (conventions.md, "The lattice").
//
//   skein::Lattice lat = skein::BuildLattice(c);
//
// The lattice always holds every panel of the configuration (both halves of a symmetric surface), stored as
// structure-of-arrays so the influence kernel vectorises. Panels of a surface are stored strip by strip across
// the whole surface (left tip to right tip for a symmetric surface, first section to last otherwise) and, within
// a strip, from the leading edge to the trailing edge. For a mirrored panel, `mirror_of` names the given-half
// panel it reflects, which is how the solver builds half models.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "skein/case.hpp"

namespace skein {

/// Fraction of a panel's smaller side used as the vortex core radius of its horseshoe (biot_savart.hpp).
inline constexpr double kCoreFraction = 0.05;

/// Points stored as three arrays.
struct PointArray {
  std::vector<double> x, y, z;
  std::size_t size() const { return x.size(); }
  void push_back(const Vec3& p) {
    x.push_back(p[0]);
    y.push_back(p[1]);
    z.push_back(p[2]);
  }
  Vec3 operator[](std::size_t i) const { return {x[i], y[i], z[i]}; }
  void resize(std::size_t n) {
    x.resize(n);
    y.resize(n);
    z.resize(n);
  }
};

/// One spanwise column of panels.
struct Strip {
  int surface = 0;             ///< index into Lattice::surfaces
  std::size_t first_panel = 0;  ///< panels first_panel .. first_panel + panels - 1, leading edge first
  int panels = 0;
  Vec3 quarter_chord{};        ///< m, midpoint of the strip's quarter-chord line (station y, z)
  double chord = 0.0;          ///< m, local chord at the strip's mid-span
  double width = 0.0;          ///< m, length of the strip's leading edge projected on the yz plane
  Vec3 normal{};               ///< unit, the strip's mean panel normal
  Vec3 te_left{}, te_right{};  ///< trailing-edge corners (where the strip's trailing legs leave), left = A side
  int mirror_of = -1;          ///< given-half strip this one reflects, -1 if it is given
};

struct LatticeSurface {
  std::string name;
  std::size_t first_panel = 0, panels = 0;
  std::size_t first_strip = 0, strips = 0;
  bool symmetric = false;
  /// True for a non-symmetric surface lying in the plane y = 0 (a centre-line fin): in symmetric flight it
  /// carries no load, so a half model leaves it out of the symmetric system.
  bool on_symmetry_plane = false;
};

/// The vortex lattice. Panel i's horseshoe: infinity -> te_a -> a -> b -> te_b -> infinity.
struct Lattice {
  std::vector<LatticeSurface> surfaces;
  std::vector<Strip> strips;

  // Per panel (structure of arrays).
  PointArray a, b;            ///< bound segment end points on the quarter-chord line, a -> b
  PointArray te_a, te_b;      ///< trailing-edge ends of the legs through a and b
  PointArray control;         ///< control point: three-quarter chord, mid-way across the panel
  PointArray normal;          ///< unit normal at the control point (camber and deflection included)
  PointArray corner_le_a, corner_le_b, corner_te_a, corner_te_b;  ///< panel corners (for plots and checks)
  std::vector<double> core4;  ///< core radius^4 of the panel's horseshoe, m^4
  std::vector<double> area;   ///< m^2
  std::vector<int> strip;     ///< strip index of each panel
  std::vector<int> surface;   ///< surface index of each panel
  std::vector<int> mirror_of;  ///< given-half panel this one reflects, -1 if it is given
  std::vector<int> control_of;  ///< index into `controls` of the control the panel belongs to, -1 if none
  PointArray normal_rate;      ///< d normal / d deflection of that control, per radian (zero if none)

  /// Every control of the configuration, in case order (surface by surface): its name and its surface.
  struct ControlInfo {
    std::string name;
    int surface = 0;
  };
  std::vector<ControlInfo> controls;

  std::size_t panels() const { return area.size(); }
  /// True when every surface is symmetric or lies on the plane y = 0, so a half model is exact for
  /// symmetric flight.
  bool geometry_symmetric = false;
};

/// Builds the lattice of a case. Throws InputError for a geometry that cannot be meshed (degenerate panels).
Lattice BuildLattice(const Case& c);

/// Panel count the case will produce, without building anything (for memory estimates).
std::size_t CountPanels(const Case& c);
/// Panel count of one surface (an upper bound when controls add mesh lines).
std::size_t CountPanels(const Surface& s);

/// Spacing fractions in [0, 1]: n + 1 values from 0 to 1 (library function so tests can check it).
///  uniform: t;  cosine: (1 - cos(pi t))/2;  sine: sin(pi t / 2).
std::vector<double> SpacingFractions(Spacing s, int n);

}  // namespace skein
