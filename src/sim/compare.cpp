#include "sim/compare.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>

#include "battery/scaling.hpp"
#include "core/text.hpp"

namespace sortie::sim {

std::vector<PackCandidate> pack_grid(const battery::Cell& cell, const battery::Pack& base,
                                     const std::vector<int>& series, const std::vector<double>& capacity_Ah,
                                     const std::vector<int>& parallel) {
  std::vector<PackCandidate> out;
  for (int s : series)
    for (double q : capacity_Ah)
      for (int p : parallel) {
        battery::Pack pack = base;
        pack.cell = battery::scale_cell(cell, q);
        pack.series = s;
        pack.parallel = p;
        char label[64];
        if (p == 1) std::snprintf(label, sizeof label, "%dS1P %.1f Ah", s, q);
        else std::snprintf(label, sizeof label, "%dS%dP %.1f Ah (%.1f Ah cells)", s, p, q * p, q);
        pack.name = label;
        out.push_back({label, pack});
      }
  return out;
}

std::vector<CompareRow> compare_packs(const Mission& base, const std::vector<PackCandidate>& packs,
                                      const std::function<void(std::size_t, std::size_t)>& progress,
                                      const SimOptions& opts) {
  SpareOptions spare_opts;
  spare_opts.sim = opts;
  std::vector<CompareRow> rows;
  rows.reserve(packs.size());
  for (const auto& c : packs) {
    Mission m = base;
    m.pack = c.pack;
    CompareRow row;
    row.candidate = c;
    row.result = simulate(m, opts);
    row.spare = solve_spare(m, row.result, spare_opts);
    rows.push_back(std::move(row));
    if (progress) progress(rows.size(), packs.size());
  }
  rank_rows(rows, RankOptions{});
  return rows;
}

std::string to_string(RankBy r) {
  switch (r) {
    case RankBy::spare: return "spare";
    case RankBy::lightest: return "lightest";
    case RankBy::spare_per_kg: return "spare-per-kg";
  }
  return "spare";
}

double counted_spare_s(const CompareRow& r) {
  if (r.result.refused) return -std::numeric_limits<double>::infinity();
  if (!r.spare.phase) return 0.0;
  if (!r.spare.bounded) return -std::numeric_limits<double>::infinity();
  return r.spare.spare_s;
}

void rank_rows(std::vector<CompareRow>& rows, const RankOptions& o) {
  for (auto& r : rows) {
    r.short_of.clear();
    r.meets = r.result.go;
    if (!r.result.go) continue;
    if (o.need_spare_s && !(counted_spare_s(r) >= *o.need_spare_s)) {
      r.meets = false;
      r.short_of = "spare " + format_fixed(counted_spare_s(r), 0) + " s below the " + format_fixed(*o.need_spare_s, 0) + " s needed";
    }
    if (o.need_landing_soc && !(r.result.landing.soc >= *o.need_landing_soc)) {
      r.meets = false;
      r.short_of += (r.short_of.empty() ? "" : "; ") + std::string("landing SoC ") + format_fixed(100 * r.result.landing.soc, 1) +
                    " % below the " + format_fixed(100 * *o.need_landing_soc, 1) + " % needed";
    }
  }
  // The Pareto front of spare against pack mass among go rows (brute force: rows are few).
  for (auto& a : rows) {
    a.pareto = false;
    if (!a.result.go) continue;
    bool dominated = false;
    for (const auto& b : rows) {
      if (&a == &b || !b.result.go) continue;
      const double ma = a.result.pack_mass_kg, mb = b.result.pack_mass_kg;
      const double sa = counted_spare_s(a), sb = counted_spare_s(b);
      if (mb <= ma && sb >= sa && (mb < ma || sb > sa)) dominated = true;
    }
    a.pareto = !dominated;
  }
  auto tier = [](const CompareRow& r) { return r.result.refused ? 0 : !r.result.go ? 1 : !r.meets ? 2 : 3; };
  auto per_kg = [](const CompareRow& r) { return counted_spare_s(r) / r.result.pack_mass_kg; };
  std::stable_sort(rows.begin(), rows.end(), [&](const CompareRow& a, const CompareRow& b) {
    if (tier(a) != tier(b)) return tier(a) > tier(b);
    if (tier(a) == 3 && o.by == RankBy::lightest && a.result.pack_mass_kg != b.result.pack_mass_kg)
      return a.result.pack_mass_kg < b.result.pack_mass_kg;
    if (tier(a) == 3 && o.by == RankBy::spare_per_kg) return per_kg(a) > per_kg(b);
    return counted_spare_s(a) > counted_spare_s(b);
  });
}

std::vector<PackCandidate> equal_energy_packs(const battery::Cell& cell, const battery::Pack& base,
                                              const std::vector<int>& series, double energy_Wh,
                                              const std::vector<int>& parallel) {
  // Mean OCV over SoC 0..1 (trapezoid on 1000 steps): the cell's energy at rest per Ah.
  double mean_ocv = 0.0;
  const int n = 1000;
  for (int k = 0; k <= n; ++k) mean_ocv += (k == 0 || k == n ? 0.5 : 1.0) * cell.ocv_V(static_cast<double>(k) / n);
  mean_ocv /= n;
  std::vector<PackCandidate> out;
  for (int s : series)
    for (int p : parallel) {
      const double q = energy_Wh / (s * p * mean_ocv);
      auto one = pack_grid(cell, base, {s}, {q}, {p});
      char label[96];
      std::snprintf(label, sizeof label, "%dS%dP %.0f Wh (%.2f Ah cells)", s, p, energy_Wh, q);
      one.front().label = label;
      one.front().pack.name = label;
      out.push_back(std::move(one.front()));
    }
  return out;
}

}  // namespace sortie::sim
