#pragma once
/// A whole profile (docs/formats.md "Profile"): airframe, drive and pack (inline or relative paths),
/// environment, phases and reserve, checked against each other once at load.
#include <filesystem>
#include <string>
#include <vector>

#include "io/json_reader.hpp"
#include "plan/mission.hpp"

namespace sortie::io {

struct LoadedProfile {
  plan::Mission mission;
  Source source;                             ///< the profile file
  std::vector<std::string> phase_pointers;   ///< "/phases/0", ... for messages
};

/// `pack_override`: a pack file used in place of the profile's "pack".
LoadedProfile load_profile_file(const std::filesystem::path& path,
                                const std::filesystem::path& pack_override = {});

/// A profile from JSON text (tests, fuzzing): `src.file` names it in messages, `src.dir` (and
/// `src.root`) resolve its model paths.
LoadedProfile parse_profile_json(const std::string& text, const Source& src,
                                 const std::filesystem::path& pack_override = {});

/// The checks that need the airframe, the pack and the phases together (a fixed wing does not
/// hover, a multirotor does not bank, reserve voltages below the cell's maximum);
/// load_profile_file runs them, and a caller that changes the mission after loading (what-if
/// options) runs them again. Whether every cruise leg makes headway needs the airspeeds the
/// power model chooses: cli::check_profile adds that check.
void check_profile(const LoadedProfile& p);

}  // namespace sortie::io
