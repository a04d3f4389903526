// The measured bench map: interpolation against the parametric model it was made from, and the
// bench CSV reader's recognition of headers and units and its one-line errors.
#include <doctest/doctest.h>

#include <cmath>
#include <cstdio>
#include <string>

#include "core/error.hpp"
#include "io/bench_csv.hpp"
#include "io/drive_json.hpp"
#include "propulsion/bench_map.hpp"
#include "support/cli.hpp"

using namespace sortie;
using namespace sortie::propulsion;

namespace {

Drive load(const std::string& rel) { return io::load_drive_file(test::source_path(rel)); }

// A bench CSV written from the parametric model: throttle in µs, thrust in grams-force.
std::string synthetic_bench(const Drive& d, double v_bus, double step_pct) {
  std::string csv = "# synthetic, from the parametric model\nthrottle_us,bus_V,bus_A,rpm,thrust_g,torque_Nm\n";
  char line[256];
  for (double t = 10.0; t <= 100.0 + 1e-9; t += step_pct) {
    const OperatingPoint op = at_duty(d, t / 100.0 * d.esc.duty_max, 0.0, 1.225, v_bus);
    std::snprintf(line, sizeof line, "%.6f,%.6f,%.9f,%.6f,%.9f,%.9f\n", 1000.0 + 10.0 * t, v_bus, op.bus.bus_A,
                  op.motor.rpm, op.motor.thrust_N / kStandardGravity * 1000.0, op.motor.torque);
    csv += line;
  }
  return csv;
}

std::string error_of(const std::string& text, const io::BenchColumns& cols = {}) {
  try {
    io::read_bench_csv(io::parse_csv(text, "bench.csv"), cols);
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

const std::string kGood =
    "throttle_us,bus_V,bus_A,rpm,thrust_g\n"
    "1100,14.8,0.5,1000,50\n"
    "1200,14.8,1.2,1800,160\n"
    "1300,14.7,2.5,2500,310\n";

}  // namespace

TEST_SUITE("propulsion") {

TEST_CASE("bench map: a bench made from the parametric model reproduces its bus power within 1 %") {
  // The map built from 5 %-throttle steps of the model (a common bench sweep: common practice),
  // queried halfway between the steps, against the model solved at the same thrust. Bus power
  // goes through the monotone cubic; its error is largest in the first step, where idle and
  // no-load losses dominate (about 0.2 % here).
  for (const std::string f : {"models/drives/demo-quad-15in.json", "models/drives/demo-hex-10in.json",
                              "models/drives/demo-pusher-10x6.json"}) {
    const Drive d = load(f);
    const double v_bus = 14.8;
    const BenchMap map = io::read_bench_csv(io::parse_csv(synthetic_bench(d, v_bus, 5.0), "synthetic.csv"));
    REQUIRE(map.rows.size() == 19);
    CHECK(map.has_torque);
    CHECK(map.v_bus_mean_V == doctest::Approx(v_bus));
    for (double t = 12.5; t < 100.0; t += 5.0) {
      const double thrust = at_duty(d, t / 100.0 * d.esc.duty_max, 0.0, 1.225, v_bus).motor.thrust_N;
      const OperatingPoint model = solve(d, thrust, 0.0, 1.225, v_bus);
      const BenchPoint p = bench_at_thrust(map, thrust);
      CAPTURE(f);
      CAPTURE(t);
      CHECK(p.status == BusStatus::ok);
      CHECK_FALSE(p.extrapolated);
      CHECK(p.bus_W == doctest::Approx(model.bus.bus_W).epsilon(0.01));
      CHECK(p.bus_A == doctest::Approx(model.bus.bus_A).epsilon(0.01));
      CHECK(p.rpm == doctest::Approx(model.motor.rpm).epsilon(0.01));
      CHECK(p.throttle_pct == doctest::Approx(t).epsilon(0.01));
      CHECK(p.shaft_W == doctest::Approx(model.motor.shaft_W).epsilon(0.01));
    }
    // At the measured rows themselves the map gives the rows back.
    for (const auto& row : map.rows)
      CHECK(bench_at_thrust(map, row.thrust_N).bus_W == doctest::Approx(row.bus_W()).epsilon(1e-12));
  }
}

TEST_CASE("bench map: exact laws for shaft power and speed — saturated above the map") {
  // Static prop with constant coefficients: shaft power ∝ T^1.5 and n ∝ √T (the coefficient
  // definitions), which the map interpolates exactly; bus power with a fixed part,
  // P0 + c·T^1.5, goes through the monotone cubic: through every row, increasing between them.
  std::vector<BenchRow> rows;
  const double n_per_sqrtN = 900.0, kq = 0.02;  // rpm per √N; torque N·m per N (Q ∝ T at fixed CT, CP)
  for (double t : {0.0, 1.0, 3.0, 7.0, 12.0}) {
    BenchRow r;
    r.throttle_pct = 10.0 + t;
    r.v_bus_V = 10.0;
    r.i_bus_A = (0.8 + 6.0 * std::pow(t, 1.5)) / 10.0;
    r.rpm = n_per_sqrtN * std::sqrt(t);
    r.thrust_N = t;
    r.torque_Nm = kq * t;
    rows.push_back(r);
  }
  const BenchMap map = make_bench_map(rows);
  for (const auto& r : rows) CHECK(bench_at_thrust(map, r.thrust_N).bus_W == doctest::Approx(r.bus_W()).epsilon(1e-14));
  double last = 0.0;
  for (double t = 0.05; t < 12.0; t += 0.05) {
    const BenchPoint p = bench_at_thrust(map, t);
    // Q·ω = kq·T · 2π·n/60 with n = 900·√T: exactly ∝ T^1.5.
    CHECK(p.shaft_W == doctest::Approx(kq * t * 2.0 * 3.14159265358979323846 / 60.0 * n_per_sqrtN * std::sqrt(t))
                           .epsilon(1e-12));
    CHECK(p.rpm == doctest::Approx(n_per_sqrtN * std::sqrt(t)).epsilon(1e-12));
    // Shape-preserving: rising, and inside the bracket of the two rows around it.
    CHECK(p.bus_W > last);
    std::size_t k = 0;
    while (rows[k + 1].thrust_N < t) ++k;
    CHECK(p.bus_W >= rows[k].bus_W());
    CHECK(p.bus_W <= rows[k + 1].bus_W());
    last = p.bus_W;
  }
  // Above the largest measured thrust: saturated, with that thrust as the available one, and the
  // cost extrapolated along the end slope (still rising).
  const BenchPoint over = bench_at_thrust(map, 14.0);
  CHECK(over.status == BusStatus::saturated);
  CHECK(over.extrapolated);
  REQUIRE(over.thrust_available_N);
  CHECK(*over.thrust_available_N == 12.0);
  CHECK(over.bus_W > rows.back().bus_W());
  CHECK(bus_load(over).a_W == over.bus_W);
  CHECK(bus_load(over).b_W_per_V == 0.0);
}

TEST_CASE("bench CSV: headers and units are recognised") {
  // Units converted: 1 gf = 9.80665e-3 N, 1 kgf·cm = 0.0980665 N·m, 1 lbf = 4.4482216152605 N
  // (NIST SP 811, 2008, appendix B; from memory, and 1 lbf is exact by definition); pulse width 1000–2000 µs → 0–100 %.
  const std::string text =
      "Duty command (µs),Supply voltage [V],Current (mA),Shaft speed (rpm),Thrust (gf),Torque (kgf·cm)\n"
      "1250,12.0,2000,3000,400,0.5\n"
      "1500,11.9,6000,5000,1100,1.4\n";
  const BenchMap m = io::read_bench_csv(io::parse_csv(text, "b.csv"));
  REQUIRE(m.rows.size() == 2);
  CHECK(m.rows[0].throttle_pct == doctest::Approx(25.0));
  CHECK(m.rows[1].i_bus_A == doctest::Approx(6.0));
  CHECK(m.rows[1].thrust_N == doctest::Approx(1.1 * 9.80665));
  CHECK(*m.rows[0].torque_Nm == doctest::Approx(0.5 * 0.0980665));
  CHECK(m.v_bus_min_V == 11.9);
  // Percent throttle, plain names with a unit suffix, lbf, no torque.
  const BenchMap p = io::read_bench_csv(io::parse_csv(
      "throttle_pct,bus_V,bus_A,rpm,thrust_lbf\n20,16,1,2000,0.5\n40,16,3,3500,1.5\n", "p.csv"));
  CHECK(p.rows[1].throttle_pct == 40.0);
  CHECK(p.rows[1].thrust_N == doctest::Approx(1.5 * 4.4482216152605));
  CHECK_FALSE(p.has_torque);
  // Columns named by the user, with units.
  const io::BenchColumns cols = io::parse_bench_columns("throttle=cmd:us, voltage=U:V,current=I:A,rpm=n:rpm,thrust=F:N");
  const BenchMap c = io::read_bench_csv(io::parse_csv("cmd,U,I,n,F\n1100,12,1,900,1\n1200,12,2,1500,3\n", "c.csv"), cols);
  CHECK(c.rows[1].thrust_N == 3.0);
  CHECK(c.rows[0].rpm == 900.0);
}

TEST_CASE("bench CSV: every bad file fails with one line naming the file — line and value") {
  CHECK(error_of(kGood).empty());
  // Missing column.
  CHECK(error_of("throttle_us,bus_V,bus_A,rpm\n1100,14.8,0.5,1000\n1200,14.8,1.2,1800\n") ==
        "bench.csv: line 1: missing column for thrust (got header \"throttle_us,bus_V,bus_A,rpm\", expected a "
        "column named 'thrust' with its unit, or --columns thrust=HEADER:UNIT)");
  // Thrust not increasing with throttle.
  CHECK(error_of("throttle_us,bus_V,bus_A,rpm,thrust_g\n1100,14.8,0.5,1000,50\n1200,14.8,1.2,1800,160\n"
                 "1300,14.7,2.5,2500,150\n") ==
        "bench.csv: line 4: thrust not increasing with throttle (got 150 g at 1300 us, expected above 160 g)");
  // Throttle not increasing.
  CHECK(error_of("throttle_us,bus_V,bus_A,rpm,thrust_g\n1200,14.8,0.5,1000,50\n1100,14.8,1.2,1800,160\n") ==
        "bench.csv: line 3: throttle not increasing from the row before (got 1100 us, expected above 1200 us)");
  // Unknown unit in a header.
  CHECK(error_of("throttle_us,bus_V,bus_A,rpm,Thrust (stone)\n1100,14.8,0.5,1000,50\n") ==
        "bench.csv: line 1: column 'Thrust (stone)': unknown unit for thrust (got 'stone', expected N, g, kgf, "
        "lbf, ozf)");
  // A header without a unit.
  CHECK(error_of("throttle_us,bus_V,bus_A,rpm,thrust\n1100,14.8,0.5,1000,50\n").find(
            "column 'thrust' declares no unit for thrust") != std::string::npos);
  // Pulse width out of range, a text cell, too few rows, two thrust columns.
  CHECK(error_of("throttle_us,bus_V,bus_A,rpm,thrust_g\n900,14.8,0.5,1000,50\n") ==
        "bench.csv: line 2: throttle outside the pulse-width range (got 900 us, expected 1000 to 2000 us)");
  CHECK(error_of("throttle_us,bus_V,bus_A,rpm,thrust_g\n1100,abc,0.5,1000,50\n") ==
        "bench.csv: line 2: column 'bus_V' is not a number (got \"abc\", expected a bus voltage in V)");
  CHECK(error_of("throttle_us,bus_V,bus_A,rpm,thrust_g\n1100,14.8,0.5,1000,50\n") ==
        "bench.csv: too few rows (got 1, expected at least 2 throttle steps)");
  CHECK(error_of("throttle_us,bus_V,bus_A,rpm,thrust_g,thrust_N\n1100,14.8,0.5,1000,50,0.5\n")
            .find("two columns for thrust") != std::string::npos);
  CHECK(error_of("throttle_us,bus_V,bus_A,rpm,thrust_g\n1100,14.8,-0.5,1000,50\n") ==
        "bench.csv: line 2: bus current negative (got -0.5 A, expected a current >= 0)");
  // A column named with --columns that the file does not have.
  CHECK(error_of(kGood, io::parse_bench_columns("thrust=Schub:g")) ==
        "bench.csv: line 1: missing column 'Schub' named by --columns for thrust (got header "
        "\"throttle_us,bus_V,bus_A,rpm,thrust_g\", expected a column named 'Schub')");
}

TEST_CASE("bench CSV: bad --columns values are usage errors") {
  auto usage = [](const std::string& spec) {
    try {
      io::parse_bench_columns(spec);
    } catch (const UsageError& e) {
      return std::string(e.what());
    }
    return std::string();
  };
  CHECK(usage("thrust=F:stone") == "--columns: unknown unit for thrust (got 'stone', expected N, g, kgf, lbf, ozf)");
  CHECK(usage("thrus=F:N") ==
        "--columns: unknown quantity 'thrus'; did you mean 'thrust'? (expected one of throttle, voltage, current, "
        "rpm, thrust, torque)");
  CHECK(usage("thrust") == "--columns: entry without '=' (got \"thrust\", expected quantity=HEADER or quantity=HEADER:UNIT)");
  CHECK(usage("thrust=:N") == "--columns: empty header name for thrust (expected thrust=HEADER)");
  CHECK(usage("thrust=a:N,thrust=b:N") == "--columns: thrust named twice");
  CHECK(usage("").empty());
}

}  // TEST_SUITE
