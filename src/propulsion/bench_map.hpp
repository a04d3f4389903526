#pragma once
/// A measured static map of one rotor: rows from a thrust bench (throttle, bus voltage and
/// current, rpm, thrust, optionally torque), interpolated to give bus power for a thrust at the
/// bench's bus voltage. It stands in for the parametric chain in hover and static cases; it
/// knows nothing of airspeed, air density other than the bench's, or other bus voltages.
///
/// Interpolation over thrust T:
/// - bus power and bus current: shape-preserving cubic (core/monotone_cubic.hpp), so the map
///   never dips or overshoots between rows; fixed losses (ESC idle, motor no-load) make bus
///   power curve hard at low thrust, where straight lines in any power of T miss by percent;
/// - shaft power: linear in T^(3/2), and rpm and throttle: linear in √T. With constant
///   coefficients a static prop has P = CP/CT^(3/2)·T^(3/2)/(√ρ·D) and n = √(T/(CT·ρ·D⁴))
///   (the coefficient definitions; momentum theory's T^(3/2)/√(2ρA), J. G. Leishman,
///   Principles of Helicopter Aerodynamics, 2nd ed., 2006, ch. 2, has the same form), so these
///   are exact between rows for such a prop.
#include <optional>
#include <vector>

#include "core/monotone_cubic.hpp"
#include "propulsion/operating_point.hpp"

namespace sortie::propulsion {

/// One bench measurement, in SI (the CSV reader converts units).
struct BenchRow {
  double throttle_pct = 0.0;  ///< command, 0..100 % (1000..2000 µs maps to 0..100 %)
  double v_bus_V = 0.0;       ///< supply voltage at the ESC, V
  double i_bus_A = 0.0;       ///< supply current, A
  double rpm = 0.0;           ///< rev/min
  double thrust_N = 0.0;      ///< N
  std::optional<double> torque_Nm;  ///< shaft torque, N·m, when the bench measures it

  double bus_W() const { return v_bus_V * i_bus_A; }
  /// Q·ω, W (NaN without torque).
  double shaft_W() const;
};

/// The map built from rows in order of strictly increasing throttle and thrust (the reader
/// checks and names the offending line; make_bench_map asserts).
struct BenchMap {
  std::vector<BenchRow> rows;
  bool has_torque = false;  ///< every row carries a torque
  double v_bus_mean_V = 0.0;
  double v_bus_min_V = 0.0;
  double v_bus_max_V = 0.0;
  MonotoneCubic bus_W_of_thrust;  ///< W over N
  MonotoneCubic bus_A_of_thrust;  ///< A over N

  double thrust_min_N() const { return rows.front().thrust_N; }
  double thrust_max_N() const { return rows.back().thrust_N; }
};

BenchMap make_bench_map(std::vector<BenchRow> rows);

/// The map at one thrust (N, per rotor).
struct BenchPoint {
  double thrust_N = 0.0;
  double throttle_pct = 0.0;
  double rpm = 0.0;
  double bus_W = 0.0;
  double bus_A = 0.0;      ///< at the measured voltage
  double shaft_W = 0.0;    ///< NaN without torque
  double eta_system = 0.0; ///< shaft / bus (NaN without torque)
  double g_per_W = 0.0;
  /// ok inside the map; saturated above the largest measured thrust (values extrapolated along
  /// the end slopes: what the demand would cost, not something the bench showed).
  BusStatus status = BusStatus::ok;
  bool extrapolated = false;  ///< outside the measured thrust range (either end)
  std::optional<double> thrust_available_N;  ///< when saturated: the largest measured thrust
};

BenchPoint bench_at_thrust(const BenchMap& map, double thrust_N);

/// The bench point as a bus load: P = a, no bus-voltage term (valid at the bench voltage).
BusLoad bus_load(const BenchPoint& p);

}  // namespace sortie::propulsion
