// Skein report: the JSON document of results-format.md (format "skein-result", version 1).
#pragma once

#include <iosfwd>

#include "skein/results.hpp"

namespace skein::report {

/// Writes the results document. Non-finite numbers are written as null with a reason in "warnings".
void WriteJson(const Results& r, std::ostream& out);

}  // namespace skein::report
