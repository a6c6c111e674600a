// Skein: the pipeline for one case. See run.hpp.
#include "skein/run.hpp"

#include <chrono>
#include <cmath>
#include <exception>
#include <map>
#include <set>
#include <string>
#include <utility>
#include <vector>

#include <fmt/format.h>
#include <omp.h>
#include <unistd.h>

#include "skein/geometry_check.hpp"
#include "skein/influence.hpp"
#include "skein/probe.hpp"
#include "skein/profile_drag.hpp"
#include "skein/structural.hpp"
#include "vec3.hpp"

namespace skein {
namespace {

using Clock = std::chrono::steady_clock;
double Since(Clock::time_point t0) { return std::chrono::duration<double>(Clock::now() - t0).count(); }

}  // namespace

std::size_t EstimateMemoryBytes(std::size_t panels, std::size_t controls, const std::vector<std::size_t>& systems) {
  const std::size_t cols = 6 * (1 + controls);
  std::size_t matrix = 0;
  for (std::size_t m : systems) matrix += m * m;
  // Matrices, right-hand sides, circulations and induced velocities (4 x N x cols), lattice (~60 doubles/panel).
  return 8 * (matrix + 6 * panels * cols + 60 * panels);
}

std::size_t EstimateMemoryBytes(std::size_t panels, std::size_t controls, bool half_model) {
  // Half model: a symmetric and an antisymmetric matrix of (N/2)^2 each; full: one N^2 matrix.
  if (half_model) return EstimateMemoryBytes(panels, controls, {panels / 2 + 1, panels / 2 + 1});
  return EstimateMemoryBytes(panels, controls, std::vector<std::size_t>{panels});
}

std::size_t PhysicalMemoryBytes() {
  const long pages = sysconf(_SC_PHYS_PAGES), size = sysconf(_SC_PAGE_SIZE);
  return pages > 0 && size > 0 ? static_cast<std::size_t>(pages) * static_cast<std::size_t>(size) : 0;
}

WakeGeometry WakeFor(const Case& c, double alpha_deg, double beta_deg) {
  WakeGeometry w;
  w.ground = c.ground;
  if (c.mesh.wake == WakeDirection::freestream) {
    const double a = alpha_deg * detail::kDegToRad, b = beta_deg * detail::kDegToRad;
    w.direction = {std::cos(a) * std::cos(b), -std::sin(b), std::sin(a) * std::cos(b)};
    if (!(std::abs(beta_deg) > 0.0)) w.direction[1] = 0.0;  // exactly, so the half model applies
  }
  return w;
}

Results Run(const Case& c, const RunOptions& options) {
  const auto t_start = Clock::now();
  Results res;
  res.title = c.title;
  res.source_path = c.source_path;
  res.reference = c.reference;
  res.warnings = c.warnings;
  res.times.threads_given = options.threads;
  if (options.threads > 0) omp_set_num_threads(options.threads);
  res.times.threads_used = omp_get_max_threads();

  // Refuse a mesh that will not fit before allocating anything.
  const std::size_t panels = CountPanels(c);
  std::size_t controls = 0;
  for (const Surface& s : c.surfaces) controls += s.controls.size();
  const std::size_t need = EstimateMemoryBytes(panels, controls, false);
  const std::size_t limit = options.memory_limit_bytes ? options.memory_limit_bytes : PhysicalMemoryBytes();
  // A size error points at the surface with the most panels: the one to coarsen first.
  SourceRegion biggest;
  std::size_t most = 0;
  for (const Surface& s : c.surfaces) {
    const std::size_t n = CountPanels(s);
    if (n > most) {
      most = n;
      biggest = s.where;
    }
  }
  if (options.max_panels && panels > options.max_panels)
    throw InputError(c.source_path, biggest,
                     fmt::format("the mesh has {} panels, more than --max-panels {}", panels, options.max_panels));
  if (limit && need > limit)
    throw InputError(c.source_path, biggest,
                     fmt::format("the mesh has {} panels and would need {:.1f} GB of memory, more than the "
                                 "{:.1f} GB available; reduce [mesh] chordwise or spanwise",
                                 panels, static_cast<double>(need) / 1e9, static_cast<double>(limit) / 1e9));

  auto t0 = Clock::now();
  const Lattice lat = BuildLattice(c);
  CheckGeometry(c, lat);  // coincident, intersecting, folded or degenerate surfaces: InputError before assembly
  res.times.mesh = Since(t0);
  res.mesh.panels = lat.panels();
  for (const LatticeSurface& s : lat.surfaces) res.mesh.surfaces.push_back({s.name, s.panels, s.strips});

  SolverOptions so;
  so.threads = options.threads;
  so.allow_half_model = options.allow_half_model;

  // Points grouped by wake geometry; each group is assembled and factorised once.
  struct Key {
    double a, b;
    bool operator<(const Key& o) const { return a < o.a || (!(o.a < a) && b < o.b); }
  };
  const bool freestream = c.mesh.wake == WakeDirection::freestream;
  std::map<Key, std::vector<std::size_t>> groups;
  std::vector<std::pair<double, double>> points;
  for (double beta : c.flight.beta_deg)
    for (double alpha : c.flight.alpha_deg) points.emplace_back(alpha, beta);
  for (std::size_t p = 0; p < points.size(); ++p) {
    const Key k = freestream ? Key{points[p].first, points[p].second} : Key{0.0, 0.0};
    groups[k].push_back(p);
  }
  res.points.resize(points.size());
  std::set<std::pair<int, int>> wake_warned;  // one near-the-wake warning per pair of surfaces
  // A group that cannot be solved (its wake meets another surface's control points, its system is singular)
  // marks its points with the error and the sweep carries on; only when every point fails does Run throw.
  std::exception_ptr first_failure;
  const auto flight_point = [&](std::size_t p) {
    FlightPoint fp;
    fp.alpha_deg = points[p].first;
    fp.beta_deg = points[p].second;
    fp.mach = c.flight.mach;
    fp.rates = c.flight.rates;
    fp.speed = c.flight.speed;
    return fp;
  };

  // Lateral derivatives skipped on request only if every point is in symmetric flight (the lateral flow
  // parameters v, p, r vanish), so that every point of the sweep has the same outputs.
  bool symmetric_flight = true;
  for (std::size_t p = 0; p < points.size(); ++p) {
    const auto cf = FlowParameters(flight_point(p));
    if (std::abs(cf[1]) > 0.0 || std::abs(cf[3]) > 0.0 || std::abs(cf[5]) > 0.0) symmetric_flight = false;
  }
  so.lateral = options.lateral || !symmetric_flight;

  // The plan, before the long work: the largest systems any wake geometry needs, and their memory.
  {
    RunPlan plan;
    plan.panels = lat.panels();
    plan.threads = res.times.threads_used;
    plan.lateral = true;
    plan.factorisations = static_cast<int>(groups.size());
    std::vector<std::size_t> biggest_systems;
    std::size_t biggest_bytes = 0;
    for (const auto& [key, members] : groups) {
      const WakeGeometry wake = WakeFor(c, points[members.front()].first, points[members.front()].second);
      std::vector<SystemLayout> layouts = ChooseLayouts(lat, wake, so.allow_half_model);
      const bool split = layouts.size() == 2;
      if (split && !so.lateral && !LateralSystemNeeded(lat, layouts)) {
        layouts.pop_back();
        plan.lateral = false;
      }
      std::vector<std::size_t> sizes;
      for (const SystemLayout& l : layouts) {
        sizes.push_back(l.panel.size());
        plan.unknowns = std::max(plan.unknowns, l.panel.size());
      }
      plan.half_model = plan.half_model || split;
      const std::size_t bytes = EstimateMemoryBytes(lat.panels(), lat.controls.size(), sizes);
      if (bytes > biggest_bytes) {
        biggest_bytes = bytes;
        biggest_systems = sizes;
      }
    }
    plan.memory_estimate_bytes = biggest_bytes;
    res.mesh.memory_estimate_bytes = biggest_bytes;
    // Bad input says so in one line and nothing else: no plan when every wake geometry is refused (a control
    // point on another surface's trailing leg), which the loop below would find only after it.
    bool some_group_clear = false;
    for (const auto& [key, members] : groups) try {
      const WakeGeometry wake = WakeFor(c, points[members.front()].first, points[members.front()].second);
      (void)CheckWakeClearance(c, lat, wake.direction, "");
      some_group_clear = true;
      break;
    } catch (const InputError&) {
    }
    if (options.on_plan && some_group_clear) options.on_plan(plan);
  }
  // Called inside a handler: keeps the first error to rethrow when no point at all is solved.
  const auto mark_failed = [&](const std::vector<std::size_t>& members, const std::string& message) {
    if (!first_failure) first_failure = std::current_exception();
    for (std::size_t p : members) {
      const FlightPoint fp = flight_point(p);
      PointResult failed;
      failed.alpha_deg = fp.alpha_deg;
      failed.beta_deg = fp.beta_deg;
      failed.mach = fp.mach;
      failed.rates = fp.rates;
      failed.error = message;
      res.points[p] = std::move(failed);
      res.warnings.push_back(fmt::format("point {} (alpha {:g} deg, beta {:g} deg) was not solved: {}", p + 1,
                                         fp.alpha_deg, fp.beta_deg, message));
    }
  };
  for (const auto& [key, members] : groups) try {
    const WakeGeometry wake = WakeFor(c, points[members.front()].first, points[members.front()].second);
    const std::string flight =
        freestream ? fmt::format("at alpha {:g} deg, beta {:g} deg", points[members.front()].first,
                                 points[members.front()].second)
                   : "";
    for (WakeWarning& w : CheckWakeClearance(c, lat, wake.direction, flight))
      if (wake_warned.insert({w.surface, w.leg_surface}).second) res.warnings.push_back(std::move(w.message));
    BasisSolution basis = SolveBasis(lat, c.reference.moment_point, wake, so, c.flight.mach);
    res.times.assemble += basis.seconds_assemble;
    res.times.factorise += basis.seconds_factorise;
    res.times.solve += basis.seconds_solve;
    res.times.loads += basis.seconds_velocity;
    res.rcond = std::min(res.rcond, basis.rcond);
    res.mesh.unknowns = std::max(res.mesh.unknowns, basis.unknowns);
    res.mesh.half_model = basis.layouts.front().kind != SystemLayout::Kind::full;
    res.mesh.lateral = res.mesh.lateral && basis.lateral_solved;
    ++res.mesh.factorisations;
    if (basis.status == SolveStatus::singular || basis.status == SolveStatus::non_finite)
      throw NumericalError(basis.message + "; " + DiagnoseCloseApproach(lat, wake.direction));
    if (basis.status == SolveStatus::ill_conditioned)
      res.warnings.push_back(basis.message + "; " + DiagnoseCloseApproach(lat, wake.direction));
    t0 = Clock::now();
    const ProbeSample probes = SampleProbes(lat, basis, c.probes);  // the flow at the case's probes (probe.hpp)
    for (std::size_t p : members) {
      const FlightPoint fp = flight_point(p);
      res.points[p] = ComputeLoads(lat, c.reference, basis, fp);
      res.points[p].probes = EvaluateProbes(probes, c.reference.moment_point, fp);
      for (const ProbeResult& pr : res.points[p].probes)
        if (!pr.note.empty()) res.points[p].warnings.push_back(pr.note);
      if (c.flight.speed_given) AddStructuralLoads(lat, c.flight.density, c.flight.speed, res.points[p]);
      if (c.flight.speed_given || HasSectionData(c)) {  // strip theory, and the stall-onset search
        const auto loads_at = [&](double alpha_deg) {
          FlightPoint other = fp;
          other.alpha_deg = alpha_deg;
          return ComputeLoads(lat, c.reference, basis, other);
        };
        AddProfileDrag(c, lat, loads_at, res.points[p]);
      }
    }
    res.times.loads += Since(t0);
  } catch (const InputError& e) {
    mark_failed(members, e.what());
  } catch (const NumericalError& e) {
    mark_failed(members, e.what());
  }
  if (first_failure && res.FailedPoints() == res.points.size()) std::rethrow_exception(first_failure);
  if (!res.mesh.lateral)
    res.warnings.push_back("lateral derivatives (beta, p, r) not computed: only the symmetric half system was "
                           "solved, as asked (symmetric flight)");
  res.best_lift_to_drag = FindBestLiftToDrag(res.points);
  res.times.total = Since(t_start);
  return res;
}

}  // namespace skein
