#pragma once
/// One cell's equivalent-circuit parameters (Thevenin model with up to two RC pairs).
/// Plain data, SI inside; tables over state of charge (0..1) or temperature (°C).
#include <optional>
#include <string>
#include <vector>

#include "core/table.hpp"

namespace sortie::battery {

/// One RC pair: resistance and time constant, each constant or a table over SoC.
struct RcPair {
  Table r_ohm{0.001};  ///< Ω
  Table tau_s{10.0};   ///< s
};

/// Resistance and capacity factors over cell temperature (°C), both 1 at the reference.
struct TemperatureEffect {
  Table r_factor{1.0};         ///< multiplies R0 and every R_k
  Table capacity_factor{1.0};  ///< multiplies the capacity
};

/// Lumped thermal model of one cell (DESIGN.md "Physics"): one temperature for the whole cell,
///   m·c·dT/dt = I²·R0 + Σ v_k²/R_k − hA·(T − T_air)
/// (the irreversible heat of the equivalent circuit; the reversible, entropic heat is left out).
struct Thermal {
  double c_J_per_kgK = 1000.0;  ///< specific heat of the cell, J/(kg·K)
  double hA_W_per_K = 0.1;      ///< heat transfer coefficient times area, cell to air, W/K
};

/// Cell temperature above which a run is warned about, °C: 60 °C is the usual upper limit for
/// discharging lithium cells (common practice; the maker's own figure comes first).
inline constexpr double kCellHotC = 60.0;

/// The ranges the data a cell model was fitted on covered (cell JSON key "coverage"; written by
/// `fit cell`): outside them the model's figures are extrapolated. Current per cell, discharge
/// positive.
struct CellCoverage {
  double soc_min = 0.0;
  double soc_max = 1.0;
  double current_max_A = 0.0;  ///< largest discharge current, A
  double current_min_A = 0.0;  ///< most negative current (largest charge), A
  std::optional<double> temperature_min_C;  ///< with a temperature column
  std::optional<double> temperature_max_C;
  std::string source;          ///< "fit cell <log file names>"
};

/// How well the fit that wrote a model did (cell JSON key "fit_quality"; written by `fit cell`).
struct CellFitQuality {
  double resimulation_rmse_V = 0.0;         ///< the model re-run on its own logs' current
  std::optional<double> held_out_rmse_V;    ///< predicted on log parts the fit did not see
  double threshold_V = 0.0;                 ///< the quality gate's limit on it
  bool passed = true;                       ///< false: written only because the user accepted it
};

struct Cell {
  std::string name;
  std::string chemistry;
  double capacity_Ah = 1.0;    ///< rated capacity, Ah
  double mass_kg = 0.05;       ///< kg
  double v_max_V = 4.2;        ///< full-charge voltage, V
  double v_cutoff_V = 3.3;     ///< default end-of-discharge loaded voltage, V
  double i_cont_max_A = 10.0;  ///< continuous current limit, A
  Table ocv_V{3.7};            ///< open-circuit voltage over SoC, V
  Table r0_ohm{0.01};          ///< series resistance over SoC, Ω
  std::vector<RcPair> rc;      ///< zero, one or two RC pairs
  std::optional<TemperatureEffect> temperature;
  std::optional<Thermal> thermal;  ///< none: the cell stays at the pack temperature
  std::optional<CellCoverage> coverage;  ///< none: not recorded (a hand-written model)
  std::optional<CellFitQuality> fit_quality;

  /// Resistance multiplier at `temperature_C` (1 without a temperature table).
  double r_factor(double temperature_C) const {
    return temperature ? temperature->r_factor(temperature_C) : 1.0;
  }
  /// Capacity multiplier at `temperature_C` (1 without a temperature table).
  double capacity_factor(double temperature_C) const {
    return temperature ? temperature->capacity_factor(temperature_C) : 1.0;
  }
};

}  // namespace sortie::battery
