#include "io/drive_json_write.hpp"

#include <cmath>

namespace sortie::io {

namespace {

double significant(double v, int digits) {
  if (v == 0.0 || !std::isfinite(v)) return v;
  const int d = digits - 1 - static_cast<int>(std::floor(std::log10(std::fabs(v))));
  const double p = std::pow(10.0, d);
  return std::round(v * p) / p;
}

nlohmann::ordered_json coefficient(const Table& t) {
  if (t.is_constant()) return significant(t.y().front(), 5);
  nlohmann::ordered_json j, x = nlohmann::ordered_json::array(), y = nlohmann::ordered_json::array();
  for (double v : t.x()) x.push_back(significant(v, 5));
  for (double v : t.y()) y.push_back(significant(v, 5));
  j["J"] = x;
  j["value"] = y;
  return j;
}

}  // namespace

nlohmann::ordered_json drive_to_json(const propulsion::Drive& d, const std::string& note) {
  nlohmann::ordered_json j;
  j["name"] = d.name;
  if (!note.empty()) j["note"] = note;
  j["rotors"] = d.rotors;
  nlohmann::ordered_json prop;
  prop["diameter_m"] = significant(d.prop.diameter_m, 5);
  prop["ct"] = coefficient(d.prop.ct);
  prop["cp"] = coefficient(d.prop.cp);
  if (d.prop.mass_kg > 0) prop["mass_kg"] = significant(d.prop.mass_kg, 4);
  j["prop"] = prop;
  nlohmann::ordered_json motor;
  motor["kv_rpm_per_V"] = significant(d.motor.kv_rpm_per_V, 5);
  motor["rm_ohm"] = significant(d.motor.rm_ohm, 5);
  motor["i0_A"] = significant(d.motor.i0_A, 5);
  motor["i0_ref_V"] = significant(d.motor.i0_ref_V, 5);
  motor["i_max_A"] = significant(d.motor.i_max_A, 5);
  if (d.motor.mass_kg > 0) motor["mass_kg"] = significant(d.motor.mass_kg, 4);
  if (d.motor.i0_speed_exponent > 0) motor["i0_speed_exponent"] = significant(d.motor.i0_speed_exponent, 4);
  j["motor"] = motor;
  nlohmann::ordered_json esc;
  esc["r_on_ohm"] = significant(d.esc.r_on_ohm, 5);
  esc["k_switch"] = significant(d.esc.k_switch, 5);
  esc["p_idle_W"] = significant(d.esc.p_idle_W, 5);
  esc["duty_max"] = significant(d.esc.duty_max, 4);
  esc["i_max_A"] = significant(d.esc.i_max_A, 5);
  if (d.esc.mass_kg > 0) esc["mass_kg"] = significant(d.esc.mass_kg, 4);
  j["esc"] = esc;
  return j;
}

}  // namespace sortie::io
