#include "sim/uncertainty.hpp"

#include <algorithm>
#include <cmath>
#include <random>
#include <tuple>

#include "sim/parallel.hpp"
#include "sim/what_if.hpp"

namespace sortie::sim {

namespace {

/// splitmix64 (S. Vigna's finaliser of Java's SplittableRandom; G. L. Steele, D. Lea, C. H.
/// Flood, Fast splittable pseudorandom number generators, 2014): a bijection of 64-bit words
/// that spreads nearby seeds apart.
std::uint64_t splitmix64(std::uint64_t x) {
  x += 0x9E3779B97F4A7C15ULL;
  x = (x ^ (x >> 30)) * 0xBF58476D1CE4E5B9ULL;
  x = (x ^ (x >> 27)) * 0x94D049BB133111EBULL;
  return x ^ (x >> 31);
}

constexpr double kPi = 3.14159265358979323846;

/// Hold `v` inside [lo, hi], noting `name` when it had to.
double held(double v, double lo, double hi, const char* name, Draw& d) {
  if (v < lo || v > hi) {
    d.clamped.push_back(name);
    return std::clamp(v, lo, hi);
  }
  return v;
}

}  // namespace

Spreads zero_spreads() {
  Spreads s;
  s.cell_capacity_sd = s.cell_resistance_sd = 0.0;
  s.wind_speed_sd_mps = s.wind_from_sd_deg = 0.0;
  s.temperature_sd_C = 0.0;
  return s;
}

std::uint64_t sample_seed(std::uint64_t seed, std::uint64_t index) { return splitmix64(splitmix64(seed) ^ index); }

double unit_uniform(std::uint64_t word) { return static_cast<double>(word >> 11) * 0x1.0p-53; }

double box_muller(std::uint64_t w1, std::uint64_t w2) {
  const double u1 = static_cast<double>((w1 >> 11) + 1) * 0x1.0p-53;  // (0, 1]: the log stays finite
  const double u2 = unit_uniform(w2);
  return std::sqrt(-2.0 * std::log(u1)) * std::cos(2.0 * kPi * u2);
}

Mission sampled_mission(const Mission& base, const Spreads& s, std::uint64_t seed, std::uint64_t index, Draw& d) {
  std::mt19937_64 g(sample_seed(seed, index));
  auto normal = [&g] {
    const std::uint64_t a = g();
    const std::uint64_t b = g();
    return box_muller(a, b);
  };
  // Every draw is taken whatever the spreads, in this order, so that a sample's numbers do not
  // shift when one spread is set to 0.
  const double z_cap = normal(), z_res = normal(), z_sohc = normal(), z_sohr = normal();
  const double z_ws = normal(), z_wd = normal();
  const double u_gust = unit_uniform(g());
  const double z_t = normal(), z_pay = normal();

  Mission m = base;
  d = Draw{};
  d.capacity_factor = 1.0 + s.cell_capacity_sd * z_cap;
  d.resistance_factor = 1.0 + s.cell_resistance_sd * z_res;
  d.soh_capacity = m.pack.soh_capacity;
  d.soh_resistance = m.pack.soh_resistance;
  // The ranges held are the loader's (io/battery_json.cpp soh, io/airframe_json.cpp wind and
  // temperature and payload); a value is changed only where its spread is not 0, so that zero
  // spreads give the profile exactly.
  if (s.cell_capacity_sd > 0 || s.soh_capacity_sd > 0)
    m.pack.soh_capacity = d.soh_capacity =
        held((base.pack.soh_capacity + s.soh_capacity_sd * z_sohc) * d.capacity_factor, 0.01, 1.5, "soh_capacity", d);
  if (s.cell_resistance_sd > 0 || s.soh_resistance_sd > 0)
    m.pack.soh_resistance = d.soh_resistance =
        held((base.pack.soh_resistance + s.soh_resistance_sd * z_sohr) * d.resistance_factor, 0.01, 20.0,
             "soh_resistance", d);
  d.wind_mps = m.environment.wind.speed_mps;
  d.wind_from_deg = m.environment.wind.from_deg;
  if (s.wind_speed_sd_mps > 0)
    m.environment.wind.speed_mps = d.wind_mps = held(d.wind_mps + s.wind_speed_sd_mps * z_ws, 0.0, 60.0, "wind_mps", d);
  if (s.wind_from_sd_deg > 0) {
    double dir = std::fmod(d.wind_from_deg + s.wind_from_sd_deg * z_wd, 360.0);
    if (dir < 0) dir += 360.0;
    m.environment.wind.from_deg = d.wind_from_deg = dir;
  }
  if (s.gust_max_mps > 0 && s.gust_power_W_per_mps2 > 0) {
    d.gust_mps = s.gust_max_mps * u_gust;
    d.gust_W = s.gust_power_W_per_mps2 * d.gust_mps * d.gust_mps;
    m.avionics_W += d.gust_W;
  }
  d.air_C = get_what_if(base, "air-C");
  d.pack_C = base.pack.temperature_C;
  if (s.temperature_sd_C > 0) {
    const double delta = s.temperature_sd_C * z_t;
    d.air_C = held(d.air_C + delta, -60.0, 60.0, "air_C", d);
    set_what_if(m, "air-C", d.air_C);
    m.pack.temperature_C = d.pack_C = held(d.pack_C + delta, -60.0, 100.0, "pack_C", d);
    if (m.pack.air_C) m.pack.air_C = held(*m.pack.air_C + delta, -60.0, 100.0, "pack_air_C", d);
  }
  d.payload_kg = get_what_if(base, "payload-kg");
  if (s.payload_sd_kg > 0) {
    d.payload_kg = held(d.payload_kg + s.payload_sd_kg * z_pay, 0.0, 500.0, "payload_kg", d);
    set_what_if(m, "payload-kg", d.payload_kg);
  }
  return m;
}

double quantile_sorted(const std::vector<double>& v, double p) {
  if (v.empty()) return std::nan("");
  // Hyndman–Fan definition 7: h = (n − 1)·p, Q = x[⌊h⌋] + (h − ⌊h⌋)·(x[⌊h⌋+1] − x[⌊h⌋]).
  const double h = (static_cast<double>(v.size()) - 1.0) * p;
  const std::size_t lo = static_cast<std::size_t>(std::floor(h));
  const std::size_t hi = std::min(lo + 1, v.size() - 1);
  return v[lo] + (h - static_cast<double>(lo)) * (v[hi] - v[lo]);
}

Percentiles percentiles(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  Percentiles p;
  p.n = v.size();
  p.p5 = quantile_sorted(v, 0.05);
  p.p50 = quantile_sorted(v, 0.50);
  p.p95 = quantile_sorted(v, 0.95);
  return p;
}

std::pair<double, double> wilson95(std::size_t k, std::size_t n) {
  if (n == 0) return {0.0, 1.0};
  const double N = static_cast<double>(n);
  const double p = static_cast<double>(k) / N;
  const double z = 1.959963984540054, z2 = z * z;
  const double centre = (p + z2 / (2 * N)) / (1 + z2 / N);
  const double half = z * std::sqrt(p * (1 - p) / N + z2 / (4 * N * N)) / (1 + z2 / N);
  return {std::max(0.0, centre - half), std::min(1.0, centre + half)};
}

SampleRun run_samples(const Mission& base, const Spreads& s, int n, std::uint64_t seed, const SimOptions& so,
                      unsigned threads, const std::function<void(std::size_t, std::size_t)>& progress) {
  SampleRun out;
  out.spreads = s;
  out.seed = seed;
  const std::size_t count = static_cast<std::size_t>(std::max(n, 0));
  out.draws.resize(count);
  out.points.resize(count);
  for_each_index(
      count, threads,
      [&](std::size_t i) {
        const Mission m = sampled_mission(base, s, seed, i, out.draws[i]);
        out.points[i] = fly_point(m, so);
      },
      progress);
  std::vector<double> ft, soc, spare;
  for (std::size_t i = 0; i < count; ++i) {
    const auto& p = out.points[i];
    if (p.go) ++out.n_go;
    if (!out.draws[i].clamped.empty()) ++out.clamped;
    for (const auto& f : p.failing) ++out.failures[f];
    if (p.refused) continue;
    ft.push_back(p.flight_time_s);
    soc.push_back(p.landing_soc);
    if (p.spare_s) spare.push_back(*p.spare_s);
  }
  const double N = static_cast<double>(count);
  if (count > 0) {
    const double p = static_cast<double>(out.n_go) / N;
    out.p_go = p;
    out.p_go_se = std::sqrt(p * (1.0 - p) / N);
    std::tie(out.wilson_lo, out.wilson_hi) = wilson95(out.n_go, count);
  }
  out.flight_time_s = percentiles(ft);
  out.landing_soc = percentiles(soc);
  out.spare_s = percentiles(spare);
  std::size_t most = 0;
  for (const auto& [rule, k] : out.failures)
    if (k > most) {
      most = k;
      out.most_failing = rule;
    }
  return out;
}

}  // namespace sortie::sim
