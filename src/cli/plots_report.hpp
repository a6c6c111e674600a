// skein CLI: the --plots DIR, --report FILE and compare --svg FILE outputs (the design-review pictures and the
// HTML page), staged with the command's other files so that an error leaves none of them behind.
#pragma once

#include <string>

#include <CLI/CLI.hpp>

#include "outputs.hpp"
#include "skein/case.hpp"
#include "skein/results.hpp"
#include "skein/study.hpp"

namespace skein::cli {

struct PlotsReportArgs {
  std::string plots_dir;  ///< --plots DIR: the SVGs of report::ResultPlots under their fixed names
  std::string report;     ///< --report FILE: one self-contained HTML page
};

/// Adds --plots and --report to `solve` or `trim`.
void AddPlotsReportOptions(CLI::App* command, PlotsReportArgs& args);

/// Stages what `args` asks for. `c` is the case as read (a trim's setting is applied here before meshing),
/// `convergence` the --refine study or null.
void StagePlotsAndReport(StagedOutputs& out, const PlotsReportArgs& args, const std::string& case_path,
                         const Case& c, const Results& r, const study::ConvergenceStudy* convergence);

/// Stages the span-loading overlay of `skein compare --svg FILE`.
void StageComparisonSvg(StagedOutputs& out, const std::string& file, const study::Comparison& cmp);

}  // namespace skein::cli
