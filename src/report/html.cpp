// Skein report: the HTML design-review page. See report/html.hpp.
#include "skein/report/html.hpp"

#include <cmath>
#include <ostream>
#include <sstream>

#include <fmt/format.h>

#include "skein/report/plot.hpp"
#include "skein/report/study.hpp"
#include "skein/report/summary.hpp"

namespace skein::report {
namespace {

std::string H(const std::string& s) { return plot::XmlEscape(s); }

/// A table cell's number: fixed decimals, or "n/a".
std::string Num(double v, int digits) {
  if (!std::isfinite(v)) return "n/a";
  std::string s = fmt::format("{:.{}f}", v, digits);
  if (s[0] == '-' && s.find_first_not_of("-0.") == std::string::npos) s.erase(0, 1);  // "-0.0000" is 0
  return s;
}
std::string Num(const std::optional<double>& v, int digits) { return v ? Num(*v, digits) : "n/a"; }

std::string Stem(const std::string& file) {
  const std::size_t dot = file.rfind('.');
  return plot::XmlId(dot == std::string::npos ? file : file.substr(0, dot));
}

constexpr const char* kCss = R"(body{font-family:"DejaVu Sans",Arial,Helvetica,sans-serif;color:#111;margin:24px auto;
max-width:1000px;padding:0 16px;line-height:1.4}
h1{font-size:1.6em;margin-bottom:0.2em}h2{font-size:1.25em;border-bottom:1px solid #999;margin-top:1.6em}
table{border-collapse:collapse;margin:0.6em 0;font-size:0.92em}
th,td{border:1px solid #bbb;padding:3px 8px;text-align:right}th{background:#eee}
td.l,th.l{text-align:left}tr.failed td{background:#fbeaea}
pre{background:#f6f6f6;border:1px solid #ddd;padding:8px;overflow-x:auto;font-size:0.85em}
.caution{border:2px solid #a33;background:#fff4f0;padding:8px 12px;margin:1em 0}
figure{margin:1.2em 0;page-break-inside:avoid}figure svg{max-width:100%;height:auto}
figcaption{font-size:0.9em;color:#333}
@media print{body{margin:0;max-width:none}pre{white-space:pre-wrap}})";

void Cautions(const Results& r, std::ostream& out) {
  bool profile = false;
  for (const PointResult& p : r.points) profile = profile || p.profile.has_value();
  out << "<div class=\"caution\"><strong>Cautions.</strong> Conceptual-design estimates from linear, inviscid "
         "theory, which predicts no stall or separation"
      << (profile ? "; the profile drag is a strip-theory estimate" : " and no viscous drag")
      << ". Verify by test, and follow the applicable airworthiness rules and licensed engineers.</div>\n";
}

void Points(const Results& r, std::ostream& out) {
  out << "<h2 id=\"points\">Flight points</h2>\n<table><tr><th>#</th><th>alpha (deg)</th><th>beta (deg)</th>"
         "<th>CL</th><th>CD_induced</th><th>span efficiency</th><th>CY</th><th>Cl</th><th>Cm</th><th>Cn</th>"
         "<th class=\"l\">status</th></tr>\n";
  for (std::size_t i = 0; i < r.points.size(); ++i) {
    const PointResult& p = r.points[i];
    if (!p.solved()) {
      out << fmt::format("<tr class=\"failed\"><td>{}</td><td>{}</td><td>{}</td><td colspan=\"7\">n/a</td>"
                         "<td class=\"l\">not solved: {}</td></tr>\n",
                         i + 1, Num(p.alpha_deg, 2), Num(p.beta_deg, 2), H(p.error));
      continue;
    }
    out << fmt::format("<tr><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td>"
                       "<td>{}</td><td>{}</td><td class=\"l\">solved</td></tr>\n",
                       i + 1, Num(p.alpha_deg, 2), Num(p.beta_deg, 2), Num(p.CL, 4), Num(p.CD_induced, 6),
                       Num(p.span_efficiency, 4), Num(p.CY, 4), Num(p.Cl, 4), Num(p.Cm, 4), Num(p.Cn, 4));
  }
  out << "</table>\n";
}

void Shown(const Results& r, std::ostream& out) {
  const PointResult& p = r.FirstSolved();
  if (!p.solved()) return;
  out << fmt::format("<h2 id=\"surfaces\">Surfaces at alpha {} deg, beta {} deg</h2>\n", Num(p.alpha_deg, 2),
                     Num(p.beta_deg, 2));
  out << "<table><tr><th class=\"l\">surface</th><th>CL</th><th>share of CL</th><th>CD_induced</th><th>CY</th>"
         "<th>Cl</th><th>Cm</th><th>Cn</th><th>downwash (deg)</th></tr>\n";
  for (const SurfaceLoads& s : p.surfaces)
    out << fmt::format("<tr><td class=\"l\">{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td>"
                       "<td>{}</td><td>{}</td></tr>\n",
                       H(s.name), Num(s.CL, 4),
                       std::abs(p.CL) > 1e-12 ? Num(s.CL / p.CL, 3) : std::string("n/a"), Num(s.CD_induced, 6),
                       Num(s.CY, 4), Num(s.Cl, 4), Num(s.Cm, 4), Num(s.Cn, 4),
                       s.downwash_from.empty() ? std::string("-") : Num(s.downwash_deg, 3));
  out << "</table>\n";
  out << "<h2 id=\"derivatives\">Derivatives (per rad, or per unit non-dimensional rate)</h2>\n<table><tr>"
         "<th class=\"l\">derivative</th><th>value</th></tr>\n";
  for (const auto& [name, v] : p.derivatives.items)
    out << fmt::format("<tr><td class=\"l\">{}</td><td>{}</td></tr>\n", H(name), Num(v, 4));
  for (const auto& [control, values] : p.control_derivatives)
    for (const auto& [name, v] : values.items)
      out << fmt::format("<tr><td class=\"l\">{} per rad of {}</td><td>{}</td></tr>\n", H(name), H(control), Num(v, 4));
  if (p.neutral_point)
    out << fmt::format("<tr><td class=\"l\">neutral point x (m)</td><td>{}</td></tr>\n", Num((*p.neutral_point)[0], 4));
  out << fmt::format("<tr><td class=\"l\">static margin (fraction of c_ref)</td><td>{}</td></tr>\n",
                     Num(p.static_margin, 4));
  out << "</table>\n";
}

void Trim(const TrimResult& t, std::ostream& out) {
  out << "<h2 id=\"trim\">Trim</h2>\n<table>\n";
  out << fmt::format("<tr><td class=\"l\">adjusted</td><td>{}</td></tr>\n", H(t.adjust));
  out << fmt::format("<tr><td class=\"l\">setting (deg)</td><td>{}</td></tr>\n", Num(t.value_deg, 3));
  out << fmt::format("<tr><td class=\"l\">alpha (deg)</td><td>{}</td></tr>\n", Num(t.alpha_deg, 3));
  out << fmt::format("<tr><td class=\"l\">CL target / reached</td><td>{} / {}</td></tr>\n", Num(t.CL_target, 4),
                     Num(t.CL, 4));
  out << fmt::format("<tr><td class=\"l\">Cm at trim</td><td>{}</td></tr>\n", Num(t.Cm, 6));
  out << fmt::format("<tr><td class=\"l\">CD_induced at trim</td><td>{}</td></tr>\n", Num(t.CD_induced, 6));
  out << fmt::format("<tr><td class=\"l\">static margin at trim</td><td>{}</td></tr>\n", Num(t.static_margin, 4));
  out << fmt::format("<tr><td class=\"l\">Newton steps</td><td>{}</td></tr>\n", t.iterations);
  for (const auto& [name, share] : t.lift_share)
    out << fmt::format("<tr><td class=\"l\">lift share of {}</td><td>{}</td></tr>\n", H(name), Num(share, 3));
  out << "</table>\n";
}

void Convergence(const study::ConvergenceStudy& s, std::ostream& out) {
  out << fmt::format("<h2 id=\"convergence\">Mesh convergence at alpha {} deg, beta {} deg</h2>\n", Num(s.alpha_deg, 2),
                     Num(s.beta_deg, 2));
  out << "<table><tr><th class=\"l\">mesh</th><th>scale</th><th>chordwise</th><th>spanwise</th><th>panels</th></tr>\n";
  const char* names[3] = {"coarse", "medium", "fine"};
  for (std::size_t k = 0; k < 3; ++k)
    out << fmt::format("<tr><td class=\"l\">{}</td><td>{:g}</td><td>{}</td><td>{}</td><td>{}</td></tr>\n", names[k],
                       s.meshes[k].scale, s.meshes[k].chordwise, s.meshes[k].spanwise, s.meshes[k].panels);
  out << "</table>\n<table><tr><th class=\"l\">quantity</th><th>coarse</th><th>medium</th><th>fine</th>"
         "<th>extrapolated</th><th>order</th><th>error estimate</th></tr>\n";
  for (const study::ConvergenceQuantity& q : s.quantities)
    out << fmt::format("<tr><td class=\"l\">{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{} ({})</td>"
                       "<td>{}</td></tr>\n",
                       H(q.name), Num(q.values[0], 6), Num(q.values[1], 6), Num(q.values[2], 6),
                       Num(q.extrapolation.value, 6), Num(q.extrapolation.order, 2),
                       q.extrapolation.order_observed ? "observed" : "assumed", Num(q.extrapolation.error_estimate, 6));
  out << "</table>\n";
  for (const study::ConvergenceQuantity& q : s.quantities)
    if (!q.extrapolation.note.empty()) out << fmt::format("<p>{}: {}</p>\n", H(q.name), H(q.extrapolation.note));
  for (const std::string& w : s.warnings) out << fmt::format("<p>{}</p>\n", H(w));
  std::ostringstream table;
  WriteConvergenceTable(s, table);
  out << "<pre>" << H(table.str()) << "</pre>\n";
}

}  // namespace

void WriteHtmlReport(const HtmlReport& h, std::ostream& out) {
  static const Results kEmpty;
  const Results& r = h.results ? *h.results : kEmpty;
  const std::string title = r.title.empty() ? h.case_path : r.title;
  out << "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
         "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n";
  out << fmt::format("<title>Skein report: {}</title>\n<style>\n{}\n</style>\n</head>\n<body>\n", H(title), kCss);
  out << fmt::format("<h1>Skein report: {}</h1>\n", H(title));
  out << fmt::format("<p>Case file <code>{}</code>{}.</p>\n", H(h.case_path),
                     r.trim ? "; trimmed in pitch (skein trim)" : "");
  Cautions(r, out);

  out << "<h2 id=\"case\">Reference and mesh</h2>\n<table>\n";
  out << fmt::format("<tr><td class=\"l\">reference area S_ref (m^2)</td><td>{}</td></tr>\n", Num(r.reference.area, 4));
  out << fmt::format("<tr><td class=\"l\">reference span b_ref (m)</td><td>{}</td></tr>\n", Num(r.reference.span, 4));
  out << fmt::format("<tr><td class=\"l\">reference chord c_ref (m)</td><td>{}</td></tr>\n", Num(r.reference.chord, 4));
  out << fmt::format("<tr><td class=\"l\">moment point (m)</td><td>({}, {}, {})</td></tr>\n",
                     Num(r.reference.moment_point[0], 4), Num(r.reference.moment_point[1], 4),
                     Num(r.reference.moment_point[2], 4));
  out << fmt::format("<tr><td class=\"l\">panels</td><td>{}</td></tr>\n", r.mesh.panels);
  out << fmt::format("<tr><td class=\"l\">unknowns of the largest system</td><td>{}{}</td></tr>\n", r.mesh.unknowns,
                     r.mesh.half_model ? " (half model)" : "");
  out << fmt::format("<tr><td class=\"l\">factorisations</td><td>{}</td></tr>\n", r.mesh.factorisations);
  out << fmt::format("<tr><td class=\"l\">smallest reciprocal condition estimate</td><td>{}</td></tr>\n",
                     std::isfinite(r.rcond) ? fmt::format("{:.3g}", r.rcond) : std::string("n/a"));
  out << "</table>\n<table><tr><th class=\"l\">surface</th><th>panels</th><th>strips</th></tr>\n";
  for (const MeshSummary::Surface& s : r.mesh.surfaces)
    out << fmt::format("<tr><td class=\"l\">{}</td><td>{}</td><td>{}</td></tr>\n", H(s.name), s.panels, s.strips);
  out << "</table>\n";

  if (!r.points.empty()) {
    Points(r, out);
    Shown(r, out);
  }
  if (r.trim) Trim(*r.trim, out);
  if (h.convergence) Convergence(*h.convergence, out);

  std::vector<std::string> warnings = r.warnings;
  for (const PointResult& p : r.points)
    for (const std::string& w : p.warnings) warnings.push_back(w);
  out << "<h2 id=\"warnings\">Warnings</h2>\n";
  if (warnings.empty()) {
    out << "<p>None.</p>\n";
  } else {
    out << "<ul>\n";
    for (const std::string& w : warnings) out << "<li>" << H(w) << "</li>\n";
    out << "</ul>\n";
  }

  if (!h.plots.empty()) out << "<h2 id=\"plots\">Plots</h2>\n";
  for (const NamedChart& p : h.plots) {
    plot::Chart ch = p.chart;
    const std::string stem = Stem(p.file);
    ch.id_prefix = stem + "-";
    ch.xml_declaration = false;
    out << fmt::format("<figure id=\"plot-{}\">\n", stem);
    plot::WriteChartSvg(ch, out);
    out << fmt::format("<figcaption>{} (file {})</figcaption>\n</figure>\n", H(p.caption), H(p.file));
  }

  if (h.results) {
    std::ostringstream summary;
    WriteSummary(r, summary);
    out << "<h2 id=\"summary\">Summary as printed</h2>\n<pre>" << H(summary.str()) << "</pre>\n";
  }
  out << fmt::format("<h2 id=\"case-text\">Case file as read: {}</h2>\n<pre>{}</pre>\n", H(h.case_path),
                     H(h.case_text));
  Cautions(r, out);
  out << "</body>\n</html>\n";
}

}  // namespace skein::report
