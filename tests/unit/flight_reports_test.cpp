// The flight-condition results in the reports (results-format.md: keys may be added, none changed): structural
// loads, profile drag, stall onset and the best L/D in the JSON document, structural.csv, the new points.csv
// columns and the summary's tables with their cautions.
#include <sstream>
#include <string>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "../support/planforms.hpp"
#include "skein/report/csv.hpp"
#include "skein/report/json.hpp"
#include "skein/report/summary.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

Results Solve() {
  Surface wing = testing::TaperedWing(8.0, 1.2, 0.5, 5.0, testing::Mesh(4, 10));
  for (Section& s : wing.sections) s.viscous.cl_max = 1.3;
  Case c = testing::WingCase(wing, {0.0, 4.0});
  c.flight.speed = 35.0;
  c.flight.speed_given = true;
  return skein::Run(c, {});
}

TEST(FlightReports, JsonCarriesTheNewObjects) {
  const Results r = Solve();
  std::ostringstream out;
  report::WriteJson(r, out);
  const nlohmann::json doc = nlohmann::json::parse(out.str());
  const auto& p = doc["points"][1];
  const auto& s = p["surfaces"][0];
  ASSERT_TRUE(s.contains("structural"));
  EXPECT_EQ(s["structural"]["station"].size(), 11u);  // 10 strips per half: 11 stations
  EXPECT_DOUBLE_EQ(s["structural"]["root_bending_Nm"].get<double>(), r.points[1].surfaces[0].structural->root_bending_Nm);
  EXPECT_DOUBLE_EQ(s["structural"]["mirrored_root_bending_Nm"].get<double>(),
                   *r.points[1].surfaces[0].structural->mirrored_root_bending_Nm);
  EXPECT_EQ(s["strips"]["cd_profile"].size(), s["strips"]["y"].size());
  EXPECT_EQ(s["strips"]["cl_max"].size(), s["strips"]["y"].size());
  EXPECT_DOUBLE_EQ(p["profile"]["CD_total"].get<double>(), r.points[1].profile->CD_total);
  EXPECT_DOUBLE_EQ(p["stall_onset"]["CL"].get<double>(), r.points[1].stall_onset->CL);
  EXPECT_NE(p["stall_onset"]["method"].get<std::string>().find("optimistic"), std::string::npos);
  EXPECT_EQ(doc["best_lift_to_drag"]["point"].get<std::size_t>(), r.best_lift_to_drag->point);
}

TEST(FlightReports, CsvTables) {
  const Results r = Solve();
  std::ostringstream structural, points;
  report::WriteStructuralCsv(r, structural);
  report::WritePointsCsv(r, points);
  std::istringstream lines(structural.str());
  std::string header, row;
  std::getline(lines, header);
  EXPECT_EQ(header, "point,surface,station,shear_N,bending_Nm");
  int rows = 0;
  while (std::getline(lines, row)) ++rows;
  EXPECT_EQ(rows, 2 * 11);  // two points, 11 stations each
  const std::string p = points.str();
  EXPECT_NE(p.substr(0, p.find('\n')).find(",CD_profile,CD_total,L_over_D,CL_stall_onset,alpha_stall_onset_deg"),
            std::string::npos);
}

TEST(FlightReports, SummaryTablesAndCautions) {
  const Results r = Solve();
  std::ostringstream out;
  report::WriteSummary(r, out);
  const std::string s = out.str();
  EXPECT_NE(s.find("Structural loads at alpha"), std::string::npos);
  EXPECT_NE(s.find("airworthiness rules"), std::string::npos);
  EXPECT_NE(s.find("Strip theory"), std::string::npos);
  EXPECT_NE(s.find("best L/D"), std::string::npos);
  EXPECT_NE(s.find("OPTIMISTIC"), std::string::npos);
}

}  // namespace
}  // namespace skein
