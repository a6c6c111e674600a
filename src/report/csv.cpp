// Skein report: CSV. See report/csv.hpp.
#include "skein/report/csv.hpp"

#include <algorithm>
#include <cmath>
#include <ostream>
#include <string>

#include <fmt/format.h>

namespace skein::report {
namespace {

/// A number as CSV text: shortest round-trip form; empty for a value that could not be computed.
std::string Cell(double v) { return std::isfinite(v) ? fmt::format("{}", v) : std::string(); }
std::string Cell(const std::optional<double>& v) { return v ? Cell(*v) : std::string(); }

/// Quotes a text field when it holds a separator, a quote or a line break.
std::string Text(const std::string& s) {
  if (s.find_first_of(",\"\n\r") == std::string::npos) return s;
  std::string q = "\"";
  for (char ch : s) q += ch == '"' ? std::string("\"\"") : std::string(1, ch);
  return q + "\"";
}

}  // namespace

void WritePointsCsv(const Results& r, std::ostream& out) {
  std::vector<std::string> deriv_names;
  if (!r.points.empty())
    for (const auto& [k, v] : r.FirstSolved().derivatives.items) deriv_names.push_back(k);
  std::string header = "point,alpha_deg,beta_deg,mach,p,q,r,CL,CD_induced,CD_induced_nearfield,CY,Cl,Cm,Cn,span_efficiency";
  for (const auto& k : deriv_names) header += ',' + k;
  header += ",neutral_point_x,static_margin,CD_profile,CD_total,L_over_D,CL_stall_onset,alpha_stall_onset_deg,error";
  out << header << '\n';
  // A point that was not solved writes its seven flight-condition cells, leaves every value empty and puts its
  // message in the last column: as many separators as the header has after its seventh column.
  const auto separators = static_cast<std::size_t>(std::count(header.begin(), header.end(), ','));
  for (std::size_t i = 0; i < r.points.size(); ++i) {
    const PointResult& p = r.points[i];
    out << i;
    if (!p.solved()) {  // the flight condition, every value empty, and why
      for (double v : {p.alpha_deg, p.beta_deg, p.mach, p.rates[0], p.rates[1], p.rates[2]}) out << ',' << Cell(v);
      out << std::string(separators - 6, ',') << Text(p.error) << '\n';
      continue;
    }
    for (double v : {p.alpha_deg, p.beta_deg, p.mach, p.rates[0], p.rates[1], p.rates[2], p.CL, p.CD_induced,
                     p.CD_induced_nearfield, p.CY, p.Cl, p.Cm, p.Cn})
      out << ',' << Cell(v);
    out << ',' << Cell(p.span_efficiency);
    for (const auto& k : deriv_names) out << ',' << Cell(p.derivatives.Get(k));
    out << ',' << (p.neutral_point ? Cell((*p.neutral_point)[0]) : std::string()) << ',' << Cell(p.static_margin);
    if (p.profile)
      out << ',' << Cell(p.profile->CD_profile) << ',' << Cell(p.profile->CD_total) << ',' << Cell(p.profile->L_over_D);
    else
      out << ",,,";
    if (p.stall_onset)
      out << ',' << Cell(p.stall_onset->CL) << ',' << Cell(p.stall_onset->alpha_deg);
    else
      out << ",,";
    out << ",\n";
  }
}

void WriteStripsCsv(const Results& r, std::ostream& out) {
  out << "point,surface,strip,y,z,chord,gamma,cl,cl_c_over_cref\n";
  for (std::size_t i = 0; i < r.points.size(); ++i)
    for (const SurfaceLoads& s : r.points[i].surfaces)
      for (std::size_t k = 0; k < s.strips.y.size(); ++k)
        out << i << ',' << Text(s.name) << ',' << k << ',' << Cell(s.strips.y[k]) << ',' << Cell(s.strips.z[k])
            << ',' << Cell(s.strips.chord[k]) << ',' << Cell(s.strips.gamma[k]) << ',' << Cell(s.strips.cl[k])
            << ',' << Cell(s.strips.cl_c_over_cref[k]) << '\n';
}

void WriteProbesCsv(const Results& r, std::ostream& out) {
  out << "point,probe,x,y,z,u,v,w,downwash_deg,sidewash_deg,q_ratio,in_core,note\n";
  for (std::size_t i = 0; i < r.points.size(); ++i)
    for (const ProbeResult& p : r.points[i].probes) {
      out << i << ',' << Text(p.name) << ',' << Cell(p.point[0]) << ',' << Cell(p.point[1]) << ',' << Cell(p.point[2]);
      for (std::size_t k = 0; k < 3; ++k) out << ',' << (p.velocity ? Cell((*p.velocity)[k]) : std::string());
      out << ',' << Cell(p.downwash_deg) << ',' << Cell(p.sidewash_deg) << ',' << Cell(p.q_ratio) << ','
          << (p.in_core ? "true" : "false") << ',' << Text(p.note) << '\n';
    }
}

void WriteStructuralCsv(const Results& r, std::ostream& out) {
  out << "point,surface,station,shear_N,bending_Nm\n";
  for (std::size_t i = 0; i < r.points.size(); ++i)
    for (const SurfaceLoads& s : r.points[i].surfaces) {
      if (!s.structural) continue;
      const StructuralLoads& sv = *s.structural;
      for (std::size_t k = 0; k < sv.station.size(); ++k)
        out << i << ',' << Text(s.name) << ',' << Cell(sv.station[k]) << ',' << Cell(sv.shear_N[k]) << ','
            << Cell(sv.bending_Nm[k]) << '\n';
    }
}

}  // namespace skein::report
