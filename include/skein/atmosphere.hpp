// Skein: the International Standard Atmosphere (ISO 2533:1975, identical to ICAO Doc 7488/3 and to the U.S.
// Standard Atmosphere 1976 below 32 km), from the standard's defining equations:
//   sea level  T0 = 288.15 K, p0 = 101325 Pa, g0 = 9.80665 m/s^2, R = 287.05287 J/(kg K), gamma = 1.4;
//   0 .. 11 km   (troposphere) T = T0 + L H with L = -6.5 K/km,  p = p0 (T / T0)^(-g0 / (R L));
//   11 .. 20 km  (tropopause, isothermal) T = 216.65 K,          p = p11 exp(-g0 (H - 11000) / (R T));
//   density rho = p / (R T); speed of sound a = sqrt(gamma R T);
//   dynamic viscosity by Sutherland's law mu = beta_s T^1.5 / (T + S), beta_s = 1.458e-6 kg/(m s K^0.5),
//   S = 110.4 K.
// H is the geopotential altitude, which is what a standard altimeter shows (pressure altitude); it differs
// from the geometric height by about 0.3 % at 20 km. Below sea level the troposphere's lapse rate continues
// down to -2000 m, where ISO 2533 starts its tables.
//
//   skein::AtmosphereState s = skein::StandardAtmosphere(5000.0);   // s.density = 0.736 kg/m^3
#pragma once

namespace skein {

/// Altitudes the model covers, m (geopotential).
inline constexpr double kAtmosphereMinAltitude = -2000.0;
inline constexpr double kAtmosphereMaxAltitude = 20000.0;

struct AtmosphereState {
  double altitude = 0.0;             ///< m, geopotential
  double temperature = 0.0;          ///< K
  double pressure = 0.0;             ///< Pa
  double density = 0.0;              ///< kg/m^3
  double speed_of_sound = 0.0;       ///< m/s
  double dynamic_viscosity = 0.0;    ///< Pa s
  double kinematic_viscosity = 0.0;  ///< m^2/s
};

/// The standard atmosphere at geopotential altitude `altitude` (m). Throws InputError (without a file
/// position; the reader adds one) for an altitude outside [kAtmosphereMinAltitude, kAtmosphereMaxAltitude] or
/// not finite.
AtmosphereState StandardAtmosphere(double altitude);

/// Sutherland's law for air, Pa s, at temperature T (K > 0).
double SutherlandViscosity(double temperature);

}  // namespace skein
