#pragma once
/// A flown log against the plan: the plan's simulated timeline (its trace) read at the log's
/// times, the energy and charge of each planned phase from the log, flight time, landing state
/// and the time on station that was really left; and the replay of the pack model on the logged
/// current.
#include <string>
#include <vector>

#include "sim/mission.hpp"

namespace sortie::sim {

/// A flight log in SI: times from take-off, pack voltage and current (discharge positive).
struct MeasuredFlight {
  std::vector<double> time_s, voltage_V, current_A;
  std::vector<std::size_t> lines;  ///< file lines, for "where"
};

struct PhaseCheck {
  std::string label;
  double start_s = 0.0, end_s = 0.0;  ///< the plan's phase as flown in the plan
  double energy_pred_Wh = 0.0, energy_meas_Wh = 0.0;
  double charge_pred_Ah = 0.0, charge_meas_Ah = 0.0;
  bool covered = false;  ///< the log spans the whole phase
};

struct FlightCheck {
  // predicted vs measured on the plan's timeline
  std::size_t rows_compared = 0, rows_after_plan = 0;
  double v_rmse_V = 0.0, v_bias_V = 0.0;  ///< measured − predicted
  std::vector<PhaseCheck> phases;
  double flight_time_pred_s = 0.0, flight_time_meas_s = 0.0;
  double energy_pred_Wh = 0.0, energy_meas_Wh = 0.0, charge_pred_Ah = 0.0, charge_meas_Ah = 0.0;
  double soc_land_pred = 0.0;
  double soc_land_counted = 0.0;  ///< soc0 − counted charge / the profile pack's capacity
  double soc_land_voltage = 0.0;  ///< from the landing voltage: OCV⁻¹ of (V + the model's overpotential)
  double capacity_est_Ah = 0.0;   ///< counted charge / (soc0 − soc_land_voltage)
  double station_current_A = 0.0; ///< the plan's mean current on station (the spare or last hover/loiter phase)
  std::string station_phase;
  double reserve_pred_s = 0.0;    ///< the plan's time on station left at landing
  double reserve_meas_s = 0.0;    ///< from the log (see flight_check.cpp)
  std::string reserve_end;        ///< what ends the plan's time on station
  // replay on the logged current
  double replay_rmse_V = 0.0, replay_max_V = 0.0, replay_max_t_s = 0.0;
  std::size_t replay_max_line = 0;
  std::vector<double> replay_V, replay_soc;        ///< at each log row
  std::vector<double> pred_V, pred_I, pred_soc;    ///< the plan at each log row (NaN after the plan)
  std::vector<double> meas_soc;                    ///< counted
};

/// `plan` must have a trace (SimOptions::sample_s > 0). Throws InputError naming `log_file` when
/// the log does not overlap the plan.
FlightCheck check_flight(const Mission& m, const MissionResult& plan, const MeasuredFlight& log,
                         const std::string& log_file);

}  // namespace sortie::sim
