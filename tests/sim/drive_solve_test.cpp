// The drive solved for a flight condition: a multirotor's static-equivalent thrust gives the
// motor exactly the momentum model's shaft power; a fixed wing's prop outside its tables warns.
#include "sim/drive_solve.hpp"

#include <doctest/doctest.h>

#include <cmath>

#include "io/profile_json.hpp"
#include "support/cli.hpp"

using namespace sortie;

TEST_SUITE("sim") {

TEST_CASE("multirotor: the drive is solved at the thrust whose static shaft power is the model's power") {
  // Static prop: T = CT0·ρn²D⁴, P = CP0·ρn³D⁵, so P ∝ T^1.5 and T_eq = T·(P/P_s)^(2/3) must give
  // the motor the model's shaft power; in hover T_eq = T. The drive then decides current and duty.
  const auto lp = io::load_profile_file(test::source_path("profiles/demo-quad-water-tank.json"));
  const sim::Mission& m = lp.mission;
  const double mass = flight::all_up_mass_kg(m.airframe, m.pack.mass_kg()), rho = 1.18;
  for (double V : {0.0, 5.0, 10.0, 20.0}) {
    CAPTURE(V);
    flight::FlightCondition c;
    c.mass_kg = mass;
    c.density_kg_m3 = rho;
    c.airspeed_mps = V;
    c.rotors = m.drive.rotors;
    c.disk_area_m2 = m.drive.prop.disc_area_m2();
    const auto need = flight::thrust_need(m.airframe, c);
    const sim::DriveSolve ds = sim::solve_drive(m, need, rho);
    REQUIRE(ds.ok);
    REQUIRE(ds.rotor_power);
    CHECK(ds.motor.shaft_W == doctest::Approx(ds.rotor_power->shaft_W).epsilon(1e-9));
    CHECK(ds.drive_axial_mps == 0.0);
    if (V == 0.0) CHECK(ds.drive_thrust_N == doctest::Approx(ds.thrust_N).epsilon(1e-12));
    const auto hover = propulsion::solve_motor(m.drive, ds.thrust_N, 0.0, rho);
    CHECK(ds.drive_thrust_N ==
          doctest::Approx(ds.thrust_N * std::pow(ds.rotor_power->shaft_W / hover.shaft_W, 2.0 / 3.0)).epsilon(1e-12));
  }
}

TEST_CASE("multirotor: a descent fast enough that the air would drive the rotors is refused") {
  // Windmill-brake state (Leishman 2006, ch. 2): below V_n = −2·v_h the ideal power T·(V_n + v_i)
  // is negative; once it outweighs the profile power the rotor would give power, which the ESC
  // cannot take back: no powered operating point, refused naming the descent rate.
  const auto lp = io::load_profile_file(test::source_path("profiles/demo-quad-water-tank.json"));
  const sim::Mission& m = lp.mission;
  const double mass = flight::all_up_mass_kg(m.airframe, m.pack.mass_kg()), rho = 1.18;
  flight::FlightCondition c;
  c.mass_kg = mass;
  c.density_kg_m3 = rho;
  c.rotors = m.drive.rotors;
  c.disk_area_m2 = m.drive.prop.disc_area_m2();
  c.climb_rate_mps = 0.0;
  const auto hover = flight::thrust_need(m.airframe, c);
  const double vh = std::get<flight::RotorDemand>(hover.demand).hover_induced_mps;
  c.climb_rate_mps = -3.0 * vh;
  const auto need = flight::thrust_need(m.airframe, c);
  REQUIRE_FALSE(flight::refused(need.status));
  const sim::DriveSolve ds = sim::solve_drive(m, need, rho);
  CHECK_FALSE(ds.ok);
  CHECK(ds.field == "rate_mps");
  CHECK(ds.why.find("windmill-brake") != std::string::npos);
  REQUIRE(ds.rotor_power);
  CHECK(ds.rotor_power->shaft_W <= 0.0);
  // A slow descent is powered.
  c.climb_rate_mps = -0.2 * vh;
  CHECK(sim::solve_drive(m, flight::thrust_need(m.airframe, c), rho).ok);
}

TEST_CASE("fixed wing: an advance ratio outside the prop tables is a warning naming the value and the range") {
  const auto lp = io::load_profile_file(test::source_path("profiles/demo-fixed-wing-field-survey.json"));
  // The demo pusher's tables cut at J = 0.4, where CT is still well above zero, so that fast
  // flight needs an advance ratio beyond them.
  sim::Mission m = lp.mission;
  auto cut = [](const Table& t) {
    std::vector<double> x, y;
    for (std::size_t k = 0; k < t.x().size() && t.x()[k] <= 0.4 + 1e-12; ++k) x.push_back(t.x()[k]), y.push_back(t.y()[k]);
    return Table(x, y);
  };
  m.drive.prop.ct = cut(m.drive.prop.ct);
  m.drive.prop.cp = cut(m.drive.prop.cp);
  const double mass = flight::all_up_mass_kg(m.airframe, m.pack.mass_kg()), rho = 1.2;
  const double j_max = m.drive.prop.j_covered_max();
  REQUIRE(j_max == doctest::Approx(0.4));
  REQUIRE(std::isfinite(j_max));
  flight::FlightCondition c;
  c.mass_kg = mass;
  c.density_kg_m3 = rho;
  c.rotors = m.drive.rotors;
  c.disk_area_m2 = m.drive.prop.disc_area_m2();
  bool warned = false, quiet_inside = true;
  for (double V = 12.0; V <= 40.0 && !warned; V += 1.0) {
    c.airspeed_mps = V;
    const auto need = flight::thrust_need(m.airframe, c);
    if (flight::refused(need.status)) continue;
    const sim::DriveSolve ds = sim::solve_drive(m, need, rho);
    if (!ds.ok) continue;
    const bool outside = ds.motor.advance_ratio > j_max;
    bool said = false;
    for (const auto& w : ds.warnings) said = said || w.rfind("prop_table_range: ", 0) == 0;
    if (!outside) quiet_inside = quiet_inside && !said;
    if (outside) {
      CHECK(said);
      warned = said;
    }
  }
  CHECK(quiet_inside);
  // Fast enough, the cut tables are left behind: the warning must have come.
  CHECK(warned);
}

}  // TEST_SUITE
