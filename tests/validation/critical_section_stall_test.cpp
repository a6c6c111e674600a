// Stall onset by the critical-section method (common practice): the wing's lift at stall onset is taken where
// the first strip reaches its section cl_max, the span loading held linear in alpha. A rectangular wing's
// sections are most loaded near the root, so it stalls first inboard; a strongly tapered wing's are most
// loaded outboard, so its first strip to reach cl_max lies further out (the reason tapered wings are given
// washout). The estimate is optimistic and says so in the output.
#include <algorithm>
#include <cmath>

#include <gtest/gtest.h>

#include "../support/planforms.hpp"
#include "skein/run.hpp"

namespace skein {
namespace {

constexpr double kClMax = 1.3;

StallOnset Onset(Surface wing) {
  for (Section& s : wing.sections) s.viscous.cl_max = kClMax;
  Case c = testing::WingCase(std::move(wing), {2.0});
  const Results r = skein::Run(c, {});
  EXPECT_TRUE(r.points[0].stall_onset.has_value());
  const StallOnset o = r.points[0].stall_onset.value_or(StallOnset{});
  // Consistency: at the angle found, the highest strip cl is cl_max (the lattice is linear in alpha).
  Case at = c;
  at.flight.alpha_deg = {o.alpha_deg};
  const Results ra = skein::Run(at, {});
  const std::vector<double>& cl = ra.points[0].surfaces[0].strips.cl;
  EXPECT_NEAR(*std::max_element(cl.begin(), cl.end()), kClMax, 1e-9);
  EXPECT_NEAR(ra.points[0].CL, o.CL, 1e-9);
  return o;
}

TEST(CriticalSectionStall, TaperedWingStallsFurtherOutboard) {
  const StallOnset rect = Onset(testing::RectangularWing(8.0, 1.0, testing::Mesh(4, 20)));
  const StallOnset tapered = Onset(testing::TaperedWing(8.0, 1.6, 0.25, 0.0, testing::Mesh(4, 20)));
  RecordProperty("rectangular_span_fraction", std::to_string(rect.span_fraction));
  RecordProperty("tapered_span_fraction", std::to_string(tapered.span_fraction));
  RecordProperty("rectangular_CL", std::to_string(rect.CL));
  RecordProperty("tapered_CL", std::to_string(tapered.CL));
  EXPECT_LT(rect.span_fraction, 0.2);
  EXPECT_GT(tapered.span_fraction, rect.span_fraction + 0.3);
  // Wing CL at onset below the section cl_max (the loading is not uniform).
  EXPECT_LT(rect.CL, kClMax);
  EXPECT_LT(tapered.CL, kClMax);
  EXPECT_FALSE(rect.already_beyond);
}

// Washout moves the tapered wing's critical section inboard.
TEST(CriticalSectionStall, WashoutMovesTheCriticalSectionInboard) {
  Surface plain = testing::TaperedWing(8.0, 1.6, 0.25, 0.0, testing::Mesh(4, 20));
  Surface washed = plain;
  washed.sections[1].twist_deg = -4.0;
  EXPECT_LT(Onset(washed).span_fraction, Onset(plain).span_fraction);
}

}  // namespace
}  // namespace skein
