#pragma once
/// The results of `sortie drive`: operating points of one rotor across a throttle sweep or at
/// one thrust, at one or several bus voltages, and a measured bench map beside or instead.
/// Text tables for the terminal and a JSON result (schema sortie.drive/1).
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "propulsion/bench_map.hpp"
#include "propulsion/drive.hpp"
#include "propulsion/operating_point.hpp"

namespace sortie::report {

/// JSON result schema version (README "JSON results").
inline constexpr const char* kDriveSchema = "sortie.drive/1";

/// One operating point, with the throttle that made it in a sweep (duty / duty_max, %).
struct DriveRow {
  std::optional<double> throttle_pct;
  propulsion::OperatingPoint op;
};

/// All points at one bus voltage.
struct DriveCase {
  double v_bus_V = 0.0;
  std::optional<int> cells;         ///< when the voltage came from --cells
  double cell_V = 0.0;              ///< with cells
  double thrust_available_N = 0.0;  ///< per rotor at duty_max
  std::vector<DriveRow> rows;
};

/// A measured map and, when a drive model is given too, the model at each measured thrust (at
/// that row's bus voltage) and at the thrust asked for.
struct BenchView {
  std::string file;
  propulsion::BenchMap map;
  std::vector<propulsion::OperatingPoint> model_at_rows;  ///< empty without a drive model
  std::optional<propulsion::BenchPoint> at_thrust;         ///< with --thrust-N
  std::optional<double> v_bus_asked_V;                     ///< --bus-V, to compare with the bench
};

struct DriveResult {
  std::string drive_file;                ///< empty: bench map only
  std::optional<propulsion::Drive> drive;
  double rho_kg_m3 = core::kSeaLevelDensity;
  std::optional<double> altitude_m;      ///< when the density came from --altitude-m
  bool density_given = false;            ///< --density-kg-m3
  double v_axial_mps = 0.0;
  std::optional<double> thrust_N;        ///< per rotor; nullopt: a sweep
  std::vector<DriveCase> cases;
  std::optional<BenchView> bench;
};

std::string drive_text(const DriveResult& r);
nlohmann::json drive_json(const DriveResult& r);

}  // namespace sortie::report
