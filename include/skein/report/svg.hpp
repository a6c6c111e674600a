// Skein report: SVG plots for people. Writers only draw what they are handed.
#pragma once

#include <iosfwd>
#include <string>
#include <vector>

#include "skein/report/plot.hpp"
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

}  // namespace skein::report
