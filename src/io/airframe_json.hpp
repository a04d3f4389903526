#pragma once
/// Airframe models and a profile's environment from JSON (docs/formats.md), validated
/// once at load.
#include <filesystem>
#include <string>

#include "flight/airframe.hpp"
#include "flight/environment.hpp"
#include "io/json_reader.hpp"

namespace sortie::io {

/// An airframe object: "kind" is "multirotor" or "fixed_wing"; each kind's keys (and "name",
/// "note"). A key of the other kind is refused naming the kind it belongs to.
flight::Airframe read_airframe(ObjectReader& r);
flight::Airframe load_airframe_file(const std::filesystem::path& path);
/// An airframe from JSON text (tests, fuzzing); `src.file` names it in messages.
flight::Airframe parse_airframe_json(const std::string& text, const Source& src);

/// A profile's "environment" object: field_elevation_m (required), temperature_C (outside air
/// at the field) or isa_offset_C (not both; neither: standard day), wind {speed_mps, from_deg}
/// (calm when absent). The OAT becomes the offset ΔT = OAT − T_ISA(field).
flight::Environment read_environment(ObjectReader& r);

}  // namespace sortie::io
