#pragma once
/// The model's range in the results of `discharge`, `fly` and `compare`: the cell's covered
/// ranges and every excursion beyond them (sim/model_range.hpp), as text and JSON.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "battery/cell.hpp"
#include "sim/model_range.hpp"

namespace sortie::report {

/// `{soc_min, soc_max, current_max_A, current_min_A, temperature_min_C, temperature_max_C,
/// source}` (absent bounds `null`), or `null` for a cell without a coverage block.
nlohmann::json coverage_json(const battery::Cell& c);
/// One object per excursion: `quantity`, `side`, `range`, `limit`, `extreme`, `beyond`,
/// `first_s`, `duration_s`, `intervals`, `at_end` (and `phase` when `with_phase`).
nlohmann::json excursions_json(const std::vector<sim::Excursion>& xs, bool with_phase);
/// "outside the model's range" and one line per excursion; empty when there is none.
std::string excursions_text(const std::vector<sim::Excursion>& xs);

}  // namespace sortie::report
