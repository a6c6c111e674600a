// Every example aircraft in cases/ is read and solved here, so none goes stale: the directory is globbed, and a
// new file is picked up by the next build (tests/CMakeLists.txt re-globs at configure time; this file reads
// the directory when the test runs).
//
// For each example:
//  - it opens with a header comment saying what it shows, reads without error or warning and stays under
//    kMaxExamplePanels, so the suite stays fast;
//  - it solves, every number of every point is finite and the induced drag is not negative;
//  - its results document is the same bit for bit on 1 and on 2 threads and when solved again (the issue on
//    hostile input asks for it; common practice for a tool whose answers are compared across runs);
//  - a single-surface wing's lift-curve slope agrees with the handbook estimate for its aspect ratio and
//    half-chord sweep (see LiftSlopeEstimate for the sources);
//  - a single-surface wing's mesh is converged: solved at half its own mesh counts, at its own mesh and at twice
//    its counts (chordwise and spanwise together), CL and CD_induced change less than kConvergenceTolerance
//    between the two finest, that is between the file's mesh and one four times the panels. The ladder ends at
//    the file's mesh x2 rather than x4 so that the claim is about the mesh the user runs, and the suite stays
//    fast (the finest mesh of any example is under 4 x kMaxExamplePanels panels).
#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "skein/case_file.hpp"
#include "skein/report/json.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

namespace fs = std::filesystem;

const fs::path kCasesDir = fs::path(SKEIN_SOURCE_DIR) / "cases";

/// The examples are meant to solve in well under a second each.
constexpr std::size_t kMaxExamplePanels = 2000;

/// Largest relative change of CL and CD_induced allowed between the two finest meshes of the ladder. Half a
/// percent is below what a conceptual design decision turns on (common practice) and well above round-off.
constexpr double kConvergenceTolerance = 0.005;

/// Allowed relative difference between the solved lift-curve slope and the handbook estimate. The estimates
/// are closed-form fits for straight-tapered wings; taper, cranks, twist and dihedral move the exact
/// lifting-surface value by a few percent (common practice), while an error in the method (a slope per degree
/// taken for per radian, a lost half-wing, a factor 2 in the kernel) is far larger.
constexpr double kHandbookEstimateTolerance = 0.06;

std::vector<std::string> ExampleFiles() {
  std::vector<std::string> names;
  std::error_code ec;
  for (const auto& entry : fs::directory_iterator(kCasesDir, ec))
    if (entry.is_regular_file() && entry.path().extension() == ".toml")
      names.push_back(entry.path().filename().string());
  std::sort(names.begin(), names.end());
  return names;
}

std::string FirstLine(const fs::path& p) {
  std::ifstream in(p);
  std::string line;
  std::getline(in, line);
  return line;
}

/// A mesh count scaled by `factor`, rounded, at least 1.
int Scaled(int count, double factor) { return std::max(1, static_cast<int>(std::lround(count * factor))); }

/// The case with every mesh count (chordwise, spanwise, per-section spanwise) scaled by `factor`.
Case Refined(Case c, double factor) {
  c.mesh.chordwise = Scaled(c.mesh.chordwise, factor);
  c.mesh.spanwise = Scaled(c.mesh.spanwise, factor);
  for (Surface& s : c.surfaces) {
    s.mesh.chordwise = Scaled(s.mesh.chordwise, factor);
    s.mesh.spanwise = Scaled(s.mesh.spanwise, factor);
    for (Section& sec : s.sections)
      if (sec.spanwise) sec.spanwise = Scaled(*sec.spanwise, factor);
  }
  return c;
}

/// Handbook estimate of the lift-curve slope per radian of a wing of aspect ratio A whose half-chord line is
/// swept by Lambda (section slope 2 pi, incompressible):
///     CL_alpha = 2 pi A / (2 + sqrt(A^2 (1 + tan^2 Lambda) + 4)).
/// For Lambda = 0 this is Helmbold's formula (H. B. Helmbold, "Der unverwundene Ellipsenfluegel als tragende
/// Wirbelflaeche", Jahrbuch 1942 der deutschen Luftfahrtforschung, pp. I 111-I 113; from memory); the sweep
/// term is the extension of E. C. Polhamus, "A simple method of estimating the subsonic lift and damping in
/// roll of sweptback wings", NACA TN 1862, 1949 (from memory). The same formula, with a section-slope and a
/// Mach factor, is the USAF Stability and Control DATCOM's subsonic lift-curve slope (D. E. Hoak et al., 1960,
/// rev. 1978, sec. 4.1.3.2); it is written out here rather than taken from skein::datcom so that the check
/// does not lean on the code it checks.
/// A = b^2 / S from the wing's projected area and span; tan^2 Lambda is the span-weighted mean over the
/// straight segments between sections, from the section mid-chord points (twist and dihedral neglected: both
/// change the slope by far less than the tolerance in these examples).
double LiftSlopeEstimate(const Surface& s) {
  const SurfaceExtent e = MeasureSurface(s);
  const double aspect = e.span * e.span / e.area;
  double weighted = 0.0, total = 0.0;
  for (std::size_t k = 0; k + 1 < s.sections.size(); ++k) {
    const Section& a = s.sections[k];
    const Section& b = s.sections[k + 1];
    const double dy = std::abs(b.leading_edge[1] - a.leading_edge[1]);
    const double dx = (b.leading_edge[0] + 0.5 * b.chord) - (a.leading_edge[0] + 0.5 * a.chord);
    if (dy <= 0.0) continue;
    weighted += dy * (dx / dy) * (dx / dy);
    total += dy;
  }
  const double tan2 = total > 0.0 ? weighted / total : 0.0;
  return 2.0 * M_PI * aspect / (2.0 + std::sqrt(aspect * aspect * (1.0 + tan2) + 4.0));
}

bool IsWingExample(const Case& c) { return c.surfaces.size() == 1 && c.surfaces.front().symmetric; }

class Example : public ::testing::TestWithParam<std::string> {
 protected:
  fs::path Path() const { return kCasesDir / GetParam(); }
};

TEST(Examples, DirectoryHoldsTheBundledWings) {
  const std::vector<std::string> names = ExampleFiles();
  EXPECT_GE(names.size(), 3u);
  // tools/demo.sh solves this one, and the CLI's help text names it.
  EXPECT_NE(std::find(names.begin(), names.end(), "survey_drone.toml"), names.end());
}

TEST_P(Example, OpensWithAHeaderCommentSayingWhatItShows) {
  const std::string line = FirstLine(Path());
  ASSERT_GE(line.size(), 12u) << GetParam();
  EXPECT_EQ(line.rfind("# ", 0), 0u) << GetParam() << ": first line is \"" << line << "\"";
}

TEST_P(Example, ReadsWithoutWarningsAndStaysSmall) {
  const Case c = ReadCaseFile(Path().string());
  EXPECT_FALSE(c.title.empty()) << GetParam();
  EXPECT_TRUE(c.warnings.empty()) << GetParam() << ": " << (c.warnings.empty() ? "" : c.warnings.front());
  EXPECT_LE(CountPanels(c), kMaxExamplePanels) << GetParam();
}

TEST_P(Example, SolvesToFiniteResultsWithNonNegativeInducedDrag) {
  const Case c = ReadCaseFile(Path().string());
  const Results r = skein::Run(c, {});
  ASSERT_EQ(r.points.size(), c.flight.alpha_deg.size() * c.flight.beta_deg.size()) << GetParam();
  EXPECT_TRUE(r.warnings.empty()) << GetParam() << ": " << (r.warnings.empty() ? "" : r.warnings.front());
  for (const PointResult& p : r.points) {
    for (double v : {p.CL, p.CD_induced, p.CD_induced_nearfield, p.CY, p.Cl, p.Cm, p.Cn})
      EXPECT_TRUE(std::isfinite(v)) << GetParam() << " at alpha " << p.alpha_deg;
    for (const auto& [name, v] : p.derivatives.items)
      EXPECT_TRUE(std::isfinite(v)) << GetParam() << ": " << name << " at alpha " << p.alpha_deg;
    // The Trefftz-plane drag is a positive semi-definite quadratic form of the shed circulation (common
    // practice: the kinetic energy the wake leaves behind per unit length).
    EXPECT_GE(p.CD_induced, 0.0) << GetParam() << " at alpha " << p.alpha_deg;
    for (const SurfaceLoads& s : p.surfaces)
      for (double g : s.strips.gamma) EXPECT_TRUE(std::isfinite(g)) << GetParam() << ": " << s.name;
  }
}

TEST_P(Example, GivesTheSameBitsOnOneAndTwoThreadsAndWhenRepeated) {
  const Case c = ReadCaseFile(Path().string());
  const auto document = [&](int threads) {
    RunOptions o;
    o.threads = threads;
    Results r = skein::Run(c, o);
    r.times = StageTimes{};  // wall-clock times and thread counts are the only values allowed to differ
    std::ostringstream out;
    report::WriteJson(r, out);
    return out.str();
  };
  const std::string one = document(1), two = document(2), again = document(2);
  // The JSON writes every double with its shortest exact representation, so equal text is equal bits.
  EXPECT_TRUE(one == two) << GetParam() << ": 1 and 2 threads differ";
  EXPECT_TRUE(two == again) << GetParam() << ": a repeated run differs";
  EXPECT_GT(one.size(), 1000u);
}

TEST_P(Example, WingLiftSlopeAgreesWithTheHandbookEstimate) {
  const Case c = ReadCaseFile(Path().string());
  if (!IsWingExample(c)) GTEST_SKIP() << GetParam() << " is a configuration, not a single wing";
  const Results r = skein::Run(c, {});
  ASSERT_FALSE(r.points.empty());
  const double solved = r.points.front().derivatives.Get("CL_alpha").value_or(NAN);
  const double estimate = LiftSlopeEstimate(c.surfaces.front());
  EXPECT_NEAR(solved, estimate, kHandbookEstimateTolerance * estimate)
      << GetParam() << ": CL_alpha " << solved << " per rad, handbook estimate " << estimate;
}

TEST_P(Example, WingMeshIsConverged) {
  const Case file_case = ReadCaseFile(Path().string());
  if (!IsWingExample(file_case)) GTEST_SKIP() << GetParam() << " is a configuration, not a single wing";
  // The point of the file's sweep with the most lift: relative changes are meaningful there.
  const Results at_file_mesh = skein::Run(file_case, {});
  ASSERT_FALSE(at_file_mesh.points.empty());
  const PointResult* most = &at_file_mesh.points.front();
  for (const PointResult& p : at_file_mesh.points)
    if (std::abs(p.CL) > std::abs(most->CL)) most = &p;
  Case one_point = file_case;
  one_point.flight.alpha_deg = {most->alpha_deg};
  one_point.flight.beta_deg = {most->beta_deg};

  std::vector<double> cl, cd;
  for (double factor : {0.5, 1.0, 2.0}) {
    const Results r = skein::Run(Refined(one_point, factor), {});
    ASSERT_EQ(r.points.size(), 1u);
    cl.push_back(r.points.front().CL);
    cd.push_back(r.points.front().CD_induced);
  }
  const double dcl = std::abs(cl[2] - cl[1]) / std::abs(cl[2]);
  const double dcd = std::abs(cd[2] - cd[1]) / std::abs(cd[2]);
  EXPECT_LT(dcl, kConvergenceTolerance) << GetParam() << " at alpha " << most->alpha_deg << ": CL " << cl[0]
                                        << " -> " << cl[1] << " -> " << cl[2];
  EXPECT_LT(dcd, kConvergenceTolerance) << GetParam() << " at alpha " << most->alpha_deg << ": CD_induced "
                                        << cd[0] << " -> " << cd[1] << " -> " << cd[2];
}

INSTANTIATE_TEST_SUITE_P(Cases, Example, ::testing::ValuesIn(ExampleFiles()),
                         [](const ::testing::TestParamInfo<std::string>& param) {
                           std::string id = fs::path(param.param).stem().string();
                           for (char& ch : id)
                             if (!std::isalnum(static_cast<unsigned char>(ch))) ch = '_';
                           return id;
                         });

}  // namespace
}  // namespace skein
