#pragma once
/// The results of `sortie check`: text report and JSON.
#include <nlohmann/json.hpp>
#include <string>

#include "sim/flight_check.hpp"

namespace sortie::report {

std::string flight_check_text(const std::string& log_file, const std::string& profile_file,
                              const sim::FlightCheck& c);
nlohmann::json flight_check_json(const std::string& log_file, const std::string& profile_file,
                                 const sim::FlightCheck& c);
/// The overlay page: measured, planned and replayed voltage, current and SoC on one time axis
/// with the plan's phases shaded; numbers marked with their JSON keys.
std::string flight_check_html(const std::string& log_file, const std::string& profile_file,
                              const sim::MeasuredFlight& log, const sim::FlightCheck& c);
/// One row per log row: log, plan and replay voltage, current and SoC, and the plan's phase
/// index (empty cells after the plan's landing).
std::string flight_check_trace_csv(const sim::MeasuredFlight& log, const sim::FlightCheck& c);

}  // namespace sortie::report
