#include "plan/legs.hpp"

#include <cmath>
#include <numbers>

namespace sortie::plan {

const char* to_string(Turns t) {
  switch (t) {
    case Turns::square: return "square";
    case Turns::bank: return "bank";
    case Turns::stop: return "stop";
  }
  return "?";
}

namespace {

using flight::Phase;

constexpr double kMinLeg_m = 0.5;  // legs shorter than this are not flown as phases

Phase climb(double to_h, const FlightPlan& fp, double track, const std::string& label) {
  Phase p;
  p.kind = Phase::Kind::climb;
  p.label = label;
  p.to_height_m = to_h;
  p.rate_mps = fp.climb_rate_mps;
  p.airspeed_mps = fp.climb_airspeed_mps;
  p.track_deg = track;
  return p;
}

Phase descend(double to_h, const FlightPlan& fp, double track, const std::string& label) {
  Phase p;
  p.kind = Phase::Kind::descend;
  p.label = label;
  p.to_height_m = to_h;
  p.rate_mps = fp.descent_rate_mps;
  p.airspeed_mps = fp.descent_airspeed_mps;
  p.track_deg = track;
  return p;
}

Phase cruise(double dist, double airspeed, double track, const std::string& label, double bank = 0.0) {
  Phase p;
  p.kind = Phase::Kind::cruise;
  p.label = label;
  p.distance_m = dist;
  p.airspeed_mps = airspeed;
  p.track_deg = geo::track_0_360(track);
  p.bank_deg = bank;
  return p;
}

Phase hover(double s, const std::string& label) {
  Phase p;
  p.kind = Phase::Kind::hover;
  p.label = label;
  p.duration_s = s;
  return p;
}

double plane_azimuth(const Xy& a, const Xy& b) { return geo::track_0_360(std::atan2(b.x - a.x, b.y - a.y) * 180.0 / std::numbers::pi); }

/// A straight stretch flown from rest to rest at acceleration a (stop turns): speed up over
/// V²/(2a) at the mean speed V/2, hold V, slow down over V²/(2a); a stretch shorter than V²/a
/// peaks at √(a·d) and is flown at its mean speed √(a·d)/2.
void rest_to_rest(std::vector<PlannedPhase>& out, double d, double v, double a, double track,
                  const geo::LonLat& start, const std::string& label) {
  const double ramp = v * v / (2.0 * a);
  geo::LonLat at = start;
  auto push = [&](double dist, double speed, const std::string& l) {
    at = geo::direct(at, track, dist);
    out.push_back({cruise(dist, speed, track, l), at});
  };
  if (d >= 2.0 * ramp) {
    push(ramp, 0.5 * v, label + ": speed up");
    if (d - 2.0 * ramp > kMinLeg_m) push(d - 2.0 * ramp, v, label);
    push(ramp, 0.5 * v, label + ": slow down");
  } else {
    push(d, 0.5 * std::sqrt(a * d), label + ": speed up and slow down");
  }
}

}  // namespace

std::vector<PlannedPhase> route_phases(const std::vector<RoutePoint>& pts, const FlightPlan& fp) {
  std::vector<PlannedPhase> out;
  double h = 0.0;
  auto height_of = [&](std::size_t i) { return pts[i].height_m.value_or(fp.height_m); };
  for (std::size_t i = 0; i + 1 < pts.size(); ++i) {
    const geo::Inverse leg = geo::inverse(pts[i].at, pts[i + 1].at);
    const double track = geo::track_0_360(leg.azi1_deg);
    const double want = i == 0 ? height_of(0) : height_of(i);
    const std::string at = "waypoint " + std::to_string(i + 1);
    if (want > h) out.push_back({climb(want, fp, track, "climb at " + at), pts[i].at});
    if (want < h) out.push_back({descend(want, fp, track, "descend at " + at), pts[i].at});
    h = want;
    if (leg.distance_m > kMinLeg_m)
      out.push_back({cruise(leg.distance_m, fp.airspeed_mps, track,
                            "leg " + std::to_string(i + 1) + " to waypoint " + std::to_string(i + 2)),
                     pts[i + 1].at});
  }
  const geo::LonLat last = pts.back().at;
  const double track = out.empty() ? 0.0 : out.back().phase.track_deg;
  out.push_back({descend(0.0, fp, track, "descend at the last waypoint"), last});
  return out;
}

std::vector<PlannedPhase> survey_phases(const Pattern& pat, const geo::LocalPlane& plane, const geo::LonLat& home,
                                        const FlightPlan& fp) {
  std::vector<PlannedPhase> out;
  const geo::LonLat first = plane.reverse(pat.passes.front().a);
  const geo::Inverse out_leg = geo::inverse(home, first);
  out.push_back({climb(fp.height_m, fp, geo::track_0_360(out_leg.azi1_deg), "climb over home"), home});
  if (out_leg.distance_m > kMinLeg_m)
    out.push_back({cruise(out_leg.distance_m, fp.transit_airspeed_mps, out_leg.azi1_deg, "transit to line 1"), first});
  const double r = fp.turns == Turns::bank ? turn_radius_m(fp.airspeed_mps, fp.bank_deg) : 0.0;
  for (std::size_t i = 0; i < pat.passes.size(); ++i) {
    const Pass& ps = pat.passes[i];
    const geo::LonLat a = plane.reverse(ps.a), b = plane.reverse(ps.b);
    const geo::Inverse leg = geo::inverse(a, b);
    const std::string name = "line " + std::to_string(ps.line + 1);
    if (fp.turns == Turns::stop) {
      rest_to_rest(out, leg.distance_m, fp.airspeed_mps, fp.accel_mps2, leg.azi1_deg, a, name);
    } else {
      out.push_back({cruise(leg.distance_m, fp.airspeed_mps, leg.azi1_deg, name), b});
    }
    if (i + 1 == pat.passes.size()) break;
    const Pass& nx = pat.passes[i + 1];
    const geo::LonLat c = plane.reverse(nx.a);
    const geo::Inverse step = geo::inverse(b, c);
    if (step.distance_m <= kMinLeg_m) continue;
    // Across and along parts of the step, in the plane, relative to this pass's direction.
    const double len = std::hypot(ps.b.x - ps.a.x, ps.b.y - ps.a.y);
    const double ux = (ps.b.x - ps.a.x) / len, uy = (ps.b.y - ps.a.y) / len;
    const double dx = nx.a.x - ps.b.x, dy = nx.a.y - ps.b.y;
    const double along = dx * ux + dy * uy;
    const Xy across_v{dx - along * ux, dy - along * uy};
    const double across = std::hypot(across_v.x, across_v.y);
    const bool reverses = (nx.b.x - nx.a.x) * ux + (nx.b.y - nx.a.y) * uy < 0.0;
    const double across_track = plane_azimuth({0, 0}, across_v);
    if (fp.turns == Turns::square || !reverses) {
      if (fp.turns == Turns::stop) {
        out.push_back({hover(90.0 / fp.yaw_rate_deg_s, "turn toward " + std::string(reverses ? "the next line" : "the next stretch")), b});
        rest_to_rest(out, step.distance_m, fp.airspeed_mps, fp.accel_mps2, step.azi1_deg, b, "step");
        out.push_back({hover(90.0 / fp.yaw_rate_deg_s, "turn onto line " + std::to_string(nx.line + 1)), c});
      } else {
        out.push_back({cruise(step.distance_m, fp.airspeed_mps, step.azi1_deg, "step"), c});
      }
      continue;
    }
    if (fp.turns == Turns::stop) {
      out.push_back({hover(90.0 / fp.yaw_rate_deg_s, "turn toward the next line"), b});
      rest_to_rest(out, step.distance_m, fp.airspeed_mps, fp.accel_mps2, step.azi1_deg, b, "step");
      out.push_back({hover(90.0 / fp.yaw_rate_deg_s, "turn onto line " + std::to_string(nx.line + 1)), c});
      continue;
    }
    // Fixed-wing reversal (plan/survey.hpp reversal_turn_length_m); each arc is a banked cruise
    // on the across-track direction (the mean of its headings for a symmetric turn).
    const std::string tl = "turn onto line " + std::to_string(nx.line + 1);
    if (std::abs(along) > kMinLeg_m)
      out.push_back({cruise(std::abs(along), fp.airspeed_mps, along > 0 ? leg.azi2_deg : leg.azi2_deg + 180.0, "run to the turn"), b});
    if (across >= 2.0 * r) {
      out.push_back({cruise(0.5 * std::numbers::pi * r, fp.airspeed_mps, across_track, tl + " (first quarter)", fp.bank_deg), b});
      if (across - 2.0 * r > kMinLeg_m) out.push_back({cruise(across - 2.0 * r, fp.airspeed_mps, across_track, tl + " (across)"), c});
      out.push_back({cruise(0.5 * std::numbers::pi * r, fp.airspeed_mps, across_track, tl + " (second quarter)", fp.bank_deg), c});
    } else {
      out.push_back({cruise(reversal_turn_length_m(across, r), fp.airspeed_mps, across_track, tl + " (bulb turn)", fp.bank_deg), c});
    }
  }
  const geo::LonLat end = plane.reverse(pat.passes.back().b);
  const geo::Inverse back = geo::inverse(end, home);
  if (back.distance_m > kMinLeg_m)
    out.push_back({cruise(back.distance_m, fp.transit_airspeed_mps, back.azi1_deg, "transit home"), home});
  const double track = out.back().phase.track_deg;
  if (fp.loiter_s) {
    Phase p;
    p.label = "wait over home";
    p.duration_s = *fp.loiter_s;
    p.spare = true;
    if (fp.loiter_airspeed_mps > 0.0) {
      p.kind = Phase::Kind::loiter;
      p.airspeed_mps = fp.loiter_airspeed_mps;
      p.turn_radius_m = fp.loiter_radius_m;
    } else {
      p.kind = Phase::Kind::hover;
    }
    out.push_back({p, home});
  }
  out.push_back({descend(0.0, fp, track, "let-down over home"), home});
  return out;
}

}  // namespace sortie::plan
