// Skein report: design-study tables and JSON. See report/study.hpp.
#include "skein/report/study.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <ostream>
#include <sstream>

#include <fmt/format.h>
#include <nlohmann/json.hpp>

#include "skein/report/json.hpp"
#include "skein/report/plot.hpp"

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

void WriteTwistDesign(const study::TwistDesign& d, std::ostream& out) {
  out << fmt::format("Skein twist design: {}\n", d.designed.title);
  out << fmt::format("Design point: CL {:.4f}, beta 0; the root section keeps its twist and the angle of attack\n"
                     "is designed with the other sections' twists\n",
                     d.before.CL);
  out << "\n                     as given    designed    change\n";
  auto row = [&](const char* name, double a, double b, int digits) {
    out << fmt::format("  {:<16} {} {} {}\n", name, Cell(a, 10, digits), Cell(b, 11, digits), Cell(b - a, 9, digits));
  };
  row("alpha deg", d.before.alpha_deg, d.after.alpha_deg, 3);
  row("CL", d.before.CL, d.after.CL, 5);
  row("CD_induced", d.before.CD_induced, d.after.CD_induced, 6);
  row("span efficiency", d.before.span_efficiency.value_or(NAN), d.after.span_efficiency.value_or(NAN), 4);
  row("root bending", d.before.root_bending, d.after.root_bending, 5);
  out << "  (root bending: moment of the right half's load about the x axis through the root, / (q S_ref b_ref))\n";
  if (std::isfinite(d.before.CD_induced) && d.before.CD_induced > 0.0)
    out << fmt::format("  induced drag {:+.2f} %\n", 100.0 * (d.after.CD_induced / d.before.CD_induced - 1.0));
  if (d.bending_constraint_active) out << "  the root bending moment was held at the wing-as-given's value\n";
  out << "\n  section   y/semi-span   twist as given   designed   (deg, nose up)\n";
  for (std::size_t k = 0; k < d.station_eta.size(); ++k)
    out << fmt::format("  {:>7} {:>13.4f} {:>16.3f} {:>10.3f}\n", k + 1, d.station_eta[k], d.twist_before_deg[k],
                       d.twist_after_deg[k]);
  out << fmt::format("\n  {} design iteration{}{}\n", d.iterations, d.iterations == 1 ? "" : "s",
                     d.converged ? "" : " (not settled)");
  for (const auto& w : d.warnings) out << "  Warning: " << w << '\n';
  out << "  The figures are for this mesh; run `skein solve NEW.toml --refine` for mesh-converged values.\n\n";
  WriteCautions(out);
}

namespace {

std::string CaseName(const study::CompareEntry& e) {
  if (!e.source.empty()) return e.source;
  return e.title.empty() ? std::string("(untitled)") : e.title;
}

double OrNan(const std::optional<double>& v) { return v ? *v : std::numeric_limits<double>::quiet_NaN(); }

std::string CsvField(const std::string& s) {
  std::string out = "\"";
  for (char ch : s) out += ch == '"' ? std::string("\"\"") : std::string(1, ch);
  return out + "\"";
}

std::string CsvNum(double v) { return std::isfinite(v) ? fmt::format("{:.17g}", v) : std::string(); }

}  // namespace

void WriteComparisonTable(const study::Comparison& c, std::ostream& out) {
  if (c.same_aircraft)
    out << fmt::format("Skein comparison of one aircraft: weight {:g} N at {:g} m/s, density {:g} kg/m^3\n"
                       "(each case at CL = W / (q S_ref) for its own reference area; ranked by induced drag force)\n\n",
                       c.same_aircraft->weight_N, c.same_aircraft->speed, c.same_aircraft->density);
  else
    out << fmt::format("Skein comparison at CL {:.4f} (every case at this lift; ranked by induced drag)\n\n",
                       c.target_CL);
  const bool force = c.same_aircraft.has_value();
  out << " rank" << (force ? "      CL  D_induced" : "") << "  alpha   CD_induced      e  CL_alpha  root bending  cl peak at   peak cl   neutral pt  case\n";
  out << "     " << (force ? "                  N" : "") << "    deg                         /rad   /(q S b)     y/semi-span  / CL       x m\n";
  for (std::size_t i : c.ranked) {
    const study::CompareEntry& e = c.entries[i];
    out << fmt::format("{:>5}", e.rank);
    if (force) out << fmt::format(" {} {}", Cell(e.CL, 7, 4), Cell(OrNan(e.induced_drag_N), 10, 3));
    out << fmt::format(" {} {} {} {} {} {} {} {}  {}\n", Cell(e.alpha_deg, 6, 2),
                       Cell(e.CD_induced, 12, 6), Cell(OrNan(e.span_efficiency), 6, 3), Cell(e.CL_alpha, 9, 3),
                       Cell(e.root_bending, 13, 5), Cell(e.cl_peak_eta, 12, 3), Cell(e.cl_peak_over_CL, 9, 3),
                       Cell(OrNan(e.neutral_point_x), 11, 4), CaseName(e));
  }
  out << "  (root bending: the first surface's right half about the x axis through its root; cl peak: the first\n"
         "   surface's largest local cl, an indication of where stall would begin, not a stall prediction)\n\n";
  WriteCautions(out);
}

void WriteComparisonJson(const study::Comparison& c, std::ostream& out) {
  std::vector<std::string> problems;
  ordered_json cases = ordered_json::array();
  for (std::size_t i : c.ranked) {
    const study::CompareEntry& e = c.entries[i];
    const std::string at = "cases." + CaseName(e);
    cases.push_back({{"rank", e.rank},
                     {"title", e.title},
                     {"source", e.source},
                     {"alpha_deg", Num(e.alpha_deg, at + ".alpha_deg", problems)},
                     {"CL", Num(e.CL, at + ".CL", problems)},
                     {"CD_induced", Num(e.CD_induced, at + ".CD_induced", problems)},
                     {"span_efficiency", e.span_efficiency ? Num(*e.span_efficiency, at, problems) : ordered_json()},
                     {"CL_alpha", Num(e.CL_alpha, at + ".CL_alpha", problems)},
                     {"root_bending", Num(e.root_bending, at + ".root_bending", problems)},
                     {"cl_peak_eta", Num(e.cl_peak_eta, at + ".cl_peak_eta", problems)},
                     {"cl_peak_over_CL", Num(e.cl_peak_over_CL, at + ".cl_peak_over_CL", problems)},
                     {"neutral_point_x", e.neutral_point_x ? Num(*e.neutral_point_x, at, problems) : ordered_json()}});
    if (e.induced_drag_N) cases.back()["induced_drag_N"] = Num(*e.induced_drag_N, at + ".induced_drag_N", problems);
  }
  ordered_json doc;
  doc["format"] = "skein-comparison";
  doc["version"] = 1;
  if (c.same_aircraft) {
    doc["CL"] = nullptr;  // each case flies at its own CL: cases[].CL
    doc["same_aircraft"] = {{"weight_N", c.same_aircraft->weight_N},
                            {"speed", c.same_aircraft->speed},
                            {"density", c.same_aircraft->density}};
  } else {
    doc["CL"] = c.target_CL;
  }
  doc["cautions"] = "Conceptual-design estimates from linear, inviscid theory: no stall, separation or viscous "
                    "drag. Verify by test and follow the applicable airworthiness rules and licensed engineers.";
  doc["cases"] = cases;
  doc["warnings"] = problems;
  out << doc.dump(2) << '\n';
}

void WriteComparisonCsv(const study::Comparison& c, std::ostream& out) {
  out << "rank,case,title,alpha_deg,CL,CD_induced,span_efficiency,CL_alpha,root_bending,cl_peak_eta,"
         "cl_peak_over_CL,neutral_point_x,induced_drag_N\n";
  for (std::size_t i : c.ranked) {
    const study::CompareEntry& e = c.entries[i];
    out << e.rank << ',' << CsvField(e.source) << ',' << CsvField(e.title) << ',' << CsvNum(e.alpha_deg) << ','
        << CsvNum(e.CL) << ',' << CsvNum(e.CD_induced) << ',' << CsvNum(OrNan(e.span_efficiency)) << ','
        << CsvNum(e.CL_alpha) << ',' << CsvNum(e.root_bending) << ',' << CsvNum(e.cl_peak_eta) << ','
        << CsvNum(e.cl_peak_over_CL) << ',' << CsvNum(OrNan(e.neutral_point_x)) << ','
        << CsvNum(OrNan(e.induced_drag_N)) << '\n';
  }
}

void WriteTwistDesignJson(const study::TwistDesign& d, std::ostream& out) {
  std::vector<std::string> problems;
  auto state = [&](const study::DesignState& st, const std::string& at) {
    return ordered_json{{"alpha_deg", Num(st.alpha_deg, at + ".alpha_deg", problems)},
                        {"CL", Num(st.CL, at + ".CL", problems)},
                        {"CD_induced", Num(st.CD_induced, at + ".CD_induced", problems)},
                        {"span_efficiency", st.span_efficiency ? Num(*st.span_efficiency, at, problems) : ordered_json()},
                        {"root_bending", Num(st.root_bending, at + ".root_bending", problems)}};
  };
  ordered_json sections = ordered_json::array();
  for (std::size_t k = 0; k < d.station_eta.size(); ++k)
    sections.push_back({{"eta", d.station_eta[k]},
                        {"twist_before_deg", d.twist_before_deg[k]},
                        {"twist_after_deg", Num(d.twist_after_deg[k], "sections.twist_after_deg", problems)}});
  ordered_json doc;
  doc["format"] = "skein-twist-design";
  doc["version"] = 1;
  doc["title"] = d.designed.title;
  doc["cautions"] = "Conceptual-design estimates from linear, inviscid theory: no stall, separation or viscous "
                    "drag. Verify by test and follow the applicable airworthiness rules and licensed engineers.";
  doc["before"] = state(d.before, "before");
  doc["after"] = state(d.after, "after");
  doc["bending_constraint_active"] = d.bending_constraint_active;
  doc["iterations"] = d.iterations;
  doc["converged"] = d.converged;
  doc["sections"] = sections;
  std::vector<std::string> warnings = d.warnings;
  warnings.insert(warnings.end(), problems.begin(), problems.end());
  doc["warnings"] = warnings;
  out << doc.dump(2) << '\n';
}

// ---- parameter studies ------------------------------------------------------------------------------------

namespace {

std::optional<double> LeastDragAt(const study::Study& s) {
  if (s.axes.size() != 1) return std::nullopt;
  std::vector<double> cd;
  for (const study::StudyVariant& v : s.variants) cd.push_back(v.CD_induced);
  return study::ParabolicMinimum(s.axes.front().values, cd);
}

/// The last key of a path, cut to a column's width: the table's column head.
std::string ColumnHead(const std::string& path, std::size_t width) {
  std::size_t dot = path.rfind('.');
  // An array element's index alone says nothing: keep its key ("moment_point.1").
  const bool index = dot != std::string::npos && path.find_first_not_of("0123456789", dot + 1) == std::string::npos;
  if (index && dot > 0) dot = path.rfind('.', dot - 1);
  std::string head = dot == std::string::npos ? path : path.substr(dot + 1);
  if (head.size() > width) head = head.substr(0, width);
  return head;
}

}  // namespace

void WriteStudyTable(const study::Study& s, std::ostream& out) {
  out << fmt::format("Skein parameter study: {}\n", s.title);
  if (s.target_CL)
    out << fmt::format("Every variant at CL {:.4f} (the angle of attack found for each)\n", *s.target_CL);
  else
    out << fmt::format("Every variant at alpha {:.2f} deg\n", s.alpha_deg.value_or(0.0));
  for (std::size_t a = 0; a < s.axes.size(); ++a)
    out << fmt::format("  varied: {} ({} values)\n", s.axes[a].path, s.axes[a].values.size());
  out << fmt::format("  {} variants, {} at a time on {} thread{} each\n\n", s.variants.size(),
                     s.threads.concurrent_cases, s.threads.threads_per_case, s.threads.threads_per_case == 1 ? "" : "s");
  std::string head, units;
  for (const study::StudyAxis& axis : s.axes) {
    head += fmt::format("{:>12} ", ColumnHead(axis.path, 12));
    units += fmt::format("{:>12} ", "");
  }
  out << head << " alpha       CL   CD_induced      e       Cm  CL_alpha  root bending   neutral pt  cl peak at   peak cl\n";
  out << units << "   deg                                          /rad    /(q S b)         x m   y/semi-span  / CL\n";
  for (const study::StudyVariant& v : s.variants) {
    std::string row;
    for (double x : v.values) row += fmt::format("{:>12g} ", x);
    out << row
        << fmt::format("{} {} {} {} {} {} {} {} {} {}\n", Cell(v.alpha_deg, 6, 2), Cell(v.CL, 8, 4),
                       Cell(v.CD_induced, 12, 6), Cell(OrNan(v.span_efficiency), 6, 3), Cell(v.Cm, 8, 4),
                       Cell(OrNan(v.CL_alpha), 9, 3), Cell(OrNan(v.root_bending), 13, 5),
                       Cell(OrNan(v.neutral_point_x), 12, 4), Cell(OrNan(v.cl_peak_eta), 11, 3),
                       Cell(v.cl_peak_over_CL, 9, 3));
  }
  if (const std::optional<double> at = LeastDragAt(s))
    out << fmt::format("\nLeast induced drag at {} = {:.4g} (parabola through the three best variants)\n",
                       s.axes.front().path, *at);
  else if (s.axes.size() == 1)
    out << "\nLeast induced drag: at an end of the range (or the values are not in order), so not located\n";
  out << "  (root bending: the first surface's right half about the x axis through its root; cl peak: the first\n"
         "   surface's largest local cl, an indication of where stall would begin, not a stall prediction)\n";
  for (const std::string& w : s.warnings) out << "warning: " << w << '\n';
  out << '\n';
  WriteCautions(out);
}

void WriteStudyJson(const study::Study& s, std::ostream& out) {
  std::vector<std::string> problems;
  ordered_json axes = ordered_json::array();
  for (const study::StudyAxis& a : s.axes) axes.push_back({{"path", a.path}, {"values", a.values}});
  ordered_json variants = ordered_json::array();
  for (std::size_t i = 0; i < s.variants.size(); ++i) {
    const study::StudyVariant& v = s.variants[i];
    const std::string at = fmt::format("variants[{}]", i);
    const auto opt = [&](const std::optional<double>& x, const char* name) {
      return x ? Num(*x, at + "." + name, problems) : ordered_json();
    };
    variants.push_back({{"values", v.values},
                        {"alpha_deg", Num(v.alpha_deg, at + ".alpha_deg", problems)},
                        {"CL", Num(v.CL, at + ".CL", problems)},
                        {"CD_induced", Num(v.CD_induced, at + ".CD_induced", problems)},
                        {"span_efficiency", opt(v.span_efficiency, "span_efficiency")},
                        {"Cm", Num(v.Cm, at + ".Cm", problems)},
                        {"CL_alpha", opt(v.CL_alpha, "CL_alpha")},
                        {"root_bending", opt(v.root_bending, "root_bending")},
                        {"neutral_point_x", opt(v.neutral_point_x, "neutral_point_x")},
                        {"cl_peak_eta", opt(v.cl_peak_eta, "cl_peak_eta")},
                        {"cl_peak_over_CL", Num(v.cl_peak_over_CL, at + ".cl_peak_over_CL", problems)}});
  }
  ordered_json doc;
  doc["format"] = "skein-study";
  doc["version"] = 1;
  doc["title"] = s.title;
  doc["source"] = s.source;
  doc["cautions"] = "Conceptual-design estimates from linear, inviscid theory: no stall, separation or viscous "
                    "drag. Verify by test and follow the applicable airworthiness rules and licensed engineers.";
  if (s.target_CL)
    doc["target"] = {{"CL", *s.target_CL}};
  else
    doc["target"] = {{"alpha_deg", s.alpha_deg.value_or(0.0)}};
  doc["axes"] = axes;
  doc["variants"] = variants;
  const std::optional<double> least = LeastDragAt(s);
  doc["least_induced_drag_at"] = least ? ordered_json(*least) : ordered_json();
  std::vector<std::string> warnings = s.warnings;
  warnings.insert(warnings.end(), problems.begin(), problems.end());
  doc["warnings"] = warnings;
  out << doc.dump(2) << '\n';
}

void WriteStudyCsv(const study::Study& s, std::ostream& out) {
  for (const study::StudyAxis& a : s.axes) out << CsvField(a.path) << ',';
  out << "alpha_deg,CL,CD_induced,span_efficiency,Cm,CL_alpha,root_bending,neutral_point_x,cl_peak_eta,"
         "cl_peak_over_CL\n";
  for (const study::StudyVariant& v : s.variants) {
    for (double x : v.values) out << CsvNum(x) << ',';
    out << CsvNum(v.alpha_deg) << ',' << CsvNum(v.CL) << ',' << CsvNum(v.CD_induced) << ','
        << CsvNum(OrNan(v.span_efficiency)) << ',' << CsvNum(v.Cm) << ',' << CsvNum(OrNan(v.CL_alpha)) << ','
        << CsvNum(OrNan(v.root_bending)) << ',' << CsvNum(OrNan(v.neutral_point_x)) << ','
        << CsvNum(OrNan(v.cl_peak_eta)) << ',' << CsvNum(v.cl_peak_over_CL) << '\n';
  }
}

std::vector<plot::Chart> StudyCharts(const study::Study& s) {
  std::vector<plot::Chart> charts(2);
  const std::string at = s.target_CL ? fmt::format("every variant at CL {:.4f}", *s.target_CL)
                                     : fmt::format("every variant at alpha {:.2f} deg", s.alpha_deg.value_or(0.0));
  const std::size_t n0 = s.axes.front().values.size();
  const std::size_t lines = s.axes.size() == 2 ? s.axes[1].values.size() : 1;
  for (std::size_t c = 0; c < 2; ++c) {
    plot::Chart& ch = charts[c];
    ch.id_prefix = c == 0 ? "cd-" : "e-";
    ch.title = (c == 0 ? "Induced drag: " : "Span efficiency: ") + s.title;
    ch.subtitle = lines == 1 ? at : fmt::format("{}; one line per value of {}", at, s.axes[1].path);
    ch.x.title = s.axes.front().path;
    ch.y.title = c == 0 ? "induced drag coefficient CD_induced (-)" : "span efficiency e (-)";
    for (std::size_t k = 0; k < lines; ++k) {
      plot::Series ser;
      ser.id = lines == 1 ? std::string(c == 0 ? "CD_induced" : "span_efficiency") : fmt::format("line-{}", k + 1);
      ser.label = lines == 1 ? std::string(c == 0 ? "CD_induced" : "e")
                             : fmt::format("{} = {:g}", ColumnHead(s.axes[1].path, 24), s.axes[1].values[k]);
      ser.markers = true;
      ser.colour = plot::PaletteColour(k);
      std::vector<std::pair<double, double>> pts;  // drawn in order of the varied value
      for (std::size_t i = 0; i < n0; ++i) {
        const study::StudyVariant& v = s.variants[i + n0 * k];
        pts.emplace_back(v.values[0], c == 0 ? v.CD_induced : OrNan(v.span_efficiency));
      }
      std::stable_sort(pts.begin(), pts.end(), [](const auto& a, const auto& b) { return a.first < b.first; });
      for (const auto& [x, y] : pts) {
        ser.x.push_back(x);
        ser.y.push_back(y);
      }
      ch.series.push_back(std::move(ser));
    }
  }
  charts.back().footnotes = plot::CautionLines();
  return charts;
}

void WriteStudySvg(const study::Study& s, std::ostream& out) {
  // Two charts of the plot core stacked in one document: induced drag above, span efficiency below.
  std::vector<plot::Chart> charts = StudyCharts(s);
  double height = 0.0;
  for (const plot::Chart& ch : charts) height += ch.height;
  const double width = charts.front().width;
  out << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  out << fmt::format("<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{:g}\" height=\"{:g}\" viewBox=\"0 0 {:g} {:g}\">\n",
                     width, height, width, height);
  double y = 0.0;
  for (plot::Chart& ch : charts) {
    ch.xml_declaration = false;
    out << fmt::format("<g transform=\"translate(0,{:g})\">\n", y);
    plot::WriteChartSvg(ch, out);
    out << "</g>\n";
    y += ch.height;
  }
  out << "</svg>\n";
}

}  // namespace skein::report
