// The reader's strip-theory keys on [[surface.section]] and [surface.trapezoid]: polar, cl_max, thickness,
// transition (case-format.md; profile_drag.hpp).
#include <sstream>
#include <string>

#include <gtest/gtest.h>

#include "skein/case_file.hpp"

namespace skein {
namespace {

std::string Sections(const std::string& root_extra) {
  return "[[surface]]\nname = \"wing\"\n[[surface.section]]\nleading_edge = [0.0, 0.0, 0.0]\nchord = 1.0\n" +
         root_extra + "[[surface.section]]\nleading_edge = [0.0, 4.0, 0.0]\nchord = 0.5\n";
}

std::string ErrorOf(const std::string& text) {
  try {
    ReadCaseText(text, "s.toml");
  } catch (const InputError& e) {
    return e.what();
  }
  return "(no error)";
}

TEST(SectionData, ReadsAndEchoes) {
  const Case c = ReadCaseText(
      Sections("polar = { cl = [-0.2, 0.4, 1.2], cd = [0.011, 0.008, 0.016] }\ncl_max = 1.35\nthickness = 0.14\n"
               "transition = 0.3\n"),
      "s.toml");
  const SectionViscousData& v = c.surfaces[0].sections[0].viscous;
  ASSERT_TRUE(v.polar.has_value());
  EXPECT_EQ(v.polar->cl, (std::vector<double>{-0.2, 0.4, 1.2}));
  EXPECT_EQ(v.polar->cd, (std::vector<double>{0.011, 0.008, 0.016}));
  EXPECT_EQ(v.cl_max, 1.35);
  EXPECT_EQ(v.thickness, 0.14);
  EXPECT_EQ(v.transition, 0.3);
  EXPECT_FALSE(c.surfaces[0].sections[1].viscous.cl_max.has_value());
  std::ostringstream echo;
  WriteCaseToml(c, echo);
  const Case back = ReadCaseText(echo.str(), "echo.toml");
  EXPECT_EQ(back.surfaces[0].sections[0].viscous.polar->cd, v.polar->cd);
  EXPECT_EQ(back.surfaces[0].sections[0].viscous.cl_max, v.cl_max);
  EXPECT_EQ(back.surfaces[0].sections[0].viscous.transition, v.transition);
}

TEST(SectionData, TrapezoidGivesBothSections) {
  const Case c = ReadCaseText(
      "[[surface]]\nname = \"wing\"\n[surface.trapezoid]\nroot_leading_edge = [0.0, 0.0, 0.0]\nspan = 6.0\n"
      "root_chord = 1.0\ncl_max = 1.2\n",
      "t.toml");
  EXPECT_EQ(c.surfaces[0].sections[0].viscous.cl_max, 1.2);
  EXPECT_EQ(c.surfaces[0].sections[1].viscous.cl_max, 1.2);
}

TEST(SectionData, Errors) {
  EXPECT_EQ(ErrorOf(Sections("polar = { cl = [0.0, 0.0], cd = [0.01, 0.01] }\n")),
            "s.toml:6:22: surface \"wing\" section 1 polar: cl must increase strictly along the table; element 2 is "
            "0 after 0");
  EXPECT_EQ(ErrorOf(Sections("polar = { cl = [0.0, 1.0], cd = [0.01] }\n")),
            "s.toml:6:33: surface \"wing\" section 1 polar: \"cd\" needs from 2 to 1000 values, got 1");
  EXPECT_EQ(ErrorOf(Sections("polar = { cl = [0.0, 1.0, 2.0], cd = [0.01, 0.02] }\n")),
            "s.toml:6:38: surface \"wing\" section 1 polar: cd has 2 values but cl has 3; give one cd per cl");
  EXPECT_EQ(ErrorOf(Sections("polar = { cl = [0.0, 1.0], cd = [0.01, -0.02] }\n")),
            "s.toml:6:40: surface \"wing\" section 1 polar: cd must be >= 0 and < 1, got -0.02 (element 2)");
  EXPECT_EQ(ErrorOf(Sections("polar = { cl = [0.0, 1.0], cd = [0.01, 0.02], cm = [0.0, 0.0] }\n")),
            "s.toml:6:47: surface \"wing\" section 1 polar: unknown key \"cm\" (did you mean \"cl\"?)");
  EXPECT_EQ(ErrorOf(Sections("polar = [0.01, 0.02]\n")),
            "s.toml:6:9: surface \"wing\" section 1: expected a table for \"polar\" (write polar = { cl = [...], cd = "
            "[...] }), got an array");
  EXPECT_EQ(ErrorOf(Sections("cl_max = -1.0\n")),
            "s.toml:6:10: surface \"wing\" section 1: cl_max must be > 0 and < 10, got -1");
  EXPECT_EQ(ErrorOf(Sections("thickness = 12\n")),
            "s.toml:6:13: surface \"wing\" section 1: thickness (thickness / chord) must be between 0 and 0.5, got 12");
  EXPECT_EQ(ErrorOf(Sections("transition = 1.5\n")),
            "s.toml:6:14: surface \"wing\" section 1: transition (x/c of transition) must be between 0 and 1, got 1.5");
  EXPECT_EQ(ErrorOf(Sections("clmax = 1.2\n")),
            "s.toml:6:1: surface \"wing\" section 1: unknown key \"clmax\" (did you mean \"cl_max\"?)");
}

}  // namespace
}  // namespace skein
