// Tests for case_file.hpp: reading case files (case-format.md is the contract), defaults, sweeps, the
// trapezoid shorthand, error messages (the text, not only the type) and the normalised echo.
#include "skein/case_file.hpp"

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>

namespace skein {
namespace {

// Tolerances. Geometry built from a few operations on values of order one: a few ulps. The echo round trip:
// the brief's 1e-12 (the writer prints shortest round-trip decimals, so it is exact in practice).
constexpr double kTight = 1e-14;
constexpr double kRoundTrip = 1e-12;
constexpr double kPi = 3.14159265358979323846;

// A wing of our own invention, used as the base of most tests.
const std::string kWing = R"(
[[surface]]
name = "wing"

  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 0.3

  [[surface.section]]
  leading_edge = [0.05, 1.2, 0.0]
  chord = 0.2
)";

// The example of case-format.md (an invented survey drone).
const std::string kSurvey = R"(title = "Survey drone, cruise"

[reference]
area = 0.62
span = 2.4
chord = 0.27
moment_point = [0.07, 0.0, 0.0]

[flight]
alpha = 3.0
beta = 0.0
speed = 20.0
density = 1.225
mach = 0.0
rates = [0.0, 0.0, 0.0]

[ground]
height_z = -1.2

[mesh]
chordwise = 6
spanwise = 20
chordwise_spacing = "cosine"
spanwise_spacing = "cosine"
wake = "freestream"

[[surface]]
name = "wing"
symmetric = true
incidence = 0.0
offset = [0.0, 0.0, 0.0]
spanwise = 24

  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 0.32
  twist = 2.0
  camber = "NACA 2412"
  spanwise = 12

  [[surface.section]]
  leading_edge = [0.06, 1.2, 0.08]
  chord = 0.18
  twist = -1.0

  [[surface.control]]
  name = "aileron"
  hinge = 0.75
  span_fraction = [0.6, 0.95]
  deflection = 0.0
  mirror = "opposite"

[[surface]]
name = "tail"
symmetric = true
incidence = -1.5

  [surface.trapezoid]
  root_leading_edge = [1.10, 0.0, 0.05]
  span = 0.90
  root_chord = 0.20
  taper = 0.6
  sweep = 8.0
  dihedral = 0.0
  washout = 0.0
  camber = "flat"

[trim]
lift_coefficient = 0.55
adjust = "tail.incidence"
)";

Case Read(const std::string& text) { return ReadCaseText(text, "t.toml"); }

/// The error line the reader gives for `text` (named t.toml), or "no error".
std::string ErrorOf(const std::string& text) {
  try {
    Read(text);
  } catch (const InputError& e) {
    return e.what();
  }
  return "no error";
}

double Deg(double d) { return d * kPi / 180.0; }

// ---- what a good file gives ---------------------------------------------------------------------------------

TEST(ReadCase, ReadsTheContractExample) {
  const Case c = Read(kSurvey);
  EXPECT_EQ(c.title, "Survey drone, cruise");
  EXPECT_TRUE(c.reference.area_given && c.reference.span_given && c.reference.chord_given);
  EXPECT_EQ(c.reference.area, 0.62);
  EXPECT_EQ(c.reference.moment_point[0], 0.07);
  EXPECT_EQ(c.flight.alpha_deg, std::vector<double>{3.0});
  EXPECT_TRUE(c.flight.speed_given);
  EXPECT_EQ(c.flight.speed, 20.0);
  EXPECT_TRUE(c.ground.enabled);
  EXPECT_EQ(c.ground.height_z, -1.2);
  ASSERT_EQ(c.surfaces.size(), 2u);
  const Surface& wing = c.surfaces[0];
  EXPECT_EQ(wing.mesh.spanwise, 24);
  EXPECT_EQ(wing.mesh.chordwise, 6);
  ASSERT_EQ(wing.sections.size(), 2u);
  EXPECT_EQ(wing.sections[0].camber.kind, Camber::Kind::naca4);
  EXPECT_EQ(wing.sections[0].camber.max_camber, 0.02);
  EXPECT_EQ(wing.sections[0].camber.max_camber_position, 0.4);
  EXPECT_EQ(wing.sections[0].camber.spelling, "NACA 2412");
  EXPECT_EQ(wing.sections[0].spanwise, 12);
  EXPECT_FALSE(wing.sections[1].spanwise.has_value());
  EXPECT_EQ(wing.sections[1].camber.kind, Camber::Kind::flat);
  ASSERT_EQ(wing.controls.size(), 1u);
  EXPECT_EQ(wing.controls[0].name, "aileron");
  EXPECT_TRUE(wing.controls[0].mirror_opposite);
  EXPECT_EQ(wing.controls[0].span_fraction[1], 0.95);
  EXPECT_EQ(c.surfaces[1].incidence_deg, -1.5);
  EXPECT_TRUE(c.trim.enabled);
  EXPECT_EQ(c.trim.lift_coefficient, 0.55);
  EXPECT_EQ(c.trim.adjust, "tail.incidence");
  EXPECT_TRUE(c.warnings.empty());
}

TEST(ReadCase, RecordsWhereThingsWereWritten) {
  const Case c = Read(kWing);
  EXPECT_EQ(c.surfaces[0].where.line, 2);
  EXPECT_EQ(c.surfaces[0].where.column, 1);
  EXPECT_EQ(c.surfaces[0].sections[1].where.line, 9);
  EXPECT_EQ(c.surfaces[0].sections[1].where.column, 3);
}

TEST(ReadCase, FillsEveryDefault) {
  const Case c = ReadCaseText(kWing, "cases/quiet_glider.toml");
  EXPECT_EQ(c.title, "quiet_glider");  // the file's stem
  EXPECT_EQ(c.source_path, "");        // text, not a file
  EXPECT_EQ(c.flight.alpha_deg, std::vector<double>{0.0});
  EXPECT_EQ(c.flight.beta_deg, std::vector<double>{0.0});
  EXPECT_FALSE(c.flight.speed_given);
  EXPECT_EQ(c.flight.density, 1.225);  // ISA sea level
  EXPECT_EQ(c.flight.mach, 0.0);
  EXPECT_FALSE(c.ground.enabled);
  EXPECT_FALSE(c.trim.enabled);
  EXPECT_EQ(c.mesh.chordwise, 6);
  EXPECT_EQ(c.mesh.spanwise, 20);
  EXPECT_EQ(c.mesh.chordwise_spacing, Spacing::cosine);
  EXPECT_EQ(c.mesh.wake, WakeDirection::freestream);
  const Surface& s = c.surfaces[0];
  EXPECT_TRUE(s.symmetric);
  EXPECT_EQ(s.incidence_deg, 0.0);
  EXPECT_EQ(s.sections[0].twist_deg, 0.0);
  EXPECT_EQ(s.sections[0].camber.spelling, "flat");
  // Reference defaults from the first surface: a trapezoid of span 2.4, chords 0.3 and 0.2 (common practice:
  // S = b (c_r + c_t)/2, MAC = 2/3 c_r (1 + l + l^2)/(1 + l)).
  const double l = 0.2 / 0.3;
  EXPECT_FALSE(c.reference.area_given || c.reference.span_given || c.reference.chord_given);
  EXPECT_NEAR(c.reference.area, 2.4 * (0.3 + 0.2) / 2, kTight);
  EXPECT_NEAR(c.reference.span, 2.4, kTight);
  EXPECT_NEAR(c.reference.chord, 2.0 / 3.0 * 0.3 * (1 + l + l * l) / (1 + l), kTight);
  EXPECT_EQ(c.reference.moment_point, (Vec3{0.0, 0.0, 0.0}));
}

TEST(ReadCase, GivenReferenceValuesWinOverDefaults) {
  const Case c = Read("[reference]\nchord = 0.25\n" + kWing);
  EXPECT_TRUE(c.reference.chord_given);
  EXPECT_FALSE(c.reference.area_given);
  EXPECT_EQ(c.reference.chord, 0.25);
  EXPECT_NEAR(c.reference.area, 0.6, kTight);
}

TEST(ReadCase, OffsetMovesEverySectionAndTheDefaults) {
  const Case c = Read(R"(
[[surface]]
name = "wing"
offset = [0.5, 0.1, -0.2]

  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 0.3

  [[surface.section]]
  leading_edge = [0.05, 1.2, 0.0]
  chord = 0.3
)");
  const Surface& s = c.surfaces[0];
  EXPECT_EQ(s.offset, (Vec3{0.5, 0.1, -0.2}));
  EXPECT_EQ(s.sections[0].leading_edge, (Vec3{0.5, 0.1, -0.2}));
  EXPECT_NEAR(s.sections[1].leading_edge[0], 0.55, kTight);
  EXPECT_NEAR(s.sections[1].leading_edge[1], 1.3, kTight);
  // Tip to tip 2 * 1.3; the area counts only the panels, 2 * 1.2 * 0.3.
  EXPECT_NEAR(c.reference.span, 2.6, kTight);
  EXPECT_NEAR(c.reference.area, 0.72, kTight);
}

TEST(ReadCase, IntegersAreAcceptedForNumbers) {
  const Case c = Read("[flight]\nalpha = 4\nspeed = 25\n" + kWing);
  EXPECT_EQ(c.flight.alpha_deg, std::vector<double>{4.0});
  EXPECT_EQ(c.flight.speed, 25.0);
}

TEST(ReadCase, SurfaceMeshOverridesCaseMesh) {
  const Case c = Read(R"(
[mesh]
chordwise = 8
spanwise = 30
spanwise_spacing = "sine"
wake = "x-axis"

[[surface]]
name = "wing"
chordwise = 4
chordwise_spacing = "uniform"

  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 0.3

  [[surface.section]]
  leading_edge = [0.05, 1.2, 0.0]
  chord = 0.2
)");
  EXPECT_EQ(c.mesh.wake, WakeDirection::x_axis);
  const MeshOptions& m = c.surfaces[0].mesh;
  EXPECT_EQ(m.chordwise, 4);
  EXPECT_EQ(m.spanwise, 30);
  EXPECT_EQ(m.chordwise_spacing, Spacing::uniform);
  EXPECT_EQ(m.spanwise_spacing, Spacing::sine);
  EXPECT_EQ(m.wake, WakeDirection::x_axis);
}

TEST(ReadCase, CamberSpellingsAreNormalised) {
  const auto camber = [](const std::string& spelling) {
    return Read(kWing + "  camber = \"" + spelling + "\"\n").surfaces[0].sections[1].camber;
  };
  EXPECT_EQ(camber("naca2412").spelling, "NACA 2412");
  EXPECT_EQ(camber("Naca 4415").max_camber, 0.04);
  EXPECT_EQ(camber("NACA  6409").max_camber_position, 0.4);
  EXPECT_EQ(camber("NACA 0012").max_camber, 0.0);  // symmetric section: a flat mean line
  EXPECT_EQ(camber("Flat").kind, Camber::Kind::flat);
}

// ---- sweeps ---------------------------------------------------------------------------------------------------

std::vector<double> Alphas(const std::string& alpha) { return Read("[flight]\nalpha = " + alpha + "\n" + kWing).flight.alpha_deg; }

TEST(ReadCase, RangeIncludesItsEnd) {
  EXPECT_EQ(Alphas("{ from = -4, to = 12, step = 2 }"),
            (std::vector<double>{-4, -2, 0, 2, 4, 6, 8, 10, 12}));
}

TEST(ReadCase, RangeEndWithinToleranceIsIncludedExactly) {
  const std::vector<double> a = Alphas("{ from = 0, to = 1, step = 0.1 }");  // 10 steps of an inexact 0.1
  ASSERT_EQ(a.size(), 11u);
  EXPECT_EQ(a.back(), 1.0);
  EXPECT_NEAR(a[3], 0.3, kTight);
}

TEST(ReadCase, RangeStopsBeforeAnEndOffTheStep) {
  EXPECT_EQ(Alphas("{ from = 0, to = 5, step = 2 }"), (std::vector<double>{0, 2, 4}));
}

TEST(ReadCase, RangeRunsDownWithNegativeStep) {
  EXPECT_EQ(Alphas("{ from = 5, to = -5, step = -2.5 }"), (std::vector<double>{5, 2.5, 0, -2.5, -5}));
}

TEST(ReadCase, RangeWithEqualEndsIsOnePoint) { EXPECT_EQ(Alphas("{ from = 3, to = 3, step = 1 }"), (std::vector<double>{3})); }

TEST(ReadCase, AngleListIsKeptInOrder) { EXPECT_EQ(Alphas("[4, -2, 0.5]"), (std::vector<double>{4, -2, 0.5})); }

TEST(ReadCase, BetaTakesRangesToo) {
  const Case c = Read("[flight]\nbeta = { from = -10, to = 10, step = 10 }\n" + kWing);
  EXPECT_EQ(c.flight.beta_deg, (std::vector<double>{-10, 0, 10}));
}

TEST(ReadCase, ThousandPointsAreAllowed) {
  EXPECT_EQ(Alphas("{ from = -49.95, to = 49.95, step = 0.1 }").size(), 1000u);
  EXPECT_EQ(ErrorOf("[flight]\nalpha = { from = -50, to = 50, step = 0.1 }\n" + kWing),
            "t.toml:2:9: flight: alpha range: from -50 to 50 by 0.1 gives 1001 points, more than the limit of 1000");
}

// ---- the trapezoid shorthand (case-format.md) ---------------------------------------------------------------

Surface Trapezoid(const std::string& body, const std::string& surface_keys = "") {
  return Read("[[surface]]\nname = \"t\"\n" + surface_keys + "[surface.trapezoid]\n" + body).surfaces[0];
}

TEST(Trapezoid, SymmetricTipFollowsQuarterChordSweepAndDihedral) {
  const Surface s = Trapezoid(
      "root_leading_edge = [1.0, 0.0, 0.1]\nspan = 3.0\nroot_chord = 0.4\ntaper = 0.5\nsweep = 10\ndihedral = 5\n"
      "washout = 2\ncamber = \"NACA 2412\"\n");
  ASSERT_EQ(s.sections.size(), 2u);
  const Section &root = s.sections[0], &tip = s.sections[1];
  EXPECT_EQ(root.leading_edge, (Vec3{1.0, 0.0, 0.1}));
  EXPECT_EQ(root.chord, 0.4);
  EXPECT_EQ(root.twist_deg, 0.0);
  EXPECT_NEAR(tip.chord, 0.2, kTight);
  EXPECT_EQ(tip.twist_deg, -2.0);  // tip twist = -washout
  // Geometry, independent of how the reader computes it: the quarter-chord line rises at the dihedral and runs
  // aft at the sweep angle over the half span 1.5.
  const double dy = tip.leading_edge[1] - root.leading_edge[1];
  const double dz = tip.leading_edge[2] - root.leading_edge[2];
  const double dx_qc = (tip.leading_edge[0] + 0.25 * tip.chord) - (root.leading_edge[0] + 0.25 * root.chord);
  EXPECT_NEAR(dy, 1.5, kTight);
  EXPECT_NEAR(dz / dy, std::tan(Deg(5)), kTight);
  EXPECT_NEAR(dx_qc / dy, std::tan(Deg(10)), kTight);
  EXPECT_EQ(tip.camber.spelling, "NACA 2412");
  EXPECT_EQ(root.camber.spelling, "NACA 2412");
}

TEST(Trapezoid, TipLeadingEdgeFromSweepRuleByHand) {
  // case-format.md example tail: x_tip = 1.10 + 0.25*0.20 + 0.45 tan(8 deg) - 0.25*0.12.
  const Case c = Read(kSurvey);
  const Section& tip = c.surfaces[1].sections[1];
  EXPECT_NEAR(tip.leading_edge[0], 1.10 + 0.05 + 0.45 * std::tan(Deg(8)) - 0.03, kTight);
  EXPECT_NEAR(tip.leading_edge[1], 0.45, kTight);
  EXPECT_NEAR(tip.leading_edge[2], 0.05, kTight);
  EXPECT_NEAR(tip.chord, 0.12, kTight);
}

TEST(Trapezoid, NonSymmetricSpanIsRootToTip) {
  const Surface s = Trapezoid("root_leading_edge = [0.0, -1.0, 0.0]\nspan = 2.0\nroot_chord = 0.3\n",
                              "symmetric = false\n");
  EXPECT_NEAR(s.sections[1].leading_edge[1], 1.0, kTight);
  EXPECT_NEAR(s.sections[1].chord, 0.3, kTight);  // taper default 1
}

TEST(Trapezoid, VerticalBuildsAFinUpward) {
  const Surface s = Trapezoid(
      "root_leading_edge = [1.2, 0.0, 0.0]\nspan = 0.5\nroot_chord = 0.3\ntaper = 0.5\nsweep = 30\nvertical = true\n",
      "symmetric = false\n");
  const Section &root = s.sections[0], &tip = s.sections[1];
  EXPECT_EQ(tip.leading_edge[1], 0.0);
  EXPECT_NEAR(tip.leading_edge[2], 0.5, kTight);
  const double dx_qc = (tip.leading_edge[0] + 0.25 * tip.chord) - (root.leading_edge[0] + 0.25 * root.chord);
  EXPECT_NEAR(dx_qc / 0.5, std::tan(Deg(30)), kTight);
}

TEST(Trapezoid, SymmetricVerticalMakesTwinFinsOfTheGivenHeight) {
  const Case c = Read(
      "[[surface]]\nname = \"fins\"\n[surface.trapezoid]\nroot_leading_edge = [1.2, 0.4, 0.0]\nspan = 0.3\n"
      "root_chord = 0.2\nvertical = true\n");
  const Section& tip = c.surfaces[0].sections[1];
  EXPECT_EQ(tip.leading_edge[1], 0.4);
  EXPECT_NEAR(tip.leading_edge[2], 0.3, kTight);  // span is each fin's height
}

TEST(Trapezoid, OffsetIsApplied) {
  const Surface s = Trapezoid("root_leading_edge = [0.0, 0.0, 0.0]\nspan = 1.0\nroot_chord = 0.2\n",
                              "offset = [2.0, 0.0, 0.3]\n");
  EXPECT_EQ(s.sections[0].leading_edge, (Vec3{2.0, 0.0, 0.3}));
  EXPECT_NEAR(s.sections[1].leading_edge[2], 0.3, kTight);
}

// ---- warnings ------------------------------------------------------------------------------------------------

TEST(ReadCase, WarnsAboveMachSevenTenths) {
  EXPECT_TRUE(Read("[flight]\nmach = 0.7\n" + kWing).warnings.empty());
  const Case c = Read("[flight]\nmach = 0.75\n" + kWing);
  ASSERT_EQ(c.warnings.size(), 1u);
  EXPECT_EQ(c.warnings[0],
            "t.toml:2:8: flight: mach 0.75 is above about 0.7, where the Prandtl-Glauert correction loses accuracy");
  EXPECT_EQ(c.flight.mach, 0.75);
}

// ---- errors: each rule, with its text -----------------------------------------------------------------------

TEST(ReadCaseErrors, TomlSyntaxErrorGivesParserPosition) {
  EXPECT_EQ(ErrorOf("title = \"unterminated\n"),
            "t.toml:1:22: TOML syntax error while parsing string: unescaped control characters other than TAB (U+0009) "
            "are explicitly prohibited");
}

TEST(ReadCaseErrors, RedefinedKeyIsASyntaxError) {
  EXPECT_EQ(ErrorOf("title = \"a\"\ntitle = \"b\"\n" + kWing),
            "t.toml:2:9: TOML syntax error while parsing key-value pair: cannot redefine existing string 'title'");
}

TEST(ReadCaseErrors, UnknownKeysAtEveryLevelGetHints) {
  EXPECT_EQ(ErrorOf("titel = \"x\"\n" + kWing), "t.toml:1:1: unknown key \"titel\" (did you mean \"title\"?)");
  EXPECT_EQ(ErrorOf("[reference]\naera = 1\n" + kWing), "t.toml:2:1: reference: unknown key \"aera\" (did you mean \"area\"?)");
  EXPECT_EQ(ErrorOf("[flight]\nbetta = 1\n" + kWing), "t.toml:2:1: flight: unknown key \"betta\" (did you mean \"beta\"?)");
  EXPECT_EQ(ErrorOf("[flight]\nvelocity = 20\n" + kWing),
            "t.toml:2:1: flight: unknown key \"velocity\" (did you mean \"speed\"?)");
  EXPECT_EQ(ErrorOf("[ground]\nheight = -1\n" + kWing),
            "t.toml:2:1: ground: unknown key \"height\" (did you mean \"height_z\"?)");
  EXPECT_EQ(ErrorOf("[mesh]\nspanwize = 10\n" + kWing), "t.toml:2:1: mesh: unknown key \"spanwize\" (did you mean \"spanwise\"?)");
  EXPECT_EQ(ErrorOf(kWing + "  chrod = 0.2\n"),
            "t.toml:12:3: surface \"wing\" section 2: unknown key \"chrod\" (did you mean \"chord\"?)");
  EXPECT_EQ(ErrorOf(kWing + "[trim]\nlift_coeficient = 0.5\nadjust = \"wing.incidence\"\n"),
            "t.toml:13:1: trim: unknown key \"lift_coeficient\" (did you mean \"lift_coefficient\"?)");
  EXPECT_EQ(ErrorOf("[flight]\nalpha = { from = 0, too = 4, step = 1 }\n" + kWing),
            "t.toml:2:21: flight: alpha range: unknown key \"too\" (did you mean \"to\"?)");
}

TEST(ReadCaseErrors, KeyInTheWrongTableSaysWhereItBelongs) {
  EXPECT_EQ(ErrorOf("alpha = 2\n" + kWing), "t.toml:1:1: unknown key \"alpha\" (it belongs in [flight])");
  EXPECT_EQ(ErrorOf("[flight]\ntitle = \"x\"\n" + kWing),
            "t.toml:2:1: flight: unknown key \"title\" (it belongs at the top of the file, before any table)");
  EXPECT_EQ(ErrorOf(kWing + "  incidence = 2\n"),
            "t.toml:12:3: surface \"wing\" section 2: unknown key \"incidence\" (it belongs in [[surface]])");
  EXPECT_EQ(ErrorOf("[[surface]]\nname = \"w\"\n[surface.trapezoid]\nchord = 0.3\n"),
            "t.toml:4:1: surface \"w\" trapezoid: unknown key \"chord\" (did you mean \"root_chord\"?)");
}

TEST(ReadCaseErrors, FirstUnknownKeyInTheFileIsReported) {
  // TOML++ keeps keys sorted; the reader reports the one written first.
  EXPECT_EQ(ErrorOf("[flight]\ngamma = 1\naaa = 2\n" + kWing), "t.toml:2:1: flight: unknown key \"gamma\"");
}

TEST(ReadCaseErrors, WrongTypesNameTheKeyAndTheType) {
  EXPECT_EQ(ErrorOf("title = 3\n" + kWing), "t.toml:1:9: expected a string for \"title\", got an integer");
  EXPECT_EQ(ErrorOf("[flight]\nspeed = \"fast\"\n" + kWing),
            "t.toml:2:9: flight: expected a number for \"speed\", got a string");
  EXPECT_EQ(ErrorOf("[flight]\nrates = [0, true, 0]\n" + kWing),
            "t.toml:2:13: flight: expected a number for element 2 of \"rates\", got a boolean");
  EXPECT_EQ(ErrorOf("[flight]\nalpha = [0, \"2\"]\n" + kWing),
            "t.toml:2:13: flight: expected a number for element 2 of \"alpha\", got a string");
  EXPECT_EQ(ErrorOf("[reference]\nmoment_point = 0.1\n" + kWing),
            "t.toml:2:16: reference: expected an array of 3 numbers for \"moment_point\", got a floating-point number");
  EXPECT_EQ(ErrorOf("flight = 3\n" + kWing), "t.toml:1:10: expected a table for \"flight\" (write [flight]), got an integer");
  EXPECT_EQ(ErrorOf("[flight]\nalpha = 1979-05-27\n" + kWing),
            "t.toml:2:9: flight: expected a number, an array of numbers or a range table { from, to, step } for "
            "\"alpha\", got a date");
  EXPECT_EQ(ErrorOf("[[surface]]\nname = \"w\"\n[[surface.trapezoid]]\nspan = 1\n"),
            "t.toml:3:1: surface \"w\": expected a table for \"trapezoid\" (write [surface.trapezoid], one per "
            "surface), got an array");
  EXPECT_EQ(ErrorOf("[[surface]]\nname = \"w\"\nsection = [1, 2]\n"),
            "t.toml:3:12: surface \"w\": expected an array of tables for \"section\" (write [[surface.section]]), got "
            "an element that is an integer");
}

TEST(ReadCaseErrors, NonFiniteNumbersAreRefused) {
  EXPECT_EQ(ErrorOf("[flight]\nalpha = inf\n" + kWing), "t.toml:2:9: flight: expected a finite number for \"alpha\", got inf");
  EXPECT_EQ(ErrorOf("[reference]\narea = -nan\n" + kWing),
            "t.toml:2:8: reference: expected a finite number for \"area\", got nan");
}

TEST(ReadCaseErrors, ReferenceValuesMustBePositive) {
  EXPECT_EQ(ErrorOf("[reference]\narea = -0.5\n" + kWing), "t.toml:2:8: reference: area must be > 0, got -0.5");
  EXPECT_EQ(ErrorOf("[reference]\nspan = 0\n" + kWing), "t.toml:2:8: reference: span must be > 0, got 0");
  EXPECT_EQ(ErrorOf("[reference]\nmoment_point = [0, 0]\n" + kWing),
            "t.toml:2:16: reference: expected an array of 3 numbers for \"moment_point\", got 2 values");
}

TEST(ReadCaseErrors, FlightRanges) {
  EXPECT_EQ(ErrorOf("[flight]\nalpha = -90.5\n" + kWing), "t.toml:2:9: flight: alpha must be between -90 and 90 deg, got -90.5");
  EXPECT_EQ(ErrorOf("[flight]\nbeta = [0, 100]\n" + kWing),
            "t.toml:2:12: flight: element 2 of beta must be between -90 and 90 deg, got 100");
  EXPECT_EQ(ErrorOf("[flight]\nspeed = 0\n" + kWing), "t.toml:2:9: flight: speed must be > 0, got 0");
  EXPECT_EQ(ErrorOf("[flight]\ndensity = -1.2\n" + kWing), "t.toml:2:11: flight: density must be > 0, got -1.2");
  EXPECT_EQ(ErrorOf("[flight]\nmach = -0.1\n" + kWing), "t.toml:2:8: flight: mach must be >= 0 and < 1, got -0.1");
  EXPECT_EQ(ErrorOf("[flight]\nmach = 1.5\n" + kWing), "t.toml:2:8: flight: mach must be >= 0 and < 1, got 1.5");
  EXPECT_EQ(ErrorOf("[flight]\nalpha = { from = -4, to = 120, step = 2 }\n" + kWing),
            "t.toml:2:27: flight: alpha range: to must be between -90 and 90 deg, got 120");
  EXPECT_EQ(ErrorOf("[flight]\nalpha = { from = -4, step = 2 }\n" + kWing),
            "t.toml:2:9: flight: alpha range: missing required key \"to\"");
  EXPECT_EQ(ErrorOf("[flight]\nalpha = { from = 0, to = 4, step = 0.0 }\n" + kWing),
            "t.toml:2:36: flight: alpha range: step must be nonzero");
  EXPECT_EQ(ErrorOf("[flight]\nalpha = { from = 0, to = 4, step = -1 }\n" + kWing),
            "t.toml:2:36: flight: alpha range: step -1 goes away from to = 4; it must be positive to go from 0 to 4");
}

TEST(ReadCaseErrors, GroundNeedsItsHeight) {
  EXPECT_EQ(ErrorOf("[ground]\n" + kWing), "t.toml:1:1: ground: missing required key \"height_z\"");
  EXPECT_EQ(ErrorOf("[ground]\nheight_z = \"low\"\n" + kWing),
            "t.toml:2:12: ground: expected a number for \"height_z\", got a string");
  const Case c = Read("[ground]\nheight_z = -0.4\n" + kWing);
  EXPECT_TRUE(c.ground.enabled);
  EXPECT_EQ(c.ground.height_z, -0.4);
}

TEST(ReadCaseErrors, MeshCountsAndSpacings) {
  EXPECT_EQ(ErrorOf("[mesh]\nchordwise = 201\n" + kWing), "t.toml:2:13: mesh: chordwise must be an integer from 1 to 200, got 201");
  EXPECT_EQ(ErrorOf("[mesh]\nspanwise = 5001\n" + kWing), "t.toml:2:12: mesh: spanwise must be an integer from 1 to 5000, got 5001");
  EXPECT_EQ(ErrorOf("[mesh]\nspanwise = -3\n" + kWing), "t.toml:2:12: mesh: spanwise must be an integer from 1 to 5000, got -3");
  EXPECT_EQ(ErrorOf("[mesh]\nchordwise = 6.0\n" + kWing), "t.toml:2:13: mesh: expected an integer for \"chordwise\", got 6");
  EXPECT_EQ(ErrorOf("[mesh]\nchordwise_spacing = \"sin\"\n" + kWing),
            "t.toml:2:21: mesh: expected \"uniform\" or \"cosine\" for \"chordwise_spacing\", got \"sin\"");
  EXPECT_EQ(ErrorOf("[mesh]\nwake = 1\n" + kWing), "t.toml:2:8: mesh: expected a string for \"wake\", got an integer");
  EXPECT_EQ(ErrorOf("[[surface]]\nname = \"w\"\nspanwise_spacing = \"Sine\"\n"),
            "t.toml:3:20: surface \"w\": expected \"uniform\", \"cosine\" or \"sine\" for \"spanwise_spacing\", got "
            "\"Sine\" (did you mean \"sine\"?)");
}

TEST(ReadCaseErrors, SectionSpanwiseCounts) {
  EXPECT_EQ(ErrorOf(R"(
[[surface]]
name = "wing"
  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  chord = 0.3
  spanwise = 0
  [[surface.section]]
  leading_edge = [0.05, 1.2, 0.0]
  chord = 0.2
)"),
            "t.toml:7:14: surface \"wing\" section 1: spanwise must be an integer from 1 to 5000, got 0");
}

TEST(ReadCaseErrors, PanelGuardCountsBothHalves) {
  // 100 x 1000 x 2 = 200000 panels: at the limit; one more strip per half is over it.
  EXPECT_EQ(Read("[mesh]\nchordwise = 100\nspanwise = 1000\n" + kWing).surfaces[0].mesh.spanwise, 1000);
  EXPECT_EQ(ErrorOf("[mesh]\nchordwise = 100\nspanwise = 1001\n" + kWing),
            "t.toml:1:1: mesh: the case would have 200200 panels (both halves of symmetric surfaces counted), more "
            "than the limit of 200000; lower chordwise or spanwise");
}

TEST(ReadCaseErrors, SurfaceNames) {
  EXPECT_EQ(ErrorOf("[[surface]]\nname = \"\"\n"), "t.toml:2:8: surface \"\": name must not be empty");
  EXPECT_EQ(ErrorOf("[[surface]]\nname = 7\n"), "t.toml:2:8: surface 1: expected a string for \"name\", got an integer");
  EXPECT_EQ(ErrorOf("[[surface]]\nnmae = \"w\"\n"), "t.toml:2:1: surface 1: unknown key \"nmae\" (did you mean \"name\"?)");
}

TEST(ReadCaseErrors, SectionValues) {
  EXPECT_EQ(ErrorOf(kWing + "  twist = 91\n"),
            "t.toml:12:11: surface \"wing\" section 2: twist must be between -90 and 90 deg, got 91");
  EXPECT_EQ(ErrorOf(kWing + "  camber = 2412\n"),
            "t.toml:12:12: surface \"wing\" section 2: expected a string for \"camber\", got an integer");
  EXPECT_EQ(ErrorOf(kWing + "  camber = \"NACA 241\"\n"),
            "t.toml:12:12: surface \"wing\" section 2: expected \"flat\" or \"NACA\" and 4 digits (e.g. \"NACA 2412\") "
            "for \"camber\", got \"NACA 241\"");
  EXPECT_EQ(ErrorOf(R"(
[[surface]]
name = "wing"
  [[surface.section]]
  leading_edge = [0.0, 0.0, 0.0]
  [[surface.section]]
  leading_edge = [0.05, 1.2, 0.0]
  chord = 0.2
)"),
            "t.toml:4:3: surface \"wing\" section 1: missing required key \"chord\"");
}

TEST(ReadCaseErrors, SurfaceValues) {
  EXPECT_EQ(ErrorOf("[[surface]]\nname = \"w\"\nincidence = -95\n"),
            "t.toml:3:13: surface \"w\": incidence must be between -90 and 90 deg, got -95");
  EXPECT_EQ(ErrorOf("[[surface]]\nname = \"w\"\noffset = [0, 0, \"z\"]\n"),
            "t.toml:3:17: surface \"w\": expected a number for element 3 of \"offset\", got a string");
  EXPECT_EQ(ErrorOf("[[surface]]\nname = \"w\"\nsection = []\n"),
            "t.toml:3:11: surface \"w\": needs at least two [[surface.section]] (root and tip), got 0");
}

TEST(ReadCaseErrors, TrapezoidValues) {
  const std::string head = "[[surface]]\nname = \"w\"\n[surface.trapezoid]\nroot_leading_edge = [0, 0, 0]\n";
  EXPECT_EQ(ErrorOf(head + "span = 1\n"), "t.toml:3:1: surface \"w\" trapezoid: missing required key \"root_chord\"");
  EXPECT_EQ(ErrorOf(head + "span = -1\nroot_chord = 0.2\n"), "t.toml:5:8: surface \"w\" trapezoid: span must be > 0, got -1");
  EXPECT_EQ(ErrorOf(head + "span = 1\nroot_chord = 0.2\ndihedral = -85\n"),
            "t.toml:7:12: surface \"w\" trapezoid: dihedral must be strictly between -85 and 85 deg, got -85");
  EXPECT_EQ(ErrorOf(head + "span = 1\nroot_chord = 0.2\nvertical = 1\n"),
            "t.toml:7:12: surface \"w\" trapezoid: expected true or false for \"vertical\", got an integer");
  EXPECT_EQ(ErrorOf(head + "span = 1\nroot_chord = 0.2\nwashout = 100\n"),
            "t.toml:7:11: surface \"w\" trapezoid: washout must be between -90 and 90 deg, got 100");
  EXPECT_EQ(ErrorOf("[[surface]]\nname = \"w\"\n[surface.trapezoid]\nroot_leading_edge = [0, -0.5, 0]\nspan = 1\n"
                    "root_chord = 0.2\n"),
            "t.toml:4:21: surface \"w\" section 1: y = -0.5 is negative, but a symmetric surface is given for y >= 0 "
            "and mirrored (set symmetric = false to give the whole surface)");
}

TEST(ReadCaseErrors, SymmetricSurfaceMayTouchTheCentreLineWithinRoundOff) {
  const std::string text = R"(
[[surface]]
name = "wing"
  [[surface.section]]
  leading_edge = [0.0, -1e-13, 0.0]
  chord = 0.3
  [[surface.section]]
  leading_edge = [0.05, 1.2, 0.0]
  chord = 0.2
)";
  EXPECT_EQ(Read(text).surfaces[0].sections[0].leading_edge[1], -1e-13);
}

TEST(ReadCaseErrors, ControlValues) {
  const auto control = [](const std::string& keys) {
    return ErrorOf(kWing + "  [[surface.control]]\n  name = \"flap\"\n" + keys);
  };
  EXPECT_EQ(control("  hinge = 0\n"),
            "t.toml:14:11: surface \"wing\" control \"flap\": hinge must be strictly between 0 and 1 (a fraction of the "
            "chord), got 0");
  EXPECT_EQ(control("  span_fraction = [-0.1, 0.5]\n"),
            "t.toml:14:19: surface \"wing\" control \"flap\": span_fraction must be [start, end] with 0 <= start < end "
            "<= 1, got [-0.1, 0.5]");
  EXPECT_EQ(control("  span_fraction = [0.5, 1.01]\n"),
            "t.toml:14:19: surface \"wing\" control \"flap\": span_fraction must be [start, end] with 0 <= start < end "
            "<= 1, got [0.5, 1.01]");
  EXPECT_EQ(control("  span_fraction = [0.5]\n"),
            "t.toml:14:19: surface \"wing\" control \"flap\": expected an array of 2 numbers [start, end] for "
            "\"span_fraction\", got 1 values");
  EXPECT_EQ(control("  deflection = -91\n"),
            "t.toml:14:16: surface \"wing\" control \"flap\": deflection must be between -90 and 90 deg, got -91");
  EXPECT_EQ(ErrorOf(kWing + "  [[surface.control]]\n  hinge = 0.7\n"),
            "t.toml:12:3: surface \"wing\" control 1: missing required key \"name\"");
  EXPECT_EQ(ErrorOf(kWing + "  [[surface.control]]\n  name = \"flap\"\n  [[surface.control]]\n  name = \"flap\"\n"),
            "t.toml:15:10: surface \"wing\" control \"flap\": name already used by control \"flap\" of surface \"wing\" "
            "(line 12); surfaces and controls need distinct names");
  const Case c = Read(kWing + "  [[surface.control]]\n  name = \"flap\"\n");
  EXPECT_EQ(c.surfaces[0].controls[0].hinge, 0.75);  // defaults of case.hpp
  EXPECT_EQ(c.surfaces[0].controls[0].span_fraction, (std::array<double, 2>{0.0, 1.0}));
  EXPECT_FALSE(c.surfaces[0].controls[0].mirror_opposite);
}

TEST(ReadCaseErrors, TrimTargetsAndAdjust) {
  const std::string ctl = kWing + "  [[surface.control]]\n  name = \"flap\"\n";
  EXPECT_EQ(ErrorOf(kWing + "[trim]\nadjust = \"wing.incidence\"\n"),
            "t.toml:12:1: trim: missing the target: give lift_coefficient, or weight (N) with flight.speed");
  EXPECT_EQ(ErrorOf(kWing + "[trim]\nlift_coefficient = 0.4\n"), "t.toml:12:1: trim: missing required key \"adjust\"");
  EXPECT_EQ(ErrorOf("[flight]\nspeed = 15\n" + kWing + "[trim]\nweight = 0\nadjust = \"wing.incidence\"\n"),
            "t.toml:15:10: trim: weight must be > 0, got 0");
  EXPECT_EQ(ErrorOf(ctl + "[trim]\nlift_coefficient = 0.4\nadjust = \"flp.deflection\"\n"),
            "t.toml:16:10: trim: adjust \"flp.deflection\": no control named \"flp\" (did you mean \"flap\"?)");
  EXPECT_EQ(ErrorOf(ctl + "[trim]\nlift_coefficient = 0.4\nadjust = \"wing.deflection\"\n"),
            "t.toml:16:10: trim: adjust \"wing.deflection\": no control named \"wing\"");
  EXPECT_EQ(ErrorOf(ctl + "[trim]\nlift_coefficient = 0.4\nadjust = \"flap.twist\"\n"),
            "t.toml:16:10: trim: expected \"<surface>.incidence\" or \"<control>.deflection\" for \"adjust\", got "
            "\"flap.twist\"");
  const Case c = Read("[flight]\nspeed = 15\n" + ctl + "[trim]\nweight = 40\nadjust = \"flap.deflection\"\n");
  EXPECT_TRUE(c.trim.enabled);
  EXPECT_EQ(c.trim.weight, 40.0);
  EXPECT_FALSE(c.trim.lift_coefficient.has_value());
  EXPECT_EQ(c.trim.adjust, "flap.deflection");
  EXPECT_EQ(c.trim.where.line, 16);
}

// ---- files --------------------------------------------------------------------------------------------------

TEST(ReadCaseFile, ReadsAFileAndRecordsItsPath) {
  const std::filesystem::path p = std::filesystem::temp_directory_path() / "skein_reader_test_case.toml";
  {
    std::ofstream out(p);
    out << kWing;
  }
  const Case c = ReadCaseFile(p.string());
  EXPECT_EQ(c.source_path, p.string());
  EXPECT_EQ(c.title, "skein_reader_test_case");
  std::filesystem::remove(p);
}

TEST(ReadCaseFile, ErrorsNameThePathAsGiven) {
  const std::filesystem::path p = std::filesystem::temp_directory_path() / "skein_reader_test_bad.toml";
  {
    std::ofstream out(p);
    out << "[flight]\nmach = 2\n" << kWing;
  }
  try {
    ReadCaseFile(p.string());
    FAIL() << "no error";
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), p.string() + ":2:8: flight: mach must be >= 0 and < 1, got 2");
    EXPECT_EQ(e.file(), p.string());
  }
  std::filesystem::remove(p);
}

TEST(ReadCaseFile, MissingFileIsAnInputError) {
  try {
    ReadCaseFile("/nonexistent/skein/none.toml");
    FAIL() << "no error";
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), "/nonexistent/skein/none.toml: cannot open the case file: No such file or directory");
  }
  try {
    ReadCaseFile(std::filesystem::temp_directory_path().string());
    FAIL() << "no error";
  } catch (const InputError& e) {
    EXPECT_EQ(e.message(), "cannot read the case file: it is a directory");
  }
}

// ---- the echo ---------------------------------------------------------------------------------------------------

void ExpectNear(const Vec3& a, const Vec3& b, const std::string& what) {
  for (std::size_t i = 0; i < 3; ++i) EXPECT_NEAR(a[i], b[i], kRoundTrip) << what << "[" << i << "]";
}

void ExpectSameMesh(const MeshOptions& a, const MeshOptions& b) {
  EXPECT_EQ(a.chordwise, b.chordwise);
  EXPECT_EQ(a.spanwise, b.spanwise);
  EXPECT_EQ(a.chordwise_spacing, b.chordwise_spacing);
  EXPECT_EQ(a.spanwise_spacing, b.spanwise_spacing);
  EXPECT_EQ(a.wake, b.wake);
}

void ExpectSameCase(const Case& a, const Case& b) {
  EXPECT_EQ(a.title, b.title);
  EXPECT_NEAR(a.reference.area, b.reference.area, kRoundTrip);
  EXPECT_NEAR(a.reference.span, b.reference.span, kRoundTrip);
  EXPECT_NEAR(a.reference.chord, b.reference.chord, kRoundTrip);
  ExpectNear(a.reference.moment_point, b.reference.moment_point, "moment_point");
  EXPECT_EQ(a.reference.area_given, b.reference.area_given);
  EXPECT_EQ(a.reference.span_given, b.reference.span_given);
  EXPECT_EQ(a.reference.chord_given, b.reference.chord_given);
  ASSERT_EQ(a.flight.alpha_deg.size(), b.flight.alpha_deg.size());
  for (std::size_t i = 0; i < a.flight.alpha_deg.size(); ++i)
    EXPECT_NEAR(a.flight.alpha_deg[i], b.flight.alpha_deg[i], kRoundTrip);
  ASSERT_EQ(a.flight.beta_deg.size(), b.flight.beta_deg.size());
  for (std::size_t i = 0; i < a.flight.beta_deg.size(); ++i)
    EXPECT_NEAR(a.flight.beta_deg[i], b.flight.beta_deg[i], kRoundTrip);
  EXPECT_NEAR(a.flight.speed, b.flight.speed, kRoundTrip);
  EXPECT_EQ(a.flight.speed_given, b.flight.speed_given);
  EXPECT_NEAR(a.flight.density, b.flight.density, kRoundTrip);
  EXPECT_NEAR(a.flight.mach, b.flight.mach, kRoundTrip);
  ExpectNear(a.flight.rates, b.flight.rates, "rates");
  EXPECT_EQ(a.ground.enabled, b.ground.enabled);
  EXPECT_NEAR(a.ground.height_z, b.ground.height_z, kRoundTrip);
  ExpectSameMesh(a.mesh, b.mesh);
  ASSERT_EQ(a.surfaces.size(), b.surfaces.size());
  for (std::size_t k = 0; k < a.surfaces.size(); ++k) {
    const Surface &sa = a.surfaces[k], &sb = b.surfaces[k];
    SCOPED_TRACE("surface " + sa.name);
    EXPECT_EQ(sa.name, sb.name);
    EXPECT_EQ(sa.symmetric, sb.symmetric);
    EXPECT_NEAR(sa.incidence_deg, sb.incidence_deg, kRoundTrip);
    ExpectSameMesh(sa.mesh, sb.mesh);
    ASSERT_EQ(sa.sections.size(), sb.sections.size());
    for (std::size_t j = 0; j < sa.sections.size(); ++j) {
      const Section &xa = sa.sections[j], &xb = sb.sections[j];
      ExpectNear(xa.leading_edge, xb.leading_edge, "leading_edge");
      EXPECT_NEAR(xa.chord, xb.chord, kRoundTrip);
      EXPECT_NEAR(xa.twist_deg, xb.twist_deg, kRoundTrip);
      EXPECT_EQ(xa.camber.kind, xb.camber.kind);
      EXPECT_EQ(xa.camber.spelling, xb.camber.spelling);
      EXPECT_NEAR(xa.camber.max_camber, xb.camber.max_camber, kRoundTrip);
      EXPECT_NEAR(xa.camber.max_camber_position, xb.camber.max_camber_position, kRoundTrip);
      EXPECT_EQ(xa.spanwise, xb.spanwise);
    }
    ASSERT_EQ(sa.controls.size(), sb.controls.size());
    for (std::size_t j = 0; j < sa.controls.size(); ++j) {
      const Control &ca = sa.controls[j], &cb = sb.controls[j];
      EXPECT_EQ(ca.name, cb.name);
      EXPECT_NEAR(ca.hinge, cb.hinge, kRoundTrip);
      EXPECT_NEAR(ca.span_fraction[0], cb.span_fraction[0], kRoundTrip);
      EXPECT_NEAR(ca.span_fraction[1], cb.span_fraction[1], kRoundTrip);
      EXPECT_NEAR(ca.deflection_deg, cb.deflection_deg, kRoundTrip);
      EXPECT_EQ(ca.mirror_opposite, cb.mirror_opposite);
    }
  }
  EXPECT_EQ(a.trim.enabled, b.trim.enabled);
  EXPECT_EQ(a.trim.lift_coefficient, b.trim.lift_coefficient);
  EXPECT_EQ(a.trim.weight, b.trim.weight);
  EXPECT_EQ(a.trim.adjust, b.trim.adjust);
  EXPECT_EQ(a.warnings.size(), b.warnings.size());
}

std::string Echo(const Case& c) {
  std::ostringstream out;
  WriteCaseToml(c, out);
  return out.str();
}

TEST(Echo, RoundTripsTheContractExample) {
  const Case c = Read(kSurvey);
  const std::string echo = Echo(c);
  const Case back = ReadCaseText(echo, "echo.toml");
  ExpectSameCase(c, back);
  EXPECT_EQ(Echo(back), echo);  // normalised: echoing the echo changes nothing
}

TEST(Echo, ExpandsTrapezoidsAndAppliesOffsets) {
  const Case c = Read(kSurvey);
  const std::string echo = Echo(c);
  EXPECT_EQ(echo.find("[surface.trapezoid]"), std::string::npos);
  EXPECT_NE(echo.find("leading_edge = [1.1, 0.0, 0.05]"), std::string::npos) << echo;
  const Case shifted = Read("[[surface]]\nname = \"w\"\noffset = [1, 0, 0]\n[surface.trapezoid]\n"
                            "root_leading_edge = [0, 0, 0]\nspan = 2\nroot_chord = 0.3\n");
  const std::string e2 = Echo(shifted);
  EXPECT_NE(e2.find("offset = [0.0, 0.0, 0.0]"), std::string::npos) << e2;
  EXPECT_NE(e2.find("leading_edge = [1.0, 0.0, 0.0]"), std::string::npos) << e2;
  const Case back = ReadCaseText(e2, "echo.toml");
  EXPECT_EQ(back.surfaces[0].sections[0].leading_edge, (Vec3{1.0, 0.0, 0.0}));
}

TEST(Echo, KeepsDefaultsAsDefaults) {
  // Reference values and speed that were not given are echoed as comments, so they stay "not given".
  const Case c = Read("[flight]\nalpha = { from = 0, to = 1, step = 0.1 }\nmach = 0.8\n" + kWing);
  const std::string echo = Echo(c);
  EXPECT_NE(echo.find("# area = "), std::string::npos) << echo;
  EXPECT_NE(echo.find("# speed not given"), std::string::npos) << echo;
  EXPECT_NE(echo.find("# warning: t.toml:3:8: flight: mach 0.8"), std::string::npos) << echo;
  ExpectSameCase(c, ReadCaseText(echo, "echo.toml"));
}

TEST(Echo, RoundTripsEveryOptionalPart) {
  const Case c = Read(R"(title = "odd \"quoted\" title\twith tab"
[reference]
moment_point = [0.1, 0.0, -0.02]
[flight]
alpha = [-2, 0, 2.5]
beta = [1e-7, 3]
speed = 33.3
density = 0.9
mach = 0.3
rates = [0.1, -0.2, 0.3]
[ground]
height_z = -0.7
[mesh]
chordwise = 5
spanwise = 9
chordwise_spacing = "uniform"
spanwise_spacing = "sine"
wake = "x-axis"
[[surface]]
name = "fin"
symmetric = false
incidence = 0.5
spanwise = 7
  [[surface.section]]
  leading_edge = [1.0, 0.0, 0.0]
  chord = 0.3
  twist = 1.25
  camber = "naca0009"
  spanwise = 3
  [[surface.section]]
  leading_edge = [1.1, 0.0, 0.2]
  chord = 0.25
  [[surface.section]]
  leading_edge = [1.2, 0.0, 0.4]
  chord = 0.2
  camber = "NACA 4412"
  [[surface.control]]
  name = "rudder"
  hinge = 0.7
  span_fraction = [0.1, 0.9]
  deflection = -5
[trim]
weight = 12.5
adjust = "rudder.deflection"
)");
  const Case back = ReadCaseText(Echo(c), "echo.toml");
  ExpectSameCase(c, back);
  EXPECT_EQ(back.title, "odd \"quoted\" title\twith tab");
  EXPECT_EQ(back.flight.beta_deg[0], 1e-7);
}

}  // namespace
}  // namespace skein
