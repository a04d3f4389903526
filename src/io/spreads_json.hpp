#pragma once
/// The spreads of a sampled run (`fly --samples N --spreads FILE`), read with the ranges below.
#include <filesystem>
#include <string>

#include "io/json_reader.hpp"
#include "sim/uncertainty.hpp"

namespace sortie::io {

/// Every key optional (its default is sim::Spreads's); unknown keys refused.
sim::Spreads read_spreads(ObjectReader& r);
sim::Spreads load_spreads_file(const std::filesystem::path& path);
sim::Spreads parse_spreads_json(const std::string& text, const Source& src);

}  // namespace sortie::io
