#pragma once
/// A pack of S cells in series by P in parallel, with wiring resistance and state of health.
#include <optional>
#include <string>

#include "battery/cell.hpp"

namespace sortie::battery {

struct Pack {
  std::string name;
  Cell cell;
  int series = 1;               ///< cells in series (S)
  int parallel = 1;             ///< cells in parallel (P)
  double wiring_ohm = 0.0;      ///< leads, connectors and fuse, Ω
  double soh_capacity = 1.0;    ///< fraction of rated capacity left
  double soh_resistance = 1.0;  ///< multiplier on R0 from ageing
  double soc0 = 1.0;            ///< initial state of charge, 0..1
  double temperature_C = 25.0;  ///< cell temperature (at the start, with a thermal model), °C
  /// Air the cells give their heat to, °C (thermal model only; none: temperature_C). `fly` sets
  /// it to the air temperature at the field.
  std::optional<double> air_C;

  int cells() const { return series * parallel; }
  double mass_kg() const { return cell.mass_kg * cells(); }
  /// Usable capacity at the pack temperature: Q·P·soh·capacity_factor(T), Ah.
  double capacity_Ah() const {
    return cell.capacity_Ah * parallel * soh_capacity * cell.capacity_factor(temperature_C);
  }
  /// Label like "4S2P".
  std::string layout() const { return std::to_string(series) + "S" + std::to_string(parallel) + "P"; }
};

}  // namespace sortie::battery
