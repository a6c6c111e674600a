// The machine-readable outputs, parsed back: the JSON document of results-format.md (format "skein-result",
// version 1) and the CSV tables beside it. Scripts and other tools read these, so the names, the nesting, the
// order of points and strips and the "no NaN" rule are a contract; these tests hold the writers to it.
#include <algorithm>
#include <cmath>
#include <limits>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "skein/case_file.hpp"
#include "skein/report/csv.hpp"
#include "skein/report/json.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

using nlohmann::json;

// A wing with an aileron and a centre-line fin, swept over two sideslip angles and three angles of attack:
// enough to exercise every block of the document (a scenario of our own).
const char* const kProbe = R"(title = "output probe"

[reference]
moment_point = [0.3, 0.0, 0.0]

[flight]
alpha = { from = -2.0, to = 6.0, step = 4.0 }
beta = [0.0, 3.0]

[mesh]
chordwise = 3
spanwise = 6

[[surface]]
name = "wing"
symmetric = true

  [surface.trapezoid]
  root_leading_edge = [0.0, 0.0, 0.0]
  span = 6.0
  root_chord = 1.0
  taper = 0.5
  sweep = 5.0
  dihedral = 3.0

  [[surface.control]]
  name = "aileron"
  hinge = 0.7
  span_fraction = [0.5, 0.9]
  mirror = "opposite"

[[surface]]
name = "fin"
symmetric = false

  [surface.trapezoid]
  root_leading_edge = [3.0, 0.0, 0.0]
  span = 0.8
  root_chord = 0.5
  vertical = true
)";

/// Relative tolerance for sums of shares: round-off of a few dozen additions of order-one numbers.
constexpr double kSumTolerance = 1e-12;

class Output : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    const Case c = ReadCaseText(kProbe, "probe.toml");
    results_ = new Results(skein::Run(c, {}));
    std::ostringstream s;
    report::WriteJson(*results_, s);
    text_ = new std::string(s.str());
  }
  static void TearDownTestSuite() {
    delete results_;
    delete text_;
  }
  static json Doc() { return json::parse(*text_); }

  static Results* results_;
  static std::string* text_;
};
Results* Output::results_ = nullptr;
std::string* Output::text_ = nullptr;

/// Paths of every number in `j` that is not finite (nlohmann writes NaN as null, but a parser built
/// differently could keep it: check both the values and the text).
void CollectNonFinite(const json& j, const std::string& path, std::vector<std::string>& bad) {
  if (j.is_number_float() && !std::isfinite(j.get<double>())) bad.push_back(path);
  if (j.is_array())
    for (std::size_t i = 0; i < j.size(); ++i) CollectNonFinite(j[i], path + "[" + std::to_string(i) + "]", bad);
  if (j.is_object())
    for (auto it = j.begin(); it != j.end(); ++it) CollectNonFinite(it.value(), path + "." + it.key(), bad);
}

std::vector<std::string> SplitCsvLine(const std::string& line) {
  std::vector<std::string> cells;
  std::string cell;
  bool quoted = false;
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char ch = line[i];
    if (quoted) {
      if (ch == '"' && i + 1 < line.size() && line[i + 1] == '"') {
        cell += '"';
        ++i;
      } else if (ch == '"') {
        quoted = false;
      } else {
        cell += ch;
      }
    } else if (ch == '"') {
      quoted = true;
    } else if (ch == ',') {
      cells.push_back(cell);
      cell.clear();
    } else {
      cell += ch;
    }
  }
  cells.push_back(cell);
  return cells;
}

std::vector<std::vector<std::string>> ParseCsv(const std::string& text) {
  std::vector<std::vector<std::string>> rows;
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line)) rows.push_back(SplitCsvLine(line));
  return rows;
}

std::size_t Column(const std::vector<std::string>& header, const std::string& name) {
  for (std::size_t i = 0; i < header.size(); ++i)
    if (header[i] == name) return i;
  ADD_FAILURE() << "no column \"" << name << "\"";
  return 0;
}

TEST_F(Output, JsonHasFormatVersionTitleAndReference) {
  const json d = Doc();
  EXPECT_EQ(d.at("format"), "skein-result");
  EXPECT_EQ(d.at("version"), 1);
  EXPECT_EQ(d.at("title"), "output probe");
  const json& ref = d.at("reference");
  for (const char* k : {"area", "span", "chord"}) EXPECT_TRUE(ref.at(k).is_number()) << k;
  ASSERT_EQ(ref.at("moment_point").size(), 3u);
  EXPECT_EQ(ref.at("moment_point")[0].get<double>(), 0.3);
  EXPECT_EQ(ref.at("span").get<double>(), 6.0);  // default: tip-to-tip span of the first surface
  EXPECT_TRUE(d.at("warnings").is_array());
}

TEST_F(Output, JsonMeshNamesTheSurfacesInCaseOrder) {
  const json mesh = Doc().at("mesh");
  ASSERT_EQ(mesh.at("surfaces").size(), 2u);
  EXPECT_EQ(mesh.at("surfaces")[0].at("name"), "wing");
  EXPECT_EQ(mesh.at("surfaces")[1].at("name"), "fin");
  // 3 chordwise x 6 spanwise per half x 2 halves, and 3 x 6 on the fin.
  EXPECT_EQ(mesh.at("surfaces")[0].at("panels"), 36);
  EXPECT_EQ(mesh.at("surfaces")[0].at("strips"), 12);
  EXPECT_EQ(mesh.at("surfaces")[1].at("panels"), 18);
  EXPECT_EQ(mesh.at("panels"), 54);
}

TEST_F(Output, JsonPointsFollowTheSweepOrderAlphaFastest) {
  const json pts = Doc().at("points");
  ASSERT_EQ(pts.size(), 6u);
  const double alpha[] = {-2.0, 2.0, 6.0, -2.0, 2.0, 6.0};
  const double beta[] = {0.0, 0.0, 0.0, 3.0, 3.0, 3.0};
  for (std::size_t i = 0; i < pts.size(); ++i) {
    EXPECT_EQ(pts[i].at("alpha_deg").get<double>(), alpha[i]) << i;
    EXPECT_EQ(pts[i].at("beta_deg").get<double>(), beta[i]) << i;
  }
}

TEST_F(Output, JsonPointHoldsEveryContractKey) {
  const json p = Doc().at("points")[0];
  for (const char* k : {"alpha_deg", "beta_deg", "mach", "CL", "CD_induced", "CD_induced_nearfield", "CY", "Cl",
                        "Cm", "Cn", "span_efficiency", "static_margin"})
    EXPECT_TRUE(p.contains(k) && p.at(k).is_number()) << k;
  EXPECT_EQ(p.at("rates").size(), 3u);
  EXPECT_EQ(p.at("neutral_point").size(), 3u);
  const json& d = p.at("derivatives");
  for (const char* k : {"CL_alpha", "Cm_alpha", "CY_beta", "Cl_beta", "Cn_beta", "CL_q", "Cm_q", "Cl_p", "Cn_p",
                        "Cl_r", "Cn_r", "CY_p", "CY_r"})
    EXPECT_TRUE(d.contains(k) && d.at(k).is_number()) << k;
  ASSERT_TRUE(d.at("controls").contains("aileron"));
  for (const char* k : {"CL", "CY", "Cl", "Cm", "Cn"}) EXPECT_TRUE(d.at("controls").at("aileron").at(k).is_number()) << k;
  ASSERT_EQ(p.at("surfaces").size(), 2u);
  for (const json& s : p.at("surfaces")) {
    for (const char* k : {"name", "CL", "CD_induced", "CY", "Cl", "Cm", "Cn"}) EXPECT_TRUE(s.contains(k)) << k;
    const json& st = s.at("strips");
    const std::size_t n = st.at("y").size();
    EXPECT_GT(n, 0u);
    for (const char* k : {"y", "z", "chord", "gamma", "cl", "cl_c_over_cref"})
      EXPECT_EQ(st.at(k).size(), n) << s.at("name") << " strips." << k << " differs in length from strips.y";
  }
}

TEST_F(Output, JsonNumbersAreTheResultsExactly) {
  // The document is a faithful image of Results: doubles round-trip without loss.
  const json pts = Doc().at("points");
  for (std::size_t i = 0; i < results_->points.size(); ++i) {
    const PointResult& p = results_->points[i];
    EXPECT_EQ(pts[i].at("CL").get<double>(), p.CL);
    EXPECT_EQ(pts[i].at("CD_induced").get<double>(), p.CD_induced);
    EXPECT_EQ(pts[i].at("Cm").get<double>(), p.Cm);
    EXPECT_EQ(pts[i].at("derivatives").at("CL_alpha").get<double>(), p.derivatives.Get("CL_alpha").value());
    EXPECT_EQ(pts[i].at("surfaces")[0].at("strips").at("gamma").get<std::vector<double>>(), p.surfaces[0].strips.gamma);
  }
}

TEST_F(Output, JsonStripsRunLeftTipToRightTipAndFinRootToTip) {
  // The document must outlive the loop: a range-for over Doc().at(...) iterates a destroyed temporary.
  const json doc = Doc();
  for (const json& p : doc.at("points")) {
    const auto y = p.at("surfaces")[0].at("strips").at("y").get<std::vector<double>>();
    ASSERT_EQ(y.size(), 12u);
    for (std::size_t k = 1; k < y.size(); ++k) EXPECT_LT(y[k - 1], y[k]) << "wing strip " << k;
    EXPECT_LT(y.front(), 0.0);
    EXPECT_GT(y.back(), 0.0);
    const auto z = p.at("surfaces")[1].at("strips").at("z").get<std::vector<double>>();
    ASSERT_EQ(z.size(), 6u);
    for (std::size_t k = 1; k < z.size(); ++k) EXPECT_LT(z[k - 1], z[k]) << "fin strip " << k;
  }
}

TEST_F(Output, JsonSurfaceSharesAddUpToTheTotals) {
  const json doc = Doc();  // outlives the loop (see above)
  for (const json& p : doc.at("points")) {
    for (const char* k : {"CL", "CD_induced", "CY", "Cl", "Cm", "Cn"}) {
      double sum = 0.0;
      for (const json& s : p.at("surfaces")) sum += s.at(k).get<double>();
      const double total = p.at(k).get<double>();
      EXPECT_NEAR(sum, total, kSumTolerance * std::max(1.0, std::abs(total))) << k << " at alpha " << p.at("alpha_deg");
    }
  }
}

TEST_F(Output, JsonHasNoNaNOrInfinity) {
  std::vector<std::string> bad;
  CollectNonFinite(Doc(), "$", bad);
  EXPECT_TRUE(bad.empty()) << bad.front();
  for (const char* word : {"NaN", "nan", "Infinity", "inf"})
    EXPECT_EQ(text_->find(std::string(": ") + word), std::string::npos) << word;
}

TEST_F(Output, JsonWritesNullWithAWarningForAValueThatCouldNotBeComputed) {
  Results r = *results_;
  r.points[1].CL = std::nan("");
  r.points[1].surfaces[0].strips.cl[3] = std::numeric_limits<double>::infinity();
  std::ostringstream s;
  report::WriteJson(r, s);
  const json d = json::parse(s.str());
  EXPECT_TRUE(d.at("points")[1].at("CL").is_null());
  EXPECT_TRUE(d.at("points")[1].at("surfaces")[0].at("strips").at("cl")[3].is_null());
  EXPECT_TRUE(d.at("points")[0].at("CL").is_number()) << "only the bad value becomes null";
  std::string warnings;
  for (const json& w : d.at("warnings")) warnings += w.get<std::string>() + "\n";
  EXPECT_NE(warnings.find("points[1].CL"), std::string::npos) << warnings;
  EXPECT_NE(warnings.find("strips.cl"), std::string::npos) << warnings;
}

TEST_F(Output, PointsCsvHasAHeaderRowAndOneRowPerPoint) {
  std::ostringstream s;
  report::WritePointsCsv(*results_, s);
  const auto rows = ParseCsv(s.str());
  ASSERT_EQ(rows.size(), 1 + results_->points.size());
  const auto& header = rows.front();
  EXPECT_EQ(header.front(), "point");
  for (const char* k : {"alpha_deg", "beta_deg", "mach", "CL", "CD_induced", "CD_induced_nearfield", "CY", "Cl", "Cm",
                        "Cn", "span_efficiency", "CL_alpha", "Cm_alpha", "static_margin"})
    Column(header, k);
  const std::size_t cl = Column(header, "CL"), alpha = Column(header, "alpha_deg");
  for (std::size_t i = 0; i < results_->points.size(); ++i) {
    const auto& row = rows[i + 1];
    ASSERT_EQ(row.size(), header.size()) << "row " << i;
    EXPECT_EQ(std::stoul(row[0]), i);
    EXPECT_EQ(std::stod(row[alpha]), results_->points[i].alpha_deg);
    EXPECT_EQ(std::stod(row[cl]), results_->points[i].CL) << "CSV numbers round-trip";
  }
}

TEST_F(Output, StripsCsvHasAHeaderRowAndTheJsonStripOrder) {
  std::ostringstream s;
  report::WriteStripsCsv(*results_, s);
  const auto rows = ParseCsv(s.str());
  ASSERT_FALSE(rows.empty());
  const auto& header = rows.front();
  const std::vector<std::string> expected_start{"point", "surface", "strip", "y", "z", "chord", "gamma", "cl",
                                                "cl_c_over_cref"};
  ASSERT_GE(header.size(), expected_start.size());
  EXPECT_EQ(std::vector<std::string>(header.begin(), header.begin() + 9), expected_start);
  std::size_t row = 1;
  for (std::size_t i = 0; i < results_->points.size(); ++i)
    for (const SurfaceLoads& surf : results_->points[i].surfaces)
      for (std::size_t k = 0; k < surf.strips.y.size(); ++k, ++row) {
        ASSERT_LT(row, rows.size());
        const auto& r = rows[row];
        ASSERT_EQ(r.size(), header.size());
        EXPECT_EQ(std::stoul(r[0]), i);
        EXPECT_EQ(r[1], surf.name);
        EXPECT_EQ(std::stoul(r[2]), k);
        EXPECT_EQ(std::stod(r[3]), surf.strips.y[k]);
        EXPECT_EQ(std::stod(r[6]), surf.strips.gamma[k]);
      }
  EXPECT_EQ(row, rows.size()) << "no rows beyond the strips of every point";
}

}  // namespace
}  // namespace skein
