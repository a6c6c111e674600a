// Parameter studies (study.hpp: ParseStudyAxis, RunStudy, PlanThreads, ParabolicMinimum) and the parallel
// compare. Checks: the --vary grammar; a variant gives bit for bit what the ordinary reader and solver give
// for the same file; two identical variants are equal bit for bit; results are the same bit for bit on 1 and
// 2 threads (the variants run two at a time, or one at a time on two threads); the parabola through three
// points of a quadratic finds its vertex exactly (common practice: the vertex of y = a (x - x0)^2 + c).
#include <cmath>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "skein/case_edit.hpp"
#include "skein/case_file.hpp"
#include "skein/study.hpp"

namespace skein::study {
namespace {

// A small tapered wing of our own invention.
constexpr const char* kCase = R"(title = "Study probe wing"

[flight]
alpha = 3.0

[mesh]
chordwise = 2
spanwise = 10
spanwise_spacing = "sine"

[[surface]]
name = "wing"
symmetric = true

  [surface.trapezoid]
  root_leading_edge = [0.0, 0.0, 0.0]
  span = 6.0
  root_chord = 0.8
  taper = 0.5
  sweep = 10.0
  washout = 1.0
)";

void ExpectSameBits(const StudyVariant& a, const StudyVariant& b) {
  EXPECT_EQ(a.values, b.values);
  EXPECT_EQ(a.alpha_deg, b.alpha_deg);
  EXPECT_EQ(a.CL, b.CL);
  EXPECT_EQ(a.CD_induced, b.CD_induced);
  EXPECT_EQ(a.Cm, b.Cm);
  EXPECT_EQ(a.span_efficiency, b.span_efficiency);
  EXPECT_EQ(a.CL_alpha, b.CL_alpha);
  EXPECT_EQ(a.root_bending, b.root_bending);
  EXPECT_EQ(a.neutral_point_x, b.neutral_point_x);
  EXPECT_EQ(a.cl_peak_eta, b.cl_peak_eta);
  EXPECT_EQ(a.cl_peak_over_CL, b.cl_peak_over_CL);
}

TEST(ParameterStudy, VaryTakesARangeOrAList) {
  const StudyAxis r = ParseStudyAxis("surface.wing.trapezoid.taper=0.2:0.6:17");
  EXPECT_EQ(r.path, "surface.wing.trapezoid.taper");
  ASSERT_EQ(r.values.size(), 17u);
  EXPECT_EQ(r.values[0], 0.2);
  EXPECT_EQ(r.values[1], 0.225);  // the decimal meant, not 0.22500000000000003
  EXPECT_EQ(r.values[16], 0.6);
  const StudyAxis l = ParseStudyAxis("surface.tail.incidence=-2,0,1.5");
  EXPECT_EQ(l.values, (std::vector<double>{-2.0, 0.0, 1.5}));
  for (const char* bad : {"taper", "=1,2", "x=", "x=1,,2", "x=1:2", "x=1:2:1", "x=1:2:3:4", "x=a:2:3", "x=1:2:2.5",
                          "x=nan", "x=1e999", "x=0:1:100000"}) {
    try {
      ParseStudyAxis(bad);
      ADD_FAILURE() << bad << " was accepted";
    } catch (const InputError& e) {
      const std::string what = e.what();
      EXPECT_EQ(what.rfind("--vary \"", 0), 0u) << what;
      EXPECT_EQ(what.find('\n'), std::string::npos) << what;
    }
  }
}

TEST(ParameterStudy, ParabolaThroughTheBestThreeFindsTheVertex) {
  std::vector<double> x, y;
  for (int i = 0; i < 9; ++i) {
    x.push_back(0.2 + 0.05 * i);
    y.push_back(3.0 * (x.back() - 0.37) * (x.back() - 0.37) + 0.01);
  }
  ASSERT_TRUE(ParabolicMinimum(x, y).has_value());
  EXPECT_NEAR(*ParabolicMinimum(x, y), 0.37, 1e-12);
  y.back() = -1.0;  // least at an end: not located
  EXPECT_FALSE(ParabolicMinimum(x, y).has_value());
}

TEST(ParameterStudy, ThreadsGoToTheVariantsOrToTheVariant) {
  EXPECT_EQ(PlanThreads(10, 2).concurrent_cases, 2);
  EXPECT_EQ(PlanThreads(10, 2).threads_per_case, 1);
  EXPECT_EQ(PlanThreads(1, 2).concurrent_cases, 1);
  EXPECT_EQ(PlanThreads(1, 2).threads_per_case, 2);
  EXPECT_EQ(PlanThreads(3, 8).concurrent_cases, 3);
  EXPECT_EQ(PlanThreads(3, 8).threads_per_case, 2);
}

TEST(ParameterStudy, AVariantIsTheCaseFileWithThatValueReadAndSolved) {
  StudyOptions o;
  o.axes = {ParseStudyAxis("surface.wing.trapezoid.taper=0.35")};
  o.target_CL = 0.4;
  const Study s = RunStudy(kCase, "probe.toml", o);
  ASSERT_EQ(s.variants.size(), 1u);
  std::string text = kCase;
  text.replace(text.find("taper = 0.5"), 11, "taper = 0.35");
  const PointAtLift p = SolveAtLift(ReadCaseText(text, "probe.toml"), 0.4, {});
  EXPECT_EQ(s.variants[0].CD_induced, p.point.CD_induced);
  EXPECT_EQ(s.variants[0].alpha_deg, p.point.alpha_deg);
  EXPECT_EQ(s.variants[0].Cm, p.point.Cm);
  EXPECT_NEAR(s.variants[0].CL, 0.4, 1e-12);
}

TEST(ParameterStudy, TwoIdenticalVariantsAreEqualBitForBit) {
  StudyOptions o;
  o.axes = {ParseStudyAxis("surface.wing.trapezoid.taper=0.4,0.4")};
  o.target_CL = 0.5;
  o.run.threads = 2;  // the two variants solved at the same time, on different threads
  const Study s = RunStudy(kCase, "probe.toml", o);
  ASSERT_EQ(s.variants.size(), 2u);
  ExpectSameBits(s.variants[0], s.variants[1]);
}

TEST(ParameterStudy, ResultsAreTheSameOnOneAndTwoThreads) {
  for (const char* second : {"surface.wing.trapezoid.sweep=0,20", ""}) {
    StudyOptions o;
    o.axes = {ParseStudyAxis("surface.wing.trapezoid.taper=0.3:0.7:3")};
    if (*second) o.axes.push_back(ParseStudyAxis(second));
    o.alpha_deg = 4.0;
    o.run.threads = 1;
    const Study one = RunStudy(kCase, "probe.toml", o);
    o.run.threads = 2;
    const Study two = RunStudy(kCase, "probe.toml", o);
    EXPECT_EQ(two.threads.concurrent_cases, 2);
    ASSERT_EQ(one.variants.size(), two.variants.size());
    for (std::size_t i = 0; i < one.variants.size(); ++i) ExpectSameBits(one.variants[i], two.variants[i]);
  }
  // One variant: both threads go to it (OpenMP and BLAS), with the same bits as on one.
  StudyOptions o;
  o.axes = {ParseStudyAxis("surface.wing.trapezoid.taper=0.45")};
  o.target_CL = 0.5;
  o.run.threads = 1;
  const Study one = RunStudy(kCase, "probe.toml", o);
  o.run.threads = 2;
  const Study two = RunStudy(kCase, "probe.toml", o);
  EXPECT_EQ(two.threads.threads_per_case, 2);
  ExpectSameBits(one.variants[0], two.variants[0]);
}

TEST(ParameterStudy, GridRunsTheFirstKeyFastestAndReportsProgress) {
  StudyOptions o;
  o.axes = {ParseStudyAxis("surface.wing.trapezoid.taper=0.4,0.6"),
            ParseStudyAxis("surface.wing.trapezoid.washout=0,1,2")};
  o.alpha_deg = 3.0;
  std::vector<std::size_t> seen;
  o.progress = [&](std::size_t done, std::size_t total) {
    EXPECT_EQ(total, 6u);
    seen.push_back(done);
  };
  const Study s = RunStudy(kCase, "probe.toml", o);
  ASSERT_EQ(s.variants.size(), 6u);
  EXPECT_EQ(s.variants[1].values, (std::vector<double>{0.6, 0.0}));
  EXPECT_EQ(s.variants[2].values, (std::vector<double>{0.4, 1.0}));
  EXPECT_EQ(seen, (std::vector<std::size_t>{1, 2, 3, 4, 5, 6}));
  // Washout unloads the tips: at a fixed angle, less lift (Glauert, common practice).
  EXPECT_LT(s.variants[4].CL, s.variants[0].CL);
}

TEST(ParameterStudy, AnInvalidVariantIsNamedWithTheUsersLine) {
  StudyOptions o;
  o.axes = {ParseStudyAxis("surface.wing.trapezoid.taper=0.5,-0.1")};
  o.target_CL = 0.5;
  try {
    RunStudy(kCase, "probe.toml", o);
    FAIL() << "a negative taper was solved";
  } catch (const InputError& e) {
    EXPECT_EQ(e.where().line, 19);
    EXPECT_EQ(e.message().rfind("variant surface.wing.trapezoid.taper = -0.1: ", 0), 0u) << e.what();
  }
}

TEST(ParameterStudy, CompareGivesTheSameOnOneAndTwoThreads) {
  std::vector<Case> cases;
  for (const char* t : {"taper = 0.3", "taper = 0.5", "taper = 0.9"}) {
    std::string text = kCase;
    text.replace(text.find("taper = 0.5"), 11, t);
    cases.push_back(ReadCaseText(text, "probe.toml"));
  }
  CompareOptions o;
  o.target_CL = 0.5;
  o.run.threads = 1;
  const Comparison one = CompareCases(cases, o);
  o.run.threads = 2;
  const Comparison two = CompareCases(cases, o);
  ASSERT_EQ(one.entries.size(), 3u);
  EXPECT_EQ(one.ranked, two.ranked);
  for (std::size_t i = 0; i < 3; ++i) {
    EXPECT_EQ(one.entries[i].CD_induced, two.entries[i].CD_induced);
    EXPECT_EQ(one.entries[i].alpha_deg, two.entries[i].alpha_deg);
    EXPECT_EQ(one.entries[i].root_bending, two.entries[i].root_bending);
  }
}

}  // namespace
}  // namespace skein::study
