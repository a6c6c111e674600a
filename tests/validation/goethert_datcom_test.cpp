// Compressibility by the Prandtl-Glauert transformation (Goethert's rule), checked two ways.
//
// Sources:
//  - B. Goethert, "Plane and three-dimensional flow at high subsonic speeds", NACA TM 1105, 1946 (translation):
//    the compressible flow past a wing at Mach M equals the incompressible flow past the wing stretched by
//    1/beta in x (beta = sqrt(1 - M^2)), so that, for lift coefficients on each wing's own reference area,
//        CL_alpha(M; wing) = (1/beta) CL_alpha(0; stretched wing),
//    the stretched wing having aspect ratio beta A, tan(Lambda)/beta for every constant-chord line, and
//    x coordinates and chords divided by beta.
//  - USAF Stability and Control DATCOM (D. E. Hoak et al., 1960, rev. 1978), section 4.1.3.2, the subsonic
//    lift-curve slope of a straight-tapered wing:
//        CL_alpha = 2 pi A / (2 + sqrt(A^2 beta^2 / kappa^2 (1 + tan^2(Lambda_c/2) / beta^2) + 4)),
//    with kappa = cl_alpha / (2 pi) = 1 for the thin-aerofoil section slope. For A = 6, Lambda = 0 it gives
//    CL_alpha(0.6) / CL_alpha(0) = 1.156.
#include <cmath>
#include <string>

#include <fmt/format.h>
#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {


double ClAlpha(const Case& c) {
  const Results r = Run(c, {});
  return *r.points.front().derivatives.Get("CL_alpha");
}

/// Divides every x coordinate and chord of every section by beta (the Goethert-stretched wing).
Case Stretched(Case c, double beta) {
  for (Surface& s : c.surfaces)
    for (Section& sec : s.sections) {
      sec.leading_edge[0] /= beta;
      sec.chord /= beta;
    }
  const SurfaceExtent e = MeasureSurface(c.surfaces.front());
  c.reference.area = e.area;
  c.reference.span = e.span;
  c.reference.chord = e.mean_aerodynamic_chord;
  c.flight.mach = 0.0;
  return c;
}

double DatcomClAlpha(double aspect, double beta, double tan_half_chord_sweep) {
  const double pi = 3.14159265358979323846;
  return 2.0 * pi * aspect /
         (2.0 + std::sqrt(aspect * aspect * beta * beta *
                              (1.0 + tan_half_chord_sweep * tan_half_chord_sweep / (beta * beta)) +
                          4.0));
}

// Goethert's rule as an identity of the discrete problem: the solver's stretch of the lattice and a wing built
// stretched must give the same lift-curve slope (at alpha = 0, where the loads are linear in the circulation).
TEST(Goethert, CompressibleSlopeEqualsStretchedIncompressibleSlopeOverBeta) {
  const double mach = 0.6, beta = std::sqrt(1.0 - mach * mach);
  for (double sweep : {0.0, 35.0}) {
    for (WakeDirection wake : {WakeDirection::x_axis, WakeDirection::freestream}) {
      Case c = testing::WingCase(
          testing::TaperedWing(6.0, 1.2, 0.4, sweep, testing::Mesh(6, 16, Spacing::cosine, Spacing::cosine, wake)),
          {0.0});
      c.flight.mach = mach;
      const double compressible = ClAlpha(c);
      const double stretched = ClAlpha(Stretched(c, beta)) / beta;
      RecordProperty("identity_error_sweep_" + std::to_string(sweep), fmt::format("{:.3g}", compressible / stretched - 1.0));
      EXPECT_NEAR(compressible / stretched, 1.0, 1e-6) << "sweep " << sweep << " wake " << ToString(wake);
      // And the stretched wing is a different wing: the correction is not trivially 1/beta.
      c.flight.mach = 0.0;
      EXPECT_GT(std::abs(compressible / ClAlpha(c) - 1.0 / beta), 0.01);
    }
  }
}

// DATCOM's ratio for a rectangular wing of aspect ratio 6 at Mach 0.6: 1.156 (USAF DATCOM 4.1.3.2).
TEST(Goethert, RectangularAspectRatio6MatchesDatcomRatio) {
  const double mach = 0.6, beta = std::sqrt(1.0 - mach * mach);
  Case c = testing::WingCase(testing::RectangularWing(6.0, 1.0, testing::Mesh(8, 24)), {0.0});
  const double incompressible = ClAlpha(c);
  c.flight.mach = mach;
  const double compressible = ClAlpha(c);
  const double datcom = DatcomClAlpha(6.0, beta, 0.0) / DatcomClAlpha(6.0, 1.0, 0.0);
  RecordProperty("lattice_ratio", std::to_string(compressible / incompressible));
  RecordProperty("datcom_ratio", std::to_string(datcom));
  EXPECT_NEAR(datcom, 1.156, 5e-4);  // the published figure, so the formula above is the one meant
  EXPECT_NEAR(compressible / incompressible / datcom, 1.0, 0.01)
      << "lattice ratio " << compressible / incompressible << " vs DATCOM " << datcom;
}

}  // namespace
}  // namespace skein
