#include "sim/what_if.hpp"

#include <cassert>
#include <variant>

#include "flight/atmosphere.hpp"

namespace sortie::sim {

const std::vector<WhatIfParameter>& what_if_parameters() {
  // Each range is the loader's for the same field: io/airframe_json.cpp (payload_kg,
  // environment) and io/battery_json.cpp (pack). tests/sim/what_if_test.cpp holds them equal.
  static const std::vector<WhatIfParameter> params = {
      {"payload-kg", "airframe/payload_kg", between(0.0, 500.0, "kg"), "payload, kg"},
      {"air-C", "environment/temperature_C", between(-60.0, 60.0, "C"), "air temperature at the field, °C"},
      {"pack-C", "pack/temperature_C", between(-60.0, 100.0, "C"), "pack temperature at take-off, °C"},
      {"wind-mps", "environment/wind/speed_mps", between(0.0, 60.0, "m/s"), "wind speed, m/s"},
      {"wind-from-deg", "environment/wind/from_deg", between(0.0, 360.0, "deg"),
       "direction the wind blows from, degrees true"},
      {"field-elevation-m", "environment/field_elevation_m", between(-500.0, flight::kTropopauseHeight, "m"),
       "field elevation, m (the field's air temperature is held)"},
      {"soc0", "pack/soc0", between(0.0, 1.0, ""), "state of charge at take-off, 0..1"},
      {"soh-capacity", "pack/soh/capacity", above_to(0.0, 1.5, ""), "state of health: fraction of rated capacity left"},
      {"soh-resistance", "pack/soh/resistance", above_to(0.0, 20.0, ""), "state of health: multiplier on R0"},
  };
  return params;
}

const WhatIfParameter* find_what_if(const std::string& name) {
  for (const auto& p : what_if_parameters())
    if (p.name == name) return &p;
  return nullptr;
}

void set_what_if(Mission& m, const std::string& name, double value) {
  auto& atm = m.environment.atmosphere;
  if (name == "payload-kg") {
    std::visit([&](auto& a) { a.payload_kg = value; }, m.airframe);
  } else if (name == "air-C") {
    atm = flight::Atmosphere::from_field_temperature(atm.field_elevation_m, value + flight::kCelsiusZero);
  } else if (name == "pack-C") {
    m.pack.temperature_C = value;
  } else if (name == "wind-mps") {
    m.environment.wind.speed_mps = value;
  } else if (name == "wind-from-deg") {
    m.environment.wind.from_deg = value;
  } else if (name == "field-elevation-m") {
    atm = flight::Atmosphere::from_field_temperature(value, atm.field_temperature_K());
  } else if (name == "soc0") {
    m.pack.soc0 = value;
  } else if (name == "soh-capacity") {
    m.pack.soh_capacity = value;
  } else if (name == "soh-resistance") {
    m.pack.soh_resistance = value;
  } else {
    assert(false && "unknown what-if name");
  }
}

double get_what_if(const Mission& m, const std::string& name) {
  const auto& atm = m.environment.atmosphere;
  if (name == "payload-kg") return std::visit([](const auto& a) { return a.payload_kg; }, m.airframe);
  if (name == "air-C") return atm.field_temperature_K() - flight::kCelsiusZero;
  if (name == "pack-C") return m.pack.temperature_C;
  if (name == "wind-mps") return m.environment.wind.speed_mps;
  if (name == "wind-from-deg") return m.environment.wind.from_deg;
  if (name == "field-elevation-m") return atm.field_elevation_m;
  if (name == "soc0") return m.pack.soc0;
  if (name == "soh-capacity") return m.pack.soh_capacity;
  if (name == "soh-resistance") return m.pack.soh_resistance;
  assert(false && "unknown what-if name");
  return 0.0;
}

}  // namespace sortie::sim
