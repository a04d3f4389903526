#pragma once
/// Drive models from JSON (docs/formats.md "Drive"), validated once at load.
/// `prop`, `motor` and `esc` may each be inline or a path relative to the drive's file.
#include <filesystem>
#include <string>

#include "io/json_reader.hpp"
#include "propulsion/drive.hpp"

namespace sortie::io {

/// A drive object (a profile's inline "drive", or a drive file's root).
propulsion::Drive read_drive(ObjectReader& r);
propulsion::Prop read_prop(ObjectReader& r);
propulsion::Motor read_motor(ObjectReader& r);
propulsion::Esc read_esc(ObjectReader& r);

propulsion::Drive load_drive_file(const std::filesystem::path& path);
/// A drive from JSON text (tests, fuzzing): `src.file` names it in messages, `src.dir` (and
/// `src.root`) resolve its prop, motor and esc paths.
propulsion::Drive parse_drive_json(const std::string& text, const Source& src);

}  // namespace sortie::io
