// Propulsion benchmarks: one operating-point solve per repetition, so the printed median is the
// time of one solve (target: under 5 µs). The thrust or duty steps through a range from one
// repetition to the next so that no two solves are the same.
#include "bench.hpp"
#include "io/drive_json.hpp"
#include "propulsion/bench_map.hpp"
#include "propulsion/operating_point.hpp"

namespace {

using namespace sortie;

propulsion::Drive demo(const char* name) {
  return io::load_drive_file(std::string(SORTIE_SOURCE_DIR "/models/drives/") + name);
}

// Next value of a sawtooth from lo to hi in n steps.
double step(int& k, double lo, double hi, int n = 97) {
  k = (k + 1) % n;
  return lo + (hi - lo) * k / (n - 1);
}

// Thrust in, static: the root finder on T(n) with the demo's tabulated CT(J) at J = 0, then the
// bus step (the hover case of a mission).
const bool reg_static = bench::add_case("propulsion_solve_static_quad", [] {
  static const propulsion::Drive d = demo("demo-quad-15in.json");
  static int k = 0;
  bench::keep(propulsion::solve(d, step(k, 1.0, 15.0), 0.0, 1.225, 14.8).bus.bus_W);
}, 5000);

// Thrust in with axial inflow: J changes with n, so the tables are interpolated at every step.
const bool reg_axial = bench::add_case("propulsion_solve_axial_pusher", [] {
  static const propulsion::Drive d = demo("demo-pusher-10x6.json");
  static int k = 0;
  bench::keep(propulsion::solve(d, step(k, 1.0, 8.0), 16.0, 1.1, 14.8).bus.bus_W);
}, 5000);

// The motor side alone with a speed-dependent no-load current (pow in the inner loop), and the
// exact bus-voltage form the battery solve uses.
const bool reg_motor = bench::add_case("propulsion_solve_motor_hex", [] {
  static const propulsion::Drive d = demo("demo-hex-10in.json");
  static int k = 0;
  const propulsion::MotorPoint m = propulsion::solve_motor(d, step(k, 0.5, 9.0), 2.0, 1.225);
  bench::keep(propulsion::bus_load(d, m).power_W(14.8));
}, 5000);

// Duty in: the torque balance bracketed on [0, Kv·V_m].
const bool reg_duty = bench::add_case("propulsion_at_duty_quad", [] {
  static const propulsion::Drive d = demo("demo-quad-15in.json");
  static int k = 0;
  bench::keep(propulsion::at_duty(d, step(k, 0.1, 0.98), 0.0, 1.225, 14.8).motor.thrust_N);
}, 5000);

// A measured map lookup (19 rows).
const bool reg_map = bench::add_case("propulsion_bench_map_lookup", [] {
  static const propulsion::BenchMap map = [] {
    const propulsion::Drive d = demo("demo-quad-15in.json");
    std::vector<propulsion::BenchRow> rows;
    for (int t = 10; t <= 100; t += 5) {
      const auto op = propulsion::at_duty(d, t / 100.0 * d.esc.duty_max, 0.0, 1.225, 14.8);
      rows.push_back({static_cast<double>(t), 14.8, op.bus.bus_A, op.motor.rpm, op.motor.thrust_N, op.motor.torque});
    }
    return propulsion::make_bench_map(std::move(rows));
  }();
  static int k = 0;
  bench::keep(propulsion::bench_at_thrust(map, step(k, 0.5, 18.0)).bus_W);
}, 5000);

}  // namespace
