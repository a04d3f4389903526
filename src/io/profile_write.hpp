#pragma once
/// A profile written back as the loader reads it (docs/formats.md "Profile"): the base profile's
/// airframe, drive, pack, avionics, environment and reserve with new phases. Model paths are
/// rewritten relative to the folder the new file goes to.
#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "flight/mission.hpp"

namespace sortie::io {

/// One phase in the loader's keys (only the keys its kind reads).
nlohmann::json phase_json(const flight::Phase& p);

/// The new profile: `base` is the base profile's JSON read from `base_dir`; the result is to be
/// written into `out_dir`. Its "name" and "note" are replaced.
nlohmann::json generated_profile(const nlohmann::json& base, const std::filesystem::path& base_dir,
                                 const std::filesystem::path& out_dir, const std::string& name,
                                 const std::string& note, const std::vector<flight::Phase>& phases);

}  // namespace sortie::io
