// Skein report: terminal summary. See report/summary.hpp.
#include "skein/report/summary.hpp"

#include <algorithm>
#include <cmath>
#include <ostream>
#include <vector>

#include <fmt/format.h>

namespace skein::report {
namespace {

std::string Fixed(double v, int width, int digits) {
  if (!std::isfinite(v)) return fmt::format("{:>{}}", "-", width);
  if (std::abs(v) < 0.5 * std::pow(10.0, -digits)) v = 0.0;  // no "-0.0000"
  return fmt::format("{:>{}.{}f}", v, width, digits);
}

std::string Opt(const std::optional<double>& v, int width, int digits) {
  return v ? Fixed(*v, width, digits) : fmt::format("{:>{}}", "-", width);
}

double Get(const PointResult& p, const char* name) { return p.derivatives.Get(name).value_or(NAN); }

/// The sign of a derivative in words: `negative` when it is below zero, `positive` above, "zero" otherwise.
std::string Sign(double v, const char* negative, const char* positive) {
  if (!std::isfinite(v)) return "not computed";
  if (std::abs(v) < 1e-9) return "zero";
  return v < 0.0 ? negative : positive;
}

/// Stability derivatives of one point, each with what its sign means (conventions.md: positive Cl is right
/// wing down, Cm nose up, Cn nose right; positive beta is wind from the right).
void WriteStability(const PointResult& p, std::ostream& out) {
  out << fmt::format("\nStability at alpha {:.2f} deg, beta {:.2f} deg (stability axes; per rad, rates per p b/2V, "
                     "q c/2V, r b/2V)\n",
                     p.alpha_deg, p.beta_deg);
  const double cma = Get(p, "Cm_alpha");
  out << fmt::format("  Pitch  CL_alpha {}   Cm_alpha {}  {}\n", Fixed(Get(p, "CL_alpha"), 8, 4), Fixed(cma, 8, 4),
                     Sign(cma, "nose down as alpha rises: statically stable",
                          "nose UP as alpha rises: statically UNSTABLE"));
  if (p.neutral_point && p.static_margin)
    out << fmt::format("         neutral point x = {:.4g} m   static margin {:.1f}% c_ref  ({})\n", (*p.neutral_point)[0],
                       100.0 * *p.static_margin,
                       *p.static_margin > 0.0 ? "moment point ahead of the neutral point: stable"
                                              : "moment point behind the neutral point: UNSTABLE in pitch");
  const double cmq = Get(p, "Cm_q");
  out << fmt::format("         Cm_q     {}  {}   CL_q {}\n", Fixed(cmq, 8, 3),
                     Sign(cmq, "pitch damping", "pitch rate NOT damped"), Fixed(Get(p, "CL_q"), 8, 3));
  const double cnb = Get(p, "Cn_beta"), cnr = Get(p, "Cn_r");
  out << fmt::format("  Yaw    Cn_beta  {}  {}\n", Fixed(cnb, 8, 4),
                     Sign(cnb, "nose turns away from the relative wind: NO weathercock stability",
                          "nose turns into the relative wind: weathercock stable"));
  out << fmt::format("         Cn_r     {}  {}   Cn_p {}\n", Fixed(cnr, 8, 4),
                     Sign(cnr, "yaw damping", "yaw rate NOT damped"), Fixed(Get(p, "Cn_p"), 8, 4));
  const double clb = Get(p, "Cl_beta"), clp = Get(p, "Cl_p");
  out << fmt::format("  Roll   Cl_beta  {}  {}\n", Fixed(clb, 8, 4),
                     Sign(clb, "rolls away from a sideslip: stable dihedral effect",
                          "rolls into a sideslip: NO dihedral stability"));
  out << fmt::format("         Cl_p     {}  {}   Cl_r {}\n", Fixed(clp, 8, 4),
                     Sign(clp, "roll damping", "roll rate NOT damped"), Fixed(Get(p, "Cl_r"), 8, 4));
  out << fmt::format("  Side   CY_beta  {}\n", Fixed(Get(p, "CY_beta"), 8, 4));
  if (p.control_derivatives.empty()) return;
  out << "  Controls, per rad of positive deflection (trailing edge toward -n: down on a wing, right on a fin):\n";
  for (const auto& [name, nv] : p.control_derivatives) {
    const double cl = nv.Get("CL").value_or(NAN), cm = nv.Get("Cm").value_or(NAN);
    const double roll = nv.Get("Cl").value_or(NAN), cn = nv.Get("Cn").value_or(NAN);
    // What the control does: each moment at least half as large as the largest, largest first.
    struct Axis {
      double v;
      std::string words;
    };
    std::vector<Axis> axes = {{cm, "pitch: " + Sign(cm, "nose down", "nose up")},
                              {roll, "roll: " + Sign(roll, "right wing up", "right wing down")},
                              {cn, "yaw: " + Sign(cn, "nose left", "nose right")}};
    std::stable_sort(axes.begin(), axes.end(), [](const Axis& a, const Axis& b) { return std::abs(a.v) > std::abs(b.v); });
    std::string role;
    for (const Axis& a : axes)
      if (std::isfinite(a.v) && std::abs(a.v) > 1e-9 && std::abs(a.v) >= 0.5 * std::abs(axes.front().v))
        role += (role.empty() ? "" : ", ") + a.words;
    if (role.empty()) role = "no moment";
    out << fmt::format("    {:<12} CL {}  Cm {}  Cl {}  Cn {}  ({})\n", name, Fixed(cl, 8, 4), Fixed(cm, 8, 4),
                       Fixed(roll, 8, 4), Fixed(cn, 8, 4), role);
  }
}

/// Downwash each surface sees from the surfaces ahead of it.
void WriteDownwash(const PointResult& p, std::ostream& out) {
  bool header = false;
  for (const SurfaceLoads& s : p.surfaces) {
    if (s.downwash_from.empty()) continue;
    if (!header) {
      out << "  Downwash from the surfaces ahead (area-weighted over the control points):\n";
      header = true;
    }
    std::string from;
    for (const std::string& f : s.downwash_from) from += (from.empty() ? "" : ", ") + f;
    out << fmt::format("    {:<12} epsilon {} deg   d epsilon/d alpha {}   (from {})\n", s.name,
                       Fixed(s.downwash_deg, 7, 3), Fixed(s.downwash_gradient, 7, 4), from);
  }
}

/// The flow at the probes (probe.hpp), every solved point of the sweep; a probe in a vortex core shows no
/// numbers, and why is said once under the table.
void WriteProbes(const Results& r, std::ostream& out) {
  std::vector<ProbeResult> listed;
  for (const PointResult& p : r.points)
    if (p.solved() && !p.probes.empty()) {
      listed = p.probes;
      break;
    }
  if (listed.empty()) return;
  out << "\nFlow at the probes: u, v, w per unit airspeed in geometry axes (x aft, y right, z up); downwash and\n"
         "sidewash in deg (positive: flow turned down, turned toward the right wing); q/q_inf = |V|^2 / V^2\n";
  std::size_t width = 5;
  for (const ProbeResult& pr : listed) width = std::max(width, pr.name.size());
  for (const ProbeResult& pr : listed)
    out << fmt::format("  {:<{}}  at ({:.4g}, {:.4g}, {:.4g}) m\n", pr.name, width, pr.point[0], pr.point[1],
                       pr.point[2]);
  out << fmt::format(" alpha   beta  {:<{}}       u/V       v/V       w/V  downwash  sidewash   q/q_inf\n", "probe",
                     width);
  std::vector<std::string> notes;
  for (const PointResult& p : r.points) {
    if (!p.solved()) continue;
    for (const ProbeResult& pr : p.probes) {
      out << Fixed(p.alpha_deg, 6, 2) << ' ' << Fixed(p.beta_deg, 6, 2) << "  " << fmt::format("{:<{}}", pr.name, width);
      if (pr.velocity && pr.downwash_deg && pr.sidewash_deg && pr.q_ratio) {
        out << ' ' << Fixed((*pr.velocity)[0], 9, 4) << ' ' << Fixed((*pr.velocity)[1], 9, 4) << ' '
            << Fixed((*pr.velocity)[2], 9, 4) << ' ' << Fixed(*pr.downwash_deg, 9, 3) << ' '
            << Fixed(*pr.sidewash_deg, 9, 3) << ' ' << Fixed(*pr.q_ratio, 9, 4) << '\n';
      } else {
        out << (pr.in_core ? "  in a vortex core: no values\n" : "  not computed\n");
        if (std::find(notes.begin(), notes.end(), pr.note) == notes.end()) notes.push_back(pr.note);
      }
    }
  }
  for (const std::string& n : notes) out << "  (" << n << ")\n";
}

/// How the trim ended and what it found.
void WriteTrim(const TrimResult& t, std::ostream& out) {
  out << fmt::format("\nTrim ({}): {} in {} Newton step{}\n", t.adjust, t.converged ? "converged" : "NOT converged",
                     t.iterations, t.iterations == 1 ? "" : "s");
  out << fmt::format("  alpha {:.4f} deg   {} {:.4f} deg   CL {:.6f} (target {:.6f})   Cm {:.2e}\n", t.alpha_deg,
                     t.adjust, t.value_deg, t.CL, t.CL_target, t.Cm);
  out << fmt::format("  CD_induced {:.6f}", t.CD_induced);
  if (t.static_margin)
    out << fmt::format("   static margin {:.1f}% c_ref ({})", 100.0 * *t.static_margin,
                       *t.static_margin > 0.0 ? "stable" : "UNSTABLE in pitch");
  out << '\n';
  if (!t.lift_share.empty()) {
    out << "  share of the lift:";
    for (const auto& [name, v] : t.lift_share) out << fmt::format("  {} {:.1f}%", name, 100.0 * v);
    out << '\n';
  }
}

}  // namespace

void WriteSummary(const Results& r, std::ostream& out, const SummaryOptions& options) {
  out << fmt::format("Skein: {}{}\n", r.title.empty() ? "(untitled case)" : r.title,
                     r.source_path.empty() ? "" : fmt::format("  [{}]", r.source_path));
  const Reference& ref = r.reference;
  out << fmt::format("Reference  S = {:.4g} m^2{}  b = {:.4g} m{}  c = {:.4g} m{}  moment point ({:.4g}, {:.4g}, {:.4g}) m\n",
                     ref.area, ref.area_given ? "" : "*", ref.span, ref.span_given ? "" : "*", ref.chord,
                     ref.chord_given ? "" : "*", ref.moment_point[0], ref.moment_point[1], ref.moment_point[2]);
  if (!(ref.area_given && ref.span_given && ref.chord_given))
    out << "           (* from the first surface: projected area, tip-to-tip span, mean aerodynamic chord)\n";
  std::string surf;
  for (const auto& s : r.mesh.surfaces) surf += fmt::format("{}{} {}", surf.empty() ? "" : ", ", s.name, s.panels);
  out << fmt::format("Mesh       {} panels ({}); {} model, {} unknowns; {} factorisation{}; rcond {:.2g}\n",
                     r.mesh.panels, surf, r.mesh.half_model ? "half" : "full", r.mesh.unknowns,
                     r.mesh.factorisations, r.mesh.factorisations == 1 ? "" : "s", r.rcond);
  for (const auto& w : r.warnings) out << "Warning: " << w << '\n';
  if (r.trim) WriteTrim(*r.trim, out);

  out << "\n alpha   beta       CL   CD_induced  CD_i near       CY       Cl       Cm       Cn    e\n";
  out << "   deg    deg\n";
  for (const PointResult& p : r.points)
    if (!p.solved())
      out << Fixed(p.alpha_deg, 6, 2) << ' ' << Fixed(p.beta_deg, 6, 2) << "   NOT SOLVED (see the warning above)\n";
    else
    out << Fixed(p.alpha_deg, 6, 2) << ' ' << Fixed(p.beta_deg, 6, 2) << ' ' << Fixed(p.CL, 8, 4) << ' '
        << Fixed(p.CD_induced, 12, 6) << ' ' << Fixed(p.CD_induced_nearfield, 9, 6) << ' ' << Fixed(p.CY, 8, 4)
        << ' ' << Fixed(p.Cl, 8, 4) << ' ' << Fixed(p.Cm, 8, 4) << ' ' << Fixed(p.Cn, 8, 4) << ' '
        << Opt(p.span_efficiency, 5, 3) << '\n';

  if (!r.points.empty()) {
    const PointResult& p = r.FirstSolved();
    WriteStability(p, out);
    WriteDownwash(p, out);

    if (options.strips) {
      out << fmt::format("\nSpan loading at alpha {:.2f} deg (a sample of the strips; all of them in --json/--csv)\n",
                         p.alpha_deg);
      for (const SurfaceLoads& s : p.surfaces) {
        const std::size_t n = s.strips.y.size();
        out << fmt::format("  {}: CL {:.4f}  CD_induced {:.6f}\n", s.name, s.CL, s.CD_induced);
        out << "        y m       z m   chord m        cl  cl c/c_ref\n";
        const std::size_t rows = std::min<std::size_t>(n, static_cast<std::size_t>(std::max(options.strip_rows, 2)));
        for (std::size_t k = 0; k < rows; ++k) {
          const std::size_t i = rows == 1 ? 0 : (k * (n - 1) + (rows - 1) / 2) / (rows - 1);
          out << "  " << Fixed(s.strips.y[i], 9, 4) << ' ' << Fixed(s.strips.z[i], 9, 4) << ' '
              << Fixed(s.strips.chord[i], 9, 4) << ' ' << Fixed(s.strips.cl[i], 9, 4) << ' '
              << Fixed(s.strips.cl_c_over_cref[i], 11, 4) << '\n';
        }
      }
    }
  }
  WriteProbes(r, out);
  if (!r.points.empty()) {
    bool header = false;
    const PointResult& p = r.FirstSolved();
    for (const SurfaceLoads& s : p.surfaces) {
      if (!s.structural) continue;
      const StructuralLoads& sv = *s.structural;
      if (!header) {
        out << fmt::format("\nStructural loads at alpha {:.2f} deg (given half; every station in --json/--csv)\n",
                           p.alpha_deg);
        out << "  surface         root shear N  root bending N m  at 1/4, 1/2, 3/4 of the span: bending N m\n";
        header = true;
      }
      const auto at = [&](double fraction) {  // bending at the station nearest the fraction of the span
        const double target = fraction * sv.station.back();
        std::size_t best = 0;
        for (std::size_t k = 0; k < sv.station.size(); ++k)
          if (std::abs(sv.station[k] - target) < std::abs(sv.station[best] - target)) best = k;
        return sv.bending_Nm[best];
      };
      out << fmt::format("  {:<14} {:>13.5g} {:>17.5g}  {:>11.4g} {:>11.4g} {:>11.4g}", s.name, sv.root_shear_N,
                         sv.root_bending_Nm, at(0.25), at(0.5), at(0.75));
      if (sv.mirrored_root_bending_Nm &&
          std::abs(*sv.mirrored_root_bending_Nm - sv.root_bending_Nm) > 1e-9 * std::abs(sv.root_bending_Nm))
        out << fmt::format("  (left half: {:.5g} N, {:.5g} N m)", *sv.mirrored_root_shear_N, *sv.mirrored_root_bending_Nm);
      out << '\n';
    }
    if (header)
      out << "  (from the inviscid strip normal forces; limit and ultimate loads need load factors, gusts and a\n"
             "   structural safety factor from the applicable airworthiness rules)\n";
  }
  bool profile = false, stall = false;
  for (const PointResult& p : r.points) {
    profile = profile || p.profile.has_value();
    stall = stall || p.stall_onset.has_value();
  }
  if (profile || stall) {
    out << "\nStrip theory (section drag at each strip's cl; stall onset by the critical-section method)\n";
    out << " alpha       CL  CD_profile    CD_total     L/D   stall-onset CL  at alpha  first strip\n";
    for (const PointResult& p : r.points) {
      if (!p.solved()) continue;
      out << Fixed(p.alpha_deg, 6, 2) << ' ' << Fixed(p.CL, 8, 4) << ' ';
      if (p.profile)
        out << Fixed(p.profile->CD_profile, 11, 6) << ' ' << Fixed(p.profile->CD_total, 11, 6) << ' '
            << Opt(p.profile->L_over_D, 7, 2);
      else
        out << fmt::format("{:>11} {:>11} {:>7}", "-", "-", "-");
      if (p.stall_onset)
        out << fmt::format("  {:>14.4f}  {:>8.2f}  {} y = {:.3g} m ({:.0f}% of the half-span){}", p.stall_onset->CL,
                           p.stall_onset->alpha_deg, p.stall_onset->surface, p.stall_onset->y,
                           100.0 * p.stall_onset->span_fraction, p.stall_onset->already_beyond ? ", BEYOND" : "");
      out << '\n';
    }
    if (r.best_lift_to_drag)
      out << fmt::format("  best L/D {:.2f} at alpha {:.2f} deg, CL {:.4f} (of the points computed)\n",
                         r.best_lift_to_drag->L_over_D, r.best_lift_to_drag->alpha_deg, r.best_lift_to_drag->CL);
    if (stall)
      out << "  The critical-section stall onset is OPTIMISTIC: it takes the inviscid span loading up to the first strip's\n"
             "  cl_max and ignores spanwise boundary-layer flow and Reynolds effects; real maximum lift comes from test.\n";
  }
  if (profile)
    out << "\nCautions: conceptual-design estimates from linear, inviscid theory, which predicts no stall or separation;\n"
           "the profile drag is a strip-theory estimate. Verify by test, and follow the applicable airworthiness rules\n"
           "and licensed engineers.\n";
  else
    out << "\nCautions: conceptual-design estimates from linear, inviscid theory; no stall, separation or viscous\n"
           "drag. Verify by test, and follow the applicable airworthiness rules and licensed engineers.\n";
  out << fmt::format("Time {:.3f} s (mesh {:.3f}, assemble {:.3f}, factorise {:.3f}, solve {:.3f}, loads {:.3f}), {} thread{}\n",
                     r.times.total, r.times.mesh, r.times.assemble, r.times.factorise, r.times.solve, r.times.loads,
                     r.times.threads_used, r.times.threads_used == 1 ? "" : "s");
}

}  // namespace skein::report
