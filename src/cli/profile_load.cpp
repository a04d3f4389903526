#include "cli/profile_load.hpp"

#include "core/error.hpp"
#include "flight/wind.hpp"
#include "sim/best_speeds.hpp"

namespace sortie::cli {

using flight::Phase;

void check_headway(const io::LoadedProfile& lp) {
  const sim::Mission& m = lp.mission;
  for (std::size_t i = 0; i < m.phases.size(); ++i) {
    const Phase& p = m.phases[i];
    if (p.kind != Phase::Kind::cruise || p.duration_s) continue;
    if (!sim::planned_duration_s(m, i)) {
      const auto leg = flight::solve_leg(m.environment.wind, p.track_deg, sim::phase_airspeed_mps(m, i));
      throw InputError(io::message(lp.source, lp.phase_pointers[i] + "/airspeed_mps", leg.detail,
                                   format_number(p.airspeed_mps) + " m/s", "an airspeed that makes headway in this wind"));
    }
  }
}

io::LoadedProfile load_profile(const std::filesystem::path& path, const std::filesystem::path& pack_override) {
  io::LoadedProfile lp = io::load_profile_file(path, pack_override);
  check_headway(lp);
  return lp;
}

io::LoadedProfile parse_profile(const std::string& text, const io::Source& src,
                                const std::filesystem::path& pack_override) {
  io::LoadedProfile lp = io::parse_profile_json(text, src, pack_override);
  check_headway(lp);
  return lp;
}

void check_profile(const io::LoadedProfile& lp) {
  io::check_profile(lp);
  check_headway(lp);
}

std::string refusal_message(const io::LoadedProfile& p, const sim::MissionResult& r) {
  const std::string ptr = r.end_phase >= 0 && static_cast<std::size_t>(r.end_phase) < p.phase_pointers.size()
                              ? p.phase_pointers[r.end_phase] + "/" + r.refusal_field
                              : "";
  return io::message(p.source, ptr, "this phase cannot be flown: " + r.end_detail);
}

}  // namespace sortie::cli
