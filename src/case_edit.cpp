// Skein: one number of a case file's text, found by a dotted path and replaced in place (case_edit.hpp).
#include "skein/case_edit.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <string>
#include <vector>

#include <fmt/format.h>
#include <toml++/toml.h>

namespace skein {
namespace {

toml::table Parse(std::string_view text, const std::string& file) {
  try {
    return toml::parse(text, std::string(file));
  } catch (const toml::parse_error& e) {
    throw InputError(file, {static_cast<int>(e.source().begin.line), static_cast<int>(e.source().begin.column)},
                     "TOML syntax error");
  }
}

SourceRegion Where(const toml::node& n) {
  return {static_cast<int>(n.source().begin.line), static_cast<int>(n.source().begin.column)};
}

/// An array whose every element is a table with a string `name`: its elements are addressed by name.
bool Named(const toml::array& a) {
  if (a.empty()) return false;
  for (const toml::node& e : a) {
    const toml::table* t = e.as_table();
    if (t == nullptr || t->get_as<std::string>("name") == nullptr) return false;
  }
  return true;
}

/// Keys of the flight condition that the study sets itself (the angle of attack) or solves only once (beta).
bool SetByTheStudy(const std::string& path) {
  return path == "flight.alpha" || path.rfind("flight.alpha.", 0) == 0 || path.rfind("flight.beta.", 0) == 0;
}

void Collect(const toml::node& n, const std::string& path, std::vector<std::string>& out) {
  if (n.is_integer() || n.is_floating_point()) {
    if (!SetByTheStudy(path)) out.push_back(path);
  } else if (const toml::table* t = n.as_table()) {
    for (const auto& [k, v] : *t) Collect(v, path.empty() ? std::string(k.str()) : path + "." + std::string(k.str()), out);
  } else if (const toml::array* a = n.as_array()) {
    const bool named = Named(*a);
    for (std::size_t i = 0; i < a->size(); ++i) {
      const toml::node& e = (*a)[i];
      const std::string seg = named ? e.as_table()->get_as<std::string>("name")->get() : std::to_string(i + 1);
      Collect(e, path + "." + seg, out);
    }
  }
}

/// Optimal string alignment distance (Levenshtein with adjacent transpositions).
std::size_t EditDistance(std::string_view a, std::string_view b) {
  const std::size_t n = a.size(), m = b.size();
  std::vector<std::vector<std::size_t>> d(n + 1, std::vector<std::size_t>(m + 1, 0));
  for (std::size_t i = 0; i <= n; ++i) d[i][0] = i;
  for (std::size_t j = 0; j <= m; ++j) d[0][j] = j;
  for (std::size_t i = 1; i <= n; ++i)
    for (std::size_t j = 1; j <= m; ++j) {
      d[i][j] = std::min({d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + (a[i - 1] == b[j - 1] ? 0u : 1u)});
      if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1]) d[i][j] = std::min(d[i][j], d[i - 2][j - 2] + 1);
    }
  return d[n][m];
}

std::string Nearest(const std::string& path, const std::vector<std::string>& paths) {
  std::string best;
  std::size_t best_d = std::numeric_limits<std::size_t>::max();
  for (const std::string& p : paths) {
    const std::size_t dist = EditDistance(path.substr(0, 128), p);
    if (dist < best_d) {
      best = p;
      best_d = dist;
    }
  }
  return best;
}

const char* Kind(const toml::node& n) {
  switch (n.type()) {
    case toml::node_type::table: return "a table";
    case toml::node_type::array: return "an array";
    case toml::node_type::string: return "a string";
    case toml::node_type::boolean: return "a boolean";
    default: return "not a number";
  }
}

/// Byte offset of a 1-based line and column (columns count code points, as toml++ does).
std::size_t Offset(std::string_view text, const toml::source_position& p) {
  std::size_t i = 0;
  for (std::uint32_t line = 1; line < p.line && i < text.size(); ++i)
    if (text[i] == '\n') ++line;
  for (std::uint32_t col = 1; col < p.column && i < text.size(); ++col) {
    ++i;
    while (i < text.size() && (static_cast<unsigned char>(text[i]) & 0xC0) == 0x80) ++i;
  }
  return i;
}

}  // namespace

std::vector<std::string> CaseKeyPaths(std::string_view text, const std::string& file) {
  const toml::table root = Parse(text, file);
  std::vector<std::string> out;
  Collect(root, "", out);
  return out;
}

CaseKey FindCaseKey(std::string_view text, const std::string& file, const std::string& path,
                    const std::string& option) {
  const toml::table root = Parse(text, file);
  const std::string quoted = fmt::format("{} \"{}\"", option, path);
  const auto nearest = [&]() {
    std::vector<std::string> all;
    Collect(root, "", all);
    const std::string n = Nearest(path, all);
    if (n.empty()) return std::string(" (the case has no number to vary)");
    constexpr std::size_t kSlip = 2;  // edits that make a slip of the keyboard (a transposition counts one)
    if (EditDistance(path.substr(0, 128), n) <= kSlip) return fmt::format(" (did you mean \"{}\"?)", n);
    return fmt::format(" (the nearest number written in the case is \"{}\"; a key left at its default must be "
                       "written in the file to be varied)",
                       n);
  };

  std::vector<std::string> segments;
  for (std::size_t start = 0;;) {
    const std::size_t dot = path.find('.', start);
    segments.push_back(path.substr(start, dot == std::string::npos ? std::string::npos : dot - start));
    if (dot == std::string::npos) break;
    start = dot + 1;
  }
  const bool blank = std::any_of(segments.begin(), segments.end(), [](const std::string& s) {
    return s.empty() || s.find_first_of(" \t\r\n=") != std::string::npos;
  });
  if (path.empty() || blank)
    throw InputError(file, {}, fmt::format("{}: expected a dotted path of keys such as surface.wing.trapezoid.taper",
                                           quoted));
  if (path == "flight.alpha" || path.rfind("flight.alpha.", 0) == 0)
    throw InputError(file, {}, fmt::format("{}: the angle of attack is set by --alpha or --cl; vary another key",
                                           quoted));

  const toml::node* at = &root;
  std::string walked;
  for (const std::string& seg : segments) {
    const toml::node* next = nullptr;
    std::string missing;
    if (const toml::table* t = at->as_table()) {
      next = t->get(seg);
      if (next == nullptr)
        missing = walked.empty() ? fmt::format("the case has no key \"{}\"", seg)
                                 : fmt::format("\"{}\" has no key \"{}\"", walked, seg);
    } else if (const toml::array* a = at->as_array()) {
      if (Named(*a)) {
        for (const toml::node& e : *a)
          if (e.as_table()->get_as<std::string>("name")->get() == seg) next = &e;
        if (next == nullptr) missing = fmt::format("\"{}\" has no element named \"{}\"", walked, seg);
      } else {
        const bool digits = std::all_of(seg.begin(), seg.end(), [](char ch) { return ch >= '0' && ch <= '9'; });
        const std::size_t k = digits && seg.size() < 10 ? std::stoul(seg) : 0;
        if (k >= 1 && k <= a->size())
          next = &(*a)[k - 1];
        else
          missing = fmt::format("\"{}\" has {} element{}, addressed by index 1 to {}; got \"{}\"", walked, a->size(),
                                a->size() == 1 ? "" : "s", a->size(), seg);
      }
    } else {
      missing = fmt::format("\"{}\" is a number and has no key \"{}\"", walked, seg);
    }
    if (next == nullptr)
      throw InputError(file, at == &root ? SourceRegion{} : Where(*at),
                       fmt::format("{}: {}{}", quoted, missing, nearest()));
    at = next;
    walked += (walked.empty() ? "" : ".") + seg;
  }
  if (!(at->is_integer() || at->is_floating_point()))
    throw InputError(file, Where(*at), fmt::format("{}: this key is {}, not a number{}", quoted, Kind(*at), nearest()));
  if (SetByTheStudy(path))
    throw InputError(file, Where(*at),
                     fmt::format("{}: a study solves the case's first flight condition only; write flight.beta as "
                                 "one number to vary it",
                                 quoted));
  CaseKey k;
  k.path = path;
  k.where = Where(*at);
  k.begin = Offset(text, at->source().begin);
  k.end = Offset(text, at->source().end);
  k.integer = at->is_integer();
  k.value = k.integer ? static_cast<double>(at->as_integer()->get()) : at->as_floating_point()->get();
  return k;
}

std::string FormatCaseNumber(double v, bool integer) {
  constexpr double kExactInteger = 9007199254740992.0;  // 2^53: every whole double below it is exact
  if (integer && std::isfinite(v) && std::abs(v - std::floor(v)) <= 0.0 && std::abs(v) < kExactInteger)
    return fmt::format("{}", static_cast<std::int64_t>(v));
  std::string s = fmt::format("{}", v);
  if (s.find_first_of(".eEn") == std::string::npos) s += ".0";  // 'n': inf and nan
  return s;
}

std::string EditCaseText(std::string_view text, const std::vector<std::pair<CaseKey, double>>& edits) {
  std::vector<std::pair<CaseKey, double>> sorted = edits;
  std::sort(sorted.begin(), sorted.end(), [](const auto& a, const auto& b) { return a.first.begin > b.first.begin; });
  std::string out(text);
  for (std::size_t i = 0; i < sorted.size(); ++i) {
    const CaseKey& k = sorted[i].first;
    SKEIN_ASSERT(k.begin <= k.end && k.end <= out.size());
    SKEIN_ASSERT(i == 0 || k.end <= sorted[i - 1].first.begin);
    out.replace(k.begin, k.end - k.begin, FormatCaseNumber(sorted[i].second, k.integer));
  }
  return out;
}

}  // namespace skein
