// Tests for report/html.hpp: the page is one self-contained document (no URL, script, stylesheet link or font
// from elsewhere), holds every plot as well-formed inline SVG with ids unique in the page, the tables, the
// case text as read, the mesh-convergence table when given, and the cautions; a point that was not solved
// shows its error and never a NaN. Sources: "common practice" (HTML5 inline SVG; a self-contained review page).
#include "skein/report/html.hpp"

#include <cctype>
#include <limits>
#include <regex>
#include <set>
#include <sstream>
#include <string>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "../support/xml_check.hpp"
#include "skein/report/svg.hpp"
#include "skein/run.hpp"
#include "skein/study.hpp"

namespace skein {
namespace {

std::size_t Count(const std::string& s, const std::string& part) {
  std::size_t n = 0;
  for (std::size_t at = s.find(part); at != std::string::npos; at = s.find(part, at + 1)) ++n;
  return n;
}

struct Page {
  std::vector<report::NamedChart> plots;
  std::string html;
};

Page Report() {
  const Case c = testing::WingCase(testing::TaperedWing(8.0, 1.2, 0.45, 10.0, testing::Mesh(2, 6)), {0.0, 4.0, 8.0});
  Results r = skein::Run(c, {});
  PointResult lost;
  lost.alpha_deg = 6.0;
  lost.error = "wake <met> a control point";
  lost.CL = lost.CD_induced = std::numeric_limits<double>::quiet_NaN();
  r.points.push_back(lost);
  Case one = c;
  one.flight.alpha_deg = {4.0};
  const study::ConvergenceStudy conv = study::MeshConvergence(one, {});
  Page p;
  p.plots = report::ResultPlots(r, BuildLattice(c));
  report::HtmlReport h;
  h.results = &r;
  h.case_path = "wing.toml";
  h.case_text = "title = \"a <wing> & its tail\"\n[flight]\nalpha = [0.0, 4.0, 8.0]\n";
  h.convergence = &conv;
  h.plots = p.plots;
  std::ostringstream out;
  report::WriteHtmlReport(h, out);
  p.html = out.str();
  return p;
}

TEST(HtmlReport, IsSelfContained) {
  const Page p = Report();
  EXPECT_EQ(p.html.rfind("<!DOCTYPE html>", 0), 0u);
  EXPECT_NE(p.html.find("</html>"), std::string::npos);
  for (const char* banned : {"http://", "https://", "<script", "<link", "@import", "src=", "href="})
    EXPECT_EQ(p.html.find(banned), std::string::npos) << banned;
  for (std::size_t at = p.html.find("url("); at != std::string::npos; at = p.html.find("url(", at + 1))
    EXPECT_EQ(p.html[at + 4], '#') << "only references inside the page";
}

TEST(HtmlReport, HoldsEveryPlotAsWellFormedSvgWithUniqueIds) {
  const Page p = Report();
  ASSERT_EQ(p.plots.size(), 5u);
  const std::vector<std::string> svgs = testing::SvgFragments(p.html);
  ASSERT_EQ(svgs.size(), p.plots.size());
  std::set<std::string> ids;
  for (std::size_t k = 0; k < svgs.size(); ++k) {
    std::vector<testing::Element> el;
    ASSERT_EQ(testing::CheckXml(svgs[k], el), "") << p.plots[k].file;
    for (const auto& e : el)
      if (e.attributes.count("id")) {
        EXPECT_TRUE(ids.insert(e.attributes.at("id")).second) << e.attributes.at("id");
      }
  }
  const std::string stem[] = {"span_loading", "local_cl", "planform_load", "lift_curve", "drag_polar"};
  for (const std::string& s : stem) {
    EXPECT_EQ(Count(p.html, "<figure id=\"plot-" + s + "\">"), 1u) << s;
    EXPECT_TRUE(ids.count(s + "-cautions")) << s;
  }
  EXPECT_TRUE(ids.count("span_loading-loading-wing"));
  EXPECT_TRUE(ids.count("span_loading-elliptic-wing"));
  EXPECT_TRUE(ids.count("lift_curve-lift-curve-0"));
}

TEST(HtmlReport, HoldsTheTablesTheCaseAndTheCautionsAndNoNaN) {
  const Page p = Report();
  for (const char* section : {"id=\"case\"", "id=\"points\"", "id=\"surfaces\"", "id=\"derivatives\"",
                              "id=\"convergence\"", "id=\"warnings\"", "id=\"summary\"", "id=\"case-text\""})
    EXPECT_NE(p.html.find(section), std::string::npos) << section;
  EXPECT_EQ(Count(p.html, "class=\"caution\""), 2u);  // top and bottom
  EXPECT_NE(p.html.find("linear, inviscid"), std::string::npos);
  EXPECT_NE(p.html.find("airworthiness rules and licensed engineers"), std::string::npos);
  EXPECT_NE(p.html.find("title = &quot;a &lt;wing&gt; &amp; its tail&quot;"), std::string::npos);  // echoed, escaped
  EXPECT_NE(p.html.find("not solved: wake &lt;met&gt; a control point"), std::string::npos);
  EXPECT_NE(p.html.find("<th>extrapolated</th>"), std::string::npos);  // the convergence table
  const std::regex not_a_number("\\b(nan|NaN|NAN|inf|Inf)\\b");
  EXPECT_FALSE(std::regex_search(p.html, not_a_number));
  // Four flight points: three solved rows and the lost one.
  EXPECT_EQ(Count(p.html, "<td class=\"l\">solved</td>"), 3u);
  EXPECT_EQ(Count(p.html, "<tr class=\"failed\">"), 1u);
}

}  // namespace
}  // namespace skein
