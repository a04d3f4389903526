#pragma once
/// A drive model as JSON in the shape io::read_drive reads (docs/formats.md "Drive"),
/// keys in the documented order, numbers to 5 significant digits.
#include <nlohmann/json.hpp>
#include <string>

#include "propulsion/drive.hpp"

namespace sortie::io {

nlohmann::ordered_json drive_to_json(const propulsion::Drive& drive, const std::string& note);

}  // namespace sortie::io
