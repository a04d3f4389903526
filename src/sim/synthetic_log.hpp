#pragma once
/// Synthetic test logs: a pulse test run on a model cell by sortie's own integrator, with
/// measurement noise from a fixed seed. For checking `fit cell` against known parameters and
/// for the bundled demo log; never a substitute for a measurement.
///
/// The protocol (a hybrid pulse test, common practice in cell testing):
///   rest at the start SoC; constant-current charge to v_max, constant voltage until the current
///   falls to the taper current; rest; then per SoC step: discharge pulse (cut short at
///   v_cutoff), short rest, charge
///   pulse (held at v_max by a constant-voltage phase if it would go above), short rest, a constant-current discharge of `step_soc`, long rest; the last
///   discharge runs to v_cutoff.
/// Sample k's current flowed during (t_{k−1}, t_k] (battery::CellLog's convention); each interval is
/// one sim::run_segment at that constant current.
#include <cstdint>
#include <string>
#include <vector>

#include "battery/cell.hpp"
#include "battery/cell_log.hpp"

namespace sortie::sim {

struct PulseTestProtocol {
  double soc_start = 0.0;        ///< SoC at the start (rested)
  double start_rest_s = 600.0;
  double charge_C = 0.5;         ///< constant-current charge, C-rate
  double taper_C = 0.05;         ///< the constant-voltage phase ends below this C-rate
  double full_rest_s = 1800.0;   ///< rest after the charge
  double pulse_C = 4.0;          ///< discharge pulse
  double pulse_s = 10.0;
  double charge_pulse_C = 2.0;   ///< charge pulse
  double charge_pulse_s = 10.0;
  double pulse_rest_s = 40.0;    ///< rest after each pulse
  double step_soc = 0.1;         ///< SoC discharged between pulse sets
  double step_C = 0.5;           ///< rate of that discharge
  double step_rest_s = 1800.0;   ///< rest after it
  double sample_s = 1.0;         ///< logging interval under load, s
  double pulse_sample_s = 0.1;   ///< logging interval during pulses and the rests after them, s
  double rest_sample_s = 10.0;   ///< logging interval at rest, s (irregular time steps)
  /// Run the cell's thermal block (if it has one) with the cell starting at and cooling in
  /// air_C, and log the cell temperature; otherwise the test is isothermal at 25 °C and logs none.
  bool thermal = false;
  double air_C = 25.0;
};

struct MeasurementNoise {
  double voltage_sd_V = 0.001;     ///< Gaussian, before quantisation
  double voltage_step_V = 0.001;   ///< logger resolution (0: none)
  double current_sd_A = 0.002;
  double current_step_A = 0.001;
  std::uint64_t seed = 1;          ///< std::mt19937_64 seed (the normal deviates are our own
                                   ///< Box–Muller, so the log is the same on every platform)
  double temperature_sd_C = 0.05;  ///< thermal protocols only
  double temperature_step_C = 0.1;
};

struct SyntheticLog {
  std::vector<double> time_s;
  std::vector<double> current_A;   ///< measured (noisy), discharge positive
  std::vector<double> voltage_V;   ///< measured (noisy, quantised)
  std::vector<double> soc_true;    ///< the model's SoC at each row
  std::vector<double> v_true_V;    ///< the model's voltage at each row
  std::vector<double> i_true_A;    ///< the current applied over the interval ending at each row
  std::vector<double> temperature_C;       ///< measured cell temperature (thermal protocols; else empty)
  std::vector<double> temperature_true_C;  ///< the model's
};

/// Run the protocol on one cell (at 25 °C, or with its thermal block, see `thermal`). Throws LimitError if a stretch
/// does not end (a protocol that never reaches its limits).
SyntheticLog synthetic_pulse_test(const battery::Cell& cell, const PulseTestProtocol& protocol,
                                  const MeasurementNoise& noise);

/// The measured columns as the fit reads a log (time, current, voltage, and the temperature when
/// logged), one section, lines numbered from 2 as under a header.
battery::CellLog to_cell_log(const SyntheticLog& log, const std::string& file);

}  // namespace sortie::sim
