// Skein: DATCOM handbook estimates. See datcom.hpp.
#include "skein/datcom.hpp"

#include <cmath>

#include <fmt/format.h>

#include "skein/error.hpp"

namespace skein::datcom {
namespace {

constexpr double kPi = 3.14159265358979323846;

void Require(bool ok, const char* what, double value, const char* rule) {
  if (!ok) throw InputError(fmt::format("DATCOM estimate: {} must be {}, got {}", what, rule, value));
}

void RequireSweep(double sweep_rad) {
  Require(std::isfinite(sweep_rad) && std::abs(sweep_rad) < 0.5 * kPi, "sweep (rad)", sweep_rad,
          "finite and within (-pi/2, pi/2)");
}

}  // namespace

double LiftCurveSlope(double aspect_ratio, double half_chord_sweep_rad, double mach, double kappa) {
  Require(std::isfinite(aspect_ratio) && aspect_ratio > 0.0, "aspect ratio", aspect_ratio, "> 0 and finite");
  RequireSweep(half_chord_sweep_rad);
  Require(std::isfinite(mach) && mach >= 0.0 && mach < 1.0, "Mach number", mach, "in [0, 1)");
  Require(std::isfinite(kappa) && kappa > 0.0, "kappa (section lift slope / 2 pi)", kappa, "> 0 and finite");
  const double beta2 = 1.0 - mach * mach;
  const double t = std::tan(half_chord_sweep_rad);
  const double a = aspect_ratio;
  return 2.0 * kPi * a / (2.0 + std::sqrt(a * a * beta2 / (kappa * kappa) * (1.0 + t * t / beta2) + 4.0));
}

double SweepAtChordFraction(double sweep_m_rad, double m, double n, double aspect_ratio, double taper) {
  RequireSweep(sweep_m_rad);
  Require(std::isfinite(aspect_ratio) && aspect_ratio > 0.0, "aspect ratio", aspect_ratio, "> 0 and finite");
  Require(std::isfinite(taper) && taper >= 0.0, "taper ratio", taper, ">= 0 and finite");
  Require(std::isfinite(m), "chord fraction m", m, "finite");
  Require(std::isfinite(n), "chord fraction n", n, "finite");
  return std::atan(std::tan(sweep_m_rad) - 4.0 / aspect_ratio * (n - m) * (1.0 - taper) / (1.0 + taper));
}

double HalfChordSweep(double quarter_chord_sweep_rad, double aspect_ratio, double taper) {
  return SweepAtChordFraction(quarter_chord_sweep_rad, 0.25, 0.5, aspect_ratio, taper);
}

}  // namespace skein::datcom
