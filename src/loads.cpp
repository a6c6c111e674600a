// Skein stage 5, loads. See loads.hpp.
#include "skein/loads.hpp"

#include <cmath>
#include <string>

#include "skein/biot_savart.hpp"
#include "vec3.hpp"

namespace skein {
namespace {

using namespace detail;

/// Force and moment (about the moment point) of a set of panels, and their derivatives.
struct Wrench {
  Vec3 force{0.0, 0.0, 0.0}, moment{0.0, 0.0, 0.0};
  void Add(const Vec3& f, const Vec3& arm) {
    force = force + f;
    moment = moment + Cross(arm, f);
  }
};

/// The wind and stability axes of conventions.md and their derivatives with respect to alpha and beta.
struct Axes {
  Vec3 lift, drag, side, roll, pitch, yaw;
  Axes(double a, double b) {
    const double ca = std::cos(a), sa = std::sin(a), cb = std::cos(b), sb = std::sin(b);
    lift = {-sa, 0.0, ca};
    drag = {ca * cb, -sb, sa * cb};
    side = {sb * ca, cb, sb * sa};
    roll = {-ca, 0.0, -sa};
    pitch = {0.0, 1.0, 0.0};
    yaw = {sa, 0.0, -ca};
  }
};

struct Coefficients {
  double CL, CD, CY, Cl, Cm, Cn;
};

Coefficients ToCoefficients(const Wrench& w, const Axes& ax, const Reference& ref) {
  const double qs = 0.5 * ref.area;
  return {Dot(w.force, ax.lift) / qs,  Dot(w.force, ax.drag) / qs,
          Dot(w.force, ax.side) / qs,  Dot(w.moment, ax.roll) / (qs * ref.span),
          Dot(w.moment, ax.pitch) / (qs * ref.chord), Dot(w.moment, ax.yaw) / (qs * ref.span)};
}

/// Fills in each surface's downwash from the surfaces ahead of it (results.hpp, SurfaceLoads). At control
/// point i of surface S, v_i = sum over the surfaces T ahead of S and the basis fields k of c_k v_Tk(P_i); the
/// flow there turns down by
///     eps_i = atan2(N, D),  N = -(v_i . l),  D = 1 + v_i . d     (V = 1, l lift and d drag direction),
/// and d eps_i / d alpha = (D dN - N dD) / (N^2 + D^2), with dN = -(dv . l + v . dl), dD = dv . d + v . dd,
/// dv = sum dc_k/d alpha v_Tk and dl, dd the derivatives of the axes (the wake held in place, as for every
/// derivative). Averages are weighted by panel area.
void AddDownwash(const Lattice& lat, const BasisSolution& basis, const std::array<double, kBasisSize>& c,
                 const std::array<double, kBasisSize>& dc_dalpha, const Axes& ax, double alpha, double beta,
                 std::vector<SurfaceLoads>& surfaces) {
  const auto ahead = SurfacesAhead(lat);
  const Vec3 dlift{-std::cos(alpha), 0.0, -std::sin(alpha)};
  const Vec3 ddrag{-std::sin(alpha) * std::cos(beta), 0.0, std::cos(alpha) * std::cos(beta)};
  const InducedVelocity& cv = basis.control_point_velocity;
  for (std::size_t s = 0; s < lat.surfaces.size(); ++s) {
    if (ahead[s].empty()) continue;
    SKEIN_ASSERT(cv.u.cols() == static_cast<Eigen::Index>(kBasisSize * lat.surfaces.size()));
    const LatticeSurface& ls = lat.surfaces[s];
    double area = 0.0, eps = 0.0, deps = 0.0;
    for (std::size_t i = ls.first_panel; i < ls.first_panel + ls.panels; ++i) {
      const auto ii = static_cast<Eigen::Index>(i);
      Vec3 v{0.0, 0.0, 0.0}, dv{0.0, 0.0, 0.0};
      for (int t : ahead[s])
        for (int k = 0; k < kBasisSize; ++k) {
          const auto col = static_cast<Eigen::Index>(kBasisSize * t + k);
          const Vec3 vk{cv.u(ii, col), cv.v(ii, col), cv.w(ii, col)};
          v = v + c[static_cast<std::size_t>(k)] * vk;
          dv = dv + dc_dalpha[static_cast<std::size_t>(k)] * vk;
        }
      const double num = -Dot(v, ax.lift), den = 1.0 + Dot(v, ax.drag);
      const double dnum = -(Dot(dv, ax.lift) + Dot(v, dlift)), dden = Dot(dv, ax.drag) + Dot(v, ddrag);
      eps += lat.area[i] * std::atan2(num, den);
      deps += lat.area[i] * (den * dnum - num * dden) / (num * num + den * den);
      area += lat.area[i];
    }
    SurfaceLoads& sl = surfaces[s];
    sl.downwash_deg = eps / area / kDegToRad;
    sl.downwash_gradient = deps / area;
    for (int t : ahead[s]) sl.downwash_from.push_back(lat.surfaces[static_cast<std::size_t>(t)].name);
  }
}

/// Trefftz-plane velocity at p of one infinite line vortex through q along d, of sense s (+1 along d): one leg of
/// AddTrefftzPairVelocity (biot_savart.hpp), with the same regularisation.
void AddTrefftzLegVelocity(const Vec3& p, const Vec3& q, const Vec3& d, double eps4, double s, double& u, double& v,
                           double& w) {
  const Vec3 c = Cross(d, p - q);
  const double h2 = Dot(c, c);
  const double f = s * 2.0 * kInv4Pi * h2 / (h2 * h2 + eps4 + kTiny);
  u += f * c[0];
  v += f * c[1];
  w += f * c[2];
}

}  // namespace

std::vector<std::vector<int>> SurfacesAhead(const Lattice& lat) {
  const std::size_t ns = lat.surfaces.size();
  std::vector<double> x_mean(ns, 0.0), area(ns, 0.0);
  for (std::size_t i = 0; i < lat.panels(); ++i) {
    const auto s = static_cast<std::size_t>(lat.surface[i]);
    x_mean[s] += lat.area[i] * 0.5 * (lat.a.x[i] + lat.b.x[i]);
    area[s] += lat.area[i];
  }
  for (std::size_t s = 0; s < ns; ++s) x_mean[s] /= area[s];
  std::vector<std::vector<int>> ahead(ns);
  for (std::size_t s = 0; s < ns; ++s)
    for (std::size_t t = 0; t < ns; ++t)
      if (t != s && x_mean[t] < x_mean[s]) ahead[s].push_back(static_cast<int>(t));
  return ahead;
}

std::array<double, kBasisSize> FlowParameters(const FlightPoint& fp) {
  const double a = fp.alpha_deg * kDegToRad, b = fp.beta_deg * kDegToRad;
  const double v = fp.speed > 0.0 ? fp.speed : 1.0;
  // V_inf / V and omega / V, omega = (-p, q, -r) in geometry axes (conventions.md).
  return {std::cos(a) * std::cos(b), -std::sin(b), std::sin(a) * std::cos(b),
          -fp.rates[0] / v, fp.rates[1] / v, -fp.rates[2] / v};
}

Eigen::MatrixXd TrefftzKernel(const Lattice& lat, const WakeGeometry& wake) {
  const std::size_t ns = lat.strips.size();
  const double d[3] = {wake.direction[0], wake.direction[1], wake.direction[2]};
  std::vector<double> ta(3 * ns), tb(3 * ns), eps4(ns);
  for (std::size_t m = 0; m < ns; ++m) {
    for (std::size_t k = 0; k < 3; ++k) {
      ta[3 * m + k] = lat.strips[m].te_left[k];
      tb[3 * m + k] = lat.strips[m].te_right[k];
    }
    const double eps = kCoreFraction * Norm(lat.strips[m].te_right - lat.strips[m].te_left);
    eps4[m] = eps * eps * eps * eps;
  }
  Eigen::MatrixXd kernel(static_cast<Eigen::Index>(ns), static_cast<Eigen::Index>(ns));
  const double h2 = 2.0 * wake.ground.height_z;
  const Vec3& dir = wake.direction;
  auto across = [&](const Vec3& r) { return r - Dot(r, dir) * dir; };  // projection on the Trefftz plane
  for (std::size_t m = 0; m < ns; ++m) {
    const Vec3 a = lat.strips[m].te_left, b = lat.strips[m].te_right;
    const Vec3 p = 0.5 * (a + b);
    const double coincident = kCoreFraction * Norm(across(b - a));
    const Vec3 n = Cross(wake.direction, b - a);
    for (std::size_t j = 0; j < ns; ++j) {
      double uj = 0.0, vj = 0.0, wj = 0.0, flux = 0.0;
      if (lat.strips[j].surface == lat.strips[m].surface) {
        // The surface's own wake: the midpoint rule, the velocity at the segment's midpoint times its length.
        AddTrefftzPairVelocity(p[0], p[1], p[2], &ta[3 * j], &tb[3 * j], d, eps4[j], uj, vj, wj);
        if (wake.ground.enabled) {
          // Image pair in the ground plane: reflected points in reversed order, same circulation.
          const double ia[3] = {tb[3 * j], tb[3 * j + 1], h2 - tb[3 * j + 2]};
          const double ib[3] = {ta[3 * j], ta[3 * j + 1], h2 - ta[3 * j + 2]};
          AddTrefftzPairVelocity(p[0], p[1], p[2], ia, ib, d, eps4[j], uj, vj, wj);
        }
      } else {
        // Another surface's vortices. Its velocity can vary steeply along this segment (a tail's wake close to
        // the wing's), where the midpoint rule makes the drag jump with the mesh; integrate exactly instead:
        // a line vortex of sense s through Q gives, along the segment A -> B projected on the Trefftz plane,
        //     int v . (d x t) ds = (s / 2 pi) ln(|B - Q| / |A - Q|)
        // (a principal value when Q lies on the segment). A vortex at one of the segment's ends (a junction,
        // such as a winglet on a wing tip) belongs to this sheet's own edge and keeps the midpoint rule.
        const Vec3 la{ta[3 * j], ta[3 * j + 1], ta[3 * j + 2]}, lb{tb[3 * j], tb[3 * j + 1], tb[3 * j + 2]};
        struct Leg {
          Vec3 q;
          double sense;
        };
        const Leg legs[4] = {{la, -1.0}, {lb, 1.0}, {{lb[0], lb[1], h2 - lb[2]}, -1.0}, {{la[0], la[1], h2 - la[2]}, 1.0}};
        for (int k = 0; k < (wake.ground.enabled ? 4 : 2); ++k) {
          const double ra = Norm(across(a - legs[k].q)), rb = Norm(across(b - legs[k].q));
          if (std::min(ra, rb) > coincident) {
            flux += legs[k].sense * 2.0 * kInv4Pi * std::log(rb / ra);
          } else {
            AddTrefftzLegVelocity(p, legs[k].q, dir, eps4[j], legs[k].sense, uj, vj, wj);
          }
        }
      }
      kernel(static_cast<Eigen::Index>(m), static_cast<Eigen::Index>(j)) = uj * n[0] + vj * n[1] + wj * n[2] + flux;
    }
  }
  return kernel;
}

std::vector<double> TrefftzDrag(const Eigen::MatrixXd& kernel, const std::vector<double>& strip_gamma) {
  const auto ns = static_cast<Eigen::Index>(strip_gamma.size());
  SKEIN_ASSERT(kernel.rows() == ns && kernel.cols() == ns);
  const Eigen::VectorXd kg = kernel * Eigen::Map<const Eigen::VectorXd>(strip_gamma.data(), ns);
  std::vector<double> drag(strip_gamma.size());
  for (Eigen::Index m = 0; m < ns; ++m) drag[static_cast<std::size_t>(m)] = -0.5 * strip_gamma[static_cast<std::size_t>(m)] * kg(m);
  return drag;
}

std::vector<double> TrefftzDrag(const Lattice& lat, const std::vector<double>& strip_gamma,
                                const WakeGeometry& wake) {
  return TrefftzDrag(TrefftzKernel(lat, wake), strip_gamma);
}

PointResult ComputeLoads(const Lattice& lat, const Reference& ref, const BasisSolution& basis,
                         const FlightPoint& fp) {
  PointResult out;
  out.alpha_deg = fp.alpha_deg;
  out.beta_deg = fp.beta_deg;
  out.mach = fp.mach;
  out.rates = fp.rates;
  const auto c = FlowParameters(fp);
  const std::size_t n = lat.panels();
  const std::size_t nctl = lat.controls.size();
  const Vec3& r_ref = ref.moment_point;

  // Per-panel circulation, local velocity, force, and their derivatives with respect to c and the controls.
  Wrench total;
  std::vector<Wrench> by_surface(lat.surfaces.size());
  std::array<Wrench, kBasisSize> d_total{};
  std::vector<Wrench> d_control(nctl);
  std::vector<double> gamma(n), strip_gamma(lat.strips.size(), 0.0), strip_normal_force(lat.strips.size(), 0.0);
  std::vector<double> delta_cp(n, 0.0);  // (F . n) / (q A), q = 1/2
  for (std::size_t i = 0; i < n; ++i) {
    const auto ii = static_cast<Eigen::Index>(i);
    const Vec3 a = lat.a[i], b = lat.b[i];
    const Vec3 mid = 0.5 * (a + b), seg = b - a, arm = mid - r_ref;
    std::array<Vec3, kBasisSize> e{};  // onset plus induced velocity of each basis column
    double g = 0.0;
    Vec3 vel{0.0, 0.0, 0.0};
    for (int k = 0; k < kBasisSize; ++k) {
      const auto kk = static_cast<Eigen::Index>(k);
      e[static_cast<std::size_t>(k)] =
          BasisOnset(k, mid, r_ref) +
          Vec3{basis.bound_velocity.u(ii, kk), basis.bound_velocity.v(ii, kk), basis.bound_velocity.w(ii, kk)};
      g += basis.gamma(ii, kk) * c[static_cast<std::size_t>(k)];
      vel = vel + c[static_cast<std::size_t>(k)] * e[static_cast<std::size_t>(k)];
    }
    gamma[i] = g;
    const Vec3 f = g * Cross(vel, seg);
    total.Add(f, arm);
    by_surface[static_cast<std::size_t>(lat.surface[i])].Add(f, arm);
    const auto strip = static_cast<std::size_t>(lat.strip[i]);
    strip_gamma[strip] += g;
    strip_normal_force[strip] += Dot(f, lat.strips[strip].normal);
    delta_cp[i] = Dot(f, lat.normal[i]) / (0.5 * lat.area[i]);
    const Vec3 vxs = Cross(vel, seg);
    for (int k = 0; k < kBasisSize; ++k) {
      const auto ku = static_cast<std::size_t>(k);
      const Vec3 df = basis.gamma(ii, k) * vxs + g * Cross(e[ku], seg);
      d_total[ku].Add(df, arm);
    }
    for (std::size_t m = 0; m < nctl; ++m) {
      double dg = 0.0;
      Vec3 dv{0.0, 0.0, 0.0};
      for (int k = 0; k < kBasisSize; ++k) {
        const auto col = static_cast<Eigen::Index>(kBasisSize * (1 + static_cast<int>(m)) + k);
        const double ck = c[static_cast<std::size_t>(k)];
        dg += basis.gamma(ii, col) * ck;
        dv = dv + ck * Vec3{basis.bound_velocity.u(ii, col), basis.bound_velocity.v(ii, col),
                            basis.bound_velocity.w(ii, col)};
      }
      d_control[m].Add(dg * vxs + g * Cross(dv, seg), arm);
    }
  }

  const double alpha = fp.alpha_deg * kDegToRad, beta = fp.beta_deg * kDegToRad;
  const Axes ax(alpha, beta);
  const Coefficients co = ToCoefficients(total, ax, ref);
  const double qs = 0.5 * ref.area;

  // Trefftz-plane drag, per strip, and its share per surface.
  // The kernel depends only on the geometry and the wake: SolveBasis computes it once for all the points.
  const bool have_kernel = basis.trefftz_kernel.rows() == static_cast<Eigen::Index>(lat.strips.size()) &&
                           basis.trefftz_kernel.cols() == basis.trefftz_kernel.rows();
  const std::vector<double> strip_drag = have_kernel ? TrefftzDrag(basis.trefftz_kernel, strip_gamma)
                                                     : TrefftzDrag(lat, strip_gamma, basis.wake);
  double cdi = 0.0;
  for (double dm : strip_drag) cdi += dm / qs;

  out.CL = co.CL;
  out.CD_induced = cdi;
  out.CD_induced_nearfield = co.CD;
  out.CY = co.CY;
  out.Cl = co.Cl;
  out.Cm = co.Cm;
  out.Cn = co.Cn;
  const double aspect = ref.span * ref.span / ref.area;
  if (std::abs(cdi) > 1e-12 && std::abs(co.CL) > 1e-9) {
    out.span_efficiency = co.CL * co.CL / (kPi * aspect * cdi);
  } else {
    out.warnings.push_back("span efficiency is undefined at zero lift (CL and CD_induced both vanish)");
  }

  // Derivatives. dc/dx for x = alpha, beta (rad) and the stability-axis rates p b/2V, q c/2V, r b/2V.
  const double ca = std::cos(alpha), sa = std::sin(alpha), cb = std::cos(beta), sb = std::sin(beta);
  struct Variable {
    const char* name;
    std::array<double, kBasisSize> dc;
    Vec3 dlift, ddrag, dside, droll, dyaw;  // axis derivatives
  };
  const Vec3 zero{0.0, 0.0, 0.0};
  const double pb = 2.0 / ref.span, qc = 2.0 / ref.chord;
  const std::array<Variable, 5> vars{{
      {"alpha", {-sa * cb, 0.0, ca * cb, 0.0, 0.0, 0.0}, {-ca, 0.0, -sa}, {-sa * cb, 0.0, ca * cb},
       {-sb * sa, 0.0, sb * ca}, {sa, 0.0, -ca}, {ca, 0.0, sa}},
      {"beta", {-ca * sb, -cb, -sa * sb, 0.0, 0.0, 0.0}, zero, {-ca * sb, -cb, -sa * sb}, {cb * ca, -sb, cb * sa},
       zero, zero},
      {"p", {0.0, 0.0, 0.0, -ca * pb, 0.0, -sa * pb}, zero, zero, zero, zero, zero},
      {"q", {0.0, 0.0, 0.0, 0.0, qc, 0.0}, zero, zero, zero, zero, zero},
      {"r", {0.0, 0.0, 0.0, sa * pb, 0.0, -ca * pb}, zero, zero, zero, zero, zero},
  }};
  double cz_alpha = 0.0;  // d(F . e_z)/d alpha / (q S): the force normal to the x axis, for the neutral point
  for (const Variable& var : vars) {
    // Without the lateral columns (SolverOptions::lateral) the beta, roll-rate and yaw-rate derivatives are
    // not known: they are left out rather than given as zero.
    const std::string name = var.name;
    if (!basis.lateral_solved && (name == "beta" || name == "p" || name == "r")) continue;
    Wrench dw;
    for (std::size_t k = 0; k < kBasisSize; ++k) {
      dw.force = dw.force + var.dc[k] * d_total[k].force;
      dw.moment = dw.moment + var.dc[k] * d_total[k].moment;
    }
    if (std::string(var.name) == "alpha") cz_alpha = dw.force[2] / qs;
    const double dCL = (Dot(dw.force, ax.lift) + Dot(total.force, var.dlift)) / qs;
    const double dCY = (Dot(dw.force, ax.side) + Dot(total.force, var.dside)) / qs;
    const double dCl = (Dot(dw.moment, ax.roll) + Dot(total.moment, var.droll)) / (qs * ref.span);
    const double dCm = Dot(dw.moment, ax.pitch) / (qs * ref.chord);
    const double dCn = (Dot(dw.moment, ax.yaw) + Dot(total.moment, var.dyaw)) / (qs * ref.span);
    const std::string v = var.name;
    out.derivatives.Set("CL_" + v, dCL);
    out.derivatives.Set("CY_" + v, dCY);
    out.derivatives.Set("Cl_" + v, dCl);
    out.derivatives.Set("Cm_" + v, dCm);
    out.derivatives.Set("Cn_" + v, dCn);
  }
  for (std::size_t m = 0; m < nctl; ++m) {
    const Coefficients dc = ToCoefficients(d_control[m], ax, ref);
    NamedValues nv;
    nv.Set("CL", dc.CL);
    nv.Set("CY", dc.CY);
    nv.Set("Cl", dc.Cl);
    nv.Set("Cm", dc.Cm);
    nv.Set("Cn", dc.Cn);
    out.control_derivatives.emplace_back(lat.controls[m].name, nv);
  }
  // Neutral point: the point on the line through the moment point parallel to x about which the pitching
  // moment does not change with alpha. Moving the moment point by dx adds dx F_z to M_y, so
  //     x_np = x_ref - c_ref Cm_alpha / CZ_alpha,   CZ_alpha = d(F . e_z)/d alpha / (q S),
  // which is independent of where along x (or y) the moment point sits. CZ_alpha = CL_alpha cos(alpha)
  // - CL sin(alpha) + (drag terms) is conventions.md's CL_alpha to first order in alpha.
  const double cma = *out.derivatives.Get("Cm_alpha");
  if (std::abs(cz_alpha) > 1e-12) {
    const double x_np = r_ref[0] - ref.chord * cma / cz_alpha;
    out.neutral_point = Vec3{x_np, r_ref[1], r_ref[2]};
    out.static_margin = (x_np - r_ref[0]) / ref.chord;
  } else {
    out.warnings.push_back("neutral point is undefined: the normal force does not change with alpha");
  }

  // Surfaces and their strips.
  for (std::size_t s = 0; s < lat.surfaces.size(); ++s) {
    const LatticeSurface& ls = lat.surfaces[s];
    const Coefficients cs = ToCoefficients(by_surface[s], ax, ref);
    SurfaceLoads sl;
    sl.name = ls.name;
    sl.CL = cs.CL;
    sl.CD_induced_nearfield = cs.CD;
    sl.CY = cs.CY;
    sl.Cl = cs.Cl;
    sl.Cm = cs.Cm;
    sl.Cn = cs.Cn;
    sl.panel_delta_cp.assign(delta_cp.begin() + static_cast<std::ptrdiff_t>(ls.first_panel),
                             delta_cp.begin() + static_cast<std::ptrdiff_t>(ls.first_panel + ls.panels));
    for (std::size_t m = ls.first_strip; m < ls.first_strip + ls.strips; ++m) {
      const Strip& st = lat.strips[m];
      sl.CD_induced += strip_drag[m] / qs;
      const double cl = strip_normal_force[m] / (0.5 * st.chord * st.width);
      sl.strips.y.push_back(st.quarter_chord[1]);
      sl.strips.z.push_back(st.quarter_chord[2]);
      sl.strips.chord.push_back(st.chord);
      sl.strips.gamma.push_back(strip_gamma[m]);
      sl.strips.cl.push_back(cl);
      sl.strips.cl_c_over_cref.push_back(cl * st.chord / ref.chord);
    }
    out.surfaces.push_back(std::move(sl));
  }
  AddDownwash(lat, basis, c, vars[0].dc, ax, alpha, beta, out.surfaces);
  return out;
}

}  // namespace skein
