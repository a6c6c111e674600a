// Skein: handbook estimates from the USAF Stability and Control DATCOM, for checking the lattice against
// and for quick sizing. Angles in radians here (these are formulas, not case-file inputs); per radian out.
//
//   double a = skein::datcom::LiftCurveSlope(4.0, 45.0 * kDegToRad);   // = pi
//
// These are semi-empirical handbook formulas for straight-tapered wings in attached subsonic flow: conceptual
// estimates only, no substitute for test data.
#pragma once

namespace skein::datcom {

/// Lift-curve slope of a straight-tapered wing, per radian (USAF Stability and Control DATCOM, sec. 4.1.3.2,
/// the Helmbold-Diederich form):
///     CL_alpha = 2 pi A / (2 + sqrt(A^2 beta^2 / kappa^2 (1 + tan^2(Lambda_c/2) / beta^2) + 4)),
/// with A = b^2 / S the aspect ratio, Lambda_c/2 the sweep of the half-chord line, beta = sqrt(1 - M^2) and
/// kappa the section lift-curve slope over its thin-airfoil value (cl_alpha / (2 pi) at M = 0; default 1).
/// Throws InputError for A <= 0, |sweep| >= 90 deg, M outside [0, 1) or kappa <= 0 (non-finite included).
double LiftCurveSlope(double aspect_ratio, double half_chord_sweep_rad, double mach = 0.0, double kappa = 1.0);

/// Sweep of the line at chord fraction n of a straight-tapered wing, from the sweep of the line at chord
/// fraction m (common practice geometry: the constant-percent-chord lines of a trapezoid),
///     tan Lambda_n = tan Lambda_m - (4 / A) (n - m) (1 - taper) / (1 + taper),
/// A = b^2 / S the aspect ratio of the whole wing, taper = tip chord / root chord. Radians in and out.
/// Throws InputError for A <= 0, taper < 0, |sweep| >= 90 deg or non-finite arguments.
double SweepAtChordFraction(double sweep_m_rad, double m, double n, double aspect_ratio, double taper);

/// The half-chord sweep from the quarter-chord sweep: SweepAtChordFraction(sweep, 0.25, 0.5, A, taper).
double HalfChordSweep(double quarter_chord_sweep_rad, double aspect_ratio, double taper);

}  // namespace skein::datcom
