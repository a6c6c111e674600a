// Skein report: SVG plots. See report/svg.hpp; the drawing itself is report/plot.hpp's.
#include "skein/report/svg.hpp"

#include <algorithm>
#include <cmath>
#include <ostream>

#include <fmt/format.h>

#include "skein/report/plot.hpp"

namespace skein::report {

plot::Chart SpanLoadingChart(const SpanLoadingPlot& p) {
  plot::Chart ch;
  ch.title = "Span loading: " + p.title;
  ch.subtitle = fmt::format("alpha {:.2f} deg, beta {:.2f} deg, CL {:.4f}", p.alpha_deg, p.beta_deg, p.CL);
  ch.x.title = "spanwise station y (m)";
  ch.x.ticks = 8;
  ch.y.title = "span loading cl c / c_ref (-)";
  ch.y.include_zero = true;
  ch.y.headroom = 0.05;
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

}  // namespace skein::report
