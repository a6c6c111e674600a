// Skein: the International Standard Atmosphere. See atmosphere.hpp for the equations and their source.
#include "skein/atmosphere.hpp"

#include <cmath>

#include <fmt/format.h>

#include "skein/error.hpp"

namespace skein {
namespace {

constexpr double kT0 = 288.15;          // K
constexpr double kP0 = 101325.0;        // Pa
constexpr double kG0 = 9.80665;         // m/s^2
constexpr double kR = 287.05287;        // J/(kg K), specific gas constant of dry air in ISO 2533
constexpr double kGamma = 1.4;
constexpr double kLapse = -0.0065;      // K/m, up to the tropopause
constexpr double kTropopause = 11000.0;  // m
constexpr double kSutherlandBeta = 1.458e-6;  // kg/(m s K^0.5)
constexpr double kSutherlandS = 110.4;        // K

}  // namespace

double SutherlandViscosity(double temperature) {
  SKEIN_ASSERT(temperature > 0.0);
  return kSutherlandBeta * temperature * std::sqrt(temperature) / (temperature + kSutherlandS);
}

AtmosphereState StandardAtmosphere(double altitude) {
  if (!(altitude >= kAtmosphereMinAltitude && altitude <= kAtmosphereMaxAltitude))
    throw InputError(fmt::format("altitude must be between {} and {} m (the standard atmosphere's troposphere "
                                 "and tropopause), got {}",
                                 kAtmosphereMinAltitude, kAtmosphereMaxAltitude, altitude));
  AtmosphereState s;
  s.altitude = altitude;
  const double exponent = -kG0 / (kR * kLapse);
  if (altitude <= kTropopause) {
    s.temperature = kT0 + kLapse * altitude;
    s.pressure = kP0 * std::pow(s.temperature / kT0, exponent);
  } else {
    const double t11 = kT0 + kLapse * kTropopause;
    const double p11 = kP0 * std::pow(t11 / kT0, exponent);
    s.temperature = t11;
    s.pressure = p11 * std::exp(-kG0 * (altitude - kTropopause) / (kR * t11));
  }
  s.density = s.pressure / (kR * s.temperature);
  s.speed_of_sound = std::sqrt(kGamma * kR * s.temperature);
  s.dynamic_viscosity = SutherlandViscosity(s.temperature);
  s.kinematic_viscosity = s.dynamic_viscosity / s.density;
  return s;
}

}  // namespace skein
