// The reader's flight condition: altitude instead of density, and speed and mach tied together through the
// standard atmosphere's speed of sound (case-format.md, [flight]; atmosphere.hpp).
#include <sstream>
#include <string>

#include <gtest/gtest.h>

#include "skein/atmosphere.hpp"
#include "skein/case_file.hpp"

namespace skein {
namespace {

const char* kSurface = R"(
[[surface]]
name = "wing"
  [surface.trapezoid]
  root_leading_edge = [0.0, 0.0, 0.0]
  span = 4.0
  root_chord = 0.5
)";

Case Read(const std::string& flight) { return ReadCaseText("[flight]\n" + flight + kSurface, "flight.toml"); }

std::string ErrorOf(const std::string& flight) {
  try {
    Read(flight);
  } catch (const InputError& e) {
    return e.what();
  }
  return "(no error)";
}

TEST(FlightCondition, AltitudeSetsDensityAndViscosity) {
  const Case c = Read("altitude = 5000\nspeed = 80.0\n");
  const AtmosphereState air = StandardAtmosphere(5000.0);
  ASSERT_TRUE(c.flight.altitude.has_value());
  EXPECT_DOUBLE_EQ(c.flight.density, air.density);
  EXPECT_DOUBLE_EQ(c.flight.dynamic_viscosity, air.dynamic_viscosity);
  // Speed given: the Mach number follows from the speed of sound there.
  EXPECT_DOUBLE_EQ(c.flight.mach, 80.0 / air.speed_of_sound);
}

TEST(FlightCondition, MachWithAltitudeGivesTheSpeed) {
  const Case c = Read("altitude = 11000\nmach = 0.5\n");
  EXPECT_TRUE(c.flight.speed_given);
  EXPECT_DOUBLE_EQ(c.flight.speed, 0.5 * StandardAtmosphere(11000.0).speed_of_sound);
}

TEST(FlightCondition, ConsistentSpeedAndMachAreAccepted) {
  const double a = StandardAtmosphere(1000.0).speed_of_sound;
  const Case c = Read("altitude = 1000\nspeed = " + std::to_string(0.3 * a) + "\nmach = 0.3\n");
  EXPECT_DOUBLE_EQ(c.flight.mach, 0.3);
}

TEST(FlightCondition, DensityAloneKeepsTheOldMeaning) {
  const Case c = Read("density = 1.0\nspeed = 30.0\n");
  EXPECT_FALSE(c.flight.altitude.has_value());
  EXPECT_DOUBLE_EQ(c.flight.density, 1.0);
  EXPECT_DOUBLE_EQ(c.flight.mach, 0.0);
}

TEST(FlightCondition, Errors) {
  EXPECT_EQ(ErrorOf("altitude = 1000\ndensity = 1.1\n"),
            "flight.toml:3:11: flight: give either altitude (the standard atmosphere sets the density) or density, "
            "not both");
  EXPECT_EQ(ErrorOf("altitude = 25000\n"),
            "flight.toml:2:12: flight: altitude must be between -2000 and 20000 m (the standard atmosphere's "
            "troposphere and tropopause), got 25000");
  EXPECT_EQ(ErrorOf("altitude = \"high\"\n"),
            "flight.toml:2:12: flight: expected a number for \"altitude\", got a string");
  EXPECT_EQ(ErrorOf("altitude = 0\nspeed = 100.0\nmach = 0.5\n"),
            "flight.toml:4:8: flight: speed 100 m/s and mach 0.5 contradict each other at altitude 0 m, where the "
            "speed of sound is 340.29 m/s (speed 100 m/s is mach 0.2939); give one of them");
  EXPECT_EQ(ErrorOf("altitude = 0\nspeed = 400.0\n"),
            "flight.toml:3:9: flight: speed 400 m/s is mach 1.1755 at altitude 0 m; the compressibility correction "
            "needs mach < 1");
  EXPECT_EQ(ErrorOf("altitude = 0\nmach = 0\n"),
            "flight.toml:3:8: flight: mach 0 with altitude gives no speed; give speed (m/s) or a mach above 0");
  EXPECT_EQ(ErrorOf("altitud = 0\n"), "flight.toml:2:1: flight: unknown key \"altitud\" (did you mean \"altitude\"?)");
}

TEST(FlightCondition, HighMachFromSpeedWarns) {
  const Case c = Read("altitude = 0\nspeed = 270.0\n");
  ASSERT_EQ(c.warnings.size(), 1u);
  EXPECT_NE(c.warnings[0].find("flight.toml:3:9: flight: mach 0.7934 is above about 0.7"), std::string::npos)
      << c.warnings[0];
}

TEST(FlightCondition, EchoReadsBackTheSame) {
  for (const char* flight : {"altitude = 5000\nmach = 0.4\n", "altitude = 300\nspeed = 55.5\n", "altitude = 20\n"}) {
    const Case c = Read(flight);
    std::ostringstream echo;
    WriteCaseToml(c, echo);
    const Case back = ReadCaseText(echo.str(), "echo.toml");
    EXPECT_EQ(back.flight.altitude, c.flight.altitude) << echo.str();
    EXPECT_EQ(back.flight.density, c.flight.density);
    EXPECT_EQ(back.flight.speed, c.flight.speed);
    EXPECT_EQ(back.flight.mach, c.flight.mach);
    EXPECT_EQ(back.flight.speed_given, c.flight.speed_given);
  }
}

}  // namespace
}  // namespace skein
