// Skein report: SVG plots. See report/svg.hpp.
#include "skein/report/svg.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <ostream>

#include <fmt/format.h>

namespace skein::report {
namespace {

std::string Escape(const std::string& s) {
  std::string o;
  for (char ch : s) {
    switch (ch) {
      case '&': o += "&amp;"; break;
      case '<': o += "&lt;"; break;
      case '>': o += "&gt;"; break;
      case '"': o += "&quot;"; break;
      case '\'': o += "&apos;"; break;
      default: o += ch;
    }
  }
  return o;
}

std::string Id(const std::string& s) {
  std::string o;
  for (char ch : s) o += (std::isalnum(static_cast<unsigned char>(ch)) || ch == '-' || ch == '_') ? ch : '_';
  return o.empty() ? std::string("surface") : o;
}

/// A tick step of 1, 2 or 5 times a power of ten giving about `n` intervals over `range`.
double TickStep(double range, int n) {
  const double raw = range / n;
  const double p = std::pow(10.0, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 5.0, 10.0})
    if (m * p >= raw) return m * p;
  return 10.0 * p;
}

std::string Tick(double v, double step) {
  const int digits = std::max(0, -static_cast<int>(std::floor(std::log10(step) + 1e-9)));
  if (std::abs(v) < 0.5 * step * 1e-6) v = 0.0;
  return fmt::format("{:.{}f}", v, digits);
}

constexpr const char* kColours[] = {"#1f5fa8", "#b8452b", "#2d8a4e", "#7a4bb0", "#a87a1f", "#3a7f8c"};

}  // namespace

void WriteSpanLoadingSvg(const SpanLoadingPlot& plot, std::ostream& out) {
  const double W = 860, H = 540, left = 80, right = 230, top = 64, bottom = 100;
  const double pw = W - left - right, ph = H - top - bottom;
  double x0 = std::numeric_limits<double>::infinity(), x1 = -x0, y0 = 0.0, y1 = 0.0;
  for (const auto& s : plot.series) {
    x0 = std::min(x0, s.centre - 0.5 * s.span);
    x1 = std::max(x1, s.centre + 0.5 * s.span);
    for (double v : s.loading) {
      if (!std::isfinite(v)) continue;
      y0 = std::min(y0, v);
      y1 = std::max(y1, v);
    }
    y1 = std::max(y1, s.amplitude);
    y0 = std::min(y0, s.amplitude);
  }
  if (!(x1 > x0)) {
    x0 = -1.0;
    x1 = 1.0;
  }
  if (!(y1 > y0)) y1 = y0 + 1.0;
  const double xstep = TickStep(x1 - x0, 8), ystep = TickStep(y1 - y0, 6);
  x0 = std::floor(x0 / xstep) * xstep;
  x1 = std::ceil(x1 / xstep) * xstep;
  y0 = std::floor(y0 / ystep) * ystep;
  y1 = std::ceil(y1 * 1.05 / ystep) * ystep;
  auto X = [&](double y) { return left + (y - x0) / (x1 - x0) * pw; };
  auto Y = [&](double v) { return top + (y1 - v) / (y1 - y0) * ph; };

  out << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  out << fmt::format("<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{:g}\" height=\"{:g}\" viewBox=\"0 0 {:g} {:g}\" "
                     "font-family=\"sans-serif\" font-size=\"13\">\n",
                     W, H, W, H);
  out << fmt::format("<title>Span loading: {}</title>\n", Escape(plot.title));
  out << fmt::format("<rect x=\"0\" y=\"0\" width=\"{:g}\" height=\"{:g}\" fill=\"white\"/>\n", W, H);
  out << fmt::format("<text x=\"{:g}\" y=\"24\" font-size=\"16\" font-weight=\"bold\">Span loading: {}</text>\n", left,
                     Escape(plot.title));
  out << fmt::format("<text x=\"{:g}\" y=\"44\">alpha {:.2f} deg, beta {:.2f} deg, CL {:.4f}</text>\n", left,
                     plot.alpha_deg, plot.beta_deg, plot.CL);
  // Grid, ticks and axes.
  out << "<g id=\"axes\" stroke=\"#999\" stroke-width=\"0.5\">\n";
  for (double t = x0; t <= x1 + 1e-9 * xstep; t += xstep)
    out << fmt::format("<line x1=\"{:.2f}\" y1=\"{:.2f}\" x2=\"{:.2f}\" y2=\"{:.2f}\"/>\n", X(t), top, X(t), top + ph);
  for (double t = y0; t <= y1 + 1e-9 * ystep; t += ystep)
    out << fmt::format("<line x1=\"{:.2f}\" y1=\"{:.2f}\" x2=\"{:.2f}\" y2=\"{:.2f}\"/>\n", left, Y(t), left + pw, Y(t));
  out << "</g>\n";
  out << fmt::format("<rect x=\"{:g}\" y=\"{:g}\" width=\"{:g}\" height=\"{:g}\" fill=\"none\" stroke=\"black\"/>\n",
                     left, top, pw, ph);
  if (y0 < 0.0)
    out << fmt::format("<line x1=\"{:.2f}\" y1=\"{:.2f}\" x2=\"{:.2f}\" y2=\"{:.2f}\" stroke=\"black\"/>\n", left,
                       Y(0.0), left + pw, Y(0.0));
  out << "<g id=\"tick-labels\">\n";
  for (double t = x0; t <= x1 + 1e-9 * xstep; t += xstep)
    out << fmt::format("<text x=\"{:.2f}\" y=\"{:.2f}\" text-anchor=\"middle\">{}</text>\n", X(t), top + ph + 18,
                       Tick(t, xstep));
  for (double t = y0; t <= y1 + 1e-9 * ystep; t += ystep)
    out << fmt::format("<text x=\"{:.2f}\" y=\"{:.2f}\" text-anchor=\"end\">{}</text>\n", left - 6, Y(t) + 4,
                       Tick(t, ystep));
  out << "</g>\n";
  out << fmt::format("<text id=\"x-label\" x=\"{:.2f}\" y=\"{:.2f}\" text-anchor=\"middle\">spanwise station y (m)</text>\n",
                     left + 0.5 * pw, top + ph + 40);
  out << fmt::format("<text id=\"y-label\" x=\"{:.2f}\" y=\"{:.2f}\" text-anchor=\"middle\" "
                     "transform=\"rotate(-90 {:.2f} {:.2f})\">span loading cl c / c_ref (-)</text>\n",
                     left - 50, top + 0.5 * ph, left - 50, top + 0.5 * ph);

  // Series and legend.
  double ly = top + 10;
  for (std::size_t i = 0; i < plot.series.size(); ++i) {
    const auto& s = plot.series[i];
    const char* colour = kColours[i % (sizeof(kColours) / sizeof(kColours[0]))];
    const std::string id = Id(s.surface);
    std::string pts;
    for (std::size_t k = 0; k < s.y.size(); ++k) {
      if (!std::isfinite(s.loading[k])) continue;
      pts += fmt::format("{}{:.2f},{:.2f}", pts.empty() ? "" : " ", X(s.y[k]), Y(s.loading[k]));
    }
    out << fmt::format("<polyline id=\"loading-{}\" class=\"loading\" fill=\"none\" stroke=\"{}\" stroke-width=\"2\" "
                       "points=\"{}\"/>\n",
                       id, colour, pts);
    std::string ell;
    const int n = 200;
    for (int k = 0; k <= n; ++k) {
      const double e = -1.0 + 2.0 * k / n;
      const double y = s.centre + 0.5 * s.span * e;
      ell += fmt::format("{}{:.2f},{:.2f}", k == 0 ? "" : " ", X(y), Y(s.amplitude * std::sqrt(std::max(0.0, 1.0 - e * e))));
    }
    out << fmt::format("<polyline id=\"elliptic-{}\" class=\"elliptic\" fill=\"none\" stroke=\"{}\" stroke-width=\"1.2\" "
                       "stroke-dasharray=\"6 4\" points=\"{}\"/>\n",
                       id, colour, ell);
    const double lx = left + pw + 16;
    out << fmt::format("<g class=\"legend\"><line x1=\"{:.2f}\" y1=\"{:.2f}\" x2=\"{:.2f}\" y2=\"{:.2f}\" stroke=\"{}\" "
                       "stroke-width=\"2\"/><text x=\"{:.2f}\" y=\"{:.2f}\">{} (CL {:.3f})</text></g>\n",
                       lx, ly, lx + 28, ly, colour, lx + 34, ly + 4, Escape(s.surface), s.CL);
    ly += 20;
    out << fmt::format("<g class=\"legend\"><line x1=\"{:.2f}\" y1=\"{:.2f}\" x2=\"{:.2f}\" y2=\"{:.2f}\" stroke=\"{}\" "
                       "stroke-width=\"1.2\" stroke-dasharray=\"6 4\"/><text x=\"{:.2f}\" y=\"{:.2f}\">elliptic, same "
                       "lift</text></g>\n",
                       lx, ly, lx + 28, ly, colour, lx + 34, ly + 4);
    ly += 28;
  }
  out << fmt::format("<text id=\"cautions\" x=\"{:g}\" y=\"{:g}\" font-size=\"11\" fill=\"#444\">"
                     "<tspan x=\"{:g}\" dy=\"0\">Conceptual-design estimates from linear, inviscid theory; no stall, "
                     "separation or viscous drag.</tspan>"
                     "<tspan x=\"{:g}\" dy=\"14\">Verify by test, and follow the applicable airworthiness rules and "
                     "licensed engineers.</tspan></text>\n",
                     left, H - 34, left, left);
  out << "</svg>\n";
}

}  // namespace skein::report
