#include "sim/best_speeds.hpp"

#include <cmath>
#include <functional>
#include <limits>
#include <vector>

#include "core/text.hpp"
#include "flight/fixed_wing.hpp"
#include "flight/thrust_need.hpp"
#include "flight/wind.hpp"
#include "sim/drive_solve.hpp"
#include "sim/mission.hpp"

namespace sortie::sim {

using flight::Phase;

namespace {

constexpr double kGridStep = 0.5;     // m/s
constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kSpeedTol = 1e-3;    // m/s, golden-section end
constexpr double kInvPhi = 0.6180339887498949;  // (√5 − 1)/2

/// Golden-section search for the minimum of f on [a, b] (f unimodal there), to kSpeedTol.
template <class F>
double golden_min(F f, double a, double b) {
  double c = b - kInvPhi * (b - a), d = a + kInvPhi * (b - a);
  double fc = f(c), fd = f(d);
  // (b − a) shrinks by 1/φ per step: 2 m/s to 1 mm/s in 16 steps; 60 is a hard bound.
  for (int k = 0; k < 60 && b - a > kSpeedTol; ++k) {
    if (fc < fd) {
      b = d, d = c, fd = fc;
      c = b - kInvPhi * (b - a), fc = f(c);
    } else {
      a = c, c = d, fc = fd;
      d = a + kInvPhi * (b - a), fd = f(d);
    }
  }
  return 0.5 * (a + b);
}

/// The grid minimum of g over the feasible points, refined between its neighbours.
/// `on_bound`: the refined minimum sits on the first or last feasible point (within 2 mm/s).
double refine(const std::vector<double>& vs, const std::vector<double>& gs, const std::function<double(double)>& g,
              bool& on_bound) {
  std::size_t k = 0;
  for (std::size_t j = 1; j < gs.size(); ++j)
    if (gs[j] < gs[k]) k = j;
  double v = vs[k];
  if (gs.size() >= 2) {
    const double a = vs[k == 0 ? 0 : k - 1], b = vs[k + 1 == gs.size() ? k : k + 1];
    const double r = golden_min(g, a, b);
    // On a bound the refinement may still move inside the first interval; keep what is lower.
    if (g(r) < gs[k]) v = r;
  }
  on_bound = v - vs.front() < 2 * kSpeedTol || vs.back() - v < 2 * kSpeedTol;
  return v;
}

}  // namespace

std::optional<double> level_bus_power_W(const Mission& m, double mass_kg, double rho, double v_bus_V,
                                        double airspeed_mps, const flight::Phase* turn) {
  flight::FlightCondition c;
  c.mass_kg = mass_kg;
  c.density_kg_m3 = rho;
  c.airspeed_mps = airspeed_mps;
  c.rotors = m.drive.rotors;
  c.disk_area_m2 = m.drive.prop.disc_area_m2();
  if (turn) c.load_factor = flight::turn_load_factor(*turn, airspeed_mps);
  const auto need = flight::thrust_need(m.airframe, c);
  if (flight::refused(need.status)) return std::nullopt;
  const DriveSolve ds = solve_drive(m, need, rho);
  if (!ds.ok) return std::nullopt;
  if (ds.motor.v_motor_V > m.drive.esc.duty_max * v_bus_V) return std::nullopt;  // saturated
  return m.drive.rotors * propulsion::bus_load(m.drive, ds.motor).power_W(v_bus_V) + m.avionics_W;
}

BestSpeeds best_speeds(const Mission& m, double height_m, double head_mps, double cross_mps,
                       const flight::Phase* turn) {
  BestSpeeds b;
  b.mass_kg = flight::all_up_mass_kg(m.airframe, m.pack.mass_kg());
  b.head_mps = head_mps;
  b.cross_mps = cross_mps;
  const auto air = m.environment.atmosphere.at(height_m);
  if (!air) {
    b.note = "height beyond the ISA troposphere";
    return b;
  }
  b.density_kg_m3 = air->density_kg_m3;
  b.v_bus_V = m.pack.series * m.pack.cell.ocv_V(0.5);
  if (const auto* w = std::get_if<flight::FixedWing>(&m.airframe)) {
    b.search_lo_mps = flight::kStallMargin * flight::stall_speed_mps(*w, b.mass_kg, b.density_kg_m3);
    b.lower_bound = format_fixed(flight::kStallMargin, 1) + " × stall speed";
  } else {
    b.search_lo_mps = 0.0;
    b.lower_bound = "hover";
  }
  auto power = [&](double v) { return level_bus_power_W(m, b.mass_kg, b.density_kg_m3, b.v_bus_V, v, turn); };
  std::vector<double> vs, ps;
  b.upper_bound = "the search limit " + format_fixed(kSearchMax, 0) + " m/s";
  for (int k = 0;; ++k) {
    const double v = b.search_lo_mps + k * kGridStep;
    if (v > kSearchMax) break;
    const auto p = power(v);
    if (!p && vs.empty()) continue;  // still below the speeds the airframe accepts (a turn's margin)
    if (!p) {
      b.upper_bound = "the drive cannot hold level flight at " + format_fixed(v, 1) + " m/s";
      break;
    }
    vs.push_back(v);
    ps.push_back(*p);
  }
  if (vs.empty()) {
    b.note = "no airspeed from " + format_fixed(b.search_lo_mps, 1) + " m/s can be flown level";
    return b;
  }
  b.search_lo_mps = vs.front();
  b.search_hi_mps = vs.back();
  b.found = true;
  // Outside the feasible grid the power is taken as infinite, so the refinement stays inside.
  auto p_or_inf = [&](double v) {
    if (v < b.search_lo_mps || v > b.search_hi_mps) return kInf;
    return power(v).value_or(kInf);
  };
  b.endurance_mps = refine(vs, ps, p_or_inf, b.endurance_on_bound);
  b.endurance_W = p_or_inf(b.endurance_mps);
  // Range: minimise P/V_g over the speeds with headway.
  auto ground = [&](double v) {
    if (!(std::fabs(cross_mps) < v)) return -1.0;
    return std::sqrt(v * v - cross_mps * cross_mps) - head_mps;
  };
  auto w_per_m = [&](double v) {
    const double gs = ground(v);
    return gs > 0.0 ? p_or_inf(v) / gs : kInf;
  };
  std::vector<double> rv, rg;
  for (std::size_t k = 0; k < vs.size(); ++k)
    if (ground(vs[k]) > 0.0) rv.push_back(vs[k]), rg.push_back(ps[k] / ground(vs[k]));
  if (rv.empty()) {
    b.note = "no airspeed up to " + format_fixed(b.search_hi_mps, 1) + " m/s makes headway in this wind";
    return b;
  }
  b.range_mps = refine(rv, rg, w_per_m, b.range_on_bound);
  b.range_W = p_or_inf(b.range_mps);
  b.range_ground_mps = ground(b.range_mps);
  b.range_m_per_Wh = 3600.0 * b.range_ground_mps / b.range_W;
  return b;
}

double phase_airspeed_mps(const Mission& m, std::size_t i) {
  const Phase& p = m.phases.at(i);
  if (p.airspeed_choice == Phase::Speed::given) return p.airspeed_mps;
  // The phase's level height: cruise and loiter fly at the height the phases before reached.
  double h = 0.0;
  for (std::size_t k = 0; k < i; ++k)
    if (m.phases[k].kind == Phase::Kind::climb || m.phases[k].kind == Phase::Kind::descend) h = m.phases[k].to_height_m;
  double head = 0.0, cross = 0.0;
  if (p.kind == Phase::Kind::cruise) {
    const auto wc = flight::wind_components(m.environment.wind, p.track_deg);
    head = wc.head_mps;
    cross = wc.cross_mps;
  }
  const bool turns = p.bank_deg > 0.0 || p.turn_radius_m.has_value();
  const BestSpeeds b = best_speeds(m, h, head, cross, turns ? &p : nullptr);
  if (!b.found) return 0.0;
  return p.airspeed_choice == Phase::Speed::best_endurance ? b.endurance_mps : b.range_mps;
}

Mission with_resolved_airspeeds(const Mission& m) {
  Mission out = m;
  for (std::size_t i = 0; i < m.phases.size(); ++i) {
    if (m.phases[i].airspeed_choice == Phase::Speed::given) continue;
    out.phases[i].airspeed_mps = phase_airspeed_mps(m, i);
    out.phases[i].airspeed_choice = Phase::Speed::given;
  }
  return out;
}

}  // namespace sortie::sim
