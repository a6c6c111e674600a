// Skein report: SVG plots. See report/svg.hpp; the drawing itself is report/plot.hpp's.
#include "skein/report/svg.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <ostream>

#include <fmt/format.h>

#include "skein/report/plot.hpp"

namespace skein::report {

/// The axes every span-loading chart shares: y across the span, cl c / c_ref up from zero.
void SetSpanLoadingAxes(plot::Chart& ch) {
  ch.x.title = "spanwise station y (m)";
  ch.x.ticks = 8;
  ch.y.title = "span loading cl c / c_ref (-)";
  ch.y.include_zero = true;
  ch.y.headroom = 0.05;
}

plot::Chart SpanLoadingChart(const SpanLoadingPlot& p) {
  plot::Chart ch;
  ch.title = "Span loading: " + p.title;
  ch.subtitle = fmt::format("alpha {:.2f} deg, beta {:.2f} deg, CL {:.4f}", p.alpha_deg, p.beta_deg, p.CL);
  SetSpanLoadingAxes(ch);
  for (std::size_t i = 0; i < p.series.size(); ++i) {
    const study::SpanLoadingSeries& s = p.series[i];
    plot::Series loading;
    loading.id = "loading-" + plot::XmlId(s.surface);
    loading.label = fmt::format("{} (CL {:.3f})", s.surface, s.CL);
    loading.x = s.y;
    loading.y = s.loading;
    loading.colour = plot::PaletteColour(i);
    plot::Series elliptic;
    elliptic.id = "elliptic-" + plot::XmlId(s.surface);
    elliptic.label = "elliptic, same lift";
    elliptic.dashed = true;
    elliptic.stroke_width = 1.3;
    elliptic.colour = loading.colour;
    constexpr int kSamples = 200;  // intervals of the drawn ellipse
    for (int k = 0; k <= kSamples; ++k) {
      const double e = -1.0 + 2.0 * k / kSamples;
      elliptic.x.push_back(s.centre + 0.5 * s.span * e);
      elliptic.y.push_back(s.amplitude * std::sqrt(std::max(0.0, 1.0 - e * e)));
    }
    ch.series.push_back(std::move(loading));
    ch.series.push_back(std::move(elliptic));
  }
  ch.footnotes = plot::CautionLines();
  return ch;
}

void WriteSpanLoadingSvg(const SpanLoadingPlot& plot, std::ostream& out) {
  plot::WriteChartSvg(SpanLoadingChart(plot), out);
}

namespace {

constexpr double kPi = 3.14159265358979323846;

/// A number for a label: fixed decimals, or "n/a" (a label never shows NaN).
std::string Num(double v, int digits) { return std::isfinite(v) ? fmt::format("{:.{}f}", v, digits) : "n/a"; }

std::string ConditionLine(const PointResult& p) {
  return fmt::format("alpha {} deg, beta {} deg, CL {}", Num(p.alpha_deg, 2), Num(p.beta_deg, 2), Num(p.CL, 4));
}

bool SpansInY(const Lattice& lat, std::size_t s) { return !lat.surfaces[s].on_symmetry_plane; }

plot::Chart LocalClChart(const Results& r, const PointResult& p, const Lattice& lat) {
  plot::Chart ch;
  ch.title = "Local lift coefficient: " + r.title;
  ch.subtitle = ConditionLine(p);
  ch.x.title = "spanwise station y (m)";
  ch.x.ticks = 8;
  ch.y.title = "section lift coefficient cl (-)";
  ch.y.include_zero = true;
  ch.y.headroom = 0.08;
  double y0 = std::numeric_limits<double>::infinity(), y1 = -y0;
  std::size_t colour = 0;
  for (std::size_t s = 0; s < p.surfaces.size() && s < lat.surfaces.size(); ++s) {
    if (!SpansInY(lat, s)) continue;
    const SurfaceLoads& sl = p.surfaces[s];
    plot::Series cl;
    cl.id = "cl-" + plot::XmlId(sl.name);
    cl.label = sl.name;
    cl.x = sl.strips.y;
    cl.y = sl.strips.cl;
    cl.colour = plot::PaletteColour(colour);
    for (double y : sl.strips.y) {
      y0 = std::min(y0, y);
      y1 = std::max(y1, y);
    }
    ch.series.push_back(cl);
    if (sl.sections && !sl.sections->cl_max.empty()) {
      plot::Series mx;
      mx.id = "cl-max-" + plot::XmlId(sl.name);
      mx.label = sl.name + " section cl_max";
      mx.x = sl.strips.y;
      mx.y = sl.sections->cl_max;
      mx.dashed = true;
      mx.stroke_width = 1.3;
      mx.colour = cl.colour;
      ch.series.push_back(mx);
    }
    ++colour;
  }
  if (y1 >= y0) {
    plot::Series ref;
    ref.id = "configuration-CL";
    ref.label = fmt::format("configuration CL {}", Num(p.CL, 3));
    ref.x = {y0, y1};
    ref.y = {p.CL, p.CL};
    ref.dashed = true;
    ref.stroke_width = 1.2;
    ref.colour = "#444";
    ch.series.push_back(ref);
  }
  ch.footnotes = plot::CautionLines();
  return ch;
}

plot::Chart PlanformChart(const Results& r, const PointResult& p, const Lattice& lat) {
  plot::Chart ch;
  ch.title = "Panel loads, top view: " + r.title;
  ch.x.title = "spanwise station y (m)";
  ch.y.title = "chordwise station x (m), aft downward";
  ch.y.reversed = true;
  ch.equal_scale = true;
  ch.height = 600;
  double limit = 0.0;
  bool left_out = false;
  for (std::size_t s = 0; s < p.surfaces.size() && s < lat.surfaces.size(); ++s) {
    if (!SpansInY(lat, s)) {
      left_out = true;
      continue;
    }
    for (double v : p.surfaces[s].panel_delta_cp)
      if (std::isfinite(v)) limit = std::max(limit, std::abs(v));
  }
  if (!(limit > 0.0)) limit = 1.0;
  for (std::size_t s = 0; s < p.surfaces.size() && s < lat.surfaces.size(); ++s) {
    if (!SpansInY(lat, s)) continue;
    const LatticeSurface& ls = lat.surfaces[s];
    const std::vector<double>& dcp = p.surfaces[s].panel_delta_cp;
    for (std::size_t k = 0; k < ls.panels; ++k) {
      const std::size_t i = ls.first_panel + k;
      plot::Shape sh;
      sh.id = fmt::format("panel-{}-{}", plot::XmlId(ls.name), k);
      const double v = k < dcp.size() ? dcp[k] : std::numeric_limits<double>::quiet_NaN();
      sh.x = {lat.corner_le_a.y[i], lat.corner_le_b.y[i], lat.corner_te_b.y[i], lat.corner_te_a.y[i]};
      sh.y = {lat.corner_le_a.x[i], lat.corner_le_b.x[i], lat.corner_te_b.x[i], lat.corner_te_a.x[i]};
      sh.fill = std::isfinite(v) ? plot::DivergingColour(v, limit) : "#cccccc";
      sh.title = fmt::format("{} panel {}: Delta Cp {}", ls.name, k, Num(v, 3));
      ch.shapes.push_back(std::move(sh));
    }
  }
  ch.colour_bar = plot::ColourBar{"panel load Delta Cp (-)", limit};
  ch.subtitle = ConditionLine(p) + (left_out ? "; surfaces in the plane y = 0 (fins) not shown" : "");
  plot::Series mp;
  mp.id = "moment-point";
  mp.label = "moment point";
  mp.line = false;
  mp.colour = "#000000";
  mp.x = {r.reference.moment_point[1]};
  mp.y = {r.reference.moment_point[0]};
  ch.series.push_back(mp);
  if (p.neutral_point) {
    plot::Series np;
    np.id = "neutral-point";
    np.label = "neutral point";
    np.line = false;
    np.colour = "#2d8a4e";
    np.x = {(*p.neutral_point)[1]};
    np.y = {(*p.neutral_point)[0]};
    ch.series.push_back(np);
  }
  ch.footnotes = plot::CautionLines();
  return ch;
}

/// The betas of the solved points, in sweep order, and each solved point's index into them.
std::vector<double> SolvedBetas(const Results& r) {
  std::vector<double> betas;
  for (const PointResult& p : r.points) {
    if (!p.solved()) continue;
    bool seen = false;
    for (double b : betas) seen = seen || !(std::abs(b - p.beta_deg) > 0.0);
    if (!seen) betas.push_back(p.beta_deg);
  }
  return betas;
}

bool HasSweep(const Results& r) {
  const PointResult* first = nullptr;
  for (const PointResult& p : r.points) {
    if (!p.solved()) continue;
    if (!first)
      first = &p;
    else if (std::abs(p.alpha_deg - first->alpha_deg) > 0.0)
      return true;
  }
  return false;
}

std::string SweepSubtitle(const Results& r) {
  std::size_t solved = 0;
  for (const PointResult& p : r.points) solved += p.solved() ? 1u : 0u;
  std::string s = fmt::format("{} solved point{}", solved, solved == 1 ? "" : "s");
  if (r.FailedPoints() > 0) s += fmt::format("; {} not solved, left out", r.FailedPoints());
  return s;
}

/// One series per beta: (x, y) of the solved points with that beta, in sweep order.
void AddSweepSeries(plot::Chart& ch, const Results& r, const std::string& id_stem, const std::string& single_label,
                    double (*x)(const PointResult&), double (*y)(const PointResult&)) {
  const std::vector<double> betas = SolvedBetas(r);
  for (std::size_t j = 0; j < betas.size(); ++j) {
    plot::Series s;
    s.id = fmt::format("{}-{}", id_stem, j);
    s.label = betas.size() == 1 ? single_label : fmt::format("beta {:g} deg", betas[j]);
    s.markers = true;
    s.colour = plot::PaletteColour(j);
    for (const PointResult& p : r.points)
      if (p.solved() && !(std::abs(p.beta_deg - betas[j]) > 0.0)) {
        s.x.push_back(x(p));
        s.y.push_back(y(p));
      }
    ch.series.push_back(s);
  }
}

plot::Chart LiftCurveChart(const Results& r) {
  plot::Chart ch;
  ch.title = "Lift curve: " + r.title;
  ch.subtitle = SweepSubtitle(r);
  ch.x.title = "angle of attack alpha (deg)";
  ch.y.title = "lift coefficient CL (-)";
  AddSweepSeries(ch, r, "lift-curve", "CL", [](const PointResult& p) { return p.alpha_deg; },
                 [](const PointResult& p) { return p.CL; });
  ch.footnotes = plot::CautionLines();
  return ch;
}

plot::Chart DragPolarChart(const Results& r) {
  plot::Chart ch;
  ch.title = "Induced drag polar: " + r.title;
  ch.subtitle = SweepSubtitle(r);
  ch.x.title = "lift coefficient CL (-)";
  ch.y.title = "induced drag coefficient CD_induced (-)";
  ch.y.include_zero = true;
  AddSweepSeries(ch, r, "polar", "CD_induced", [](const PointResult& p) { return p.CL; },
                 [](const PointResult& p) { return p.CD_induced; });
  double c0 = std::numeric_limits<double>::infinity(), c1 = -c0;
  for (const PointResult& p : r.points)
    if (p.solved() && std::isfinite(p.CL)) {
      c0 = std::min(c0, p.CL);
      c1 = std::max(c1, p.CL);
    }
  const double aspect = r.reference.area > 0.0 ? r.reference.span * r.reference.span / r.reference.area : 0.0;
  if (c1 > c0 && aspect > 0.0) {
    // Elliptic loading: CD_induced = CL^2 / (pi A), span efficiency 1 (Prandtl 1918, lifting-line theory).
    plot::Series e;
    e.id = "elliptic-polar";
    e.label = "elliptic loading CL^2/(pi A)";
    e.dashed = true;
    e.stroke_width = 1.3;
    e.colour = "#444";
    constexpr int kSamples = 100;
    for (int k = 0; k <= kSamples; ++k) {
      const double cl = c0 + (c1 - c0) * k / kSamples;
      e.x.push_back(cl);
      e.y.push_back(cl * cl / (kPi * aspect));
    }
    ch.series.push_back(e);
  }
  ch.footnotes = plot::CautionLines();
  return ch;
}

}  // namespace

std::vector<NamedChart> ResultPlots(const Results& r, const Lattice& lat) {
  std::vector<NamedChart> out;
  if (r.points.empty()) return out;
  const PointResult& p = r.FirstSolved();
  if (p.solved()) {
    SpanLoadingPlot sp;
    sp.title = r.title;
    sp.alpha_deg = p.alpha_deg;
    sp.beta_deg = p.beta_deg;
    sp.CL = p.CL;
    sp.series = study::SpanLoadingWithElliptic(lat, p, r.reference);
    out.push_back({"span_loading.svg",
                   "Span loading cl c/c_ref against the spanwise station, with the elliptic loading of the same lift "
                   "and span (Prandtl's lifting-line theory) dashed.",
                   SpanLoadingChart(sp)});
    out.push_back({"local_cl.svg",
                   "Section lift coefficient against the spanwise station, with the configuration CL dashed; where "
                   "the sections give cl_max it is drawn dashed in the surface's colour.",
                   LocalClChart(r, p, lat)});
    out.push_back({"planform_load.svg",
                   "Top view of the lifting surfaces, each panel shaded by its load Delta Cp = (F . n)/(q A); "
                   "blue pushes against the panel normal, red along it.",
                   PlanformChart(r, p, lat)});
  }
  if (HasSweep(r)) {
    out.push_back({"lift_curve.svg", "CL against alpha over the solved points of the sweep, one series per beta.",
                   LiftCurveChart(r)});
    out.push_back({"drag_polar.svg",
                   "Trefftz-plane induced drag against CL over the solved points, with the elliptic-loading "
                   "reference CL^2/(pi A) dashed.",
                   DragPolarChart(r)});
  }
  return out;
}

plot::Chart ComparisonSpanLoadingChart(const study::Comparison& cmp) {
  plot::Chart ch;
  ch.title = cmp.same_aircraft
                 ? fmt::format("Span loading of the compared cases at {:g} N and {:g} m/s", cmp.same_aircraft->weight_N,
                               cmp.same_aircraft->speed)
                 : fmt::format("Span loading of the compared cases at CL {}", Num(cmp.target_CL, 4));
  ch.subtitle = cmp.same_aircraft ? "each case at the CL its own reference area needs for that weight"
                                  : "each case at its own angle of attack for the common CL";
  SetSpanLoadingAxes(ch);
  for (std::size_t n = 0; n < cmp.entries.size(); ++n) {
    const study::CompareEntry& e = cmp.entries[n];
    const std::string name = e.title.empty() ? e.source : e.title;
    for (std::size_t k = 0; k < e.span_loading.size(); ++k) {
      const study::SpanLoadingSeries& s = e.span_loading[k];
      plot::Series l;
      l.id = fmt::format("loading-{}-{}", n + 1, plot::XmlId(s.surface));
      l.label = fmt::format("{}: {} (CDi {})", name, s.surface, Num(e.CD_induced, 5));
      l.x = s.y;
      l.y = s.loading;
      l.colour = plot::PaletteColour(n);
      l.dashed = k > 0;
      ch.series.push_back(l);
    }
  }
  ch.footnotes = plot::CautionLines();
  return ch;
}

}  // namespace skein::report
