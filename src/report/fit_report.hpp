#pragma once
/// The results of `sortie fit cell`: a text report and a JSON report. The voltage errors are
/// those of the written model re-simulated on the log's current (sim::replay).
#include <nlohmann/json.hpp>
#include <string>

#include "battery/cell_log.hpp"
#include "fit/fit_cell.hpp"
#include "fit/voltage_error.hpp"

namespace sortie::report {

/// JSON report schema version.
inline constexpr const char* kFitCellSchema = "sortie.fit_cell/1";

std::string fit_cell_text(const battery::CellLog& log, const fit::CellFitResult& r,
                          const fit::VoltageErrors& e, const std::string& model_file);
nlohmann::ordered_json fit_cell_json(const battery::CellLog& log, const fit::CellFitResult& r,
                                     const fit::VoltageErrors& e, const std::string& model_file);
/// `time_s,line,current_A,v_measured_V,v_model_V,error_mV,soc`
std::string fit_cell_trace_csv(const battery::CellLog& log, const fit::CellFitResult& r,
                               const std::vector<double>& v_model);

}  // namespace sortie::report
