// `skein solve/trim --plots DIR --report FILE` and `skein compare --svg FILE` as a user meets them: the binary
// (SKEIN_BINARY) run in a fresh directory. The fixed file names, every SVG well-formed with its series, the
// report self-contained with each plot and the cautions, a sweep with a lost point plotted from its solved
// points only, and errors leaving no file behind. Sources: "common practice" (file formats: XML 1.0, HTML5).
#include <algorithm>
#include <filesystem>
#include <fstream>
#include <map>
#include <string>
#include <vector>

#include <fmt/format.h>
#include <gtest/gtest.h>

#include "../support/cli_workdir.hpp"
#include "../support/xml_check.hpp"

namespace {

namespace fs = std::filesystem;
using skein::testing::Outcome;
using skein::testing::ReadFile;

std::string Wing(const std::string& alpha, double chord = 0.8) {
  return fmt::format(R"(title = "Plot probe wing"
[flight]
alpha = {}

[mesh]
chordwise = 2
spanwise = 8

[[surface]]
name = "wing"
symmetric = true
  [surface.trapezoid]
  root_leading_edge = [0.0, 0.0, 0.0]
  span = 6.0
  root_chord = {}
  taper = 0.4
  sweep = 10.0
)",
                     alpha, chord);
}

class PlotsCli : public skein::testing::CliWorkdir {
 protected:
  void Write(const std::string& name, const std::string& text) const { std::ofstream(dir_ / name) << text; }
  /// Parses an SVG file; returns its elements by id (fails the test when it is not well formed).
  std::map<std::string, skein::testing::Element> Svg(const fs::path& p) const {
    std::vector<skein::testing::Element> el;
    const std::string text = ReadFile(p);
    EXPECT_EQ(skein::testing::CheckXml(text, el), "") << p;
    EXPECT_EQ(text.find("nan"), std::string::npos) << p;
    std::map<std::string, skein::testing::Element> m;
    for (const auto& [id, e] : skein::testing::ById(el)) m[id] = *e;
    return m;
  }
};

long Pairs(const std::map<std::string, skein::testing::Element>& svg, const std::string& id) {
  const auto it = svg.find(id);
  if (it == svg.end()) return -2;
  return skein::testing::CountPointPairs(it->second.attributes.at("points"));
}

TEST_F(PlotsCli, SolveWritesTheFixedSetAndOneReport) {
  Write("wing.toml", Wing("{ from = -2.0, to = 6.0, step = 2.0 }"));
  const Outcome o = Skein("solve wing.toml --quiet --plots figs --report review.html");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  std::vector<std::string> files;
  for (const auto& e : fs::directory_iterator(dir_ / "figs")) files.push_back(e.path().filename().string());
  std::sort(files.begin(), files.end());
  EXPECT_EQ(files, (std::vector<std::string>{"drag_polar.svg", "lift_curve.svg", "local_cl.svg", "planform_load.svg",
                                             "span_loading.svg"}));
  const auto span = Svg(dir_ / "figs/span_loading.svg");
  EXPECT_EQ(Pairs(span, "loading-wing"), 16);  // 8 strips a half
  EXPECT_EQ(Pairs(span, "elliptic-wing"), 201);
  EXPECT_EQ(Pairs(Svg(dir_ / "figs/local_cl.svg"), "cl-wing"), 16);
  EXPECT_EQ(Pairs(Svg(dir_ / "figs/lift_curve.svg"), "lift-curve-0"), 5);  // -2, 0, 2, 4, 6 deg
  const auto polar = Svg(dir_ / "figs/drag_polar.svg");
  EXPECT_EQ(Pairs(polar, "polar-0"), 5);
  EXPECT_EQ(Pairs(polar, "elliptic-polar"), 101);
  const auto top = Svg(dir_ / "figs/planform_load.svg");
  for (int k = 0; k < 32; ++k) EXPECT_TRUE(top.count("panel-wing-" + std::to_string(k))) << k;  // 2 x 16 panels
  EXPECT_FALSE(top.count("panel-wing-32"));
  EXPECT_TRUE(top.count("colour-bar"));

  const std::string html = ReadFile(dir_ / "review.html");
  for (const char* id : {"plot-span_loading", "plot-local_cl", "plot-planform_load", "plot-lift_curve",
                         "plot-drag_polar"})
    EXPECT_NE(html.find(std::string("<figure id=\"") + id + "\">"), std::string::npos) << id;
  EXPECT_NE(html.find("airworthiness rules"), std::string::npos);
  EXPECT_NE(html.find("root_chord = 0.8"), std::string::npos);  // the case as read
  EXPECT_EQ(html.find("http://"), std::string::npos);
  EXPECT_EQ(html.find("https://"), std::string::npos);
  for (const std::string& svg : skein::testing::SvgFragments(html)) {
    std::vector<skein::testing::Element> el;
    EXPECT_EQ(skein::testing::CheckXml(svg, el), "");
  }
  // Nothing else was left in the directory (no staged partial files).
  EXPECT_EQ(Entries(), (std::vector<std::string>{"figs", "review.html", "wing.toml"}));
}

TEST_F(PlotsCli, RefineAddsTheConvergenceTablesToTheReport) {
  Write("wing.toml", Wing("3.0"));
  const Outcome o = Skein("solve wing.toml --quiet --refine --report r.html");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  const std::string html = ReadFile(dir_ / "r.html");
  EXPECT_NE(html.find("id=\"convergence\""), std::string::npos);
  EXPECT_NE(html.find("<th>extrapolated</th>"), std::string::npos);
  EXPECT_EQ(skein::testing::SvgFragments(html).size(), 3u);  // one point: no lift curve, no polar
}

TEST_F(PlotsCli, TrimWritesThePlotsOfTheTrimmedPoint) {
  fs::copy_file(fs::path(SKEIN_SOURCE_DIR) / "cases/trainer_two_seat.toml", dir_ / "trainer.toml");
  const Outcome o = Skein("trim trainer.toml --quiet --plots figs --report trim.html");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  EXPECT_TRUE(fs::exists(dir_ / "figs/span_loading.svg"));
  EXPECT_TRUE(fs::exists(dir_ / "figs/local_cl.svg"));
  EXPECT_FALSE(fs::exists(dir_ / "figs/lift_curve.svg"));
  const auto top = Svg(dir_ / "figs/planform_load.svg");
  EXPECT_TRUE(top.count("panel-wing-0"));
  const std::string html = ReadFile(dir_ / "trim.html");
  EXPECT_NE(html.find("id=\"trim\""), std::string::npos);
  EXPECT_NE(html.find("fins) not shown"), std::string::npos);  // the centre-line fin has no top view
}

TEST_F(PlotsCli, CompareOverlaysTheCases) {
  Write("a.toml", Wing("3.0", 0.8));
  Write("b.toml", Wing("3.0", 1.0));
  const Outcome o = Skein("compare a.toml b.toml --cl 0.4 --svg overlay.svg");
  ASSERT_EQ(o.exit_code, 0) << o.err;
  const auto svg = Svg(dir_ / "overlay.svg");
  EXPECT_EQ(Pairs(svg, "loading-1-wing"), 16);
  EXPECT_EQ(Pairs(svg, "loading-2-wing"), 16);
  EXPECT_TRUE(svg.count("cautions"));
}

TEST_F(PlotsCli, ABadCaseOrAnUnwritableReportLeavesNoFile) {
  Write("bad.toml", Wing("3.0", -0.8));
  Outcome o = Skein("solve bad.toml --plots figs --report r.html");
  EXPECT_EQ(o.exit_code, 2);
  EXPECT_EQ(Entries(), (std::vector<std::string>{"bad.toml"}));
  Write("wing.toml", Wing("3.0"));
  o = Skein("solve wing.toml --quiet --plots figs --report missing/r.html");
  EXPECT_EQ(o.exit_code, 4) << o.err;
  EXPECT_FALSE(fs::exists(dir_ / "missing"));
  // The plot directory may have been created, but it holds no file: nothing was renamed into place.
  if (fs::exists(dir_ / "figs")) {
    EXPECT_TRUE(fs::is_empty(dir_ / "figs"));
  }
}

}  // namespace
