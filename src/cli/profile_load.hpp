#pragma once
/// A profile loaded for a command: io's reading and cross-checks, then the checks that need the
/// simulation's power model (the airspeed a best-speed keyword stands for).
#include <filesystem>
#include <string>

#include "io/profile_json.hpp"
#include "sim/mission.hpp"

namespace sortie::cli {

/// io::load_profile_file, then check_headway.
io::LoadedProfile load_profile(const std::filesystem::path& path, const std::filesystem::path& pack_override = {});

/// io::parse_profile_json, then check_headway.
io::LoadedProfile parse_profile(const std::string& text, const io::Source& src,
                                const std::filesystem::path& pack_override = {});

/// Every cruise leg given by distance makes headway in the wind at its airspeed (a best-speed
/// keyword resolved by the power model, sim::phase_airspeed_mps): an InputError naming the
/// phase's airspeed_mps otherwise.
void check_headway(const io::LoadedProfile& p);

/// io::check_profile and check_headway: the loader's cross-checks again on a changed mission.
void check_profile(const io::LoadedProfile& p);

/// The one-line error for a phase the airframe or drive cannot fly (a simulation refusal).
std::string refusal_message(const io::LoadedProfile& p, const sim::MissionResult& r);

}  // namespace sortie::cli
