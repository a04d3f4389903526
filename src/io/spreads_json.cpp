#include "io/spreads_json.hpp"

namespace sortie::io {

plan::Spreads read_spreads(ObjectReader& r) {
  plan::Spreads s;
  // Bounds: a spread past these is a unit slip (a percentage for a fraction, a speed in km/h).
  s.cell_capacity_sd = r.number_or("cell_capacity_sd", s.cell_capacity_sd, between(0.0, 0.5, ""));
  s.cell_resistance_sd = r.number_or("cell_resistance_sd", s.cell_resistance_sd, between(0.0, 1.0, ""));
  s.soh_capacity_sd = r.number_or("soh_capacity_sd", s.soh_capacity_sd, between(0.0, 0.5, ""));
  s.soh_resistance_sd = r.number_or("soh_resistance_sd", s.soh_resistance_sd, between(0.0, 5.0, ""));
  s.wind_speed_sd_mps = r.number_or("wind_speed_sd_mps", s.wind_speed_sd_mps, between(0.0, 30.0, "m/s"));
  s.wind_from_sd_deg = r.number_or("wind_from_sd_deg", s.wind_from_sd_deg, between(0.0, 180.0, "deg"));
  s.gust_max_mps = r.number_or("gust_max_mps", s.gust_max_mps, between(0.0, 30.0, "m/s"));
  s.gust_power_W_per_mps2 = r.number_or("gust_power_W_per_mps2", s.gust_power_W_per_mps2, between(0.0, 1000.0, "W/(m/s)2"));
  s.temperature_sd_C = r.number_or("temperature_sd_C", s.temperature_sd_C, between(0.0, 30.0, "C"));
  s.payload_sd_kg = r.number_or("payload_sd_kg", s.payload_sd_kg, between(0.0, 100.0, "kg"));
  r.finish();
  return s;
}

plan::Spreads load_spreads_file(const std::filesystem::path& path) {
  ObjectReader r = open_model_file(path);
  return read_spreads(r);
}

plan::Spreads parse_spreads_json(const std::string& text, const Source& src) {
  ObjectReader r = open_model_text(text, src);
  return read_spreads(r);
}

}  // namespace sortie::io
