// Tests for report/svg.hpp and study::SpanLoadingWithElliptic: the plot is well-formed XML and holds the
// expected series; the elliptic reference carries the surface's lift.
#include "skein/report/svg.hpp"

#include <cctype>
#include <cmath>
#include <map>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/run.hpp"
#include "skein/study.hpp"

namespace skein {
namespace {

/// A small XML well-formedness check (XML 1.0, the subset an SVG writer uses): one root element, every start
/// tag closed in order, attribute values quoted, no attribute twice, only the five predefined entities or
/// numeric references, no '<' in text. Returns "" when well formed, else what is wrong. Elements met are
/// reported through `visit` (name and attributes).
struct Element {
  std::string name;
  std::map<std::string, std::string> attributes;
  std::string text;  ///< character data directly inside (for <text>-like elements)
};

std::string CheckXml(const std::string& doc, std::vector<Element>& elements) {
  std::vector<std::size_t> open;  // indices into elements
  std::size_t i = 0, roots = 0;
  auto is_name = [](char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '-' || c == '_' || c == ':' || c == '.'; };
  auto check_entities = [](const std::string& s) -> bool {
    for (std::size_t k = 0; k < s.size(); ++k) {
      if (s[k] == '<') return false;
      if (s[k] != '&') continue;
      const std::size_t e = s.find(';', k);
      if (e == std::string::npos) return false;
      const std::string ent = s.substr(k + 1, e - k - 1);
      if (!(ent == "amp" || ent == "lt" || ent == "gt" || ent == "quot" || ent == "apos" ||
            (ent.size() > 1 && ent[0] == '#')))
        return false;
    }
    return true;
  };
  if (doc.compare(0, 5, "<?xml") == 0) {
    i = doc.find("?>");
    if (i == std::string::npos) return "unterminated XML declaration";
    i += 2;
  }
  while (i < doc.size()) {
    const std::size_t lt = doc.find('<', i);
    const std::string text = doc.substr(i, (lt == std::string::npos ? doc.size() : lt) - i);
    if (!check_entities(text)) return "bad character data: " + text.substr(0, 40);
    if (open.empty() && text.find_first_not_of(" \t\r\n") != std::string::npos) return "text outside the root";
    if (!open.empty()) elements[open.back()].text += text;
    if (lt == std::string::npos) break;
    const std::size_t gt = doc.find('>', lt);
    if (gt == std::string::npos) return "unterminated tag";
    std::string tag = doc.substr(lt + 1, gt - lt - 1);
    i = gt + 1;
    if (!tag.empty() && tag[0] == '/') {
      const std::string name = tag.substr(1);
      if (open.empty() || elements[open.back()].name != name) return "mismatched end tag </" + name + ">";
      open.pop_back();
      continue;
    }
    const bool empty = !tag.empty() && tag.back() == '/';
    if (empty) tag.pop_back();
    std::size_t k = 0;
    while (k < tag.size() && is_name(tag[k])) ++k;
    Element el;
    el.name = tag.substr(0, k);
    if (el.name.empty()) return "tag without a name";
    while (k < tag.size()) {
      while (k < tag.size() && std::isspace(static_cast<unsigned char>(tag[k]))) ++k;
      if (k >= tag.size()) break;
      const std::size_t n0 = k;
      while (k < tag.size() && is_name(tag[k])) ++k;
      const std::string attr = tag.substr(n0, k - n0);
      if (attr.empty() || k >= tag.size() || tag[k] != '=') return "bad attribute in <" + el.name + ">";
      ++k;
      if (k >= tag.size() || (tag[k] != '"' && tag[k] != '\'')) return "unquoted attribute " + attr;
      const char q = tag[k++];
      const std::size_t end = tag.find(q, k);
      if (end == std::string::npos) return "unterminated attribute " + attr;
      const std::string value = tag.substr(k, end - k);
      if (!check_entities(value)) return "bad attribute value " + attr;
      if (el.attributes.count(attr)) return "attribute twice: " + attr;
      el.attributes[attr] = value;
      k = end + 1;
    }
    if (open.empty()) ++roots;
    if (roots > 1) return "more than one root element";
    elements.push_back(el);
    if (!empty) open.push_back(elements.size() - 1);
  }
  if (!open.empty()) return "unclosed element <" + elements[open.back()].name + ">";
  if (roots != 1) return "no root element";
  return "";
}

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

}  // namespace
}  // namespace skein
