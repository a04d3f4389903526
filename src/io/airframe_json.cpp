#include "io/airframe_json.hpp"

#include <algorithm>
#include <string>
#include <vector>

#include "core/error.hpp"

namespace sortie::io {

namespace {

const std::vector<std::string> kMultirotorKeys = {"mass_empty_kg", "payload_kg", "cda_m2",
                                                  "cda_vertical_m2", "download_fraction",
                                                  "induced_power_factor", "profile_power_k", "mtom_kg"};
const std::vector<std::string> kFixedWingKeys = {"mass_empty_kg", "payload_kg", "wing_area_m2",
                                                 "cd0", "aspect_ratio", "oswald_e", "cl_max",
                                                 "mtom_kg"};

bool contains(const std::vector<std::string>& v, const std::string& s) {
  return std::find(v.begin(), v.end(), s) != v.end();
}

/// A key that belongs to the other kind gets a message saying so, before finish() would call
/// it unknown and suggest something unrelated.
void refuse_other_kind(const ObjectReader& r, const std::string& kind,
                       const std::vector<std::string>& own, const std::vector<std::string>& other,
                       const std::string& other_kind) {
  for (auto it = r.json().begin(); it != r.json().end(); ++it)
    if (contains(other, it.key()) && !contains(own, it.key()))
      r.fail(it.key(), "'" + it.key() + "' is a " + other_kind + " field; this airframe is a " + kind,
             {}, "the " + kind + " fields " + [&] {
               std::string list;
               for (const auto& k : own) list += (list.empty() ? "" : ", ") + k;
               return list;
             }());
}

// Ranges: wide enough for any small electric aircraft, narrow enough to catch a unit slip
// (grams for kilograms, cm² for m²).
const Range kMass = above_to(0.0, 500.0, "kg");
const Range kPayload = between(0.0, 500.0, "kg");
const Range kDragArea = between(0.0, 10.0, "m2");

flight::Multirotor read_multirotor(ObjectReader& r, std::string name) {
  refuse_other_kind(r, "multirotor", kMultirotorKeys, kFixedWingKeys, "fixed_wing");
  flight::Multirotor m;
  m.name = std::move(name);
  m.mass_empty_kg = r.number("mass_empty_kg", kMass);
  m.payload_kg = r.number_or("payload_kg", 0.0, kPayload);
  m.mtom_kg = r.optional_number("mtom_kg", kMass);
  m.cda_m2 = r.number("cda_m2", kDragArea);
  m.cda_vertical_m2 = r.number_or("cda_vertical_m2", m.cda_m2, kDragArea);
  m.download_fraction = r.number_or("download_fraction", m.download_fraction, between(0.0, 0.5, ""));
  m.induced_power_factor = r.number_or("induced_power_factor", m.induced_power_factor, between(1.0, 2.0, ""));
  m.profile_power_k = r.number_or("profile_power_k", m.profile_power_k, between(0.0, 10.0, ""));
  return m;
}

flight::FixedWing read_fixed_wing(ObjectReader& r, std::string name) {
  refuse_other_kind(r, "fixed_wing", kFixedWingKeys, kMultirotorKeys, "multirotor");
  flight::FixedWing w;
  w.name = std::move(name);
  w.mass_empty_kg = r.number("mass_empty_kg", kMass);
  w.payload_kg = r.number_or("payload_kg", 0.0, kPayload);
  w.mtom_kg = r.optional_number("mtom_kg", kMass);
  w.wing_area_m2 = r.number("wing_area_m2", above_to(0.0, 50.0, "m2"));
  w.cd0 = r.number("cd0", above_to(0.0, 0.5, ""));
  w.aspect_ratio = r.number("aspect_ratio", between(1.0, 50.0, ""));
  // Span efficiency: 1 is the elliptic-loading ideal (Anderson 1999, ch. 2); nothing exceeds it.
  w.oswald_e = r.number("oswald_e", above_to(0.0, 1.0, ""));
  w.cl_max = r.number("cl_max", above_to(0.0, 4.0, ""));
  return w;
}

}  // namespace

flight::Airframe read_airframe(ObjectReader& r) {
  std::string name = r.string_or("name", "");
  const std::string kind = r.choice("kind", {"multirotor", "fixed_wing"}, "");
  flight::Airframe a = kind == "multirotor" ? flight::Airframe{read_multirotor(r, std::move(name))}
                                            : flight::Airframe{read_fixed_wing(r, std::move(name))};
  r.finish();
  return a;
}

flight::Airframe load_airframe_file(const std::filesystem::path& path) {
  ObjectReader r = open_model_file(path);
  return read_airframe(r);
}

flight::Airframe parse_airframe_json(const std::string& text, const Source& src) {
  ObjectReader r = open_model_text(text, src);
  return read_airframe(r);
}

flight::Environment read_environment(ObjectReader& r) {
  flight::Environment env;
  // The field may sit below sea level (−430 m is the lowest on land) and the troposphere model
  // ends at 11 km.
  const double field =
      r.number("field_elevation_m", between(-500.0, flight::kTropopauseHeight, "m"));
  const bool has_oat = r.has("temperature_C");
  const bool has_offset = r.has("isa_offset_C");
  if (has_oat && has_offset)
    r.fail("isa_offset_C", "give either temperature_C or isa_offset_C, not both");
  if (has_oat) {
    const double oat_C = r.number("temperature_C", between(-60.0, 60.0, "C"));
    env.atmosphere = flight::Atmosphere::from_field_temperature(field, oat_C + flight::kCelsiusZero);
  } else {
    const double offset_C = r.number_or("isa_offset_C", 0.0, between(-60.0, 60.0, "C"));
    env.atmosphere = flight::Atmosphere{field, offset_C};  // a difference in °C is one in K
  }
  if (r.has("wind")) {
    ObjectReader w = r.object("wind");
    env.wind.speed_mps = w.number("speed_mps", between(0.0, 60.0, "m/s"));
    env.wind.from_deg = w.number("from_deg", between(0.0, 360.0, "deg"));
    w.finish();
  }
  r.finish();
  return env;
}

}  // namespace sortie::io
