// Skein speed driver: times the stages that grow with the panel count, side by side in one run, and prints
// panels, seconds and ratios (never a verdict: the machine may be busy; compare the ratios).
//
//   skein_speed [--sizes 500,1000,2000,3000,4000,6000] [--threads 2] [--repeat 3]
//       For each N: a symmetric wing of N panels solved as one full N x N system. Every time is the smallest
//       of --repeat runs (the least disturbed by other work on the machine).
//       assemble   AssembleInfluence, seconds and nanoseconds per matrix entry (wall clock)
//       cpu/entry  the same in processor time summed over all threads, ns: on a busy machine the steadier one;
//                  wall ns/entry on T idle cores is about cpu/entry / T
//       dgetrf     LAPACKE_dgetrf (the machine's LAPACK, OpenBLAS here) on a copy of the matrix
//       eigen_lu   Eigen's own PartialPivLU (this file does not define EIGEN_USE_LAPACKE) on another copy
//       pipeline   skein::Run of the same wing (full model), total / (assemble + factorise) from its stage times
//       half       skein::Run with the half model (two N/2 systems), the same ratio
//       dx         largest difference between the dgetrf and Eigen solutions of one right-hand side, relative
//   skein_speed --memory N [--full] [--threads 2]
//       One Run of an N-panel wing (half model unless --full) and the process's peak resident memory against
//       the matrices it must hold and skein::EstimateMemoryBytes.
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <ctime>
#include <cstdlib>
#include <string>
#include <utility>
#include <vector>

#include <Eigen/Core>
#include <Eigen/LU>
#include <lapacke.h>
#include <omp.h>
#include <sys/resource.h>

#include "skein/influence.hpp"
#include "skein/lattice.hpp"
#include "skein/run.hpp"

namespace {

using Clock = std::chrono::steady_clock;
double Since(Clock::time_point t0) { return std::chrono::duration<double>(Clock::now() - t0).count(); }
double CpuSince(std::clock_t c0) { return static_cast<double>(std::clock() - c0) / CLOCKS_PER_SEC; }

/// A symmetric rectangular wing, 15 m span, 1 m chord, 10 chordwise panels: `panels` in all (a multiple of 20).
skein::Case WingOf(std::size_t panels) {
  skein::Case c;
  c.title = "speed driver wing";
  skein::Surface s;
  s.name = "wing";
  s.symmetric = true;
  s.mesh.chordwise = 10;
  s.mesh.spanwise = static_cast<int>(panels / 20);
  s.mesh.chordwise_spacing = skein::Spacing::cosine;
  s.mesh.spanwise_spacing = skein::Spacing::cosine;
  s.mesh.wake = skein::WakeDirection::x_axis;
  skein::Section root, tip;
  root.chord = tip.chord = 1.0;
  tip.leading_edge = {0.0, 7.5, 0.0};
  s.sections = {root, tip};
  c.mesh = s.mesh;
  c.surfaces = {s};
  c.reference.area = 15.0;
  c.reference.span = 15.0;
  c.reference.chord = 1.0;
  c.flight.alpha_deg = {2.0, 4.0};
  return c;
}

std::vector<std::size_t> ParseSizes(const std::string& s) {
  std::vector<std::size_t> out;
  std::size_t pos = 0;
  while (pos < s.size()) {
    const std::size_t comma = s.find(',', pos);
    out.push_back(std::stoul(s.substr(pos, comma - pos)));
    if (comma == std::string::npos) break;
    pos = comma + 1;
  }
  return out;
}

double PeakResidentBytes() {
  rusage u{};
  getrusage(RUSAGE_SELF, &u);
  return static_cast<double>(u.ru_maxrss) * 1024.0;  // Linux reports kilobytes
}

int Memory(std::size_t panels, bool full) {
  skein::RunOptions opt;
  opt.allow_half_model = !full;
  const double before = PeakResidentBytes();
  const skein::Results r = skein::Run(WingOf(panels), opt);
  const double peak = PeakResidentBytes();
  const double n = static_cast<double>(r.mesh.unknowns);
  const double matrices = (full ? 1.0 : 2.0) * 8.0 * n * n;
  const double estimate = static_cast<double>(skein::EstimateMemoryBytes(panels, 0, !full));
  std::printf("panels %zu  unknowns %zu  model %s  threads %d\n", r.mesh.panels, r.mesh.unknowns,
              full ? "full" : "half", r.times.threads_used);
  std::printf("peak resident %.1f MB (%.1f MB before the run)  matrices %.1f MB  peak/matrices %.3f  "
              "(peak - matrices) %.1f MB  estimate %.1f MB\n",
              peak / 1e6, before / 1e6, matrices / 1e6, peak / matrices, (peak - matrices) / 1e6, estimate / 1e6);
  std::printf("seconds: mesh %.3f assemble %.3f factorise %.3f solve %.3f loads %.3f total %.3f  "
              "total/(assemble+factorise) %.3f\n",
              r.times.mesh, r.times.assemble, r.times.factorise, r.times.solve, r.times.loads, r.times.total,
              r.times.total / (r.times.assemble + r.times.factorise));
  return 0;
}

int Table(const std::vector<std::size_t>& sizes, int repeat) {
  std::printf("threads %d (OpenMP); OpenBLAS threads from OPENBLAS_NUM_THREADS (unset: all cores)\n",
              omp_get_max_threads());
  std::printf("%6s %9s %8s %9s %9s %9s %10s %10s %9s %9s %9s %9s %9s\n", "N", "assemble", "ns/entry",
              "cpu/entry", "dgetrf", "eigen_lu", "eigen/blas", "asm/dgetrf", "pipeline", "pipe/a+f", "half",
              "half/a+f", "dx");
  for (std::size_t n : sizes) {
    const skein::Case c = WingOf(n);
    const skein::Lattice lat = skein::BuildLattice(c);
    const skein::WakeGeometry wake;  // x-axis legs, free air
    const std::vector<skein::SystemLayout> layouts = skein::ChooseLayouts(lat, wake, false);
    double t_asm = 1e300, cpu_asm = 1e300;
    std::vector<Eigen::MatrixXd> mats;
    for (int r = 0; r < repeat; ++r) {
      mats.clear();
      const auto t0 = Clock::now();
      const std::clock_t c0 = std::clock();
      mats = skein::AssembleInfluence(lat, layouts, wake);
      t_asm = std::min(t_asm, Since(t0));
      cpu_asm = std::min(cpu_asm, CpuSince(c0));
    }
    Eigen::MatrixXd& a = mats.front();
    const auto ni = a.rows();
    const Eigen::VectorXd rhs = Eigen::VectorXd::LinSpaced(ni, 1.0, 2.0);

    Eigen::MatrixXd blas;
    std::vector<lapack_int> ipiv(static_cast<std::size_t>(ni));
    double t_blas = 1e300;
    lapack_int info = 0;
    for (int r = 0; r < repeat; ++r) {
      blas = a;
      const auto t0 = Clock::now();
      info = LAPACKE_dgetrf(LAPACK_COL_MAJOR, static_cast<lapack_int>(ni), static_cast<lapack_int>(ni),
                            blas.data(), static_cast<lapack_int>(ni), ipiv.data());
      t_blas = std::min(t_blas, Since(t0));
    }
    Eigen::VectorXd x_blas = rhs;
    LAPACKE_dgetrs(LAPACK_COL_MAJOR, 'N', static_cast<lapack_int>(ni), 1, blas.data(), static_cast<lapack_int>(ni),
                   ipiv.data(), x_blas.data(), static_cast<lapack_int>(ni));
    blas.resize(0, 0);

    double t_eigen = 1e300;
    Eigen::VectorXd x_eigen;
    for (int r = 0; r < repeat; ++r) {
      Eigen::MatrixXd copy = a;
      const auto t0 = Clock::now();
      Eigen::PartialPivLU<Eigen::Ref<Eigen::MatrixXd>> lu(copy);  // in place, Eigen's own kernels
      t_eigen = std::min(t_eigen, Since(t0));
      x_eigen = lu.solve(rhs);
    }
    const double dx = (x_blas - x_eigen).cwiseAbs().maxCoeff() / x_eigen.cwiseAbs().maxCoeff();
    mats.clear();

    skein::RunOptions full;
    full.allow_half_model = false;
    // The run with the smallest total, and its own ratio.
    skein::Results rf, rh;
    rf.times.total = rh.times.total = 1e300;
    for (int r = 0; r < repeat; ++r) {
      skein::Results f = skein::Run(c, full), h = skein::Run(c, {});
      if (f.times.total < rf.times.total) rf = std::move(f);
      if (h.times.total < rh.times.total) rh = std::move(h);
    }
    const double pipe = rf.times.total / (rf.times.assemble + rf.times.factorise);
    const double half = rh.times.total / (rh.times.assemble + rh.times.factorise);
    const double entries = static_cast<double>(ni) * static_cast<double>(ni);
    std::printf("%6zu %9.4f %8.2f %10.2f %9.4f %9.4f %9.2f %10.3f %9.4f %9.3f %9.4f %9.3f %9.1e%s\n", n, t_asm,
                1e9 * t_asm / entries, 1e9 * cpu_asm / entries, t_blas, t_eigen, t_eigen / t_blas, t_asm / t_blas,
                rf.times.total, pipe, rh.times.total, half, dx, info == 0 ? "" : "  (dgetrf info != 0)");
    std::fflush(stdout);
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  std::vector<std::size_t> sizes{500, 1000, 2000, 3000, 4000, 6000};
  std::size_t memory = 0;
  bool full = false;
  int repeat = 1;
  for (int i = 1; i < argc; ++i) {
    const std::string arg = argv[i];
    auto next = [&]() -> std::string {
      if (i + 1 >= argc) {
        std::fprintf(stderr, "skein_speed: %s needs a value\n", arg.c_str());
        std::exit(2);
      }
      return argv[++i];
    };
    if (arg == "--sizes") {
      sizes = ParseSizes(next());
    } else if (arg == "--threads") {
      omp_set_num_threads(std::stoi(next()));
    } else if (arg == "--memory") {
      memory = std::stoul(next());
    } else if (arg == "--repeat") {
      repeat = std::max(1, std::stoi(next()));
    } else if (arg == "--full") {
      full = true;
    } else {
      std::fprintf(stderr, "usage: skein_speed [--sizes N,N,...] [--threads T] [--repeat R] | --memory N [--full]\n");
      return 2;
    }
  }
  for (std::size_t n : sizes)
    if (n % 20 != 0 || n == 0) {
      std::fprintf(stderr, "skein_speed: sizes must be positive multiples of 20 (10 chordwise x 2 halves)\n");
      return 2;
    }
  return memory ? Memory(memory, full) : Table(sizes, repeat);
}
