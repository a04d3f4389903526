// Airframe and environment loading: the demo files, and bad input as one-line messages naming
// the file and the JSON pointer.
#include "io/airframe_json.hpp"

#include <doctest/doctest.h>

#include <string>

#include "core/error.hpp"
#include "support/cli.hpp"

using namespace sortie;

namespace {

/// The InputError message loading `content` as an airframe file gives ("" when it loads).
std::string airframe_error(const std::string& file, const std::string& content) {
  const std::string path = test::write_work_file(file, content);
  try {
    io::load_airframe_file(path);
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

/// The environment object `content`, read as a profile's /environment.
flight::Environment environment(const std::string& content) {
  const nlohmann::json j = nlohmann::json::parse(content);
  io::ObjectReader r(j, io::Source{"profile.json", {}}, "/environment");
  return io::read_environment(r);
}

std::string environment_error(const std::string& content) {
  try {
    environment(content);
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

bool one_line(const std::string& s) { return !s.empty() && s.find('\n') == std::string::npos; }

}  // namespace

TEST_SUITE("flight") {

TEST_CASE("the demo airframes load") {
  const auto quad = io::load_airframe_file(test::source_path("models/airframes/demo-quad-15in-inspection.json"));
  REQUIRE(std::holds_alternative<flight::Multirotor>(quad));
  const auto& q = std::get<flight::Multirotor>(quad);
  CHECK(q.mass_empty_kg == 1.6);
  CHECK(q.payload_kg == 0.3);
  CHECK(q.cda_vertical_m2 == q.cda_m2);  // defaults to the horizontal drag area
  CHECK(flight::name(quad).find("(invented)") != std::string::npos);

  const auto hexa = io::load_airframe_file(test::source_path("models/airframes/demo-hexa-10in-lifter.json"));
  REQUIRE(std::holds_alternative<flight::Multirotor>(hexa));
  CHECK(std::get<flight::Multirotor>(hexa).cda_vertical_m2 == 0.12);
  CHECK(flight::all_up_mass_kg(hexa, 0.6) == doctest::Approx(1.9 + 0.8 + 0.6));

  const auto wing = io::load_airframe_file(test::source_path("models/airframes/demo-fixed-wing-mapper.json"));
  REQUIRE(std::holds_alternative<flight::FixedWing>(wing));
  const auto& w = std::get<flight::FixedWing>(wing);
  CHECK(w.wing_area_m2 == 0.55);
  CHECK(w.cd0 == 0.028);
  CHECK(w.aspect_ratio == 9.0);
  CHECK(w.oswald_e == 0.8);
  CHECK(w.cl_max == 1.2);
  CHECK(std::string(flight::kind_name(wing)) == "fixed_wing");
}

TEST_CASE("bad airframe files give one line with the file and the JSON pointer") {
  struct Case {
    std::string content, expected;
  };
  const Case cases[] = {
      {R"({"kind": "multirotor", "payload_kg": 0.3, "cda_m2": 0.05})",
       "/mass_empty_kg: missing field 'mass_empty_kg'"},
      {R"({"kind": "multirotor", "mass_empty_kg": 1.6, "payload_kgs": 0.3, "cda_m2": 0.05})",
       "/payload_kgs: unknown field 'payload_kgs'; did you mean 'payload_kg'?"},
      {R"({"kind": "multirotor", "mass_empty_kg": -1.6, "cda_m2": 0.05})",
       "/mass_empty_kg: out of range (got -1.6, expected a number above 0, up to 500 kg)"},
      {R"({"kind": "multirotor", "mass_empty_kg": 1600, "cda_m2": 0.05})",
       "/mass_empty_kg: out of range (got 1600, expected a number above 0, up to 500 kg)"},
      {R"({"kind": "multirotor", "mass_empty_kg": 1.6, "cda_m2": "small"})",
       "/cda_m2: not a number (got \"small\""},
      {R"({"kind": "multirotr", "mass_empty_kg": 1.6, "cda_m2": 0.05})",
       "/kind: unknown value; did you mean 'multirotor'?"},
      {R"({"mass_empty_kg": 1.6, "cda_m2": 0.05})", "/kind: missing field 'kind'"},
      {R"({"kind": "multirotor", "mass_empty_kg": 1.6, "cda_m2": 0.05, "cd0": 0.03})",
       "/cd0: 'cd0' is a fixed_wing field; this airframe is a multirotor"},
      {R"({"kind": "fixed_wing", "mass_empty_kg": 2.1, "wing_area_m2": 0.55, "cd0": 0.028,
           "aspect_ratio": 9, "oswald_e": 1.2, "cl_max": 1.2})",
       "/oswald_e: out of range (got 1.2, expected a number above 0, up to 1)"},
      {R"({"kind": "fixed_wing", "mass_empty_kg": 2.1, "wing_area_m2": 0.55, "cd0": 0,
           "aspect_ratio": 9, "oswald_e": 0.8, "cl_max": 1.2})",
       "/cd0: out of range (got 0, expected a number above 0, up to 0.5)"},
      {R"({"kind": "fixed_wing", "mass_empty_kg": 2.1, "wing_area_m2": 0.55, "cd0": 0.028,
           "aspect_ratio": 9, "oswald_e": 0.8})",
       "/cl_max: missing field 'cl_max'"},
      {R"({"kind": "fixed_wing", "mass_empty_kg": 2.1, "wing_area_m2": 0.55, "cd0": 0.028,
           "aspect_ratio": 9, "oswald_e": 0.8, "cl_max": 1.2, "cda_m2": 0.05})",
       "/cda_m2: 'cda_m2' is a multirotor field; this airframe is a fixed_wing"},
      {R"({"kind": "fixed_wing", "mass_empty_kg": 2.1, "wing_area_m2": 0.55, "cd0": 0.028,
           "aspect_ratio": 9, "oswald_e": 0.8, "cl_max": 1.2, "span_m": 2.2})",
       "/span_m: unknown field 'span_m'"},
      {R"([1, 2])", ": not an object"},
  };
  int i = 0;
  for (const auto& c : cases) {
    const std::string file = "bad-airframe-" + std::to_string(++i) + ".json";
    const std::string err = airframe_error(file, c.content);
    CAPTURE(c.content);
    CAPTURE(err);
    CHECK(one_line(err));
    CHECK(err.find(file + ":") != std::string::npos);
    CHECK(err.find(c.expected) != std::string::npos);
  }
  // A "note" and a "name" are allowed in every airframe.
  const std::string ok = R"js({"kind": "multirotor", "name": "x (invented)", "note": "invented",
                               "mass_empty_kg": 1.6, "cda_m2": 0.05})js";
  CHECK(airframe_error("ok-airframe.json", ok) == "");
}

TEST_CASE("the environment: an OAT becomes an ISA offset and wind and calm are read") {
  // Field 400 m, OAT 12 °C: ΔT = 285.15 − (288.15 − 0.0065·400) = −0.40 K.
  const auto env = environment(R"({"field_elevation_m": 400, "temperature_C": 12,
                                   "wind": {"speed_mps": 4, "from_deg": 250}})");
  CHECK(env.atmosphere.field_elevation_m == 400.0);
  CHECK(env.atmosphere.isa_offset_K == doctest::Approx(-0.40).epsilon(1e-12));
  CHECK(env.wind.speed_mps == 4.0);
  CHECK(env.wind.from_deg == 250.0);
  const auto hot = environment(R"({"field_elevation_m": 1200, "isa_offset_C": 15})");
  CHECK(hot.atmosphere.isa_offset_K == 15.0);
  CHECK(hot.wind.speed_mps == 0.0);
  const auto standard = environment(R"({"field_elevation_m": 0})");
  CHECK(standard.atmosphere.isa_offset_K == 0.0);
}

TEST_CASE("bad environments give one line with the JSON pointer") {
  struct Case {
    std::string content, expected;
  };
  const Case cases[] = {
      {R"({"field_elevation_m": 400, "temperature_C": 12, "isa_offset_C": 3})",
       "profile.json: /environment/isa_offset_C: give either temperature_C or isa_offset_C, not both"},
      {R"({"temperature_C": 12})",
       "profile.json: /environment/field_elevation_m: missing field 'field_elevation_m'"},
      {R"({"field_elevation_m": 12000})",
       "/environment/field_elevation_m: out of range (got 12000, expected a number from -500 to 11000 m)"},
      {R"({"field_elevation_m": 0, "temperature_C": 95})",
       "/environment/temperature_C: out of range (got 95, expected a number from -60 to 60 C)"},
      {R"({"field_elevation_m": 0, "wind": {"speed_mps": 4, "from_deg": 400}})",
       "/environment/wind/from_deg: out of range (got 400, expected a number from 0 to 360 deg)"},
      {R"({"field_elevation_m": 0, "wind": {"speed_mps": 4}})",
       "/environment/wind/from_deg: missing field 'from_deg'"},
      {R"({"field_elevation_m": 0, "wind": {"speed_mps": 4, "from_deg": 90, "gust_mps": 8}})",
       "/environment/wind/gust_mps: unknown field 'gust_mps'"},
      {R"({"field_elevation_m": 0, "temperature_c": 12})",
       "/environment/temperature_c: unknown field 'temperature_c'; did you mean 'temperature_C'?"},
  };
  for (const auto& c : cases) {
    const std::string err = environment_error(c.content);
    CAPTURE(c.content);
    CAPTURE(err);
    CHECK(one_line(err));
    CHECK(err.find(c.expected) != std::string::npos);
  }
}

}  // TEST_SUITE
