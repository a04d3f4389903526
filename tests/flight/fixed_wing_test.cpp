// Fixed wing: drag polar, characteristic airspeeds against a fine sweep, stall refusal.
#include "flight/fixed_wing.hpp"

#include <doctest/doctest.h>

#include <cmath>
#include <numbers>

#include "flight/atmosphere.hpp"
#include "flight/thrust_need.hpp"

using namespace sortie::flight;

namespace {

// The demo mapper's polar (CD0 0.028, AR 9, e 0.8) on 0.55 m²; a 2.8 kg all-up mass.
FixedWing mapper(double cl_max = 1.2) {
  FixedWing w;
  w.mass_empty_kg = 2.1;
  w.payload_kg = 0.2;
  w.wing_area_m2 = 0.55;
  w.cd0 = 0.028;
  w.aspect_ratio = 9.0;
  w.oswald_e = 0.8;
  w.cl_max = cl_max;
  return w;
}
constexpr double kMass = 2.8, kRho = 1.225;

}  // namespace

TEST_SUITE("flight") {

TEST_CASE("level flight follows the parabolic polar") {
  // J. D. Anderson Jr., Aircraft Performance and Design, 1999, ch. 5:
  // L = W, CL = W/(qS), D = qS·(CD0 + CL²/(π·e·AR)), T = D.
  const FixedWing w = mapper();
  const double V = 14.0, W = kMass * kStandardGravity, q = 0.5 * kRho * V * V;
  const WingDemand d = fixed_wing_steady(w, kMass, kRho, V, 0.0);
  REQUIRE(d.status == FlightStatus::ok);
  const double cl = W / (q * w.wing_area_m2);
  const double cd = w.cd0 + cl * cl / (std::numbers::pi * w.oswald_e * w.aspect_ratio);
  CHECK(d.cl == doctest::Approx(cl).epsilon(1e-15));
  CHECK(d.cd == doctest::Approx(cd).epsilon(1e-15));
  CHECK(d.thrust_N == doctest::Approx(q * w.wing_area_m2 * cd).epsilon(1e-14));
  CHECK(d.power_required_W == doctest::Approx(d.thrust_N * V).epsilon(1e-15));
  CHECK(d.axial_mps == V);
}

TEST_CASE("climb: L = W cos(gamma) and T = D + W sin(gamma)") {
  // Anderson 1999, ch. 5, steady climb equations of motion.
  const FixedWing w = mapper();
  const double V = 15.0, vz = 2.5, W = kMass * kStandardGravity;
  const WingDemand d = fixed_wing_steady(w, kMass, kRho, V, vz);
  REQUIRE(d.status == FlightStatus::ok);
  const double g = std::asin(vz / V);
  CHECK(d.gamma_rad == doctest::Approx(g).epsilon(1e-15));
  CHECK(d.lift_N == doctest::Approx(W * std::cos(g)).epsilon(1e-15));
  CHECK(d.thrust_N == doctest::Approx(d.drag_N + W * std::sin(g)).epsilon(1e-15));
  // A sink steeper than the idle glide is refused, naming both angles; with a drag device it
  // is flown at idle (thrust 0, never negative), a note, not a refusal.
  const WingDemand steep = fixed_wing_steady(w, kMass, kRho, 12.0, -3.0);
  CHECK(steep.status == FlightStatus::steeper_than_glide);
  CHECK(refused(steep.status));
  CHECK(steep.detail.find("descent angle 14.5 deg") != std::string::npos);
  CHECK(steep.detail.find("idle glide angle") != std::string::npos);
  const WingDemand braked = fixed_wing_steady(w, kMass, kRho, 12.0, -3.0, 1.0, true);
  CHECK(braked.status == FlightStatus::no_thrust_needed);
  CHECK(braked.thrust_N == 0.0);
  CHECK(braked.power_required_W == 0.0);
  CHECK_FALSE(refused(braked.status));
  // No path climbs as fast as it flies.
  CHECK(fixed_wing_steady(w, kMass, kRho, 10.0, 10.0).status == FlightStatus::climb_too_steep);
}

TEST_CASE("V_mp and V_md are the minima of power required and drag in a fine sweep") {
  // Closed forms (Anderson 1999, ch. 5): V_md = √(2W/(ρS))·(K/CD0)^¼, V_mp = (1/3)^¼·V_md.
  // cl_max raised to 6 so that the whole sweep stays above the stall margin (with the demo's 1.2 the
  // minimum-power speed is below stall, and flagged so).
  const FixedWing w = mapper(6.0);
  const WingSpeeds s = wing_speeds(w, kMass, kRho);
  REQUIRE(kStallMargin * s.stall_mps < 0.7 * s.min_power_mps);
  CHECK(s.min_power_mps == doctest::Approx(std::pow(1.0 / 3.0, 0.25) * s.min_drag_mps).epsilon(1e-14));
  // Sweep 0.7·V_mp to 2·V_md in steps h; the grid minimum of a smooth single-minimum function
  // lies within one step of the true minimum.
  const double lo = 0.7 * s.min_power_mps, hi = 2.0 * s.min_drag_mps, h = 1e-4;
  double v_pmin = lo, p_min = INFINITY, v_dmin = lo, d_min = INFINITY, ld_best = 0.0;
  for (double V = lo; V <= hi; V += h) {
    const WingDemand d = fixed_wing_steady(w, kMass, kRho, V, 0.0);
    REQUIRE(d.status == FlightStatus::ok);
    if (d.power_required_W < p_min) p_min = d.power_required_W, v_pmin = V;
    if (d.drag_N < d_min) d_min = d.drag_N, v_dmin = V;
    ld_best = std::max(ld_best, d.lift_to_drag);
  }
  MESSAGE("V_mp " << s.min_power_mps << " m/s (sweep " << v_pmin << "), V_md " << s.min_drag_mps
                  << " m/s (sweep " << v_dmin << ")");
  CHECK(std::fabs(v_pmin - s.min_power_mps) <= h);
  CHECK(std::fabs(v_dmin - s.min_drag_mps) <= h);
  // The closed-form minima are at or below every swept value (to rounding).
  CHECK(s.power_min_W <= p_min * (1 + 1e-12));
  CHECK(s.drag_min_N <= d_min * (1 + 1e-12));
  CHECK(fixed_wing_steady(w, kMass, kRho, s.min_power_mps, 0.0).power_required_W ==
        doctest::Approx(s.power_min_W).epsilon(1e-13));
  // (L/D)max = ½·√(π·e·AR/CD0) (Anderson 1999, ch. 5): 14.21 for this polar.
  const double ld_max = 0.5 * std::sqrt(std::numbers::pi * 0.8 * 9.0 / 0.028);
  CHECK(s.ld_max == doctest::Approx(ld_max).epsilon(1e-14));
  CHECK(ld_best <= ld_max * (1 + 1e-12));
  CHECK(ld_best == doctest::Approx(ld_max).epsilon(1e-8));  // flat top: error ∝ h²
  // At V_mp, CL² = 3·CD0/K so induced drag is three times the zero-lift drag: CD = 4·CD0.
  CHECK(fixed_wing_steady(w, kMass, kRho, s.min_power_mps, 0.0).cd == doctest::Approx(4 * w.cd0).epsilon(1e-13));
}

TEST_CASE("below the stall speed the airspeed is refused naming the stall speed") {
  // V_s = √(2W/(ρ·S·CL_max)) (Anderson 1999, ch. 5): 8.24 m/s for the demo at sea level.
  const FixedWing w = mapper();
  const double vs = std::sqrt(2 * kMass * kStandardGravity / (kRho * 0.55 * 1.2));
  CHECK(stall_speed_mps(w, kMass, kRho) == doctest::Approx(vs).epsilon(1e-15));
  const WingDemand slow = fixed_wing_steady(w, kMass, kRho, 0.95 * vs, 0.0);
  CHECK(slow.status == FlightStatus::below_stall);
  CHECK(refused(slow.status));
  CHECK(slow.detail.find("below the stall speed 8.24 m/s") != std::string::npos);
  CHECK(slow.cl > w.cl_max);
  // Between V_s and the planning margin 1.2·V_s (common practice): refused, naming the margin.
  const WingDemand close = fixed_wing_steady(w, kMass, kRho, 1.1 * vs, 0.0);
  CHECK(close.status == FlightStatus::stall_margin);
  CHECK(refused(close.status));
  CHECK(close.detail.find("1.2 × the stall speed 8.24 m/s") != std::string::npos);
  CHECK(fixed_wing_steady(w, kMass, kRho, 1.2 * vs, 0.0).status == FlightStatus::ok);
  CHECK(fixed_wing_steady(w, kMass, kRho, 0.0, 0.0).status == FlightStatus::below_stall);
  // Thinner air raises the stall speed by √(ρ0/ρ).
  CHECK(stall_speed_mps(w, kMass, 0.9) == doctest::Approx(vs * std::sqrt(kRho / 0.9)).epsilon(1e-14));
  // With cl_max 1.2 the minimum-power speed (CL 1.38) is below stall and flagged.
  const WingSpeeds s = wing_speeds(w, kMass, kRho);
  CHECK(s.min_power_below_stall);
  CHECK_FALSE(s.min_drag_below_stall);
}

TEST_CASE("a coordinated turn: n = 1/cos(bank) with induced drag times n^2 and stall speed times sqrt(n)") {
  // Level turn (Anderson 1999, ch. 6): L = n·W, n = 1/cos φ, r = V²/(g·tan φ), V_s,turn = V_s·√n.
  const FixedWing w = mapper();
  const double V = 16.0, bank = 40.0 * std::numbers::pi / 180.0, n = 1.0 / std::cos(bank);
  const WingDemand straight = fixed_wing_steady(w, kMass, kRho, V, 0.0);
  const WingDemand turn = fixed_wing_steady(w, kMass, kRho, V, 0.0, n);
  REQUIRE(turn.status == FlightStatus::ok);
  CHECK(turn.lift_N == doctest::Approx(n * kMass * kStandardGravity).epsilon(1e-14));
  const double K = induced_drag_factor(w), q = 0.5 * kRho * V * V, S = w.wing_area_m2;
  const double d0 = q * S * w.cd0, di = straight.drag_N - d0;
  CHECK(turn.drag_N == doctest::Approx(d0 + n * n * di).epsilon(1e-13));
  CHECK(di == doctest::Approx(K * std::pow(kMass * kStandardGravity, 2) / (q * S)).epsilon(1e-13));
  CHECK(turn.stall_speed_turn_mps == doctest::Approx(turn.stall_speed_mps * std::sqrt(n)).epsilon(1e-15));
  // Radius and bank are each other's inverse: r = V²/(g·tan φ).
  const double r = turn_radius_m(V, bank);
  CHECK(r == doctest::Approx(V * V / (kStandardGravity * std::tan(bank))).epsilon(1e-15));
  CHECK(bank_for_radius_rad(V, r) == doctest::Approx(bank).epsilon(1e-14));
  // At 60° bank (n = 2) the wing stalls at √2·V_s; 1.5·V_s flies but is below the margin
  // 1.2·√2·V_s = 1.70·V_s: refused.
  const double vs = stall_speed_mps(w, kMass, kRho);
  const WingDemand steep = fixed_wing_steady(w, kMass, kRho, 1.5 * vs, 0.0, 2.0);
  CHECK(steep.status == FlightStatus::stall_margin);
  CHECK(steep.detail.find("in the turn (load factor 2.00)") != std::string::npos);
}

TEST_CASE("the idle glide angle: W sin(gamma) = D is the boundary of a descent needing no thrust") {
  // Steady glide (Anderson 1999, ch. 5): T = 0 ⇒ W·sin γ = D with L = W·cos γ; for a shallow
  // glide tan γ ≈ CD/CL = 1/(L/D).
  const FixedWing w = mapper();
  const double V = 12.0, W = kMass * kStandardGravity;
  const double g = glide_angle_rad(w, kMass, kRho, V);
  const double cl = W * std::cos(g) / (0.5 * kRho * V * V * w.wing_area_m2);
  const double cd = w.cd0 + induced_drag_factor(w) * cl * cl;
  CHECK(std::tan(g) == doctest::Approx(cd / cl).epsilon(1e-12));
  // Just shallower than the glide needs a little thrust; just steeper is refused.
  const WingDemand shallow = fixed_wing_steady(w, kMass, kRho, V, -V * std::sin(g) * (1 - 1e-6));
  CHECK(shallow.status == FlightStatus::ok);
  CHECK(shallow.thrust_N > 0.0);
  CHECK(shallow.thrust_N < 1e-4 * W);
  CHECK(fixed_wing_steady(w, kMass, kRho, V, -V * std::sin(g) * (1 + 1e-6)).status == FlightStatus::steeper_than_glide);
}

TEST_CASE("thrust_need shares a fixed wing's thrust over its rotors") {
  FlightCondition c;
  c.mass_kg = kMass;
  c.density_kg_m3 = kRho;
  c.airspeed_mps = 14.0;
  c.rotors = 2;
  const ThrustNeed n = thrust_need(Airframe{mapper()}, c);
  REQUIRE(n.status == FlightStatus::ok);
  CHECK(n.thrust_per_rotor_N == doctest::Approx(n.thrust_total_N / 2).epsilon(1e-15));
  CHECK(n.axial_mps == 14.0);
  c.airspeed_mps = 5.0;
  const ThrustNeed stalled = thrust_need(Airframe{mapper()}, c);
  CHECK(stalled.status == FlightStatus::below_stall);
  CHECK_FALSE(stalled.detail.empty());
}

}  // TEST_SUITE
