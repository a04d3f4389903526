#include "io/profile_write.hpp"

#include <cmath>

namespace sortie::io {

namespace {

using nlohmann::json;
namespace fs = std::filesystem;

/// Rounded to a millimetre, a millisecond or a thousandth of a degree: the file is for reading
/// and editing; the rounding moves a 10 km route by under 1 mm per leg.
double r3(double v) { return std::round(v * 1000.0) / 1000.0; }

std::string moved(const std::string& ref, const fs::path& base_dir, const fs::path& out_dir) {
  const fs::path p(ref);
  if (p.is_absolute()) return ref;
  const fs::path target = fs::absolute(base_dir / p).lexically_normal();
  const fs::path rel = target.lexically_relative(fs::absolute(out_dir).lexically_normal());
  return rel.empty() ? target.string() : rel.generic_string();
}

}  // namespace

json phase_json(const flight::Phase& p) {
  using K = flight::Phase::Kind;
  json j;
  j["kind"] = flight::to_string(p.kind);
  if (!p.label.empty()) j["label"] = p.label;
  switch (p.kind) {
    case K::climb:
    case K::descend:
      j["to_height_m"] = r3(p.to_height_m);
      j["rate_mps"] = r3(p.rate_mps);
      if (p.airspeed_mps > 0.0) j["airspeed_mps"] = r3(p.airspeed_mps);
      j["track_deg"] = r3(p.track_deg) >= 360.0 ? 0.0 : r3(p.track_deg);
      break;
    case K::cruise:
      if (p.distance_m) j["distance_m"] = r3(*p.distance_m);
      if (p.duration_s) j["duration_s"] = r3(*p.duration_s);
      j["airspeed_mps"] = r3(p.airspeed_mps);
      j["track_deg"] = r3(p.track_deg) >= 360.0 ? 0.0 : r3(p.track_deg);
      if (p.bank_deg > 0.0) j["bank_deg"] = r3(p.bank_deg);
      break;
    case K::hover:
      j["duration_s"] = r3(*p.duration_s);
      break;
    case K::loiter:
      j["duration_s"] = r3(*p.duration_s);
      j["airspeed_mps"] = r3(p.airspeed_mps);
      if (p.turn_radius_m) j["turn_radius_m"] = r3(*p.turn_radius_m);
      if (p.bank_deg > 0.0) j["bank_deg"] = r3(p.bank_deg);
      break;
  }
  if (p.spare) j["spare"] = true;
  return j;
}

json generated_profile(const json& base, const fs::path& base_dir, const fs::path& out_dir, const std::string& name,
                       const std::string& note, const std::vector<flight::Phase>& phases) {
  json out = json::object();
  out["name"] = name;
  out["note"] = note;
  for (const char* key : {"airframe", "drive", "pack"}) {
    if (!base.contains(key)) continue;
    json v = base[key];
    if (v.is_string()) {
      v = moved(v.get<std::string>(), base_dir, out_dir);
    } else if (std::string(key) == "pack" && v.is_object() && v.contains("cell") && v["cell"].is_string()) {
      v["cell"] = moved(v["cell"].get<std::string>(), base_dir, out_dir);
    }
    out[key] = v;
  }
  for (const char* key : {"avionics_W", "environment"})
    if (base.contains(key)) out[key] = base[key];
  json ph = json::array();
  for (const auto& p : phases) ph.push_back(phase_json(p));
  out["phases"] = ph;
  if (base.contains("reserve")) out["reserve"] = base["reserve"];
  return out;
}

}  // namespace sortie::io
