// Skein report: design-study tables and JSON. See report/study.hpp.
#include "skein/report/study.hpp"

#include <cmath>
#include <ostream>
#include <sstream>

#include <fmt/format.h>
#include <nlohmann/json.hpp>

#include "skein/report/json.hpp"

namespace skein::report {
namespace {

using nlohmann::ordered_json;

std::string Cell(double v, int width, int digits) {
  if (!std::isfinite(v)) return fmt::format("{:>{}}", "-", width);
  if (std::abs(v) < 0.5 * std::pow(10.0, -digits)) v = 0.0;  // no "-0.0000"
  return fmt::format("{:>{}.{}f}", v, width, digits);
}

int DigitsFor(const std::string& name) { return name == "CD_induced" ? 7 : 5; }

ordered_json Num(double v, const std::string& where, std::vector<std::string>& problems) {
  if (std::isfinite(v)) return v;
  problems.push_back(where + " could not be computed (non-finite)");
  return nullptr;
}

}  // namespace

void WriteCautions(std::ostream& out) {
  out << "Cautions: conceptual-design estimates from linear, inviscid theory; no stall, separation or viscous\n"
         "drag. Verify by test, and follow the applicable airworthiness rules and licensed engineers.\n";
}

void WriteConvergenceTable(const study::ConvergenceStudy& s, std::ostream& out) {
  out << fmt::format("\nMesh convergence at alpha {:.2f} deg, beta {:.2f} deg (each direction refined by {:g})\n",
                     s.alpha_deg, s.beta_deg, s.ratio);
  for (std::size_t k = 0; k < 3; ++k) {
    const auto& m = s.meshes[k];
    out << fmt::format("  {:<7} x{:<5g} chordwise {:>3}, spanwise {:>4} per half; {} panels\n",
                       k == 0 ? "coarse" : k == 1 ? "medium" : "fine", m.scale, m.chordwise, m.spanwise, m.panels);
  }
  out << "\n  quantity             coarse       medium         fine   extrapolated  order        error est.\n";
  for (const auto& q : s.quantities) {
    const int d = DigitsFor(q.name);
    const auto& e = q.extrapolation;
    out << fmt::format("  {:<16} {} {} {} {} {:>5} {:<8} {}\n", q.name, Cell(q.values[0], 10, d),
                       Cell(q.values[1], 12, d), Cell(q.values[2], 12, d), Cell(e.value, 14, d),
                       Cell(e.order, 5, 2), e.order_observed ? "observed" : "assumed", Cell(e.error_estimate, 12, d));
  }
  out << "  (extrapolated: Richardson; error est.: grid convergence index of the fine mesh, Roache 1994,\n"
         "   safety factor 1.25 with an observed order, 3 with an assumed one)\n";
  for (const auto& q : s.quantities)
    if (!q.extrapolation.note.empty()) out << fmt::format("  Note: {}: {}\n", q.name, q.extrapolation.note);
  for (const auto& w : s.warnings) out << "  Warning: " << w << '\n';
}

void WriteJsonWithConvergence(const Results& r, const study::ConvergenceStudy& s, std::ostream& out) {
  std::ostringstream base;
  WriteJson(r, base);
  ordered_json doc = ordered_json::parse(base.str());
  std::vector<std::string> problems;
  ordered_json meshes = ordered_json::array();
  for (const auto& m : s.meshes)
    meshes.push_back({{"scale", m.scale}, {"chordwise", m.chordwise}, {"spanwise", m.spanwise}, {"panels", m.panels}});
  ordered_json quantities = ordered_json::object();
  for (const auto& q : s.quantities) {
    const std::string at = "convergence." + q.name;
    const auto& e = q.extrapolation;
    quantities[q.name] = {
        {"values", {Num(q.values[0], at, problems), Num(q.values[1], at, problems), Num(q.values[2], at, problems)}},
        {"extrapolated", Num(e.value, at + ".extrapolated", problems)},
        {"order", Num(e.order, at + ".order", problems)},
        {"order_observed", e.order_observed},
        {"error_estimate", Num(e.error_estimate, at + ".error_estimate", problems)},
        {"note", e.note}};
  }
  doc["convergence"] = {{"alpha_deg", s.alpha_deg},
                        {"beta_deg", s.beta_deg},
                        {"refinement_ratio", s.ratio},
                        {"meshes", meshes},
                        {"quantities", quantities},
                        {"method", "Richardson extrapolation; error estimate: grid convergence index (Roache 1994)"},
                        {"warnings", s.warnings}};
  for (const auto& p : problems) doc["warnings"].push_back(p);
  out << doc.dump(2) << '\n';
}

}  // namespace skein::report
