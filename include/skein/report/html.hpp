// Skein report: one self-contained HTML page for a design review (no network: inline CSS and SVG, no fonts or
// scripts from elsewhere).
//
//   skein::report::HtmlReport h;
//   h.results = &results;
//   h.case_path = "cases/survey_drone.toml";
//   h.case_text = text_of_the_file;
//   h.plots = skein::report::ResultPlots(results, lattice);
//   skein::report::WriteHtmlReport(h, out);
#pragma once

#include <iosfwd>
#include <string>
#include <vector>

#include "skein/report/svg.hpp"
#include "skein/results.hpp"
#include "skein/study.hpp"

namespace skein::report {

struct HtmlReport {
  const Results* results = nullptr;                      ///< required
  std::string case_path;                                 ///< as given on the command line
  std::string case_text;                                 ///< the case file as read, shown verbatim
  const study::ConvergenceStudy* convergence = nullptr;  ///< the mesh study of --refine, when run
  std::vector<NamedChart> plots;                         ///< each inlined as <figure id="plot-<file stem>">
};

/// Writes the page: the cautions (at the top and again at the end), the case (title, file, reference values),
/// the mesh, a table of the points (a point that was not solved shows its error, never a number), the
/// surfaces and derivatives of Results::FirstSolved(), the trim when there is one, the mesh-convergence
/// table when given, the warnings, the summary as the terminal prints it, every plot (ids in each SVG
/// prefixed "<file stem>-" so that they stay unique in the page) and the case text. Every value that
/// cannot be shown is written "n/a"; no NaN reaches the page.
void WriteHtmlReport(const HtmlReport& report, std::ostream& out);

}  // namespace skein::report
