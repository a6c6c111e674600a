// Skein design studies. See study.hpp.
#include "skein/study.hpp"

#include <algorithm>
#include <atomic>
#include <cerrno>
#include <cmath>
#include <cstdlib>
#include <exception>
#include <limits>
#include <mutex>
#include <thread>

#include <omp.h>

#include <Eigen/Dense>
#include <fmt/format.h>

#include "skein/case_edit.hpp"
#include "skein/case_file.hpp"
#include "skein/loads.hpp"
#include "vec3.hpp"

namespace skein::study {
namespace {

using namespace detail;

/// A count multiplied by a scale, or nullopt when the product is not a whole number >= 1.
std::optional<int> ScaledCount(int n, double scale) {
  const double v = n * scale;
  const double r = std::round(v);
  if (std::abs(v - r) > 1e-9 || r < 1.0 || r > static_cast<double>(std::numeric_limits<int>::max()))
    return std::nullopt;
  return static_cast<int>(r);
}

bool CanScale(const Case& c, double scale) {
  auto ok = [&](int n) { return ScaledCount(n, scale).has_value(); };
  if (!ok(c.mesh.chordwise) || !ok(c.mesh.spanwise)) return false;
  for (const Surface& s : c.surfaces) {
    if (!ok(s.mesh.chordwise) || !ok(s.mesh.spanwise)) return false;
    for (const Section& sec : s.sections)
      if (sec.spanwise && !ok(*sec.spanwise)) return false;
  }
  return true;
}

}  // namespace

Extrapolation RichardsonExtrapolate(double f_coarse, double f_medium, double f_fine, double ratio,
                                    double assumed_order) {
  SKEIN_ASSERT(ratio > 1.0 && assumed_order > 0.0);
  Extrapolation out;
  const double e21 = f_medium - f_fine, e32 = f_coarse - f_medium;
  const double scale = std::max({std::abs(f_coarse), std::abs(f_medium), std::abs(f_fine)});
  const double roundoff = 64.0 * std::numeric_limits<double>::epsilon() * scale;
  if (std::abs(e21) <= roundoff) {
    out.value = f_fine;
    out.order = assumed_order;
    out.order_observed = false;
    out.error_estimate = 0.0;
    out.note = "converged to round-off on the two finer meshes";
    return out;
  }
  double p = assumed_order;
  const double q = e32 / e21;
  if (!(q > 0.0)) {
    out.note = fmt::format("not monotone (oscillating): order {:g} assumed", assumed_order);
  } else {
    const double observed = std::log(q) / std::log(ratio);
    if (observed >= kMinTrustedOrder && observed <= kMaxTrustedOrder) {
      p = observed;
      out.order_observed = true;
    } else {
      out.note = fmt::format("observed order {:.3g} outside [{:g}, {:g}]: order {:g} assumed", observed,
                             kMinTrustedOrder, kMaxTrustedOrder, assumed_order);
    }
  }
  const double denom = std::pow(ratio, p) - 1.0;
  out.order = p;
  out.value = f_fine + (f_fine - f_medium) / denom;
  out.error_estimate = (out.order_observed ? kSafetyObserved : kSafetyAssumed) * std::abs(e21) / denom;
  return out;
}

Case ScaleMesh(const Case& c, double scale) {
  if (!CanScale(c, scale))
    throw InputError(c.source_path, {},
                     fmt::format("cannot scale the mesh by {:g}: every chordwise and spanwise count (case, surface "
                                 "and section) must give a whole number of panels",
                                 scale));
  Case out = c;
  auto apply = [&](int& n) { n = *ScaledCount(n, scale); };
  apply(out.mesh.chordwise);
  apply(out.mesh.spanwise);
  for (Surface& s : out.surfaces) {
    apply(s.mesh.chordwise);
    apply(s.mesh.spanwise);
    for (Section& sec : s.sections)
      if (sec.spanwise) apply(*sec.spanwise);
  }
  return out;
}

ConvergenceStudy MeshConvergence(const Case& c, const ConvergenceOptions& options) {
  const std::size_t npoints = c.flight.alpha_deg.size() * c.flight.beta_deg.size();
  if (options.point >= npoints)
    throw InputError(c.source_path, {},
                     fmt::format("flight point {} does not exist: the case has {}", options.point + 1, npoints));
  ConvergenceStudy study;
  study.alpha_deg = c.flight.alpha_deg[options.point % c.flight.alpha_deg.size()];
  study.beta_deg = c.flight.beta_deg[options.point / c.flight.alpha_deg.size()];
  Case one = c;
  one.flight.alpha_deg = {study.alpha_deg};
  one.flight.beta_deg = {study.beta_deg};

  const std::array<std::array<double, 3>, 3> sets{{{1.0, 2.0, 4.0}, {0.5, 1.0, 2.0}, {0.25, 0.5, 1.0}}};
  std::optional<std::array<double, 3>> chosen;
  for (const auto& set : sets) {
    bool ok = true;
    for (double f : set) ok = ok && CanScale(one, f);
    if (!ok) continue;
    const bool own = !(set[2] > 1.0);
    if (!own && CountPanels(ScaleMesh(one, set[2])) > options.max_panels) continue;
    chosen = set;
    break;
  }
  if (!chosen)
    throw InputError(c.source_path, {},
                     fmt::format("cannot build three nested meshes: refining twice would exceed {} panels, and the "
                                 "chordwise and spanwise counts do not halve exactly; use even counts in [mesh]",
                                 options.max_panels));
  if ((*chosen)[2] < 1.0 || (*chosen)[0] < 1.0)
    study.warnings.push_back(fmt::format("the case's mesh is refined only to x{:g}: the coarsest mesh is x{:g}",
                                         (*chosen)[2], (*chosen)[0]));

  std::array<PointResult, 3> res;
  for (std::size_t k = 0; k < 3; ++k) {
    const Case scaled = ScaleMesh(one, (*chosen)[k]);
    const Results r = Run(scaled, options.run);
    res[k] = r.points.front();
    study.meshes[k] = {(*chosen)[k], scaled.mesh.chordwise, scaled.mesh.spanwise, r.mesh.panels};
    for (const std::string& w : r.warnings) study.warnings.push_back(w);
  }
  auto add = [&](const char* name, auto get) {
    ConvergenceQuantity q;
    q.name = name;
    for (std::size_t k = 0; k < 3; ++k) q.values[k] = get(res[k]);
    if (std::all_of(q.values.begin(), q.values.end(), [](double v) { return std::isfinite(v); })) {
      q.extrapolation = RichardsonExtrapolate(q.values[0], q.values[1], q.values[2], study.ratio,
                                              options.assumed_order);
    } else {
      q.extrapolation.value = std::numeric_limits<double>::quiet_NaN();
      q.extrapolation.error_estimate = std::numeric_limits<double>::quiet_NaN();
      q.extrapolation.note = "undefined on at least one mesh";
    }
    study.quantities.push_back(q);
  };
  add("CL", [](const PointResult& p) { return p.CL; });
  add("CD_induced", [](const PointResult& p) { return p.CD_induced; });
  add("Cm", [](const PointResult& p) { return p.Cm; });
  add("span_efficiency", [](const PointResult& p) {
    return p.span_efficiency ? *p.span_efficiency : std::numeric_limits<double>::quiet_NaN();
  });
  return study;
}

Eigen::MatrixXd TrefftzDragMatrix(const Lattice& lat, const WakeGeometry& wake) {
  // TrefftzDrag gives D_m = -(1/2) g_m (K g)_m with K = TrefftzKernel, so D = -(1/2) g' K g = g' Q g with Q the
  // symmetric part of -K/2.
  const Eigen::MatrixXd K = TrefftzKernel(lat, wake);
  return -0.25 * (K + K.transpose());
}

Eigen::VectorXd TrefftzLiftVector(const Lattice& lat, const WakeGeometry& wake, double alpha_deg) {
  const double a = alpha_deg * kDegToRad;
  const Vec3 lift{-std::sin(a), 0.0, std::cos(a)};
  Eigen::VectorXd l(static_cast<Eigen::Index>(lat.strips.size()));
  for (std::size_t m = 0; m < lat.strips.size(); ++m)
    l(static_cast<Eigen::Index>(m)) =
        Dot(Cross(wake.direction, lat.strips[m].te_right - lat.strips[m].te_left), lift);
  return l;
}

Eigen::VectorXd TrefftzRootBendingVector(const Lattice& lat, const WakeGeometry& wake, double alpha_deg,
                                         int surface) {
  SKEIN_ASSERT(surface >= 0 && static_cast<std::size_t>(surface) < lat.surfaces.size());
  const Eigen::VectorXd l = TrefftzLiftVector(lat, wake, alpha_deg);
  const LatticeSurface& ls = lat.surfaces[static_cast<std::size_t>(surface)];
  double y_root = std::numeric_limits<double>::infinity();
  for (std::size_t m = ls.first_strip; m < ls.first_strip + ls.strips; ++m) {
    y_root = std::min(y_root, std::abs(lat.strips[m].te_left[1]));
    y_root = std::min(y_root, std::abs(lat.strips[m].te_right[1]));
  }
  Eigen::VectorXd b = Eigen::VectorXd::Zero(l.size());
  for (std::size_t m = ls.first_strip; m < ls.first_strip + ls.strips; ++m) {
    const double y = lat.strips[m].quarter_chord[1];
    if (y > 0.0) b(static_cast<Eigen::Index>(m)) = l(static_cast<Eigen::Index>(m)) * (y - y_root);
  }
  return b;
}

std::vector<double> PrescribedLoading(const Lattice& lat, int surface,
                                      const std::function<double(double)>& shape) {
  SKEIN_ASSERT(surface >= 0 && static_cast<std::size_t>(surface) < lat.surfaces.size());
  const LatticeSurface& ls = lat.surfaces[static_cast<std::size_t>(surface)];
  double semi = 0.0;
  for (std::size_t m = ls.first_strip; m < ls.first_strip + ls.strips; ++m)
    semi = std::max({semi, std::abs(lat.strips[m].te_left[1]), std::abs(lat.strips[m].te_right[1])});
  SKEIN_ASSERT(semi > 0.0);
  std::vector<double> g(lat.strips.size(), 0.0);
  for (std::size_t m = ls.first_strip; m < ls.first_strip + ls.strips; ++m)
    g[m] = shape(lat.strips[m].quarter_chord[1] / semi);
  return g;
}

std::vector<double> MinimumDragLoading(const Lattice& lat, int surface, const Eigen::MatrixXd& Q,
                                       const Eigen::VectorXd& lift_vector, double lift,
                                       const Eigen::VectorXd* bending_vector, double bending) {
  SKEIN_ASSERT(surface >= 0 && static_cast<std::size_t>(surface) < lat.surfaces.size());
  const LatticeSurface& ls = lat.surfaces[static_cast<std::size_t>(surface)];
  const auto ns = static_cast<Eigen::Index>(lat.strips.size());
  // The unknowns: the surface's given strips; P maps them onto every strip (a mirrored strip copies its own).
  std::vector<std::size_t> vars;
  for (std::size_t m = ls.first_strip; m < ls.first_strip + ls.strips; ++m)
    if (lat.strips[m].mirror_of < 0) vars.push_back(m);
  const auto n = static_cast<Eigen::Index>(vars.size());
  Eigen::MatrixXd P = Eigen::MatrixXd::Zero(ns, n);
  for (Eigen::Index k = 0; k < n; ++k) P(static_cast<Eigen::Index>(vars[static_cast<std::size_t>(k)]), k) = 1.0;
  for (std::size_t m = ls.first_strip; m < ls.first_strip + ls.strips; ++m) {
    const int src = lat.strips[m].mirror_of;
    if (src < 0) continue;
    const auto it = std::find(vars.begin(), vars.end(), static_cast<std::size_t>(src));
    SKEIN_ASSERT(it != vars.end());
    P(static_cast<Eigen::Index>(m), it - vars.begin()) = 1.0;
  }
  const Eigen::Index nc = bending_vector ? 2 : 1;
  Eigen::MatrixXd C(nc, n);
  C.row(0) = lift_vector.transpose() * P;
  if (bending_vector) C.row(1) = bending_vector->transpose() * P;
  // minimise x' (P'QP) x subject to C x = r:  [2 P'QP  C'; C  0] [x; lambda] = [0; r].
  Eigen::MatrixXd kkt = Eigen::MatrixXd::Zero(n + nc, n + nc);
  kkt.topLeftCorner(n, n) = 2.0 * P.transpose() * Q * P;
  kkt.topRightCorner(n, nc) = C.transpose();
  kkt.bottomLeftCorner(nc, n) = C;
  Eigen::VectorXd rhs = Eigen::VectorXd::Zero(n + nc);
  rhs(n) = lift;
  if (bending_vector) rhs(n + 1) = bending;
  const Eigen::VectorXd x = kkt.fullPivLu().solve(rhs);
  const Eigen::VectorXd g = P * x.head(n);
  return std::vector<double>(g.data(), g.data() + g.size());
}

double RootBendingCoefficient(const Lattice& lat, const Case& c, const PointResult& p, int surface) {
  SKEIN_ASSERT(surface >= 0 && static_cast<std::size_t>(surface) < lat.surfaces.size() &&
               static_cast<std::size_t>(surface) < p.surfaces.size());
  const auto su = static_cast<std::size_t>(surface);
  const LatticeSurface& ls = lat.surfaces[su];
  const StripLoads& sl = p.surfaces[su].strips;
  SKEIN_ASSERT(sl.cl.size() == ls.strips);
  const Vec3 root = c.surfaces[su].sections.front().leading_edge;
  double m = 0.0;
  for (std::size_t k = 0; k < ls.strips; ++k) {
    const Strip& st = lat.strips[ls.first_strip + k];
    if (!(st.quarter_chord[1] > root[1])) continue;
    const double force = sl.cl[k] * 0.5 * st.chord * st.width;  // V = rho = 1: q = 1/2
    const double dy = st.quarter_chord[1] - root[1], dz = st.quarter_chord[2] - root[2];
    m += force * (dy * st.normal[2] - dz * st.normal[1]);
  }
  return m / (0.5 * c.reference.area * c.reference.span);
}

namespace {

int SurfaceIndex(const Case& c, const std::string& name) {
  if (c.surfaces.empty()) throw InputError(c.source_path, {}, "the case has no surface");
  if (name.empty()) return 0;
  for (std::size_t i = 0; i < c.surfaces.size(); ++i)
    if (c.surfaces[i].name == name) return static_cast<int>(i);
  std::string names;
  for (const Surface& s : c.surfaces) names += (names.empty() ? "\"" : ", \"") + s.name + "\"";
  throw InputError(c.source_path, {}, fmt::format("no surface named \"{}\" (the case has {})", name, names));
}

/// Arc-length fraction (in the yz plane) of each section of a surface, root 0 to tip 1.
std::vector<double> SectionArcFractions(const Surface& s) {
  std::vector<double> u{0.0};
  for (std::size_t k = 0; k + 1 < s.sections.size(); ++k) {
    const Vec3 d = s.sections[k + 1].leading_edge - s.sections[k].leading_edge;
    u.push_back(u.back() + std::hypot(d[1], d[2]));
  }
  const double total = u.back();
  for (double& v : u) v /= total;
  return u;
}

/// The surface with sections inserted at arc fractions sin(pi/2 j/(n-1)) where a segment allows it.
Surface InsertStations(const Surface& s, int stations) {
  Surface out = s;
  if (stations < 3) return out;
  const std::vector<double> u = SectionArcFractions(s);
  // Targets closer than a quarter of their spacing to a section are dropped.
  const double min_gap = 0.25 / (stations - 1);
  std::vector<std::pair<double, Section>> added;
  for (int j = 1; j + 1 < stations; ++j) {
    const double target = static_cast<double>(j) / (stations - 1);
    bool near = false;
    for (double v : u) near = near || std::abs(v - target) < min_gap;
    if (near) continue;
    std::size_t k = 0;
    while (k + 2 < u.size() && u[k + 1] < target) ++k;
    const Section& a = s.sections[k];
    const Section& b = s.sections[k + 1];
    if (a.spanwise || a.camber.spelling != b.camber.spelling) continue;
    const double t = (target - u[k]) / (u[k + 1] - u[k]);
    Section sec = a;
    sec.leading_edge = Lerp(a.leading_edge, b.leading_edge, t);
    sec.chord = a.chord + t * (b.chord - a.chord);
    sec.twist_deg = a.twist_deg + t * (b.twist_deg - a.twist_deg);
    added.emplace_back(target, sec);
  }
  std::vector<std::pair<double, Section>> all;
  for (std::size_t k = 0; k < s.sections.size(); ++k) all.emplace_back(u[k], s.sections[k]);
  all.insert(all.end(), added.begin(), added.end());
  std::stable_sort(all.begin(), all.end(), [](const auto& l, const auto& r) { return l.first < r.first; });
  out.sections.clear();
  for (auto& [v, sec] : all) out.sections.push_back(sec);
  return out;
}

struct Evaluation {
  DesignState state;
  Eigen::VectorXd gamma;  ///< strip circulations, lattice order
  Lattice lattice;
};

Evaluation Evaluate(const Case& c, int surface, const RunOptions& ro) {
  Evaluation e;
  const Results r = Run(c, ro);
  const PointResult& p = r.points.front();
  e.lattice = BuildLattice(c);
  e.state.alpha_deg = p.alpha_deg;
  e.state.CL = p.CL;
  e.state.CD_induced = p.CD_induced;
  e.state.span_efficiency = p.span_efficiency;
  e.state.root_bending = RootBendingCoefficient(e.lattice, c, p, surface);
  std::vector<double> g;
  for (const SurfaceLoads& s : p.surfaces) g.insert(g.end(), s.strips.gamma.begin(), s.strips.gamma.end());
  e.gamma = Eigen::Map<const Eigen::VectorXd>(g.data(), static_cast<Eigen::Index>(g.size()));
  return e;
}

/// The design variables x: x[0] the angle of attack (deg), x[k] the twist of section k >= 1 (deg). The root
/// section keeps its twist: with the angle of attack free it adds nothing, and twisting a root section that
/// has dihedral tilts it off the plane of symmetry.
void SetVariables(Case& c, int surface, const std::vector<double>& x) {
  c.flight.alpha_deg = {x[0]};
  auto& secs = c.surfaces[static_cast<std::size_t>(surface)].sections;
  for (std::size_t k = 1; k < secs.size(); ++k) secs[k].twist_deg = x[k];
}

}  // namespace

TwistDesign DesignTwist(const Case& c, const TwistDesignOptions& o) {
  if (!std::isfinite(o.target_CL) || std::abs(o.target_CL) < 1e-6)
    throw InputError(c.source_path, {}, fmt::format("the target CL must be finite and non-zero, got {}", o.target_CL));
  const int si = SurfaceIndex(c, o.surface);
  const auto su = static_cast<std::size_t>(si);
  if (!c.surfaces[su].symmetric)
    throw InputError(c.source_path, c.surfaces[su].where,
                     fmt::format("surface \"{}\" is not symmetric: twist design needs a mirrored surface",
                                 c.surfaces[su].name));
  TwistDesign out;
  Case d = c;
  d.flight.alpha_deg = {c.flight.alpha_deg.front()};
  d.flight.beta_deg = {0.0};
  d.surfaces[su] = InsertStations(c.surfaces[su], o.stations);
  const std::size_t nsec = d.surfaces[su].sections.size();
  const std::vector<double> u = SectionArcFractions(d.surfaces[su]);
  out.station_eta = u;
  for (const Section& sec : d.surfaces[su].sections) out.twist_before_deg.push_back(sec.twist_deg);

  // The wing as given, at the angle of attack that gives the target CL.
  Evaluation e = Evaluate(d, si, o.run);
  for (int it = 0; it < 8 && std::abs(e.state.CL - o.target_CL) > 1e-12 * std::max(1.0, std::abs(o.target_CL));
       ++it) {
    const Results r = Run(d, o.run);
    const double cla = r.points.front().derivatives.Get("CL_alpha").value_or(0.0);
    if (!(std::abs(cla) > 1e-9))
      throw InputError(c.source_path, {}, "CL does not change with alpha: the target CL cannot be reached");
    const double next = d.flight.alpha_deg.front() + (o.target_CL - e.state.CL) / cla / kDegToRad;
    if (!(std::abs(next) < 89.0))
      throw InputError(c.source_path, {},
                       fmt::format("reaching CL {} would need alpha {:.1f} deg", o.target_CL, next));
    d.flight.alpha_deg = {next};
    e = Evaluate(d, si, o.run);
  }
  out.before = e.state;
  const double bending_ref = o.root_bending_limit ? *o.root_bending_limit : e.state.root_bending;
  const double qs = 0.5 * c.reference.area;

  std::vector<double> theta = out.twist_before_deg;
  theta[0] = d.flight.alpha_deg.front();
  const auto n = static_cast<Eigen::Index>(nsec);
  for (out.iterations = 0; out.iterations < o.max_iterations;) {
    SetVariables(d, si, theta);
    const Evaluation base = Evaluate(d, si, o.run);
    const WakeGeometry wake = WakeFor(d, theta[0], 0.0);
    Eigen::MatrixXd S(base.gamma.size(), n);
    Eigen::VectorXd g_cd(n), g_cl(n), g_bm(n);
    for (Eigen::Index k = 0; k < n; ++k) {
      std::vector<double> tp = theta, tm = theta;
      tp[static_cast<std::size_t>(k)] += o.step_deg;
      tm[static_cast<std::size_t>(k)] -= o.step_deg;
      SetVariables(d, si, tp);
      const Evaluation ep = Evaluate(d, si, o.run);
      SetVariables(d, si, tm);
      const Evaluation em = Evaluate(d, si, o.run);
      const double h2 = 2.0 * o.step_deg;
      S.col(k) = (ep.gamma - em.gamma) / h2;
      g_cd(k) = (ep.state.CD_induced - em.state.CD_induced) / h2;
      g_cl(k) = (ep.state.CL - em.state.CL) / h2;
      g_bm(k) = (ep.state.root_bending - em.state.root_bending) / h2;
    }
    const Eigen::MatrixXd Q = TrefftzDragMatrix(base.lattice, wake);
    const Eigen::MatrixXd H = 2.0 * S.transpose() * Q * S / qs;
    auto step = [&](bool with_bending) {
      const Eigen::Index nc = with_bending ? 2 : 1;
      Eigen::MatrixXd kkt = Eigen::MatrixXd::Zero(n + nc, n + nc);
      Eigen::VectorXd rhs = Eigen::VectorXd::Zero(n + nc);
      kkt.topLeftCorner(n, n) = H;
      kkt.block(0, n, n, 1) = g_cl;
      kkt.block(n, 0, 1, n) = g_cl.transpose();
      rhs.head(n) = -g_cd;
      rhs(n) = o.target_CL - base.state.CL;
      if (with_bending) {
        kkt.block(0, n + 1, n, 1) = g_bm;
        kkt.block(n + 1, 0, 1, n) = g_bm.transpose();
        rhs(n + 1) = bending_ref - base.state.root_bending;
      }
      return Eigen::VectorXd(kkt.fullPivLu().solve(rhs).head(n));
    };
    Eigen::VectorXd delta = step(false);
    out.bending_constraint_active = false;
    if (o.keep_root_bending &&
        base.state.root_bending + g_bm.dot(delta) > bending_ref + 1e-12 * std::max(1.0, std::abs(bending_ref))) {
      delta = step(true);
      out.bending_constraint_active = true;
    }
    if (!delta.allFinite()) throw NumericalError("twist design: the design system is singular");
    for (std::size_t k = 0; k < nsec; ++k) theta[k] += delta(static_cast<Eigen::Index>(k));
    ++out.iterations;
    if (delta.cwiseAbs().maxCoeff() < o.tolerance_deg) {
      out.converged = true;
      break;
    }
  }
  SetVariables(d, si, theta);
  out.after = Evaluate(d, si, o.run).state;
  out.twist_after_deg = theta;
  out.twist_after_deg[0] = out.twist_before_deg[0];
  if (!out.converged)
    out.warnings.push_back(fmt::format("the twist design did not settle to {:g} deg in {} iterations",
                                       o.tolerance_deg, out.iterations));
  d.title = fmt::format("{} (twist designed for least induced drag at CL {:g}{})", c.title, o.target_CL,
                        out.bending_constraint_active ? ", root bending held" : "");
  out.designed = d;
  return out;
}

PointAtLift SolveAtLift(const Case& c, double target_CL, const RunOptions& run) {
  PointAtLift out;
  out.at = c;
  out.at.flight.alpha_deg = {c.flight.alpha_deg.front()};
  out.at.flight.beta_deg = {c.flight.beta_deg.front()};
  // The first step uses the solved CL_alpha; later ones the secant through the last two points, since with
  // a freestream wake the wake (and so CL) moves with alpha in a way the fixed-wake derivative does not see.
  std::optional<std::pair<double, double>> previous;  // (alpha_deg, CL)
  for (int it = 0;; ++it) {
    out.point = Run(out.at, run).points.front();
    if (std::abs(out.point.CL - target_CL) <= 1e-12 * std::max(1.0, std::abs(target_CL))) break;
    if (it == 8)
      throw InputError(c.source_path, {}, fmt::format("CL {:g} was not reached (CL {:.9g} after {} steps)",
                                                      target_CL, out.point.CL, it));
    double cla = out.point.derivatives.Get("CL_alpha").value_or(0.0);
    const double alpha_now = out.at.flight.alpha_deg.front();
    if (previous && std::abs(alpha_now - previous->first) > 0.0) {
      const double secant = (out.point.CL - previous->second) / ((alpha_now - previous->first) * kDegToRad);
      if (std::abs(secant) > 1e-9) cla = secant;
    }
    previous = std::make_pair(alpha_now, out.point.CL);
    if (!(std::abs(cla) > 1e-9))
      throw InputError(c.source_path, {}, "CL does not change with alpha: the target CL cannot be reached");
    const double next = out.at.flight.alpha_deg.front() + (target_CL - out.point.CL) / cla / kDegToRad;
    if (!(std::abs(next) < 89.0))
      throw InputError(c.source_path, {}, fmt::format("reaching CL {:g} would need alpha {:.1f} deg", target_CL, next));
    out.at.flight.alpha_deg = {next};
  }
  out.lattice = BuildLattice(out.at);
  return out;
}

namespace {


/// Calls solve(i, threads) for every i < n, the cases shared among threads as PlanThreads says. An exception
/// is held in its case's place; the remaining cases after the first that failed are skipped, and the first
/// failure in case order is rethrown (the same one whatever the threads).
template <class Solve>
ThreadPlan ForEachCase(std::size_t n, int total, Solve&& solve) {
  const ThreadPlan plan = PlanThreads(n, total);
  const ScopedBlasThreads blas(plan.threads_per_case);
  std::vector<std::exception_ptr> errors(n);
  std::atomic<std::size_t> next{0}, first_failed{n};
  const auto worker = [&]() {
    for (;;) {
      const std::size_t i = next.fetch_add(1);
      if (i >= n || i > first_failed.load()) return;
      try {
        solve(i, plan.threads_per_case);
      } catch (...) {
        errors[i] = std::current_exception();
        std::size_t seen = first_failed.load();
        while (i < seen && !first_failed.compare_exchange_weak(seen, i)) {
        }
      }
    }
  };
  if (plan.concurrent_cases <= 1) {
    worker();
  } else {
    std::vector<std::thread> pool;
    for (int k = 0; k < plan.concurrent_cases; ++k) pool.emplace_back(worker);
    for (std::thread& t : pool) t.join();
  }
  for (const std::exception_ptr& e : errors)
    if (e) std::rethrow_exception(e);
  return plan;
}

/// The figures of a point that compare and study report.
double DynamicPressure(const SameAircraft& a) { return 0.5 * a.density * a.speed * a.speed; }

CompareEntry Describe(const Case& c, const PointAtLift& p) {
  CompareEntry e;
  e.title = c.title;
  e.source = c.source_path;
  e.alpha_deg = p.point.alpha_deg;
  e.CL = p.point.CL;
  e.CD_induced = p.point.CD_induced;
  e.span_efficiency = p.point.span_efficiency;
  e.CL_alpha = p.point.derivatives.Get("CL_alpha").value_or(std::numeric_limits<double>::quiet_NaN());
  e.root_bending = c.surfaces.front().symmetric ? RootBendingCoefficient(p.lattice, p.at, p.point, 0)
                                                : std::numeric_limits<double>::quiet_NaN();
  const StripLoads& sl = p.point.surfaces.front().strips;
  const LatticeSurface& ls = p.lattice.surfaces.front();
  double semi = 0.0;
  for (std::size_t m = ls.first_strip; m < ls.first_strip + ls.strips; ++m)
    semi = std::max({semi, std::abs(p.lattice.strips[m].te_left[1]), std::abs(p.lattice.strips[m].te_right[1])});
  std::size_t peak = 0;
  for (std::size_t k = 1; k < sl.cl.size(); ++k)
    if (sl.cl[k] > sl.cl[peak]) peak = k;
  e.cl_peak_eta = semi > 0.0 ? std::abs(sl.y[peak]) / semi : std::numeric_limits<double>::quiet_NaN();
  e.cl_peak_over_CL = sl.cl[peak] / p.point.CL;
  if (p.point.neutral_point) e.neutral_point_x = (*p.point.neutral_point)[0];
  return e;
}

}  // namespace

ThreadPlan PlanThreads(std::size_t cases, int total) {
  ThreadPlan plan;
  const int cores = total > 0 ? total : std::max(1, omp_get_num_procs());
  plan.concurrent_cases = static_cast<int>(std::min<std::size_t>(std::max<std::size_t>(cases, 1),
                                                                 static_cast<std::size_t>(cores)));
  plan.threads_per_case = std::max(1, cores / plan.concurrent_cases);
  return plan;
}

Comparison CompareCases(const std::vector<Case>& cases, const CompareOptions& o) {
  if (cases.empty()) throw InputError("compare needs at least one case");
  Comparison cmp;
  cmp.same_aircraft = o.same_aircraft;
  std::vector<double> lift_of(cases.size());  // the CL each case flies at
  if (o.same_aircraft) {
    const SameAircraft& a = *o.same_aircraft;
    if (!(a.weight_N > 0.0 && a.speed > 0.0 && a.density > 0.0 && std::isfinite(a.weight_N) &&
          std::isfinite(a.speed) && std::isfinite(a.density)))
      throw InputError(fmt::format("compare: weight, speed and density must be positive and finite, got {:g} N, "
                                   "{:g} m/s, {:g} kg/m^3", a.weight_N, a.speed, a.density));
    for (std::size_t i = 0; i < cases.size(); ++i) lift_of[i] = a.weight_N / (DynamicPressure(a) * cases[i].reference.area);
    cmp.target_CL = lift_of.front();
  } else if (o.target_CL) {
    cmp.target_CL = *o.target_CL;
  } else {
    Case first = cases.front();
    first.flight.alpha_deg = {first.flight.alpha_deg.front()};
    first.flight.beta_deg = {first.flight.beta_deg.front()};
    cmp.target_CL = Run(first, o.run).points.front().CL;
  }
  if (!o.same_aircraft) std::fill(lift_of.begin(), lift_of.end(), cmp.target_CL);
  for (std::size_t i = 0; i < cases.size(); ++i)
    if (!std::isfinite(lift_of[i]) || std::abs(lift_of[i]) < 1e-6)
      throw InputError(cases[i].source_path, {},
                       fmt::format("the comparison needs a non-zero CL, got {:g}; give --cl", lift_of[i]));
  // The cases are independent: solved in parallel across cases (PlanThreads), each entry in its own place.
  cmp.entries.resize(cases.size());
  ForEachCase(cases.size(), o.run.threads, [&](std::size_t i, int threads) {
    RunOptions run = o.run;
    run.threads = threads;
    const PointAtLift p = SolveAtLift(cases[i], lift_of[i], run);
    CompareEntry& e = cmp.entries[i];
    e = Describe(cases[i], p);
    e.span_loading = SpanLoadingWithElliptic(p.lattice, p.point, cases[i].reference);  // for the overlay plot
    if (o.same_aircraft) e.induced_drag_N = DynamicPressure(*o.same_aircraft) * cases[i].reference.area * e.CD_induced;
  });
  for (std::size_t i = 0; i < cmp.entries.size(); ++i) cmp.ranked.push_back(i);
  // The ranking key: the induced drag coefficient at a common CL, the induced drag force for one aircraft.
  auto key = [&](const CompareEntry& e) { return e.induced_drag_N ? *e.induced_drag_N : e.CD_induced; };
  std::stable_sort(cmp.ranked.begin(), cmp.ranked.end(), [&](std::size_t a, std::size_t b) {
    return key(cmp.entries[a]) < key(cmp.entries[b]);
  });
  for (std::size_t k = 0; k < cmp.ranked.size(); ++k) {
    CompareEntry& e = cmp.entries[cmp.ranked[k]];
    const CompareEntry* prev = k > 0 ? &cmp.entries[cmp.ranked[k - 1]] : nullptr;
    const bool tie = prev && std::abs(key(e) - key(*prev)) <= 1e-12 * std::max(std::abs(key(e)), std::abs(key(*prev)));
    e.rank = tie ? prev->rank : static_cast<int>(k) + 1;
  }
  return cmp;
}

std::vector<SpanLoadingSeries> SpanLoadingWithElliptic(const Lattice& lat, const PointResult& p,
                                                       const Reference& ref) {
  std::vector<SpanLoadingSeries> out;
  for (std::size_t s = 0; s < lat.surfaces.size() && s < p.surfaces.size(); ++s) {
    const LatticeSurface& ls = lat.surfaces[s];
    const StripLoads& sl = p.surfaces[s].strips;
    SKEIN_ASSERT(sl.y.size() == ls.strips);
    double ymin = std::numeric_limits<double>::infinity(), ymax = -ymin;
    SpanLoadingSeries ser;
    ser.surface = ls.name;
    ser.CL = p.surfaces[s].CL;
    for (std::size_t k = 0; k < ls.strips; ++k) {
      const Strip& st = lat.strips[ls.first_strip + k];
      ymin = std::min({ymin, st.te_left[1], st.te_right[1]});
      ymax = std::max({ymax, st.te_left[1], st.te_right[1]});
      ser.y.push_back(sl.y[k]);
      ser.width.push_back(std::abs(st.te_right[1] - st.te_left[1]));
      ser.loading.push_back(sl.cl_c_over_cref[k]);
    }
    ser.span = ymax - ymin;
    if (!(ser.span > 1e-9 * std::max(1.0, ref.span))) continue;  // no extent in y: a fin on the centre line
    ser.centre = 0.5 * (ymin + ymax);
    ser.amplitude = 4.0 * ref.area * ser.CL / (3.14159265358979323846 * ser.span * ref.chord);
    for (double y : ser.y) {
      const double e = 2.0 * (y - ser.centre) / ser.span;
      ser.elliptic.push_back(ser.amplitude * std::sqrt(std::max(0.0, 1.0 - e * e)));
    }
    out.push_back(std::move(ser));
  }
  return out;
}

// ---- parameter studies ------------------------------------------------------------------------------------

namespace {

/// Text made safe for a one-line message.
std::string Printable(std::string_view s) {
  std::string out;
  for (char ch : s) out += (static_cast<unsigned char>(ch) < 0x20 || ch == 0x7f) ? '?' : ch;
  return out.size() > 120 ? out.substr(0, 120) + "..." : out;
}

std::string Trim(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t')) s.remove_suffix(1);
  return std::string(s);
}

/// A whole finite number, or nullopt.
std::optional<double> ParseNumber(const std::string& s) {
  if (s.empty()) return std::nullopt;
  char* end = nullptr;
  errno = 0;
  const double v = std::strtod(s.c_str(), &end);
  if (end != s.c_str() + s.size() || errno == ERANGE || !std::isfinite(v)) return std::nullopt;
  return v;
}

std::string VariantLabel(const std::vector<CaseKey>& keys, const std::vector<double>& values) {
  std::string out = "variant ";
  for (std::size_t a = 0; a < keys.size(); ++a)
    out += fmt::format("{}{} = {}", a ? ", " : "", keys[a].path, FormatCaseNumber(values[a], keys[a].integer));
  return out;
}

}  // namespace

StudyAxis ParseStudyAxis(const std::string& spec) {
  const auto fail = [&](const std::string& why) -> StudyAxis {
    throw InputError(fmt::format("--vary \"{}\": {}", Printable(spec), why));
  };
  const std::size_t eq = spec.find('=');
  if (eq == std::string::npos || Trim(std::string_view(spec).substr(0, eq)).empty())
    return fail("expected PATH=FROM:TO:COUNT or PATH=V1,V2,... (e.g. surface.wing.trapezoid.taper=0.2:0.6:9)");
  StudyAxis axis;
  axis.path = Trim(std::string_view(spec).substr(0, eq));
  const std::string rhs = spec.substr(eq + 1);
  const auto number = [&](const std::string& text, const char* what) {
    const std::optional<double> v = ParseNumber(Trim(text));
    if (!v) fail(fmt::format("{} \"{}\" is not a finite number", what, Printable(Trim(text))));
    return *v;
  };
  if (rhs.find(':') != std::string::npos) {
    std::vector<std::string> parts;
    for (std::size_t start = 0;;) {
      const std::size_t c = rhs.find(':', start);
      parts.push_back(rhs.substr(start, c == std::string::npos ? std::string::npos : c - start));
      if (c == std::string::npos) break;
      start = c + 1;
    }
    if (parts.size() != 3) return fail("expected FROM:TO:COUNT after '=' (e.g. 0.2:0.6:9)");
    const double from = number(parts[0], "FROM"), to = number(parts[1], "TO");
    const std::string count_text = Trim(parts[2]);
    const bool digits = !count_text.empty() && count_text.size() < 10 &&
                        std::all_of(count_text.begin(), count_text.end(), [](char ch) { return ch >= '0' && ch <= '9'; });
    const std::size_t count = digits ? std::stoul(count_text) : 0;
    if (count < 2 || count > kMaxStudyVariants)
      return fail(fmt::format("COUNT must be a whole number from 2 to {}, got \"{}\"", kMaxStudyVariants,
                              Printable(count_text)));
    // Rounded to 12 significant digits, so that 0.2:0.6:17 gives 0.225 and not 0.22500000000000003 (the
    // decimal the user meant, which is also what goes into the variant's text).
    for (std::size_t i = 0; i < count; ++i) {
      const double v = from + (to - from) * static_cast<double>(i) / static_cast<double>(count - 1);
      axis.values.push_back(i + 1 == count ? to : std::strtod(fmt::format("{:.12g}", v).c_str(), nullptr));
    }
  } else {
    for (std::size_t start = 0;;) {
      const std::size_t c = rhs.find(',', start);
      axis.values.push_back(number(rhs.substr(start, c == std::string::npos ? std::string::npos : c - start), "value"));
      if (c == std::string::npos) break;
      start = c + 1;
    }
    if (axis.values.size() > kMaxStudyVariants)
      return fail(fmt::format("{} values, more than the limit of {}", axis.values.size(), kMaxStudyVariants));
  }
  return axis;
}

std::optional<double> ParabolicMinimum(const std::vector<double>& x, const std::vector<double>& y) {
  if (x.size() != y.size() || x.size() < 3) return std::nullopt;
  const bool increasing = x[1] > x[0];
  for (std::size_t k = 1; k < x.size(); ++k)
    if (increasing ? !(x[k] > x[k - 1]) : !(x[k] < x[k - 1])) return std::nullopt;
  const std::size_t m = static_cast<std::size_t>(std::min_element(y.begin(), y.end()) - y.begin());
  if (m == 0 || m + 1 == y.size()) return std::nullopt;
  const double x1 = x[m - 1], x2 = x[m], x3 = x[m + 1], y1 = y[m - 1], y2 = y[m], y3 = y[m + 1];
  const double den = 2.0 * ((x2 - x1) * (y2 - y3) - (x2 - x3) * (y2 - y1));
  if (!(std::abs(den) > 0.0)) return std::nullopt;
  return x2 - ((x2 - x1) * (x2 - x1) * (y2 - y3) - (x2 - x3) * (x2 - x3) * (y2 - y1)) / den;
}

Study RunStudy(std::string_view text, const std::string& file, const StudyOptions& o) {
  if (o.axes.empty() || o.axes.size() > 2)
    throw InputError(file, {}, fmt::format("a study varies one or two keys (--vary), got {}", o.axes.size()));
  if (o.target_CL.has_value() == o.alpha_deg.has_value())
    throw InputError(file, {}, "give either --cl (a fixed lift coefficient) or --alpha (a fixed angle), not both");
  if (o.target_CL && !std::isfinite(*o.target_CL))
    throw InputError(file, {}, fmt::format("--cl must be a finite number, got {}", *o.target_CL));
  constexpr double kMaxAlphaDeg = 90.0;  // the reader's bound on angles (case_file.cpp)
  if (o.alpha_deg && !(std::abs(*o.alpha_deg) <= kMaxAlphaDeg))
    throw InputError(file, {}, fmt::format("--alpha must be within +-{:g} deg, got {}", kMaxAlphaDeg, *o.alpha_deg));

  // The case as written first: an error of the file itself is not a variant's.
  Case base = ReadCaseText(text, file);
  Study st;
  st.title = base.title;
  st.source = file;
  st.axes = o.axes;
  st.target_CL = o.target_CL;
  st.alpha_deg = o.alpha_deg;
  st.warnings = base.warnings;

  std::vector<CaseKey> keys;
  std::size_t total = 1;
  for (const StudyAxis& axis : o.axes) {
    keys.push_back(FindCaseKey(text, file, axis.path));
    if (axis.values.empty()) throw InputError(file, {}, fmt::format("--vary \"{}\": no values", axis.path));
    total *= axis.values.size();
  }
  if (keys.size() == 2 && keys[0].begin == keys[1].begin)
    throw InputError(file, keys[1].where, fmt::format("--vary \"{}\" is given twice", keys[1].path));
  if (total > kMaxStudyVariants)
    throw InputError(file, {}, fmt::format("the study would have {} variants, more than the limit of {}", total,
                                           kMaxStudyVariants));

  // Every variant read (and so validated) before any is solved.
  std::vector<Case> cases(total);
  st.variants.resize(total);
  const std::size_t n0 = o.axes[0].values.size();
  for (std::size_t i = 0; i < total; ++i) {
    StudyVariant& v = st.variants[i];
    v.values.push_back(o.axes[0].values[i % n0]);
    if (o.axes.size() == 2) v.values.push_back(o.axes[1].values[i / n0]);
    std::vector<std::pair<CaseKey, double>> edits;
    for (std::size_t a = 0; a < keys.size(); ++a) edits.emplace_back(keys[a], v.values[a]);
    const std::string label = VariantLabel(keys, v.values);
    try {
      cases[i] = ReadCaseText(EditCaseText(text, edits), file);
    } catch (const InputError& e) {
      throw InputError(e.file(), e.where(), label + ": " + e.message());
    }
    cases[i].source_path = file;
    for (const std::string& w : cases[i].warnings)
      if (std::find(base.warnings.begin(), base.warnings.end(), w) == base.warnings.end())
        st.warnings.push_back(label + ": " + w);
  }

  std::mutex progress_mutex;
  std::size_t done = 0;
  st.threads = ForEachCase(total, o.run.threads, [&](std::size_t i, int threads) {
    RunOptions run = o.run;
    run.threads = threads;
    const std::string label = VariantLabel(keys, st.variants[i].values);
    try {
      PointAtLift p;
      if (o.target_CL) {
        p = SolveAtLift(cases[i], *o.target_CL, run);
      } else {
        p.at = cases[i];
        p.at.flight.alpha_deg = {*o.alpha_deg};
        p.at.flight.beta_deg = {cases[i].flight.beta_deg.front()};
        p.point = Run(p.at, run).points.front();
        p.lattice = BuildLattice(p.at);
      }
      const CompareEntry e = Describe(p.at, p);
      StudyVariant& v = st.variants[i];
      v.alpha_deg = e.alpha_deg;
      v.CL = e.CL;
      v.CD_induced = e.CD_induced;
      v.Cm = p.point.Cm;
      v.span_efficiency = e.span_efficiency;
      const auto finite = [](double x) { return std::isfinite(x) ? std::optional<double>(x) : std::nullopt; };
      v.CL_alpha = finite(e.CL_alpha);
      v.root_bending = finite(e.root_bending);
      v.neutral_point_x = e.neutral_point_x;
      v.cl_peak_eta = finite(e.cl_peak_eta);
      v.cl_peak_over_CL = std::isfinite(e.cl_peak_over_CL) ? e.cl_peak_over_CL : 0.0;
    } catch (const InputError& e) {
      throw InputError(e.file(), e.where(), label + ": " + e.message());
    } catch (const NumericalError& e) {
      throw NumericalError(label + ": " + e.what());
    }
    if (o.progress) {
      const std::lock_guard<std::mutex> lock(progress_mutex);
      o.progress(++done, total);
    }
  });
  return st;
}

}  // namespace skein::study
