// Tests for several lifting surfaces in one lattice: mirror symmetry and the half model, a tail close to the
// wing's wake (finite, mesh-convergent results), the downwash each surface reports, and controls that meet or
// overlap. The configurations are our own (tests/support/aircraft.hpp); references are symmetry, the discrete
// model's own finite differences and mesh refinement, each named at its check.
#include <cmath>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "../support/aircraft.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

using testing::MakeControl;
using testing::Mesh;
using testing::TwoSectionSurface;

/// Canard ahead of a swept wing with winglets at its tips (the winglets' roots are the wing's tip chords).
Case CanardWithWinglets(WakeDirection wake) {
  const MeshOptions m = Mesh(4, 8, Spacing::cosine, Spacing::cosine, wake);
  Surface canard = TwoSectionSurface("canard", true, {0.0, 0.0, 0.25}, 0.4, {0.0, 1.3, 0.25}, 0.32, m,
                                     testing::Naca4(2, 4));
  canard.incidence_deg = 3.0;
  canard.controls.push_back(MakeControl("elevator", 0.7, 0.1, 1.0, -2.0, false));
  Surface wing = TwoSectionSurface("wing", true, {2.0, 0.0, 0.0}, 1.1, {3.386, 3.8, 0.2}, 0.5, m);
  wing.controls.push_back(MakeControl("aileron", 0.75, 0.55, 0.9, 0.0, true));
  Surface winglet = TwoSectionSurface("winglet", true, {3.386, 3.8, 0.2}, 0.5, {3.9, 3.8, 1.1}, 0.25,
                                      Mesh(4, 4, Spacing::cosine, Spacing::cosine, wake));
  winglet.controls.push_back(MakeControl("rudder", 0.7, 0.05, 0.85, 0.0, true));
  std::vector<Surface> s;
  s.push_back(std::move(canard));
  s.push_back(std::move(wing));
  s.push_back(std::move(winglet));
  Case c = testing::MakeCase(std::move(s), {3.0});
  c.mesh = m;
  c.reference = {6.06, 7.6, 0.85, {2.3, 0.0, 0.0}, true, true, true};
  return c;
}

/// Wing and a V-tail (35 deg dihedral) with elevator (same) and rudder (opposite) pairs that meet at mid-span.
Case WingAndVTail(WakeDirection wake) {
  const MeshOptions m = Mesh(4, 10, Spacing::cosine, Spacing::cosine, wake);
  Surface wing = TwoSectionSurface("wing", true, {0.0, 0.0, 0.0}, 0.34, {0.0, 1.6, 0.056}, 0.2, m,
                                   testing::Naca4(4, 4), -1.5);
  Surface vtail = TwoSectionSurface("vtail", true, {1.15, 0.0, 0.12}, 0.17, {1.2, 0.425, 0.418}, 0.11,
                                    Mesh(4, 6, Spacing::cosine, Spacing::cosine, wake));
  vtail.controls.push_back(MakeControl("elevator", 0.65, 0.05, 0.5, -3.0, false));
  vtail.controls.push_back(MakeControl("rudder", 0.65, 0.5, 0.95, 0.0, true));
  std::vector<Surface> s;
  s.push_back(std::move(wing));
  s.push_back(std::move(vtail));
  Case c = testing::MakeCase(std::move(s), {3.0});
  c.mesh = m;
  c.reference.moment_point = {0.1, 0.0, 0.0};
  return c;
}

std::vector<Case> SymmetricConfigurations() {
  std::vector<Case> out;
  for (WakeDirection w : {WakeDirection::x_axis, WakeDirection::freestream}) {
    Case a = testing::TestAircraft(w);
    testing::ControlNamed(a, "elevator").deflection_deg = -4.0;  // "same": still mirror-symmetric
    a.flight.rates = {0.0, 0.2, 0.0};                             // a pull-up keeps the flight symmetric
    out.push_back(a);
    out.push_back(CanardWithWinglets(w));
    out.push_back(WingAndVTail(w));
  }
  return out;
}

// A mirror-symmetric aircraft in symmetric flight (beta = 0, no roll or yaw rate, symmetric deflections) has no
// side force, rolling or yawing moment: symmetry, to round-off (1e-12, the acceptance bound). The half model
// splits that problem exactly (influence.hpp), so it must agree with the full lattice to round-off as well
// (1e-10, the acceptance bound), in every output: totals, derivatives, strips and downwash.
TEST(WholeAircraft, SymmetricConfigurationInSymmetricFlightHasNoLateralLoadsAndTheHalfModelIsExact) {
  constexpr double kSymmetric = 1e-12, kHalfFull = 1e-10;
  for (const Case& c : SymmetricConfigurations()) {
    RunOptions half, full;
    full.allow_half_model = false;
    const Results rh = skein::Run(c, half), rf = skein::Run(c, full);
    ASSERT_TRUE(rh.mesh.half_model);
    ASSERT_FALSE(rf.mesh.half_model);
    const PointResult &h = rh.points.front(), &f = rf.points.front();
    const std::string name = c.surfaces[1].name + " with " + ToString(c.mesh.wake) + " wake";
    for (const PointResult* p : {&h, &f}) {
      EXPECT_NEAR(p->CY, 0.0, kSymmetric) << name;
      EXPECT_NEAR(p->Cl, 0.0, kSymmetric) << name;
      EXPECT_NEAR(p->Cn, 0.0, kSymmetric) << name;
    }
    auto close = [&](double a, double b, const std::string& what) {
      EXPECT_NEAR(a, b, kHalfFull * std::max(1.0, std::abs(b))) << name << ": " << what;
    };
    close(h.CL, f.CL, "CL");
    close(h.Cm, f.Cm, "Cm");
    close(h.CD_induced, f.CD_induced, "CD_induced");
    close(h.CD_induced_nearfield, f.CD_induced_nearfield, "CD_induced_nearfield");
    ASSERT_EQ(h.derivatives.items.size(), f.derivatives.items.size());
    for (std::size_t k = 0; k < h.derivatives.items.size(); ++k)
      close(h.derivatives.items[k].second, f.derivatives.items[k].second, h.derivatives.items[k].first);
    for (std::size_t m = 0; m < h.control_derivatives.size(); ++m)
      for (std::size_t k = 0; k < h.control_derivatives[m].second.items.size(); ++k)
        close(h.control_derivatives[m].second.items[k].second, f.control_derivatives[m].second.items[k].second,
              h.control_derivatives[m].first + "." + h.control_derivatives[m].second.items[k].first);
    for (std::size_t s = 0; s < h.surfaces.size(); ++s) {
      close(h.surfaces[s].downwash_deg, f.surfaces[s].downwash_deg, h.surfaces[s].name + " downwash");
      close(h.surfaces[s].downwash_gradient, f.surfaces[s].downwash_gradient, h.surfaces[s].name + " gradient");
      for (std::size_t k = 0; k < h.surfaces[s].strips.gamma.size(); ++k)
        close(h.surfaces[s].strips.gamma[k], f.surfaces[s].strips.gamma[k], h.surfaces[s].name + " strip gamma");
    }
  }
}

/// A rectangular wing (8 m x 1 m) and a tail (3 m x 0.6 m) 4 m behind it at height z, `fine` times the
/// coarsest mesh, wake along x: the tail's control points lie a height z from the plane of the wing's legs.
Case WingAndTailAt(double z, int fine, Spacing spanwise) {
  const MeshOptions mw = Mesh(4, 8 * fine, spanwise, Spacing::cosine, WakeDirection::x_axis);
  const MeshOptions mt = Mesh(4, 3 * fine, spanwise, Spacing::cosine, WakeDirection::x_axis);
  std::vector<Surface> s;
  s.push_back(TwoSectionSurface("wing", true, {0.0, 0.0, 0.0}, 1.0, {0.0, 4.0, 0.0}, 1.0, mw));
  s.push_back(TwoSectionSurface("tail", true, {4.0, 0.0, z}, 0.6, {4.0, 1.5, z}, 0.6, mt));
  Case c = testing::MakeCase(std::move(s), {5.0});
  c.mesh = mw;
  c.reference.moment_point = {0.3, 0.0, 0.0};
  return c;
}

struct TailNumbers {
  double tail_cl, cd_induced, downwash_deg;
};

TailNumbers SolveTail(double z, int fine, Spacing spanwise) {
  const PointResult p = skein::Run(WingAndTailAt(z, fine, spanwise), {}).points.front();
  return {p.surfaces[1].CL, p.CD_induced, p.surfaces[1].downwash_deg};
}

// Reference: mesh refinement. A tail a tenth of a chord above the wing's wake: each doubling of the mesh
// changes the tail's lift, the induced drag and the downwash less than the one before, and the last doubling
// by less than 2 % (the kernel's core, 0.05 of a panel's smaller side, is far smaller than the 0.1 m gap, so
// nothing is smoothed away: this is convergence of the discrete model).
TEST(WholeAircraft, TailJustAboveTheWingWakeIsMeshConvergent) {
  for (Spacing spanwise : {Spacing::cosine, Spacing::uniform}) {
    const TailNumbers n2 = SolveTail(0.1, 2, spanwise), n4 = SolveTail(0.1, 4, spanwise), n8 = SolveTail(0.1, 8, spanwise);
    auto check = [&](double a, double b, double c, const char* what) {
      EXPECT_LT(std::abs(c - b), std::abs(b - a)) << what << " " << a << " " << b << " " << c;
      EXPECT_LT(std::abs(c - b), 0.02 * std::abs(c)) << what << " " << b << " " << c;
    };
    check(n2.tail_cl, n4.tail_cl, n8.tail_cl, "tail CL");
    check(n2.cd_induced, n4.cd_induced, n8.cd_induced, "CD_induced");
    check(n2.downwash_deg, n4.downwash_deg, n8.downwash_deg, "tail downwash");
  }
}

// The Trefftz-plane drag of a tail whose wake runs 0.02 m from the wing's (cosine spacing, legs not lined up):
// evaluated at segment midpoints, another sheet's nearby discrete vortices made it jump by 25 % between
// meshes (0.0085, 0.0069, 0.0092); integrated along each segment (loads.cpp) it stays within 0.5 %.
TEST(WholeAircraft, TrefftzDragOfATailCloseToTheWingWakeDoesNotJumpWithTheMesh) {
  const double c2 = SolveTail(0.02, 2, Spacing::cosine).cd_induced, c4 = SolveTail(0.02, 4, Spacing::cosine).cd_induced,
               c8 = SolveTail(0.02, 8, Spacing::cosine).cd_induced;
  EXPECT_NEAR(c4 / c8, 1.0, 0.005);
  EXPECT_NEAR(c2 / c8, 1.0, 0.005);
}

// A tail in the plane of the wing's legs: every number stays finite (the regularised kernel), or the geometry
// check refuses the case with a message (a control point inside a leg's core). With the tail's strips cut at
// the wing's leg positions (uniform spacing, same strip width) it converges like any other case.
TEST(WholeAircraft, TailInThePlaneOfTheWingWakeIsFiniteOrRefused) {
  for (int fine : {1, 2, 4, 8}) {
    try {
      const PointResult p = skein::Run(WingAndTailAt(0.0, fine, Spacing::cosine), {}).points.front();
      for (double v : {p.CL, p.Cm, p.CD_induced, p.surfaces[1].downwash_deg, p.surfaces[1].downwash_gradient})
        EXPECT_TRUE(std::isfinite(v));
    } catch (const InputError& e) {
      EXPECT_NE(std::string(e.what()).find("trailing leg"), std::string::npos) << e.what();
    }
  }
  const TailNumbers n4 = SolveTail(0.0, 4, Spacing::uniform), n8 = SolveTail(0.0, 8, Spacing::uniform);
  EXPECT_NEAR(n4.tail_cl / n8.tail_cl, 1.0, 0.02);
  EXPECT_NEAR(n4.cd_induced / n8.cd_induced, 1.0, 0.005);
}

// Reference: the discrete model itself. d epsilon / d alpha from the flow-basis columns (wake held fixed)
// against a central difference of the reported downwash over alpha, with the x-axis wake (which does not move).
TEST(Downwash, GradientIsTheDerivativeOfTheReportedDownwash) {
  constexpr double kStepDeg = 0.01;
  for (Case c : {testing::TestAircraft(WakeDirection::x_axis), CanardWithWinglets(WakeDirection::x_axis)}) {
    c.mesh.wake = WakeDirection::x_axis;
    for (Surface& s : c.surfaces) s.mesh.wake = WakeDirection::x_axis;
    c.flight.alpha_deg = {5.0};
    const PointResult p = skein::Run(c, {}).points.front();
    Case plus = c, minus = c;
    plus.flight.alpha_deg = {5.0 + kStepDeg};
    minus.flight.alpha_deg = {5.0 - kStepDeg};
    const PointResult pp = skein::Run(plus, {}).points.front(), pm = skein::Run(minus, {}).points.front();
    for (std::size_t s = 0; s < p.surfaces.size(); ++s) {
      const double fd = (pp.surfaces[s].downwash_deg - pm.surfaces[s].downwash_deg) / (2.0 * kStepDeg);
      EXPECT_NEAR(p.surfaces[s].downwash_gradient, fd, 1e-6 + 1e-5 * std::abs(fd)) << p.surfaces[s].name;
    }
  }
}

TEST(Downwash, ComesFromTheSurfacesAheadOnly) {
  const PointResult t = skein::Run(testing::TestAircraft(WakeDirection::freestream), {}).points.front();
  EXPECT_TRUE(t.surfaces[0].downwash_from.empty());
  EXPECT_EQ(t.surfaces[0].downwash_deg, 0.0);
  // The fin's area-weighted mean bound-vortex x (5.371 m) is just ahead of the tail's (5.378 m), so it counts
  // as ahead; in symmetric flight it carries no load and adds nothing.
  EXPECT_EQ(t.surfaces[1].downwash_from, (std::vector<std::string>{"wing", "fin"}));
  EXPECT_EQ(t.surfaces[2].downwash_from, std::vector<std::string>{"wing"});
  EXPECT_GT(t.surfaces[1].downwash_deg, 0.0);  // a lifting wing turns the flow down at the tail behind it
  EXPECT_GT(t.surfaces[1].downwash_gradient, 0.0);
  EXPECT_LT(t.surfaces[1].downwash_gradient, 1.0);
  const PointResult c = skein::Run(CanardWithWinglets(WakeDirection::freestream), {}).points.front();
  EXPECT_TRUE(c.surfaces[0].downwash_from.empty());  // the canard is ahead of everything
  EXPECT_EQ(c.surfaces[1].downwash_from, std::vector<std::string>{"canard"});
  EXPECT_GT(c.surfaces[1].downwash_deg, 0.0);
}

// Controls that meet (one ends where the next begins) share one mesh line; controls that overlap would leave a
// panel with two owners, and are refused with the control's name.
TEST(WholeAircraftControls, MeetingControlsMeshAndOverlappingOnesAreRefused) {
  Case c = WingAndVTail(WakeDirection::x_axis);
  EXPECT_NO_THROW(skein::Run(c, {}));
  c.surfaces[1].controls[1].span_fraction = {0.45, 0.95};
  try {
    skein::Run(c, {});
    ADD_FAILURE() << "overlapping controls were accepted";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("control \"rudder\": span_fraction [0.45, 0.95] overlaps control \"elevator\""),
              std::string::npos)
        << e.what();
  }
}

}  // namespace
}  // namespace skein
