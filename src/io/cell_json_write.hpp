#pragma once
/// A cell model as JSON in the shape io::read_cell reads (docs/formats.md "Cell"), keys
/// in the documented order. Numbers are rounded to what a measurement can carry (OCV to 10 µV,
/// resistances to 5 significant digits, time constants to 4 significant digits) and OCV kept strictly rising.
#include <nlohmann/json.hpp>
#include <string>

#include "battery/cell.hpp"

namespace sortie::io {

nlohmann::ordered_json cell_to_json(const battery::Cell& cell, const std::string& note);

}  // namespace sortie::io
