#pragma once
#include <optional>
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
  // Set by rank_rows.
  bool meets = true;     ///< go, and the requirement of the ranking (if any) holds
  std::string short_of;  ///< why a go row misses the requirement ("" when it meets it)
  bool pareto = false;   ///< on the front of spare time against pack mass among go rows
};

/// What "best" means. `spare`: the longest spare time. `lightest`: the lightest pack that meets
/// the requirement (a spare of at least need_spare_s and/or a landing SoC of at least
/// need_landing_soc; with neither, the lightest go pack). `spare_per_kg`: spare time per kg of
/// pack. Always: go rows before no-go rows, refused missions last.
enum class RankBy { spare, lightest, spare_per_kg };
std::string to_string(RankBy r);
struct RankOptions {
  RankBy by = RankBy::spare;
  std::optional<double> need_spare_s;
  std::optional<double> need_landing_soc;  ///< 0..1
};

/// The spare time a row counts with, s: 0 with no spare phase; -inf for a refused mission or an
/// unbounded or failed solve.
double counted_spare_s(const CompareRow& r);

/// Order rows by `o` and mark the requirement and the Pareto front (a go row is on the front
/// when no other go row is at most as heavy with at least as much spare, better in one).
void rank_rows(std::vector<CompareRow>& rows, const RankOptions& o);

/// Packs of each series count at one pack energy: the cell is resized so that S·P·(mean OCV)·Q
/// equals `energy_Wh`, so what differs between the rows is voltage, duty and mass, not energy.
std::vector<PackCandidate> equal_energy_packs(const battery::Cell& cell, const battery::Pack& base,
                                              const std::vector<int>& series, double energy_Wh,
                                              const std::vector<int>& parallel);

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
