// Skein: mean camber lines from aerofoil coordinate files.
//
// The file: plain text, one point "x z" per line (two numbers, separated by spaces, tabs or a comma), running
// from the trailing edge over the upper surface to the leading edge and back along the lower surface to the
// trailing edge (either direction round is accepted: the surface with the higher mean z is taken as the upper
// one). A first line that is not two numbers is taken as the section's name; blank lines and lines starting
// with '#' are skipped. Any scale and position: the chord runs from the leading edge (the point of least x)
// to the trailing edge (the midpoint of the first and last points).
//
// The mean line (Abbott & von Doenhoff, Theory of Wing Sections, sec. 6.2: halfway between the surfaces,
// measured perpendicular to the mean line itself):
//  1. a first estimate halfway between the surfaces at the same x (monotone cubic interpolation of each
//     surface, Fritsch-Carlson), at cosine-spaced stations from 1 % to 99.8 % of the chord;
//  2. a few passes that move each point to the midpoint of the cut across the section along the current
//     line's normal;
//  3. ahead of x/c = 0.08, where the surfaces close in round the nose and such cuts are ill-posed, the cubic
//     through the points nearest x/c = 0.08, 0.12, 0.16, 0.20, continued to where it meets the contour: that
//     point is the leading edge of the chord line (to the trailing-edge midpoint);
//  4. heights in chord axes on a cosine grid, slope by second-order differences there and one pass of a
//     1-2-1 filter against the ripple of coordinates printed to few digits.
// The cubic continuation is exact for mean lines that are polynomials of at most third degree ahead of
// x/c = 0.2 (NACA 4-digit lines with p >= 0.2, 5-digit 230..250); a line with sharper nose camber is
// smoothed there.

#pragma once

#include <string>
#include <vector>

#include "skein/case.hpp"

namespace skein {

/// Points of a coordinate file, in file order, with the line each came from.
struct AirfoilCoordinates {
  std::string path;
  std::vector<double> x, z;
  std::vector<int> line;
};

/// Points on the cosine grid used for the mean-line table.
inline constexpr int kMeanLinePoints = 201;

/// Reads a coordinate file. Throws InputError naming file and line for a malformed file; messages name the
/// file as `shown_path` (e.g. as the case file wrote it) when that is given.
AirfoilCoordinates ReadAirfoilCoordinates(const std::string& open_path, const std::string& shown_path = "");

/// The mean line of a section (Camber::Kind::table, spelling = `spelling`). Throws InputError naming the file
/// and line when the points do not make one section (fewer than 3 points per surface, x turning back along a
/// surface, no chord).
Camber MeanLineFromCoordinates(const AirfoilCoordinates& points, const std::string& spelling);

/// The zero-lift angle (deg) of a mean line by thin-aerofoil theory (Abbott & von Doenhoff, Theory of Wing
/// Sections, sec. 4.3): alpha_L0 = -(1/pi) int_0^pi (dz/dx)(cos(theta) - 1) dtheta, x = (1 - cos(theta))/2,
/// by the midpoint rule with `intervals` steps in theta.
double ThinAerofoilZeroLiftAngleDeg(const Camber& camber, int intervals = 4000);

}  // namespace skein
