#include "io/profile_json.hpp"

#include "core/error.hpp"
#include "io/airframe_json.hpp"
#include "io/battery_json.hpp"
#include "io/drive_json.hpp"
#include "io/mission_json.hpp"

namespace sortie::io {

using flight::Phase;

void check_profile(const LoadedProfile& p_) {
  const plan::Mission& m = p_.mission;
  // Checks that need the airframe and the phases together.
  const bool fixed_wing = std::holds_alternative<flight::FixedWing>(m.airframe);
  for (std::size_t i = 0; i < m.phases.size(); ++i) {
    const Phase& p = m.phases[i];
    const std::string ptr = p_.phase_pointers[i];
    if (fixed_wing && p.kind == Phase::Kind::hover)
      throw InputError(message(p_.source, ptr + "/kind", "a fixed-wing aircraft cannot hover", "\"hover\"",
                               "loiter with an airspeed_mps"));
    if (!fixed_wing && (p.bank_deg > 0.0 || p.turn_radius_m))
      throw InputError(message(p_.source, ptr + (p.turn_radius_m ? "/turn_radius_m" : "/bank_deg"),
                               "a banked turn is modelled for a fixed wing only (a multirotor turns without banking "
                               "its thrust into the lift)",
                               p.turn_radius_m ? format_number(*p.turn_radius_m) + " m" : format_number(p.bank_deg) + " deg",
                               "no turn on a multirotor phase"));
    if (!fixed_wing && p.drag_device)
      throw InputError(message(p_.source, ptr + "/drag_device", "a drag device is modelled for a fixed wing only",
                               "true", "false or absent"));
    if (fixed_wing && (p.kind == Phase::Kind::climb || p.kind == Phase::Kind::descend) && p.airspeed_mps <= 0.0)
      throw InputError(message(p_.source, ptr + "/airspeed_mps",
                               "a fixed-wing climb or descent needs its airspeed along the path", "none",
                               "airspeed_mps > 0 m/s"));
  }
  if (m.reserve.v_load_cell_min_V && *m.reserve.v_load_cell_min_V >= m.pack.cell.v_max_V)
    throw InputError(message(p_.source, "/reserve/v_load_cell_min_V", "reserve voltage at or above the cell's maximum",
                             format_number(*m.reserve.v_load_cell_min_V) + " V",
                             "below " + format_number(m.pack.cell.v_max_V) + " V"));
  if (m.reserve.v_rest_cell_min_V && *m.reserve.v_rest_cell_min_V >= m.pack.cell.v_max_V)
    throw InputError(message(p_.source, "/reserve/v_rest_cell_min_V", "reserve voltage at or above the cell's maximum",
                             format_number(*m.reserve.v_rest_cell_min_V) + " V",
                             "below " + format_number(m.pack.cell.v_max_V) + " V"));
}

namespace {

/// The profile object at the root of `r`; `default_name` names the mission when "name" is absent.
LoadedProfile read_profile(ObjectReader& r, const std::string& default_name,
                           const std::filesystem::path& pack_override) {
  LoadedProfile out;
  out.source = r.source();
  plan::Mission& m = out.mission;
  m.name = r.string_or("name", default_name);
  {
    ObjectReader a = r.model("airframe");
    m.airframe = read_airframe(a);
  }
  {
    ObjectReader d = r.model("drive");
    m.drive = read_drive(d);
  }
  if (pack_override.empty()) {
    ObjectReader p = r.model("pack");
    m.pack = read_pack(p);
  } else {
    r.has("pack");
    m.pack = load_pack_file(pack_override);
  }
  m.avionics_W = r.number_or("avionics_W", 0.0, between(0.0, 10000.0, "W"));
  if (r.has("environment")) {
    ObjectReader e = r.object("environment");
    m.environment = read_environment(e);
  }
  m.phases = read_phases(r, "phases");
  for (std::size_t i = 0; i < m.phases.size(); ++i) out.phase_pointers.push_back("/phases/" + std::to_string(i));
  if (r.has("reserve")) {
    ObjectReader res = r.object("reserve");
    m.reserve = read_reserve(res);
  }
  r.finish();

  check_profile(out);
  return out;
}

}  // namespace

LoadedProfile load_profile_file(const std::filesystem::path& path,
                                const std::filesystem::path& pack_override) {
  ObjectReader r = open_model_file(path);
  return read_profile(r, path.stem().string(), pack_override);
}

LoadedProfile parse_profile_json(const std::string& text, const Source& src,
                                 const std::filesystem::path& pack_override) {
  ObjectReader r = open_model_text(text, src);
  return read_profile(r, std::filesystem::path(src.file).stem().string(), pack_override);
}

}  // namespace sortie::io
