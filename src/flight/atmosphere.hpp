#pragma once
/// The ISA troposphere (ICAO Standard Atmosphere; U.S. Standard Atmosphere, 1976, first layer):
/// temperature, pressure and density from geopotential height, with a temperature offset.
#include <optional>

#include "core/constants.hpp"

namespace sortie::flight {

using core::kStandardGravity;
inline constexpr double kGasConstantAir = 287.05287; ///< R of dry air, J/(kg·K)
inline constexpr double kLapseRate = 0.0065;         ///< troposphere lapse rate L, K/m
using core::kCelsiusZero;
using core::kSeaLevelDensity;
using core::kSeaLevelPressure;
using core::kSeaLevelTemperature;
/// The troposphere model ends at the tropopause; above it temperature no longer falls.
inline constexpr double kTropopauseHeight = 11000.0;     ///< m, geopotential
/// The 1976 standard tabulates its first layer from −5 km; nothing on Earth's surface is below
/// −0.5 km, so this lower bound only keeps the formula inside its defined layer.
inline constexpr double kLowestHeight = -5000.0;         ///< m, geopotential

/// The air at one height.
struct AirState {
  double height_m = 0.0;        ///< geopotential height above mean sea level, m
  double temperature_K = kSeaLevelTemperature;
  double pressure_Pa = kSeaLevelPressure;
  double density_kg_m3 = kSeaLevelDensity;
};

/// ISA air at geopotential height `h_m` with the temperature `isa_offset_K` above standard:
///   T_ISA = T0 − L·h,  p = p0·(T_ISA/T0)^(g0/(R·L)),  T = T_ISA + ΔT,  ρ = p/(R·T)
/// The pressure is the standard one at h (h is the pressure altitude), so a warm day lowers the
/// density by T_ISA/(T_ISA + ΔT) at the same height. nullopt outside [−5 km, 11 km] or where
/// the offset would make T ≤ 0 K.
std::optional<AirState> isa_air(double h_m, double isa_offset_K = 0.0);

/// Standard temperature T0 − L·h, K (the formula only; isa_air checks the height).
double isa_temperature_K(double h_m);

/// The atmosphere of one flight: a field and how far its day is from standard.
///
/// Heights: field elevation + height above the field is used as geopotential height and as
/// pressure altitude (a standard sea-level pressure, 1013.25 hPa, is assumed; a non-standard
/// QNH is not modelled). Geometric and geopotential height differ by h²/r_earth, 4 m at 5 km.
///
/// Temperature: the offset ΔT is constant with height. Given an outside air temperature at the
/// field instead, ΔT = OAT − T_ISA(field elevation), and the lapse rate stays standard above it.
struct Atmosphere {
  double field_elevation_m = 0.0;  ///< m above mean sea level
  double isa_offset_K = 0.0;       ///< ΔT from standard, K (equal to °C)

  /// The atmosphere whose temperature at the field is `field_temperature_K`.
  static Atmosphere from_field_temperature(double field_elevation_m, double field_temperature_K);

  /// Air at `height_above_field_m`; nullopt above the tropopause (or below −5 km).
  std::optional<AirState> at(double height_above_field_m) const;
  /// Outside air temperature at the field, K.
  double field_temperature_K() const;
  /// Highest height above this field the model covers, m.
  double max_height_above_field_m() const { return kTropopauseHeight - field_elevation_m; }
};

}  // namespace sortie::flight
