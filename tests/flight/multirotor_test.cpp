// Multirotor thrust and Glauert inflow against momentum-theory closed forms.
#include "flight/multirotor.hpp"

#include <doctest/doctest.h>

#include <cmath>

#include "flight/atmosphere.hpp"
#include "flight/thrust_need.hpp"

using namespace sortie::flight;

namespace {

// A 15-inch quad near the demo airframe: 2.4 kg all up, four 0.381 m rotors.
Multirotor quad() {
  Multirotor m;
  m.mass_empty_kg = 1.6;
  m.payload_kg = 0.3;
  m.cda_m2 = 0.055;
  m.cda_vertical_m2 = 0.09;
  m.download_fraction = 0.0;  // the closed forms below are for the rotors alone
  return m;
}
constexpr double kMass = 2.4, kRho = 1.225;
constexpr int kRotors = 4;
const double kArea = disk_area_m2(0.381);

}  // namespace

TEST_SUITE("flight") {

TEST_CASE("hover: Glauert's inflow reduces to v_h = sqrt(T/(2 rho A))") {
  // J. G. Leishman, Principles of Helicopter Aerodynamics, 2006, ch. 2: simple momentum theory
  // in hover, T = 2ρA·v_h².
  const RotorDemand d = multirotor_hover(quad(), kMass, kRho, kRotors, kArea);
  REQUIRE(d.status == FlightStatus::ok);
  const double W = kMass * kStandardGravity;
  CHECK(d.thrust_total_N == doctest::Approx(W).epsilon(1e-15));
  CHECK(d.thrust_per_rotor_N == doctest::Approx(W / kRotors).epsilon(1e-15));
  CHECK(d.tilt_rad == 0.0);
  CHECK(d.axial_mps == 0.0);
  const double vh = std::sqrt(W / kRotors / (2.0 * kRho * kArea));
  // Root found to 1e-13·v_h.
  CHECK(d.induced_mps == doctest::Approx(vh).epsilon(1e-12));
  CHECK(d.hover_induced_mps == doctest::Approx(vh).epsilon(1e-15));
  // Ideal hover power T·v_h = T^1.5/√(2ρA) (Leishman 2006, ch. 2).
  CHECK(d.ideal_power_per_rotor_W ==
        doctest::Approx(std::pow(W / kRotors, 1.5) / std::sqrt(2.0 * kRho * kArea)).epsilon(1e-12));
  CHECK(d.flow == RotorFlow::normal_working);
}

TEST_CASE("axial climb: v_i = -Vc/2 + sqrt((Vc/2)^2 + v_h^2) and T = W + drag") {
  // Leishman 2006, ch. 2, momentum theory in axial climb.
  const Multirotor m = quad();
  for (double vc : {0.5, 2.0, 5.0, 12.0}) {
    CAPTURE(vc);
    const RotorDemand d = multirotor_climb(m, kMass, kRho, kRotors, kArea, vc);
    REQUIRE(d.status == FlightStatus::ok);
    const double W = kMass * kStandardGravity;
    // T = W + ½ρVc²·CdA_vertical (the frame's drag in the climb).
    CHECK(d.thrust_total_N == doctest::Approx(W + 0.5 * kRho * vc * vc * m.cda_vertical_m2).epsilon(1e-15));
    CHECK(d.axial_mps == doctest::Approx(vc).epsilon(1e-15));
    const double vh = d.hover_induced_mps;
    CHECK(d.induced_mps == doctest::Approx(-vc / 2 + std::sqrt(vc * vc / 4 + vh * vh)).epsilon(1e-12));
  }
}

TEST_CASE("windmill-brake descent: v_i = -Vn/2 - sqrt((Vn/2)^2 - v_h^2)") {
  // Leishman 2006, ch. 2: momentum theory is valid again for descent faster than 2·v_h.
  const double T = 6.0, vh = hover_induced_velocity(T, kRho, kArea);
  for (double k : {2.0, 2.5, 4.0, 10.0}) {
    CAPTURE(k);
    const double vn = -k * vh;
    const Inflow in = glauert_inflow(T, kRho, kArea, vn, 0.0);
    CHECK(in.flow == RotorFlow::windmill_brake);
    CHECK(in.induced_mps == doctest::Approx(-vn / 2 - std::sqrt(vn * vn / 4 - vh * vh)).epsilon(1e-11));
  }
}

TEST_CASE("download: the rotors carry the weight plus f of their own thrust so T = W/(1 - f)") {
  // An airframe download fraction f (common practice: a few percent) takes f·T_z off the
  // rotors' vertical thrust: T_z·(1 − f) = W in hover, and at speed T = √(T_z² + D²).
  Multirotor m = quad();
  m.download_fraction = 0.05;
  const double W = kMass * kStandardGravity;
  const RotorDemand h = multirotor_hover(m, kMass, kRho, kRotors, kArea);
  CHECK(h.thrust_total_N == doctest::Approx(W / 0.95).epsilon(1e-15));
  CHECK(h.download_N == doctest::Approx(0.05 * h.thrust_total_N).epsilon(1e-14));
  const RotorDemand f = multirotor_forward(m, kMass, kRho, kRotors, kArea, 10.0);
  const double D = 0.5 * kRho * 100.0 * m.cda_m2;
  CHECK(f.thrust_total_N == doctest::Approx(std::hypot(W / 0.95, D)).epsilon(1e-14));
}

TEST_CASE("descent between 0 and 2 v_h is flagged as the vortex-ring state") {
  const Multirotor m = quad();
  const RotorDemand hover = multirotor_hover(m, kMass, kRho, kRotors, kArea);
  const double vh = hover.hover_induced_mps;  // about 4.5 m/s
  const RotorDemand slow = multirotor_descent(m, kMass, kRho, kRotors, kArea, 1.5);
  CHECK(slow.status == FlightStatus::vortex_ring);
  CHECK(slow.flow == RotorFlow::vortex_ring);
  CHECK_FALSE(refused(slow.status));
  CHECK(slow.detail.find("vortex-ring") != std::string::npos);
  CHECK(slow.axial_mps == doctest::Approx(-1.5));
  // Less thrust than hover: vertical drag holds the frame up, T = W − ½ρVd²·CdA_v.
  CHECK(slow.thrust_total_N ==
        doctest::Approx(kMass * kStandardGravity - 0.5 * kRho * 1.5 * 1.5 * m.cda_vertical_m2));
  // The normal-working branch in the band still satisfies Glauert's equation.
  const double T = slow.thrust_per_rotor_N, vi = slow.induced_mps;
  CHECK(vi * std::fabs(slow.axial_mps + vi) == doctest::Approx(T / (2 * kRho * kArea)).epsilon(1e-11));
  // The warning region (Wolkovitch 1972 box, flight/multirotor.hpp): forward speed above v_h
  // takes the rotor out of it at the same descent rate, and so does a descent below 0.28·v_h.
  CHECK(multirotor_steady(m, kMass, kRho, kRotors, kArea, 1.05 * vh, -1.5).status == FlightStatus::ok);
  CHECK(multirotor_steady(m, kMass, kRho, kRotors, kArea, 0.9 * vh, -1.5).status == FlightStatus::vortex_ring);
  CHECK(multirotor_descent(m, kMass, kRho, kRotors, kArea, 0.25 * vh).status == FlightStatus::ok);
  CHECK(in_vortex_ring_region(0.0, -0.28 * vh, vh));
  CHECK(in_vortex_ring_region(0.5 * vh, -1.99 * vh, vh));
  CHECK_FALSE(in_vortex_ring_region(0.0, -2.01 * vh, vh));
  CHECK_FALSE(in_vortex_ring_region(0.0, 0.5 * vh, vh));  // climbing
  // Descending faster than 2·v_h leaves the band.
  const RotorDemand fast = multirotor_descent(m, kMass, kRho, kRotors, kArea, 2.2 * vh);
  CHECK(fast.status == FlightStatus::ok);
  CHECK(fast.flow == RotorFlow::windmill_brake);
  // Faster than the frame falls (terminal speed √(2W/(ρ·CdA_v)) ≈ 20 m/s): refused.
  const double v_term = std::sqrt(2 * kMass * kStandardGravity / (kRho * m.cda_vertical_m2));
  const RotorDemand falling = multirotor_descent(m, kMass, kRho, kRotors, kArea, 1.01 * v_term);
  CHECK(falling.status == FlightStatus::descent_too_fast);
  CHECK(refused(falling.status));
}

TEST_CASE("edgewise flow: v_i has the closed form and tends to T/(2 rho A V)") {
  // With V_n = 0, Glauert's v·√(V² + v²) = v_h² is a quadratic in v²:
  //   v² = (√(V⁴ + 4·v_h⁴) − V²)/2
  // and for V ≫ v_h, v_i → v_h²/V = T/(2ρAV) with relative error 1/(2·(V/v_h)⁴) to leading
  // order (Leishman 2006, ch. 2, high-speed limit of Glauert's hypothesis).
  const double T = 6.0, vh = hover_induced_velocity(T, kRho, kArea);
  double last_err = INFINITY;
  for (double e : {0.5, 1.0, 2.0, 5.0, 10.0, 20.0}) {
    CAPTURE(e);
    const double V = e * vh;
    const Inflow in = glauert_inflow(T, kRho, kArea, 0.0, V);
    const double exact = std::sqrt((std::sqrt(V * V * V * V + 4 * vh * vh * vh * vh) - V * V) / 2);
    CHECK(in.induced_mps == doctest::Approx(exact).epsilon(1e-11));
    const double limit = T / (2 * kRho * kArea * V);
    const double err = std::fabs(in.induced_mps - limit) / limit;
    if (e >= 5.0) CHECK(err == doctest::Approx(1.0 / (2 * std::pow(e, 4))).epsilon(0.05));
    CHECK(err < last_err);
    last_err = err;
  }
  CHECK(last_err < 4e-6);
}

TEST_CASE("level flight: the induced-velocity ratio read from the textbook's figure") {
  // J. G. Leishman, Principles of Helicopter Aerodynamics, 2nd ed., 2006, §2.14 (forward flight):
  // the figure of the exact solution of Glauert's equation, v_i/v_h against V∞/v_h for a disc at
  // zero angle of attack. Values read off that figure, from memory (two figures): 0.79 at
  // V∞/v_h = 1, 0.49 at 2, 0.33 at 3, and the curve meets the v_h/V∞ asymptote within reading
  // accuracy from about 3 on. Checked to reading accuracy, ±0.01.
  const double T = 6.0, vh = hover_induced_velocity(T, kRho, kArea);
  const std::pair<double, double> read[] = {{1.0, 0.79}, {2.0, 0.49}, {3.0, 0.33}};
  for (const auto& [speed_ratio, vi_ratio] : read) {
    CAPTURE(speed_ratio);
    const Inflow in = glauert_inflow(T, kRho, kArea, 0.0, speed_ratio * vh);
    CHECK(std::fabs(in.induced_mps / vh - vi_ratio) <= 0.01);
  }
  const Inflow fast = glauert_inflow(T, kRho, kArea, 0.0, 3.0 * vh);
  CHECK(std::fabs(fast.induced_mps / vh - 1.0 / 3.0) <= 0.01);
}

TEST_CASE("forward flight: T = sqrt(W^2 + D^2) with tilt atan(D/W) and Glauert's equation holding") {
  // docs/physics.md "Flight": the rotors balance weight and drag D = ½ρV²·CdA; Glauert's inflow
  // v_i = T/(2ρA·√((V cos α)² + (V sin α + v_i)²)) (Leishman 2006, ch. 2).
  const Multirotor m = quad();
  const double W = kMass * kStandardGravity;
  for (double V : {2.0, 6.0, 10.0, 15.0, 20.0}) {
    CAPTURE(V);
    const RotorDemand d = multirotor_forward(m, kMass, kRho, kRotors, kArea, V);
    REQUIRE(d.status == FlightStatus::ok);
    const double D = 0.5 * kRho * V * V * m.cda_m2;
    CHECK(d.drag_N == doctest::Approx(D).epsilon(1e-15));
    CHECK(d.thrust_total_N == doctest::Approx(std::sqrt(W * W + D * D)).epsilon(1e-14));
    CHECK(d.tilt_rad == doctest::Approx(std::atan(D / W)).epsilon(1e-14));
    CHECK(d.axial_mps == doctest::Approx(V * std::sin(d.tilt_rad)).epsilon(1e-14));
    CHECK(d.edgewise_mps == doctest::Approx(V * std::cos(d.tilt_rad)).epsilon(1e-14));
    const double T = d.thrust_per_rotor_N, a = d.tilt_rad, vi = d.induced_mps;
    const double rhs = T / (2 * kRho * kArea * std::hypot(V * std::cos(a), V * std::sin(a) + vi));
    CHECK(vi == doctest::Approx(rhs).epsilon(1e-11));
    // Forward speed relieves the induced velocity below hover.
    CHECK(vi < d.hover_induced_mps);
  }
}

TEST_CASE("thrust_need dispatches on the airframe and shares the thrust by rotor") {
  const Airframe a = quad();
  FlightCondition c;
  c.mass_kg = kMass;
  c.density_kg_m3 = kRho;
  c.rotors = kRotors;
  c.disk_area_m2 = kArea;
  c.airspeed_mps = 8.0;
  const ThrustNeed n = thrust_need(a, c);
  const RotorDemand d = multirotor_forward(quad(), kMass, kRho, kRotors, kArea, 8.0);
  CHECK(n.thrust_per_rotor_N == doctest::Approx(d.thrust_per_rotor_N).epsilon(1e-15));
  CHECK(n.axial_mps == doctest::Approx(d.axial_mps).epsilon(1e-15));
  CHECK(std::holds_alternative<RotorDemand>(n.demand));
  CHECK(all_up_mass_kg(a, 0.5) == doctest::Approx(1.6 + 0.3 + 0.5));
}

}  // TEST_SUITE
