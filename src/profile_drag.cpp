// Skein: profile drag and stall onset by strip theory. See profile_drag.hpp for the method and its sources.
#include "skein/profile_drag.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <set>
#include <string>

#include <fmt/format.h>

namespace skein {

double LaminarSkinFriction(double reynolds) {
  SKEIN_ASSERT(reynolds > 0.0);
  return 1.328 / std::sqrt(reynolds);
}

double TurbulentSkinFriction(double reynolds) {
  SKEIN_ASSERT(reynolds > 1.0);
  return 0.455 / std::pow(std::log10(reynolds), 2.58);
}

double MixedSkinFriction(double reynolds, double transition) {
  SKEIN_ASSERT(transition >= 0.0 && transition <= 1.0);
  const double re_t = transition * reynolds;
  // Below Re 10 neither law means anything; the laminar part ahead of such a transition is negligible.
  if (re_t < 10.0) return TurbulentSkinFriction(reynolds);
  return TurbulentSkinFriction(reynolds) -
         transition * (TurbulentSkinFriction(re_t) - LaminarSkinFriction(re_t));
}

double ThicknessFormFactor(double t) { return 1.0 + 2.0 * t + 60.0 * t * t * t * t; }

std::optional<double> ThicknessFromName(const Camber& camber) {
  if (camber.kind == Camber::Kind::table) return camber.table_thickness;  // measured from the coordinates
  const std::string& s = camber.spelling;  // normalised "NACA 2412"
  if (s.size() == 9 && s.rfind("NACA ", 0) == 0 &&
      std::all_of(s.begin() + 5, s.end(), [](char ch) { return ch >= '0' && ch <= '9'; }))
    return ((s[7] - '0') * 10 + (s[8] - '0')) / 100.0;
  return std::nullopt;
}

bool HasSectionData(const Case& c) {
  for (const Surface& s : c.surfaces)
    for (const Section& sec : s.sections) {
      const SectionViscousData& v = sec.viscous;
      if (v.polar || v.cl_max || v.thickness || v.transition) return true;
    }
  return false;
}

namespace {

/// Stall-onset search: secant iterations, the tolerance on max(cl - cl_max), and how far from the point's alpha
/// the search may go (deg; beyond it the attached-flow lattice says nothing useful).
constexpr int kStallIterations = 40;
constexpr double kStallTolerance = 1e-11;
constexpr double kStallSearchDeg = 60.0;

/// Where a strip lies along its surface: between sections k and k + 1 at fraction t, and the fraction of
/// the whole span (along the leading-edge line in the yz plane) from the root.
struct SpanPlace {
  std::size_t k = 0;
  double t = 0.0, span_fraction = 0.0;
};

SpanPlace Locate(const Surface& s, double y, double z) {
  const std::vector<Section>& sec = s.sections;
  double total = 0.0;
  std::vector<double> len(sec.size() - 1);
  for (std::size_t k = 0; k + 1 < sec.size(); ++k) {
    len[k] = std::hypot(sec[k + 1].leading_edge[1] - sec[k].leading_edge[1],
                        sec[k + 1].leading_edge[2] - sec[k].leading_edge[2]);
    total += len[k];
  }
  SpanPlace best;
  double best_d = std::numeric_limits<double>::infinity(), before = 0.0;
  for (std::size_t k = 0; k + 1 < sec.size(); ++k) {
    const double ay = sec[k].leading_edge[1], az = sec[k].leading_edge[2];
    const double dy = sec[k + 1].leading_edge[1] - ay, dz = sec[k + 1].leading_edge[2] - az;
    const double t = std::clamp(((y - ay) * dy + (z - az) * dz) / (dy * dy + dz * dz), 0.0, 1.0);
    const double d = std::hypot(y - ay - t * dy, z - az - t * dz);
    if (d < best_d) {
      best_d = d;
      best = {k, t, total > 0.0 ? (before + t * len[k]) / total : 0.0};
    }
    before += len[k];
  }
  return best;
}

double Interpolate(const SectionPolar& p, double cl, bool& outside) {
  outside = cl < p.cl.front() || cl > p.cl.back();
  if (cl <= p.cl.front()) return p.cd.front();
  if (cl >= p.cl.back()) return p.cd.back();
  const auto it = std::upper_bound(p.cl.begin(), p.cl.end(), cl);
  const auto i = static_cast<std::size_t>(it - p.cl.begin());
  const double f = (cl - p.cl[i - 1]) / (p.cl[i] - p.cl[i - 1]);
  return p.cd[i - 1] + f * (p.cd[i] - p.cd[i - 1]);
}

}  // namespace

void AddProfileDrag(const Case& c, const Lattice& lat, const std::function<PointResult(double)>& loads_at,
                    PointResult& point) {
  const bool data = HasSectionData(c);
  if (!data && !c.flight.speed_given) return;
  SKEIN_ASSERT(lat.surfaces.size() == c.surfaces.size() && point.surfaces.size() == lat.surfaces.size());
  const double nu = c.flight.dynamic_viscosity / c.flight.density;
  const double s_ref = c.reference.area;
  std::set<std::string> notes;

  ProfileDrag pd;
  bool complete = true;
  std::vector<std::string> without_cl_max;
  std::vector<std::vector<double>> strip_cl_max(lat.surfaces.size());  // NaN: not checked
  std::vector<std::vector<double>> strip_fraction(lat.surfaces.size());

  for (std::size_t si = 0; si < lat.surfaces.size(); ++si) {
    const Surface& surf = c.surfaces[si];
    const LatticeSurface& ls = lat.surfaces[si];
    SurfaceLoads& sl = point.surfaces[si];
    SKEIN_ASSERT(surf.name == ls.name && sl.strips.cl.size() == ls.strips);
    StripSectionLoads sec_loads;
    std::vector<double> cl_max(ls.strips, NAN);
    bool all_cl_max = true;
    double cd_surface = 0.0;
    for (std::size_t j = 0; j < ls.strips; ++j) {
      const std::size_t m = ls.first_strip + j;
      const Strip& st = lat.strips[m];
      const Strip& given = st.mirror_of >= 0 ? lat.strips[static_cast<std::size_t>(st.mirror_of)] : st;
      const SpanPlace place = Locate(surf, given.quarter_chord[1], given.quarter_chord[2]);
      const Section& s0 = surf.sections[place.k];
      const Section& s1 = surf.sections[place.k + 1];
      const double cl = sl.strips.cl[j];
      const double re = c.flight.speed_given ? c.flight.speed * st.chord / nu : 0.0;
      double cd = 0.0;
      for (int side = 0; side < 2; ++side) {
        const Section& sec = side == 0 ? s0 : s1;
        const double weight = side == 0 ? 1.0 - place.t : place.t;
        const std::size_t number = place.k + 1 + static_cast<std::size_t>(side);
        double cd_side = 0.0;
        if (sec.viscous.polar) {
          bool outside = false;
          cd_side = Interpolate(*sec.viscous.polar, cl, outside);
          if (outside)
            notes.insert(fmt::format("surface \"{}\" section {}: strip cl {:.3f} at y = {:.3g} m lies outside its "
                                     "polar table (cl {} to {}); the table's end value is used",
                                     surf.name, number, cl, st.quarter_chord[1], sec.viscous.polar->cl.front(),
                                     sec.viscous.polar->cl.back()));
        } else if (re > 0.0) {
          std::optional<double> t = sec.viscous.thickness;
          if (!t) t = ThicknessFromName(sec.camber);
          if (!t) {
            notes.insert(fmt::format("surface \"{}\" section {}: no thickness and no NACA 4-digit name, so the "
                                     "skin-friction estimate takes a thin plate (form factor 1); give thickness",
                                     surf.name, number));
            t = 0.0;
          }
          cd_side = 2.0 * MixedSkinFriction(re, sec.viscous.transition.value_or(0.0)) * ThicknessFormFactor(*t);
        } else {
          complete = false;
          notes.insert(fmt::format("surface \"{}\" section {}: no polar table and no flight speed, so no profile "
                                   "drag (give speed for a skin-friction estimate, or a polar)",
                                   surf.name, number));
        }
        cd += weight * cd_side;
      }
      sec_loads.cd_profile.push_back(cd);
      sec_loads.reynolds.push_back(re);
      cd_surface += cd * st.chord * st.width / s_ref;
      strip_fraction[si].push_back(place.span_fraction);
      if (s0.viscous.cl_max && s1.viscous.cl_max)
        cl_max[j] = (1.0 - place.t) * *s0.viscous.cl_max + place.t * *s1.viscous.cl_max;
      else
        all_cl_max = false;
    }
    strip_cl_max[si] = cl_max;
    if (all_cl_max) {
      sec_loads.cl_max = cl_max;
    } else {
      bool some = false;
      for (double v : cl_max) some = some || std::isfinite(v);
      if (some)
        notes.insert(fmt::format("surface \"{}\": cl_max is given on some sections only; strips between sections "
                                 "without it are not checked for stall",
                                 surf.name));
      else
        without_cl_max.push_back(surf.name);
    }
    sl.CD_profile = cd_surface;
    sl.sections = std::move(sec_loads);
    pd.CD_profile += cd_surface;
  }

  if (complete) {
    pd.CD_total = point.CD_induced + pd.CD_profile;
    if (pd.CD_total > 0.0) pd.L_over_D = point.CL / pd.CD_total;
    point.profile = pd;
  } else {
    for (SurfaceLoads& sl : point.surfaces) {
      sl.CD_profile.reset();
      sl.sections.reset();
    }
  }
  // Stall onset: the angle at which the most critical strip reaches its cl_max, g(alpha) = max_m (cl_m - cl_max_m)
  // = 0, found by the secant method on the lattice's own loads (the flow basis held, as for derivatives).
  const auto margin = [&](const PointResult& p, StallOnset* where) {
    double g = -std::numeric_limits<double>::infinity();
    for (std::size_t si = 0; si < p.surfaces.size(); ++si)
      for (std::size_t j = 0; j < strip_cl_max[si].size(); ++j) {
        if (!std::isfinite(strip_cl_max[si][j])) continue;
        const double d = p.surfaces[si].strips.cl[j] - strip_cl_max[si][j];
        if (d > g) {
          g = d;
          if (where != nullptr) {
            where->surface = p.surfaces[si].name;
            where->y = p.surfaces[si].strips.y[j];
            where->span_fraction = strip_fraction[si][j];
          }
        }
      }
    return g;
  };
  std::optional<StallOnset> onset;
  bool checked = false;
  for (const auto& v : strip_cl_max)
    for (double x : v) checked = checked || std::isfinite(x);
  const bool beyond = checked && margin(point, nullptr) > 0.0;
  if (checked) {
    double a0 = point.alpha_deg, g0 = margin(point, nullptr);
    double a1 = a0 + 1.0, g1 = margin(loads_at(a1), nullptr);
    for (int it = 0; it < kStallIterations && std::abs(g1) > kStallTolerance; ++it) {
      if (!(std::abs(g1 - g0) > 0.0)) break;
      const double a2 = a1 - g1 * (a1 - a0) / (g1 - g0);
      if (!std::isfinite(a2) || std::abs(a2 - point.alpha_deg) > kStallSearchDeg) break;
      a0 = a1;
      g0 = g1;
      a1 = a2;
      g1 = margin(loads_at(a1), nullptr);
    }
    if (std::abs(g1) <= kStallTolerance) {
      StallOnset o;
      const PointResult at = loads_at(a1);
      margin(at, &o);
      o.CL = at.CL;
      o.alpha_deg = a1;
      onset = o;
    }
  }
  if (onset) {
    onset->already_beyond = beyond;
    point.stall_onset = onset;
    if (beyond)
      notes.insert(fmt::format("a strip is above its section cl_max at alpha {} deg: the linear loading here is "
                               "past the critical-section stall onset",
                               point.alpha_deg));
    if (!without_cl_max.empty()) {
      std::string names;
      for (const std::string& n : without_cl_max) names += (names.empty() ? "\"" : ", \"") + n + "\"";
      notes.insert("stall onset leaves out the surfaces without cl_max: " + names);
    }
  } else if (checked) {
    notes.insert(fmt::format("stall onset not found within {} deg of alpha {} deg: no strip reaches its cl_max there",
                             kStallSearchDeg, point.alpha_deg));
  }
  for (const std::string& n : notes) point.warnings.push_back(n);
}

std::optional<BestLiftToDrag> FindBestLiftToDrag(const std::vector<PointResult>& points) {
  std::optional<BestLiftToDrag> best;
  for (std::size_t i = 0; i < points.size(); ++i) {
    const PointResult& p = points[i];
    if (!p.profile || !p.profile->L_over_D) continue;
    if (!best || *p.profile->L_over_D > best->L_over_D) best = BestLiftToDrag{i, *p.profile->L_over_D, p.CL, p.alpha_deg};
  }
  return best;
}

}  // namespace skein
