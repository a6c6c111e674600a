// Skein report: SVG plots for people. Writers only draw what they are handed; the drawing is report/plot.hpp's.
//
//   for (const auto& p : skein::report::ResultPlots(results, skein::BuildLattice(c)))
//     skein::report::plot::WriteChartSvg(p.chart, file_named(p.file));
#pragma once

#include <iosfwd>
#include <string>
#include <vector>

#include "skein/lattice.hpp"
#include "skein/report/plot.hpp"
#include "skein/results.hpp"
#include "skein/study.hpp"

namespace skein::report {

struct SpanLoadingPlot {
  std::string title;          ///< the case title
  double alpha_deg = 0.0, beta_deg = 0.0, CL = 0.0;
  std::vector<study::SpanLoadingSeries> series;
};

/// A span-loading plot: cl c / c_ref against the spanwise station y (m) for every series, each with its
/// elliptic loading of the same lift drawn dashed; axes with ticks and units, a legend, and the cautions.
/// Every series is a <polyline> with id "loading-<surface>" or "elliptic-<surface>" (names made XML-safe).
void WriteSpanLoadingSvg(const SpanLoadingPlot& plot, std::ostream& out);
/// The chart WriteSpanLoadingSvg draws (to embed it elsewhere, or change its ids).
plot::Chart SpanLoadingChart(const SpanLoadingPlot& plot);

/// A chart with the fixed file name `--plots DIR` writes it under, and a caption for the HTML report.
struct NamedChart {
  std::string file;  ///< e.g. "span_loading.svg"
  std::string caption;
  plot::Chart chart;
};

/// The design-review plots of one result, in this order and under these file names:
///  span_loading.svg   cl c / c_ref against y, with the elliptic loading of the same lift (ids as above)
///  local_cl.svg       local cl against y: "cl-<surface>" per surface that spans in y, the configuration CL
///                     dashed ("configuration-CL") and the section cl_max when the sections give it
///                     ("cl-max-<surface>")
///  planform_load.svg  top view (y across, x aft downward, equal scales) of the surfaces that span in y, each
///                     panel a <polygon id="panel-<surface>-<k>"> (k = index in the surface's lattice order)
///                     filled by its load Delta Cp on a blue-white-red scale symmetric about 0, with the
///                     colour bar; markers at the moment point and, when defined, the neutral point
///  lift_curve.svg     CL against alpha, one series "lift-curve-<j>" per beta of the sweep (j from 0)
///  drag_polar.svg     CD_induced against CL, "polar-<j>" per beta, with the elliptic-loading reference
///                     CL^2 / (pi A) dashed ("elliptic-polar", L. Prandtl, lifting-line theory, 1918)
/// The first three show Results::FirstSolved(); the last two are made only when the solved points have two or
/// more different angles of attack, and plot solved points only. `lat` must be the lattice the points were
/// solved on.
std::vector<NamedChart> ResultPlots(const Results& r, const Lattice& lat);

/// The compared cases' span loadings at their common CL, overlaid: one colour per case, a <polyline> with id
/// "loading-<n>-<surface>" for case n (from 1, in the order given) and each surface that spans in y.
plot::Chart ComparisonSpanLoadingChart(const study::Comparison& cmp);

}  // namespace skein::report
