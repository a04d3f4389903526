#pragma once
/// Cell and pack models from JSON (docs/formats.md), validated once at load.
#include <filesystem>
#include <string>

#include "battery/pack.hpp"
#include "io/json_reader.hpp"

namespace sortie::io {

battery::Cell read_cell(ObjectReader& r);
/// A pack object; its "cell" is inline or a path relative to the pack's file.
battery::Pack read_pack(ObjectReader& r);

battery::Cell load_cell_file(const std::filesystem::path& path);
battery::Pack load_pack_file(const std::filesystem::path& path);

/// A cell or pack from JSON text (tests, fuzzing): `src.file` names it in messages, `src.dir`
/// (and `src.root`) resolve a pack's cell path.
battery::Cell parse_cell_json(const std::string& text, const Source& src);
battery::Pack parse_pack_json(const std::string& text, const Source& src);

}  // namespace sortie::io
