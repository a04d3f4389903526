#pragma once
/// What-if changes to a loaded mission: one named number (payload, air and pack temperature,
/// wind, field elevation, initial charge, state of health) set in place of the profile's value,
/// each with the same range as the JSON field it replaces. `fly` and `compare` set them from
/// options, `fly --sweep` steps them over a grid, and `fly --samples` draws them.
#include <string>
#include <vector>

#include "core/range.hpp"
#include "sim/mission.hpp"

namespace sortie::sim {

/// One number a what-if can set.
struct WhatIfParameter {
  std::string name;         ///< "payload-kg": the option without its dashes, and the sweep name
  std::string json_field;   ///< the profile field it replaces ("airframe/payload_kg")
  Range range;              ///< the loader's range for that field
  std::string description;  ///< for --help
};

/// Every number a what-if can set, in a fixed order (options, sweep names, reports).
const std::vector<WhatIfParameter>& what_if_parameters();

/// The parameter named `name`, or nullptr.
const WhatIfParameter* find_what_if(const std::string& name);

/// Set `name` to `value` in `m` (value already checked against the parameter's range).
/// field-elevation-m holds the field's air temperature (the ISA offset is recomputed), as
/// editing field_elevation_m of a profile that gives temperature_C does.
void set_what_if(Mission& m, const std::string& name, double value);

/// The mission's current value of `name` (the profile's, or the one last set).
double get_what_if(const Mission& m, const std::string& name);

/// One override in effect, for the reports.
struct Override {
  std::string name;   ///< the option without its dashes ("payload-kg", "drive", "pack-layout")
  std::string value;  ///< as applied ("0.8", "4S2P", a file name)
  std::string json_field;  ///< what it replaces
  std::string note;   ///< a rule applied with it (held temperature, a re-celled pack), or empty
};

}  // namespace sortie::sim
