#include "plan/survey.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>

#include "core/constants.hpp"

namespace sortie::plan {

namespace {

constexpr double kDeg = std::numbers::pi / 180.0;
constexpr double kG = core::kStandardGravity;

double cross(const Xy& o, const Xy& a, const Xy& b) { return (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x); }

bool on_segment(const Xy& p, const Xy& q, const Xy& r) {
  return std::min(p.x, r.x) <= q.x && q.x <= std::max(p.x, r.x) && std::min(p.y, r.y) <= q.y &&
         q.y <= std::max(p.y, r.y);
}

int orient(const Xy& p, const Xy& q, const Xy& r) {
  const double v = cross(p, q, r);
  const double scale = 1e-12 * (std::abs(q.x - p.x) + std::abs(q.y - p.y)) * (std::abs(r.x - p.x) + std::abs(r.y - p.y));
  if (std::abs(v) <= scale) return 0;
  return v > 0 ? 1 : -1;
}

/// Closed segments p1q1 and p2q2 share a point.
bool segments_meet(const Xy& p1, const Xy& q1, const Xy& p2, const Xy& q2) {
  const int o1 = orient(p1, q1, p2), o2 = orient(p1, q1, q2), o3 = orient(p2, q2, p1), o4 = orient(p2, q2, q1);
  if (o1 != o2 && o3 != o4) return true;
  if (o1 == 0 && on_segment(p1, p2, q1)) return true;
  if (o2 == 0 && on_segment(p1, q2, q1)) return true;
  if (o3 == 0 && on_segment(p2, p1, q2)) return true;
  if (o4 == 0 && on_segment(p2, q1, q2)) return true;
  return false;
}

/// Coordinates with v along the lines and u across them (u to the right of the line direction).
struct Frame {
  double s, c;  // sin and cos of the direction
  explicit Frame(double direction_deg) : s(std::sin(direction_deg * kDeg)), c(std::cos(direction_deg * kDeg)) {}
  // Direction unit vector (east, north) = (s, c); the right-hand normal = (c, −s).
  double along(const Xy& p) const { return p.x * s + p.y * c; }
  double across(const Xy& p) const { return p.x * c - p.y * s; }
  Xy point(double u, double v) const { return {u * c + v * s, -u * s + v * c}; }
};

}  // namespace

double signed_area(const std::vector<Xy>& ring) {
  double a = 0.0;
  for (std::size_t i = 0; i < ring.size(); ++i) {
    const Xy& p = ring[i];
    const Xy& q = ring[(i + 1) % ring.size()];
    a += p.x * q.y - q.x * p.y;
  }
  return 0.5 * a;
}

std::optional<RingProblem> ring_problem(const std::vector<Xy>& ring) {
  const std::size_t n = ring.size();
  for (std::size_t i = 0; i < n; ++i) {
    const Xy& p = ring[i];
    const Xy& q = ring[(i + 1) % n];
    if (p.x == q.x && p.y == q.y) return RingProblem{"two consecutive vertices are the same point", i};
  }
  if (n < 3) return RingProblem{"fewer than three distinct vertices", 0};
  for (std::size_t i = 0; i < n; ++i) {
    for (std::size_t j = i + 1; j < n; ++j) {
      const bool neighbours = j == i + 1 || (i == 0 && j == n - 1);
      const Xy &a1 = ring[i], &b1 = ring[(i + 1) % n], &a2 = ring[j], &b2 = ring[(j + 1) % n];
      if (neighbours) {
        // Neighbours share one vertex; they must not fold back onto each other.
        const Xy& far_i = j == i + 1 ? a1 : b1;
        const Xy& shared = j == i + 1 ? b1 : a1;
        const Xy& far_j = j == i + 1 ? b2 : a2;
        if (orient(far_i, shared, far_j) == 0 &&
            ((far_j.x - shared.x) * (far_i.x - shared.x) + (far_j.y - shared.y) * (far_i.y - shared.y)) > 0)
          return RingProblem{"the boundary folds back on itself", i};
        continue;
      }
      if (segments_meet(a1, b1, a2, b2)) return RingProblem{"the boundary crosses itself", i};
    }
  }
  const double area = std::abs(signed_area(ring));
  double extent = 0.0;
  for (const Xy& p : ring) extent = std::max({extent, std::abs(p.x - ring[0].x), std::abs(p.y - ring[0].y)});
  if (!(area > 1e-9 * extent * extent)) return RingProblem{"the polygon has no area", 0};
  return std::nullopt;
}

std::vector<Xy> convex_hull(std::vector<Xy> pts) {
  std::sort(pts.begin(), pts.end(), [](const Xy& a, const Xy& b) { return a.x < b.x || (a.x == b.x && a.y < b.y); });
  if (pts.size() < 3) return pts;
  std::vector<Xy> h(2 * pts.size());
  std::size_t k = 0;
  for (const Xy& p : pts) {
    while (k >= 2 && cross(h[k - 2], h[k - 1], p) <= 0) --k;
    h[k++] = p;
  }
  for (std::size_t i = pts.size() - 1, t = k + 1; i-- > 0;) {
    while (k >= t && cross(h[k - 2], h[k - 1], pts[i]) <= 0) --k;
    h[k++] = pts[i];
  }
  h.resize(k - 1);
  return h;
}

double width_across(const std::vector<Xy>& ring, double direction_deg) {
  const Frame f(direction_deg);
  double lo = std::numeric_limits<double>::infinity(), hi = -lo;
  for (const Xy& p : ring) {
    lo = std::min(lo, f.across(p));
    hi = std::max(hi, f.across(p));
  }
  return hi - lo;
}

double fewest_lines_direction_deg(const std::vector<Xy>& ring) {
  const std::vector<Xy> h = convex_hull(ring);
  double best_w = std::numeric_limits<double>::infinity(), best_dir = 0.0;
  for (std::size_t i = 0; i < h.size(); ++i) {
    const Xy& p = h[i];
    const Xy& q = h[(i + 1) % h.size()];
    double dir = std::atan2(q.x - p.x, q.y - p.y) / kDeg;  // azimuth of the edge
    dir = std::fmod(dir + 360.0, 180.0);
    const double w = width_across(h, dir);
    if (!std::isfinite(best_w) || w < best_w - 1e-9 * best_w) {
      best_w = w;
      best_dir = dir;
    }
  }
  // An edge a hair off north (179.99999°) is a north-south line: 0°.
  return best_dir >= 180.0 - 1e-6 ? 0.0 : best_dir;
}

double spacing_from_sensor(double height_m, double fov_deg, double side_overlap) {
  return 2.0 * height_m * std::tan(0.5 * fov_deg * kDeg) * (1.0 - side_overlap);
}

Pattern make_pattern(const std::vector<Xy>& ring, double direction_deg, double spacing_m, const Xy& home,
                     const OrderWind& wind) {
  // Time of a straight stretch (or its length, with no airspeed); unflyable is infinite.
  auto cost = [&](const Xy& a, const Xy& b, bool transit = false) {
    const double d = std::hypot(b.x - a.x, b.y - a.y);
    if (wind.airspeed_mps <= 0.0 || d == 0.0) return d;
    const double v = transit && wind.transit_airspeed_mps > 0.0 ? wind.transit_airspeed_mps : wind.airspeed_mps;
    const double track = std::atan2(b.x - a.x, b.y - a.y) / kDeg;
    const double gs = ground_speed_mps(v, track, wind.wind_mps, wind.wind_from_deg);
    return gs > 0.0 ? d / gs : std::numeric_limits<double>::infinity();
  };
  Pattern pat;
  pat.direction_deg = direction_deg;
  pat.spacing_m = spacing_m;
  const Frame f(direction_deg);
  double lo = std::numeric_limits<double>::infinity(), hi = -lo;
  for (const Xy& p : ring) {
    lo = std::min(lo, f.across(p));
    hi = std::max(hi, f.across(p));
  }
  pat.width_m = hi - lo;
  // n = ceil(W/s) lines, centred: the outer lines are (W − (n−1)·s)/2 ≤ s/2 inside the edges.
  // A field wider than whole spacings by under kSpacingSlack of a spacing gets no extra line
  // (a field laid out in whole spacings measures a few cm more in the plane).
  const auto n = static_cast<std::size_t>(std::max(1.0, std::ceil(pat.width_m / spacing_m - kSpacingSlack)));
  pat.lines = n;
  const double first = lo + 0.5 * (pat.width_m - static_cast<double>(n - 1) * spacing_m);
  // Each line's stretches inside the ring, in increasing v.
  std::vector<std::vector<std::pair<double, double>>> cuts(n);
  for (std::size_t k = 0; k < n; ++k) {
    const double u = first + static_cast<double>(k) * spacing_m;
    std::vector<double> vs;
    for (std::size_t i = 0; i < ring.size(); ++i) {
      const Xy& p = ring[i];
      const Xy& q = ring[(i + 1) % ring.size()];
      const double up = f.across(p), uq = f.across(q);
      if ((up <= u) == (uq <= u)) continue;  // half-open rule: a vertex on the line counts once
      const double t = (u - up) / (uq - up);
      vs.push_back(f.along(p) + t * (f.along(q) - f.along(p)));
    }
    std::sort(vs.begin(), vs.end());
    for (std::size_t i = 0; i + 1 < vs.size(); i += 2)
      if (vs[i + 1] - vs[i] > 1e-6) cuts[k].emplace_back(vs[i], vs[i + 1]);
  }
  // Four ways to fly it: from the low-u or the high-u side, first pass toward +v or −v.
  double best = std::numeric_limits<double>::infinity();
  for (int from_high = 0; from_high < 2; ++from_high) {
    for (int first_up = 0; first_up < 2; ++first_up) {
      std::vector<Pass> order;
      bool up = first_up == 1;
      for (std::size_t step = 0; step < n; ++step) {
        const std::size_t k = from_high ? n - 1 - step : step;
        const double u = first + static_cast<double>(k) * spacing_m;
        if (cuts[k].empty()) continue;
        std::vector<std::pair<double, double>> c = cuts[k];
        if (!up) std::reverse(c.begin(), c.end());
        for (const auto& [v0, v1] : c) {
          Pass p;
          p.line = k;
          p.a = f.point(u, up ? v0 : v1);
          p.b = f.point(u, up ? v1 : v0);
          order.push_back(p);
        }
        up = !up;
      }
      if (order.empty()) continue;
      double d = cost(home, order.front().a, true) + cost(order.back().b, home, true);
      for (std::size_t i = 0; i < order.size(); ++i) {
        d += cost(order[i].a, order[i].b);
        if (i + 1 < order.size()) d += cost(order[i].b, order[i + 1].a);
      }
      if (d < best - 1e-9) {
        best = d;
        pat.passes = std::move(order);
      }
    }
  }
  return pat;
}

double reversal_turn_length_m(double offset_m, double radius_m) {
  const double r = radius_m;
  if (offset_m >= 2.0 * r) return std::numbers::pi * r + (offset_m - 2.0 * r);
  const double beta = std::acos((r + 0.5 * offset_m) / (2.0 * r));
  return r * (std::numbers::pi + 4.0 * beta);
}

double turn_radius_m(double airspeed_mps, double bank_deg) {
  return airspeed_mps * airspeed_mps / (kG * std::tan(bank_deg * kDeg));
}

double ground_speed_mps(double airspeed_mps, double track_deg, double wind_mps, double wind_from_deg) {
  // The wind blows toward wind_from + 180°; its component along the track and across it.
  const double rel = (wind_from_deg + 180.0 - track_deg) * kDeg;
  const double along = wind_mps * std::cos(rel);
  const double across = wind_mps * std::sin(rel);
  if (std::abs(across) >= airspeed_mps) return 0.0;
  return std::sqrt(airspeed_mps * airspeed_mps - across * across) + along;
}

}  // namespace sortie::plan
