#pragma once
/// Flight logs: time, pack voltage and pack current (discharge positive), with optional height,
/// speed, throttle and temperature columns. Columns are found by header name (with the unit in
/// the header: "Voltage(V)", "current_mA") or named with `--columns`; rows must be in time order.
#include <filesystem>
#include <map>
#include <string>
#include <vector>

#include "io/log_columns.hpp"

namespace sortie::io {

struct FlightLog {
  std::string file;
  std::vector<double> time_s;      ///< from the first row (take-off), strictly increasing
  std::vector<double> voltage_V;   ///< pack terminal voltage
  std::vector<double> current_A;   ///< pack current, discharge positive
  std::vector<double> height_m, speed_mps, throttle, temperature_C;  ///< empty when absent (NaN cells)
  std::vector<std::size_t> lines;  ///< 1-based file line of each row
  std::vector<std::string> comments;
};

/// Quantities `--columns` accepts: time, voltage, current, height, speed, throttle, temp.
const std::vector<std::string>& flight_log_quantities();

FlightLog read_flight_log(const DelimitedFile& f, const std::map<std::string, ColumnRef>& columns = {});
FlightLog read_flight_log_file(const std::filesystem::path& path,
                               const std::map<std::string, ColumnRef>& columns = {});

}  // namespace sortie::io
