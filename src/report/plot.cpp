// Skein report: the generic SVG chart writer. See report/plot.hpp.
#include "skein/report/plot.hpp"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <functional>
#include <limits>
#include <ostream>

#include <fmt/format.h>

namespace skein::report::plot {
namespace {

constexpr const char* kPalette[] = {"#1f5fa8", "#b8452b", "#2d8a4e", "#7a4bb0", "#a87a1f", "#3a7f8c"};
constexpr double kFont = 14.0, kSmallFont = 12.5, kTitleFont = 17.0;

struct Range {
  double lo = std::numeric_limits<double>::infinity();
  double hi = -std::numeric_limits<double>::infinity();
  void Add(double v) {
    if (!std::isfinite(v)) return;
    lo = std::min(lo, v);
    hi = std::max(hi, v);
  }
  bool empty() const { return !(hi >= lo); }
};

Ticks AxisTicks(const Axis& a, Range r) {
  if (a.include_zero) r.Add(0.0);
  if (r.empty()) {
    r.lo = 0.0;
    r.hi = 1.0;
  }
  if (a.headroom > 0.0 && r.hi > 0.0) r.hi *= 1.0 + a.headroom;
  if (a.min) r.lo = *a.min;
  if (a.max) r.hi = *a.max;
  return NiceTicks(r.lo, r.hi, a.ticks);
}

std::vector<double> TickValues(double lo, double hi, double step) {
  std::vector<double> v;
  const double first = std::ceil(lo / step - 1e-9) * step;
  for (int k = 0;; ++k) {
    const double t = first + k * step;
    if (t > hi + 1e-9 * step || k > 1000) break;
    v.push_back(t);
  }
  return v;
}

std::string Points(const Series& s, const std::function<double(double)>& X, const std::function<double(double)>& Y) {
  std::string pts;
  const std::size_t n = std::min(s.x.size(), s.y.size());
  for (std::size_t k = 0; k < n; ++k) {
    if (!std::isfinite(s.x[k]) || !std::isfinite(s.y[k])) continue;
    pts += fmt::format("{}{:.2f},{:.2f}", pts.empty() ? "" : " ", X(s.x[k]), Y(s.y[k]));
  }
  return pts;
}

}  // namespace

std::string XmlEscape(const std::string& s) {
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

std::string XmlId(const std::string& s) {
  std::string o;
  for (char ch : s) o += (std::isalnum(static_cast<unsigned char>(ch)) || ch == '-' || ch == '_') ? ch : '_';
  return o.empty() ? std::string("series") : o;
}

std::string PaletteColour(std::size_t i) { return kPalette[i % (sizeof(kPalette) / sizeof(kPalette[0]))]; }

std::string DivergingColour(double v, double limit) {
  // Blue (#2166ac) - near white (#f7f7f7) - red (#b2182b), linear in RGB between the three: a diverging scale
  // whose middle means "no load" (common practice for signed quantities).
  double t = (limit > 0.0 && std::isfinite(v)) ? v / limit : 0.0;
  t = std::clamp(t, -1.0, 1.0);
  const double white[3] = {247, 247, 247}, blue[3] = {33, 102, 172}, red[3] = {178, 24, 43};
  const double* end = t < 0.0 ? blue : red;
  const double u = std::abs(t);
  int c[3];
  for (int k = 0; k < 3; ++k) c[k] = static_cast<int>(std::lround(white[k] + (end[k] - white[k]) * u));
  return fmt::format("#{:02x}{:02x}{:02x}", c[0], c[1], c[2]);
}

Ticks NiceTicks(double lo, double hi, int target) {
  Ticks t;
  if (!std::isfinite(lo) || !std::isfinite(hi)) {
    lo = 0.0;
    hi = 1.0;
  }
  if (hi < lo) std::swap(lo, hi);
  if (!(hi - lo > 1e-12 * std::max(std::abs(lo), std::abs(hi)))) {  // one value: widen around it
    const double w = std::abs(lo) > 0.0 ? 0.5 * std::abs(lo) : 0.5;
    lo -= w;
    hi += w;
  }
  const double raw = (hi - lo) / std::max(1, target);
  const double p = std::pow(10.0, std::floor(std::log10(raw)));
  t.step = 10.0 * p;
  for (double m : {1.0, 2.0, 5.0, 10.0})
    if (m * p >= raw * (1.0 - 1e-9)) {
      t.step = m * p;
      break;
    }
  t.lo = std::floor(lo / t.step + 1e-9) * t.step;
  t.hi = std::ceil(hi / t.step - 1e-9) * t.step;
  t.values = TickValues(t.lo, t.hi, t.step);
  return t;
}

std::string FormatTick(double v, double step) {
  const int digits = std::max(0, -static_cast<int>(std::floor(std::log10(step) + 1e-9)));
  if (std::abs(v) < 0.5 * step * 1e-6) v = 0.0;
  std::string s = fmt::format("{:.{}f}", v, digits);
  if (s.find_first_not_of("-0.") == std::string::npos && s[0] == '-') s.erase(0, 1);
  return s;
}

std::vector<std::string> CautionLines() {
  return {"Conceptual-design estimates from linear, inviscid theory; no stall, separation or viscous drag.",
          "Verify by test, and follow the applicable airworthiness rules and licensed engineers."};
}

void WriteChartSvg(const Chart& ch, std::ostream& out) {
  const std::string& P = ch.id_prefix;
  bool legend = false;
  std::size_t longest = ch.colour_bar ? ch.colour_bar->title.size() : 0;
  for (const Series& s : ch.series) {
    legend = legend || !s.label.empty();
    longest = std::max(longest, s.label.size());
  }
  const double W = ch.width;
  double H = ch.height;
  // The legend column is as wide as its longest label (about 0.6 em a character), up to 40 % of the width.
  const double right = (legend || ch.colour_bar)
                           ? std::min(0.4 * W, std::max(150.0, 60.0 + 0.6 * kFont * static_cast<double>(longest)))
                           : 36;
  const double left = 84, top = ch.subtitle.empty() ? 48 : 66;
  const double bottom = 64 + 16.0 * static_cast<double>(ch.footnotes.size());
  const double pw = W - left - right;
  double ph = H - top - bottom;

  Range rx, ry;
  for (const Series& s : ch.series)
    for (std::size_t k = 0; k < std::min(s.x.size(), s.y.size()); ++k)
      if (std::isfinite(s.x[k]) && std::isfinite(s.y[k])) {
        rx.Add(s.x[k]);
        ry.Add(s.y[k]);
      }
  for (const Shape& s : ch.shapes) {
    for (double v : s.x) rx.Add(v);
    for (double v : s.y) ry.Add(v);
  }
  Ticks tx = AxisTicks(ch.x, rx), ty = AxisTicks(ch.y, ry);
  if (ch.equal_scale) {
    // Same step on both axes, then widen the axis with room to spare so that a metre is as long on both.
    const double step = std::max(tx.step, ty.step);
    tx.step = ty.step = step;
    tx.lo = std::floor(rx.empty() ? 0.0 : rx.lo / step) * step;
    tx.hi = std::ceil(rx.empty() ? 1.0 : rx.hi / step) * step;
    ty.lo = std::floor(ry.empty() ? 0.0 : ry.lo / step) * step;
    ty.hi = std::ceil(ry.empty() ? 1.0 : ry.hi / step) * step;
    // A shape wider than the plot area is tall: give back the height it does not need (not below 160 px).
    const double needed = pw * (ty.hi - ty.lo) / (tx.hi - tx.lo);
    if (needed < ph) {
      const double shrink = ph - std::max(needed, std::min(ph, ch.colour_bar ? 260.0 : 160.0));
      ph -= shrink;
      H -= shrink;
    }
    const double scale = std::min(pw / (tx.hi - tx.lo), ph / (ty.hi - ty.lo));
    const double wx = pw / scale - (tx.hi - tx.lo), wy = ph / scale - (ty.hi - ty.lo);
    tx.lo -= 0.5 * wx;
    tx.hi += 0.5 * wx;
    ty.lo -= 0.5 * wy;
    ty.hi += 0.5 * wy;
    tx.values = TickValues(tx.lo, tx.hi, step);
    ty.values = TickValues(ty.lo, ty.hi, step);
  }
  const std::function<double(double)> X = [&](double v) {
    const double f = (v - tx.lo) / (tx.hi - tx.lo);
    return left + (ch.x.reversed ? 1.0 - f : f) * pw;
  };
  const std::function<double(double)> Y = [&](double v) {
    const double f = (v - ty.lo) / (ty.hi - ty.lo);
    return top + (ch.y.reversed ? f : 1.0 - f) * ph;
  };

  if (ch.xml_declaration) out << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  out << fmt::format("<svg{} width=\"{:g}\" height=\"{:g}\" viewBox=\"0 0 {:g} {:g}\" "
                     "font-family=\"DejaVu Sans, Arial, Helvetica, sans-serif\" font-size=\"{:g}\">\n",
                     ch.xml_declaration ? " xmlns=\"http://www.w3.org/2000/svg\"" : "", W, H, W, H, kFont);
  out << fmt::format("<title>{}</title>\n", XmlEscape(ch.title));
  out << fmt::format("<rect x=\"0\" y=\"0\" width=\"{:g}\" height=\"{:g}\" fill=\"white\"/>\n", W, H);
  out << fmt::format("<text x=\"{:g}\" y=\"26\" font-size=\"{:g}\" font-weight=\"bold\">{}</text>\n", left, kTitleFont,
                     XmlEscape(ch.title));
  if (!ch.subtitle.empty())
    out << fmt::format("<text x=\"{:g}\" y=\"47\">{}</text>\n", left, XmlEscape(ch.subtitle));

  // Grid, frame, zero lines.
  out << fmt::format("<g id=\"{}axes\" stroke=\"#bbb\" stroke-width=\"0.6\">\n", P);
  for (double t : tx.values)
    out << fmt::format("<line x1=\"{:.2f}\" y1=\"{:.2f}\" x2=\"{:.2f}\" y2=\"{:.2f}\"/>\n", X(t), top, X(t), top + ph);
  for (double t : ty.values)
    out << fmt::format("<line x1=\"{:.2f}\" y1=\"{:.2f}\" x2=\"{:.2f}\" y2=\"{:.2f}\"/>\n", left, Y(t), left + pw, Y(t));
  out << "</g>\n";
  out << fmt::format("<rect x=\"{:g}\" y=\"{:g}\" width=\"{:g}\" height=\"{:g}\" fill=\"none\" stroke=\"black\"/>\n",
                     left, top, pw, ph);
  if (ty.lo < 0.0 && ty.hi > 0.0)
    out << fmt::format("<line x1=\"{:.2f}\" y1=\"{:.2f}\" x2=\"{:.2f}\" y2=\"{:.2f}\" stroke=\"#555\"/>\n", left, Y(0.0),
                       left + pw, Y(0.0));
  if (tx.lo < 0.0 && tx.hi > 0.0)
    out << fmt::format("<line x1=\"{:.2f}\" y1=\"{:.2f}\" x2=\"{:.2f}\" y2=\"{:.2f}\" stroke=\"#555\"/>\n", X(0.0), top,
                       X(0.0), top + ph);
  out << fmt::format("<g id=\"{}tick-labels\" font-size=\"{:g}\">\n", P, kSmallFont);
  for (double t : tx.values)
    out << fmt::format("<text x=\"{:.2f}\" y=\"{:.2f}\" text-anchor=\"middle\">{}</text>\n", X(t), top + ph + 18,
                       FormatTick(t, tx.step));
  for (double t : ty.values)
    out << fmt::format("<text x=\"{:.2f}\" y=\"{:.2f}\" text-anchor=\"end\">{}</text>\n", left - 6, Y(t) + 4,
                       FormatTick(t, ty.step));
  out << "</g>\n";
  out << fmt::format("<text id=\"{}x-label\" x=\"{:.2f}\" y=\"{:.2f}\" text-anchor=\"middle\">{}</text>\n", P,
                     left + 0.5 * pw, top + ph + 40, XmlEscape(ch.x.title));
  out << fmt::format("<text id=\"{}y-label\" x=\"{:.2f}\" y=\"{:.2f}\" text-anchor=\"middle\" "
                     "transform=\"rotate(-90 {:.2f} {:.2f})\">{}</text>\n",
                     P, left - 56, top + 0.5 * ph, left - 56, top + 0.5 * ph, XmlEscape(ch.y.title));

  // Shapes, clipped to the plot area.
  out << fmt::format("<clipPath id=\"{}plot-area\"><rect x=\"{:g}\" y=\"{:g}\" width=\"{:g}\" height=\"{:g}\"/></clipPath>\n",
                     P, left, top, pw, ph);
  out << fmt::format("<g clip-path=\"url(#{}plot-area)\">\n", P);
  for (const Shape& s : ch.shapes) {
    std::string pts;
    for (std::size_t k = 0; k < std::min(s.x.size(), s.y.size()); ++k)
      if (std::isfinite(s.x[k]) && std::isfinite(s.y[k]))
        pts += fmt::format("{}{:.2f},{:.2f}", pts.empty() ? "" : " ", X(s.x[k]), Y(s.y[k]));
    out << "<polygon";
    if (!s.id.empty()) out << fmt::format(" id=\"{}{}\"", P, XmlId(s.id));
    out << fmt::format(" fill=\"{}\" stroke=\"{}\" stroke-width=\"0.4\" points=\"{}\"", XmlEscape(s.fill),
                       XmlEscape(s.stroke), pts);
    if (s.title.empty())
      out << "/>\n";
    else
      out << fmt::format("><title>{}</title></polygon>\n", XmlEscape(s.title));
  }

  // Series.
  for (std::size_t i = 0; i < ch.series.size(); ++i) {
    const Series& s = ch.series[i];
    const std::string colour = s.colour.empty() ? PaletteColour(i) : XmlEscape(s.colour);
    const std::string id = P + XmlId(s.id);
    const std::string dash = s.dashed ? " stroke-dasharray=\"7 4\"" : "";
    if (s.line)
      out << fmt::format("<polyline id=\"{}\" fill=\"none\" stroke=\"{}\" stroke-width=\"{:g}\"{} "
                         "stroke-linejoin=\"round\" points=\"{}\"/>\n",
                         id, colour, s.stroke_width, dash, Points(s, X, Y));
    if (!s.line || s.markers) {
      out << fmt::format("<g id=\"{}{}\" fill=\"{}\">\n", id, s.line ? "-markers" : "", colour);
      for (std::size_t k = 0; k < std::min(s.x.size(), s.y.size()); ++k)
        if (std::isfinite(s.x[k]) && std::isfinite(s.y[k]))
          out << fmt::format("<circle cx=\"{:.2f}\" cy=\"{:.2f}\" r=\"3.5\"/>\n", X(s.x[k]), Y(s.y[k]));
      out << "</g>\n";
    }
  }
  out << "</g>\n";

  // Legend and colour bar, right of the plot.
  const double lx = left + pw + 16;
  double ly = top + 10;
  if (legend) {
    out << fmt::format("<g id=\"{}legend\">\n", P);
    for (std::size_t i = 0; i < ch.series.size(); ++i) {
      const Series& s = ch.series[i];
      if (s.label.empty()) continue;
      const std::string colour = s.colour.empty() ? PaletteColour(i) : XmlEscape(s.colour);
      if (s.line)
        out << fmt::format("<line x1=\"{:.2f}\" y1=\"{:.2f}\" x2=\"{:.2f}\" y2=\"{:.2f}\" stroke=\"{}\" "
                           "stroke-width=\"{:g}\"{}/>",
                           lx, ly, lx + 28, ly, colour, s.stroke_width, s.dashed ? " stroke-dasharray=\"7 4\"" : "");
      if (!s.line || s.markers)
        out << fmt::format("<circle cx=\"{:.2f}\" cy=\"{:.2f}\" r=\"3.5\" fill=\"{}\"/>", lx + 14, ly, colour);
      out << fmt::format("<text x=\"{:.2f}\" y=\"{:.2f}\">{}</text>\n", lx + 34, ly + 5, XmlEscape(s.label));
      ly += 22;
    }
    out << "</g>\n";
    ly += 10;
  }
  if (ch.colour_bar) {
    const ColourBar& cb = *ch.colour_bar;
    const double bar_top = ly + 22, bar_h = std::max(60.0, std::min(220.0, top + ph - bar_top)), bar_w = 18;
    out << fmt::format("<g id=\"{}colour-bar\">\n", P);
    out << fmt::format("<defs><linearGradient id=\"{}colour-gradient\" x1=\"0\" y1=\"1\" x2=\"0\" y2=\"0\">"
                       "<stop offset=\"0\" stop-color=\"{}\"/><stop offset=\"0.5\" stop-color=\"{}\"/>"
                       "<stop offset=\"1\" stop-color=\"{}\"/></linearGradient></defs>\n",
                       P, DivergingColour(-1.0, 1.0), DivergingColour(0.0, 1.0), DivergingColour(1.0, 1.0));
    out << fmt::format("<text x=\"{:.2f}\" y=\"{:.2f}\">{}</text>\n", lx, ly + 8, XmlEscape(cb.title));
    out << fmt::format("<rect x=\"{:.2f}\" y=\"{:.2f}\" width=\"{:g}\" height=\"{:.2f}\" fill=\"url(#{}colour-gradient)\" "
                       "stroke=\"#555\"/>\n",
                       lx, bar_top, bar_w, bar_h, P);
    const double limit = cb.limit > 0.0 && std::isfinite(cb.limit) ? cb.limit : 1.0;
    const Ticks t = NiceTicks(-limit, limit, 4);
    for (double v : t.values) {
      if (v < -limit * (1 + 1e-9) || v > limit * (1 + 1e-9)) continue;
      const double yy = bar_top + (1.0 - (v + limit) / (2.0 * limit)) * bar_h;
      out << fmt::format("<line x1=\"{:.2f}\" y1=\"{:.2f}\" x2=\"{:.2f}\" y2=\"{:.2f}\" stroke=\"#555\"/>"
                         "<text x=\"{:.2f}\" y=\"{:.2f}\" font-size=\"{:g}\">{}</text>\n",
                         lx + bar_w, yy, lx + bar_w + 5, yy, lx + bar_w + 8, yy + 4, kSmallFont, FormatTick(v, t.step));
    }
    out << "</g>\n";
  }

  if (!ch.footnotes.empty()) {
    const double fy = H - 16.0 * static_cast<double>(ch.footnotes.size()) - 6;
    out << fmt::format("<text id=\"{}cautions\" x=\"{:g}\" y=\"{:g}\" font-size=\"{:g}\" fill=\"#333\">", P, left, fy,
                       kSmallFont);
    for (std::size_t k = 0; k < ch.footnotes.size(); ++k)
      out << fmt::format("<tspan x=\"{:g}\" dy=\"{}\">{}</tspan>", left, k == 0 ? 0 : 16, XmlEscape(ch.footnotes[k]));
    out << "</text>\n";
  }
  out << "</svg>\n";
}

}  // namespace skein::report::plot
