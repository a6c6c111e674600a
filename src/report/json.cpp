// Skein report: JSON. See report/json.hpp and results-format.md.
#include "skein/report/json.hpp"

#include <cmath>
#include <ostream>

#include <nlohmann/json.hpp>

namespace skein {

void NamedValues::Set(const std::string& name, double v) {
  for (auto& [k, x] : items)
    if (k == name) {
      x = v;
      return;
    }
  items.emplace_back(name, v);
}

std::optional<double> NamedValues::Get(const std::string& name) const {
  for (const auto& [k, x] : items)
    if (k == name) return x;
  return std::nullopt;
}

namespace report {
namespace {

using nlohmann::ordered_json;

/// Turns numbers into JSON, replacing a non-finite one by null and noting where it was.
struct Writer {
  std::vector<std::string> problems;
  ordered_json Num(double v, const std::string& where) {
    if (std::isfinite(v)) return v;
    problems.push_back(where + " could not be computed (non-finite)");
    return nullptr;
  }
  ordered_json Vec(const Vec3& v, const std::string& where) {
    return ordered_json::array({Num(v[0], where), Num(v[1], where), Num(v[2], where)});
  }
  ordered_json Array(const std::vector<double>& v, const std::string& where) {
    ordered_json a = ordered_json::array();
    for (double x : v) a.push_back(Num(x, where));
    return a;
  }
  ordered_json Values(const NamedValues& nv, const std::string& where) {
    ordered_json o = ordered_json::object();
    for (const auto& [k, v] : nv.items) o[k] = Num(v, where + "." + k);
    return o;
  }
};

}  // namespace

void WriteJson(const Results& r, std::ostream& out) {
  Writer w;
  ordered_json doc;
  doc["format"] = "skein-result";
  doc["version"] = 1;
  doc["title"] = r.title;
  doc["source"] = r.source_path;
  doc["reference"] = {{"area", w.Num(r.reference.area, "reference.area")},
                      {"span", w.Num(r.reference.span, "reference.span")},
                      {"chord", w.Num(r.reference.chord, "reference.chord")},
                      {"moment_point", w.Vec(r.reference.moment_point, "reference.moment_point")}};
  ordered_json surfaces = ordered_json::array();
  for (const auto& s : r.mesh.surfaces) surfaces.push_back({{"name", s.name}, {"panels", s.panels}, {"strips", s.strips}});
  doc["mesh"] = {{"panels", r.mesh.panels},
                 {"unknowns", r.mesh.unknowns},
                 {"half_model", r.mesh.half_model},
                 {"factorisations", r.mesh.factorisations},
                 {"surfaces", surfaces}};
  doc["solver"] = {{"rcond", w.Num(r.rcond, "solver.rcond")},
                   {"threads_given", r.times.threads_given},
                   {"threads_used", r.times.threads_used},
                   {"memory_estimate_bytes", r.mesh.memory_estimate_bytes},
                   {"lateral_derivatives", r.mesh.lateral}};
  doc["cautions"] = "Conceptual-design estimates from linear, inviscid theory: no stall, separation or viscous "
                    "drag. Verify by test and follow the applicable airworthiness rules and licensed engineers.";
  ordered_json points = ordered_json::array();
  for (std::size_t i = 0; i < r.points.size(); ++i) {
    const PointResult& p = r.points[i];
    const std::string at = "points[" + std::to_string(i) + "]";
    ordered_json jp;
    jp["alpha_deg"] = w.Num(p.alpha_deg, at + ".alpha_deg");
    jp["beta_deg"] = w.Num(p.beta_deg, at + ".beta_deg");
    jp["mach"] = w.Num(p.mach, at + ".mach");
    jp["rates"] = w.Vec(p.rates, at + ".rates");
    if (!p.solved()) {  // the flight condition, null for every value, and why (results-format.md: no NaN)
      for (const char* k : {"CL", "CD_induced", "CD_induced_nearfield", "CY", "Cl", "Cm", "Cn", "span_efficiency",
                            "derivatives", "neutral_point", "static_margin"})
        jp[k] = ordered_json();
      jp["surfaces"] = ordered_json::array();
      jp["probes"] = ordered_json::array();
      jp["warnings"] = p.warnings;
      jp["error"] = p.error;
      points.push_back(jp);
      continue;
    }
    jp["CL"] = w.Num(p.CL, at + ".CL");
    jp["CD_induced"] = w.Num(p.CD_induced, at + ".CD_induced");
    jp["CD_induced_nearfield"] = w.Num(p.CD_induced_nearfield, at + ".CD_induced_nearfield");
    jp["CY"] = w.Num(p.CY, at + ".CY");
    jp["Cl"] = w.Num(p.Cl, at + ".Cl");
    jp["Cm"] = w.Num(p.Cm, at + ".Cm");
    jp["Cn"] = w.Num(p.Cn, at + ".Cn");
    jp["span_efficiency"] = p.span_efficiency ? w.Num(*p.span_efficiency, at + ".span_efficiency") : ordered_json();
    ordered_json d = w.Values(p.derivatives, at + ".derivatives");
    ordered_json controls = ordered_json::object();
    for (const auto& [name, nv] : p.control_derivatives) controls[name] = w.Values(nv, at + ".controls." + name);
    d["controls"] = controls;
    jp["derivatives"] = d;
    jp["neutral_point"] = p.neutral_point ? w.Vec(*p.neutral_point, at + ".neutral_point") : ordered_json();
    jp["static_margin"] = p.static_margin ? w.Num(*p.static_margin, at + ".static_margin") : ordered_json();
    ordered_json js = ordered_json::array();
    for (const SurfaceLoads& s : p.surfaces) {
      const std::string sat = at + ".surfaces." + s.name;
      ordered_json o;
      o["name"] = s.name;
      o["CL"] = w.Num(s.CL, sat + ".CL");
      o["CD_induced"] = w.Num(s.CD_induced, sat + ".CD_induced");
      o["CD_induced_nearfield"] = w.Num(s.CD_induced_nearfield, sat + ".CD_induced_nearfield");
      o["CY"] = w.Num(s.CY, sat + ".CY");
      o["Cl"] = w.Num(s.Cl, sat + ".Cl");
      o["Cm"] = w.Num(s.Cm, sat + ".Cm");
      o["Cn"] = w.Num(s.Cn, sat + ".Cn");
      o["downwash_deg"] = w.Num(s.downwash_deg, sat + ".downwash_deg");
      o["downwash_gradient"] = w.Num(s.downwash_gradient, sat + ".downwash_gradient");
      o["downwash_from"] = s.downwash_from;
      o["strips"] = {{"y", w.Array(s.strips.y, sat + ".strips.y")},
                     {"z", w.Array(s.strips.z, sat + ".strips.z")},
                     {"chord", w.Array(s.strips.chord, sat + ".strips.chord")},
                     {"gamma", w.Array(s.strips.gamma, sat + ".strips.gamma")},
                     {"cl", w.Array(s.strips.cl, sat + ".strips.cl")},
                     {"cl_c_over_cref", w.Array(s.strips.cl_c_over_cref, sat + ".strips.cl_c_over_cref")}};
      if (s.structural) {
        const StructuralLoads& sv = *s.structural;
        ordered_json st = {{"station", w.Array(sv.station, sat + ".structural.station")},
                           {"shear_N", w.Array(sv.shear_N, sat + ".structural.shear_N")},
                           {"bending_Nm", w.Array(sv.bending_Nm, sat + ".structural.bending_Nm")},
                           {"root_shear_N", w.Num(sv.root_shear_N, sat + ".structural.root_shear_N")},
                           {"root_bending_Nm", w.Num(sv.root_bending_Nm, sat + ".structural.root_bending_Nm")}};
        if (sv.mirrored_root_shear_N && sv.mirrored_root_bending_Nm) {
          st["mirrored_root_shear_N"] = w.Num(*sv.mirrored_root_shear_N, sat + ".structural.mirrored_root_shear_N");
          st["mirrored_root_bending_Nm"] =
              w.Num(*sv.mirrored_root_bending_Nm, sat + ".structural.mirrored_root_bending_Nm");
        }
        o["structural"] = st;
      }
      if (s.CD_profile) o["CD_profile"] = w.Num(*s.CD_profile, sat + ".CD_profile");
      if (s.sections) {
        o["strips"]["cd_profile"] = w.Array(s.sections->cd_profile, sat + ".strips.cd_profile");
        o["strips"]["reynolds"] = w.Array(s.sections->reynolds, sat + ".strips.reynolds");
        if (!s.sections->cl_max.empty()) o["strips"]["cl_max"] = w.Array(s.sections->cl_max, sat + ".strips.cl_max");
      }
      js.push_back(o);
    }
    jp["surfaces"] = js;
    if (p.profile)
      jp["profile"] = {{"CD_profile", w.Num(p.profile->CD_profile, at + ".profile.CD_profile")},
                       {"CD_total", w.Num(p.profile->CD_total, at + ".profile.CD_total")},
                       {"L_over_D", p.profile->L_over_D ? w.Num(*p.profile->L_over_D, at + ".profile.L_over_D")
                                                         : ordered_json()}};
    if (p.stall_onset)
      jp["stall_onset"] = {{"CL", w.Num(p.stall_onset->CL, at + ".stall_onset.CL")},
                           {"alpha_deg", w.Num(p.stall_onset->alpha_deg, at + ".stall_onset.alpha_deg")},
                           {"surface", p.stall_onset->surface},
                           {"y", w.Num(p.stall_onset->y, at + ".stall_onset.y")},
                           {"span_fraction", w.Num(p.stall_onset->span_fraction, at + ".stall_onset.span_fraction")},
                           {"already_beyond", p.stall_onset->already_beyond},
                           {"method", "critical section: the first strip to reach its section cl_max, inviscid "
                                      "span loading; optimistic, verify by test"}};
    ordered_json probes = ordered_json::array();  // probe.hpp; a value is null when the probe lies in a core
    for (const ProbeResult& pr : p.probes) {
      const std::string pat = at + ".probes." + pr.name;
      const auto opt = [&](const std::optional<double>& v, const char* k) {
        return v ? w.Num(*v, pat + "." + k) : ordered_json();
      };
      ordered_json o;
      o["name"] = pr.name;
      o["point"] = w.Vec(pr.point, pat + ".point");
      for (std::size_t k = 0; k < 3; ++k) {
        const char* key = k == 0 ? "u" : k == 1 ? "v" : "w";
        o[key] = pr.velocity ? w.Num((*pr.velocity)[k], pat + "." + key) : ordered_json();
      }
      o["downwash_deg"] = opt(pr.downwash_deg, "downwash_deg");
      o["sidewash_deg"] = opt(pr.sidewash_deg, "sidewash_deg");
      o["q_ratio"] = opt(pr.q_ratio, "q_ratio");
      o["in_core"] = pr.in_core;
      o["note"] = pr.note;
      probes.push_back(o);
    }
    jp["probes"] = probes;
    jp["warnings"] = p.warnings;
    points.push_back(jp);
  }
  ordered_json trim;
  if (r.trim) {
    const TrimResult& t = *r.trim;
    ordered_json share = ordered_json::object();
    for (const auto& [name, v] : t.lift_share) share[name] = w.Num(v, "trim.lift_share." + name);
    trim = {{"converged", t.converged},
            {"iterations", t.iterations},
            {"alpha_deg", w.Num(t.alpha_deg, "trim.alpha_deg")},
            {"adjust", t.adjust},
            {"value_deg", w.Num(t.value_deg, "trim.value_deg")},
            {"CL", w.Num(t.CL, "trim.CL")},
            {"Cm", w.Num(t.Cm, "trim.Cm")},
            {"CL_target", w.Num(t.CL_target, "trim.CL_target")},
            {"CD_induced", w.Num(t.CD_induced, "trim.CD_induced")},
            {"static_margin", t.static_margin ? w.Num(*t.static_margin, "trim.static_margin") : ordered_json()},
            {"adjusted_surface", t.adjusted_surface},
            {"lift_share", share},
            {"residual_history", w.Array(t.residual_history, "trim.residual_history")}};
  }
  std::vector<std::string> warnings = r.warnings;
  warnings.insert(warnings.end(), w.problems.begin(), w.problems.end());
  doc["warnings"] = warnings;
  doc["points"] = points;
  if (r.best_lift_to_drag)
    doc["best_lift_to_drag"] = {{"point", r.best_lift_to_drag->point},
                                {"L_over_D", w.Num(r.best_lift_to_drag->L_over_D, "best_lift_to_drag.L_over_D")},
                                {"CL", w.Num(r.best_lift_to_drag->CL, "best_lift_to_drag.CL")},
                                {"alpha_deg", w.Num(r.best_lift_to_drag->alpha_deg, "best_lift_to_drag.alpha_deg")}};
  if (r.trim) doc["trim"] = trim;
  doc["timings"] = {{"read", r.times.read},         {"mesh", r.times.mesh},   {"assemble", r.times.assemble},
                    {"factorise", r.times.factorise}, {"solve", r.times.solve}, {"loads", r.times.loads},
                    {"output", r.times.output},     {"total", r.times.total}, {"threads", r.times.threads_used}};
  out << doc.dump(2) << '\n';
}

}  // namespace report
}  // namespace skein
