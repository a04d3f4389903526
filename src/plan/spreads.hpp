#pragma once
/// The spreads of the inputs a planner does not know exactly, as given (a spreads file): plain
/// data; sim::run_samples draws from them.

namespace sortie::plan {

/// The spreads of a sampled run (`fly --samples N --spreads FILE`; every field 0 turns its draw
/// off). Each is a normal around the profile's value unless said otherwise. The defaults are
/// planning values of the trade (common practice), not measurements of any pack or site.
struct Spreads {
  /// Cell-to-cell capacity spread of one lot, as a fraction (standard deviation). Drawn once per
  /// sample for the whole pack (its cells as one lot): the weakest-cell effect of a series
  /// string is not modelled. 0.02 (common practice for new cells of one lot).
  double cell_capacity_sd = 0.02;
  /// Cell-to-cell R0 spread, as a fraction (standard deviation), applied like the capacity
  /// spread to the pack's R0. 0.05 (common practice).
  double cell_resistance_sd = 0.05;
  /// State-of-health spreads around the pack's soh values (absolute standard deviations): how
  /// well the pack's ageing is known. 0 (the pack's stated SoH is taken as known).
  double soh_capacity_sd = 0.0;
  double soh_resistance_sd = 0.0;
  /// Wind speed (m/s) and direction (deg) around the profile's wind. 1 m/s and 20 deg (common
  /// practice for a forecast a few hours ahead; from memory).
  double wind_speed_sd_mps = 1.0;
  double wind_from_sd_deg = 20.0;
  /// Gusts as a turbulence power term: the gust intensity σ_u (m/s) is drawn uniform from 0 to
  /// gust_max_mps and adds gust_power_W_per_mps2·σ_u² of steady bus power for the whole flight.
  /// Why σ²: for zero-mean velocity fluctuations u about the flight speed V, the mean of the
  /// power is ⟨P(V + u)⟩ ≈ P(V) + ½·P''(V)·σ_u² (second-order Taylor expansion, an
  /// independent derivation; the first-order term averages out), so the coefficient is
  /// ½·P''(V) of the aircraft's power curve, to be given by the user (the sweep of
  /// wind-mps over the profile shows P growing with airspeed). 0 and 0 (off).
  double gust_max_mps = 0.0;
  double gust_power_W_per_mps2 = 0.0;
  /// Air temperature at the field (°C); the pack's take-off temperature moves with it by the
  /// same amount (a warmer day warms a pack kept outside). 2 °C (common practice).
  double temperature_sd_C = 2.0;
  /// Payload (kg). 0 (the payload is weighed).
  double payload_sd_kg = 0.0;
};

}  // namespace sortie::plan
