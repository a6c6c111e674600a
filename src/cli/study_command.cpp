// skein CLI: `skein study`, a parameter study of one case (study.hpp: RunStudy). It parses the options, reads
// the case file's text, calls the library, draws the progress bar and hands the study to the reporters.
#include "study_command.hpp"

#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <memory>
#include <optional>
#include <sstream>
#include <string>
#include <vector>

#include <fmt/format.h>

#include "skein/error.hpp"
#include "skein/report/study.hpp"
#include "skein/study.hpp"
#include "outputs.hpp"

namespace skein::cli {
namespace {

namespace fs = std::filesystem;

struct StudyArgs {
  std::string case_path;
  std::vector<std::string> vary;
  std::optional<double> cl, alpha;
  std::string json, csv_dir, svg;
  int threads = 0;
  bool quiet = false;
};

/// A progress bar on standard error, drawn only when it is a terminal and the study has run for a second.
class ProgressBar {
 public:
  ProgressBar() : terminal_(::isatty(STDERR_FILENO) == 1), start_(std::chrono::steady_clock::now()) {}
  void operator()(std::size_t done, std::size_t total) {
    if (!terminal_) return;
    constexpr double kDelaySeconds = 1.0;  // a study quicker than this shows no bar
    const double elapsed = std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
    if (!shown_ && elapsed < kDelaySeconds && done < total) return;
    if (!shown_ && done == total) return;  // finished before the bar was due
    constexpr std::size_t kWidth = 30;
    const std::size_t filled = total ? kWidth * done / total : kWidth;
    std::cerr << '\r' << "study [" << std::string(filled, '#') << std::string(kWidth - filled, '.') << "] "
              << done << '/' << total << " variants" << std::flush;
    shown_ = true;
    if (done == total) std::cerr << '\r' << std::string(kWidth + 40, ' ') << '\r' << std::flush;
  }

 private:
  bool terminal_;
  bool shown_ = false;
  std::chrono::steady_clock::time_point start_;
};

std::string ReadText(const std::string& path) {
  std::error_code ec;
  if (fs::is_directory(path, ec)) throw InputError(path, {}, "cannot read the case file: it is a directory");
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, {}, fmt::format("cannot open the case file: {}", std::strerror(errno)));
  std::ostringstream text;
  text << in.rdbuf();
  if (in.bad()) throw InputError(path, {}, "cannot read the case file");
  return text.str();
}

int RunStudyCommand(const StudyArgs& a) {
  if (a.vary.size() > 2)
    throw InputError(fmt::format("study: at most two --vary options (a grid of two keys), got {}", a.vary.size()));
  if (a.cl.has_value() == a.alpha.has_value())
    throw InputError("study: give either --cl X (a fixed lift coefficient) or --alpha DEG (a fixed angle)");
  study::StudyOptions o;
  for (const std::string& v : a.vary) o.axes.push_back(study::ParseStudyAxis(v));
  o.target_CL = a.cl;
  o.alpha_deg = a.alpha;
  o.run.threads = a.threads;
  ProgressBar bar;
  o.progress = [&bar](std::size_t done, std::size_t total) { bar(done, total); };
  const std::string text = ReadText(a.case_path);
  study::Study s;
  try {
    s = study::RunStudy(text, a.case_path, o);
  } catch (const NumericalError& e) {
    std::cerr << a.case_path << ": " << e.what() << '\n';
    return kExitNumerical;
  }

  StagedOutputs out({fs::path(a.case_path)});
  std::ostringstream json_text;
  if (!a.json.empty()) {
    report::WriteStudyJson(s, json_text);
    if (a.json != "-") out.Add(a.json, [&](std::ostream& f) { f << json_text.str(); });
  }
  if (!a.csv_dir.empty()) {
    MakeOutputDirectory(a.csv_dir);
    out.Add(fs::path(a.csv_dir) / "study.csv", [&](std::ostream& f) { report::WriteStudyCsv(s, f); });
  }
  if (!a.svg.empty()) out.Add(a.svg, [&](std::ostream& f) { report::WriteStudySvg(s, f); });
  out.Commit();
  if (a.json == "-") std::cout << json_text.str();
  if (!a.quiet) report::WriteStudyTable(s, a.json == "-" ? std::cerr : std::cout);
  return 0;
}

}  // namespace

Command AddStudyCommand(CLI::App& app) {
  auto a = std::make_shared<StudyArgs>();
  CLI::App* sub = app.add_subcommand(
      "study",
      "Parameter study: solve a case over a range of one number of its file (or a grid of two), each variant\n"
      "at a fixed lift coefficient or a fixed angle of attack, and tabulate lift, induced drag, span efficiency,\n"
      "pitching moment, lift slope, root bending, neutral point and where the local cl peaks.\n"
      "PATH is the dotted path of a number as written in the case file: table keys by name, [[surface]] and\n"
      "[[surface.control]] by their name, sections and array elements by 1-based index, e.g.\n"
      "surface.wing.trapezoid.taper, surface.wing.section.2.twist, surface.tail.incidence, reference.moment_point.1.\n"
      "Example: skein study cases/survey_drone.toml --vary surface.wing.incidence=0:4:5 --cl 0.5 --csv out/");
  sub->add_option("CASE", a->case_path, "case file (TOML)")->required();
  sub->add_option("--vary", a->vary,
                  "PATH=FROM:TO:COUNT (COUNT values from FROM to TO) or PATH=V1,V2,...; give it once or twice "
                  "(twice: every pair, the first varying fastest)")
      ->type_name("PATH=VALUES")
      ->expected(1)
      ->allow_extra_args(false)
      ->multi_option_policy(CLI::MultiOptionPolicy::TakeAll)
      ->required();
  sub->add_option_function<double>("--cl", [a](const double& v) { a->cl = v; },
                                   "solve every variant at this lift coefficient (alpha found for each)")
      ->type_name("X");
  sub->add_option_function<double>("--alpha", [a](const double& v) { a->alpha = v; },
                                   "solve every variant at this angle of attack, deg")
      ->type_name("DEG");
  sub->add_option("--json", a->json, "write the study to FILE ('-' for standard output)")->type_name("FILE");
  sub->add_option("--csv", a->csv_dir, "write study.csv into DIR")->type_name("DIR");
  sub->add_option("--svg", a->svg,
                  "plot CD_induced and span efficiency against the first varied value (one line per value of the "
                  "second) as SVG to FILE")
      ->type_name("FILE");
  sub->add_option("--threads", a->threads,
                  "threads for the whole study (default: all cores); with more variants than threads each "
                  "variant runs on one thread, several at a time")
      ->check(CLI::Range(1, 1024));
  sub->add_flag("--quiet", a->quiet, "print no table");
  return {sub, [a]() { return RunStudyCommand(*a); }};
}

}  // namespace skein::cli
