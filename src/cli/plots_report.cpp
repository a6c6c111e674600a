// skein CLI: --plots, --report and compare --svg. See plots_report.hpp.
#include "plots_report.hpp"

#include <fstream>
#include <iterator>
#include <sstream>

#include "skein/lattice.hpp"
#include "skein/report/html.hpp"
#include "skein/report/plot.hpp"
#include "skein/report/svg.hpp"
#include "skein/trim.hpp"

namespace skein::cli {

void AddPlotsReportOptions(CLI::App* command, PlotsReportArgs& args) {
  command
      ->add_option("--plots", args.plots_dir,
                   "write the design-review plots into DIR: span_loading.svg, local_cl.svg, planform_load.svg and, "
                   "for a sweep, lift_curve.svg and drag_polar.svg")
      ->type_name("DIR");
  command
      ->add_option("--report", args.report,
                   "write one self-contained HTML page (case, tables, plots, mesh and convergence, cautions) to FILE")
      ->type_name("FILE");
}

void StagePlotsAndReport(StagedOutputs& out, const PlotsReportArgs& args, const std::string& case_path,
                         const Case& c, const Results& r, const study::ConvergenceStudy* convergence) {
  if (args.plots_dir.empty() && args.report.empty()) return;
  const Lattice lat = BuildLattice(r.trim ? TrimmedCase(c, *r.trim) : c);
  std::vector<report::NamedChart> plots = report::ResultPlots(r, lat);
  if (!args.plots_dir.empty()) {
    MakeOutputDirectory(args.plots_dir);
    for (const report::NamedChart& p : plots)
      out.Add(fs::path(args.plots_dir) / p.file, [&](std::ostream& f) { report::plot::WriteChartSvg(p.chart, f); });
  }
  if (!args.report.empty()) {
    std::ifstream in(case_path, std::ios::binary);
    std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    report::HtmlReport h;
    h.results = &r;
    h.case_path = case_path;
    h.case_text = std::move(text);
    h.convergence = convergence;
    h.plots = std::move(plots);
    out.Add(args.report, [&](std::ostream& f) { report::WriteHtmlReport(h, f); });
  }
}

void StageComparisonSvg(StagedOutputs& out, const std::string& file, const study::Comparison& cmp) {
  if (file.empty()) return;
  const report::plot::Chart ch = report::ComparisonSpanLoadingChart(cmp);
  out.Add(file, [&](std::ostream& f) { report::plot::WriteChartSvg(ch, f); });
}

}  // namespace skein::cli
