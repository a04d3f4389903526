#pragma once
/// One cell's equivalent-circuit parameters (Thevenin model with up to two RC pairs).
/// Plain data, SI inside; tables over state of charge (0..1) or temperature (°C).
#include <algorithm>
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

/// Lumped thermal model of one cell (docs/physics.md): one temperature for the whole cell,
///   m·c·dT/dt = I²·R0 + Σ v_k²/R_k − hA·(T − T_air)
/// (the irreversible heat of the equivalent circuit; the reversible, entropic heat is left out).
struct Thermal {
  double c_J_per_kgK = 1000.0;  ///< specific heat of the cell, J/(kg·K)
  double hA_W_per_K = 0.1;      ///< heat transfer coefficient times area, cell to air, W/K
};

/// Cell temperature above which a run is warned about, °C: 60 °C is the usual upper limit for
/// discharging lithium cells (common practice; the maker's own figure comes first).
inline constexpr double kCellHotC = 60.0;

/// The ranges the data a cell model was fitted on covered (cell JSON key "coverage", written by
/// `fit cell`): outside them the model's figures are extrapolated. Every field is optional in
/// the file; an absent SoC bound is the end of the SoC scale, an absent current or temperature
/// bound is no claim. Current per cell, discharge positive.
struct CellCoverage {
  double soc_min = 0.0;                     ///< lowest SoC the data reached, 0..1
  double soc_max = 1.0;                     ///< highest SoC the data reached, 0..1
  std::optional<double> current_max_A;      ///< largest discharge current, A
  std::optional<double> current_min_A;      ///< most negative current (largest charge), A
  std::optional<double> temperature_min_C;  ///< °C
  std::optional<double> temperature_max_C;  ///< °C
  std::string source;                       ///< where the ranges come from, free text
};

/// A burst rating: the cell may carry up to `i_max_A` for at most `duration_s` at a time above its
/// continuous limit (the maker's pulse rating, e.g. "20C for 10 s").
struct Burst {
  double i_max_A = 0.0;     ///< A
  double duration_s = 0.0;  ///< s
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
  std::optional<Burst> burst;  ///< none: only the continuous limit is checked
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
  /// Lowest SoC the model rests on data for: the coverage's soc_min, or the OCV table's first
  /// SoC when that is higher (below it the table is held flat, an invented OCV); a constant OCV
  /// claims every SoC.
  double soc_floor_covered() const {
    const double table_lo = ocv_V.is_constant() ? 0.0 : ocv_V.x().front();
    return coverage ? std::max(coverage->soc_min, table_lo) : table_lo;
  }
  /// Capacity multiplier at `temperature_C` (1 without a temperature table).
  double capacity_factor(double temperature_C) const {
    return temperature ? temperature->capacity_factor(temperature_C) : 1.0;
  }
};

}  // namespace sortie::battery
