// Tests for report/svg.hpp and study::SpanLoadingWithElliptic: the plot is well-formed XML and holds the
// expected series; the elliptic reference carries the surface's lift.
#include "skein/report/svg.hpp"

#include <cctype>
#include <algorithm>
#include <cmath>
#include <limits>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "../support/xml_check.hpp"
#include "skein/run.hpp"
#include "skein/study.hpp"

namespace skein {
namespace {

using testing::CheckXml;
using testing::Element;

TEST(XmlCheck, RejectsWhatIsNotWellFormed) {
  std::vector<Element> e;
  EXPECT_EQ(CheckXml("<a><b x=\"1\"/>t</a>", e), "");
  for (const char* bad : {"<a><b></a></b>", "<a x=1/>", "<a>&nbsp;</a>", "<a/><b/>", "<a x=\"1\" x=\"2\"/>", "<a>",
                          "<a>1 < 2</a>"}) {
    e.clear();
    EXPECT_NE(CheckXml(bad, e), "") << bad;
  }
}

struct Plotted {
  Case c;
  PointResult point;
  std::vector<study::SpanLoadingSeries> series;
  std::string svg;
};

Plotted Plot() {
  Plotted p;
  p.c = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.45, 10.0, testing::Mesh(4, 24)), {5.0});
  p.c.title = "Test wing <tapered> & \"swept\"";  // characters that must be escaped
  p.point = skein::Run(p.c, {}).points.front();
  p.series = study::SpanLoadingWithElliptic(BuildLattice(p.c), p.point, p.c.reference);
  report::SpanLoadingPlot plot;
  plot.title = p.c.title;
  plot.alpha_deg = p.point.alpha_deg;
  plot.CL = p.point.CL;
  plot.series = p.series;
  std::ostringstream out;
  report::WriteSpanLoadingSvg(plot, out);
  p.svg = out.str();
  return p;
}

std::size_t CountPoints(const std::string& points) {
  std::istringstream in(points);
  std::string pair;
  std::size_t n = 0;
  while (in >> pair) {
    EXPECT_NE(pair.find(','), std::string::npos);
    ++n;
  }
  return n;
}

TEST(SpanLoadingSvg, IsWellFormedAndHoldsTheExpectedSeries) {
  const Plotted p = Plot();
  std::vector<Element> elements;
  ASSERT_EQ(CheckXml(p.svg, elements), "");
  ASSERT_FALSE(elements.empty());
  EXPECT_EQ(elements.front().name, "svg");
  EXPECT_EQ(elements.front().attributes.at("xmlns"), "http://www.w3.org/2000/svg");
  std::map<std::string, const Element*> by_id;
  for (const Element& e : elements)
    if (e.attributes.count("id")) by_id[e.attributes.at("id")] = &e;
  ASSERT_TRUE(by_id.count("loading-wing"));
  ASSERT_TRUE(by_id.count("elliptic-wing"));
  EXPECT_EQ(by_id["loading-wing"]->name, "polyline");
  EXPECT_EQ(CountPoints(by_id["loading-wing"]->attributes.at("points")), p.point.surfaces[0].strips.y.size());
  EXPECT_EQ(CountPoints(by_id["elliptic-wing"]->attributes.at("points")), 201u);
  ASSERT_TRUE(by_id.count("x-label"));
  ASSERT_TRUE(by_id.count("y-label"));
  EXPECT_NE(by_id["x-label"]->text.find("(m)"), std::string::npos);
  EXPECT_NE(by_id["y-label"]->text.find("cl c / c_ref"), std::string::npos);
  EXPECT_NE(p.svg.find("elliptic, same lift"), std::string::npos);  // the legend
  EXPECT_NE(p.svg.find("Test wing &lt;tapered&gt; &amp; &quot;swept&quot;"), std::string::npos);
  ASSERT_TRUE(by_id.count("cautions"));
  EXPECT_NE(p.svg.find("linear, inviscid theory"), std::string::npos);
}

TEST(SpanLoadingSvg, EllipticReferenceCarriesTheSurfaceLift) {
  // The area under cl c / c_ref across the span is the surface's lift S_ref CL_s / c_ref (definition of the
  // span loading); the elliptic reference must have the same area, and so must the computed loading.
  const Plotted p = Plot();
  ASSERT_EQ(p.series.size(), 1u);
  const auto& s = p.series[0];
  const double lift_area = p.c.reference.area * s.CL / p.c.reference.chord;
  EXPECT_NEAR(s.amplitude * 3.14159265358979323846 * s.span / 4.0, lift_area, 1e-12 * lift_area);  // exact
  double loading = 0.0, elliptic = 0.0;
  for (std::size_t k = 0; k < s.y.size(); ++k) {
    loading += s.loading[k] * s.width[k];
    elliptic += s.elliptic[k] * s.width[k];
  }
  // Midpoint sums over 48 cosine-spaced strips: the sampled ellipse to 0.5 %.
  EXPECT_NEAR(elliptic, lift_area, 5e-3 * lift_area);
  // The strip loads are normal-force coefficients; the lift is their component across the stream, cos(alpha)
  // at 5 deg, and the induced part of the near-field forces adds a little: agree to 1 %.
  EXPECT_NEAR(loading, lift_area, 1e-2 * lift_area);
  EXPECT_NEAR(s.span, 8.0, 1e-12);
  EXPECT_NEAR(s.centre, 0.0, 1e-12);
}

// ---------------------------------------------------------------------------------------------------------
// The design-review set (ResultPlots) and the comparison overlay

constexpr double kPi = 3.14159265358979323846;

struct Swept {
  Case c;
  Lattice lat;
  Results r;
};

/// A tapered wing (our own invention) over alpha 2, 5, 8 deg with a lost point inserted between 5 and 8 deg: its
/// values are NaN, as a point that was never solved would have them if anything read them.
Swept SweepWithALostPoint() {
  Swept s;
  s.c = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.45, 10.0, testing::Mesh(4, 12)), {2.0, 5.0, 8.0});
  s.lat = BuildLattice(s.c);
  s.r = skein::Run(s.c, {});
  PointResult lost;
  lost.alpha_deg = 6.5;
  lost.error = "test: this point was not solved";
  lost.CL = lost.CD_induced = lost.Cm = std::numeric_limits<double>::quiet_NaN();
  s.r.points.insert(s.r.points.begin() + 2, lost);
  return s;
}

const report::plot::Series* FindSeries(const report::plot::Chart& ch, const std::string& id) {
  for (const auto& s : ch.series)
    if (s.id == id) return &s;
  return nullptr;
}

std::string Draw(const report::plot::Chart& ch) {
  std::ostringstream out;
  report::plot::WriteChartSvg(ch, out);
  return out.str();
}

TEST(ResultPlots, MakesTheFixedSetWithSolvedPointsOnly) {
  const Swept s = SweepWithALostPoint();
  const std::vector<report::NamedChart> plots = report::ResultPlots(s.r, s.lat);
  std::vector<std::string> files;
  for (const auto& p : plots) files.push_back(p.file);
  EXPECT_EQ(files, (std::vector<std::string>{"span_loading.svg", "local_cl.svg", "planform_load.svg",
                                             "lift_curve.svg", "drag_polar.svg"}));
  for (const auto& p : plots) {
    const std::string svg = Draw(p.chart);
    std::vector<Element> el;
    EXPECT_EQ(CheckXml(svg, el), "") << p.file;
    EXPECT_EQ(svg.find("nan"), std::string::npos) << p.file;
    EXPECT_NE(svg.find("linear, inviscid theory"), std::string::npos) << p.file;  // the cautions
    const auto id = testing::ById(el);
    EXPECT_TRUE(id.count("x-label") && id.count("y-label")) << p.file;
    EXPECT_NE(id.at("x-label")->text.find("("), std::string::npos) << p.file << ": the x axis has no unit";
    EXPECT_NE(id.at("y-label")->text.find("("), std::string::npos) << p.file << ": the y axis has no unit";
  }
  // Lift curve: the three solved points, in sweep order, values as computed.
  const auto* lift = FindSeries(plots[3].chart, "lift-curve-0");
  ASSERT_NE(lift, nullptr);
  EXPECT_EQ(lift->x, (std::vector<double>{2.0, 5.0, 8.0}));
  EXPECT_EQ(lift->y, (std::vector<double>{s.r.points[0].CL, s.r.points[1].CL, s.r.points[3].CL}));
  std::vector<Element> el;
  ASSERT_EQ(CheckXml(Draw(plots[3].chart), el), "");
  EXPECT_EQ(testing::CountPointPairs(testing::ById(el).at("lift-curve-0")->attributes.at("points")), 3);
  // Drag polar: the elliptic-loading reference is CD_induced = CL^2 / (pi A), A = b^2 / S (L. Prandtl,
  // "Tragflügeltheorie. I. Mitteilung", 1918).
  const auto* polar = FindSeries(plots[4].chart, "polar-0");
  ASSERT_NE(polar, nullptr);
  EXPECT_EQ(polar->y.size(), 3u);
  const auto* ell = FindSeries(plots[4].chart, "elliptic-polar");
  ASSERT_NE(ell, nullptr);
  ASSERT_EQ(ell->x.size(), 101u);
  const double A = s.c.reference.span * s.c.reference.span / s.c.reference.area;
  for (std::size_t k = 0; k < ell->x.size(); ++k)
    EXPECT_NEAR(ell->y[k], ell->x[k] * ell->x[k] / (kPi * A), 1e-15);
  EXPECT_DOUBLE_EQ(ell->x.front(), s.r.points[0].CL);
  EXPECT_DOUBLE_EQ(ell->x.back(), s.r.points[3].CL);
  for (std::size_t k = 0; k < polar->x.size(); ++k) EXPECT_EQ(polar->y[k], s.r.points[k < 2 ? k : k + 1].CD_induced);
  EXPECT_NE(plots[3].chart.subtitle.find("1 not solved"), std::string::npos);
}

TEST(ResultPlots, LocalClAndPlanformShowTheFirstSolvedPoint) {
  const Swept s = SweepWithALostPoint();
  const std::vector<report::NamedChart> plots = report::ResultPlots(s.r, s.lat);
  const PointResult& p = s.r.points[0];
  const auto* cl = FindSeries(plots[1].chart, "cl-wing");
  ASSERT_NE(cl, nullptr);
  EXPECT_EQ(cl->x, p.surfaces[0].strips.y);
  EXPECT_EQ(cl->y, p.surfaces[0].strips.cl);
  const auto* ref = FindSeries(plots[1].chart, "configuration-CL");
  ASSERT_NE(ref, nullptr);
  EXPECT_EQ(ref->y, (std::vector<double>{p.CL, p.CL}));

  const report::plot::Chart& top = plots[2].chart;
  ASSERT_EQ(top.shapes.size(), s.lat.panels());
  ASSERT_TRUE(top.colour_bar.has_value());
  double limit = 0.0;
  for (double v : p.surfaces[0].panel_delta_cp) limit = std::max(limit, std::abs(v));
  ASSERT_GT(limit, 0.0);  // a loaded wing: the scale runs to its largest |Delta Cp|
  EXPECT_DOUBLE_EQ(top.colour_bar->limit, limit);
  for (std::size_t k = 0; k < top.shapes.size(); ++k) {
    EXPECT_EQ(top.shapes[k].id, "panel-wing-" + std::to_string(k));
    EXPECT_EQ(top.shapes[k].fill, report::plot::DivergingColour(p.surfaces[0].panel_delta_cp[k], limit));
    EXPECT_DOUBLE_EQ(top.shapes[k].x[0], s.lat.corner_le_a.y[k]);  // top view: y across, x down
    EXPECT_DOUBLE_EQ(top.shapes[k].y[0], s.lat.corner_le_a.x[k]);
  }
  std::vector<Element> el;
  ASSERT_EQ(CheckXml(Draw(top), el), "");
  std::size_t polygons = 0;
  for (const Element& e : el) polygons += e.name == "polygon" ? 1u : 0u;
  EXPECT_EQ(polygons, s.lat.panels());
  EXPECT_TRUE(testing::ById(el).count("colour-bar"));
}

TEST(ResultPlots, OnePointGivesNoSweepPlots) {
  const Case c = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.45, 10.0, testing::Mesh(4, 12)), {4.0});
  const std::vector<report::NamedChart> plots = report::ResultPlots(skein::Run(c, {}), BuildLattice(c));
  ASSERT_EQ(plots.size(), 3u);
  EXPECT_EQ(plots.back().file, "planform_load.svg");
}

TEST(ComparisonChart, OverlaysEveryCaseSpanLoading) {
  const Case a = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.45, 10.0, testing::Mesh(4, 12)), {4.0});
  const Case b = testing::WingCase(testing::RectangularWing(8.0, 0.9, testing::Mesh(4, 10)), {4.0});
  study::CompareOptions o;
  o.target_CL = 0.4;
  const study::Comparison cmp = study::CompareCases({a, b}, o);
  ASSERT_EQ(cmp.entries.size(), 2u);
  std::vector<Element> el;
  const std::string svg = Draw(report::ComparisonSpanLoadingChart(cmp));
  ASSERT_EQ(CheckXml(svg, el), "");
  const auto id = testing::ById(el);
  ASSERT_TRUE(id.count("loading-1-wing"));
  ASSERT_TRUE(id.count("loading-2-wing"));
  EXPECT_EQ(testing::CountPointPairs(id.at("loading-1-wing")->attributes.at("points")),
            static_cast<long>(cmp.entries[0].span_loading[0].y.size()));
  EXPECT_EQ(testing::CountPointPairs(id.at("loading-2-wing")->attributes.at("points")), 20);  // 10 strips a half
  // Each overlaid loading carries the common lift: its area is S_ref CL / c_ref (definition of cl c / c_ref).
  for (const auto& e : cmp.entries) {
    const auto& sl = e.span_loading[0];
    double area = 0.0;
    for (std::size_t k = 0; k < sl.y.size(); ++k) area += sl.loading[k] * sl.width[k];
    const Case& c = &e == &cmp.entries[0] ? a : b;
    const double lift_area = c.reference.area * 0.4 / c.reference.chord;
    EXPECT_NEAR(area, lift_area, 1e-2 * lift_area);  // strip normal force vs lift: cos(alpha), as above
  }
  EXPECT_NE(svg.find("at CL 0.4000"), std::string::npos);
}

}  // namespace
}  // namespace skein
