// Skein: mean camber lines from aerofoil coordinate files. See airfoil.hpp.
#include "skein/airfoil.hpp"

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <limits>
#include <numeric>

#include <fmt/format.h>

namespace skein {
namespace {

constexpr double kPi = 3.14159265358979323846;
/// Most points a coordinate file may hold (a sanity bound, far beyond any published section).
constexpr std::size_t kMaxPoints = 100000;
/// Fraction of the chord: x may step back by this much along a surface (rounding of printed coordinates).
constexpr double kTurnBackTolerance = 1e-9;
/// Passes of the perpendicular-bisector correction of the mean line.
constexpr int kBisectorPasses = 4;
/// Fractions of the chord at the nose and the tail left to extrapolation: there the surfaces close in and a
/// cut across them is dominated by the rounding of the coordinates.
constexpr double kNoseStation = 0.01, kTailStation = 0.002;
/// x/c of the four mean-line points whose cubic continues the line to the nose (exact for the NACA 4-digit
/// lines with p >= 0.2 and the 5-digit 230..250 lines, which are polynomials of at most third degree there).
constexpr double kNoseFit[4] = {0.08, 0.12, 0.16, 0.20};

[[noreturn]] void FailAt(const std::string& path, int line, const std::string& msg) {
  throw InputError(path, SourceRegion{line, 0}, msg);
}

/// Parses "x z", "x, z" or "x\tz": exactly two finite numbers. False if the line is not that.
bool TwoNumbers(const std::string& text, double& x, double& z) {
  std::string s = text;
  std::replace(s.begin(), s.end(), ',', ' ');
  const char* p = s.c_str();
  char* end = nullptr;
  errno = 0;
  x = std::strtod(p, &end);
  if (end == p || errno != 0) return false;
  p = end;
  z = std::strtod(p, &end);
  if (end == p || errno != 0) return false;
  for (p = end; *p != '\0'; ++p)
    if (!std::isspace(static_cast<unsigned char>(*p))) return false;
  return std::isfinite(x) && std::isfinite(z);
}

/// Monotone piecewise-cubic (Fritsch-Carlson) interpolant through (x, y), x strictly increasing.
struct Pchip {
  std::vector<double> x, y, d;
  Pchip(std::vector<double> xs, std::vector<double> ys) : x(std::move(xs)), y(std::move(ys)), d(x.size(), 0.0) {
    const std::size_t n = x.size();
    std::vector<double> h(n - 1), delta(n - 1);
    for (std::size_t i = 0; i + 1 < n; ++i) {
      h[i] = x[i + 1] - x[i];
      delta[i] = (y[i + 1] - y[i]) / h[i];
    }
    if (n == 2) {
      d[0] = d[1] = delta[0];
      return;
    }
    for (std::size_t i = 1; i + 1 < n; ++i) {
      if (delta[i - 1] * delta[i] <= 0.0) continue;
      const double w1 = 2.0 * h[i] + h[i - 1], w2 = h[i] + 2.0 * h[i - 1];
      d[i] = (w1 + w2) / (w1 / delta[i - 1] + w2 / delta[i]);
    }
    const auto end_slope = [](double h0, double h1, double d0, double d1) {
      double s = ((2.0 * h0 + h1) * d0 - h0 * d1) / (h0 + h1);
      if (s * d0 <= 0.0) s = 0.0;
      else if (d0 * d1 <= 0.0 && std::abs(s) > std::abs(3.0 * d0)) s = 3.0 * d0;
      return s;
    };
    d[0] = end_slope(h[0], h[1], delta[0], delta[1]);
    d[n - 1] = end_slope(h[n - 2], h[n - 3], delta[n - 2], delta[n - 3]);
  }
  double operator()(double at) const {
    if (at <= x.front()) return y.front();
    if (at >= x.back()) return y.back();
    const auto i = static_cast<std::size_t>(std::upper_bound(x.begin(), x.end(), at) - x.begin()) - 1;
    const double h = x[i + 1] - x[i], t = (at - x[i]) / h;
    const double h00 = (1.0 + 2.0 * t) * (1.0 - t) * (1.0 - t), h10 = t * (1.0 - t) * (1.0 - t);
    const double h01 = t * t * (3.0 - 2.0 * t), h11 = t * t * (t - 1.0);
    return h00 * y[i] + h10 * h * d[i] + h01 * y[i + 1] + h11 * h * d[i + 1];
  }
};

/// One surface from the leading edge to the trailing edge: x strictly increasing (repeated x dropped).
struct SurfacePoints {
  std::vector<double> x, z;
};

SurfacePoints OneSurface(const AirfoilCoordinates& p, const std::vector<std::size_t>& order, double chord,
                      const char* which) {
  SurfacePoints s;
  for (std::size_t k = 0; k < order.size(); ++k) {
    const std::size_t i = order[k];
    if (!s.x.empty()) {
      if (p.x[i] < s.x.back() - kTurnBackTolerance * chord)
        FailAt(p.path, p.line[i],
               fmt::format("x = {} turns back along the {} surface (after x = {}); expected the points from the "
                           "trailing edge over the upper surface to the leading edge (least x), then along the "
                           "lower surface back to the trailing edge",
                           p.x[i], which, s.x.back()));
      if (!(p.x[i] > s.x.back())) continue;  // a repeated x (e.g. the leading edge printed twice)
    }
    s.x.push_back(p.x[i]);
    s.z.push_back(p.z[i]);
  }
  if (s.x.size() < 3)
    FailAt(p.path, p.line[order.back()],
           fmt::format("the {} surface has {} distinct points; a section needs at least 3 on each surface", which,
                       s.x.size()));
  return s;
}

}  // namespace

AirfoilCoordinates ReadAirfoilCoordinates(const std::string& open_path, const std::string& shown_path) {
  const std::string path = shown_path.empty() ? open_path : shown_path;
  std::error_code ec;
  if (std::filesystem::is_directory(open_path, ec))
    throw InputError(path, {}, "cannot read the coordinate file: it is a directory");
  std::ifstream in(open_path);
  if (!in) throw InputError(path, {}, fmt::format("cannot open the coordinate file: {}", std::strerror(errno)));
  AirfoilCoordinates out;
  out.path = path;
  std::string text;
  int line = 0;
  bool first_content = true;
  while (std::getline(in, text)) {
    ++line;
    if (!text.empty() && text.back() == '\r') text.pop_back();
    const auto start = text.find_first_not_of(" \t");
    if (start == std::string::npos || text[start] == '#') continue;
    double x = 0.0, z = 0.0;
    if (!TwoNumbers(text, x, z)) {
      if (first_content) {  // the section's name
        first_content = false;
        continue;
      }
      std::string shown = text.substr(start, 40);
      for (char& ch : shown)
        if (static_cast<unsigned char>(ch) < 0x20) ch = ' ';
      FailAt(path, line, fmt::format("expected two numbers \"x z\", got \"{}\"", shown));
    }
    first_content = false;
    if (out.x.size() >= kMaxPoints) FailAt(path, line, fmt::format("more than {} points", kMaxPoints));
    out.x.push_back(x);
    out.z.push_back(z);
    out.line.push_back(line);
  }
  if (in.bad()) throw InputError(path, {}, "cannot read the coordinate file");
  if (out.x.size() < 5)
    throw InputError(path, SourceRegion{line, 0},
                     fmt::format("{} points; a section needs at least 5 (3 on each surface, sharing the leading edge)",
                                 out.x.size()));
  return out;
}

Camber MeanLineFromCoordinates(const AirfoilCoordinates& p, const std::string& spelling) {
  const std::size_t n = p.x.size();
  SKEIN_ASSERT(n >= 2 && p.z.size() == n && p.line.size() == n);
  const std::size_t ile = static_cast<std::size_t>(std::min_element(p.x.begin(), p.x.end()) - p.x.begin());
  const double x_le = p.x[ile], z_le = p.z[ile];
  const double x_te = 0.5 * (p.x.front() + p.x.back()), z_te = 0.5 * (p.z.front() + p.z.back());
  const double chord = x_te - x_le;
  if (!(chord > 0.0) || ile == 0 || ile + 1 == n)
    FailAt(p.path, p.line[ile],
           "the leading edge (the point of least x) must lie between the first and last points, which are the "
           "trailing edge, ahead of them");
  std::vector<std::size_t> a(ile + 1), b(n - ile);
  for (std::size_t k = 0; k <= ile; ++k) a[k] = ile - k;  // leading edge back to the first point
  for (std::size_t k = 0; k < n - ile; ++k) b[k] = ile + k;
  SurfacePoints first = OneSurface(p, a, chord, "first"), second = OneSurface(p, b, chord, "second");
  const auto mean_z = [](const SurfacePoints& s) {
    return std::accumulate(s.z.begin(), s.z.end(), 0.0) / static_cast<double>(s.z.size());
  };
  if (mean_z(first) < mean_z(second)) std::swap(first, second);
  const Pchip upper(first.x, first.z), lower(second.x, second.z);

  // 1. A first mean line: halfway between the surfaces at the same x, at stations spaced like a cosine.
  const auto m = static_cast<std::size_t>(kMeanLinePoints);
  std::vector<double> mx, mz;
  for (std::size_t i = 1; i + 1 < m; ++i) {
    const double f = 0.5 * (1.0 - std::cos(kPi * static_cast<double>(i) / static_cast<double>(m - 1)));
    if (f < kNoseStation || f > 1.0 - kTailStation) continue;  // where the surfaces meet, the cut is ill-posed
    const double x = x_le + f * chord;
    mx.push_back(x);
    mz.push_back(0.5 * (upper(x) + lower(x)));
  }
  // 2. The mean line proper is halfway between the surfaces measured perpendicular to itself (Abbott & von
  //    Doenhoff sec. 6.2): move each point to the midpoint of the chord of the section cut along the current
  //    line's normal there; a few passes converge (the change is second order in the thickness).
  const auto cut = [](const SurfacePoints& sf, double px, double pz, double nx, double nz, bool positive,
                      double& hit_x, double& hit_z) {
    double best = std::numeric_limits<double>::infinity();
    for (std::size_t k = 0; k + 1 < sf.x.size(); ++k) {
      const double ax = sf.x[k], az = sf.z[k], bx = sf.x[k + 1] - ax, bz = sf.z[k + 1] - az;
      const double det = nx * (-bz) - nz * (-bx);  // solve p + t n = a + u b
      if (!(std::abs(det) > 0.0)) continue;
      const double rx = ax - px, rz = az - pz;
      const double t = (rx * (-bz) - rz * (-bx)) / det, u = (nx * rz - nz * rx) / det;
      if (u < 0.0 || u > 1.0 || (positive ? t <= 0.0 : t >= 0.0) || std::abs(t) >= best) continue;
      best = std::abs(t);
      hit_x = ax + u * bx;
      hit_z = az + u * bz;
    }
    return std::isfinite(best);
  };
  for (int pass = 0; pass < kBisectorPasses; ++pass) {
    std::vector<double> nxs, nzs;
    for (std::size_t i = 0; i < mx.size(); ++i) {
      const std::size_t i0 = i == 0 ? 0 : i - 1, i1 = i + 1 == mx.size() ? i : i + 1;
      const double tx = mx[i1] - mx[i0], tz = mz[i1] - mz[i0], len = std::hypot(tx, tz);
      double ux = 0.0, uz = 0.0, lx = 0.0, lz = 0.0;
      if (cut(first, mx[i], mz[i], -tz / len, tx / len, true, ux, uz) &&
          cut(second, mx[i], mz[i], -tz / len, tx / len, false, lx, lz)) {
        nxs.push_back(0.5 * (ux + lx));
        nzs.push_back(0.5 * (uz + lz));
      }
    }
    // Keep x increasing (a point pushed past its neighbour near the nose is dropped).
    mx.clear();
    mz.clear();
    for (std::size_t i = 0; i < nxs.size(); ++i)
      if (mx.empty() || nxs[i] > mx.back()) {
        mx.push_back(nxs[i]);
        mz.push_back(nzs[i]);
      }
    if (mx.size() < 3) FailAt(p.path, p.line[ile], "no mean line could be found between the two surfaces");
  }
  // 3. The leading edge: the mean line continued forward, as the cubic through its points nearest
  //    x/c = 0.08, 0.12, 0.16 and 0.20 (where the cuts are well posed), to where it meets the contour; the same
  //    cubic stands for the mean line ahead of x/c = 0.08, where the surfaces close in round the nose.
  const auto nearest = [&](double f) {
    std::size_t best = 0;
    for (std::size_t i = 0; i < mx.size(); ++i)
      if (std::abs(mx[i] - (x_le + f * chord)) < std::abs(mx[best] - (x_le + f * chord))) best = i;
    return best;
  };
  std::vector<std::size_t> fit;
  for (double f : kNoseFit) fit.push_back(nearest(f));
  for (std::size_t j = 1; j < fit.size(); ++j)
    if (!(fit[j - 1] < fit[j]))
      FailAt(p.path, p.line[ile], "too few points near the leading edge to continue the mean line to the nose");
  const std::size_t k0 = fit.front();
  const double x0 = mx[k0];
  const auto q = [&](double x) {  // Lagrange polynomial through the fit points
    double sum = 0.0;
    for (std::size_t j = 0; j < fit.size(); ++j) {
      double w = mz[fit[j]];
      for (std::size_t l = 0; l < fit.size(); ++l)
        if (l != j) w *= (x - mx[fit[l]]) / (mx[fit[j]] - mx[fit[l]]);
      sum += w;
    }
    return sum;
  };
  double le_x = x_le, le_z = z_le;
  {
    // The contour round the nose: the upper surface forward to the leading edge, then the lower one aft.
    std::vector<double> cx, cz;
    for (std::size_t k = first.x.size(); k-- > 0;)
      if (first.x[k] < x0) {
        cx.push_back(first.x[k]);
        cz.push_back(first.z[k]);
      }
    for (std::size_t k = 1; k < second.x.size() && second.x[k] < x0; ++k) {
      cx.push_back(second.x[k]);
      cz.push_back(second.z[k]);
    }
    for (std::size_t k = 0; k + 1 < cx.size(); ++k) {
      const double g0 = cz[k] - q(cx[k]), g1 = cz[k + 1] - q(cx[k + 1]);
      if (g0 >= 0.0 && g1 < 0.0) {
        const double f = g0 / (g0 - g1);
        le_x = cx[k] + f * (cx[k + 1] - cx[k]);
        le_z = cz[k] + f * (cz[k + 1] - cz[k]);
        break;
      }
    }
  }
  {
    // Ahead of x/c = 0.08: the cubic, at the stations the cosine grid puts there.
    std::vector<double> nx_, nz_;
    for (std::size_t i = 0; i < 24; ++i) {
      const double f = 0.5 * (1.0 - std::cos(kPi * static_cast<double>(i) / 48.0)) * (x0 - le_x) / chord;
      const double x = le_x + f * chord;
      if (x > le_x && x < x0) {
        nx_.push_back(x);
        nz_.push_back(q(x));
      }
    }
    for (std::size_t i = k0; i < mx.size(); ++i) {
      nx_.push_back(mx[i]);
      nz_.push_back(mz[i]);
    }
    mx = std::move(nx_);
    mz = std::move(nz_);
  }
  // 4. Into chord axes (leading edge to the trailing-edge midpoint) and onto the cosine grid.
  const double cx_ = x_te - le_x, cz_ = z_te - le_z, c_len = std::hypot(cx_, cz_);
  const double ex = cx_ / c_len, ez = cz_ / c_len;
  std::vector<double> fx{0.0}, fh{0.0};
  for (std::size_t i = 0; i < mx.size(); ++i) {
    const double u = ((mx[i] - le_x) * ex + (mz[i] - le_z) * ez) / c_len;
    const double v = (-(mx[i] - le_x) * ez + (mz[i] - le_z) * ex) / c_len;
    if (u > fx.back() && u < 1.0) {
      fx.push_back(u);
      fh.push_back(v);
    }
  }
  fx.push_back(1.0);
  fh.push_back(0.0);
  const Pchip mean(fx, fh);

  Camber c;
  c.kind = Camber::Kind::table;
  c.spelling = spelling;
  std::vector<double> xi(m), h(m);
  for (std::size_t i = 0; i < m; ++i) {
    xi[i] = 0.5 * (1.0 - std::cos(kPi * static_cast<double>(i) / static_cast<double>(m - 1)));
    h[i] = mean(xi[i]);
    const double x = x_le + xi[i] * chord;
    c.table_thickness = std::max(c.table_thickness, (upper(x) - lower(x)) / chord);
  }
  // Slope: second-order differences on the non-uniform grid, then one 1-2-1 pass (ends kept).
  std::vector<double> slope(m);
  for (std::size_t i = 1; i + 1 < m; ++i) {
    const double h0 = xi[i] - xi[i - 1], h1 = xi[i + 1] - xi[i];
    slope[i] = (h0 * h0 * (h[i + 1] - h[i]) + h1 * h1 * (h[i] - h[i - 1])) / (h0 * h1 * (h0 + h1));
  }
  {
    const double h0 = xi[1] - xi[0], h1 = xi[2] - xi[1];
    slope[0] = (-(2.0 * h0 + h1) / (h0 * (h0 + h1))) * h[0] + ((h0 + h1) / (h0 * h1)) * h[1] -
               (h0 / (h1 * (h0 + h1))) * h[2];
    const double g0 = xi[m - 1] - xi[m - 2], g1 = xi[m - 2] - xi[m - 3];
    slope[m - 1] = ((2.0 * g0 + g1) / (g0 * (g0 + g1))) * h[m - 1] - ((g0 + g1) / (g0 * g1)) * h[m - 2] +
                   (g0 / (g1 * (g0 + g1))) * h[m - 3];
  }
  std::vector<double> smooth = slope;
  for (std::size_t i = 1; i + 1 < m; ++i) smooth[i] = 0.25 * (slope[i - 1] + 2.0 * slope[i] + slope[i + 1]);
  c.table_x = std::move(xi);
  c.table_height = std::move(h);
  c.table_slope = std::move(smooth);
  return c;
}

double ThinAerofoilZeroLiftAngleDeg(const Camber& camber, int intervals) {
  SKEIN_ASSERT(intervals > 0);
  double sum = 0.0;
  const double dt = kPi / intervals;
  for (int k = 0; k < intervals; ++k) {
    const double theta = (k + 0.5) * dt;
    sum += camber.Slope(0.5 * (1.0 - std::cos(theta))) * (std::cos(theta) - 1.0) * dt;
  }
  return -sum / kPi * 180.0 / kPi;
}

}  // namespace skein
