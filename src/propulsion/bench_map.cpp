#include "propulsion/bench_map.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>
#include <numbers>

namespace sortie::propulsion {

namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// Index i of the segment [x_i, x_{i+1}] used for xq: the one holding it, or the end segment
// (linear extrapolation) outside.
std::size_t segment(const std::vector<double>& x, double xq) {
  auto it = std::upper_bound(x.begin() + 1, x.end() - 1, xq);
  return static_cast<std::size_t>(it - x.begin()) - 1;
}

double lerp(const std::vector<double>& x, std::size_t i, double xq, double y0, double y1) {
  const double w = (xq - x[i]) / (x[i + 1] - x[i]);
  return y0 + w * (y1 - y0);
}

}  // namespace

double BenchRow::shaft_W() const {
  if (!torque_Nm) return kNaN;
  return *torque_Nm * rpm * 2.0 * std::numbers::pi / 60.0;  // P = Q·ω
}

BenchMap make_bench_map(std::vector<BenchRow> rows) {
  assert(rows.size() >= 2);
  BenchMap m;
  m.has_torque = true;
  double v_sum = 0.0;
  m.v_bus_min_V = rows.front().v_bus_V;
  m.v_bus_max_V = rows.front().v_bus_V;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    assert(rows[i].thrust_N >= 0.0);
    assert(i == 0 || (rows[i].thrust_N > rows[i - 1].thrust_N &&
                      rows[i].throttle_pct > rows[i - 1].throttle_pct));
    if (!rows[i].torque_Nm) m.has_torque = false;
    v_sum += rows[i].v_bus_V;
    m.v_bus_min_V = std::min(m.v_bus_min_V, rows[i].v_bus_V);
    m.v_bus_max_V = std::max(m.v_bus_max_V, rows[i].v_bus_V);
  }
  m.v_bus_mean_V = v_sum / static_cast<double>(rows.size());
  std::vector<double> t, w, a;
  for (const auto& r : rows) {
    t.push_back(r.thrust_N);
    w.push_back(r.bus_W());
    a.push_back(r.i_bus_A);
  }
  m.bus_W_of_thrust = MonotoneCubic(t, std::move(w));
  m.bus_A_of_thrust = MonotoneCubic(std::move(t), std::move(a));
  m.rows = std::move(rows);
  return m;
}

BenchPoint bench_at_thrust(const BenchMap& map, double thrust_N) {
  const auto& r = map.rows;
  std::vector<double> u(r.size()), s(r.size());  // u = T^1.5, s = √T
  for (std::size_t k = 0; k < r.size(); ++k) {
    s[k] = std::sqrt(r[k].thrust_N);
    u[k] = r[k].thrust_N * s[k];
  }
  BenchPoint p;
  p.thrust_N = thrust_N;
  const double tq = std::max(thrust_N, 0.0);
  const double sq = std::sqrt(tq), uq = tq * sq;
  const std::size_t iu = segment(u, uq), is = segment(s, sq);
  // Bus power and current by the monotone cubic in T; shaft power linear in T^1.5; speed and
  // throttle linear in √T (bench_map.hpp says why).
  p.bus_W = map.bus_W_of_thrust(tq);
  p.bus_A = map.bus_A_of_thrust(tq);
  p.rpm = lerp(s, is, sq, r[is].rpm, r[is + 1].rpm);
  p.throttle_pct = lerp(s, is, sq, r[is].throttle_pct, r[is + 1].throttle_pct);
  p.shaft_W = map.has_torque ? lerp(u, iu, uq, r[iu].shaft_W(), r[iu + 1].shaft_W()) : kNaN;
  p.eta_system = map.has_torque && p.bus_W > 0.0 ? p.shaft_W / p.bus_W : kNaN;
  p.g_per_W = p.bus_W > 0.0 ? tq / kStandardGravity * 1000.0 / p.bus_W : 0.0;
  p.extrapolated = thrust_N < map.thrust_min_N() || thrust_N > map.thrust_max_N();
  if (thrust_N > map.thrust_max_N()) {
    p.status = BusStatus::saturated;
    p.thrust_available_N = map.thrust_max_N();
  }
  return p;
}

BusLoad bus_load(const BenchPoint& p) { return {p.bus_W, 0.0}; }

}  // namespace sortie::propulsion
