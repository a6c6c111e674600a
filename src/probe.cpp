// Skein: the flow-field probe. See probe.hpp.
#include "skein/probe.hpp"

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdlib>
#include <optional>
#include <string>
#include <utility>

#include <fmt/format.h>

#include "vec3.hpp"

namespace skein {
namespace {

using namespace detail;

std::string Shown(const std::string& text);

/// The frame the induced velocities are computed in, as SolveBasis sets it up: for Mach > 0 the lattice
/// stretched by 1 / beta in x and the trailing legs along the stretched wake direction.
struct Frame {
  double beta = 1.0;
  std::optional<Lattice> stretched;  ///< only when beta < 1
  const Lattice* physical = nullptr;
  WakeGeometry wake;
  const Lattice& lattice() const { return stretched ? *stretched : *physical; }
};

Frame MakeFrame(const Lattice& physical, const BasisSolution& basis) {
  Frame f;
  f.beta = std::sqrt(1.0 - basis.mach * basis.mach);
  f.physical = &physical;
  if (f.beta < 1.0) f.stretched = StretchForCompressibility(physical, f.beta);
  // The same lines in stretched axes, exactly as SolveBasis forms them.
  f.wake = basis.wake;
  f.wake.direction =
      Normalized(Vec3{basis.wake.direction[0] / f.beta, basis.wake.direction[1], basis.wake.direction[2]});
  return f;
}

/// The points in the frame's axes (x / beta, as StretchForCompressibility scales x).
PointArray Stretch(const PointArray& points, double beta) {
  if (!(beta < 1.0)) return points;
  PointArray s = points;
  const double k = 1.0 / beta;
  for (double& x : s.x) x *= k;
  return s;
}

InducedVelocity InducedInFrame(const Frame& f, const BasisSolution& basis, const PointArray& stretched_points) {
  SKEIN_ASSERT(basis.gamma.cols() >= kBasisSize);
  const Eigen::MatrixXd gamma = basis.gamma.leftCols(kBasisSize);
  InducedVelocity v = InducedVelocityAt(f.lattice(), stretched_points, gamma, f.wake);
  v.u /= f.beta;  // u = d(phi)/dx = (d(phi)/dx') / beta, as for the bound velocities in SolveBasis
  return v;
}

/// Nearest point to p on the segment a + t (b - a), t in [0, 1] (`ray`: t >= 0, b - a a direction).
Vec3 Nearest(const Vec3& p, const Vec3& a, const Vec3& b, bool ray) {
  const Vec3 ab = b - a;
  const double len2 = Dot(ab, ab);
  if (!(len2 > 0.0)) return a;
  double t = Dot(p - a, ab) / len2;
  t = std::max(t, 0.0);
  if (!ray) t = std::min(t, 1.0);
  return a + t * ab;
}

/// The vortex segment whose core `p` lies in (frame axes), as words for the note, or "" if none.
std::string CoreCheck(const Frame& f, const Vec3& p) {
  const Lattice& lat = f.lattice();
  const Vec3& d = f.wake.direction;
  const bool ground = f.wake.ground.enabled;
  const double h2 = 2.0 * f.wake.ground.height_z;
  const auto reflect = [&](const Vec3& q) { return Vec3{q[0], q[1], h2 - q[2]}; };
  double worst = kProbeCoreRadii;  // smallest distance / core radius found below the limit
  std::string what;
  Vec3 at{0.0, 0.0, 0.0};
  for (std::size_t j = 0; j < lat.panels(); ++j) {
    const double eps = std::sqrt(std::sqrt(lat.core4[j]));
    if (!(eps > 0.0)) continue;
    const Vec3 a = lat.a[j], b = lat.b[j], ta = lat.te_a[j], tb = lat.te_b[j];
    struct Segment {
      Vec3 from, to;
      bool ray;
      const char* kind;
    };
    const Segment segments[5] = {{a, b, false, "the bound vortex"},
                                 {ta, a, false, "a trailing leg"},
                                 {b, tb, false, "a trailing leg"},
                                 {ta, ta + d, true, "a trailing leg"},
                                 {tb, tb + d, true, "a trailing leg"}};
    for (int image = 0; image < (ground ? 2 : 1); ++image)
      for (const Segment& s : segments) {
        const Vec3 from = image ? reflect(s.from) : s.from;
        const Vec3 to = image ? reflect(s.to) : s.to;
        const Vec3 q = Nearest(p, from, to, s.ray);
        const double ratio = Norm(p - q) / eps;
        if (ratio < worst) {
          worst = ratio;
          what = fmt::format("{}{} of surface \"{}\"", image ? "the ground image of " : "", s.kind,
                             lat.surfaces[static_cast<std::size_t>(lat.surface[j])].name);
          at = image ? reflect(q) : q;
        }
      }
  }
  if (what.empty()) return what;
  return fmt::format("within {:g} core radii of {} (nearest point ({:.4g}, {:.4g}, {:.4g}) m): no values, a discrete "
                     "vortex gives no meaningful velocity there",
                     kProbeCoreRadii, what, at[0] * f.beta, at[1], at[2]);
}

/// A command-line text quoted for a one-line message: control characters shown as escapes.
std::string Shown(const std::string& text) {
  std::string out = "\"";
  for (char ch : text) {
    const auto u = static_cast<unsigned char>(ch);
    if (u < 0x20 || u == 0x7f)
      out += fmt::format("\\u{:04X}", static_cast<unsigned>(u));
    else if (ch == '"' || ch == '\\')
      out += std::string("\\") + ch;
    else
      out += ch;
  }
  return out + "\"";
}

constexpr const char* kProbeSyntax = "expected NAME=X,Y,Z (metres, geometry axes), e.g. --probe pitot=-0.4,0,0.05";

}  // namespace

InducedVelocity InducedVelocityOfBasis(const Lattice& lat, const BasisSolution& basis, const PointArray& points) {
  const Frame f = MakeFrame(lat, basis);
  return InducedInFrame(f, basis, Stretch(points, f.beta));
}

ProbeSample SampleProbes(const Lattice& lat, const BasisSolution& basis, const std::vector<Probe>& probes) {
  ProbeSample s;
  s.probes = probes;
  if (probes.empty()) return s;
  const Frame f = MakeFrame(lat, basis);
  PointArray points;
  for (const Probe& p : probes) points.push_back(p.point);
  const PointArray stretched = Stretch(points, f.beta);
  s.induced = InducedInFrame(f, basis, stretched);
  for (std::size_t i = 0; i < stretched.size(); ++i) s.core.push_back(CoreCheck(f, stretched[i]));
  return s;
}

std::vector<ProbeResult> EvaluateProbes(const ProbeSample& sample, const Vec3& moment_point, const FlightPoint& fp) {
  const auto c = FlowParameters(fp);
  const double a = fp.alpha_deg * kDegToRad, b = fp.beta_deg * kDegToRad;
  // Wind axes (conventions.md): drag d = V_inf / V, lift l, side s = l x d.
  const Vec3 drag{std::cos(a) * std::cos(b), -std::sin(b), std::sin(a) * std::cos(b)};
  const Vec3 lift{-std::sin(a), 0.0, std::cos(a)};
  const Vec3 side{std::sin(b) * std::cos(a), std::cos(b), std::sin(b) * std::sin(a)};
  std::vector<ProbeResult> out;
  for (std::size_t i = 0; i < sample.probes.size(); ++i) {
    const Probe& p = sample.probes[i];
    ProbeResult r;
    r.name = p.name;
    r.point = p.point;
    if (!sample.core[i].empty()) {
      r.in_core = true;
      r.note = fmt::format("probe {} lies {}", Shown(p.name), sample.core[i]);
      out.push_back(std::move(r));
      continue;
    }
    const auto ii = static_cast<Eigen::Index>(i);
    Vec3 v{0.0, 0.0, 0.0};
    for (int k = 0; k < kBasisSize; ++k) {
      const auto kk = static_cast<Eigen::Index>(k);
      const Vec3 induced{sample.induced.u(ii, kk), sample.induced.v(ii, kk), sample.induced.w(ii, kk)};
      v = v + c[static_cast<std::size_t>(k)] * (BasisOnset(k, p.point, moment_point) + induced);
    }
    const double along = Dot(v, drag);
    const double down = std::atan2(-Dot(v, lift), along) / kDegToRad;
    const double sideways = std::atan2(Dot(v, side), along) / kDegToRad;
    const double q = Dot(v, v);
    if (!(std::isfinite(v[0]) && std::isfinite(v[1]) && std::isfinite(v[2]) && std::isfinite(q))) {
      r.note = fmt::format("probe {}: the velocity could not be computed (non-finite)", Shown(p.name));
      out.push_back(std::move(r));
      continue;
    }
    r.velocity = v;
    r.downwash_deg = down;
    r.sidewash_deg = sideways;
    r.q_ratio = q;
    out.push_back(std::move(r));
  }
  return out;
}

Probe ParseProbeArgument(const std::string& text) {
  const auto fail = [&](const std::string& what) {
    throw InputError(fmt::format("--probe {}: {}", Shown(text), what));
  };
  const std::size_t eq = text.find('=');
  if (eq == std::string::npos) fail(kProbeSyntax);
  Probe p;
  p.name = text.substr(0, eq);
  if (p.name.empty()) fail(std::string("the name before '=' is empty; ") + kProbeSyntax);
  const std::string coords = text.substr(eq + 1);
  std::vector<std::string> parts;
  std::size_t start = 0;
  while (true) {
    const std::size_t comma = coords.find(',', start);
    parts.push_back(coords.substr(start, comma == std::string::npos ? std::string::npos : comma - start));
    if (comma == std::string::npos) break;
    start = comma + 1;
  }
  if (parts.size() != 3)
    fail(fmt::format("expected 3 coordinates X,Y,Z after '=', got {}; {}", parts.size(), kProbeSyntax));
  for (std::size_t k = 0; k < 3; ++k) {
    const std::string& s = parts[k];
    char* end = nullptr;
    errno = 0;
    const double v = s.empty() ? 0.0 : std::strtod(s.c_str(), &end);
    const bool whole = !s.empty() && end != nullptr && *end == '\0' && errno != ERANGE;
    if (!whole || !std::isfinite(v))
      fail(fmt::format("coordinate {} ({}) is not a finite number; {}", "XYZ"[k], Shown(s), kProbeSyntax));
    p.point[k] = v;
  }
  return p;
}

void AddProbe(Case& c, Probe p) {
  for (const Probe& q : c.probes)
    if (q.name == p.name)
      throw InputError(fmt::format("--probe {}: name already used by {}", Shown(p.name),
                                   q.where.line > 0 ? fmt::format("the [[probe]] at line {} of the case file", q.where.line)
                                                    : std::string("an earlier --probe")));
  if (c.ground.enabled && !(p.point[2] > c.ground.height_z))
    throw InputError(fmt::format("--probe {}: point z = {} is not above the ground plane z = {}", Shown(p.name),
                                 p.point[2], c.ground.height_z));
  c.probes.push_back(std::move(p));
}

}  // namespace skein
