// Small 3-vector helpers for geometry code (not for the vectorised kernels, which work on arrays).
#pragma once

#include <cmath>

#include "skein/case.hpp"

namespace skein::detail {

inline Vec3 operator+(const Vec3& a, const Vec3& b) { return {a[0] + b[0], a[1] + b[1], a[2] + b[2]}; }
inline Vec3 operator-(const Vec3& a, const Vec3& b) { return {a[0] - b[0], a[1] - b[1], a[2] - b[2]}; }
inline Vec3 operator*(double s, const Vec3& a) { return {s * a[0], s * a[1], s * a[2]}; }
inline double Dot(const Vec3& a, const Vec3& b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }
inline Vec3 Cross(const Vec3& a, const Vec3& b) {
  return {a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]};
}
inline double Norm(const Vec3& a) { return std::sqrt(Dot(a, a)); }
inline Vec3 Normalized(const Vec3& a) {
  const double n = Norm(a);
  return n > 0.0 ? (1.0 / n) * a : Vec3{0.0, 0.0, 0.0};
}
inline Vec3 Lerp(const Vec3& a, const Vec3& b, double t) { return a + t * (b - a); }
/// Reflection in the plane y = 0.
inline Vec3 MirrorY(const Vec3& a) { return {a[0], -a[1], a[2]}; }
/// Rotation of v by angle (rad) about the unit axis k, right-hand rule (Rodrigues' formula).
inline Vec3 Rotate(const Vec3& v, const Vec3& k, double angle) {
  const double c = std::cos(angle), s = std::sin(angle);
  return c * v + s * Cross(k, v) + ((1.0 - c) * Dot(k, v)) * k;
}
inline constexpr double kDegToRad = 3.14159265358979323846 / 180.0;

}  // namespace skein::detail
