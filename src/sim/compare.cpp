#include "sim/compare.hpp"

#include <algorithm>
#include <cstdio>

#include "battery/scaling.hpp"

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
    CompareRow row{c, simulate(m, opts), {}};
    row.spare = solve_spare(m, row.result, spare_opts);
    rows.push_back(std::move(row));
    if (progress) progress(rows.size(), packs.size());
  }
  auto key = [](const CompareRow& r) {
    const double spare = r.result.refused ? -1e300 : r.spare.phase ? r.spare.spare_s : 0.0;
    return std::make_pair(r.result.go ? 1 : 0, spare);
  };
  std::stable_sort(rows.begin(), rows.end(), [&](const CompareRow& a, const CompareRow& b) { return key(a) > key(b); });
  return rows;
}

}  // namespace sortie::sim
