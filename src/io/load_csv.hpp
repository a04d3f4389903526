#pragma once
/// A load over time from CSV: `time_s` and `current_A` or `power_W`.
/// A comment line `# interpolation: step` (or `linear`, the default) says how values join.
#include <filesystem>
#include <optional>

#include "io/csv.hpp"
#include "plan/load_series.hpp"

namespace sortie::io {

/// `step_override`: true/false forces step/linear whatever the file says.
plan::LoadSeries read_load_csv(const CsvFile& csv, std::optional<bool> step_override = {});
plan::LoadSeries load_load_csv(const std::filesystem::path& path,
                              std::optional<bool> step_override = {});

}  // namespace sortie::io
