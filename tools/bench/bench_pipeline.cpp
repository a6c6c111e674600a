// Skein benchmarks (Google Benchmark): every speed target of the project measured as a ratio of two times taken
// side by side in the same run (each iteration times both, alternating their order), then one table of ratios.
// On a shared machine absolute times mean little; ratios measured together do. Nothing here passes or fails.
//
//   Factorise/N   the project's factorisation (InPlaceLu, as SolveBasis uses it) against LAPACKE_dgetrf (the
//                 machine's LAPACK: OpenBLAS on Debian) on copies of the same N x N influence matrix
//   Assembly/4000 AssembleInfluence of the full 4000 x 4000 matrix (wall and processor ns per entry) against
//                 the factorisation of that matrix
//   Symmetric/4000  a mirror-symmetric aircraft (wing, tail with elevator, fin; 4000 panels) at one point in
//                 symmetric flight: the full lattice against the half model, with and without the lateral
//                 derivatives (RunOptions::lateral)
//   Sweep/4000/x-axis, Sweep/4000/freestream  the aircraft with aileron, elevator and rudder, a 20-point alpha
//                 sweep with every stability and control derivative against its first point alone
//   Pipeline/4000/half-model, Pipeline/4000/full-lattice  the 20-point sweep as a user runs it: read the case
//                 file, mesh, assemble, factorise, solve, loads, write the JSON, against the assembly plus
//                 factorisation of the same run (its own stage times)
// Then two child processes (this program run again), each reporting its own peak resident memory:
//   memory: the 4000-panel wing on the full lattice, against one N x N matrix + 20 % + 50 MB
//   10 000 panels: the aircraft scaled to 10 000 panels, default options; its plan and memory estimate are
//                 printed before it starts assembling.
//
// tools/bench.sh builds and runs it. The aircraft is our own invention.
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <ctime>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <utility>
#include <vector>

#include <Eigen/Core>
#include <benchmark/benchmark.h>
#include <fmt/format.h>
#include <lapacke.h>
#include <omp.h>
#include <sys/resource.h>
#include <unistd.h>

#include "skein/case_file.hpp"
#include "skein/influence.hpp"
#include "skein/lattice.hpp"
#include "skein/report/json.hpp"
#include "skein/run.hpp"
#include "skein/solver.hpp"

namespace {

using Clock = std::chrono::steady_clock;
double Since(Clock::time_point t0) { return std::chrono::duration<double>(Clock::now() - t0).count(); }
double CpuSince(std::clock_t c0) { return static_cast<double>(std::clock() - c0) / CLOCKS_PER_SEC; }

// ---- the configurations ------------------------------------------------------------------------------------

/// A rectangular-ish wing alone, 10 chordwise panels, `panels` in all (a multiple of 20): the square matrices.
skein::Case WingOf(std::size_t panels) {
  const std::string text = fmt::format(R"(title = "benchmark wing, {} panels"
[reference]
moment_point = [0.35, 0.0, 0.0]
[flight]
alpha = 4.0
[mesh]
chordwise = 10
spanwise = {}
wake = "x-axis"
[[surface]]
name = "wing"
symmetric = true
  [surface.trapezoid]
  root_leading_edge = [0.0, 0.0, 0.0]
  span = 12.0
  root_chord = 1.4
  taper = 0.5
  sweep = 2.0
  dihedral = 3.0
)",
                                       panels, panels / 20);
  return skein::ReadCaseText(text, "bench-wing.toml");
}

/// Wing, tail and centre-line fin; the wing and the tail leave the fuselage's place open (their roots at
/// y = 0.3 and 0.12 m), so that with the freestream wake no trailing leg of theirs runs through the fin. `scale` multiplies the spanwise counts: scale 1 gives 2800 + 800 + 400 =
/// 4000 panels, scale 2.5 gives 10 000. `lateral_controls` adds the aileron and the rudder to the elevator.
std::string AircraftText(double scale, bool lateral_controls, const std::string& alpha, const std::string& wake) {
  const int ws = static_cast<int>(140 * scale), ts = static_cast<int>(50 * scale), fs = static_cast<int>(50 * scale);
  const std::string aileron = lateral_controls ? R"(
  [[surface.control]]
  name = "aileron"
  hinge = 0.75
  span_fraction = [0.55, 0.92]
  mirror = "opposite"
)"
                                               : "";
  const std::string rudder = lateral_controls ? R"(
  [[surface.control]]
  name = "rudder"
  hinge = 0.65
  span_fraction = [0.05, 0.95]
)"
                                              : "";
  return fmt::format(R"(title = "benchmark aircraft"
[reference]
moment_point = [0.5, 0.0, 0.0]
[flight]
alpha = {alpha}
speed = 40.0
[mesh]
chordwise = 10
spanwise = {ws}
wake = "{wake}"
[[surface]]
name = "wing"
symmetric = true
  [surface.trapezoid]
  root_leading_edge = [0.0, 0.3, 0.0]
  span = 11.6
  root_chord = 1.5
  taper = 0.6
  sweep = 3.0
  dihedral = 4.0
  washout = 1.5
  camber = "NACA 2412"
{aileron}
[[surface]]
name = "tail"
symmetric = true
incidence = -1.0
chordwise = 8
spanwise = {ts}
  [surface.trapezoid]
  root_leading_edge = [5.2, 0.12, 0.35]
  span = 3.2
  root_chord = 0.85
  taper = 0.6
  sweep = 6.0
  [[surface.control]]
  name = "elevator"
  hinge = 0.65
  span_fraction = [0.0, 1.0]
  mirror = "same"
[[surface]]
name = "fin"
symmetric = false
chordwise = 8
spanwise = {fs}
  [surface.trapezoid]
  root_leading_edge = [5.0, 0.0, 0.35]
  span = 1.5
  root_chord = 1.1
  taper = 0.5
  sweep = 25.0
  vertical = true
{rudder}
)",
                     fmt::arg("alpha", alpha), fmt::arg("ws", ws), fmt::arg("wake", wake),
                     fmt::arg("aileron", aileron), fmt::arg("ts", ts), fmt::arg("fs", fs), fmt::arg("rudder", rudder));
}

const char* kSweep = "{ from = -4.0, to = 15.0, step = 1.0 }";  // 20 points

skein::Case Aircraft(double scale, bool lateral_controls, const std::string& alpha, const std::string& wake) {
  return skein::ReadCaseText(AircraftText(scale, lateral_controls, alpha, wake), "bench-aircraft.toml");
}

// ---- ratios kept for the table -------------------------------------------------------------------------

struct Ratio {
  std::vector<double> values;
  double Median() const {
    std::vector<double> v = values;
    std::sort(v.begin(), v.end());
    if (v.empty()) return 0.0;
    const std::size_t n = v.size();
    return n % 2 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
  }
  double Min() const { return values.empty() ? 0.0 : *std::min_element(values.begin(), values.end()); }
  double Max() const { return values.empty() ? 0.0 : *std::max_element(values.begin(), values.end()); }
};
std::map<std::string, Ratio>& Ratios() {
  static std::map<std::string, Ratio> r;
  return r;
}
void Keep(const std::string& name, double v) { Ratios()[name].values.push_back(v); }

/// The full-lattice influence matrix of the benchmark wing of N panels.
Eigen::MatrixXd WingMatrix(std::size_t n) {
  const skein::Case c = WingOf(n);
  const skein::Lattice lat = skein::BuildLattice(c);
  const skein::WakeGeometry wake;
  return skein::AssembleInfluence(lat, skein::ChooseLayouts(lat, wake, false), wake).front();
}

double TimeProjectLu(const Eigen::MatrixXd& a, Eigen::MatrixXd& work) {
  work = a;
  const auto t0 = Clock::now();
  const skein::InPlaceLu lu(work);
  const double t = Since(t0);
  benchmark::DoNotOptimize(work.data());
  return t;
}

double TimeDgetrf(const Eigen::MatrixXd& a, Eigen::MatrixXd& work, std::vector<lapack_int>& ipiv) {
  work = a;
  const auto n = static_cast<lapack_int>(a.rows());
  ipiv.resize(static_cast<std::size_t>(n));
  const auto t0 = Clock::now();
  const lapack_int info = LAPACKE_dgetrf(LAPACK_COL_MAJOR, n, n, work.data(), n, ipiv.data());
  const double t = Since(t0);
  if (info != 0) std::fprintf(stderr, "dgetrf info %d\n", static_cast<int>(info));
  benchmark::DoNotOptimize(work.data());
  return t;
}

/// Seconds to allocate an n x n matrix and write it once, column by column on every thread, the large pages
/// asked for as AssembleInfluence asks (skein::AdviseHugePages): the first-touch cost a fresh matrix carries,
/// whatever fills it.
double FirstTouchSeconds(Eigen::Index n) {
  const auto t0 = Clock::now();
  Eigen::MatrixXd m(n, n);
  skein::AdviseHugePages(m);
#pragma omp parallel for schedule(static)
  for (Eigen::Index j = 0; j < n; ++j) m.col(j).setZero();
  benchmark::DoNotOptimize(m.data());
  return Since(t0);
}

// ---- benchmarks --------------------------------------------------------------------------------------------

void Factorise(benchmark::State& state) {
  const auto n = static_cast<std::size_t>(state.range(0));
  const Eigen::MatrixXd a = WingMatrix(n);
  Eigen::MatrixXd work(a.rows(), a.cols());
  std::vector<lapack_int> ipiv;
  double sum_project = 0.0, sum_ref = 0.0;
  int it = 0;
  for (auto _ : state) {
    double tp = 0.0, tr = 0.0;
    if (it++ % 2 == 0) {
      tp = TimeProjectLu(a, work);
      tr = TimeDgetrf(a, work, ipiv);
    } else {
      tr = TimeDgetrf(a, work, ipiv);
      tp = TimeProjectLu(a, work);
    }
    state.SetIterationTime(tp);
    sum_project += tp;
    sum_ref += tr;
    Keep(fmt::format("factorise/dgetrf N={}", n), tp / tr);
  }
  const double nd = static_cast<double>(n);
  state.counters["dgetrf_s"] = sum_ref / it;
  state.counters["ratio"] = sum_project / sum_ref;
  state.counters["GFLOP_s"] = 2.0 * nd * nd * nd / 3.0 / (sum_project / it) / 1e9;
}

void Assembly(benchmark::State& state) {
  const auto n = static_cast<std::size_t>(state.range(0));
  const skein::Case c = WingOf(n);
  const skein::Lattice lat = skein::BuildLattice(c);
  const skein::WakeGeometry wake;
  const std::vector<skein::SystemLayout> layouts = skein::ChooseLayouts(lat, wake, false);
  const double entries = static_cast<double>(n) * static_cast<double>(n);
  for (auto _ : state) {
    std::vector<Eigen::MatrixXd> m;
    const auto t0 = Clock::now();
    const std::clock_t c0 = std::clock();
    m = skein::AssembleInfluence(lat, layouts, wake);
    const double ta = Since(t0), ca = CpuSince(c0);
    const auto t1 = Clock::now();
    const skein::InPlaceLu lu(m.front());
    const double tf = Since(t1);
    state.SetIterationTime(ta);
    Keep(fmt::format("assembly ns/entry (wall) N={}", n), 1e9 * ta / entries);
    Keep(fmt::format("assembly ns/entry (cpu, all threads) N={}", n), 1e9 * ca / entries);
    Keep(fmt::format("assembly ns/entry (cpu / threads) N={}", n), 1e9 * ca / entries / omp_get_max_threads());
    Keep(fmt::format("assembly/factorisation N={}", n), ta / tf);
    // What the assembly pays the operating system before its kernel runs: the first touch of a fresh matrix
    // of the same size (huge pages asked for, as the assembly does), on every thread. It varies with the
    // machine's free memory; the assembly's time less this one estimates the kernel's.
    const double tz = FirstTouchSeconds(static_cast<Eigen::Index>(n));
    Keep(fmt::format("first touch of a fresh N x N matrix, ns/entry (wall) N={}", n), 1e9 * tz / entries);
    Keep(fmt::format("assembly less that first touch, ns/entry (wall) N={}", n), 1e9 * (ta - tz) / entries);
  }
}

void Symmetric(benchmark::State& state) {
  const skein::Case c = Aircraft(1.0, false, "4.0", "x-axis");
  skein::RunOptions full, half, lazy;
  full.allow_half_model = false;
  lazy.lateral = false;
  int it = 0;
  for (auto _ : state) {
    const bool flip = it++ % 2 == 1;
    skein::Results rl, rh, rf;
    if (flip) {
      rl = skein::Run(c, lazy);
      rh = skein::Run(c, half);
      rf = skein::Run(c, full);
    } else {
      rf = skein::Run(c, full);
      rh = skein::Run(c, half);
      rl = skein::Run(c, lazy);
    }
    state.SetIterationTime(rf.times.total);
    Keep("symmetric: full / half model (all derivatives)", rf.times.total / rh.times.total);
    Keep("symmetric: full / half model (--no-lateral)", rf.times.total / rl.times.total);
    state.counters["panels"] = static_cast<double>(rf.mesh.panels);
  }
}

void Sweep(benchmark::State& state, const std::string& wake) {
  const skein::Case one = Aircraft(1.0, true, "4.0", wake), sweep = Aircraft(1.0, true, kSweep, wake);
  int it = 0;
  for (auto _ : state) {
    skein::Results r1, r20;
    const auto t0 = Clock::now();
    if (it++ % 2 == 0) {
      r1 = skein::Run(one, {});
      r20 = skein::Run(sweep, {});
    } else {
      r20 = skein::Run(sweep, {});
      r1 = skein::Run(one, {});
    }
    benchmark::DoNotOptimize(Since(t0));
    state.SetIterationTime(r20.times.total);
    Keep("sweep 20 alpha / 1 point, wake " + wake, r20.times.total / r1.times.total);
    state.counters["panels"] = static_cast<double>(r20.mesh.panels);
    state.counters["factorisations"] = r20.mesh.factorisations;
  }
}

void Pipeline(benchmark::State& state, bool full_model) {
  char dir_template[] = "/tmp/skein-bench-XXXXXX";
  const char* dir = mkdtemp(dir_template);
  if (!dir) {
    state.SkipWithError("no temporary directory");
    return;
  }
  const std::string case_path = std::string(dir) + "/aircraft.toml", json_path = std::string(dir) + "/out.json";
  {
    std::ofstream f(case_path);
    f << AircraftText(1.0, true, kSweep, "x-axis");
  }
  for (auto _ : state) {
    const auto t0 = Clock::now();
    const skein::Case c = skein::ReadCaseFile(case_path);
    skein::RunOptions o;
    o.allow_half_model = !full_model;
    skein::Results r = skein::Run(c, o);
    {
      std::ofstream f(json_path);
      skein::report::WriteJson(r, f);
    }
    const double total = Since(t0);
    state.SetIterationTime(total);
    const double af = r.times.assemble + r.times.factorise;
    const std::string model = full_model ? "full lattice" : "half model";
    Keep("pipeline / (assembly + factorisation), " + model, total / af);
    Keep("pipeline: loads (velocity passes + loads) / (asm + fact), " + model, r.times.loads / af);
    Keep("pipeline: solve / (assembly + factorisation), " + model, r.times.solve / af);
  }
  std::remove(json_path.c_str());
  std::remove(case_path.c_str());
  rmdir(dir);
}

/// Every benchmark, in the order they run; iterations fixed so that the whole run fits in about 5 to 10
/// minutes on 2 busy cores (the large sizes take seconds per iteration).
void Register() {
  for (const auto& [n, iterations] : std::vector<std::pair<int, int>>{{500, 12}, {1000, 8}, {2000, 5}, {4000, 3}, {6000, 2}})
    benchmark::RegisterBenchmark(fmt::format("Factorise/{}", n).c_str(), Factorise)
        ->Arg(n)
        ->Iterations(iterations)
        ->UseManualTime()
        ->Unit(benchmark::kMillisecond);
  benchmark::RegisterBenchmark("Assembly/4000", Assembly)->Arg(4000)->Iterations(3)->UseManualTime()->Unit(
      benchmark::kMillisecond);
  benchmark::RegisterBenchmark("Symmetric/4000", Symmetric)->Iterations(3)->UseManualTime()->Unit(benchmark::kMillisecond);
  benchmark::RegisterBenchmark("Sweep/4000/x-axis", [](benchmark::State& s) { Sweep(s, "x-axis"); })
      ->Iterations(3)
      ->UseManualTime()
      ->Unit(benchmark::kMillisecond);
  benchmark::RegisterBenchmark("Sweep/4000/freestream", [](benchmark::State& s) { Sweep(s, "freestream"); })
      ->Iterations(1)
      ->UseManualTime()
      ->Unit(benchmark::kMillisecond);
  benchmark::RegisterBenchmark("Pipeline/4000/half-model", [](benchmark::State& s) { Pipeline(s, false); })
      ->Iterations(3)
      ->UseManualTime()
      ->Unit(benchmark::kMillisecond);
  benchmark::RegisterBenchmark("Pipeline/4000/full-lattice", [](benchmark::State& s) { Pipeline(s, true); })
      ->Iterations(2)
      ->UseManualTime()
      ->Unit(benchmark::kMillisecond);
}

// ---- child processes: peak memory ----------------------------------------------------------------------------

double PeakResidentBytes() {
  rusage u{};
  getrusage(RUSAGE_SELF, &u);
  return static_cast<double>(u.ru_maxrss) * 1024.0;  // Linux reports kilobytes
}

/// In a fresh process: one Run, then "peak <bytes> estimate <bytes> unknowns <n> panels <n> seconds <s>".
int Child(const std::string& what) {
  skein::RunOptions o;
  o.on_plan = [](const skein::RunPlan& p) {
    std::printf("  plan: %zu panels, %s, largest system %zu unknowns, %d thread(s); memory estimate %.1f MB\n",
                p.panels, p.half_model ? "half model" : "full model", p.unknowns, p.threads,
                static_cast<double>(p.memory_estimate_bytes) / 1e6);
    std::fflush(stdout);
  };
  skein::Case c;
  if (what == "full4000") {
    c = WingOf(4000);
    o.allow_half_model = false;
  } else {
    c = Aircraft(2.5, true, "4.0", "x-axis");
  }
  const auto t0 = Clock::now();
  const skein::Results r = skein::Run(c, o);
  std::printf("peak %.0f estimate %zu unknowns %zu panels %zu seconds %.2f\n", PeakResidentBytes(),
              r.mesh.memory_estimate_bytes, r.mesh.unknowns, r.mesh.panels, Since(t0));
  return 0;
}

struct ChildResult {
  double peak = 0.0, estimate = 0.0, seconds = 0.0;
  std::size_t unknowns = 0, panels = 0;
  bool ok = false;
};

ChildResult RunChild(const std::string& self, const std::string& what) {
  ChildResult out;
  FILE* p = popen((self + " --child " + what).c_str(), "r");
  if (!p) return out;
  char line[512];
  while (std::fgets(line, sizeof line, p)) {
    double peak = 0.0, est = 0.0, secs = 0.0;
    std::size_t unk = 0, pan = 0;
    if (std::sscanf(line, "peak %lf estimate %lf unknowns %zu panels %zu seconds %lf", &peak, &est, &unk, &pan,
                    &secs) == 5) {
      out = {peak, est, secs, unk, pan, true};
    } else {
      std::fputs(line, stdout);  // the plan, as the child printed it before its work
      std::fflush(stdout);
    }
  }
  out.ok = pclose(p) == 0 && out.ok;
  return out;
}

std::string Load() {
  double l[3] = {0.0, 0.0, 0.0};
  if (getloadavg(l, 3) != 3) return "unknown";
  return fmt::format("{:.2f} {:.2f} {:.2f}", l[0], l[1], l[2]);
}

void PrintRow(const std::string& what, const Ratio& r, const std::string& target) {
  std::printf("| %-62s | %8.3f | %8.3f - %-8.3f | %-22s |\n", what.c_str(), r.Median(), r.Min(), r.Max(),
              target.c_str());
}

}  // namespace

int main(int argc, char** argv) {
  skein::RestartWithBlasSettings(argv);  // as the CLI does: the reference dgetrf runs the same way
  if (argc == 3 && std::string(argv[1]) == "--child") return Child(argv[2]);
  bool memory = true;  // --skip-memory: no child processes (a quick look at one benchmark)
  for (int i = 1; i < argc; ++i)
    if (std::string(argv[i]) == "--skip-memory") {
      memory = false;
      for (int k = i; k + 1 < argc; ++k) argv[k] = argv[k + 1];
      --argc;
      break;
    }
  // --isa=baseline|avx2|avx512: cap the kernels' instruction set (to compare the compiled paths).
  for (int i = 1; i < argc; ++i) {
    const std::string arg = argv[i];
    if (arg.rfind("--isa=", 0) != 0) continue;
    const std::string isa = arg.substr(6);
    skein::CapKernelIsa(isa == "baseline" ? skein::KernelIsa::baseline
                        : isa == "avx2"   ? skein::KernelIsa::avx2
                                          : skein::KernelIsa::avx512);
    for (int k = i; k + 1 < argc; ++k) argv[k] = argv[k + 1];
    --argc;
    break;
  }
  const std::string load_before = Load();
  std::printf("skein_bench: factorisation by %s (OpenBLAS kernel %s); assembly kernels %s; %d OpenMP threads; OPENBLAS_NUM_THREADS=%s; load average %s\n",
              skein::InPlaceLu::Backend(), skein::BlasKernelName(),
              skein::KernelIsaName(skein::KernelIsaInUse()), omp_get_max_threads(),
              std::getenv("OPENBLAS_NUM_THREADS") ? std::getenv("OPENBLAS_NUM_THREADS") : "(unset: all cores)",
              load_before.c_str());
  std::fflush(stdout);
  Register();
  benchmark::Initialize(&argc, argv);
  if (benchmark::ReportUnrecognizedArguments(argc, argv)) return 2;
  benchmark::RunSpecifiedBenchmarks();

  const std::string self = "/proc/" + std::to_string(getpid()) + "/exe";
  ChildResult mem, big;
  if (memory) {
    std::printf("\nmemory: the 4000-panel wing on the full lattice, in a child process\n");
    std::fflush(stdout);
    mem = RunChild(self, "full4000");
    std::printf("10 000 panels: the aircraft (wing, tail, fin, three controls), default options, in a child process\n");
    std::fflush(stdout);
    big = RunChild(self, "aircraft10000");
  }

  std::printf("\nRatios (median of the iterations, and their range), measured side by side in this run\n");
  std::printf("| %-62s | %8s | %-19s | %-22s |\n", "measure", "median", "range", "target");
  std::printf("|%s|%s|%s|%s|\n", std::string(64, '-').c_str(), std::string(10, '-').c_str(),
              std::string(21, '-').c_str(), std::string(24, '-').c_str());
  for (const auto& [name, r] : Ratios()) {
    std::string target;
    if (name.rfind("factorise/dgetrf", 0) == 0) target = "<= 1.1 (N 2000-6000)";
    if (name.rfind("assembly/factorisation", 0) == 0) target = "<= 0.15";
    if (name.rfind("assembly ns/entry (wall)", 0) == 0) target = "<= 4 (2 free cores)";
    if (name.rfind("symmetric", 0) == 0) target = ">= 5";
    if (name.rfind("sweep", 0) == 0) target = "<= 1.3";
    if (name.rfind("pipeline / (assembly + factorisation)", 0) == 0) target = "<= 1.25";
    PrintRow(name, r, target);
  }
  if (mem.ok) {
    const double matrix = 8.0 * static_cast<double>(mem.unknowns) * static_cast<double>(mem.unknowns);
    const double bound = 1.2 * matrix + 50e6;
    std::printf("| %-62s | %8.3f | %-19s | %-22s |\n", "peak memory / (N^2 matrix + 20% + 50 MB), full model N=4000",
                mem.peak / bound, fmt::format("{:.0f} MB / {:.0f} MB", mem.peak / 1e6, bound / 1e6).c_str(),
                "<= 1");
    std::printf("| %-62s | %8.3f | %-19s | %-22s |\n", "peak memory / estimate, full model N=4000",
                mem.peak / mem.estimate, fmt::format("est. {:.0f} MB", mem.estimate / 1e6).c_str(), "");
  } else if (memory) {
    std::printf("| memory child failed |\n");
  }
  if (big.ok) {
    const double n = static_cast<double>(big.panels);
    const double bound = 1.2 * 8.0 * n * n + 50e6;
    std::printf("| %-62s | %8.3f | %-19s | %-22s |\n",
                fmt::format("{} panels completed: peak memory / (N^2 matrix + 20% + 50 MB)", big.panels).c_str(),
                big.peak / bound, fmt::format("{:.0f} MB / {:.0f} MB", big.peak / 1e6, bound / 1e6).c_str(), "<= 1");
    std::printf("| %-62s | %8.3f | %-19s | %-22s |\n", "  peak memory / its estimate (printed before the work)",
                big.peak / big.estimate, fmt::format("est. {:.0f} MB, {:.0f} s", big.estimate / 1e6, big.seconds).c_str(),
                "");
  } else if (memory) {
    std::printf("| 10 000-panel child failed |\n");
  }
  std::printf("\nload average before %s, after %s (1, 5, 15 min; 2 cores)\n", load_before.c_str(), Load().c_str());
  benchmark::Shutdown();
  return 0;
}
