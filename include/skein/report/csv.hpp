// Skein report: CSV tables (results-format.md): points.csv, one row per point, and strips.csv, one row per
// strip (point index, surface, then the strip arrays). Same names as the JSON.
#pragma once

#include <iosfwd>

#include "skein/results.hpp"

namespace skein::report {

void WritePointsCsv(const Results& r, std::ostream& out);
void WriteStripsCsv(const Results& r, std::ostream& out);

}  // namespace skein::report
