// Skein report: a small, generic SVG chart writer (line and scatter charts, filled shapes with a colour scale).
// The plot writers of svg.hpp, and any other reporter that draws a chart, build a Chart and hand it here.
//
//   skein::report::plot::Chart ch;
//   ch.title = "Lift curve";
//   ch.x.title = "angle of attack alpha (deg)";
//   ch.y.title = "lift coefficient CL (-)";
//   ch.series.push_back({"cl-alpha", "CL", {0, 2, 4}, {0.0, 0.18, 0.36}});
//   ch.series.back().markers = true;
//   ch.footnotes = skein::report::plot::CautionLines();
//   skein::report::plot::WriteChartSvg(ch, out);
//
// Contract of the output (tests rely on it): a standalone SVG 1.1 document (XML declaration first unless
// Chart::xml_declaration is false), well-formed XML. Every series with a line is one <polyline> whose id is the
// series id; its markers, when asked for, are circles in a <g> with id "<id>-markers"; a series without a line
// (scatter) is a <g> with the series id holding one <circle> per point. Each shape is a <polygon> with its id
// (or none when the id is empty). Points whose x or y is not finite are left out, so a NaN never reaches the
// file. Fixed ids: "axes", "tick-labels", "x-label", "y-label", "legend", "colour-bar", "cautions" (each with
// Chart::id_prefix in front, so that several charts can live in one HTML page with unique ids).
#pragma once

#include <iosfwd>
#include <optional>
#include <string>
#include <vector>

namespace skein::report::plot {

/// One named series of (x, y) points, drawn in the order given.
struct Series {
  std::string id;            ///< stable id of its element (made XML-safe: other characters become '_')
  std::string label;         ///< legend text; "" leaves the series out of the legend
  std::vector<double> x, y;  ///< same length; non-finite pairs are skipped
  bool dashed = false;       ///< dashed line (a reference curve, say)
  bool line = true;          ///< false: markers only (a scatter series)
  bool markers = false;      ///< a circle at every point (always on when `line` is false)
  std::string colour;        ///< CSS colour; "" takes the palette colour of the series' index
  double stroke_width = 2.0;  ///< px
};

/// A filled polygon in data coordinates (a panel of a planform, say), drawn under the series.
struct Shape {
  std::string id;            ///< "" for none
  std::vector<double> x, y;  ///< corners in order
  std::string fill;          ///< CSS colour
  std::string stroke = "#555";
  std::string title;         ///< tooltip text (<title> child), "" for none
};

/// A colour scale beside the plot, for shapes filled with DivergingColour(value, limit).
struct ColourBar {
  std::string title;   ///< with units, e.g. "load dCp (-)"
  double limit = 1.0;  ///< the bar runs from -limit to +limit
};

struct Axis {
  std::string title;            ///< with units in parentheses, e.g. "spanwise station y (m)"
  std::optional<double> min, max;  ///< fixed ends; otherwise from the data, rounded out to a tick
  bool include_zero = false;    ///< widen the data range to contain 0
  double headroom = 0.0;        ///< fraction of the largest value added above it before rounding (legend room)
  int ticks = 6;                ///< about this many tick intervals
  bool reversed = false;        ///< values grow downward (y) or leftward (x): x aft drawn down in a top view
};

struct Chart {
  std::string title;                   ///< bold, top left
  std::string subtitle;                ///< one line under the title (the flight condition, say)
  Axis x, y;
  std::vector<Series> series;
  std::vector<Shape> shapes;
  std::optional<ColourBar> colour_bar;
  bool equal_scale = false;            ///< one metre is as long on both axes (a top view)
  std::vector<std::string> footnotes;  ///< lines under the plot, e.g. CautionLines()
  double width = 860, height = 540;    ///< px (the viewBox); fonts are sized to stay legible printed at A4 width
  std::string id_prefix;               ///< put before every id in the chart
  /// false for an SVG embedded in HTML: no XML declaration and no xmlns attribute (an HTML parser puts <svg>
  /// in the SVG namespace itself, and the page then names no URL at all).
  bool xml_declaration = true;
};

/// Writes the chart as SVG. Library code: never prints elsewhere.
void WriteChartSvg(const Chart& chart, std::ostream& out);

/// The project's cautions, as two lines for a plot's footnote.
std::vector<std::string> CautionLines();

// Helpers shared by the plot writers.

/// Ticks of an axis: a step of 1, 2 or 5 times a power of ten giving about `target` intervals, and the data
/// range [lo, hi] rounded out to whole steps. A degenerate range is widened around its value.
struct Ticks {
  double lo = 0.0, hi = 1.0, step = 0.2;
  std::vector<double> values;  ///< lo, lo + step, ..., hi
};
Ticks NiceTicks(double lo, double hi, int target);
/// A tick label with as many decimals as the step needs ("0.25", "10", "-0.5"); never "-0".
std::string FormatTick(double value, double step);
/// Text and attribute escaping for XML (& < > " ').
std::string XmlEscape(const std::string& s);
/// An XML-safe id: letters, digits, '-' and '_' kept, anything else '_'; "" becomes "series".
std::string XmlId(const std::string& s);
/// Palette colour i (cycled): six hues that stay apart in print and for the common colour-vision deficiencies.
std::string PaletteColour(std::size_t i);
/// A blue-white-red colour for value v on a scale symmetric about 0: white at 0, full blue at -limit, full red
/// at +limit (clamped), as "#rrggbb".
std::string DivergingColour(double v, double limit);

}  // namespace skein::report::plot
