// Skein stage 5, loads: trim in pitch. Finds the angle of attack and one setting (a surface's incidence or a
// control's deflection) at which the pitching moment about the moment point vanishes and the lift coefficient
// equals a target, as the case's [trim] table asks (case-format.md).
//
//   skein::Case c = skein::ReadCaseFile("cases/trainer_two_seat.toml");
//   skein::Results r = skein::Trim(c, {});   // r.points holds the trimmed point, r.trim how it got there
//
// Method: Newton's method on (alpha, setting) with the residual (CL - CL_target, Cm) of the EXACT solution at
// each iterate: the case is re-meshed with the setting and re-solved (a deflection turns normals, which
// changes the influence matrix as well as the right-hand side; an incidence moves the surface). The Jacobian
// comes from the derivatives of that solution: CL_alpha and Cm_alpha, and for a control its derivative column
// (exact); for an incidence a forward difference over one more solve. Convergence is declared only when both
// residuals of an exact solution are below TrimOptions::tolerance, and the point returned is that solution.
//
// A target that cannot be reached throws TrimError (a numerical outcome; the CLI exits with 3): a setting with
// no independent pitch authority, an alpha or a setting beyond the bounds below, no convergence.
#pragma once

#include <string>

#include "skein/case.hpp"
#include "skein/error.hpp"
#include "skein/results.hpp"
#include "skein/run.hpp"

namespace skein {

/// A trim that cannot be reached. what() is `file:line:column: trim: message`, pointing at the [trim] table.
class TrimError : public NumericalError {
 public:
  TrimError(const std::string& file, SourceRegion where, const std::string& message);
};

struct TrimOptions {
  /// Newton iterations before giving up. The problem is nearly linear: 3 to 6 are usual.
  int max_iterations = 25;
  /// Bound on |CL - CL_target| and |Cm| at the exact solution of the last iterate. 1e-10 leaves two orders of
  /// magnitude to the acceptance bound of 1e-8 and stays above round-off (about 1e-13).
  double tolerance = 1e-10;
  /// Linear inviscid theory says nothing useful beyond this angle of attack (deg): a trim that needs more is
  /// refused rather than reported.
  double max_alpha_deg = 20.0;
  /// Largest incidence or deflection (deg) the trim may use; beyond it a real control would stall or hit a stop.
  double max_setting_deg = 30.0;
  /// Largest change of alpha or of the setting in one Newton step (deg), so that an early, poor linearisation
  /// cannot throw the iterate far away.
  double max_step_deg = 10.0;
  /// Forward-difference step for the incidence column of the Jacobian (deg): its truncation error, about
  /// 1e-5 relative, only slows the quadratic convergence to a fast linear one; round-off is about 1e-9.
  double incidence_step_deg = 1e-3;

  /// Throws InputError naming the field, its value and the rule it broke.
  void Validate() const;
};

/// Trims the case (its [trim] table, Case::trim) at the first beta of its sweep and its rates, starting from
/// its first alpha and its current setting. Returns the Results of the trimmed point (one point) with
/// Results::trim filled in. Throws InputError when the case has no usable [trim] table, TrimError when the
/// target cannot be reached, NumericalError when a solve fails.
Results Trim(const Case& c, const RunOptions& run, const TrimOptions& options = {});

/// The configuration a trim solved: the case with the trimmed setting (trim.value_deg) in the place its [trim]
/// table names, and one flight point at the trimmed alpha and the case's first beta (to mesh it for a plot).
Case TrimmedCase(const Case& c, const TrimResult& trim);

}  // namespace skein
