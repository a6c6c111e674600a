// Skein stage 1, read: TOML case file -> Case (case-format.md).
//
//   skein::Case c = skein::ReadCaseFile("cases/survey_drone.toml");
//
// Every input error throws skein::InputError naming file:line:column and what was expected; unknown keys get a
// "did you mean" hint. The reader fills in every default, so the Case is complete.
#pragma once

#include <iosfwd>
#include <string>
#include <string_view>

#include "skein/case.hpp"

namespace skein {

/// Limits the reader enforces on mesh counts (a sane bound, not a memory check: see EstimateMemoryBytes).
inline constexpr int kMaxChordwisePanels = 200;
inline constexpr int kMaxSpanwisePanels = 5000;

/// Reads and validates a case file. Throws InputError.
Case ReadCaseFile(const std::string& path);

/// Reads a case from text; `name` is used in error messages as the file name. Throws InputError.
Case ReadCaseText(std::string_view text, const std::string& name);

/// Writes the case in normalised TOML form with every default filled in (`skein solve --echo`).
/// Reading the echoed text back gives the same Case.
void WriteCaseToml(const Case& c, std::ostream& out);

}  // namespace skein
