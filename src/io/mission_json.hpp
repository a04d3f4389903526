#pragma once
/// Mission phases and reserve rules from a profile (docs/formats.md "Profile").
#include "flight/mission.hpp"
#include "io/json_reader.hpp"

namespace sortie::io {

flight::Phase read_phase(ObjectReader& r);
flight::Reserve read_reserve(ObjectReader& r);
/// The phase list: at least one phase, at most one marked spare, heights consistent
/// (a climb goes up, a descent goes down, the mission starts at 0 m above the field).
std::vector<flight::Phase> read_phases(ObjectReader& profile, const std::string& key);

}  // namespace sortie::io
