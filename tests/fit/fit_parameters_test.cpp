// Every fitted parameter against its known truth, in synthetic round trips: a bench test and a
// pulse test made by sortie's own models from the invented demo drive and cell.
//
// Two kinds of tolerance:
// - without measurement noise the fit must give the truth back to the solver's convergence
//   (the model fitted is the model that made the data, so any bias is the fitter's);
// - with noise each parameter is held to a bound from the noise and the conditioning of the
//   data, stated beside it.
#include <doctest/doctest.h>

#include <cmath>
#include <map>
#include <random>

#include "fit/fit_cell.hpp"
#include "fit/fit_drive.hpp"
#include "io/battery_json.hpp"
#include "io/drive_json.hpp"
#include "propulsion/operating_point.hpp"
#include "support/cli.hpp"
#include "support/synthetic.hpp"

using namespace sortie;

namespace {

propulsion::Drive demo_drive() {
  propulsion::Drive d = io::load_drive_file(test::source_path("models/drives/demo-quad-15in.json"));
  d.motor.i0_speed_exponent = 0.0;  // the fitted model's constant I0
  d.esc.duty_max = 1.0;             // the fit's default: throttle 100 % is full duty
  return d;
}

/// A static throttle-step bench test at `v_bus` (J = 0, ρ = 1.225 kg/m³), each measurement
/// times (1 + scale·σ·z): rpm σ 0.3 %, thrust 0.5 %, current 0.5 %, voltage 0.1 %, torque 1 %
/// (hobby thrust stands; common practice). scale 0: exact.
std::vector<propulsion::BenchRow> bench_rows(const propulsion::Drive& d, double v_bus, double scale,
                                             std::uint64_t seed, int steps = 12) {
  std::mt19937_64 gen(seed);
  std::normal_distribution<double> z(0.0, 1.0);
  std::vector<propulsion::BenchRow> rows;
  for (int i = 0; i <= steps; ++i) {
    const double duty = i == 0 ? 0.0 : 0.2 + 0.8 * (i - 1) / (steps - 1.0);
    const auto op = propulsion::at_duty(d, duty, 0.0, 1.225, v_bus);
    propulsion::BenchRow r;
    r.throttle_pct = 100.0 * duty;
    r.v_bus_V = v_bus * (1.0 + scale * 0.001 * z(gen));
    const double bus_W = duty > 0 ? op.bus.bus_W : d.esc.p_idle_W;
    r.i_bus_A = bus_W / v_bus * (1.0 + scale * 0.005 * z(gen));
    r.rpm = op.motor.rpm * (1.0 + scale * 0.003 * z(gen));
    r.thrust_N = op.motor.thrust_N * (1.0 + scale * 0.005 * z(gen));
    r.torque_Nm = op.motor.torque * (1.0 + scale * 0.01 * z(gen));
    rows.push_back(r);
  }
  return rows;
}

/// The fitted drive's eight parameters beside the truth's, in the units the fit reports.
std::map<std::string, std::pair<double, double>> drive_parameters(const propulsion::Drive& fit,
                                                                  const propulsion::Drive& truth) {
  return {{"Kv", {fit.motor.kv_rpm_per_V, truth.motor.kv_rpm_per_V}},
          {"Rm", {fit.motor.rm_ohm, truth.motor.rm_ohm}},
          {"I0", {fit.motor.i0_A, truth.motor.i0_A}},
          {"P_idle", {fit.esc.p_idle_W, truth.esc.p_idle_W}},
          {"R_on", {fit.esc.r_on_ohm, truth.esc.r_on_ohm}},
          {"k_switch", {fit.esc.k_switch, truth.esc.k_switch}},
          {"CT", {fit.prop.ct(0.0), truth.prop.ct(0.0)}},
          {"CP", {fit.prop.cp(0.0), truth.prop.cp(0.0)}}};
}

}  // namespace

TEST_SUITE("fit") {

TEST_CASE("fit drive: an exact bench test gives all eight parameters back to 1e-4") {
  // The data are the fitted model's own at two bus voltages (the ESC's conduction and switching
  // losses, R_on·I² and k_sw·V_bus·I, are told apart by the voltage; at one voltage they differ
  // only in I against I²). The solver stops at a relative step of about 1e-8 (LM defaults), so
  // 1e-4 relative leaves room for the conditioning of the eight-parameter problem.
  const propulsion::Drive truth = demo_drive();
  std::vector<propulsion::BenchRow> rows = bench_rows(truth, 16.0, 0.0, 1);
  for (const auto& r : bench_rows(truth, 22.2, 0.0, 1)) rows.push_back(r);
  fit::DriveFitOptions o;
  o.diameter_m = truth.prop.diameter_m;
  const fit::DriveFitResult r = fit::fit_drive(propulsion::make_bench_map(rows), o);
  for (const auto& [name, v] : drive_parameters(r.drive, truth)) {
    CAPTURE(name);
    CHECK(v.first == doctest::Approx(v.second).epsilon(1e-4));
  }
  CHECK(r.max_power_pct < 1e-3);
}

TEST_CASE("fit drive: a noisy bench test gives every parameter back within its own stated bound") {
  // Noise as above, 13 steps at each of 16 V and 22.2 V, seeds fixed and printed. Bounds:
  // - Kv within 1 %: ω/V_m at light load is Kv itself, and rpm carries 0.3 % noise;
  // - CT within 2 %: T/(ρn²D⁴) row by row, 0.5 % thrust + 2·0.3 % rpm noise, averaged;
  // - CP within 3 %: from torque (1 %) and rpm, or from the power balance without torque;
  // - Rm, I0 within 15 %: I0 is the current at no load (about 0.8 A of 1–25 A read to 0.5 %), Rm
  //   the speed droop (a few per cent of rpm read to 0.3 %);
  // - P_idle, R_on, k_switch, the ESC's three loss terms, within 4 standard errors of the fit
  //   itself (σ²·(JᵀJ)⁻¹; a 4σ bound fails by chance about once in 16 000 for a Gaussian
  //   estimate): together they are a few per cent of the bus power read to 0.5 %, so each alone
  //   is poorly known, and the bound says how poorly — and a standard error above 100 % fails.
  const propulsion::Drive truth = demo_drive();
  for (const std::uint64_t seed : {std::uint64_t{3}, std::uint64_t{20240611}}) {
    MESSAGE("seed " << seed);
    std::vector<propulsion::BenchRow> rows = bench_rows(truth, 16.0, 1.0, seed);
    for (const auto& row : bench_rows(truth, 22.2, 1.0, seed + 1)) rows.push_back(row);
    fit::DriveFitOptions o;
    o.diameter_m = truth.prop.diameter_m;
    const fit::DriveFitResult r = fit::fit_drive(propulsion::make_bench_map(rows), o);
    const auto values = drive_parameters(r.drive, truth);
    const std::map<std::string, double> fixed_bound = {{"Kv", 0.01}, {"CT", 0.02}, {"CP", 0.03}, {"Rm", 0.15}, {"I0", 0.15}};
    for (const auto& p : r.parameters) {
      CAPTURE(p.name);
      REQUIRE(values.count(p.name) == 1);
      const auto [got, want] = values.at(p.name);
      const double rel = std::fabs(got / want - 1.0);
      MESSAGE(p.name << " " << got << " (truth " << want << ", " << 100 * rel << " %, s.e. " << 100 * p.se_rel << " %)");
      if (fixed_bound.count(p.name)) {
        CHECK(rel <= fixed_bound.at(p.name));
      } else {
        CHECK(p.se_rel < 1.0);
        CHECK(rel <= 4.0 * p.se_rel);
      }
    }
    CHECK(r.parameters.size() == 8);
  }
}

TEST_CASE("fit cell: an exact pulse test gives back R0 and both RC pairs — and the fitted R_k within 5 %") {
  // The pulse test of the invented demo cell without measurement noise. The cell's R0 varies
  // over SoC (a table), R_k and τ_k are constants. Bounds: R0 within 0.5 % and τ within 2 %
  // (no noise: what is left is the fit's knot placement over a table that is piecewise linear
  // between other knots); R_k within 5 % (an RC pair's resistance and its time constant trade
  // against each other over a pulse of finite length, more than R0 does).
  const battery::Cell truth = io::load_cell_file(test::source_path(test::kDemoLogCell));
  sim::MeasurementNoise noise;
  noise.voltage_sd_V = 0.0;
  noise.current_sd_A = 0.0;
  noise.voltage_step_V = 0.0;
  noise.current_step_A = 0.0;
  noise.seed = 1;
  const sim::SyntheticLog s = sim::synthetic_pulse_test(truth, sim::PulseTestProtocol{}, noise);
  // The demo cell is a LiPo (its file says so): the fit takes its full and cutoff voltages from
  // the chemistry (fit/chemistry).
  fit::CellFitOptions fo;
  fo.chemistry = truth.chemistry;
  const fit::CellFitResult r = fit::fit_cell(sim::to_cell_log(s, "synthetic"), fo);
  REQUIRE(r.cell.rc.size() == 2);
  REQUIRE(r.bands.size() >= 5);
  std::size_t full = 0, empty = 0;
  for (const auto& an : r.soc_estimate.anchors) {
    if (an.kind == fit::SocAnchor::Kind::full) full = an.row;
    if (an.kind == fit::SocAnchor::Kind::empty) empty = an.row;
  }
  const double a = s.soc_true[empty], b = s.soc_true[full] - a;  // soc_true = a + b·soc_fit
  for (const auto& band : r.bands) {
    CAPTURE(band.soc);
    REQUIRE(band.excited);
    const double soc = a + b * band.soc;
    CHECK(band.r0_ohm == doctest::Approx(truth.r0_ohm(soc)).epsilon(0.005));
    for (int p = 0; p < 2; ++p) {
      CAPTURE(p);
      CHECK(band.r_ohm[p] == doctest::Approx(truth.rc[p].r_ohm(soc)).epsilon(0.05));
      CHECK(band.tau_s[p] == doctest::Approx(truth.rc[p].tau_s(soc)).epsilon(0.02));
    }
  }
  // The written cell's own tables at the same points.
  for (int p = 0; p < 2; ++p)
    for (double sf : {0.2, 0.5, 0.8}) {
      CAPTURE(sf);
      CHECK(r.cell.rc[p].r_ohm(sf) == doctest::Approx(truth.rc[p].r_ohm(a + b * sf)).epsilon(0.05));
    }
  CHECK(r.cell.capacity_Ah == doctest::Approx(truth.capacity_Ah * b).epsilon(1e-4));
}

}  // TEST_SUITE
