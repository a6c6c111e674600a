// Skein: editing one number of a case file's text, addressed by a dotted path, so that a variant of a case is
// read back through the ordinary reader (case_file.hpp) and validated exactly like a file a user wrote.
//
//   const skein::CaseKey k = skein::FindCaseKey(text, "wing.toml", "surface.wing.trapezoid.taper");
//   const std::string variant = skein::EditCaseText(text, {{k, 0.35}});
//   skein::Case c = skein::ReadCaseText(variant, "wing.toml");
//
// Path syntax (DEVELOPERS.md, "Case key paths"): the keys of the TOML as written, joined by '.'.
//  - A table's key by its name: `reference.area`, `mesh.spanwise`, `surface.wing.trapezoid.taper`.
//  - An element of an array of tables whose every element has a string `name` key, by that name:
//    `surface.wing`, `surface.wing.control.aileron.deflection`. Names cannot contain '.' (the reader refuses
//    them), so a name never splits a path.
//  - An element of any other array, by its 1-based index: `surface.wing.section.2.twist` (the second
//    [[surface.section]] of surface "wing"), `reference.moment_point.1` (its x).
// Only numbers (TOML integers and floats) written in the file can be addressed; a key left at its default is
// not in the text and must be written to be varied. The value's text is replaced in place, so every line and
// column of the variant is the user's file's (errors point into the file the user has).
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "skein/error.hpp"

namespace skein {

/// A number of a case file's text.
struct CaseKey {
  std::string path;            ///< the dotted path it was found by
  SourceRegion where;          ///< line and column of the value in the text
  std::size_t begin = 0;       ///< byte offset of the value's first character
  std::size_t end = 0;         ///< byte offset one past its last character
  bool integer = false;        ///< written as a TOML integer
  double value = 0.0;          ///< the value as written
};

/// The paths of every number in the text, in document order (arrays of named tables by name, other arrays by
/// 1-based index). Throws InputError for a TOML syntax error.
std::vector<std::string> CaseKeyPaths(std::string_view text, const std::string& file);

/// Finds the number at `path`. Throws InputError (one line, `file[:line:column]: --vary "<path>": ...`) when
/// the path is malformed, leads nowhere, or ends at something that is not a number; the message names the
/// nearest path that does lead to a number. `option` names the option in messages (default "--vary").
CaseKey FindCaseKey(std::string_view text, const std::string& file, const std::string& path,
                    const std::string& option = "--vary");

/// The number as TOML text: a whole number as an integer when the key was written as one (so a count stays a
/// count), anything else as the shortest float text that reads back to the same double.
std::string FormatCaseNumber(double value, bool integer);

/// The text with each key's value replaced by the number given with it. Keys must come from the same text
/// and not overlap.
std::string EditCaseText(std::string_view text, const std::vector<std::pair<CaseKey, double>>& edits);

}  // namespace skein
