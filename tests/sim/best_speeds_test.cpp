// Best speeds from the whole power model: a fixed wing with an ideal drive against the polar's
// closed forms, the multirotor bus-power bucket against a fine scan, and airspeed keywords.
#include "sim/best_speeds.hpp"

#include <doctest/doctest.h>

#include <cmath>

#include "flight/atmosphere.hpp"
#include "flight/fixed_wing.hpp"
#include "flight/multirotor.hpp"
#include "io/profile_json.hpp"
#include "sim/mission.hpp"
#include "support/cells.hpp"
#include "support/cli.hpp"

using namespace sortie;
using flight::Phase;

namespace {

constexpr double kEta = 0.7;  // the ideal drive's constant efficiency

/// A drive with constant efficiency η: CT constant, CP(J) = CT·J/η (so η_p = CT·J/CP = η at
/// every J; the table is linear, which linear interpolation holds exactly), a motor and ESC
/// that lose nothing. Bus power = T·V/η.
propulsion::Drive constant_eta_drive() {
  propulsion::Drive d;
  d.rotors = 1;
  d.prop.diameter_m = 0.254;
  d.prop.ct = Table(0.09);
  d.prop.cp = Table({0.0, 3.0}, {0.0, 0.09 * 3.0 / kEta});
  d.motor.kv_rpm_per_V = 900;
  d.motor.rm_ohm = 0.0;
  d.motor.i0_A = 0.0;
  d.motor.i_max_A = 1e4;
  d.esc.r_on_ohm = 0.0;
  d.esc.p_idle_W = 0.0;
  d.esc.k_switch = 0.0;
  d.esc.duty_max = 1.0;
  d.esc.i_max_A = 1e4;
  return d;
}

/// A wing whose minimum-power speed is above the 1.2·V_s margin (CL_mp 1.38 ≤ 2.1/1.44).
sim::Mission wing_mission() {
  sim::Mission m;
  m.airframe = flight::FixedWing{"test wing", 1.6, 0.2, 0.8, 0.028, 9.0, 0.8, 2.1};
  m.drive = constant_eta_drive();
  battery::Cell c = test::analytic_cell(5.0, 3.7, 0.0, 0.0);
  c.mass_kg = 0.1;
  c.v_cutoff_V = 3.0;
  m.pack = test::single(c);
  m.pack.series = 4;
  Phase loiter;
  loiter.kind = Phase::Kind::loiter;
  loiter.duration_s = 600;
  m.phases = {loiter};
  return m;
}

}  // namespace

TEST_SUITE("sim") {

TEST_CASE("fixed wing with an ideal drive: best endurance at V_mp and best range at V_md of the polar") {
  // Parabolic polar (J. D. Anderson Jr., Aircraft Performance and Design, 1999, ch. 5):
  // V_mp = √(2W/(ρS))·(K/(3CD0))^¼ minimises D·V, V_md = √(2W/(ρS))·(K/CD0)^¼ maximises V/(D·V).
  // With a constant drive efficiency the bus power is D·V/η, so the tool's search must land on
  // them; the golden-section end is 1 mm/s.
  const sim::Mission m = wing_mission();
  const auto& w = std::get<flight::FixedWing>(m.airframe);
  const double mass = 1.6 + 0.2 + 0.4, rho = m.environment.atmosphere.at(0.0)->density_kg_m3;
  const auto polar = flight::wing_speeds(w, mass, rho);
  REQUIRE(polar.min_power_mps > flight::kStallMargin * polar.stall_mps);
  const sim::BestSpeeds b = sim::best_speeds(m);
  REQUIRE(b.found);
  CHECK(b.mass_kg == doctest::Approx(mass));
  CHECK(b.endurance_mps == doctest::Approx(polar.min_power_mps).epsilon(2e-4));
  CHECK(b.range_mps == doctest::Approx(polar.min_drag_mps).epsilon(2e-4));
  CHECK(b.endurance_W == doctest::Approx(polar.power_min_W / kEta).epsilon(1e-6));
  // P is not stationary at V_md: a speed error of 2e-4 relative moves it by about that much.
  CHECK(b.range_W == doctest::Approx(polar.drag_min_N * polar.min_drag_mps / kEta).epsilon(2e-4));
  CHECK_FALSE(b.endurance_on_bound);
  CHECK(b.lower_bound == "1.2 × stall speed");
  MESSAGE("V_mp " << polar.min_power_mps << " (tool " << b.endurance_mps << "), V_md " << polar.min_drag_mps
                  << " (tool " << b.range_mps << ")");
}

TEST_CASE("best range into a headwind h solves P(V) = (V - h) P'(V)") {
  // Most ground per energy: maximise (V − h)/P(V), stationary where P = (V − h)·P'. With
  // P(V) = (A·V³ + B/V)/η, A = ½ρS·CD0, B = 2K·W²/(ρS) (Anderson 1999, ch. 5), the root is
  // found here by bisection, independently of the tool's search.
  const sim::Mission m = wing_mission();
  const auto& w = std::get<flight::FixedWing>(m.airframe);
  const double mass = 1.6 + 0.2 + 0.4, rho = m.environment.atmosphere.at(0.0)->density_kg_m3;
  const double W = mass * flight::kStandardGravity, S = w.wing_area_m2, K = flight::induced_drag_factor(w);
  const double A = 0.5 * rho * S * w.cd0, B = 2 * K * W * W / (rho * S);
  for (double h : {3.0, 6.0}) {
    CAPTURE(h);
    auto g = [&](double V) { return (A * V * V * V + B / V) - (V - h) * (3 * A * V * V - B / (V * V)); };
    double lo = h + 0.1, hi = 60.0;
    REQUIRE(g(lo) > 0);
    REQUIRE(g(hi) < 0);
    for (int k = 0; k < 100; ++k) (g(0.5 * (lo + hi)) > 0 ? lo : hi) = 0.5 * (lo + hi);
    const sim::BestSpeeds b = sim::best_speeds(m, 0.0, h, 0.0);
    CHECK(b.range_mps == doctest::Approx(0.5 * (lo + hi)).epsilon(2e-4));
    CHECK(b.range_ground_mps == doctest::Approx(b.range_mps - h).epsilon(1e-12));
    CHECK(b.range_mps > flight::wing_speeds(w, mass, rho).min_drag_mps);  // fly faster into wind
  }
}

TEST_CASE("multirotor: bus power falls from hover to a minimum near 2 v_h then rises") {
  // The bucket of forward-flight power (J. G. Leishman, Principles of Helicopter Aerodynamics,
  // 2006, ch. 5, the power curve figure: induced power falling, parasite and profile rising).
  // The demo quad of profiles/demo-quad-water-tank.json; the tool's minimum must match a fine
  // 0.01 m/s scan of its own bus power done here.
  const auto lp = io::load_profile_file(test::source_path("profiles/demo-quad-water-tank.json"));
  const sim::Mission& m = lp.mission;
  const sim::BestSpeeds b = sim::best_speeds(m);
  REQUIRE(b.found);
  const double rho = b.density_kg_m3, mass = b.mass_kg;
  auto P = [&](double v) { return *sim::level_bus_power_W(m, mass, rho, b.v_bus_V, v); };
  double v_min = 0.0, p_min = INFINITY;
  for (double v = 0.0; v <= 25.0; v += 0.01)
    if (P(v) < p_min) p_min = P(v), v_min = v;
  const auto& frame = std::get<flight::Multirotor>(m.airframe);
  const auto hover = flight::multirotor_hover(frame, mass, rho, m.drive.rotors, m.drive.prop.disc_area_m2());
  const double vh = hover.hover_induced_mps;
  MESSAGE("hover " << P(0) << " W, minimum " << p_min << " W at " << v_min << " m/s (" << v_min / vh
                   << " v_h), 20 m/s " << P(20) << " W; tool " << b.endurance_mps << " m/s");
  CHECK(p_min < 0.9 * P(0.0));        // translational lift: at least 10 % below hover
  CHECK(v_min > 1.0 * vh);
  CHECK(v_min < 3.0 * vh);
  CHECK(P(20.0) > P(0.0));            // parasite and profile power win at speed
  for (double v = 0.5; v <= v_min; v += 0.5) CHECK(P(v) < P(v - 0.5));   // falls into the bucket
  for (double v = v_min + 0.5; v <= 20.0; v += 0.5) CHECK(P(v) > P(v - 0.5));  // and climbs out
  CHECK(b.endurance_mps == doctest::Approx(v_min).epsilon(0.01 / v_min + 1e-3));
  CHECK(b.endurance_W == doctest::Approx(p_min).epsilon(1e-5));
  // Range: the best V/P lies above the endurance speed (the tangent from the origin).
  CHECK(b.range_mps > b.endurance_mps);
}

TEST_CASE("a keyword airspeed flies the best speed the tool finds for it") {
  sim::Mission m = wing_mission();
  m.phases[0].airspeed_choice = Phase::Speed::best_endurance;
  const sim::BestSpeeds b = sim::best_speeds(m);
  const auto r = sim::simulate(m);
  REQUIRE_FALSE(r.refused);
  CHECK(r.phases[0].airspeed_mps == doctest::Approx(b.endurance_mps).epsilon(1e-12));
  // A cruise on a track into the wind takes the range speed for that wind.
  m.environment.wind = {5.0, 90.0};
  Phase cruise;
  cruise.kind = Phase::Kind::cruise;
  cruise.distance_m = 2000;
  cruise.track_deg = 90;
  cruise.airspeed_choice = Phase::Speed::best_range;
  m.phases = {cruise};
  const sim::BestSpeeds into = sim::best_speeds(m, 0.0, 5.0, 0.0);
  const auto rc = sim::simulate(m);
  REQUIRE_FALSE(rc.refused);
  CHECK(rc.phases[0].airspeed_mps == doctest::Approx(into.range_mps).epsilon(1e-12));
  CHECK(rc.phases[0].planned_s == doctest::Approx(2000.0 / (into.range_mps - 5.0)).epsilon(1e-9));
}

}  // TEST_SUITE
