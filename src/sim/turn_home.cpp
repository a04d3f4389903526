#include "sim/turn_home.hpp"

#include <algorithm>
#include <cmath>
#include <functional>
#include <numbers>

#include "core/error.hpp"
#include "core/roots.hpp"
#include "flight/wind.hpp"

namespace sortie::sim {

using flight::Phase;

namespace {

/// Ground position, m east and m north of the start point.
struct Position {
  double east_m = 0.0, north_m = 0.0;
};

bool holding(const Phase& p) { return p.kind == Phase::Kind::hover || p.kind == Phase::Kind::loiter; }

/// Ground speed and unit track vector of a cruise leg (zero for every other phase).
Position ground_velocity(const Mission& m, const Phase& p) {
  if (p.kind != Phase::Kind::cruise) return {};
  const auto leg = flight::solve_leg(m.environment.wind, p.track_deg, p.airspeed_mps);
  if (leg.status != flight::LegStatus::ok) return {};
  // Track in degrees true, clockwise from north: east = sin, north = cos.
  const double tr = p.track_deg * std::numbers::pi / 180.0;
  return {leg.ground_speed_mps * std::sin(tr), leg.ground_speed_mps * std::cos(tr)};
}

/// Height above the field at the start of each phase.
std::vector<double> heights(const Mission& m) {
  std::vector<double> h{0.0};
  for (const auto& p : m.phases)
    h.push_back(p.kind == Phase::Kind::climb || p.kind == Phase::Kind::descend ? p.to_height_m : h.back());
  return h;
}

const Phase* last_of(const Mission& m, Phase::Kind k) {
  for (std::size_t i = m.phases.size(); i-- > 0;)
    if (m.phases[i].kind == k) return &m.phases[i];
  return nullptr;
}

}  // namespace

Mission turn_home_mission(const Mission& m, std::size_t i, double tau_s, bool with_home) {
  Mission out = m;
  out.phases.assign(m.phases.begin(), m.phases.begin() + static_cast<std::ptrdiff_t>(i));
  const auto h = heights(m);
  Position pos;
  for (std::size_t k = 0; k < i; ++k) {
    const Position v = ground_velocity(m, m.phases[k]);
    const double d = planned_duration_s(m, k).value_or(0.0);
    pos.east_m += v.east_m * d;
    pos.north_m += v.north_m * d;
  }
  double height = h[i];
  if (tau_s > 0.0) {
    Phase p = m.phases[i];
    const double planned = planned_duration_s(m, i).value_or(0.0);
    if (p.kind == Phase::Kind::climb || p.kind == Phase::Kind::descend) {
      // Cut at tau: the height reached at the phase's constant vertical rate.
      height = h[i] + (h[i + 1] - h[i]) * std::min(tau_s / std::max(planned, 1e-9), 1.0);
      p.to_height_m = height;
    } else {
      p.distance_m.reset();
      p.duration_s = tau_s;
      const Position v = ground_velocity(m, p);
      pos.east_m += v.east_m * tau_s;
      pos.north_m += v.north_m * tau_s;
    }
    if (std::fabs(height - h[i]) > 0.0 || !(p.kind == Phase::Kind::climb || p.kind == Phase::Kind::descend))
      out.phases.push_back(p);
  }
  for (auto& p : out.phases) p.spare = false;
  if (!with_home) return out;
  const double dist = std::hypot(pos.east_m, pos.north_m);
  if (const Phase* cruise = last_of(m, Phase::Kind::cruise); cruise && dist >= 1.0) {
    Phase home;
    home.kind = Phase::Kind::cruise;
    home.label = "turn home";
    home.distance_m = dist;
    home.airspeed_mps = cruise->airspeed_mps;
    double track = std::atan2(-pos.east_m, -pos.north_m) * 180.0 / std::numbers::pi;
    if (track < 0.0) track += 360.0;
    home.track_deg = track;
    out.phases.push_back(home);
  }
  if (const Phase* descent = last_of(m, Phase::Kind::descend); descent && height > 0.0) {
    Phase down = *descent;
    down.label = "home descent";
    down.to_height_m = 0.0;
    down.spare = false;
    out.phases.push_back(down);
  }
  return out;
}

TurnHome solve_turn_home(const Mission& m, const TurnHomeOptions& opts) {
  TurnHome out;
  if (const Phase* c = last_of(m, Phase::Kind::cruise)) out.home_airspeed_mps = c->airspeed_mps;
  if (const Phase* d = last_of(m, Phase::Kind::descend)) out.home_descent_mps = d->rate_mps;
  SimOptions so = opts.sim;
  so.sample_s = 0.0;
  auto fly = [&](const Mission& mm) {
    if (out.simulations >= opts.max_simulations)
      throw LimitError("turn-home solve stopped after " + std::to_string(opts.max_simulations) +
                       " whole-mission simulations");
    ++out.simulations;
    return simulate(mm, so);
  };
  // Smallest rule margin with the return inserted at tau into phase i, and the rule it is.
  auto margin = [&](std::size_t i, double tau) -> std::pair<double, std::string> {
    const Mission mm = turn_home_mission(m, i, tau);
    const MissionResult r = fly(mm);
    if (r.refused) return {-1.0, "the way home cannot be flown: " + r.end_detail};
    return smallest_margin(mm, r);
  };
  auto state_at = [&](std::size_t i, double tau) {
    const MissionResult r = fly(turn_home_mission(m, i, tau, false));
    return FlightState{r.flight_time_s, r.landing.soc, r.landing.v_load_cell_V, r.landing.v_rest_cell_V};
  };
  const double tol = opts.time_tol_s;
  std::optional<std::pair<double, std::string>> prev_end;  // margin at the end of the phase before
  std::optional<FlightState> prev_state;
  for (std::size_t i = 0; i < m.phases.size(); ++i) {
    const auto planned = planned_duration_s(m, i);
    if (!planned) break;
    TurnHomePhase tp;
    tp.phase = i;
    const auto end = margin(i, *planned);
    std::optional<double> latest;
    if (end.first >= 0.0) {
      tp.whole_phase = true;
      latest = *planned;
      if (holding(m.phases[i])) {
        // Past the plan: how long the crew could stay and still get home.
        double lo = *planned, flo = end.first;
        double hi = *planned + std::min(std::max(60.0, 0.25 * *planned), opts.max_extra_s);
        auto fhi = margin(i, hi);
        while (fhi.first >= 0.0 && !tp.capped) {
          if (hi - *planned >= opts.max_extra_s) {
            tp.capped = true;
            break;
          }
          // Past the root the last two points predict (at least 1 s on, at most eight times as far).
          const double extra = hi - *planned;
          const double slope = (fhi.first - flo) / (hi - lo);
          double next = 2.0 * extra;
          if (slope < 0.0) next = std::clamp(extra - fhi.first / slope + 0.02 * (hi - lo) + 1.0, extra + 1.0, 8.0 * extra);
          lo = hi;
          flo = fhi.first;
          hi = *planned + std::min(next, opts.max_extra_s);
          fhi = margin(i, hi);
        }
        if (tp.capped) {
          latest = hi;
        } else {
          const std::function<double(double)> f = [&](double tau) { return margin(i, tau).first; };
          double fh = fhi.first;
          narrow_bracket(f, lo, hi, flo, fh);
          latest = find_root(f, lo, hi, flo, fh, tol, 100).value_or(lo);
          tp.binding_rule = margin(i, *latest + tol).second;
        }
        tp.beyond_plan = *latest > *planned;
      }
    } else {
      const auto start = prev_end ? *prev_end : margin(i, 0.0);
      if (start.first < 0.0) {
        tp.binding_rule = start.second;
      } else {
        const std::function<double(double)> f = [&](double tau) { return margin(i, tau).first; };
        double lo = 0.0, hi = *planned, flo = start.first, fhi = end.first;
        narrow_bracket(f, lo, hi, flo, fhi);
        latest = find_root(f, lo, hi, flo, fhi, tol, 100).value_or(lo);
        tp.binding_rule = margin(i, std::min(*latest + tol, *planned)).second;
      }
    }
    tp.latest_in_phase_s = latest;
    if (latest) tp.at = state_at(i, *latest);
    // The first phase where turning home stops holding within the plan sets the point.
    const bool fails_in_plan = !latest || (!tp.whole_phase) || (*latest < *planned);
    if (fails_in_plan && !out.point_phase) {
      out.point_phase = i;
      out.binding_rule = tp.binding_rule;
      if (tp.at) out.point = tp.at;
      else if (prev_state) out.point = prev_state;
      else out.point = state_at(0, 0.0);
    }
    prev_end = tp.whole_phase && !tp.beyond_plan ? std::optional(end) : std::nullopt;
    prev_state = tp.whole_phase && !tp.beyond_plan ? tp.at : std::nullopt;
    if (tp.whole_phase && tp.beyond_plan) {
      // The state at the planned end, for a failure at the next phase's start.
      prev_end = end;
      prev_state = state_at(i, *planned);
    }
    out.phases.push_back(tp);
  }
  return out;
}

}  // namespace sortie::sim
