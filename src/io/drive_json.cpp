#include "io/drive_json.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "core/error.hpp"

namespace sortie::io {

namespace {

// Every J where either coefficient table has a point (0 for two constants).
std::vector<double> table_points(const Table& a, const Table& b) {
  std::vector<double> j;
  if (!a.is_constant()) j.insert(j.end(), a.x().begin(), a.x().end());
  if (!b.is_constant()) j.insert(j.end(), b.x().begin(), b.x().end());
  if (j.empty()) j.push_back(0.0);
  std::sort(j.begin(), j.end());
  j.erase(std::unique(j.begin(), j.end()), j.end());
  return j;
}

}  // namespace

propulsion::Prop read_prop(ObjectReader& r) {
  propulsion::Prop p;
  // From 1 cm: the smallest props flown are about 3 cm, and a diameter like 1e-300 m made the
  // disc area underflow to 0 (the momentum-theory inflow divides by it).
  p.diameter_m = r.number("diameter_m", between(0.01, 10.0, "m"));
  const Range rj = between(0.0, 10.0, "");
  p.ct = r.number_or_table("ct", "J", "value", rj, between(-1.0, 1.0, ""));
  p.cp = r.number_or_table("cp", "J", "value", rj, between(-1.0, 1.0, ""));
  p.mass_kg = r.number_or("mass_kg", 0.0, between(0.0, 100.0, "kg"));
  if (!(p.ct(0.0) > 0.0))
    r.fail("ct", "static thrust coefficient not positive", "CT(0) = " + format_number(p.ct(0.0)),
           "CT > 0 at J = 0");
  if (!(p.cp(0.0) > 0.0))
    r.fail("cp", "static power coefficient not positive", "CP(0) = " + format_number(p.cp(0.0)),
           "CP > 0 at J = 0");
  // Momentum theory (Leishman 2006, ch. 2): an actuator disc in axial flow needs at least
  // P = T·(V/2 + √((V/2)² + T/(2ρA))); in coefficients, with A = π·D²/4,
  //   CP ≥ CT·(J/2 + √(J²/4 + 2·CT/π))   wherever CT > 0.
  // Coefficients below this bound describe a prop better than ideal: a typing error.
  for (double J : table_points(p.ct, p.cp)) {
    const double ct = p.ct(J), cp = p.cp(J);
    if (!(ct > 0.0)) continue;
    const double cp_min = ct * (0.5 * J + std::sqrt(0.25 * J * J + 2.0 * ct / std::numbers::pi));
    if (cp < cp_min)
      r.fail("cp", "power coefficient below the momentum-theory minimum at J = " + format_number(J),
             "CP = " + format_number(cp) + " with CT = " + format_number(ct),
             "CP >= " + format_number(cp_min));
  }
  r.finish();
  return p;
}

propulsion::Motor read_motor(ObjectReader& r) {
  propulsion::Motor m;
  m.kv_rpm_per_V = r.number("kv_rpm_per_V", above_to(0.0, 1e5, "rpm/V"));
  m.rm_ohm = r.number("rm_ohm", above_to(0.0, 100.0, "ohm"));
  m.i0_A = r.number("i0_A", between(0.0, 1000.0, "A"));
  m.i0_ref_V = r.number("i0_ref_V", above_to(0.0, 1000.0, "V"));
  m.i_max_A = r.number("i_max_A", above_to(0.0, 1e4, "A"));
  m.mass_kg = r.number_or("mass_kg", 0.0, between(0.0, 100.0, "kg"));
  m.i0_speed_exponent = r.number_or("i0_speed_exponent", 0.0, between(0.0, 2.0, ""));
  if (m.i0_A >= m.i_max_A)
    r.fail("i0_A", "no-load current at or above the current limit", format_number(m.i0_A) + " A",
           "below i_max_A = " + format_number(m.i_max_A) + " A");
  if (m.i0_A * m.rm_ohm >= m.i0_ref_V)
    r.fail("i0_ref_V", "reference voltage does not turn the motor at the no-load current",
           format_number(m.i0_ref_V) + " V",
           "above i0_A·rm_ohm = " + format_number(m.i0_A * m.rm_ohm) + " V");
  r.finish();
  return m;
}

propulsion::Esc read_esc(ObjectReader& r) {
  propulsion::Esc e;
  e.r_on_ohm = r.number("r_on_ohm", between(0.0, 10.0, "ohm"));
  e.k_switch = r.number("k_switch", between(0.0, 0.5, ""));
  e.p_idle_W = r.number("p_idle_W", between(0.0, 1000.0, "W"));
  e.duty_max = r.number("duty_max", above_to(0.0, 1.0, ""));
  e.i_max_A = r.number("i_max_A", above_to(0.0, 1e4, "A"));
  e.mass_kg = r.number_or("mass_kg", 0.0, between(0.0, 100.0, "kg"));
  r.finish();
  return e;
}

propulsion::Drive read_drive(ObjectReader& r) {
  propulsion::Drive d;
  d.name = r.string_or("name", "");
  d.rotors = r.integer("rotors", 1, 64);
  {
    ObjectReader p = r.model("prop");
    d.prop = read_prop(p);
  }
  {
    ObjectReader m = r.model("motor");
    d.motor = read_motor(m);
  }
  {
    ObjectReader e = r.model("esc");
    d.esc = read_esc(e);
  }
  r.finish();
  return d;
}

propulsion::Drive load_drive_file(const std::filesystem::path& path) {
  ObjectReader r = open_model_file(path);
  return read_drive(r);
}

propulsion::Drive parse_drive_json(const std::string& text, const Source& src) {
  ObjectReader r = open_model_text(text, src);
  return read_drive(r);
}

}  // namespace sortie::io
