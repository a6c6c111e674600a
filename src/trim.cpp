// Skein stage 5, trim. See trim.hpp.
#include "skein/trim.hpp"

#include <algorithm>
#include <cmath>
#include <utility>

#include <fmt/format.h>

#include "vec3.hpp"

namespace skein {
namespace {

using detail::kDegToRad;

/// The setting the trim adjusts: a surface's incidence or one control's deflection, found in the Case.
struct Setting {
  bool incidence = true;
  std::size_t surface = 0;  ///< index into Case::surfaces
  std::size_t control = 0;  ///< index into that surface's controls (deflection only)

  double& In(Case& c) const {
    Surface& s = c.surfaces[surface];
    return incidence ? s.incidence_deg : s.controls[control].deflection_deg;
  }
  double Of(const Case& c) const {
    const Surface& s = c.surfaces[surface];
    return incidence ? s.incidence_deg : s.controls[control].deflection_deg;
  }
};

Setting FindSetting(const Case& c) {
  const std::string& adjust = c.trim.adjust;
  const std::size_t dot = adjust.rfind('.');
  const std::string owner = dot == std::string::npos ? "" : adjust.substr(0, dot);
  const std::string what = dot == std::string::npos ? "" : adjust.substr(dot + 1);
  Setting st;
  for (std::size_t si = 0; si < c.surfaces.size(); ++si) {
    const Surface& s = c.surfaces[si];
    if (what == "incidence" && s.name == owner) {
      st.incidence = true;
      st.surface = si;
      return st;
    }
    for (std::size_t k = 0; k < s.controls.size(); ++k)
      if (what == "deflection" && s.controls[k].name == owner) {
        st.incidence = false;
        st.surface = si;
        st.control = k;
        return st;
      }
  }
  throw InputError(c.source_path, c.trim.where,
                   fmt::format("trim: adjust \"{}\" names no \"<surface>.incidence\" or \"<control>.deflection\" of "
                               "this case",
                               adjust));
}

double TargetLiftCoefficient(const Case& c) {
  if (c.trim.lift_coefficient) {
    if (!std::isfinite(*c.trim.lift_coefficient))
      throw InputError(c.source_path, c.trim.where, "trim: lift_coefficient must be a finite number");
    return *c.trim.lift_coefficient;
  }
  if (!c.trim.weight)
    throw InputError(c.source_path, c.trim.where, "trim: give lift_coefficient, or weight (N) with flight.speed");
  if (!c.flight.speed_given || !(c.flight.speed > 0.0) || !(c.flight.density > 0.0) || !(c.reference.area > 0.0))
    throw InputError(c.source_path, c.trim.where,
                     "trim: weight needs flight.speed and flight.density (the lift coefficient depends on the "
                     "dynamic pressure)");
  return *c.trim.weight / (0.5 * c.flight.density * c.flight.speed * c.flight.speed * c.reference.area);
}

void AddTimes(StageTimes& sum, const StageTimes& t) {
  sum.mesh += t.mesh;
  sum.assemble += t.assemble;
  sum.factorise += t.factorise;
  sum.solve += t.solve;
  sum.loads += t.loads;
  sum.total += t.total;
}

}  // namespace

TrimError::TrimError(const std::string& file, SourceRegion where, const std::string& message)
    : NumericalError(FormatSourceMessage(file, where, "trim: " + message)) {}

void TrimOptions::Validate() const {
  auto fail = [](const char* field, double v, const char* rule) {
    throw InputError(fmt::format("TrimOptions::{} = {:g}: {}", field, v, rule));
  };
  if (max_iterations < 1) fail("max_iterations", max_iterations, "must be at least 1");
  if (!(tolerance > 0.0)) fail("tolerance", tolerance, "must be > 0");
  if (!(max_alpha_deg > 0.0 && max_alpha_deg < 90.0)) fail("max_alpha_deg", max_alpha_deg, "must be in (0, 90)");
  if (!(max_setting_deg > 0.0 && max_setting_deg < 90.0))
    fail("max_setting_deg", max_setting_deg, "must be in (0, 90)");
  if (!(max_step_deg > 0.0)) fail("max_step_deg", max_step_deg, "must be > 0");
  if (!(incidence_step_deg > 0.0 && incidence_step_deg < 1.0))
    fail("incidence_step_deg", incidence_step_deg, "must be in (0, 1)");
}

Results Trim(const Case& c, const RunOptions& run, const TrimOptions& options) {
  options.Validate();
  if (!c.trim.enabled)
    throw InputError(c.source_path, {},
                     "no [trim] table: trim needs lift_coefficient (or weight) and adjust = \"<surface>.incidence\" "
                     "or \"<control>.deflection\"");
  if (c.flight.alpha_deg.empty() || c.flight.beta_deg.empty())
    throw InputError(c.source_path, {}, "trim: the case has no flight point to start from");
  const Setting setting = FindSetting(c);
  const double target = TargetLiftCoefficient(c);
  const std::string adjust = c.trim.adjust;
  const std::string& surface_name = c.surfaces[setting.surface].name;
  auto fail = [&](const std::string& message) -> TrimError { return TrimError(c.source_path, c.trim.where, message); };

  StageTimes times;
  int factorisations = 0;
  auto solve = [&](double alpha_deg, double setting_deg) {
    Case k = c;
    k.flight.alpha_deg = {alpha_deg};
    k.flight.beta_deg = {c.flight.beta_deg.front()};
    setting.In(k) = setting_deg;
    Results r;
    try {
      r = Run(k, run);
    } catch (const InputError& e) {  // a geometry the case allows at its own alpha can fail at an iterate's
      throw InputError(e.file(), e.where(),
                       fmt::format("during the trim, at alpha {:g} deg and {} {:g} deg: {}", alpha_deg, c.trim.adjust,
                                   setting_deg, e.message()));
    }
    AddTimes(times, r.times);
    factorisations += r.mesh.factorisations;
    return r;
  };

  const double amax = options.max_alpha_deg, smax = options.max_setting_deg;
  double alpha = std::clamp(c.flight.alpha_deg.front(), -amax, amax);
  double value = std::clamp(setting.Of(c), -smax, smax);
  TrimResult tr;
  tr.adjust = adjust;
  tr.adjusted_surface = surface_name;
  tr.CL_target = target;
  for (int step = 0;; ++step) {
    Results r = solve(alpha, value);
    const PointResult& p = r.points.front();
    const double f_lift = p.CL - target, f_moment = p.Cm;
    tr.residual_history.push_back(std::max(std::abs(f_lift), std::abs(f_moment)));
    if (!std::isfinite(f_lift) || !std::isfinite(f_moment))
      throw NumericalError(fmt::format("trim: non-finite CL or Cm at alpha {:g} deg, {} {:g} deg", alpha, adjust, value));
    if (std::abs(f_lift) < options.tolerance && std::abs(f_moment) < options.tolerance) {
      tr.converged = true;
      tr.iterations = step;
      tr.alpha_deg = alpha;
      tr.value_deg = value;
      tr.CL = p.CL;
      tr.Cm = p.Cm;
      tr.CD_induced = p.CD_induced;
      tr.static_margin = p.static_margin;
      if (std::abs(p.CL) > 1e-12)
        for (const SurfaceLoads& s : p.surfaces) tr.lift_share.emplace_back(s.name, s.CL / p.CL);
      if (c.flight.alpha_deg.size() * c.flight.beta_deg.size() > 1)
        r.warnings.push_back("trim used the first beta of the sweep and solved for alpha; the other flight points of "
                             "the sweep were not run");
      if (p.static_margin && *p.static_margin < 0.0)
        r.warnings.push_back(fmt::format("the trimmed aircraft is statically unstable in pitch (static margin "
                                         "{:.1f}% c_ref): the trim exists but is not stable",
                                         100.0 * *p.static_margin));
      times.read = r.times.read;
      times.output = r.times.output;
      times.threads_given = r.times.threads_given;
      times.threads_used = r.times.threads_used;
      r.times = times;
      r.mesh.factorisations = factorisations;
      r.trim = std::move(tr);
      return r;
    }
    if (step >= options.max_iterations)
      throw fail(fmt::format("no convergence in {} iterations (|CL - target| = {:.3g}, |Cm| = {:.3g} at alpha {:.3f} "
                             "deg, {} {:.3f} deg)",
                             options.max_iterations, std::abs(f_lift), std::abs(f_moment), alpha, adjust, value));

    // Jacobian per radian: d(CL, Cm)/d alpha from the solution's derivatives, d/d setting from the control's
    // derivative column or, for an incidence, a forward difference over one more exact solution.
    const double cl_a = *p.derivatives.Get("CL_alpha"), cm_a = *p.derivatives.Get("Cm_alpha");
    double cl_s = 0.0, cm_s = 0.0;
    if (setting.incidence) {
      const Results rh = solve(alpha, value + options.incidence_step_deg);
      const double h = options.incidence_step_deg * kDegToRad;
      cl_s = (rh.points.front().CL - p.CL) / h;
      cm_s = (rh.points.front().Cm - p.Cm) / h;
    } else {
      const std::string& name = c.surfaces[setting.surface].controls[setting.control].name;
      const auto d = std::find_if(p.control_derivatives.begin(), p.control_derivatives.end(),
                                  [&](const auto& nv) { return nv.first == name; });
      SKEIN_ASSERT(d != p.control_derivatives.end());
      cl_s = *d->second.Get("CL");
      cm_s = *d->second.Get("Cm");
    }
    // The setting must move (CL, Cm) in a direction of its own: det / |(CL_alpha, Cm_alpha)| is the part of its
    // column across alpha's, and below 1e-6 of alpha's own (per rad) it is no pitch control at all (an aileron
    // pair: its CL and Cm derivatives vanish by symmetry).
    const double det = cl_a * cm_s - cl_s * cm_a;
    const double alpha_column2 = cl_a * cl_a + cm_a * cm_a;
    if (!(std::abs(det) > 1e-6 * alpha_column2))
      throw fail(fmt::format("{} gives no pitch control independent of alpha (dCm/d{} = {:.3g}, dCL/d{} = {:.3g} per "
                             "rad against Cm_alpha = {:.3g}, CL_alpha = {:.3g}); adjust an elevator deflection or a "
                             "tail incidence",
                             adjust, setting.incidence ? "i" : "delta", cm_s, setting.incidence ? "i" : "delta", cl_s,
                             cm_a, cl_a));
    // Newton: J (d alpha, d setting) = -(f_lift, f_moment).
    const double d_alpha = (-f_lift * cm_s + cl_s * f_moment) / det / kDegToRad;
    const double d_value = (-cl_a * f_moment + cm_a * f_lift) / det / kDegToRad;
    const double alpha_estimate = alpha + d_alpha, value_estimate = value + d_value;
    const bool alpha_at_bound = std::abs(alpha) >= amax * (1.0 - 1e-12);
    const bool value_at_bound = std::abs(value) >= smax * (1.0 - 1e-12);
    const std::string unstable =
        p.static_margin && *p.static_margin < 0.0
            ? fmt::format("; the configuration is statically unstable (static margin {:.1f}% c_ref)",
                          100.0 * *p.static_margin)
            : "";
    if (alpha_at_bound && std::abs(alpha_estimate) > amax && alpha_estimate * alpha > 0.0)
      throw fail(fmt::format("the target CL = {:.4g} needs alpha of about {:.1f} deg ({} about {:.1f} deg), beyond "
                             "the {:g} deg this linear, inviscid theory is trusted to{}",
                             target, alpha_estimate, adjust, value_estimate, amax, unstable));
    if (value_at_bound && std::abs(value_estimate) > smax && value_estimate * value > 0.0)
      throw fail(fmt::format("the trim needs {} of about {:.1f} deg (alpha about {:.1f} deg), beyond the {:g} deg "
                             "allowed{}",
                             adjust, value_estimate, alpha_estimate, smax, unstable));
    const double largest = std::max(std::abs(d_alpha), std::abs(d_value));
    const double shrink = largest > options.max_step_deg ? options.max_step_deg / largest : 1.0;
    alpha = std::clamp(alpha + shrink * d_alpha, -amax, amax);
    value = std::clamp(value + shrink * d_value, -smax, smax);
  }
}

Case TrimmedCase(const Case& c, const TrimResult& trim) {
  Case t = c;
  FindSetting(t).In(t) = trim.value_deg;
  t.flight.alpha_deg = {trim.alpha_deg};
  t.flight.beta_deg = {c.flight.beta_deg.empty() ? 0.0 : c.flight.beta_deg.front()};
  return t;
}

}  // namespace skein
