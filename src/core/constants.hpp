#pragma once
/// Physical constants the layers share, each defined here once.
namespace sortie::core {

/// Standard gravity g0, m/s² (3rd CGPM, 1901; also the ISA's g0).
inline constexpr double kStandardGravity = 9.80665;
/// ISA sea-level values (ICAO Doc 7488, 1993; U.S. Standard Atmosphere, 1976).
inline constexpr double kSeaLevelTemperature = 288.15;  ///< T0, K
inline constexpr double kSeaLevelPressure = 101325.0;   ///< p0, Pa
inline constexpr double kSeaLevelDensity = 1.225;       ///< ρ0, kg/m³ (the standard's tabulated value)
/// 0 °C in kelvin.
inline constexpr double kCelsiusZero = 273.15;

}  // namespace sortie::core
