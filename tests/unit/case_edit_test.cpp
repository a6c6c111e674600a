// Case key paths (case_edit.hpp): a dotted path finds the number it names in a case file's text, the edited
// text reads back through the ordinary reader with the new value and every other line as it was, and a wrong
// path is one line naming it and the nearest path that leads to a number.
//
// What the edited text must be is set by the TOML v1.0.0 specification (T. Preston-Werner et al., toml.io,
// 2021): integers and floats as its grammar writes them, so that the reader reads back the value given.
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "skein/case_edit.hpp"
#include "skein/case_file.hpp"

namespace skein {
namespace {

// A two-surface case of our own invention: a wing by sections with a control, a tail by trapezoid.
constexpr const char* kCase = R"(title = "Edit probe"

[reference]
moment_point = [0.25, 0.0, 0.0]

[mesh]
chordwise = 2
spanwise = 8

[[surface]]
name = "wing"
symmetric = true
incidence = 1.5

  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 1.0
  twist = 0

  [[surface.section]]
  leading_edge = [0.1, 4.0, 0.2]
  chord = 0.5
  twist = -2.0

  [[surface.control]]
  name = "aileron"
  hinge = 0.75
  span_fraction = [0.5, 0.9]
  deflection = 2.0
  mirror = "opposite"

[[surface]]
name = "tail"
symmetric = true
incidence = -1.0

  [surface.trapezoid]
  root_leading_edge = [4.0, 0.0, 0.3]
  span = 2.0
  root_chord = 0.5
  taper = 0.6
)";

Case Edited(const std::string& path, double value) {
  const CaseKey k = FindCaseKey(kCase, "probe.toml", path);
  return ReadCaseText(EditCaseText(kCase, {{k, value}}), "probe.toml");
}

TEST(CaseEdit, NamedTablesByNameOthersByOneBasedIndex) {
  EXPECT_DOUBLE_EQ(Edited("surface.wing.section.2.twist", -3.25).surfaces[0].sections[1].twist_deg, -3.25);
  EXPECT_DOUBLE_EQ(Edited("surface.tail.incidence", 2.5).surfaces[1].incidence_deg, 2.5);
  EXPECT_DOUBLE_EQ(Edited("surface.wing.control.aileron.deflection", -4.0).surfaces[0].controls[0].deflection_deg,
                   -4.0);
  EXPECT_DOUBLE_EQ(Edited("surface.wing.control.aileron.span_fraction.2", 0.95).surfaces[0].controls[0].span_fraction[1],
                   0.95);
  EXPECT_DOUBLE_EQ(Edited("reference.moment_point.1", 0.4).reference.moment_point[0], 0.4);
  const Case c = Edited("surface.tail.trapezoid.taper", 0.35);
  EXPECT_DOUBLE_EQ(c.surfaces[1].sections[1].chord, 0.35 * 0.5);
}

TEST(CaseEdit, TheEditedTextKeepsEveryOtherCharacterAndEveryLine) {
  const CaseKey k = FindCaseKey(kCase, "probe.toml", "surface.wing.section.1.twist");
  EXPECT_EQ(k.where.line, 18);
  EXPECT_EQ(k.where.column, 11);
  EXPECT_TRUE(k.integer);  // written "twist = 0"
  const std::string edited = EditCaseText(kCase, {{k, 1.25}});
  const std::string original = kCase;
  EXPECT_EQ(edited.substr(0, k.begin), original.substr(0, k.begin));
  EXPECT_EQ(edited.substr(k.begin, 4), "1.25");
  EXPECT_EQ(edited.substr(k.begin + 4), original.substr(k.end));
}

TEST(CaseEdit, NumbersAreWrittenSoTheyReadBackExactly) {
  EXPECT_EQ(FormatCaseNumber(12.0, true), "12");       // a count stays an integer
  EXPECT_EQ(FormatCaseNumber(12.5, true), "12.5");     // ...unless the value is not whole: the reader decides
  EXPECT_EQ(FormatCaseNumber(3.0, false), "3.0");      // a float stays a float
  EXPECT_EQ(FormatCaseNumber(0.1, false), "0.1");
  EXPECT_EQ(FormatCaseNumber(-2.5e-7, false), "-2.5e-07");
  EXPECT_EQ(Edited("mesh.spanwise", 12.0).mesh.spanwise, 12);
}

TEST(CaseEdit, AnEditTheReaderRefusesIsReportedAtTheUsersLine) {
  try {
    Edited("surface.wing.section.2.chord", -0.5);
    FAIL() << "a negative chord was read";
  } catch (const InputError& e) {
    EXPECT_EQ(e.where().line, 22);
    EXPECT_NE(std::string(e.what()).find("chord must be > 0"), std::string::npos) << e.what();
  }
  // A count given a fraction: the reader's own message.
  EXPECT_THROW(Edited("mesh.spanwise", 8.5), InputError);
}

std::string PathError(const std::string& path) {
  try {
    FindCaseKey(kCase, "probe.toml", path);
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

TEST(CaseEdit, WrongPathsAreOneLineNamingThePathAndTheNearestKey) {
  EXPECT_EQ(PathError("surface.wing.section.2.twsit"),
            "probe.toml:20:3: --vary \"surface.wing.section.2.twsit\": \"surface.wing.section.2\" has no key \"twsit\" "
            "(did you mean \"surface.wing.section.2.twist\"?)");
  EXPECT_EQ(PathError("surface.wnig.incidence"),
            "probe.toml:10:1: --vary \"surface.wnig.incidence\": \"surface\" has no element named \"wnig\" (did you "
            "mean \"surface.wing.incidence\"?)");
  EXPECT_EQ(PathError("surface.wing.section.3.twist"),
            "probe.toml:15:3: --vary \"surface.wing.section.3.twist\": \"surface.wing.section\" has 2 elements, "
            "addressed by index 1 to 2; got \"3\" (did you mean \"surface.wing.section.1.twist\"?)");
  EXPECT_NE(PathError("surface.wing.name").find("this key is a string, not a number"), std::string::npos);
  EXPECT_NE(PathError("surface.tail.trapezoid").find("this key is a table, not a number"), std::string::npos);
  EXPECT_NE(PathError("surface..incidence").find("expected a dotted path of keys"), std::string::npos);
  EXPECT_NE(PathError("flight.alpha").find("set by --alpha or --cl"), std::string::npos);
  // A key left at its default is not in the text: the message says it must be written.
  EXPECT_NE(PathError("surface.tail.trapezoid.sweep").find("must be written in the file"), std::string::npos);
  for (const char* p : {"surface.wing.section.2.twsit", "surface.wnig.incidence", "x", "surface.wing.name"})
    EXPECT_EQ(PathError(p).find('\n'), std::string::npos) << p;
}

TEST(CaseEdit, EveryNumberOfTheCaseHasAPathThatLeadsBackToIt) {
  const std::vector<std::string> paths = CaseKeyPaths(kCase, "probe.toml");
  EXPECT_NE(std::find(paths.begin(), paths.end(), "surface.wing.control.aileron.hinge"), paths.end());
  EXPECT_NE(std::find(paths.begin(), paths.end(), "surface.tail.trapezoid.root_leading_edge.3"), paths.end());
  for (const std::string& p : paths) EXPECT_NO_THROW(FindCaseKey(kCase, "probe.toml", p)) << p;
}

}  // namespace
}  // namespace skein
