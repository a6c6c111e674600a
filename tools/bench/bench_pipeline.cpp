// Skein benchmarks (Google Benchmark): the stages whose cost grows with the panel count N, for N = 500 to 4000.
//
//   Assemble/N   AssembleInfluence of the full N x N matrix (one horseshoe per column, every control point)
//   Factorise/N  LU with partial pivoting of that matrix, in place, as src/solver.cpp does it (Eigen's
//                PartialPivLU, through LAPACKE when the library is built with OpenBLAS)
//   Solve/N      the factorised matrix applied to the six flow-basis right-hand sides (BasisRightHandSides)
//   Run/N        skein::Run of the whole case as a user runs it: mesh, half-model assembly and factorisation
//                (two N/2 systems), solve, loads; one flight point
//
// Counters: panels_per_s (N per second of the stage), and for Assemble entries_per_s (N^2 per second), for
// Factorise flops_per_s (2 N^3 / 3 per second). Numbers depend on the machine and on what else runs on it:
// compare ratios between sizes and stages, not absolute times. Nothing here passes or fails.
//
// The wing is a scenario of our own: a symmetric tapered wing, 12 m span, chords 1.4 m to 0.7 m, 3 deg of
// dihedral, 10 chordwise panels, N / 20 spanwise panels per half.
#include <cmath>
#include <cstddef>
#include <vector>

#include <Eigen/Core>
#include <Eigen/LU>
#include <benchmark/benchmark.h>
#include <omp.h>

#include "skein/case.hpp"
#include "skein/influence.hpp"
#include "skein/lattice.hpp"
#include "skein/run.hpp"
#include "skein/solver.hpp"

namespace {

constexpr int kChordwise = 10;
constexpr double kAlphaDeg = 4.0;

skein::Case BenchWing(std::size_t panels) {
  skein::Case c;
  c.title = "benchmark wing";
  skein::Surface s;
  s.name = "wing";
  s.symmetric = true;
  s.mesh.chordwise = kChordwise;
  s.mesh.spanwise = static_cast<int>(panels / (2 * kChordwise));
  s.mesh.chordwise_spacing = skein::Spacing::cosine;
  s.mesh.spanwise_spacing = skein::Spacing::cosine;
  skein::Section root, tip;
  root.chord = 1.4;
  tip.chord = 0.7;
  tip.leading_edge = {0.35, 6.0, 6.0 * std::tan(3.0 * 3.14159265358979323846 / 180.0)};
  s.sections = {root, tip};
  c.mesh = s.mesh;
  c.surfaces = {s};
  const skein::SurfaceExtent e = skein::MeasureSurface(c.surfaces.front());
  c.reference.area = e.area;
  c.reference.span = e.span;
  c.reference.chord = e.mean_aerodynamic_chord;
  c.reference.moment_point = {0.35, 0.0, 0.0};
  c.flight.alpha_deg = {kAlphaDeg};
  return c;
}

/// The lattice, the full-model layout and the wake of the benchmark wing with `panels` panels.
struct Problem {
  skein::Case c;
  skein::Lattice lat;
  skein::WakeGeometry wake;
  std::vector<skein::SystemLayout> layouts;
  explicit Problem(std::size_t panels)
      : c(BenchWing(panels)),
        lat(skein::BuildLattice(c)),
        wake(skein::WakeFor(c, kAlphaDeg, 0.0)),
        layouts(skein::ChooseLayouts(lat, wake, /*allow_split=*/false)) {}
};

std::size_t PanelsOf(const benchmark::State& state) { return static_cast<std::size_t>(state.range(0)); }

void SetCommonCounters(benchmark::State& state, std::size_t n) {
  state.counters["panels"] = static_cast<double>(n);
  state.counters["threads"] = omp_get_max_threads();
  state.counters["panels_per_s"] =
      benchmark::Counter(static_cast<double>(n), benchmark::Counter::kIsIterationInvariantRate);
}

void Assemble(benchmark::State& state) {
  const Problem p(PanelsOf(state));
  const std::size_t n = p.lat.panels();
  for (auto _ : state) {
    std::vector<Eigen::MatrixXd> m = skein::AssembleInfluence(p.lat, p.layouts, p.wake);
    benchmark::DoNotOptimize(m.front().data());
    benchmark::ClobberMemory();
  }
  SetCommonCounters(state, n);
  state.counters["entries_per_s"] =
      benchmark::Counter(static_cast<double>(n) * static_cast<double>(n), benchmark::Counter::kIsIterationInvariantRate);
}

void Factorise(benchmark::State& state) {
  const Problem p(PanelsOf(state));
  const std::size_t n = p.lat.panels();
  const Eigen::MatrixXd a = skein::AssembleInfluence(p.lat, p.layouts, p.wake).front();
  Eigen::MatrixXd work(a.rows(), a.cols());
  for (auto _ : state) {
    state.PauseTiming();
    work = a;  // a fresh matrix each time: the factorisation overwrites it
    state.ResumeTiming();
    Eigen::PartialPivLU<Eigen::Ref<Eigen::MatrixXd>> lu(work);
    benchmark::DoNotOptimize(lu.matrixLU().data());
    benchmark::ClobberMemory();
  }
  SetCommonCounters(state, n);
  const double nd = static_cast<double>(n);
  state.counters["flops_per_s"] =
      benchmark::Counter(2.0 * nd * nd * nd / 3.0, benchmark::Counter::kIsIterationInvariantRate);
}

void Solve(benchmark::State& state) {
  const Problem p(PanelsOf(state));
  const std::size_t n = p.lat.panels();
  Eigen::MatrixXd a = skein::AssembleInfluence(p.lat, p.layouts, p.wake).front();
  const Eigen::PartialPivLU<Eigen::Ref<Eigen::MatrixXd>> lu(a);
  const Eigen::MatrixXd b =
      skein::BasisRightHandSides(p.lat, p.c.reference.moment_point).leftCols(skein::kBasisSize);
  for (auto _ : state) {
    Eigen::MatrixXd x = lu.solve(b);
    benchmark::DoNotOptimize(x.data());
    benchmark::ClobberMemory();
  }
  SetCommonCounters(state, n);
}

void Run(benchmark::State& state) {
  const skein::Case c = BenchWing(PanelsOf(state));
  std::size_t n = 0;
  for (auto _ : state) {
    const skein::Results r = skein::Run(c, {});
    n = r.mesh.panels;
    benchmark::DoNotOptimize(r.points.front().CL);
  }
  SetCommonCounters(state, n);
}

void Sizes(benchmark::internal::Benchmark* b) {
  for (int n : {500, 1000, 2000, 3000, 4000}) b->Arg(n);
  b->Unit(benchmark::kMillisecond)->UseRealTime();
}

BENCHMARK(Assemble)->Apply(Sizes);
BENCHMARK(Factorise)->Apply(Sizes);
BENCHMARK(Solve)->Apply(Sizes);
BENCHMARK(Run)->Apply(Sizes);

}  // namespace

BENCHMARK_MAIN();
