// Skein: the Case (case.hpp): enum spellings, the NACA 4-digit mean line and the measures of a surface.
#include "skein/case.hpp"

#include <algorithm>
#include <cmath>
#include <cstddef>

namespace skein {

std::string ToString(Spacing s) {
  switch (s) {
    case Spacing::uniform: return "uniform";
    case Spacing::cosine: return "cosine";
    case Spacing::sine: return "sine";
  }
  AssertionFailed("unknown Spacing value", __FILE__, __LINE__);
}

std::string ToString(WakeDirection w) {
  switch (w) {
    case WakeDirection::freestream: return "freestream";
    case WakeDirection::x_axis: return "x-axis";
  }
  AssertionFailed("unknown WakeDirection value", __FILE__, __LINE__);
}

std::optional<Spacing> SpacingFromString(const std::string& s) {
  for (Spacing v : {Spacing::uniform, Spacing::cosine, Spacing::sine})
    if (s == ToString(v)) return v;
  return std::nullopt;
}

std::optional<WakeDirection> WakeDirectionFromString(const std::string& s) {
  for (WakeDirection v : {WakeDirection::freestream, WakeDirection::x_axis})
    if (s == ToString(v)) return v;
  return std::nullopt;
}

// NACA 4-digit mean line, Abbott & von Doenhoff, Theory of Wing Sections, sec. 6.4, with m the maximum camber
// and p its position (fractions of the chord):
//   z = m/p^2 (2 p x - x^2)                  for 0 <= x < p
//   z = m/(1-p)^2 ((1 - 2p) + 2 p x - x^2)   for p <= x <= 1
// and its slope dz/dx = 2m/p^2 (p - x), 2m/(1-p)^2 (p - x). A zero m (NACA 00xx) is the flat line.
namespace {

/// Linear interpolation in a mean-line table (x ascending), clamped to its ends.
double TableValue(const std::vector<double>& x, const std::vector<double>& v, double at) {
  SKEIN_ASSERT(x.size() >= 2 && x.size() == v.size());
  if (at <= x.front()) return v.front();
  if (at >= x.back()) return v.back();
  const auto i = static_cast<std::size_t>(std::upper_bound(x.begin(), x.end(), at) - x.begin());
  const double f = (at - x[i - 1]) / (x[i] - x[i - 1]);
  return v[i - 1] + f * (v[i] - v[i - 1]);
}

bool IsCambered(const Camber& c) {
  if (c.kind == Camber::Kind::table) return true;
  if (c.kind == Camber::Kind::flat || !(std::abs(c.max_camber) > 0.0)) return false;
  // The reader refuses a cambered line with its maximum at the leading or trailing edge.
  SKEIN_ASSERT(c.max_camber_position > 0.0 && c.max_camber_position < 1.0);
  return true;
}

}  // namespace

double Camber::Height(double x_over_c) const {
  if (!IsCambered(*this)) return 0.0;
  if (kind == Kind::table) return TableValue(table_x, table_height, x_over_c);
  const double x = std::clamp(x_over_c, 0.0, 1.0);
  const double m = max_camber, p = max_camber_position;
  if (x < p) return m / (p * p) * (2.0 * p * x - x * x);
  return m / ((1.0 - p) * (1.0 - p)) * ((1.0 - 2.0 * p) + 2.0 * p * x - x * x);
}

double Camber::Slope(double x_over_c) const {
  if (!IsCambered(*this)) return 0.0;
  if (kind == Kind::table) return TableValue(table_x, table_slope, x_over_c);
  const double x = std::clamp(x_over_c, 0.0, 1.0);
  const double m = max_camber, p = max_camber_position;
  if (x < p) return 2.0 * m / (p * p) * (p - x);
  return 2.0 * m / ((1.0 - p) * (1.0 - p)) * (p - x);
}

// Measures for the reference defaults (case-format.md, [reference]):
//  - each segment between two sections has a linear chord; its length ds is |dy| (the planform projected on
//    the xy plane), or, for a surface with no extent in y (a fin), its length in the yz plane;
//  - area = sum of ds (c1 + c2)/2, doubled for a symmetric surface (both halves);
//  - mean aerodynamic chord = integral c^2 ds / integral c ds, with integral c^2 ds = ds (c1^2 + c1 c2 + c2^2)/3
//    over a segment (exact for a linear chord); mirroring does not change it;
//  - span: tip to tip, 2 max(y) for a symmetric surface, the sum of |dy| otherwise; for a fin, the sum of the
//    segment lengths in the yz plane (root to tip of one fin, also when a symmetric surface makes twin fins).
SurfaceExtent MeasureSurface(const Surface& s) {
  SurfaceExtent e;
  const std::vector<Section>& sec = s.sections;
  if (sec.size() < 2) return e;

  double y_extent = 0.0, yz_length = 0.0, sum_abs_dy = 0.0, max_y = sec.front().leading_edge[1];
  for (std::size_t k = 0; k < sec.size(); ++k) {
    y_extent = std::max(y_extent, std::abs(sec[k].leading_edge[1] - sec.front().leading_edge[1]));
    max_y = std::max(max_y, sec[k].leading_edge[1]);
    if (k + 1 < sec.size()) {
      const double dy = sec[k + 1].leading_edge[1] - sec[k].leading_edge[1];
      const double dz = sec[k + 1].leading_edge[2] - sec[k].leading_edge[2];
      yz_length += std::hypot(dy, dz);
      sum_abs_dy += std::abs(dy);
    }
  }
  // "No extent in y": within round-off of the surface's own size.
  const bool fin = y_extent <= 1e-9 * yz_length;

  double int_c = 0.0, int_c2 = 0.0;
  for (std::size_t k = 0; k + 1 < sec.size(); ++k) {
    const double dy = sec[k + 1].leading_edge[1] - sec[k].leading_edge[1];
    const double dz = sec[k + 1].leading_edge[2] - sec[k].leading_edge[2];
    const double ds = fin ? std::hypot(dy, dz) : std::abs(dy);
    const double c1 = sec[k].chord, c2 = sec[k + 1].chord;
    int_c += ds * (c1 + c2) / 2.0;
    int_c2 += ds * (c1 * c1 + c1 * c2 + c2 * c2) / 3.0;
  }
  e.area = (s.symmetric ? 2.0 : 1.0) * int_c;
  e.mean_aerodynamic_chord = int_c > 0.0 ? int_c2 / int_c : 0.0;
  if (fin)
    e.span = yz_length;
  else
    e.span = s.symmetric ? 2.0 * max_y : sum_abs_dy;
  return e;
}

}  // namespace skein
