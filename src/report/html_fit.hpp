#pragma once
/// `sortie fit cell --html` and `sortie fit drive --html`: how well the fitted model follows the
/// measurement. Cell: measured and model voltage over the log, their difference, the fitted OCV
/// and the resistances per SoC band. Drive: thrust and speed, bus power, the residuals and the
/// efficiency (or g/W) against throttle, measured beside the model; the parameter tables.
#include <string>
#include <vector>

#include "battery/cell_log.hpp"
#include "fit/fit_cell.hpp"
#include "fit/fit_drive.hpp"
#include "fit/voltage_error.hpp"

namespace sortie::report {

inline constexpr const char* kFitCellPlots[] = {"fit-cell-voltage", "fit-cell-error", "fit-cell-ocv",
                                                "fit-cell-resistance"};
inline constexpr const char* kFitDrivePlots[] = {"fit-drive-thrust", "fit-drive-power", "fit-drive-residuals",
                                                 "fit-drive-efficiency"};

/// `v_model`: the written model re-simulated on the log's current, one value per log row.
std::string fit_cell_html(const battery::CellLog& log, const fit::CellFitResult& r, const fit::VoltageErrors& e,
                          const std::vector<double>& v_model, const std::string& model_file);
std::string fit_drive_html(const std::string& bench_file, const fit::DriveFitResult& r, const std::string& model_file);

}  // namespace sortie::report
