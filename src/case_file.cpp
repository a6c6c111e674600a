// Skein stage 1, read: TOML case file -> Case (case_file.hpp). The rules are case-format.md's.
//
// Every message has one shape, so a user learns to read it once:
//   file:line:column: <where in the case>: <what is wrong, and what was expected>
// with <where in the case> one of `reference`, `flight`, `flight: alpha range`, `ground`, `mesh`,
// `surface "wing"`, `surface "wing" section 2`, `surface "tail" trapezoid`, `surface "wing" control "aileron"`,
// `trim`, `probe "pitot"` (nothing for the top level). Positions point at the offending key (unknown keys) or
// value (wrong type, out of range), or at the table's header when a key is missing.
#include "skein/case_file.hpp"

#include "skein/airfoil.hpp"
#include "skein/atmosphere.hpp"

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <map>
#include <ostream>
#include <sstream>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include <fmt/format.h>
#include <toml++/toml.h>

namespace skein {
namespace {

// ---- limits and tolerances of the reader ------------------------------------------------------------------

/// Angles of attack, sideslip, twist, incidence, washout and deflection: |angle| <= 90 deg. Beyond that the
/// geometry folds over and the attached-flow model means nothing.
constexpr double kMaxAngleDeg = 90.0;
/// Sweep and dihedral of a trapezoid: |angle| < 85 deg, since the tip is placed with tan(angle).
constexpr double kMaxSweepDeg = 85.0;
/// Points in one angle list or range.
constexpr std::int64_t kMaxSweepPoints = 1000;
/// Total panels of a case (both halves of symmetric surfaces): a sanity bound on a typo such as
/// `spanwise = 50000`, not the memory check proper (that lives with the solver).
constexpr std::int64_t kMaxTotalPanels = 200000;
/// Above this Mach number the Prandtl-Glauert correction is far from its small-disturbance ground.
constexpr double kMachWarning = 0.7;
/// m: a symmetric surface may touch y = 0 within round-off of its coordinates.
constexpr double kSymmetryPlaneTolerance = 1e-12;
/// Fraction of the local chord: a segment shorter than this in the yz plane is degenerate.
constexpr double kZeroSegmentTolerance = 1e-9;
/// Fraction of |step|: a range end this close to a step is included.
constexpr double kRangeEndTolerance = 1e-9;
/// Relative: speed and mach given together with altitude must agree this closely (0.5 %, the spread of
/// rounding a mach number to two or three figures).
constexpr double kSpeedMachTolerance = 5e-3;

// ---- small text helpers ---------------------------------------------------------------------------------------

/// A string in TOML basic-string form: quotes, backslashes and control characters escaped.
std::string TomlString(std::string_view s) {
  std::string out = "\"";
  for (char ch : s) {
    const auto u = static_cast<unsigned char>(ch);
    switch (ch) {
      case '"': out += "\\\""; break;
      case '\\': out += "\\\\"; break;
      case '\b': out += "\\b"; break;
      case '\t': out += "\\t"; break;
      case '\n': out += "\\n"; break;
      case '\f': out += "\\f"; break;
      case '\r': out += "\\r"; break;
      default:
        if (u < 0x20 || u == 0x7f)
          out += fmt::format("\\u{:04X}", static_cast<unsigned>(u));
        else
          out += ch;
    }
  }
  return out + "\"";
}

/// Text made safe for a one-line message: control characters shown as escapes (the TOML parser's descriptions
/// quote what it saw, which may be a newline).
std::string OneLine(std::string_view s) {
  std::string out;
  for (char ch : s) {
    const auto u = static_cast<unsigned char>(ch);
    if (u < 0x20 || u == 0x7f)
      out += fmt::format("\\u{:04X}", static_cast<unsigned>(u));
    else
      out += ch;
  }
  return out;
}

/// A user's string quoted for a one-line message (escaped, and cut short if it is long).
std::string Quote(std::string_view s) {
  constexpr std::size_t kMaxShown = 60;
  if (s.size() <= kMaxShown) return TomlString(s);
  std::size_t cut = kMaxShown;
  while (cut > 0 && (static_cast<unsigned char>(s[cut]) & 0xC0) == 0x80) --cut;  // keep UTF-8 whole
  return TomlString(s.substr(0, cut)) + "...";
}

/// A number as the shortest text that reads back to the same double, always with a decimal point or an
/// exponent so TOML reads it as a float.
std::string Num(double v) {
  std::string s = fmt::format("{}", v);
  if (s.find_first_of(".eEn") == std::string::npos) s += ".0";  // 'n': inf and nan
  return s;
}

std::string Vec(const Vec3& v) { return fmt::format("[{}, {}, {}]", Num(v[0]), Num(v[1]), Num(v[2])); }

std::string Lower(std::string_view s) {
  std::string out(s);
  for (char& ch : out)
    if (ch >= 'A' && ch <= 'Z') ch = static_cast<char>(ch - 'A' + 'a');
  return out;
}

/// Optimal string alignment distance (Levenshtein with adjacent transpositions), case-insensitive.
std::size_t EditDistance(std::string_view a_in, std::string_view b_in) {
  const std::string a = Lower(a_in), b = Lower(b_in);
  const std::size_t n = a.size(), m = b.size();
  std::vector<std::vector<std::size_t>> d(n + 1, std::vector<std::size_t>(m + 1, 0));
  for (std::size_t i = 0; i <= n; ++i) d[i][0] = i;
  for (std::size_t j = 0; j <= m; ++j) d[0][j] = j;
  for (std::size_t i = 1; i <= n; ++i)
    for (std::size_t j = 1; j <= m; ++j) {
      const std::size_t cost = a[i - 1] == b[j - 1] ? 0 : 1;
      d[i][j] = std::min({d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost});
      if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1])
        d[i][j] = std::min(d[i][j], d[i - 2][j - 2] + 1);
    }
  return d[n][m];
}

/// The closest candidate to `word` if it is close enough to be a slip of the keyboard: within 1 edit for
/// short words, 2 for words of six letters or more. Empty if none.
std::string ClosestSpelling(std::string_view word, const std::vector<std::string_view>& candidates) {
  if (word.size() > 64) return "";  // nobody mistypes a 65-letter key; and the distance table stays small
  std::string best;
  std::size_t best_d = 0;
  for (std::string_view c : candidates) {
    const std::size_t limit = c.size() >= 6 ? 2 : 1;
    const std::size_t dist = EditDistance(word, c);
    if (dist <= limit && (best.empty() || dist < best_d)) {
      best = std::string(c);
      best_d = dist;
    }
  }
  return best;
}

/// "a", "a or b", "a, b or c" with each item quoted.
std::string OneOf(const std::vector<std::string_view>& items) {
  std::string out;
  for (std::size_t i = 0; i < items.size(); ++i) {
    if (i > 0) out += i + 1 == items.size() ? " or " : ", ";
    out += TomlString(items[i]);
  }
  return out;
}

const char* TypeName(const toml::node& n) {
  switch (n.type()) {
    case toml::node_type::table: return "a table";
    case toml::node_type::array: return "an array";
    case toml::node_type::string: return "a string";
    case toml::node_type::integer: return "an integer";
    case toml::node_type::floating_point: return "a floating-point number";
    case toml::node_type::boolean: return "a boolean";
    case toml::node_type::date: return "a date";
    case toml::node_type::time: return "a time";
    case toml::node_type::date_time: return "a date-time";
    case toml::node_type::none: break;
  }
  return "nothing";
}

SourceRegion Where(const toml::source_region& r) {
  return {static_cast<int>(r.begin.line), static_cast<int>(r.begin.column)};
}

bool Before(const SourceRegion& a, const SourceRegion& b) {
  return a.line < b.line || (a.line == b.line && a.column < b.column);
}

std::string Key(std::string_view key) { return TomlString(key); }

// ---- the keys valid at each level, for unknown-key errors and their hints -------------------------------------

struct Level {
  std::string_view place;  ///< where the keys go, as a user would say it: "in [[surface.section]]"
  std::vector<std::string_view> keys;
  /// Keys a user plausibly writes here by mistake, with the hint to give.
  std::vector<std::pair<std::string_view, std::string_view>> misplaced = {};
};

const Level kRootLevel{"at the top of the file, before any table", {"title", "reference", "flight", "ground", "mesh", "surface", "trim", "probe"}};
const Level kReferenceLevel{"in [reference]", {"area", "span", "chord", "moment_point"}};
const Level kFlightLevel{"in [flight]",
                         {"alpha", "beta", "speed", "density", "mach", "rates", "altitude"},
                         {{"velocity", "did you mean \"speed\"?"},
                          {"rho", "did you mean \"density\"?"},
                          {"height", "did you mean \"altitude\"?"}}};
const Level kRangeLevel{"in a range table { from, to, step }", {"from", "to", "step"}};
const Level kGroundLevel{"in [ground]", {"height_z"}};
const Level kMeshLevel{"in [mesh]", {"chordwise", "spanwise", "chordwise_spacing", "spanwise_spacing", "wake"}};
const Level kSurfaceLevel{"in [[surface]]",
                          {"name", "symmetric", "incidence", "offset", "chordwise", "spanwise", "chordwise_spacing",
                           "spanwise_spacing", "section", "trapezoid", "control"},
                          {{"wake", "the wake direction is set once for the whole case, in [mesh]"},
                           {"sections", "write each section as a [[surface.section]] table"}}};
const Level kSectionLevel{"in [[surface.section]]",
                          {"leading_edge", "chord", "twist", "camber", "spanwise", "polar", "cl_max", "thickness",
                           "transition"},
                          {{"root_chord", "did you mean \"chord\"?"},
                           {"root_leading_edge", "did you mean \"leading_edge\"?"},
                           {"wake", "the wake direction is set once for the whole case, in [mesh]"}}};
const Level kTrapezoidLevel{"in [surface.trapezoid]",
                            {"root_leading_edge", "span", "root_chord", "taper", "sweep", "dihedral", "washout",
                             "camber", "vertical", "polar", "cl_max", "thickness", "transition"},
                            {{"chord", "did you mean \"root_chord\"?"},
                             {"leading_edge", "did you mean \"root_leading_edge\"?"},
                             {"twist", "a trapezoid's twist is set by \"washout\" (tip twist = -washout)"},
                             {"tip_chord", "the tip chord is set by \"taper\" (tip chord / root chord)"},
                             {"wake", "the wake direction is set once for the whole case, in [mesh]"}}};
const Level kPolarLevel{"in a polar table { cl = [...], cd = [...] }", {"cl", "cd"}};
const Level kControlLevel{"in [[surface.control]]", {"name", "hinge", "span_fraction", "deflection", "mirror"}};
const Level kTrimLevel{"in [trim]", {"lift_coefficient", "weight", "adjust"}};
const Level kProbeLevel{"in [[probe]]",
                        {"name", "point"},
                        {{"position", "did you mean \"point\"?"},
                         {"location", "did you mean \"point\"?"},
                         {"leading_edge", "a probe is one point: write point = [x, y, z]"}}};

const std::vector<const Level*> kAllLevels = {&kRootLevel,    &kReferenceLevel, &kFlightLevel,
                                              &kRangeLevel,   &kGroundLevel,    &kMeshLevel,
                                              &kSurfaceLevel, &kSectionLevel,   &kTrapezoidLevel,
                                              &kControlLevel, &kTrimLevel,      &kPolarLevel,
                                              &kProbeLevel};

/// The "(...)" hint for an unknown key, or "" if nothing useful can be said.
std::string UnknownKeyHint(std::string_view key, const Level& here) {
  for (const auto& [wrong, hint] : here.misplaced)
    if (key == wrong) return fmt::format(" ({})", hint);
  const std::string close = ClosestSpelling(key, here.keys);
  if (!close.empty()) return fmt::format(" (did you mean {}?)", Key(close));
  std::vector<std::string_view> elsewhere;
  for (const Level* level : kAllLevels)
    if (level != &here && std::find(level->keys.begin(), level->keys.end(), key) != level->keys.end())
      elsewhere.push_back(level->place);
  if (elsewhere.empty()) return "";
  std::string where_list;
  for (std::size_t i = 0; i < elsewhere.size(); ++i) {
    if (i > 0) where_list += i + 1 == elsewhere.size() ? " or " : ", ";
    where_list += elsewhere[i];
  }
  return fmt::format(" (it belongs {})", where_list);
}

// ---- the reader -------------------------------------------------------------------------------------------------

/// A section as read, with where its leading edge was written (for geometry errors).
struct ReadSection {
  Section section;
  SourceRegion leading_edge_where;
};

class Reader {
 public:
  explicit Reader(std::string file) : file_(std::move(file)) {}

  Case Read(std::string_view text);

 private:
  // -- failing and warning --
  [[noreturn]] void Fail(SourceRegion where, const std::string& ctx, const std::string& msg) const {
    throw InputError(file_, where, ctx.empty() ? msg : ctx + ": " + msg);
  }
  [[noreturn]] void Fail(const toml::node& at, const std::string& ctx, const std::string& msg) const {
    Fail(Where(at.source()), ctx, msg);
  }
  void Warn(SourceRegion where, const std::string& ctx, const std::string& msg) {
    warnings_.push_back(InputError(file_, where, ctx.empty() ? msg : ctx + ": " + msg).what());
  }

  // -- keys and values --
  void CheckKeys(const toml::table& t, const Level& level, const std::string& ctx) const;
  const toml::node& Require(const toml::table& t, std::string_view key, const std::string& ctx) const;
  double NumberAt(const toml::node& n, const std::string& label, const std::string& ctx) const;
  std::int64_t IntegerAt(const toml::node& n, const std::string& label, const std::string& ctx) const;
  bool BooleanAt(const toml::node& n, const std::string& label, const std::string& ctx) const;
  std::string StringAt(const toml::node& n, const std::string& label, const std::string& ctx) const;
  Vec3 Vec3At(const toml::node& n, const std::string& label, const std::string& ctx) const;
  const toml::table& TableAt(const toml::node& n, const std::string& label, const std::string& ctx,
                             std::string_view hint = {}) const;
  const toml::array& TableArrayAt(const toml::node& n, const std::string& label, const std::string& ctx,
                                  std::string_view hint) const;

  /// Optional number with a default; `check` returns "" or the rule broken (e.g. "must be > 0").
  template <typename Check>
  double Number(const toml::table& t, std::string_view key, const std::string& ctx, double dflt,
                Check check) const;
  template <typename Check>
  double RequiredNumber(const toml::table& t, std::string_view key, const std::string& ctx, Check check) const;
  int Count(const toml::table& t, std::string_view key, const std::string& ctx, int dflt, int max) const;
  Spacing SpacingKey(const toml::table& t, std::string_view key, const std::string& ctx, Spacing dflt,
                     bool allow_sine) const;
  Camber CamberAt(const toml::node& n, const std::string& ctx) const;
  SectionViscousData ViscousKeys(const toml::table& t, const std::string& ctx) const;

  // -- tables --
  void ReadReference(const toml::table& t, Reference& r) const;
  void ReadFlight(const toml::table& t, Flight& f);
  std::vector<double> ReadAngles(const toml::node& n, std::string_view key, const std::string& ctx) const;
  void ReadMesh(const toml::table& t, MeshOptions& m) const;
  void ReadSurfaceMesh(const toml::table& t, const std::string& ctx, MeshOptions& m) const;
  Surface ReadSurface(const toml::table& t, int index, const MeshOptions& case_mesh);
  ReadSection ReadSectionTable(const toml::table& t, const std::string& ctx, const Vec3& offset,
                               bool last) const;
  std::vector<ReadSection> ReadTrapezoid(const toml::table& t, const std::string& ctx, const Surface& s) const;
  void CheckGeometry(const Surface& s, const std::vector<ReadSection>& sections, const std::string& ctx) const;
  Control ReadControl(const toml::table& t, int index, const std::string& surface_ctx, bool symmetric) const;
  void ReadTrim(const toml::table& t, const Case& c, TrimRequest& trim) const;
  void ReadProbes(const toml::node& n, Case& c) const;

  std::string file_;
  std::vector<std::string> warnings_;
};

// ---- keys and values --------------------------------------------------------------------------------------------

void Reader::CheckKeys(const toml::table& t, const Level& level, const std::string& ctx) const {
  const toml::key* first = nullptr;
  for (auto&& [k, v] : t) {
    if (std::find(level.keys.begin(), level.keys.end(), k.str()) != level.keys.end()) continue;
    if (first == nullptr || Before(Where(k.source()), Where(first->source()))) first = &k;
  }
  if (first == nullptr) return;
  Fail(Where(first->source()), ctx,
       fmt::format("unknown key {}{}", Quote(first->str()), UnknownKeyHint(first->str(), level)));
}

const toml::node& Reader::Require(const toml::table& t, std::string_view key, const std::string& ctx) const {
  if (const toml::node* n = t.get(key)) return *n;
  Fail(t, ctx, fmt::format("missing required key {}", Key(key)));
}

double Reader::NumberAt(const toml::node& n, const std::string& label, const std::string& ctx) const {
  if (const auto* i = n.as_integer()) return static_cast<double>(i->get());
  if (const auto* f = n.as_floating_point()) {
    const double v = f->get();
    if (!std::isfinite(v)) Fail(n, ctx, fmt::format("expected a finite number for {}, got {}", label, v));
    return v;
  }
  Fail(n, ctx, fmt::format("expected a number for {}, got {}", label, TypeName(n)));
}

std::int64_t Reader::IntegerAt(const toml::node& n, const std::string& label, const std::string& ctx) const {
  if (const auto* i = n.as_integer()) return i->get();
  if (const auto* f = n.as_floating_point())
    Fail(n, ctx, fmt::format("expected an integer for {}, got {}", label, f->get()));
  Fail(n, ctx, fmt::format("expected an integer for {}, got {}", label, TypeName(n)));
}

bool Reader::BooleanAt(const toml::node& n, const std::string& label, const std::string& ctx) const {
  if (const auto* b = n.as_boolean()) return b->get();
  Fail(n, ctx, fmt::format("expected true or false for {}, got {}", label, TypeName(n)));
}

std::string Reader::StringAt(const toml::node& n, const std::string& label, const std::string& ctx) const {
  if (const auto* s = n.as_string()) return s->get();
  Fail(n, ctx, fmt::format("expected a string for {}, got {}", label, TypeName(n)));
}

Vec3 Reader::Vec3At(const toml::node& n, const std::string& label, const std::string& ctx) const {
  const toml::array* a = n.as_array();
  if (a == nullptr) Fail(n, ctx, fmt::format("expected an array of 3 numbers for {}, got {}", label, TypeName(n)));
  if (a->size() != 3)
    Fail(n, ctx, fmt::format("expected an array of 3 numbers for {}, got {} values", label, a->size()));
  Vec3 v{};
  for (std::size_t i = 0; i < 3; ++i) v[i] = NumberAt((*a)[i], fmt::format("element {} of {}", i + 1, label), ctx);
  return v;
}

const toml::table& Reader::TableAt(const toml::node& n, const std::string& label, const std::string& ctx,
                                   std::string_view hint) const {
  if (const toml::table* t = n.as_table()) return *t;
  Fail(n, ctx, fmt::format("expected a table for {}{}, got {}", label, hint, TypeName(n)));
}

const toml::array& Reader::TableArrayAt(const toml::node& n, const std::string& label, const std::string& ctx,
                                        std::string_view hint) const {
  const toml::array* a = n.as_array();
  if (a == nullptr) Fail(n, ctx, fmt::format("expected an array of tables for {}{}, got {}", label, hint, TypeName(n)));
  for (const toml::node& e : *a)
    if (!e.is_table())
      Fail(e, ctx, fmt::format("expected an array of tables for {}{}, got an element that is {}", label, hint,
                               TypeName(e)));
  return *a;
}

template <typename Check>
double Reader::Number(const toml::table& t, std::string_view key, const std::string& ctx, double dflt,
                      Check check) const {
  const toml::node* n = t.get(key);
  if (n == nullptr) return dflt;
  const double v = NumberAt(*n, Key(key), ctx);
  const std::string broken = check(v);
  if (!broken.empty()) Fail(*n, ctx, fmt::format("{} {}, got {}", key, broken, v));
  return v;
}

template <typename Check>
double Reader::RequiredNumber(const toml::table& t, std::string_view key, const std::string& ctx,
                              Check check) const {
  Require(t, key, ctx);
  return Number(t, key, ctx, 0.0, check);
}

// The range rules, as checks for Number().
auto Positive() {
  return [](double v) { return v > 0.0 ? std::string() : std::string("must be > 0"); };
}
auto AnyValue() {
  return [](double) { return std::string(); };
}
auto AngleWithin(double limit) {
  return [limit](double v) {
    return std::abs(v) <= limit ? std::string() : fmt::format("must be between {} and {} deg", -limit, limit);
  };
}
auto AngleBelow(double limit) {
  return [limit](double v) {
    return std::abs(v) < limit ? std::string() : fmt::format("must be strictly between {} and {} deg", -limit, limit);
  };
}

int Reader::Count(const toml::table& t, std::string_view key, const std::string& ctx, int dflt, int max) const {
  const toml::node* n = t.get(key);
  if (n == nullptr) return dflt;
  const std::int64_t v = IntegerAt(*n, Key(key), ctx);
  if (v < 1 || v > max) Fail(*n, ctx, fmt::format("{} must be an integer from 1 to {}, got {}", key, max, v));
  return static_cast<int>(v);
}

Spacing Reader::SpacingKey(const toml::table& t, std::string_view key, const std::string& ctx, Spacing dflt,
                           bool allow_sine) const {
  const toml::node* n = t.get(key);
  if (n == nullptr) return dflt;
  const std::string s = StringAt(*n, Key(key), ctx);
  std::vector<std::string_view> valid = {"uniform", "cosine"};
  if (allow_sine) valid.push_back("sine");
  const std::optional<Spacing> sp = SpacingFromString(s);
  if (sp && (allow_sine || *sp != Spacing::sine)) return *sp;
  if (sp)  // "sine" along the chord
    Fail(*n, ctx, fmt::format("\"sine\" spacing is for spanwise_spacing only; expected {} for {}", OneOf(valid),
                              Key(key)));
  const std::string close = ClosestSpelling(s, valid);
  Fail(*n, ctx, fmt::format("expected {} for {}, got {}{}", OneOf(valid), Key(key), Quote(s),
                            close.empty() ? "" : fmt::format(" (did you mean {}?)", Key(close))));
}

// "flat" or a NACA 4-digit designation: "NACA 2412", "naca2412" (case-insensitive, optional spaces).
Camber Reader::CamberAt(const toml::node& n, const std::string& ctx) const {
  const std::string s = StringAt(n, "\"camber\"", ctx);
  const std::string lower = Lower(s);
  Camber c;
  if (lower == "flat") return c;
  if (lower.rfind("naca", 0) == 0) {
    std::string_view digits(s);
    digits.remove_prefix(4);
    while (!digits.empty() && (digits.front() == ' ' || digits.front() == '\t')) digits.remove_prefix(1);
    const bool all_digits =
        !digits.empty() && std::all_of(digits.begin(), digits.end(), [](char ch) { return ch >= '0' && ch <= '9'; });
    if (all_digits && digits.size() == 5)
      Fail(n, ctx, fmt::format("camber {}: 5-digit NACA mean lines are not supported yet; use \"flat\" or a "
                               "4-digit \"NACA dddd\"",
                               Quote(s)));
    if (all_digits && digits.size() == 4) {
      const int m = digits[0] - '0', p = digits[1] - '0';
      if (m > 0 && p == 0)
        Fail(n, ctx, fmt::format("camber {}: the second digit (position of the maximum camber, in tenths of the "
                                 "chord) must be 1 to 9 when the first digit is not 0",
                                 Quote(s)));
      c.kind = Camber::Kind::naca4;
      c.max_camber = m / 100.0;
      c.max_camber_position = p / 10.0;
      c.spelling = "NACA " + std::string(digits);
      return c;
    }
  } else if (s.find_first_of("./\\") != std::string::npos) {
    // A coordinate file, relative to the case file's directory (airfoil.hpp).
    namespace fs = std::filesystem;
    fs::path where(s);
    if (where.is_relative()) where = fs::path(file_).parent_path() / where;
    std::error_code ec;
    const fs::path absolute = fs::absolute(where, ec);
    const std::string resolved = (ec ? where : absolute).lexically_normal().string();
    try {
      return MeanLineFromCoordinates(ReadAirfoilCoordinates(resolved, s), resolved);
    } catch (const InputError& e) {
      Fail(n, ctx, fmt::format("camber {}: {}", Quote(s), e.what()));
    }
  }
  Fail(n, ctx,
       fmt::format("expected \"flat\" or \"NACA\" and 4 digits (e.g. \"NACA 2412\") for \"camber\", got {}", Quote(s)));
}

// polar = { cl = [...], cd = [...] }, cl_max, thickness, transition: strip-theory data of a section.
SectionViscousData Reader::ViscousKeys(const toml::table& t, const std::string& ctx) const {
  SectionViscousData v;
  if (const toml::node* n = t.get("polar")) {
    const std::string pctx = ctx + " polar";
    const toml::table& pt = TableAt(*n, "\"polar\"", ctx, " (write polar = { cl = [...], cd = [...] })");
    CheckKeys(pt, kPolarLevel, pctx);
    SectionPolar polar;
    for (const char* key : {"cl", "cd"}) {
      const toml::node& an = Require(pt, key, pctx);
      const toml::array* a = an.as_array();
      if (a == nullptr) Fail(an, pctx, fmt::format("expected an array of numbers for \"{}\", got {}", key, TypeName(an)));
      if (a->size() < 2 || static_cast<std::int64_t>(a->size()) > kMaxSweepPoints)
        Fail(an, pctx, fmt::format("\"{}\" needs from 2 to {} values, got {}", key, kMaxSweepPoints, a->size()));
      std::vector<double>& out = std::string(key) == "cl" ? polar.cl : polar.cd;
      for (std::size_t i = 0; i < a->size(); ++i) {
        const toml::node& e = (*a)[i];
        out.push_back(NumberAt(e, fmt::format("element {} of \"{}\"", i + 1, key), pctx));
        if (out.size() > 1 && std::string(key) == "cl" && !(out[i] > out[i - 1]))
          Fail(e, pctx, fmt::format("cl must increase strictly along the table; element {} is {} after {}", i + 1,
                                    out[i], out[i - 1]));
        if (std::string(key) == "cd" && !(out[i] >= 0.0 && out[i] < 1.0))
          Fail(e, pctx, fmt::format("cd must be >= 0 and < 1, got {} (element {})", out[i], i + 1));
      }
    }
    if (polar.cl.size() != polar.cd.size())
      Fail(*pt.get("cd"), pctx,
           fmt::format("cd has {} values but cl has {}; give one cd per cl", polar.cd.size(), polar.cl.size()));
    v.polar = std::move(polar);
  }
  if (t.contains("cl_max")) v.cl_max = Number(t, "cl_max", ctx, 0.0, [](double x) {
    return x > 0.0 && x < 10.0 ? std::string() : std::string("must be > 0 and < 10");
  });
  if (t.contains("thickness")) v.thickness = Number(t, "thickness", ctx, 0.0, [](double x) {
    return x >= 0.0 && x <= 0.5 ? std::string() : std::string("(thickness / chord) must be between 0 and 0.5");
  });
  if (t.contains("transition")) v.transition = Number(t, "transition", ctx, 0.0, [](double x) {
    return x >= 0.0 && x <= 1.0 ? std::string() : std::string("(x/c of transition) must be between 0 and 1");
  });
  return v;
}

// ---- [reference], [flight], [mesh] ------------------------------------------------------------------------------

void Reader::ReadReference(const toml::table& t, Reference& r) const {
  const std::string ctx = "reference";
  CheckKeys(t, kReferenceLevel, ctx);
  r.area_given = t.contains("area");
  r.span_given = t.contains("span");
  r.chord_given = t.contains("chord");
  r.area = Number(t, "area", ctx, 0.0, Positive());
  r.span = Number(t, "span", ctx, 0.0, Positive());
  r.chord = Number(t, "chord", ctx, 0.0, Positive());
  if (const toml::node* n = t.get("moment_point")) r.moment_point = Vec3At(*n, "\"moment_point\"", ctx);
}

// An angle list: a number, an array of numbers, or a range table {from, to, step} with an inclusive end.
std::vector<double> Reader::ReadAngles(const toml::node& n, std::string_view key, const std::string& ctx) const {
  const auto check_angle = [&](const toml::node& at, double v, const std::string& what) {
    if (std::abs(v) > kMaxAngleDeg)
      Fail(at, ctx, fmt::format("{} must be between {} and {} deg, got {}", what, -kMaxAngleDeg, kMaxAngleDeg, v));
  };
  std::vector<double> out;
  if (n.is_number()) {
    out.push_back(NumberAt(n, Key(key), ctx));
    check_angle(n, out.back(), std::string(key));
    return out;
  }
  if (const toml::array* a = n.as_array()) {
    if (a->empty()) Fail(n, ctx, fmt::format("{} is an empty array; give at least one angle", key));
    if (static_cast<std::int64_t>(a->size()) > kMaxSweepPoints)
      Fail(n, ctx, fmt::format("{} has {} values, more than the limit of {}", key, a->size(), kMaxSweepPoints));
    for (std::size_t i = 0; i < a->size(); ++i) {
      const toml::node& e = (*a)[i];
      out.push_back(NumberAt(e, fmt::format("element {} of {}", i + 1, Key(key)), ctx));
      check_angle(e, out.back(), fmt::format("element {} of {}", i + 1, key));
    }
    return out;
  }
  if (const toml::table* t = n.as_table()) {
    const std::string rctx = fmt::format("{}: {} range", ctx, key);
    CheckKeys(*t, kRangeLevel, rctx);
    const double from = RequiredNumber(*t, "from", rctx, AngleWithin(kMaxAngleDeg));
    const double to = RequiredNumber(*t, "to", rctx, AngleWithin(kMaxAngleDeg));
    const double step = RequiredNumber(*t, "step", rctx, AnyValue());
    const toml::node& step_node = *t->get("step");
    if (!(std::abs(step) > 0.0)) Fail(step_node, rctx, "step must be nonzero");
    const double steps = (to - from) / step;
    if (steps < -kRangeEndTolerance)
      Fail(step_node, rctx,
           fmt::format("step {} goes away from to = {}; it must be {} to go from {} to {}", step, to,
                       step > 0.0 ? "negative" : "positive", from, to));
    const double points = std::floor(std::max(steps, 0.0) + kRangeEndTolerance) + 1.0;
    if (points > static_cast<double>(kMaxSweepPoints))
      Fail(n, rctx, fmt::format("from {} to {} by {} gives {} points, more than the limit of {}", from, to, step,
                                points, kMaxSweepPoints));
    const auto count = static_cast<std::size_t>(points);
    for (std::size_t i = 0; i < count; ++i) out.push_back(from + static_cast<double>(i) * step);
    if (std::abs(out.back() - to) <= kRangeEndTolerance * std::abs(step)) out.back() = to;
    return out;
  }
  Fail(n, ctx,
       fmt::format("expected a number, an array of numbers or a range table {{ from, to, step }} for {}, got {}",
                   Key(key), TypeName(n)));
}

void Reader::ReadFlight(const toml::table& t, Flight& f) {
  const std::string ctx = "flight";
  CheckKeys(t, kFlightLevel, ctx);
  if (const toml::node* n = t.get("alpha")) f.alpha_deg = ReadAngles(*n, "alpha", ctx);
  if (const toml::node* n = t.get("beta")) f.beta_deg = ReadAngles(*n, "beta", ctx);
  f.speed_given = t.contains("speed");
  f.speed = Number(t, "speed", ctx, f.speed, Positive());
  f.density = Number(t, "density", ctx, f.density, Positive());
  f.mach_given = t.contains("mach");
  f.mach = Number(t, "mach", ctx, f.mach, [](double v) {
    return v >= 0.0 && v < 1.0 ? std::string() : std::string("must be >= 0 and < 1");
  });
  const toml::node* mach_at = t.get("mach");
  // altitude (instead of density): the standard atmosphere gives density and viscosity, and its speed of
  // sound ties speed (true airspeed) and mach together, so either gives the other; both must agree.
  if (const toml::node* alt = t.get("altitude")) {
    if (const toml::node* rho = t.get("density"))
      Fail(Before(Where(alt->source()), Where(rho->source())) ? *rho : *alt, ctx,
           "give either altitude (the standard atmosphere sets the density) or density, not both");
    const double h = NumberAt(*alt, "\"altitude\"", ctx);
    if (!(h >= kAtmosphereMinAltitude && h <= kAtmosphereMaxAltitude))
      Fail(*alt, ctx,
           fmt::format("altitude must be between {} and {} m (the standard atmosphere's troposphere and "
                       "tropopause), got {}",
                       kAtmosphereMinAltitude, kAtmosphereMaxAltitude, h));
    const AtmosphereState air = StandardAtmosphere(h);
    f.altitude = h;
    f.density = air.density;
    f.dynamic_viscosity = air.dynamic_viscosity;
    const double a = air.speed_of_sound;
    const toml::node* speed_at = t.get("speed");
    if (f.speed_given && f.mach_given) {
      if (std::abs(f.speed - f.mach * a) > kSpeedMachTolerance * std::max(f.speed, f.mach * a))
        Fail(Before(Where(speed_at->source()), Where(mach_at->source())) ? *mach_at : *speed_at, ctx,
             fmt::format("speed {} m/s and mach {} contradict each other at altitude {} m, where the speed of "
                         "sound is {:.2f} m/s (speed {} m/s is mach {:.4f}); give one of them",
                         f.speed, f.mach, h, a, f.speed, f.speed / a));
    } else if (f.mach_given) {
      if (!(f.mach > 0.0))
        Fail(*mach_at, ctx, "mach 0 with altitude gives no speed; give speed (m/s) or a mach above 0");
      f.speed = f.mach * a;
      f.speed_given = true;
    } else if (f.speed_given) {
      f.mach = f.speed / a;
      mach_at = speed_at;
      if (!(f.mach < 1.0))
        Fail(*speed_at, ctx,
             fmt::format("speed {} m/s is mach {:.4f} at altitude {} m; the compressibility correction needs "
                         "mach < 1",
                         f.speed, f.mach, h));
    }
  }
  if (f.mach > kMachWarning)
    Warn(Where(mach_at->source()), ctx,
         fmt::format("mach {:.4g} is above about {}, where the Prandtl-Glauert correction loses accuracy", f.mach,
                     kMachWarning));
  if (const toml::node* n = t.get("rates")) f.rates = Vec3At(*n, "\"rates\"", ctx);
}

void Reader::ReadSurfaceMesh(const toml::table& t, const std::string& ctx, MeshOptions& m) const {
  m.chordwise = Count(t, "chordwise", ctx, m.chordwise, kMaxChordwisePanels);
  m.spanwise = Count(t, "spanwise", ctx, m.spanwise, kMaxSpanwisePanels);
  m.chordwise_spacing = SpacingKey(t, "chordwise_spacing", ctx, m.chordwise_spacing, false);
  m.spanwise_spacing = SpacingKey(t, "spanwise_spacing", ctx, m.spanwise_spacing, true);
}

void Reader::ReadMesh(const toml::table& t, MeshOptions& m) const {
  const std::string ctx = "mesh";
  CheckKeys(t, kMeshLevel, ctx);
  ReadSurfaceMesh(t, ctx, m);
  if (const toml::node* n = t.get("wake")) {
    const std::string s = StringAt(*n, "\"wake\"", ctx);
    const std::optional<WakeDirection> w = WakeDirectionFromString(s);
    if (!w) {
      const std::vector<std::string_view> valid = {"freestream", "x-axis"};
      const std::string close = ClosestSpelling(s, valid);
      Fail(*n, ctx, fmt::format("expected {} for \"wake\", got {}{}", OneOf(valid), Quote(s),
                                close.empty() ? "" : fmt::format(" (did you mean {}?)", Key(close))));
    }
    m.wake = *w;
  }
}

// ---- [[surface]] ------------------------------------------------------------------------------------------------

ReadSection Reader::ReadSectionTable(const toml::table& t, const std::string& ctx, const Vec3& offset,
                                     bool last) const {
  CheckKeys(t, kSectionLevel, ctx);
  ReadSection r;
  Section& s = r.section;
  s.where = Where(t.source());
  const toml::node& le = Require(t, "leading_edge", ctx);
  const Vec3 given = Vec3At(le, "\"leading_edge\"", ctx);
  for (std::size_t i = 0; i < 3; ++i) s.leading_edge[i] = given[i] + offset[i];
  r.leading_edge_where = Where(le.source());
  s.chord = RequiredNumber(t, "chord", ctx, Positive());
  s.twist_deg = Number(t, "twist", ctx, 0.0, AngleWithin(kMaxAngleDeg));
  if (const toml::node* n = t.get("camber")) s.camber = CamberAt(*n, ctx);
  s.viscous = ViscousKeys(t, ctx);
  if (const toml::node* n = t.get("spanwise")) {
    if (last) Fail(*n, ctx, "\"spanwise\" counts the panels up to the next section, and the last section has none");
    s.spanwise = Count(t, "spanwise", ctx, 1, kMaxSpanwisePanels);
  }
  return r;
}

// Two sections from the trapezoid shorthand (case-format.md): the quarter-chord line has the given sweep (and
// dihedral); the tip is half = span/2 (symmetric) or span (otherwise) out along y, or, for a vertical surface,
// up along z, where span is always the height of the fin.
std::vector<ReadSection> Reader::ReadTrapezoid(const toml::table& t, const std::string& ctx,
                                               const Surface& s) const {
  CheckKeys(t, kTrapezoidLevel, ctx);
  const toml::node& le_node = Require(t, "root_leading_edge", ctx);
  const Vec3 given = Vec3At(le_node, "\"root_leading_edge\"", ctx);
  const double span = RequiredNumber(t, "span", ctx, Positive());
  const double root_chord = RequiredNumber(t, "root_chord", ctx, Positive());
  const double taper = Number(t, "taper", ctx, 1.0, Positive());
  const double sweep = Number(t, "sweep", ctx, 0.0, AngleBelow(kMaxSweepDeg));
  const bool vertical = t.contains("vertical") && BooleanAt(*t.get("vertical"), "\"vertical\"", ctx);
  if (vertical && t.contains("dihedral"))
    Fail(*t.get("dihedral"), ctx, "dihedral cannot be combined with vertical = true (a fin is built in the xz plane)");
  const double dihedral = Number(t, "dihedral", ctx, 0.0, AngleBelow(kMaxSweepDeg));
  const double washout = Number(t, "washout", ctx, 0.0, AngleWithin(kMaxAngleDeg));
  Camber camber;
  if (const toml::node* n = t.get("camber")) camber = CamberAt(*n, ctx);

  constexpr double kDegToRad = 3.14159265358979323846 / 180.0;
  const double half = vertical || !s.symmetric ? span : span / 2.0;
  const double tip_chord = taper * root_chord;
  Vec3 root{};
  for (std::size_t i = 0; i < 3; ++i) root[i] = given[i] + s.offset[i];
  Vec3 tip = root;
  tip[0] = root[0] + 0.25 * root_chord + half * std::tan(sweep * kDegToRad) - 0.25 * tip_chord;
  if (vertical) {
    tip[2] = root[2] + half;
  } else {
    tip[1] = root[1] + half;
    tip[2] = root[2] + half * std::tan(dihedral * kDegToRad);
  }
  std::vector<ReadSection> out(2);
  out[0].section.leading_edge = root;
  out[0].section.chord = root_chord;
  out[1].section.leading_edge = tip;
  out[1].section.chord = tip_chord;
  out[1].section.twist_deg = 0.0 - washout;  // not -washout: no -0.0 in the echo for a zero washout
  const SectionViscousData viscous = ViscousKeys(t, ctx);
  for (ReadSection& r : out) {
    r.section.camber = camber;
    r.section.viscous = viscous;
    r.section.where = Where(t.source());
    r.leading_edge_where = Where(le_node.source());
  }
  return out;
}

void Reader::CheckGeometry(const Surface& s, const std::vector<ReadSection>& sections,
                           const std::string& ctx) const {
  for (std::size_t k = 0; k < sections.size(); ++k) {
    const Section& sec = sections[k].section;
    const std::string sctx = fmt::format("{} section {}", ctx, k + 1);
    for (double x : sec.leading_edge)
      if (!std::isfinite(x))
        Fail(sections[k].leading_edge_where, sctx, "the leading edge is not finite (the coordinates are too large)");
    if (!std::isfinite(sec.chord)) Fail(sec.where, sctx, "the chord is not finite (the root chord is too large)");
    if (s.symmetric && sec.leading_edge[1] < -kSymmetryPlaneTolerance)
      Fail(sections[k].leading_edge_where, sctx,
           fmt::format("y = {} is negative, but a symmetric surface is given for y >= 0 and mirrored (set "
                       "symmetric = false to give the whole surface)",
                       sec.leading_edge[1]));
    if (k == 0) continue;
    const Section& prev = sections[k - 1].section;
    const double dy = sec.leading_edge[1] - prev.leading_edge[1];
    const double dz = sec.leading_edge[2] - prev.leading_edge[2];
    if (std::hypot(dy, dz) <= kZeroSegmentTolerance * std::max(sec.chord, prev.chord))
      Fail(sections[k].leading_edge_where, sctx,
           fmt::format("zero-length segment: the leading edge has the same y and z as section {}, so the "
                       "segment between them has no span",
                       k));
    if (s.symmetric && std::abs(sec.leading_edge[1]) <= kSymmetryPlaneTolerance &&
        std::abs(prev.leading_edge[1]) <= kSymmetryPlaneTolerance)
      Fail(sections[k].leading_edge_where, sctx,
           fmt::format("the segment from section {} lies in the plane y = 0, where a symmetric surface would "
                       "coincide with its mirror image (set symmetric = false for a fin on the centre line)",
                       k));
  }
}

Control Reader::ReadControl(const toml::table& t, int index, const std::string& surface_ctx,
                            bool symmetric) const {
  std::string ctx = fmt::format("{} control {}", surface_ctx, index);
  if (const toml::node* n = t.get("name"); n != nullptr && n->is_string())
    ctx = fmt::format("{} control {}", surface_ctx, Quote(n->as_string()->get()));
  CheckKeys(t, kControlLevel, ctx);
  Control c;
  c.where = Where(t.source());
  const toml::node& name = Require(t, "name", ctx);
  c.name = StringAt(name, "\"name\"", ctx);
  if (c.name.empty()) Fail(name, ctx, "name must not be empty");
  if (c.name.find('.') != std::string::npos)
    Fail(name, ctx, "name must not contain '.' (trim adjust uses \"<control>.deflection\")");
  c.hinge = Number(t, "hinge", ctx, c.hinge, [](double v) {
    return v > 0.0 && v < 1.0 ? std::string() : std::string("must be strictly between 0 and 1 (a fraction of the chord)");
  });
  if (const toml::node* n = t.get("span_fraction")) {
    const toml::array* a = n->as_array();
    if (a == nullptr || a->size() != 2)
      Fail(*n, ctx, fmt::format("expected an array of 2 numbers [start, end] for \"span_fraction\", got {}",
                                a == nullptr ? TypeName(*n) : fmt::format("{} values", a->size())));
    for (std::size_t i = 0; i < 2; ++i)
      c.span_fraction[i] = NumberAt((*a)[i], fmt::format("element {} of \"span_fraction\"", i + 1), ctx);
    const double lo = c.span_fraction[0], hi = c.span_fraction[1];
    if (!(lo >= 0.0 && lo < hi && hi <= 1.0))
      Fail(*n, ctx, fmt::format("span_fraction must be [start, end] with 0 <= start < end <= 1, got [{}, {}]", lo, hi));
  }
  c.deflection_deg = Number(t, "deflection", ctx, 0.0, AngleWithin(kMaxAngleDeg));
  if (const toml::node* n = t.get("mirror")) {
    const std::string m = StringAt(*n, "\"mirror\"", ctx);
    if (m == "opposite") {
      if (!symmetric)
        Fail(*n, ctx, "mirror = \"opposite\" needs a symmetric surface (this one is not mirrored)");
      c.mirror_opposite = true;
    } else if (m != "same") {
      const std::vector<std::string_view> valid = {"same", "opposite"};
      const std::string close = ClosestSpelling(m, valid);
      Fail(*n, ctx, fmt::format("expected {} for \"mirror\", got {}{}", OneOf(valid), Quote(m),
                                close.empty() ? "" : fmt::format(" (did you mean {}?)", Key(close))));
    }
  }
  return c;
}

Surface Reader::ReadSurface(const toml::table& t, int index, const MeshOptions& case_mesh) {
  std::string ctx = fmt::format("surface {}", index);
  if (const toml::node* n = t.get("name"); n != nullptr && n->is_string())
    ctx = "surface " + Quote(n->as_string()->get());
  CheckKeys(t, kSurfaceLevel, ctx);
  Surface s;
  s.where = Where(t.source());
  const toml::node& name = Require(t, "name", ctx);
  s.name = StringAt(name, "\"name\"", ctx);
  if (s.name.empty()) Fail(name, ctx, "name must not be empty");
  if (s.name.find('.') != std::string::npos)
    Fail(name, ctx, "name must not contain '.' (trim adjust uses \"<surface>.incidence\")");
  if (const toml::node* n = t.get("symmetric")) s.symmetric = BooleanAt(*n, "\"symmetric\"", ctx);
  s.incidence_deg = Number(t, "incidence", ctx, 0.0, AngleWithin(kMaxAngleDeg));
  if (const toml::node* n = t.get("offset")) s.offset = Vec3At(*n, "\"offset\"", ctx);
  s.mesh = case_mesh;
  ReadSurfaceMesh(t, ctx, s.mesh);

  const toml::node* section_node = t.get("section");
  const toml::node* trapezoid_node = t.get("trapezoid");
  if (section_node != nullptr && trapezoid_node != nullptr)
    Fail(*trapezoid_node, ctx, "give either [[surface.section]] tables or one [surface.trapezoid], not both");
  std::vector<ReadSection> sections;
  if (section_node != nullptr) {
    const toml::array& a = TableArrayAt(*section_node, "\"section\"", ctx, " (write [[surface.section]])");
    if (a.size() < 2)
      Fail(a.empty() ? *section_node : a[0], ctx,
           fmt::format("needs at least two [[surface.section]] (root and tip), got {}", a.size()));
    for (std::size_t k = 0; k < a.size(); ++k)
      sections.push_back(ReadSectionTable(*a[k].as_table(), fmt::format("{} section {}", ctx, k + 1), s.offset,
                                          k + 1 == a.size()));
  } else if (trapezoid_node != nullptr) {
    const toml::table& tt =
        TableAt(*trapezoid_node, "\"trapezoid\"", ctx, " (write [surface.trapezoid], one per surface)");
    sections = ReadTrapezoid(tt, ctx + " trapezoid", s);
  } else {
    Fail(t, ctx, "no geometry: give at least two [[surface.section]] tables or one [surface.trapezoid]");
  }
  CheckGeometry(s, sections, ctx);
  for (ReadSection& r : sections) s.sections.push_back(std::move(r.section));

  if (const toml::node* n = t.get("control")) {
    const toml::array& a = TableArrayAt(*n, "\"control\"", ctx, " (write [[surface.control]])");
    for (std::size_t k = 0; k < a.size(); ++k)
      s.controls.push_back(ReadControl(*a[k].as_table(), static_cast<int>(k + 1), ctx, s.symmetric));
  }
  return s;
}

// ---- [trim] -----------------------------------------------------------------------------------------------------

void Reader::ReadTrim(const toml::table& t, const Case& c, TrimRequest& trim) const {
  const std::string ctx = "trim";
  CheckKeys(t, kTrimLevel, ctx);
  trim.enabled = true;
  trim.where = Where(t.source());
  const toml::node* cl = t.get("lift_coefficient");
  const toml::node* weight = t.get("weight");
  if (cl != nullptr && weight != nullptr)
    Fail(Before(Where(cl->source()), Where(weight->source())) ? *weight : *cl, ctx,
         "give either lift_coefficient or weight, not both");
  if (cl == nullptr && weight == nullptr)
    Fail(t, ctx, "missing the target: give lift_coefficient, or weight (N) with flight.speed");
  if (cl != nullptr) trim.lift_coefficient = NumberAt(*cl, "\"lift_coefficient\"", ctx);
  if (weight != nullptr) {
    trim.weight = Number(t, "weight", ctx, 0.0, Positive());
    if (!c.flight.speed_given)
      Fail(*weight, ctx, "weight needs flight.speed (the lift coefficient to trim to depends on the dynamic pressure)");
  }
  const toml::node& adjust = Require(t, "adjust", ctx);
  trim.adjust = StringAt(adjust, "\"adjust\"", ctx);
  const std::size_t dot = trim.adjust.rfind('.');
  const std::string owner = dot == std::string::npos ? "" : trim.adjust.substr(0, dot);
  const std::string what = dot == std::string::npos ? "" : trim.adjust.substr(dot + 1);
  std::vector<std::string_view> surfaces, controls;
  for (const Surface& s : c.surfaces) {
    surfaces.push_back(s.name);
    for (const Control& ct : s.controls) controls.push_back(ct.name);
  }
  const auto no_such = [&](const char* kind, const std::vector<std::string_view>& names) {
    const std::string close = ClosestSpelling(owner, names);
    Fail(adjust, ctx, fmt::format("adjust {}: no {} named {}{}", Quote(trim.adjust), kind, Quote(owner),
                                  close.empty() ? "" : fmt::format(" (did you mean {}?)", Key(close))));
  };
  if (what == "incidence") {
    if (std::find(surfaces.begin(), surfaces.end(), owner) == surfaces.end()) no_such("surface", surfaces);
  } else if (what == "deflection") {
    if (std::find(controls.begin(), controls.end(), owner) == controls.end()) no_such("control", controls);
  } else {
    Fail(adjust, ctx, fmt::format("expected \"<surface>.incidence\" or \"<control>.deflection\" for \"adjust\", got {}",
                                  Quote(trim.adjust)));
  }
}

// ---- [[probe]] --------------------------------------------------------------------------------------------------

// Points where the flow is reported (probe.hpp): a unique name and a point above any ground plane.
void Reader::ReadProbes(const toml::node& n, Case& c) const {
  const toml::array& a = TableArrayAt(n, "\"probe\"", "", " (write [[probe]])");
  for (std::size_t k = 0; k < a.size(); ++k) {
    const toml::table& t = *a[k].as_table();
    std::string ctx = fmt::format("probe {}", k + 1);
    if (const toml::node* nn = t.get("name"); nn != nullptr && nn->is_string() && !nn->as_string()->get().empty())
      ctx = "probe " + Quote(nn->as_string()->get());
    CheckKeys(t, kProbeLevel, ctx);
    Probe p;
    p.where = Where(t.source());
    const toml::node& name = Require(t, "name", ctx);
    p.name = StringAt(name, "\"name\"", ctx);
    if (p.name.empty()) Fail(name, ctx, "name must not be empty");
    for (std::size_t j = 0; j < c.probes.size(); ++j)
      if (c.probes[j].name == p.name)
        Fail(name, ctx, fmt::format("name already used by probe {} (line {})", j + 1, c.probes[j].where.line));
    const toml::node& point = Require(t, "point", ctx);
    p.point = Vec3At(point, "\"point\"", ctx);
    if (c.ground.enabled && !(p.point[2] > c.ground.height_z))
      Fail(point, ctx, fmt::format("point z = {} is not above the ground plane z = {}", p.point[2], c.ground.height_z));
    c.probes.push_back(std::move(p));
  }
}

// ---- the whole case ---------------------------------------------------------------------------------------------

Case Reader::Read(std::string_view text) {
  toml::table root;
  try {
    root = toml::parse(text, file_);
  } catch (const toml::parse_error& e) {
    std::string description = OneLine(e.description());
    constexpr std::string_view kPrefix = "Error while ";
    if (description.rfind(kPrefix, 0) == 0)
      description = "TOML syntax error while " + description.substr(kPrefix.size());
    else
      description = "TOML syntax error: " + description;
    Fail(Where(e.source()), "", description);
  }

  Case c;
  CheckKeys(root, kRootLevel, "");
  c.title = std::filesystem::path(file_).stem().string();
  if (const toml::node* n = root.get("title")) c.title = StringAt(*n, "\"title\"", "");
  const toml::table* reference = nullptr;
  if (const toml::node* n = root.get("reference")) {
    reference = &TableAt(*n, "\"reference\"", "", " (write [reference])");
    ReadReference(*reference, c.reference);
  }
  if (const toml::node* n = root.get("flight")) ReadFlight(TableAt(*n, "\"flight\"", "", " (write [flight])"), c.flight);
  const toml::table* ground = nullptr;
  if (const toml::node* n = root.get("ground")) {
    ground = &TableAt(*n, "\"ground\"", "", " (write [ground])");
    CheckKeys(*ground, kGroundLevel, "ground");
    c.ground.enabled = true;
    c.ground.height_z = RequiredNumber(*ground, "height_z", "ground", AnyValue());
  }
  const toml::table* mesh = nullptr;
  if (const toml::node* n = root.get("mesh")) {
    mesh = &TableAt(*n, "\"mesh\"", "", " (write [mesh])");
    ReadMesh(*mesh, c.mesh);
  }

  // Surfaces, with names unique across surfaces and controls together (trim adjust names either).
  const toml::node* surface_node = root.get("surface");
  if (surface_node == nullptr) Fail(SourceRegion{}, "", "no [[surface]]: a case needs at least one lifting surface");
  const toml::array& surfaces = TableArrayAt(*surface_node, "\"surface\"", "", " (write [[surface]])");
  if (surfaces.empty()) Fail(*surface_node, "", "\"surface\" is empty: a case needs at least one lifting surface");
  std::map<std::string, std::string> used;  // name -> what already carries it
  for (std::size_t k = 0; k < surfaces.size(); ++k) {
    c.surfaces.push_back(ReadSurface(*surfaces[k].as_table(), static_cast<int>(k + 1), c.mesh));
    const Surface& s = c.surfaces.back();
    const std::string ctx = "surface " + Quote(s.name);
    const auto [it, fresh] = used.emplace(s.name, fmt::format("surface {} (line {})", k + 1, s.where.line));
    if (!fresh)
      Fail(*surfaces[k].as_table()->get("name"), ctx, fmt::format("name already used by {}", it->second));
  }
  for (std::size_t k = 0; k < c.surfaces.size(); ++k) {
    const Surface& s = c.surfaces[k];
    if (s.controls.empty()) continue;
    const toml::array& controls = *surfaces[k].as_table()->get("control")->as_array();
    for (std::size_t j = 0; j < s.controls.size(); ++j) {
      const Control& ct = s.controls[j];
      const auto [it, fresh] = used.emplace(ct.name, fmt::format("control {} of surface {} (line {})", Quote(ct.name),
                                                                 Quote(s.name), ct.where.line));
      if (!fresh)
        Fail(*controls[j].as_table()->get("name"), fmt::format("surface {} control {}", Quote(s.name), Quote(ct.name)),
             fmt::format("name already used by {}; surfaces and controls need distinct names", it->second));
    }
  }

  // The ground plane must lie below every surface (the image method mirrors the configuration in it).
  if (c.ground.enabled) {
    for (const Surface& s : c.surfaces)
      for (std::size_t k = 0; k < s.sections.size(); ++k)
        if (!(s.sections[k].leading_edge[2] > c.ground.height_z))
          Fail(*ground->get("height_z"), "ground",
               fmt::format("height_z = {} is not below surface {} section {} (z = {}); the ground plane must lie "
                           "below every surface",
                           c.ground.height_z, Quote(s.name), k + 1, s.sections[k].leading_edge[2]));
  }

  if (const toml::node* n = root.get("trim")) ReadTrim(TableAt(*n, "\"trim\"", "", " (write [trim])"), c, c.trim);
  if (const toml::node* n = root.get("probe")) ReadProbes(*n, c);

  // Mesh size guard, with the panel count the mesher will produce (lattice.cpp, CountPanels): explicit section
  // counts, the rest sharing the surface count with at least one panel each, two more strips per control, at
  // least two chordwise panels on a surface with controls.
  std::int64_t total = 0;
  bool partial = false;
  for (const Surface& s : c.surfaces) {
    std::int64_t fixed = 0, free_segments = 0;
    for (std::size_t k = 0; k + 1 < s.sections.size(); ++k) {
      if (s.sections[k].spanwise)
        fixed += *s.sections[k].spanwise;
      else
        ++free_segments;
    }
    std::int64_t span = fixed + (free_segments > 0 ? std::max(std::max<std::int64_t>(s.mesh.spanwise - fixed, 0),
                                                              free_segments)
                                                   : 0);
    span += 2 * static_cast<std::int64_t>(s.controls.size());
    const std::int64_t chord = std::max(s.mesh.chordwise, s.controls.empty() ? 1 : 2);
    total += span * chord * (s.symmetric ? 2 : 1);
    if (total > kMaxTotalPanels) {  // stop counting: also keeps the sum far from overflow
      partial = &s != &c.surfaces.back();
      break;
    }
  }
  if (total > kMaxTotalPanels)
    Fail(mesh != nullptr ? Where(mesh->source()) : c.surfaces.front().where, "mesh",
         fmt::format("the case would have {}{} panels (both halves of symmetric surfaces counted), more than the "
                     "limit of {}; lower chordwise or spanwise",
                     total, partial ? " or more" : "", kMaxTotalPanels));

  // Reference defaults from the first surface (offset applied, incidence not).
  const SurfaceExtent extent = MeasureSurface(c.surfaces.front());
  if (!c.reference.area_given) c.reference.area = extent.area;
  if (!c.reference.span_given) c.reference.span = extent.span;
  if (!c.reference.chord_given) c.reference.chord = extent.mean_aerodynamic_chord;
  for (double v : {c.reference.area, c.reference.span, c.reference.chord})
    if (!(std::isfinite(v) && v > 0.0))
      Fail(reference != nullptr ? Where(reference->source()) : c.surfaces.front().where, "reference",
           fmt::format("the default reference area, span and chord of surface {} are not positive and finite "
                       "(area {}, span {}, chord {}); give them in [reference]",
                       Quote(c.surfaces.front().name), extent.area, extent.span, extent.mean_aerodynamic_chord));

  c.warnings = std::move(warnings_);
  return c;
}

}  // namespace

Case ReadCaseText(std::string_view text, const std::string& name) { return Reader(name).Read(text); }

Case ReadCaseFile(const std::string& path) {
  std::error_code ec;
  if (std::filesystem::is_directory(path, ec))
    throw InputError(path, {}, "cannot read the case file: it is a directory");
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, {}, fmt::format("cannot open the case file: {}", std::strerror(errno)));
  std::ostringstream text;
  text << in.rdbuf();
  if (in.bad()) throw InputError(path, {}, "cannot read the case file");
  Case c = ReadCaseText(text.str(), path);
  c.source_path = path;
  return c;
}

// ---- the echo ---------------------------------------------------------------------------------------------------

void WriteCaseToml(const Case& c, std::ostream& out) {
  const auto angles = [](const std::vector<double>& v) {
    if (v.size() == 1) return Num(v.front());
    std::string s = "[";
    for (std::size_t i = 0; i < v.size(); ++i) s += (i > 0 ? ", " : "") + Num(v[i]);
    return s + "]";
  };
  const std::string first = c.surfaces.empty() ? std::string("(none)") : Quote(c.surfaces.front().name);
  std::string o;
  o += "# Skein case, normalised: every default filled in, trapezoids expanded to sections, offsets applied.\n";
  o += fmt::format("title = {}\n", TomlString(c.title));
  for (const std::string& w : c.warnings) {
    std::string line = w;
    std::replace(line.begin(), line.end(), '\n', ' ');
    o += fmt::format("# warning: {}\n", line);
  }

  const Reference& r = c.reference;
  o += "\n[reference]\n";
  const auto ref = [&](const char* key, double v, bool given, const char* what) {
    if (given)
      o += fmt::format("{} = {}\n", key, Num(v));
    else
      o += fmt::format("# {} = {}  (not given: the {} of surface {})\n", key, Num(v), what, first);
  };
  ref("area", r.area, r.area_given, "projected area");
  ref("span", r.span, r.span_given, "tip-to-tip span");
  ref("chord", r.chord, r.chord_given, "mean aerodynamic chord");
  o += fmt::format("moment_point = {}\n", Vec(r.moment_point));

  const Flight& f = c.flight;
  o += "\n[flight]\n";
  o += fmt::format("alpha = {}\n", angles(f.alpha_deg));
  o += fmt::format("beta = {}\n", angles(f.beta_deg));
  if (f.speed_given)
    o += fmt::format("speed = {}\n", Num(f.speed));
  else
    o += "# speed not given: coefficients only (dimensional loads use 1 m/s)\n";
  if (f.altitude)
    o += fmt::format("altitude = {}\n# density = {}  (the standard atmosphere at this altitude)\n", Num(*f.altitude),
                     Num(f.density));
  else
    o += fmt::format("density = {}\n", Num(f.density));
  if (f.altitude && !f.speed_given)
    o += "# mach not given: no speed, so no compressibility correction\n";
  else
    o += fmt::format("mach = {}\n", Num(f.mach));
  o += fmt::format("rates = {}\n", Vec(f.rates));

  if (c.ground.enabled) o += fmt::format("\n[ground]\nheight_z = {}\n", Num(c.ground.height_z));

  const auto mesh_keys = [&](const MeshOptions& m, const char* indent) {
    o += fmt::format("{}chordwise = {}\n{}spanwise = {}\n", indent, m.chordwise, indent, m.spanwise);
    o += fmt::format("{}chordwise_spacing = {}\n{}spanwise_spacing = {}\n", indent,
                     TomlString(ToString(m.chordwise_spacing)), indent, TomlString(ToString(m.spanwise_spacing)));
  };
  o += "\n[mesh]\n";
  mesh_keys(c.mesh, "");
  o += fmt::format("wake = {}\n", TomlString(ToString(c.mesh.wake)));

  for (const Surface& s : c.surfaces) {
    o += "\n[[surface]]\n";
    o += fmt::format("name = {}\nsymmetric = {}\nincidence = {}\noffset = [0.0, 0.0, 0.0]\n", TomlString(s.name),
                     s.symmetric ? "true" : "false", Num(s.incidence_deg));
    mesh_keys(s.mesh, "");
    for (const Section& sec : s.sections) {
      o += "\n  [[surface.section]]\n";
      o += fmt::format("  leading_edge = {}\n  chord = {}\n  twist = {}\n  camber = {}\n", Vec(sec.leading_edge),
                       Num(sec.chord), Num(sec.twist_deg), TomlString(sec.camber.spelling));
      if (sec.spanwise) o += fmt::format("  spanwise = {}\n", *sec.spanwise);
      const SectionViscousData& v = sec.viscous;
      if (v.polar) {
        const auto list = [](const std::vector<double>& x) {
          std::string l;
          for (std::size_t i = 0; i < x.size(); ++i) l += (i > 0 ? ", " : "") + Num(x[i]);
          return l;
        };
        o += fmt::format("  polar = {{ cl = [{}], cd = [{}] }}\n", list(v.polar->cl), list(v.polar->cd));
      }
      if (v.cl_max) o += fmt::format("  cl_max = {}\n", Num(*v.cl_max));
      if (v.thickness) o += fmt::format("  thickness = {}\n", Num(*v.thickness));
      if (v.transition) o += fmt::format("  transition = {}\n", Num(*v.transition));
    }
    for (const Control& ct : s.controls) {
      o += "\n  [[surface.control]]\n";
      o += fmt::format("  name = {}\n  hinge = {}\n  span_fraction = [{}, {}]\n  deflection = {}\n  mirror = {}\n",
                       TomlString(ct.name), Num(ct.hinge), Num(ct.span_fraction[0]), Num(ct.span_fraction[1]),
                       Num(ct.deflection_deg), ct.mirror_opposite ? "\"opposite\"" : "\"same\"");
    }
  }

  if (c.trim.enabled) {
    o += "\n[trim]\n";
    if (c.trim.lift_coefficient) o += fmt::format("lift_coefficient = {}\n", Num(*c.trim.lift_coefficient));
    if (c.trim.weight) o += fmt::format("weight = {}\n", Num(*c.trim.weight));
    o += fmt::format("adjust = {}\n", TomlString(c.trim.adjust));
  }

  for (const Probe& p : c.probes) o += fmt::format("\n[[probe]]\nname = {}\npoint = {}\n", TomlString(p.name), Vec(p.point));
  out << o;
}

}  // namespace skein
