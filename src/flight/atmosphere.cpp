#include "flight/atmosphere.hpp"

#include <cmath>

namespace sortie::flight {

double isa_temperature_K(double h_m) {
  // T_ISA = T0 − L·h (U.S. Standard Atmosphere, 1976, layer 0: 0 to 11 km geopotential).
  return kSeaLevelTemperature - kLapseRate * h_m;
}

std::optional<AirState> isa_air(double h_m, double isa_offset_K) {
  if (!std::isfinite(h_m) || !std::isfinite(isa_offset_K)) return std::nullopt;
  if (h_m < kLowestHeight || h_m > kTropopauseHeight) return std::nullopt;
  const double t_isa = isa_temperature_K(h_m);
  const double t = t_isa + isa_offset_K;
  if (!(t > 0.0)) return std::nullopt;
  // Hydrostatic balance dp/dh = −ρ·g0 with ρ = p/(R·T_ISA) and T_ISA linear in h integrates to
  //   p = p0·(T_ISA/T0)^(g0/(R·L))   (exponent 5.25588).
  constexpr double kExponent = kStandardGravity / (kGasConstantAir * kLapseRate);
  const double p = kSeaLevelPressure * std::pow(t_isa / kSeaLevelTemperature, kExponent);
  // Ideal gas at the actual temperature: ρ = p/(R·T).
  return AirState{h_m, t, p, p / (kGasConstantAir * t)};
}

Atmosphere Atmosphere::from_field_temperature(double field_elevation_m, double field_temperature_K) {
  // ΔT = OAT − T_ISA(field), held constant with height.
  return Atmosphere{field_elevation_m, field_temperature_K - isa_temperature_K(field_elevation_m)};
}

std::optional<AirState> Atmosphere::at(double height_above_field_m) const {
  return isa_air(field_elevation_m + height_above_field_m, isa_offset_K);
}

double Atmosphere::field_temperature_K() const {
  return isa_temperature_K(field_elevation_m) + isa_offset_K;
}

}  // namespace sortie::flight
