// Skein stage 2, mesh. See lattice.hpp and conventions.md.
#include "skein/lattice.hpp"

#include <algorithm>
#include <cmath>
#include <numeric>

#include <fmt/format.h>

#include "vec3.hpp"

namespace skein {
namespace {

using namespace detail;

constexpr double kPiL = 3.14159265358979323846;

double SpacingMap(Spacing s, double t) {
  switch (s) {
    case Spacing::uniform: return t;
    case Spacing::cosine: return 0.5 * (1.0 - std::cos(kPiL * t));
    case Spacing::sine: return std::sin(0.5 * kPiL * t);
  }
  return t;
}

double SpacingInverse(Spacing s, double u) {
  u = std::clamp(u, 0.0, 1.0);
  switch (s) {
    case Spacing::uniform: return u;
    case Spacing::cosine: return std::acos(1.0 - 2.0 * u) / kPiL;
    case Spacing::sine: return 2.0 * std::asin(u) / kPiL;
  }
  return u;
}

/// A section after twist and incidence: leading and trailing edge points and its camber line.
struct PlacedSection {
  Vec3 le, te;
  const Camber* camber;
};

std::vector<PlacedSection> PlaceSections(const Surface& s) {
  const std::size_t n = s.sections.size();
  // Spanwise axis of each section: the mean of its segments' directions in the yz plane.
  std::vector<Vec3> seg_dir(n - 1);
  for (std::size_t k = 0; k + 1 < n; ++k) {
    const Vec3 d = s.sections[k + 1].leading_edge - s.sections[k].leading_edge;
    seg_dir[k] = Normalized(Vec3{0.0, d[1], d[2]});
  }
  const Vec3 pivot = s.sections[0].leading_edge;
  const double inc = s.incidence_deg * kDegToRad;
  std::vector<PlacedSection> out(n);
  for (std::size_t k = 0; k < n; ++k) {
    const Section& sec = s.sections[k];
    Vec3 axis = k == 0 ? seg_dir[0] : k == n - 1 ? seg_dir[n - 2] : Normalized(seg_dir[k - 1] + seg_dir[k]);
    if (!(Norm(axis) > 0.0)) axis = seg_dir[k == 0 ? 0 : k - 1];
    // The root of a symmetric surface on the plane y = 0 is shared with its mirror image: the mean of the two
    // halves' spanwise axes is y itself, so twist turns it about y and its trailing edge stays on the plane.
    if (k == 0 && s.symmetric && !(std::abs(sec.leading_edge[1]) > 1e-12)) axis = {0.0, axis[1] < 0.0 ? -1.0 : 1.0, 0.0};
    // Twist: nose-up about the local spanwise axis (the right-hand rule about +y raises the nose).
    const Vec3 chord_dir = Rotate({1.0, 0.0, 0.0}, axis, sec.twist_deg * kDegToRad);
    Vec3 le = sec.leading_edge;
    Vec3 te = le + sec.chord * chord_dir;
    // Incidence: the whole surface nose-up about the y axis through the first leading edge.
    le = pivot + Rotate(le - pivot, {0.0, 1.0, 0.0}, inc);
    te = pivot + Rotate(te - pivot, {0.0, 1.0, 0.0}, inc);
    out[k] = {le, te, &sec.camber};
  }
  return out;
}

/// Spanwise stations of one half: for each strip edge, the segment index and the fraction along it.
struct Station {
  std::size_t segment;
  double t;
};

std::vector<Station> SpanStations(const Surface& s, const std::vector<PlacedSection>& placed) {
  const std::size_t nseg = placed.size() - 1;
  std::vector<double> len(nseg);
  for (std::size_t k = 0; k < nseg; ++k) {
    const Vec3 d = placed[k + 1].le - placed[k].le;
    len[k] = std::hypot(d[1], d[2]);
  }
  const double total = std::accumulate(len.begin(), len.end(), 0.0);
  std::vector<double> u_break{0.0};  // arc fraction of each section
  for (std::size_t k = 0; k < nseg; ++k) u_break.push_back(u_break.back() + len[k] / total);
  u_break.back() = 1.0;

  // Break points: sections and the ends of controls; each interval gets its share of panels.
  struct Interval {
    double u0, u1;
    std::size_t segment;
  };
  std::vector<double> cuts;
  for (const Control& c : s.controls)
    for (double f : c.span_fraction) cuts.push_back(f);
  const Spacing sp = s.mesh.spanwise_spacing;
  std::vector<Interval> intervals;
  for (std::size_t k = 0; k < nseg; ++k) {
    std::vector<double> pts{u_break[k], u_break[k + 1]};
    for (double c : cuts)
      if (c > u_break[k] + 1e-9 && c < u_break[k + 1] - 1e-9) pts.push_back(c);
    std::sort(pts.begin(), pts.end());
    // Two controls that meet (one ends where the next begins) cut the span at the same place: one mesh line.
    pts.erase(std::unique(pts.begin(), pts.end(), [](double l, double r) { return r - l <= 1e-9; }), pts.end());
    for (std::size_t i = 0; i + 1 < pts.size(); ++i) intervals.push_back({pts[i], pts[i + 1], k});
  }
  // Panel counts: explicit per-section counts are kept; the rest share the surface count by their range in
  // the spacing parameter, so the global distribution is preserved and every break is a mesh line.
  std::vector<int> count(intervals.size(), 0);
  std::vector<double> share(intervals.size(), 0.0);
  int fixed = 0;
  double free_range = 0.0;
  for (std::size_t i = 0; i < intervals.size(); ++i) {
    const auto& given = s.sections[intervals[i].segment].spanwise;
    const double range = SpacingInverse(sp, intervals[i].u1) - SpacingInverse(sp, intervals[i].u0);
    if (given) {
      // A segment split by a control end keeps its total, shared by range within the segment.
      const Interval& iv = intervals[i];
      const double seg_range =
          SpacingInverse(sp, u_break[iv.segment + 1]) - SpacingInverse(sp, u_break[iv.segment]);
      count[i] = std::max(1, static_cast<int>(std::lround(*given * range / seg_range)));
      fixed += count[i];
    } else {
      share[i] = range;
      free_range += range;
    }
  }
  int free_total = std::max(s.mesh.spanwise - fixed, 0);
  std::vector<std::size_t> free_idx;
  for (std::size_t i = 0; i < intervals.size(); ++i)
    if (!s.sections[intervals[i].segment].spanwise) free_idx.push_back(i);
  free_total = std::max(free_total, static_cast<int>(free_idx.size()));
  if (!free_idx.empty()) {
    // Largest-remainder rounding with at least one panel per interval.
    std::vector<std::pair<double, std::size_t>> rem;
    int used = 0;
    for (std::size_t i : free_idx) {
      const double exact = free_total * share[i] / free_range;
      count[i] = std::max(1, static_cast<int>(std::floor(exact)));
      used += count[i];
      rem.push_back({exact - std::floor(exact), i});
    }
    std::sort(rem.begin(), rem.end(), [](const auto& l, const auto& r) { return l.first > r.first || (!(l.first < r.first) && l.second < r.second); });
    for (std::size_t k = 0; used < free_total && k < rem.size(); ++k, ++used) ++count[rem[k].second];
    for (std::size_t k = rem.size(); used > free_total && k-- > 0;)
      if (count[rem[k].second] > 1) {
        --count[rem[k].second];
        --used;
      }
  }
  std::vector<Station> st;
  for (std::size_t i = 0; i < intervals.size(); ++i) {
    const Interval& iv = intervals[i];
    const double t0 = SpacingInverse(sp, iv.u0), t1 = SpacingInverse(sp, iv.u1);
    const double seg_u0 = u_break[iv.segment], seg_u1 = u_break[iv.segment + 1];
    for (int j = (i == 0 ? 0 : 1); j <= count[i]; ++j) {
      double u = j == 0 ? iv.u0 : j == count[i] ? iv.u1 : SpacingMap(sp, t0 + (t1 - t0) * j / count[i]);
      st.push_back({iv.segment, (u - seg_u0) / (seg_u1 - seg_u0)});
    }
  }
  return st;
}

/// A control's effect on one strip: hinge fraction and the deflection of the given half (and the mirror).
struct StripControl {
  const Control* control = nullptr;
};

std::vector<double> ChordFractions(const MeshOptions& m, const Control* c) {
  if (!c) return SpacingFractions(m.chordwise_spacing, m.chordwise);
  // A mesh line on the hinge: panels ahead of it and behind it, each with the surface's spacing.
  const int n = std::max(m.chordwise, 2);
  const int fwd = std::clamp(static_cast<int>(std::lround(n * c->hinge)), 1, n - 1);
  std::vector<double> f;
  for (double v : SpacingFractions(m.chordwise_spacing, fwd)) f.push_back(v * c->hinge);
  for (double v : SpacingFractions(m.chordwise_spacing, n - fwd))
    if (v > 0.0) f.push_back(c->hinge + v * (1.0 - c->hinge));
  return f;
}

}  // namespace

std::vector<double> SpacingFractions(Spacing s, int n) {
  std::vector<double> f(static_cast<std::size_t>(n) + 1);
  for (int i = 0; i <= n; ++i) f[static_cast<std::size_t>(i)] = SpacingMap(s, static_cast<double>(i) / n);
  f.front() = 0.0;
  f.back() = 1.0;
  return f;
}

std::size_t CountPanels(const Surface& s) {
  int fixed = 0;
  std::size_t free_segments = 0;
  for (std::size_t k = 0; k + 1 < s.sections.size(); ++k) {
    if (s.sections[k].spanwise) fixed += *s.sections[k].spanwise;
    else ++free_segments;
  }
  std::size_t span = static_cast<std::size_t>(fixed) +
                     (free_segments ? std::max<std::size_t>(
                                          static_cast<std::size_t>(std::max(s.mesh.spanwise - fixed, 0)), free_segments)
                                    : 0);
  span += 2 * s.controls.size();  // control ends add at most a strip each
  const std::size_t chord = static_cast<std::size_t>(std::max(s.mesh.chordwise, s.controls.empty() ? 1 : 2));
  return span * chord * (s.symmetric ? 2 : 1);
}

std::size_t CountPanels(const Case& c) {
  std::size_t total = 0;
  for (const Surface& s : c.surfaces) total += CountPanels(s);
  return total;
}

Lattice BuildLattice(const Case& c) {
  Lattice lat;
  lat.geometry_symmetric = true;
  for (std::size_t si = 0; si < c.surfaces.size(); ++si) {
    const Surface& s = c.surfaces[si];
    const auto placed = PlaceSections(s);
    const auto stations = SpanStations(s, placed);

    auto le_at = [&](const Station& q) { return Lerp(placed[q.segment].le, placed[q.segment + 1].le, q.t); };
    auto te_at = [&](const Station& q) { return Lerp(placed[q.segment].te, placed[q.segment + 1].te, q.t); };
    auto slope_at = [&](std::size_t seg, double t, double x) {
      return (1.0 - t) * placed[seg].camber->Slope(x) + t * placed[seg + 1].camber->Slope(x);
    };

    // Given half, strip by strip, into a temporary lattice; then the mirror (tip to root) and the given half.
    Lattice half;
    std::vector<Strip> half_strips;
    double arc_total = 0.0, arc = 0.0;
    for (std::size_t k = 0; k + 1 < stations.size(); ++k) {
      const Vec3 d = le_at(stations[k + 1]) - le_at(stations[k]);
      arc_total += std::hypot(d[1], d[2]);
    }
    std::vector<double> normal_mirror_x, normal_mirror_y, normal_mirror_z;  // normals of the mirrored half
    std::vector<Vec3> rate_given, rate_mirror;  // d n / d delta of both halves (mirror before reflection)
    std::vector<int> control_index;
    const int first_control = static_cast<int>(lat.controls.size());
    for (const Control& ct : s.controls) lat.controls.push_back({ct.name, static_cast<int>(si)});
    // A panel belongs to one control at most: two controls sharing part of the span would leave the first one
    // without the panels of the overlap (and without their derivative), a silent wrong answer.
    for (std::size_t i = 0; i < s.controls.size(); ++i)
      for (std::size_t j = 0; j < i; ++j) {
        const Control &a = s.controls[j], &b = s.controls[i];
        if (b.span_fraction[0] < a.span_fraction[1] && a.span_fraction[0] < b.span_fraction[1])
          throw InputError(c.source_path, b.where,
                           fmt::format("surface \"{}\" control \"{}\": span_fraction [{}, {}] overlaps control \"{}\" "
                                       "[{}, {}]; controls of one surface must not share any part of the span",
                                       s.name, b.name, b.span_fraction[0], b.span_fraction[1], a.name,
                                       a.span_fraction[0], a.span_fraction[1]));
      }
    for (std::size_t k = 0; k + 1 < stations.size(); ++k) {
      // The first strip of a segment starts where the previous segment ends (stored as that segment's t = 1):
      // restate it as this segment's t = 0, so that both edges, and the mid-strip station, lie in one segment.
      const Station q1 = stations[k + 1];
      const Station q0 = stations[k].segment == q1.segment ? stations[k] : Station{q1.segment, 0.0};
      const Station qm{q1.segment, 0.5 * (q0.t + q1.t)};
      const Vec3 le0 = le_at(q0), le1 = le_at(q1), te0 = te_at(q0), te1 = te_at(q1);
      const Vec3 lem = le_at(qm), tem = te_at(qm);
      const double w_yz = std::hypot(le1[1] - le0[1], le1[2] - le0[2]);
      const double frac_mid = (arc + 0.5 * w_yz) / arc_total;
      arc += w_yz;
      const Control* ctrl = nullptr;
      for (const Control& ct : s.controls)
        if (frac_mid > ct.span_fraction[0] && frac_mid < ct.span_fraction[1]) ctrl = &ct;
      const auto f = ChordFractions(s.mesh, ctrl);
      Strip strip;
      strip.surface = static_cast<int>(si);
      strip.first_panel = half.panels();
      strip.panels = static_cast<int>(f.size()) - 1;
      strip.quarter_chord = Lerp(lem, tem, 0.25);
      strip.chord = Norm(tem - lem);
      strip.width = w_yz;
      strip.normal = Normalized(Cross(tem - lem, le1 - le0));
      strip.te_left = te0;
      strip.te_right = te1;
      for (std::size_t r = 0; r + 1 < f.size(); ++r) {
        auto at = [&](const Vec3& le, const Vec3& te, double x) { return Lerp(le, te, x); };
        const double fq = f[r] + 0.25 * (f[r + 1] - f[r]), fc = f[r] + 0.75 * (f[r + 1] - f[r]);
        const Vec3 a = at(le0, te0, fq), b = at(le1, te1, fq);
        const Vec3 cp = at(lem, tem, fc);
        const Vec3 chord_vec = at(lem, tem, f[r + 1]) - at(lem, tem, f[r]);
        const Vec3 span_vec = at(le1, te1, fc) - at(le0, te0, fc);
        const Vec3 n_flat = Normalized(Cross(chord_vec, span_vec));
        const Vec3 c_hat = Normalized(chord_vec - Dot(chord_vec, n_flat) * n_flat);
        const double slope = slope_at(qm.segment, qm.t, fc);
        const Vec3 n_camber = Normalized(n_flat - slope * c_hat);
        Vec3 n_given = n_camber, n_mirror = n_camber, dn_given{0.0, 0.0, 0.0}, dn_mirror{0.0, 0.0, 0.0};
        int ci = -1;
        if (ctrl && f[r] >= ctrl->hinge - 1e-12) {
          // Positive deflection: right-hand rotation about the hinge axis (first section toward last), so the
          // trailing edge moves toward -n. d/d delta of a rotation about k is k x (rotated vector).
          const Vec3 hinge_axis = Normalized(at(le1, te1, ctrl->hinge) - at(le0, te0, ctrl->hinge));
          const double delta = ctrl->deflection_deg * kDegToRad;
          const double sign_mirror = ctrl->mirror_opposite ? -1.0 : 1.0;
          n_given = Rotate(n_camber, hinge_axis, delta);
          n_mirror = Rotate(n_camber, hinge_axis, sign_mirror * delta);
          dn_given = Cross(hinge_axis, n_given);
          dn_mirror = sign_mirror * Cross(hinge_axis, n_mirror);
          ci = first_control + static_cast<int>(ctrl - s.controls.data());
        }
        rate_given.push_back(dn_given);
        rate_mirror.push_back(dn_mirror);
        control_index.push_back(ci);
        const Vec3 cla = at(le0, te0, f[r]), clb = at(le1, te1, f[r]);
        const Vec3 cta = at(le0, te0, f[r + 1]), ctb = at(le1, te1, f[r + 1]);
        const double area = 0.5 * Norm(Cross(ctb - cla, clb - cta));
        if (!(area > 0.0) || !std::isfinite(area))
          throw InputError(c.source_path, s.where,
                           fmt::format("surface \"{}\": panel {} of strip {} is degenerate (zero area); check the "
                                       "sections' chords and positions",
                                       s.name, r + 1, k + 1));
        half.a.push_back(a);
        half.b.push_back(b);
        half.te_a.push_back(te0);
        half.te_b.push_back(te1);
        half.control.push_back(cp);
        half.normal.push_back(n_given);
        normal_mirror_x.push_back(n_mirror[0]);
        normal_mirror_y.push_back(n_mirror[1]);
        normal_mirror_z.push_back(n_mirror[2]);
        half.corner_le_a.push_back(cla);
        half.corner_le_b.push_back(clb);
        half.corner_te_a.push_back(cta);
        half.corner_te_b.push_back(ctb);
        const double eps = kCoreFraction * std::min(Norm(b - a), Norm(chord_vec));
        half.core4.push_back(eps * eps * eps * eps);
        half.area.push_back(area);
      }
      half_strips.push_back(strip);
    }

    // Is a non-symmetric surface lying in the plane y = 0?
    bool on_plane = false;
    if (!s.symmetric) {
      double scale = 0.0, ymax = 0.0;
      for (const auto& p : placed) {
        scale = std::max({scale, Norm(p.te - p.le), std::abs(p.le[2]), std::abs(p.le[0])});
        ymax = std::max({ymax, std::abs(p.le[1]), std::abs(p.te[1])});
      }
      on_plane = ymax <= 1e-9 * std::max(scale, 1.0);
      if (!on_plane) lat.geometry_symmetric = false;
    }

    LatticeSurface ls;
    ls.name = s.name;
    ls.symmetric = s.symmetric;
    ls.on_symmetry_plane = on_plane;
    ls.first_panel = lat.panels();
    ls.first_strip = lat.strips.size();
    auto push_panel = [&](const Lattice& src, std::size_t i, bool mirror, std::size_t strip_index,
                          int mirror_of) {
      auto put = [&](PointArray& dst, const PointArray& p) { dst.push_back(mirror ? MirrorY(p[i]) : p[i]); };
      // A mirrored horseshoe runs the other way across the span so that its lift stays along its normal.
      put(lat.a, mirror ? src.b : src.a);
      put(lat.b, mirror ? src.a : src.b);
      put(lat.te_a, mirror ? src.te_b : src.te_a);
      put(lat.te_b, mirror ? src.te_a : src.te_b);
      put(lat.control, src.control);
      if (mirror)
        lat.normal.push_back(MirrorY({normal_mirror_x[i], normal_mirror_y[i], normal_mirror_z[i]}));
      else
        lat.normal.push_back(src.normal[i]);
      put(lat.corner_le_a, mirror ? src.corner_le_b : src.corner_le_a);
      put(lat.corner_le_b, mirror ? src.corner_le_a : src.corner_le_b);
      put(lat.corner_te_a, mirror ? src.corner_te_b : src.corner_te_a);
      put(lat.corner_te_b, mirror ? src.corner_te_a : src.corner_te_b);
      lat.core4.push_back(src.core4[i]);
      lat.area.push_back(src.area[i]);
      lat.strip.push_back(static_cast<int>(strip_index));
      lat.surface.push_back(static_cast<int>(si));
      lat.mirror_of.push_back(mirror_of);
      lat.control_of.push_back(control_index[i]);
      lat.normal_rate.push_back(mirror ? MirrorY(rate_mirror[i]) : rate_given[i]);
    };
    const std::size_t given_first_panel = ls.first_panel + (s.symmetric ? half.panels() : 0);
    const std::size_t given_first_strip = ls.first_strip + (s.symmetric ? half_strips.size() : 0);
    if (s.symmetric) {
      for (std::size_t k = half_strips.size(); k-- > 0;) {
        const Strip& g = half_strips[k];
        Strip m = g;
        m.first_panel = lat.panels();
        m.quarter_chord = MirrorY(g.quarter_chord);
        m.normal = MirrorY(g.normal);
        m.te_left = MirrorY(g.te_right);
        m.te_right = MirrorY(g.te_left);
        m.mirror_of = static_cast<int>(given_first_strip + k);
        const std::size_t strip_index = lat.strips.size();
        lat.strips.push_back(m);
        for (int r = 0; r < g.panels; ++r) {
          const std::size_t i = g.first_panel + static_cast<std::size_t>(r);
          push_panel(half, i, true, strip_index, static_cast<int>(given_first_panel + i));
        }
      }
    }
    for (const Strip& g : half_strips) {
      Strip m = g;
      m.first_panel = lat.panels();
      const std::size_t strip_index = lat.strips.size();
      lat.strips.push_back(m);
      for (int r = 0; r < g.panels; ++r) push_panel(half, g.first_panel + static_cast<std::size_t>(r), false, strip_index, -1);
    }
    ls.panels = lat.panels() - ls.first_panel;
    ls.strips = lat.strips.size() - ls.first_strip;
    lat.surfaces.push_back(ls);
  }
  return lat;
}

}  // namespace skein
