// The International Standard Atmosphere against its tables.
//
// Sources:
//  - ISO 2533:1975, Standard Atmosphere; ICAO Doc 7488/3, Manual of the ICAO Standard Atmosphere (1993); and
//    U.S. Standard Atmosphere, 1976 (NOAA, NASA, USAF), Table I, which agree below 32 km. The values below are
//    the tables' entries at geopotential altitudes 0, 1000, 5000 and 11000 m, to the figures printed there
//    (recalled from the tables, "from memory": they could not be checked against a printed copy here, but they
//    are given to more figures than the 1e-4 tolerance needs and any slip in one of them fails the test).
//  - Sutherland's law with the standard's constants: sea-level dynamic viscosity 1.7894e-5 Pa s (same tables).
#include <cmath>
#include <string>

#include <gtest/gtest.h>

#include "skein/atmosphere.hpp"
#include "skein/error.hpp"

namespace skein {
namespace {

struct Row {
  double altitude, temperature, pressure, density, speed_of_sound;
};

// H (m), T (K), p (Pa), rho (kg/m^3), a (m/s).
constexpr Row kTable[] = {
    {0.0, 288.15, 101325.0, 1.22500, 340.294},
    {1000.0, 281.65, 89874.6, 1.11164, 336.434},
    {5000.0, 255.65, 54019.9, 0.736116, 320.529},
    {11000.0, 216.65, 22632.1, 0.363918, 295.070},
};

TEST(StandardAtmosphere, MatchesTabulatedValues) {
  for (const Row& row : kTable) {
    const AtmosphereState s = StandardAtmosphere(row.altitude);
    const std::string at = "H = " + std::to_string(row.altitude) + " m";
    EXPECT_NEAR(s.temperature / row.temperature, 1.0, 1e-4) << at;
    EXPECT_NEAR(s.pressure / row.pressure, 1.0, 1e-4) << at;
    EXPECT_NEAR(s.density / row.density, 1.0, 1e-4) << at;
    EXPECT_NEAR(s.speed_of_sound / row.speed_of_sound, 1.0, 1e-4) << at;
  }
}

TEST(StandardAtmosphere, SutherlandViscosityAtSeaLevel) {
  EXPECT_NEAR(StandardAtmosphere(0.0).dynamic_viscosity / 1.7894e-5, 1.0, 1e-4);
}

// The tropopause: the two layers meet continuously at 11 km, and above it the temperature is constant and the
// pressure falls exponentially with the scale height R T / g0 (the standard's defining equation).
TEST(StandardAtmosphere, IsothermalLayerAboveTropopause) {
  const AtmosphereState below = StandardAtmosphere(11000.0 - 1e-6), above = StandardAtmosphere(11000.0 + 1e-6);
  EXPECT_NEAR(above.pressure / below.pressure, 1.0, 1e-9);
  const AtmosphereState a = StandardAtmosphere(15000.0), b = StandardAtmosphere(20000.0);
  EXPECT_DOUBLE_EQ(a.temperature, 216.65);
  EXPECT_DOUBLE_EQ(b.temperature, 216.65);
  EXPECT_NEAR(std::log(a.pressure / b.pressure), 5000.0 * 9.80665 / (287.05287 * 216.65), 1e-12);
}

TEST(StandardAtmosphere, RefusesAltitudesOutsideTheModel) {
  EXPECT_THROW(StandardAtmosphere(20000.5), InputError);
  EXPECT_THROW(StandardAtmosphere(-2000.5), InputError);
  EXPECT_THROW(StandardAtmosphere(std::nan("")), InputError);
  EXPECT_NO_THROW(StandardAtmosphere(-2000.0));
  EXPECT_NO_THROW(StandardAtmosphere(20000.0));
}

}  // namespace
}  // namespace skein
