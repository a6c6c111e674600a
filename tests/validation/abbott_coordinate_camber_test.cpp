// Mean lines extracted from aerofoil coordinate files (airfoil.hpp), against the analytic mean line.
//
// Source: I. H. Abbott and A. E. von Doenhoff, Theory of Wing Sections, Dover 1959: the NACA 4-digit and
// 5-digit section equations (sec. 6.4, 6.5; the files in cases/airfoils/ are generated from them by
// tools/naca_sections.py, thickness laid off perpendicular to the mean line) and thin-aerofoil theory's
// zero-lift angle alpha_L0 = -(1/pi) int (dz/dx)(cos(theta) - 1) dtheta (sec. 4.3), about -2.08 deg for the
// NACA 2412 mean line. Check: the mean line recovered from the NACA 2412 coordinates gives a zero-lift angle
// within 0.05 deg of the analytic mean line's, by the thin-aerofoil integral and through the lattice.
#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>

#include <fmt/format.h>
#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/airfoil.hpp"
#include "skein/case_file.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

const std::string kAirfoils = std::string(SKEIN_SOURCE_DIR) + "/cases/airfoils/";

Camber FromFile(const std::string& name) {
  return MeanLineFromCoordinates(ReadAirfoilCoordinates(kAirfoils + name), name);
}

TEST(CoordinateCamber, Naca2412ZeroLiftAngleByThinAerofoilTheory) {
  const Camber file = FromFile("naca2412.dat");
  const Camber exact = testing::Naca4(2, 4);
  const double a_file = ThinAerofoilZeroLiftAngleDeg(file), a_exact = ThinAerofoilZeroLiftAngleDeg(exact);
  RecordProperty("alpha_L0_file_deg", fmt::format("{:.4f}", a_file));
  RecordProperty("alpha_L0_analytic_deg", fmt::format("{:.4f}", a_exact));
  EXPECT_NEAR(a_exact, -2.08, 0.01);  // the book's thin-aerofoil value for this mean line
  EXPECT_NEAR(a_file, a_exact, 0.05);
  EXPECT_NEAR(file.table_thickness, 0.12, 0.002);
  // The recovered line itself: height within 2e-4 c, and its maximum near 0.4 c.
  for (double x = 0.05; x < 1.0; x += 0.05) EXPECT_NEAR(file.Height(x), exact.Height(x), 2e-4) << x;
}

double ZeroLiftAlphaDeg(const Camber& camber) {
  Case c = testing::WingCase(testing::RectangularWing(40.0, 1.0, testing::Mesh(16, 10), camber), {0.0, 2.0});
  const Results r = skein::Run(c, {});
  const double cl0 = r.points[0].CL, cl2 = r.points[1].CL;
  return -cl0 / ((cl2 - cl0) / 2.0);
}

TEST(CoordinateCamber, Naca2412ZeroLiftAngleThroughTheLattice) {
  const double a_file = ZeroLiftAlphaDeg(FromFile("naca2412.dat"));
  const double a_exact = ZeroLiftAlphaDeg(testing::Naca4(2, 4));
  RecordProperty("lattice_alpha_L0_file_deg", fmt::format("{:.4f}", a_file));
  RecordProperty("lattice_alpha_L0_analytic_deg", fmt::format("{:.4f}", a_exact));
  EXPECT_NEAR(a_file, a_exact, 0.05);
}

// A symmetric section has no camber; the 5-digit file gives the 230 mean line's zero-lift angle
// (thin-aerofoil integral of the analytic 5-digit line, evaluated here: z = k1/6 (x^3 - 3 r x^2 + r^2 (3-r) x)).
TEST(CoordinateCamber, SymmetricAndFiveDigitSections) {
  const Camber sym = FromFile("naca0012.dat");
  EXPECT_NEAR(ThinAerofoilZeroLiftAngleDeg(sym), 0.0, 1e-9);
  EXPECT_NEAR(sym.table_thickness, 0.12, 0.002);
  Camber five;  // the analytic NACA 230 mean line as a table
  five.kind = Camber::Kind::table;
  const double r = 0.2025, k1 = 15.957;
  for (int i = 0; i <= 4000; ++i) {
    const double x = 0.5 * (1.0 - std::cos(3.14159265358979323846 * i / 4000.0));
    five.table_x.push_back(x);
    five.table_height.push_back(x < r ? k1 / 6 * (x * x * x - 3 * r * x * x + r * r * (3 - r) * x)
                                      : k1 * r * r * r / 6 * (1 - x));
    five.table_slope.push_back(x < r ? k1 / 6 * (3 * x * x - 6 * r * x + r * r * (3 - r)) : -k1 * r * r * r / 6);
  }
  EXPECT_NEAR(ThinAerofoilZeroLiftAngleDeg(FromFile("naca23012.dat")), ThinAerofoilZeroLiftAngleDeg(five), 0.05);
}

// The reader resolves the path against the case file's directory, and takes the thickness for profile drag.
TEST(CoordinateCamber, ReadFromACaseFile) {
  const std::string dir = ::testing::TempDir() + "skein_camber_case";
  std::filesystem::create_directories(dir + "/sections");
  std::filesystem::copy_file(kAirfoils + "naca4415.dat", dir + "/sections/n4415.dat",
                             std::filesystem::copy_options::overwrite_existing);
  {
    std::ofstream f(dir + "/wing.toml");
    f << "[[surface]]\nname = \"wing\"\n[surface.trapezoid]\nroot_leading_edge = [0.0, 0.0, 0.0]\nspan = 6.0\n"
         "root_chord = 1.0\ncamber = \"sections/n4415.dat\"\n";
  }
  const Case c = ReadCaseFile(dir + "/wing.toml");
  const Camber& cam = c.surfaces[0].sections[0].camber;
  EXPECT_EQ(cam.kind, Camber::Kind::table);
  EXPECT_NEAR(cam.table_thickness, 0.15, 0.003);
  EXPECT_NEAR(cam.Height(0.4), testing::Naca4(4, 4).Height(0.4), 3e-4);
}

struct Bad {
  const char* text;
  const char* message;
};

TEST(CoordinateCamber, MalformedFilesNameFileAndLine) {
  const Bad cases[] = {
      {"name\n1.0 0.0\n0.5 0.05\n0.0 0.0\n0.5 -0.04\nx y\n1.0 0.0\n",
       "bad.dat:6: expected two numbers \"x z\", got \"x y\""},
      {"1.0 0.0\n0.5 0.05\n0.0 0.0\n0.5 -0.04\n", "bad.dat:4: 4 points; a section needs at least 5 (3 on each "
                                                  "surface, sharing the leading edge)"},
      {"1.0 0.0\n0.5 0.05\n0.7 0.04\n0.0 0.0\n0.5 -0.04\n1.0 0.0\n",
       "bad.dat:2: x = 0.5 turns back along the first surface (after x = 0.7); expected the points from the "
       "trailing edge over the upper surface to the leading edge (least x), then along the lower surface back to "
       "the trailing edge"},
      {"0.0 0.0\n0.5 0.05\n1.0 0.0\n0.5 -0.04\n0.2 -0.02\n",
       "bad.dat:1: the leading edge (the point of least x) must lie between the first and last points, which are "
       "the trailing edge, ahead of them"},
      {"1.0 0.0\n0.5 0.05\n0.0 0.0\n0.5 -0.04\n1.0 nan\n", "bad.dat:5: expected two numbers \"x z\", got \"1.0 nan\""},
  };
  const std::string path = ::testing::TempDir() + "bad.dat";
  for (const Bad& b : cases) {
    {
      std::ofstream f(path);
      f << b.text;
    }
    try {
      MeanLineFromCoordinates(ReadAirfoilCoordinates(path, "bad.dat"), "bad.dat");
      ADD_FAILURE() << "no error for:\n" << b.text;
    } catch (const InputError& e) {
      EXPECT_EQ(std::string(e.what()), b.message);
    }
  }
  try {
    ReadAirfoilCoordinates(::testing::TempDir() + "no_such_file.dat", "no_such_file.dat");
    ADD_FAILURE();
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), "no_such_file.dat: cannot open the coordinate file: No such file or directory");
  }
}

}  // namespace
}  // namespace skein
