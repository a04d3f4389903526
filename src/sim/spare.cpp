// The spare-time solve: how much longer the spare phase can be (or how much shorter it must be)
// before a rule fails, from the margins of whole-mission simulations, and the cut of the longest
// leg when even removing the spare phase is not enough.
#include <algorithm>
#include <cmath>
#include <limits>
#include <tuple>

#include "core/error.hpp"
#include "core/roots.hpp"
#include "core/text.hpp"
#include "sim/best_speeds.hpp"
#include "sim/mission.hpp"
#include "sim/mission_steps.hpp"

namespace sortie::sim {

using flight::Phase;

namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();

}  // namespace

std::optional<std::size_t> spare_phase(const Mission& m) {
  for (std::size_t i = 0; i < m.phases.size(); ++i)
    if (m.phases[i].spare) return i;
  for (std::size_t i = m.phases.size(); i-- > 0;)
    if (m.phases[i].kind == Phase::Kind::hover || m.phases[i].kind == Phase::Kind::loiter) return i;
  return std::nullopt;
}

Mission lengthened(const Mission& m, std::size_t i, double delta_s) {
  Mission out = m;
  Phase& p = out.phases.at(i);
  const double base = planned_duration_s(m, i).value_or(0.0);
  p.distance_m.reset();
  p.duration_s = std::max(0.0, base + delta_s);
  return out;
}

/// Continuous across the boundary where a flight stops completing: a completed flight's
/// completion margin is its closeness to the cutoff and to full duty, an incomplete one's is
/// minus the fraction not flown.
std::pair<double, std::string> smallest_margin(const Mission& m, const MissionResult& r) {
  double best = kInf;
  std::string name;
  for (const auto& [v, n] : rule_margins(m, r))
    if (v < best) best = v, name = n;
  return {best, name};
}

std::vector<std::pair<double, std::string>> rule_margins(const Mission& m, const MissionResult& r) {
  std::vector<std::pair<double, std::string>> out;
  auto consider = [&](double v, const std::string& n) { out.emplace_back(v, n); };
  const double planned = r.rules.front().required;
  if (!r.completed) {
    consider(-(planned - r.flight_time_s) / std::max(planned, 1.0), end_text(r.end_kind));
    return out;
  }
  const double cutoff = m.pack.cell.v_cutoff_V;
  consider((r.v_min_cell_V - cutoff) / cutoff, "cutoff_voltage");
  double duty_max = 0.0;
  for (const auto& p : r.phases) duty_max = std::max(duty_max, p.duty_max);
  consider((m.drive.esc.duty_max - duty_max) / m.drive.esc.duty_max, "saturation");
  for (const auto& rule : r.rules) {
    if (rule.name == "mission_flown" || !rule.length_dependent) continue;
    const double scale = rule.name == "soc_min" || rule.name == "soc_covered" ? 1.0 : rule.name == "hover_s" ? std::max(rule.required, 60.0)
                                                                               : rule.required;
    consider(rule.margin / scale, rule.name);
  }
  return out;
}

double predicted_root(const std::vector<std::pair<double, std::string>>& a,
                      const std::vector<std::pair<double, std::string>>& b, double xa, double xb) {
  // Each margin nearly linear in x: its zero at xa + v_a·(xb − xa)/(v_a − v_b); the first to
  // reach zero binds.
  double r = kInf;
  for (const auto& [va, na] : a)
    for (const auto& [vb, nb] : b)
      if (na == nb && va >= 0.0 && vb < va) r = std::min(r, xa + va * (xb - xa) / (va - vb));
  return std::isfinite(r) ? r : std::numeric_limits<double>::quiet_NaN();
}

void narrow_bracket(const std::function<double(double)>& f, double& lo, double& hi, double& flo, double& fhi,
                    double guess) {
  if (!(hi > lo) || flo == fhi) return;
  // Linear interpolation of the ends: r = lo + f(lo)·(hi − lo)/(f(lo) − f(hi)).
  const double r = std::isfinite(guess) ? guess : lo + flo * (hi - lo) / (flo - fhi);
  const double d = std::max(0.5, 0.002 * (hi - lo));
  for (double x : {r + d, r - d}) {
    if (!(x > lo && x < hi)) continue;
    const double fx = f(x);
    if ((fx >= 0.0) == (flo >= 0.0)) lo = x, flo = fx;
    else hi = x, fhi = fx;
  }
}

namespace {

/// The longest cruise leg given by distance, if any.
std::optional<std::size_t> longest_leg(const Mission& m) {
  std::optional<std::size_t> best;
  for (std::size_t k = 0; k < m.phases.size(); ++k) {
    const Phase& p = m.phases[k];
    if (p.kind != Phase::Kind::cruise || !p.distance_m) continue;
    if (!best || *p.distance_m > *m.phases[*best].distance_m) best = k;
  }
  return best;
}

/// With the spare phase removed and the mission still failing: how many metres of the longest
/// cruise leg must go as well (TOMS 748 to 0.5 m), or none when even 1 m of it is too much.
template <class Run>
void solve_leg_cut(const Mission& m, std::size_t spare, SpareResult& out, Run& run_mission) {
  const auto leg = longest_leg(m);
  if (!leg) {
    out.note = "the mission fails even without phase " + std::to_string(spare + 1) + ", and it has no cruise leg to shorten";
    return;
  }
  const Mission without = lengthened(m, spare, -planned_duration_s(m, spare).value_or(0.0));
  const double dist = *m.phases[*leg].distance_m;
  auto cut = [&](double c) {
    Mission mm = without;
    mm.phases[*leg].distance_m = std::max(dist - c, 1.0);
    return smallest_margin(mm, run_mission(mm, "the cut of leg " + std::to_string(*leg + 1) + " (last tried " +
                                                   format_number(c) + " m)"))
        .first;
  };
  const double lo = 0.0, hi = dist - 1.0;  // metres cut
  const double flo = smallest_margin(m, run_mission(without, "the mission without its spare phase")).first;
  const double fhi = cut(hi);
  out.cut_leg = leg;
  if (fhi < 0.0) {
    out.note = "the mission fails even without phase " + std::to_string(spare + 1) + " and with phase " +
               std::to_string(*leg + 1) + " cut to 1 m";
    return;
  }
  double a = lo, b = hi, fa = flo, fb = fhi;
  narrow_bracket(cut, a, b, fa, fb);
  const double root = find_root(cut, a, b, fa, fb, 0.5, 100).value_or(b);
  out.cut_leg_m = std::min(root + 0.5, hi);
  out.note = "remove phase " + std::to_string(spare + 1) + " and shorten phase " + std::to_string(*leg + 1) + " by " +
             format_fixed(*out.cut_leg_m, 0) + " m";
}

}  // namespace

namespace {

using Margins = std::vector<std::pair<double, std::string>>;

/// One spare-time search: its whole-mission simulations, counted against the cap, and every
/// evaluation kept (the binding rule is read from the nearest failing one).
struct SpareSearch {
  const Mission& m;
  const SpareOptions& opts;
  SpareResult& out;
  std::size_t i = 0;  ///< the spare phase
  SimOptions so;
  std::vector<std::tuple<double, double, std::string>> seen;
  std::vector<std::pair<double, Margins>> all;  ///< every rule's margin

  MissionResult run_mission(const Mission& mm, const std::string& what) {
    if (out.simulations >= opts.max_simulations)
      throw LimitError("spare-time solve stopped after " + std::to_string(opts.max_simulations) +
                       " whole-mission simulations without locating " + what);
    ++out.simulations;
    return simulate(mm, so);
  }
  /// The flight at the start of the spare phase, kept by the first try: every later try flies
  /// only from there (the phases before it are the same in each), with the same result as a
  /// whole simulation.
  std::optional<steps::FlightAt> at_spare;
  MissionResult run(double delta) {
    if (out.simulations >= opts.max_simulations)
      throw LimitError("spare-time solve stopped after " + std::to_string(opts.max_simulations) +
                       " whole-mission simulations without locating the spare time of phase " + std::to_string(i + 1) +
                       " (last tried " + format_number(delta) + " s)");
    ++out.simulations;
    const Mission mm = lengthened(m, i, delta);
    if (at_spare) return steps::simulate_from(mm, so, *at_spare);
    return steps::simulate_keeping(mm, so, i, at_spare);
  }
  /// The smallest margin with `delta` added to the spare phase.
  double f(double delta) {
    const MissionResult r = run(delta);
    auto [v, name] = smallest_margin(m, r);
    seen.emplace_back(delta, v, name);
    all.emplace_back(delta, rule_margins(m, r));
    return v;
  }
  Margins margins_at(double x) const {
    for (const auto& [d, v] : all)
      if (d == x) return v;
    return Margins{};
  }
};

/// The bracket of a mission that holds as planned: added time grown until a rule fails; false
/// when every rule still holds at max_spare_s (stated as a bound: the search stops).
bool bracket_above(SpareSearch& s, double f0, double base_len, double& lo, double& hi, double& flo, double& fhi) {
  const SpareOptions& opts = s.opts;
  lo = 0.0;
  flo = f0;
  hi = std::min(std::max(60.0, 0.25 * base_len), opts.max_spare_s);
  fhi = s.f(hi);
  while (fhi >= 0.0) {
    if (hi >= opts.max_spare_s) {
      s.out.spare_s = hi;
      s.out.capped = true;
      s.out.note = "every rule still holds with " + format_fixed(hi, 0) + " s added; the search stops there";
      return false;
    }
    // Next try: past the root the last two points predict (margins fall nearly linearly with
    // the added time), at least 1 s further and at most eight times as far.
    const double slope = (fhi - flo) / (hi - lo);
    double next = 2.0 * hi;
    if (slope < 0.0) next = std::clamp(hi - fhi / slope + 0.02 * (hi - lo) + 1.0, hi + 1.0, 8.0 * hi);
    const double pr = predicted_root(s.margins_at(lo), s.margins_at(hi), lo, hi);
    if (std::isfinite(pr) && pr > hi) next = std::clamp(pr + 0.02 * (hi - lo) + 1.0, hi + 1.0, 8.0 * hi);
    lo = hi;
    flo = fhi;
    hi = std::min(next, opts.max_spare_s);
    fhi = s.f(hi);
  }
  return true;
}

/// The bracket of a mission that fails as planned: down to the spare phase removed; false when
/// it fails even then (not bounded: the leg cut is tried instead).
bool bracket_below(SpareSearch& s, double f0, double base_len, double& lo, double& hi, double& flo, double& fhi) {
  hi = 0.0;
  fhi = f0;
  lo = -base_len;
  const MissionResult without = s.run(lo);
  const auto [m_without, rule_without] = smallest_margin(s.m, without);
  s.all.emplace_back(lo, rule_margins(s.m, without));
  flo = m_without;
  if (flo >= 0.0) return true;
  s.out.spare_s = -base_len;
  s.out.bounded = false;
  s.out.binding_rule = rule_without;
  auto run_mission = [&](const Mission& mm, const std::string& what) { return s.run_mission(mm, what); };
  solve_leg_cut(s.m, s.i, s.out, run_mission);
  return false;
}

}  // namespace

SpareResult solve_spare(const Mission& m_in, const MissionResult& base, const SpareOptions& opts) {
  // Keyword airspeeds solved once, not in every simulation of the search.
  const Mission m = with_resolved_airspeeds(m_in);
  SpareResult out;
  out.phase = spare_phase(m);
  for (const auto& r : base.rules)
    if (!r.pass && !r.length_dependent) out.fixed_failures.push_back(r.name);
  if (!out.phase) {
    out.note = "no hover, loiter or phase marked spare to lengthen";
    return out;
  }
  if (base.refused) {
    out.note = "the mission cannot be flown as planned";
    out.bounded = false;
    return out;
  }
  SpareSearch s{m, opts, out};
  s.i = *out.phase;
  s.so = opts.sim;
  s.so.sample_s = 0.0;
  const double base_len = planned_duration_s(m, s.i).value_or(0.0);
  s.all.emplace_back(0.0, rule_margins(m, base));
  const double f0 = smallest_margin(m, base).first;
  double lo, hi, flo, fhi;
  if (!(f0 >= 0.0 ? bracket_above(s, f0, base_len, lo, hi, flo, fhi) : bracket_below(s, f0, base_len, lo, hi, flo, fhi)))
    return out;
  auto f = [&](double delta) { return s.f(delta); };
  narrow_bracket(f, lo, hi, flo, fhi, predicted_root(s.margins_at(lo), s.margins_at(hi), lo, hi));
  const double root = find_root(f, lo, hi, flo, fhi, 0.05, 100).value_or(lo);
  // Report the side of the bracket where every rule still holds.
  out.spare_s = root;
  // The rule failing just past the root: from an evaluation within 1 s past it, else one more.
  for (const auto& [d, v, name] : s.seen)
    if (v < 0.0 && d > root && d - root <= 1.0 && out.binding_rule.empty()) out.binding_rule = name;
  if (out.binding_rule.empty()) out.binding_rule = smallest_margin(m, s.run(root + 0.05)).second;
  return out;
}

}  // namespace sortie::sim
