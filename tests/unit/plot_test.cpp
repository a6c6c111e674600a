// Tests for report/plot.hpp, the generic SVG chart writer: the document is well-formed XML, every series is the
// element its contract names with one point pair or circle per finite point, ids are stable and prefixed, ticks
// are 1-2-5 steps, an equal-scale chart draws a metre as long across as down, and the colour scale's ends and
// middle are where it says. Sources: "common practice" for chart layout (1-2-5 tick steps, a diverging colour
// scale white at zero); the SVG 1.1 element names are W3C's (Scalable Vector Graphics 1.1, 2nd ed., 2011).
#include "skein/report/plot.hpp"

#include <cmath>
#include <limits>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "../support/xml_check.hpp"

namespace skein::report::plot {
namespace {

using skein::testing::ById;
using skein::testing::CheckXml;
using skein::testing::CountPointPairs;
using skein::testing::Element;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

std::string Svg(const Chart& ch) {
  std::ostringstream out;
  WriteChartSvg(ch, out);
  return out.str();
}

Chart TwoSeries() {
  Chart ch;
  ch.title = "Lift & drag <test>";
  ch.subtitle = "alpha sweep";
  ch.x.title = "angle of attack alpha (deg)";
  ch.y.title = "lift coefficient CL (-)";
  Series a;
  a.id = "cl alpha";  // the space must become '_'
  a.label = "CL";
  a.x = {0.0, 2.0, 4.0, 6.0, 8.0};
  a.y = {0.0, 0.2, kNaN, 0.6, 0.8};  // a lost point: left out
  a.markers = true;
  Series b;
  b.id = "reference";
  b.label = "reference, dashed";
  b.x = {0.0, 8.0};
  b.y = {0.0, 0.88};
  b.dashed = true;
  Series c;
  c.id = "measured";
  c.label = "scatter";
  c.line = false;
  c.x = {1.0, 3.0, 5.0};
  c.y = {0.1, 0.3, 0.5};
  ch.series = {a, b, c};
  ch.footnotes = CautionLines();
  return ch;
}

TEST(Chart, IsWellFormedWithOneElementPerSeriesAndTheFinitePointsOnly) {
  const std::string svg = Svg(TwoSeries());
  std::vector<Element> el;
  ASSERT_EQ(CheckXml(svg, el), "");
  EXPECT_EQ(el.front().name, "svg");
  EXPECT_EQ(el.front().attributes.at("xmlns"), "http://www.w3.org/2000/svg");
  auto id = ById(el);
  ASSERT_TRUE(id.count("cl_alpha"));
  EXPECT_EQ(id["cl_alpha"]->name, "polyline");
  EXPECT_EQ(CountPointPairs(id["cl_alpha"]->attributes.at("points")), 4);  // five given, one NaN
  ASSERT_TRUE(id.count("cl_alpha-markers"));
  ASSERT_TRUE(id.count("reference"));
  EXPECT_EQ(id["reference"]->attributes.at("stroke-dasharray"), "7 4");
  EXPECT_EQ(id["cl_alpha"]->attributes.count("stroke-dasharray"), 0u);
  ASSERT_TRUE(id.count("measured"));
  EXPECT_EQ(id["measured"]->name, "g");
  // Circles: 4 markers of the first series, 3 of the scatter, one in each of the two marker legend entries.
  std::size_t circles = 0;
  for (const Element& e : el) circles += e.name == "circle" ? 1u : 0u;
  EXPECT_EQ(circles, 4u + 3u + 2u);
  for (const char* fixed : {"axes", "tick-labels", "x-label", "y-label", "legend", "cautions"})
    EXPECT_TRUE(id.count(fixed)) << fixed;
  EXPECT_EQ(id["x-label"]->text, "angle of attack alpha (deg)");
  EXPECT_NE(svg.find("Lift &amp; drag &lt;test&gt;"), std::string::npos);
  EXPECT_NE(svg.find("airworthiness rules"), std::string::npos);
  EXPECT_EQ(svg.find("nan"), std::string::npos);
  EXPECT_EQ(svg.find("inf"), std::string::npos);
}

TEST(Chart, PrefixesEveryIdAndLeavesOutTheDeclarationWhenEmbedded) {
  Chart ch = TwoSeries();
  ch.id_prefix = "lift-";
  ch.xml_declaration = false;
  const std::string svg = Svg(ch);
  EXPECT_EQ(svg.rfind("<svg", 0), 0u);
  EXPECT_EQ(svg.find("http"), std::string::npos);  // no xmlns either: the HTML parser supplies the namespace
  std::vector<Element> el;
  ASSERT_EQ(CheckXml(svg, el), "");
  for (const Element& e : el)
    if (e.attributes.count("id")) {
      EXPECT_EQ(e.attributes.at("id").rfind("lift-", 0), 0u) << e.attributes.at("id");
    }
  EXPECT_TRUE(ById(el).count("lift-cl_alpha"));
}

TEST(Ticks, AreOneTwoOrFiveTimesAPowerOfTenAndCoverTheData) {
  // Common practice: tick steps of 1, 2 or 5 x 10^k, ends rounded out to whole steps.
  const Ticks a = NiceTicks(0.0, 0.93, 6);
  EXPECT_DOUBLE_EQ(a.step, 0.2);
  EXPECT_DOUBLE_EQ(a.lo, 0.0);
  EXPECT_DOUBLE_EQ(a.hi, 1.0);
  EXPECT_EQ(a.values.size(), 6u);
  const Ticks b = NiceTicks(-3.7, 12.2, 8);
  EXPECT_DOUBLE_EQ(b.step, 2.0);
  EXPECT_DOUBLE_EQ(b.lo, -4.0);
  EXPECT_DOUBLE_EQ(b.hi, 14.0);
  const Ticks c = NiceTicks(0.0012, 0.0138, 6);  // raw step 0.0021: the next 1-2-5 value is 0.005
  EXPECT_DOUBLE_EQ(c.step, 0.005);
  EXPECT_DOUBLE_EQ(c.hi, 0.015);
  const Ticks d = NiceTicks(5.0, 5.0, 6);  // one value: widened around it
  EXPECT_LT(d.lo, 5.0);
  EXPECT_GT(d.hi, 5.0);
  EXPECT_EQ(FormatTick(0.4, 0.2), "0.4");
  EXPECT_EQ(FormatTick(-1e-17, 0.2), "0.0");
  EXPECT_EQ(FormatTick(-0.004, 0.1), "0.0");  // never "-0.0"
  EXPECT_EQ(FormatTick(10.0, 5.0), "10");
  EXPECT_EQ(FormatTick(0.015, 0.005), "0.015");
}

TEST(Chart, EqualScaleDrawsAMetreAsLongAcrossAsDown) {
  Chart ch;
  ch.equal_scale = true;
  ch.y.reversed = true;
  Shape sq;
  sq.id = "square";
  sq.x = {0.0, 1.0, 1.0, 0.0};
  sq.y = {0.0, 0.0, 1.0, 1.0};
  sq.fill = "#ff0000";
  Shape wide;
  wide.id = "wide";
  wide.x = {-4.0, 4.0, 4.0, -4.0};
  wide.y = {2.0, 2.0, 2.5, 2.5};
  wide.fill = "#00ff00";
  ch.shapes = {sq, wide};
  const std::string svg = Svg(ch);
  std::vector<Element> el;
  ASSERT_EQ(CheckXml(svg, el), "");
  auto id = ById(el);
  ASSERT_TRUE(id.count("square"));
  std::istringstream pts(id["square"]->attributes.at("points"));
  double x[4], y[4];
  char comma = 0;
  for (int k = 0; k < 4; ++k) pts >> x[k] >> comma >> y[k];
  const double across = x[1] - x[0], down = y[2] - y[1];
  EXPECT_GT(across, 10.0);
  EXPECT_NEAR(down, across, 0.02);  // two-decimal coordinates
  EXPECT_GT(y[2], y[0]);            // reversed: larger x drawn lower
}

TEST(DivergingColour, IsWhiteAtZeroAndFullAtTheLimitsClamped) {
  EXPECT_EQ(DivergingColour(0.0, 2.0), "#f7f7f7");
  EXPECT_EQ(DivergingColour(2.0, 2.0), "#b2182b");
  EXPECT_EQ(DivergingColour(-2.0, 2.0), "#2166ac");
  EXPECT_EQ(DivergingColour(5.0, 2.0), "#b2182b");
  EXPECT_EQ(DivergingColour(kNaN, 2.0), "#f7f7f7");
  EXPECT_EQ(DivergingColour(1.0, 2.0), "#d58891");  // half way, each channel rounded: (247+178)/2, ...
}

TEST(Chart, ColourBarHasItsTitleAndGradient) {
  Chart ch;
  Shape s;
  s.x = {0.0, 1.0, 1.0};
  s.y = {0.0, 0.0, 1.0};
  s.fill = DivergingColour(0.3, 0.6);
  ch.shapes = {s};
  ch.colour_bar = ColourBar{"load dCp (-)", 0.6};
  const std::string svg = Svg(ch);
  std::vector<Element> el;
  ASSERT_EQ(CheckXml(svg, el), "");
  auto id = ById(el);
  EXPECT_TRUE(id.count("colour-bar"));
  EXPECT_TRUE(id.count("colour-gradient"));
  EXPECT_NE(svg.find("load dCp (-)"), std::string::npos);
}

}  // namespace
}  // namespace skein::report::plot
