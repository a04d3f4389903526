#pragma once
/// The spreads of a sampled run (`fly --samples N --spreads FILE`), read with the ranges below.
#include <filesystem>
#include <string>

#include "io/json_reader.hpp"
#include "plan/spreads.hpp"

namespace sortie::io {

/// Every key optional (its default is plan::Spreads's); unknown keys refused.
plan::Spreads read_spreads(ObjectReader& r);
plan::Spreads load_spreads_file(const std::filesystem::path& path);
plan::Spreads parse_spreads_json(const std::string& text, const Source& src);

}  // namespace sortie::io
