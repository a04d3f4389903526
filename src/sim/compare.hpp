#pragma once
/// One mission across packs: every pack changes the all-up mass, so the thrust, the current and
/// the sag all change with it. Rows are ranked by spare time.
#include <functional>
#include <string>
#include <vector>

#include "sim/mission.hpp"

namespace sortie::sim {

struct PackCandidate {
  std::string label;   ///< "6S1P 5.0 Ah" or the pack file's name
  battery::Pack pack;
};

struct CompareRow {
  PackCandidate candidate;
  MissionResult result;  ///< without trace
  SpareResult spare;
};

/// Packs S×P from one cell resized to each cell capacity (the pack holds P times that, see
/// battery::scale_cell); wiring, state of health, temperature and initial charge from `base`.
std::vector<PackCandidate> pack_grid(const battery::Cell& cell, const battery::Pack& base,
                                     const std::vector<int>& series, const std::vector<double>& capacity_Ah,
                                     const std::vector<int>& parallel);

/// Fly the mission with each pack; `progress(done, total)` after each. Ranked: go before
/// no-go, then by spare time, longest first; refused missions last.
std::vector<CompareRow> compare_packs(const Mission& base, const std::vector<PackCandidate>& packs,
                                      const std::function<void(std::size_t, std::size_t)>& progress = {},
                                      const SimOptions& opts = {});

}  // namespace sortie::sim
