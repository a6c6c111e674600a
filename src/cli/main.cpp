// skein: the command-line front. It parses arguments, calls the library and hands results to reporters;
// all physics lives in the library.
//
// Exit codes: 0 success; 2 bad input (the case file, or an argument); 3 a numerical failure (singular system,
// non-finite result, a trim that cannot be reached); 4 an output file could not be written; 70 an internal error.
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <functional>
#include <iostream>
#include <optional>
#include <sstream>
#include <string>
#include <vector>

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include "skein/skein.hpp"
#include "skein/report/study.hpp"
#include "skein/report/svg.hpp"
#include "skein/study.hpp"
#include "outputs.hpp"
#include "plots_report.hpp"
#include "study_command.hpp"

namespace fs = std::filesystem;

namespace {

using namespace skein::cli;

struct SolveArgs {
  std::string case_path;
  std::string json;
  std::string csv_dir;
  bool echo = false;
  bool quiet = false;
  bool full_model = false;
  bool no_lateral = false;
  int threads = 0;
  std::size_t max_panels = 0;
  bool refine = false;
  std::size_t refine_max_panels = 6000;
  std::string svg;
  PlotsReportArgs plots;  ///< --plots DIR, --report FILE (plots_report.hpp)
  bool trim = false;  ///< `skein trim`: solve for the trimmed point of the case's [trim] table instead
  std::vector<std::string> probes;  ///< `--probe NAME=X,Y,Z`, added after the case's [[probe]] tables
};

struct TwistArgs {
  double cl = 0.0;
  bool keep_root_bending = false;
  std::string out;
  std::string surface;
  int stations = 6;
  std::string json;
};

int RunTwist(const std::string& case_path, const TwistArgs& t) {
  const skein::Case c = skein::ReadCaseFile(case_path);
  skein::study::TwistDesignOptions o;
  o.target_CL = t.cl;
  o.keep_root_bending = t.keep_root_bending;
  o.surface = t.surface;
  o.stations = t.stations;
  const skein::study::TwistDesign d = skein::study::DesignTwist(c, o);
  StagedOutputs out({fs::path(case_path)});
  if (!t.out.empty()) out.Add(t.out, [&](std::ostream& f) { skein::WriteCaseToml(d.designed, f); });
  std::ostringstream json_text;
  if (!t.json.empty()) {
    skein::report::WriteTwistDesignJson(d, json_text);
    if (t.json != "-") out.Add(t.json, [&](std::ostream& f) { f << json_text.str(); });
  }
  out.Commit();
  if (t.json == "-") std::cout << json_text.str();
  skein::report::WriteTwistDesign(d, t.json == "-" ? std::cerr : std::cout);
  if (!t.out.empty()) (t.json == "-" ? std::cerr : std::cout) << "Wrote " << t.out << '\n';
  return 0;
}

struct CompareArgs {
  std::vector<std::string> cases;
  double cl = 0.0;
  bool cl_given = false;
  std::optional<double> weight, speed, density;  ///< --weight/--speed/--density: one aircraft, each case at W/(q S)
  std::string json, csv_dir;
  std::string svg;  ///< --svg FILE: the cases' span loadings overlaid
  int threads = 0;  ///< for all the cases together: see study::PlanThreads
};

int RunCompare(const CompareArgs& t) {
  std::vector<skein::Case> cases;
  std::vector<fs::path> inputs;
  for (const std::string& p : t.cases) {
    cases.push_back(skein::ReadCaseFile(p));
    inputs.emplace_back(p);
  }
  skein::study::CompareOptions o;
  if (t.cl_given) o.target_CL = t.cl;
  if (t.weight) {
    // The density defaults to the first case's [flight] density (its standard atmosphere's, given an altitude).
    o.same_aircraft = skein::study::SameAircraft{*t.weight, *t.speed, t.density.value_or(cases.front().flight.density)};
  }
  o.run.threads = t.threads;
  const skein::study::Comparison cmp = skein::study::CompareCases(cases, o);
  StagedOutputs out(inputs);
  std::ostringstream json_text;
  if (!t.json.empty()) {
    skein::report::WriteComparisonJson(cmp, json_text);
    if (t.json != "-") out.Add(t.json, [&](std::ostream& f) { f << json_text.str(); });
  }
  if (!t.csv_dir.empty()) {
    MakeOutputDirectory(t.csv_dir);
    out.Add(fs::path(t.csv_dir) / "compare.csv", [&](std::ostream& f) { skein::report::WriteComparisonCsv(cmp, f); });
  }
  StageComparisonSvg(out, t.svg, cmp);
  out.Commit();
  if (t.json == "-") std::cout << json_text.str();
  skein::report::WriteComparisonTable(cmp, t.json == "-" ? std::cerr : std::cout);
  return 0;
}

int RunSolve(const SolveArgs& a) {
  using Clock = std::chrono::steady_clock;
  const auto t0 = Clock::now();
  skein::Case c = skein::ReadCaseFile(a.case_path);
  for (const std::string& p : a.probes) skein::AddProbe(c, skein::ParseProbeArgument(p));
  const double t_read = std::chrono::duration<double>(Clock::now() - t0).count();
  if (a.echo) {
    skein::WriteCaseToml(c, std::cout);
    return 0;
  }
  skein::RunOptions ro;
  ro.threads = a.threads;
  ro.max_panels = a.max_panels;
  ro.allow_half_model = !a.full_model;
  ro.lateral = !a.no_lateral;
  if (!a.quiet && !a.trim)  // the plan and its memory, before the long work; with the summary's stream
    ro.on_plan = [&a](const skein::RunPlan& p) {
      (a.json == "-" ? std::cerr : std::cout)
          << fmt::format("Plan: {} panels, {}, largest system {} unknowns, {} factorisation{}, {} thread{}; "
                         "memory estimate {:.1f} MB\n",
                         p.panels,
                         !p.half_model ? "full model" : p.lateral ? "half model" : "half model, symmetric system only",
                         p.unknowns, p.factorisations, p.factorisations == 1 ? "" : "s", p.threads,
                         p.threads == 1 ? "" : "s", static_cast<double>(p.memory_estimate_bytes) / 1e6)
          << std::flush;
    };
  skein::Results r = a.trim ? skein::Trim(c, ro) : skein::Run(c, ro);
  r.times.read = t_read;
  r.times.total += t_read;
  std::optional<skein::study::ConvergenceStudy> convergence;
  if (a.refine) {
    skein::study::ConvergenceOptions co;
    co.max_panels = a.max_panels ? std::min(a.max_panels, a.refine_max_panels) : a.refine_max_panels;
    co.run = ro;
    co.run.max_panels = 0;
    co.run.on_plan = nullptr;  // the plan line is the main run's only
    convergence = skein::study::MeshConvergence(c, co);
  }

  const auto t_out = Clock::now();
  StagedOutputs out({fs::path(a.case_path)});
  std::ostringstream json_text;
  if (!a.json.empty()) {
    if (convergence)
      skein::report::WriteJsonWithConvergence(r, *convergence, json_text);
    else
      skein::report::WriteJson(r, json_text);
    if (a.json != "-") out.Add(a.json, [&](std::ostream& f) { f << json_text.str(); });
  }
  if (!a.csv_dir.empty()) {
    MakeOutputDirectory(a.csv_dir);
    out.Add(fs::path(a.csv_dir) / "points.csv", [&](std::ostream& f) { skein::report::WritePointsCsv(r, f); });
    out.Add(fs::path(a.csv_dir) / "strips.csv", [&](std::ostream& f) { skein::report::WriteStripsCsv(r, f); });
    out.Add(fs::path(a.csv_dir) / "structural.csv", [&](std::ostream& f) { skein::report::WriteStructuralCsv(r, f); });
    if (!c.probes.empty())
      out.Add(fs::path(a.csv_dir) / "probes.csv", [&](std::ostream& f) { skein::report::WriteProbesCsv(r, f); });
  }
  if (!a.svg.empty() && !r.points.empty()) {
    skein::report::SpanLoadingPlot plot;
    plot.title = r.title;
    const skein::PointResult& shown = r.FirstSolved();
    plot.alpha_deg = shown.alpha_deg;
    plot.beta_deg = shown.beta_deg;
    plot.CL = shown.CL;
    plot.series = skein::study::SpanLoadingWithElliptic(skein::BuildLattice(c), shown, r.reference);
    out.Add(a.svg, [&](std::ostream& f) { skein::report::WriteSpanLoadingSvg(plot, f); });
  }
  StagePlotsAndReport(out, a.plots, a.case_path, c, r, convergence ? &*convergence : nullptr);
  out.Commit();
  r.times.output = std::chrono::duration<double>(Clock::now() - t_out).count();
  if (a.json == "-") std::cout << json_text.str();
  if (!a.quiet) skein::report::WriteSummary(r, a.json == "-" ? std::cerr : std::cout);
  if (!a.quiet && convergence) skein::report::WriteConvergenceTable(*convergence, a.json == "-" ? std::cerr : std::cout);
  // Points of the sweep that could not be solved are marked in every output; the exit status says so too.
  for (std::size_t i = 0; i < r.points.size(); ++i)
    if (!r.points[i].solved())
      std::cerr << fmt::format("skein: point {} (alpha {:g} deg, beta {:g} deg) was not solved: {}\n", i + 1,
                               r.points[i].alpha_deg, r.points[i].beta_deg, r.points[i].error);
  return r.FailedPoints() > 0 ? kExitNumerical : 0;
}

}  // namespace

int main(int argc, char** argv) {
  skein::RestartWithBlasSettings(argv);  // before anything else: what OpenBLAS reads only when it loads
  CLI::App app{"skein: vortex-lattice aerodynamics for conceptual aircraft design.\n"
               "Example: skein solve cases/survey_drone.toml --json result.json"};
  app.set_version_flag("--version", std::string("skein ") + SKEIN_VERSION);
  app.require_subcommand(1);
  SolveArgs a;
  CLI::App* solve = app.add_subcommand(
      "solve", "Solve a case file: lift, induced drag, span efficiency, moments, derivatives and span loading.\n"
               "Example: skein solve cases/survey_drone.toml --json out.json --csv out/");
  solve->add_option("CASE", a.case_path, "case file (TOML)")->required();
  solve->add_option("--json", a.json, "write the results document to FILE ('-' for standard output)")
      ->type_name("FILE");
  solve->add_option("--csv", a.csv_dir, "write points.csv, strips.csv and structural.csv into DIR")->type_name("DIR");
  solve->add_flag("--echo", a.echo, "print the case as read, every default filled in, and stop");
  solve->add_option("--threads", a.threads, "OpenMP threads (default: all cores)")->check(CLI::Range(1, 1024));
  solve->add_option("--max-panels", a.max_panels, "refuse a mesh with more panels than this");
  solve->add_flag("--full-model", a.full_model, "solve the whole lattice even for a mirror-symmetric case");
  solve->add_flag("--no-lateral", a.no_lateral,
                  "in symmetric flight, skip the lateral derivatives (beta, p, r): a mirror-symmetric case then "
                  "solves only its symmetric half system");
  solve->add_flag("--quiet", a.quiet, "print no summary");
  solve->add_option("--probe", a.probes,
                    "report the flow (velocity, downwash, sidewash, q/q_inf) at a point, NAME=X,Y,Z in metres, "
                    "geometry axes; repeatable, added to the case's [[probe]] tables (--csv adds probes.csv)")
      ->type_name("NAME=X,Y,Z")
      ->allow_extra_args(false);
  solve->add_option("--svg", a.svg,
                    "write the span loading of the first point (cl c/c_ref, with the elliptic loading of the same "
                    "lift) as an SVG plot to FILE")
      ->type_name("FILE");
  solve->add_flag("--refine", a.refine,
                  "also solve the first flight point on three nested meshes and print Richardson-extrapolated CL, "
                  "CD_induced, Cm and span efficiency with error estimates (--json adds a \"convergence\" object)");
  solve->add_option("--refine-max-panels", a.refine_max_panels,
                    "largest mesh --refine may build (default 6000); beyond it the case's mesh is halved instead")
      ->type_name("N");
  CLI::App* trim = app.add_subcommand(
      "trim", "Trim in pitch as the case's [trim] table asks: find alpha and the setting it names (a surface's\n"
              "incidence or a control's deflection) for Cm = 0 and the target CL, then report that point like solve.\n"
              "Example: skein trim cases/trainer_two_seat.toml --json trim.json");
  trim->add_option("CASE", a.case_path, "case file (TOML) with a [trim] table")->required();
  trim->add_option("--json", a.json, "write the results document, with its \"trim\" object, to FILE ('-' for "
                                     "standard output)")
      ->type_name("FILE");
  trim->add_option("--csv", a.csv_dir, "write points.csv, strips.csv and structural.csv of the trimmed point into DIR")
      ->type_name("DIR");
  trim->add_option("--threads", a.threads, "OpenMP threads (default: all cores)")->check(CLI::Range(1, 1024));
  trim->add_flag("--quiet", a.quiet, "print no summary");
  AddPlotsReportOptions(solve, a.plots);
  AddPlotsReportOptions(trim, a.plots);
  TwistArgs tw;
  CLI::App* twist = app.add_subcommand(
      "twist", "Design the spanwise twist of a wing for least induced drag at a target CL.\n"
               "Example: skein twist cases/survey_drone.toml --cl 0.5 --out twisted.toml");
  twist->add_option("CASE", a.case_path, "case file (TOML)")->required();
  twist->add_option("--cl", tw.cl, "target lift coefficient")->required();
  twist->add_flag("--keep-root-bending", tw.keep_root_bending,
                  "hold the root bending moment at or below the wing-as-given's at the same CL");
  twist->add_option("--out", tw.out, "write the case with the designed twist to FILE")->type_name("FILE");
  twist->add_option("--surface", tw.surface, "surface to twist (default: the first)")->type_name("NAME");
  twist->add_option("--stations", tw.stations, "design sections per half, root to tip (default 6)")
      ->check(CLI::Range(2, 50));
  twist->add_option("--json", tw.json, "write the design (before, after, twists) to FILE ('-' for standard output)")
      ->type_name("FILE");
  CompareArgs cmp;
  CLI::App* compare = app.add_subcommand(
      "compare", "Solve several cases at the same CL and rank them by induced drag.\n"
                 "Example: skein compare cases/survey_drone.toml twisted.toml --cl 0.5 --json cmp.json");
  compare->add_option("CASES", cmp.cases, "case files (TOML)")->required();
  compare->add_option("--cl", cmp.cl, "lift coefficient for every case (default: the first case's first point)")
      ->each([&](const std::string&) { cmp.cl_given = true; });
  auto* weight = compare->add_option("--weight", cmp.weight,
                                     "compare one aircraft instead of one CL: its weight in N (each case at "
                                     "CL = W / (q S_ref), ranked by induced drag force); needs --speed")
                     ->type_name("N")
                     ->check(CLI::PositiveNumber);
  auto* speed = compare->add_option("--speed", cmp.speed, "true airspeed for --weight, m/s")
                    ->type_name("M/S")
                    ->check(CLI::PositiveNumber);
  auto* density = compare->add_option("--density", cmp.density,
                                      "air density for --weight, kg/m^3 (default: the first case's)")
                      ->type_name("KG/M3")
                      ->check(CLI::PositiveNumber);
  weight->needs(speed);
  speed->needs(weight);
  density->needs(weight);
  weight->excludes("--cl");
  compare->add_option("--json", cmp.json, "write the comparison to FILE ('-' for standard output)")
      ->type_name("FILE");
  compare->add_option("--csv", cmp.csv_dir, "write compare.csv into DIR")->type_name("DIR");
  compare->add_option("--svg", cmp.svg, "write the cases' span loadings at the common CL, overlaid, as an SVG plot to FILE")
      ->type_name("FILE");
  compare->add_option("--threads", cmp.threads,
                      "threads for all the cases (default: all cores); with more cases than threads each case runs on "
                      "one thread, several at a time")
      ->check(CLI::Range(1, 1024));
  const Command study = AddStudyCommand(app);
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    const int rc = app.exit(e);
    return rc == 0 ? 0 : kExitInput;
  }
  try {
    a.trim = trim->parsed();
    if (*solve || *trim) return RunSolve(a);
    if (*twist) return RunTwist(a.case_path, tw);
    if (*compare) return RunCompare(cmp);
    if (*study.app) return study.run();
  } catch (const skein::InputError& e) {
    std::cerr << e.what() << '\n';
    return kExitInput;
  } catch (const skein::TrimError& e) {  // already names the file and the [trim] table
    std::cerr << e.what() << '\n';
    return kExitNumerical;
  } catch (const skein::NumericalError& e) {
    std::cerr << a.case_path << ": " << e.what() << '\n';
    return kExitNumerical;
  } catch (const OutputError& e) {
    std::cerr << "skein: " << e.what() << '\n';
    return kExitOutput;
  } catch (const std::exception& e) {
    std::cerr << "skein: internal error: " << e.what() << '\n';
    return kExitInternal;
  }
  return 0;
}
