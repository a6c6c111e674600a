// Skein report: the terminal summary, for people. Writes to the stream it is handed.
#pragma once

#include <iosfwd>

#include "skein/results.hpp"

namespace skein::report {

struct SummaryOptions {
  bool strips = true;   ///< include the compact span-loading table
  int strip_rows = 11;  ///< stations shown per surface in that table
};

/// Case title, reference values, mesh, a table of coefficients per point, derivatives of the first point,
/// a compact span-loading table, the cautions line and the time taken.
void WriteSummary(const Results& r, std::ostream& out, const SummaryOptions& options = {});

}  // namespace skein::report
