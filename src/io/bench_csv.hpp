#pragma once
/// Thrust-bench CSV files: one row per throttle step of one rotor, read into a measured map
/// (propulsion/bench_map.hpp).
///
/// Quantities and how headers are recognised (by words and units through io/log_header.hpp,
/// case-insensitive; the unit follows the name as `_unit`, ` (unit)` or ` [unit]`, e.g.
/// `thrust_N`, `Thrust (gf)`, `supply voltage [V]`):
///   throttle  throttle | duty | pwm | signal | command, or a name holding one  us, µs (1000–2000) | pct, %
///   voltage   voltage | volt | v | u | bus, or a name holding "volt"         V, mV
///   current   current | i | amps | bus, or a name holding "current"          A, mA
///   rpm       rpm (the name is the unit) | speed | n, or a name holding "speed"  rpm, rev/min, rps, rad/s
///   thrust    thrust, or a name holding it                                    N, g, gf, kg, kgf, lbf, ozf
///   torque    torque, or a name holding it (optional)            Nm, N·m, N*m, N.m, Nmm, mNm, kgf·cm
/// A name two quantities share ("bus") belongs to the one whose unit it carries.
/// (g and kg on a thrust bench mean gram-force and kilogram-force.) Any header can be named
/// instead with --columns `quantity=HEADER[:UNIT]`, comma-separated; without `:UNIT` the unit
/// comes from HEADER's own suffix.
///
/// Rows must come in order of strictly increasing throttle, with thrust strictly increasing
/// with it; at least two rows.
#include <filesystem>
#include <map>
#include <string>
#include <vector>

#include "io/csv.hpp"
#include "propulsion/bench_map.hpp"

namespace sortie::io {

/// A column named by the user: the header text and, optionally, its unit.
struct BenchColumn {
  std::string header;
  std::string unit;  ///< empty: from the header's suffix
};

/// quantity ("throttle", "voltage", "current", "rpm", "thrust", "torque") → column.
using BenchColumns = std::map<std::string, BenchColumn>;

/// Parse a --columns value, e.g. "throttle=PWM:us,thrust=Thrust:g". Throws UsageError naming
/// --columns for an unknown quantity, a missing '=', an empty header or an unknown unit.
BenchColumns parse_bench_columns(const std::string& spec);

/// The quantities, in the order above.
const std::vector<std::string>& bench_quantities();

propulsion::BenchMap read_bench_csv(const CsvFile& csv, const BenchColumns& columns = {});
propulsion::BenchMap load_bench_csv(const std::filesystem::path& path,
                                    const BenchColumns& columns = {});

}  // namespace sortie::io
