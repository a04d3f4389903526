// The bundled demo logs are golden files (tests/fit/demo_log_test.cpp rebuilds them byte for
// byte); these checks read the same figures from the files and hold them to the physics of the
// invented models that made them, computed here in closed form, so that a change to the
// simulator that rewrote the files consistently would still be caught.
#include <doctest/doctest.h>

#include <cmath>
#include <fstream>
#include <numbers>
#include <sstream>
#include <string>
#include <vector>

#include "support/cli.hpp"
#include "support/synthetic.hpp"

namespace {

/// The numeric rows of a comma-separated file after its `#` comment lines and its header.
std::vector<std::vector<double>> numeric_rows(const std::string& path) {
  std::ifstream in(path);
  std::vector<std::vector<double>> rows;
  std::string line;
  bool header = true;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#') continue;
    if (header) {
      header = false;
      continue;
    }
    std::vector<double> row;
    std::stringstream ss(line);
    std::string cell;
    while (std::getline(ss, cell, ',')) row.push_back(std::stod(cell));
    rows.push_back(row);
  }
  return rows;
}

}  // namespace

TEST_SUITE("fit") {

TEST_CASE("demo bench: every row of the bundled bench file follows the invented drive's closed form within its noise") {
  // The invented drive (models/drives/demo-quad-15in.json, constant I0) on a static stand at
  // 16 V, ρ = 1.225 kg/m³, duty = throttle/100. At J = 0 (M. Drela, "First-Order DC Electric
  // Motor Model", MIT, 2007, for the motor; docs/physics.md "Propulsion" for the prop and ESC):
  //   Q = c·ω², c = CP·ρ·D⁵/(2π)³;  I_m = I0 + Kv·Q;  ω = (V_m − I_m·Rm)·Kv, V_m = d·V_bus
  //   ⇒ Kv²·Rm·c·ω² + ω − Kv·(V_m − Rm·I0) = 0 (its positive root);
  //   T = CT·ρ·n²·D⁴;  P_bus = V_m·I_m + P_idle + R_on·I_m² + k_sw·V_bus·I_m.
  // The file's noise (its comment lines): rpm 0.3 %, thrust 0.5 %, current 0.5 %, voltage
  // 0.1 %, torque 1 % (one σ). Each figure is held to 4σ, and the thrust to 4σ of its own noise
  // and of twice the rpm's (the file's rpm is itself noisy): a bound a Gaussian passes 99.99 % of
  // the time, and a change of a model term by more than a few per cent fails.
  constexpr double pi = std::numbers::pi;
  const double D = 0.381, rho = 1.225, CT = 0.105, CP = 0.042;  // the drive file's J = 0 values
  const double kv = 400.0 * 2.0 * pi / 60.0, rm = 0.09, i0 = 0.8;
  const double r_on = 0.008, k_sw = 0.02, p_idle = 0.4, v_bus = 16.0;
  const double c = CP * rho * std::pow(D, 5) / std::pow(2.0 * pi, 3);
  const auto rows = numeric_rows(sortie::test::source_path(sortie::test::kDemoBenchFile));
  REQUIRE(rows.size() == 13);
  int running = 0;
  for (const auto& r : rows) {
    REQUIRE(r.size() == 6);  // throttle %, V, A, rpm, thrust g, torque N·m
    const double d = r[0] / 100.0;
    CAPTURE(r[0]);
    CHECK(r[1] == doctest::Approx(v_bus).epsilon(0.004));
    if (d == 0.0) {
      // Standing: the ESC's idle draw alone, P_idle/V_bus.
      CHECK(r[2] * v_bus == doctest::Approx(p_idle).epsilon(0.02 + 1e-3 / (p_idle / v_bus)));
      CHECK(r[3] == 0.0);
      continue;
    }
    ++running;
    const double vm = d * v_bus;
    const double a = kv * kv * rm * c, b = 1.0, cc = -kv * (vm - rm * i0);
    const double omega = (-b + std::sqrt(b * b - 4.0 * a * cc)) / (2.0 * a);
    const double q = c * omega * omega, im = i0 + kv * q;
    const double n = omega / (2.0 * pi);
    const double bus_W = vm * im + p_idle + r_on * im * im + k_sw * v_bus * im;
    CHECK(r[3] == doctest::Approx(60.0 * n).epsilon(4 * 0.003 + 0.5 / (60.0 * n)));  // rpm to 1 rpm
    CHECK(r[2] == doctest::Approx(bus_W / v_bus).epsilon(4 * 0.005 + 0.0005 / (bus_W / v_bus)));
    CHECK(r[5] == doctest::Approx(q).epsilon(4 * 0.01 + 0.00005 / q));
    // Thrust from the file's own rpm: T = CT·ρ·n²·D⁴, grams-force of 9.80665 mN.
    const double n_file = r[3] / 60.0;
    const double thrust_g = CT * rho * n_file * n_file * std::pow(D, 4) / 9.80665e-3;
    CHECK(r[4] == doctest::Approx(thrust_g).epsilon(4 * std::sqrt(0.005 * 0.005 + 4 * 0.003 * 0.003)));
  }
  CHECK(running == 12);
}

TEST_CASE("demo log: the bundled pulse-test log rests on the invented cell's OCV at the Coulomb-counted charge") {
  // models/logs/demo-hppc-synthetic.csv from the invented demo cell (5.0 Ah, OCV table in its
  // file) starting rested at SoC 0. SoC by Coulomb counting of the logged current (discharge
  // positive): SoC(t) = −∫I dt/(3600·Q), each row's current held over the interval that ends at
  // its time (the log's own convention: a 10 s pulse from t0 fills the rows t0 + 0.1 … t0 + 10). At the end of each rest of 30 min or more the
  // RC pairs (τ 6 s and 90 s) have relaxed to e^(−20) of their value, so the terminal voltage is
  // OCV(SoC) (Plett 2015, ch. 2): held to 4 mV — the logger's 1 mV noise and resolution, and
  // the counting error of 2 mA noise and the 10 s rest interval (under 1e-4 of SoC, below
  // 0.4 mV on the steepest part of the table).
  const std::vector<double> soc_knots = {0.0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0};
  const std::vector<double> ocv_knots = {3.27, 3.61, 3.69, 3.73, 3.77, 3.81, 3.86, 3.92, 3.98, 4.07, 4.20};
  auto ocv = [&](double s) {
    if (s <= 0.0) return ocv_knots.front();
    if (s >= 1.0) return ocv_knots.back();
    const auto k = static_cast<std::size_t>(s * 10.0);
    const double w = (s - soc_knots[k]) / 0.1;
    return ocv_knots[k] + w * (ocv_knots[k + 1] - ocv_knots[k]);
  };
  const auto rows = numeric_rows(sortie::test::source_path(sortie::test::kDemoLogFile));
  REQUIRE(rows.size() > 20000);
  double charge_As = 0.0, rest_since = rows.front()[0];
  double soc_max = 0.0;
  int rest_ends = 0;
  double worst = 0.0;
  for (std::size_t k = 1; k < rows.size(); ++k) {
    const double dt = rows[k][0] - rows[k - 1][0];
    charge_As += rows[k][1] * dt;
    const double soc = -charge_As / (3600.0 * 5.0);
    soc_max = std::max(soc_max, soc);
    const bool at_rest = std::fabs(rows[k][1]) < 0.01;
    const bool rest_ends_here = at_rest && (k + 1 == rows.size() || std::fabs(rows[k + 1][1]) >= 0.01);
    if (!at_rest) rest_since = rows[k][0];
    if (rest_ends_here && rows[k][0] - rest_since >= 1790.0 && soc > 0.005 && soc < 0.995) {
      ++rest_ends;
      const double err = std::fabs(rows[k][2] - ocv(soc));
      worst = std::max(worst, err);
      CHECK_MESSAGE(err < 0.004, "t " << rows[k][0] << " s, SoC " << soc << ": " << rows[k][2] << " V vs OCV " << ocv(soc));
    }
  }
  MESSAGE(rest_ends << " long rests, largest difference from the OCV table " << 1000 * worst << " mV; counted SoC peak "
                    << soc_max);
  // The protocol charges to full and steps down by 0.1 of SoC with a rest after each step.
  CHECK(rest_ends >= 8);
  CHECK(soc_max == doctest::Approx(1.0).epsilon(0.01));
}

}  // TEST_SUITE
