#include "io/mission_json.hpp"

#include "core/error.hpp"

namespace sortie::io {

using flight::Phase;

namespace {

/// airspeed_mps as a number, or one of the best-speed keywords (sim/best_speeds.hpp).
void read_airspeed(ObjectReader& r, Phase& p, const Range& speed) {
  if (r.has("airspeed_mps") && r.json()["airspeed_mps"].is_string()) {
    const std::string k = r.choice("airspeed_mps", {"best_endurance", "best_range"}, "");
    p.airspeed_choice = k == "best_endurance" ? Phase::Speed::best_endurance : Phase::Speed::best_range;
    return;
  }
  p.airspeed_mps = r.number("airspeed_mps", speed);
}

/// A coordinated turn: bank_deg or turn_radius_m, not both.
void read_turn(ObjectReader& r, Phase& p) {
  p.bank_deg = r.number_or("bank_deg", 0.0, between(0.0, 75.0, "deg"));
  p.turn_radius_m = r.optional_number("turn_radius_m", above_to(0.0, 1e5, "m"));
  if (p.turn_radius_m && p.bank_deg > 0.0)
    r.fail("turn_radius_m", "a turn is given by bank_deg or turn_radius_m, one of them");
}

}  // namespace

flight::Phase read_phase(ObjectReader& r) {
  Phase p;
  const std::string kind = r.choice("kind", {"climb", "cruise", "hover", "loiter", "descend"}, "");
  p.label = r.string_or("label", "");
  p.spare = r.boolean_or("spare", false);
  const Range height = between(0.0, 11000.0, "m");
  const Range speed = above_to(0.0, 150.0, "m/s");
  if (kind == "climb" || kind == "descend") {
    p.kind = kind == "climb" ? Phase::Kind::climb : Phase::Kind::descend;
    p.to_height_m = r.number("to_height_m", height);
    p.rate_mps = r.number("rate_mps", above_to(0.0, 30.0, "m/s"));
    p.airspeed_mps = r.number_or("airspeed_mps", 0.0, between(0.0, 150.0, "m/s"));
    p.track_deg = r.number_or("track_deg", 0.0, between(0.0, 360.0, "deg"));
    if (kind == "descend") p.drag_device = r.boolean_or("drag_device", false);
  } else if (kind == "cruise") {
    p.kind = Phase::Kind::cruise;
    p.distance_m = r.optional_number("distance_m", above_to(0.0, 1e7, "m"));
    p.duration_s = r.optional_number("duration_s", above_to(0.0, 1e6, "s"));
    if (p.distance_m.has_value() == p.duration_s.has_value())
      r.fail("distance_m", "a cruise needs distance_m or duration_s, one of them");
    read_airspeed(r, p, speed);
    p.track_deg = r.number_or("track_deg", 0.0, between(0.0, 360.0, "deg"));
    read_turn(r, p);
  } else if (kind == "hover") {
    p.kind = Phase::Kind::hover;
    p.duration_s = r.number("duration_s", above_to(0.0, 1e6, "s"));
  } else {
    p.kind = Phase::Kind::loiter;
    p.duration_s = r.number("duration_s", above_to(0.0, 1e6, "s"));
    read_airspeed(r, p, speed);
    read_turn(r, p);
  }
  r.finish();
  return p;
}

flight::Reserve read_reserve(ObjectReader& r) {
  flight::Reserve res;
  res.soc_min = r.optional_number("soc_min", between(0.0, 1.0, ""));
  res.hover_s = r.optional_number("hover_s", between(0.0, 1e5, "s"));
  res.v_rest_cell_min_V = r.optional_number("v_rest_cell_min_V", above_to(0.0, 10.0, "V"));
  res.v_load_cell_min_V = r.optional_number("v_load_cell_min_V", above_to(0.0, 10.0, "V"));
  res.thrust_to_weight_min = r.optional_number("thrust_to_weight_min", between(1.0, 20.0, ""));
  res.hover_duty_max = r.optional_number("hover_duty_max", above_to(0.0, 1.0, ""));
  r.finish();
  return res;
}

std::vector<flight::Phase> read_phases(ObjectReader& profile, const std::string& key) {
  auto items = profile.objects(key, 1);
  std::vector<Phase> phases;
  double h = 0.0;
  int spares = 0;
  for (std::size_t i = 0; i < items.size(); ++i) {
    Phase p = read_phase(items[i]);
    if (p.kind == Phase::Kind::climb && !(p.to_height_m > h))
      items[i].fail("to_height_m", "a climb must end higher than it starts",
                    format_number(p.to_height_m) + " m", "above " + format_number(h) + " m");
    if (p.kind == Phase::Kind::descend && !(p.to_height_m < h))
      items[i].fail("to_height_m", "a descent must end lower than it starts",
                    format_number(p.to_height_m) + " m", "below " + format_number(h) + " m");
    if ((p.kind == Phase::Kind::cruise || p.kind == Phase::Kind::hover ||
         p.kind == Phase::Kind::loiter) && h <= 0.0)
      items[i].fail("kind", "the aircraft is still on the ground here; climb first",
                    "\"" + std::string(flight::to_string(p.kind)) + "\" at 0 m", "a climb before it");
    if (p.kind == Phase::Kind::climb || p.kind == Phase::Kind::descend) h = p.to_height_m;
    if (p.spare && ++spares > 1)
      items[i].fail("spare", "more than one phase marked spare", "true", "at most one");
    if (p.spare && p.kind != Phase::Kind::cruise && p.kind != Phase::Kind::hover &&
        p.kind != Phase::Kind::loiter)
      items[i].fail("spare", "only a cruise, hover or loiter can be lengthened",
                    "\"" + std::string(flight::to_string(p.kind)) + "\"", "cruise, hover or loiter");
    phases.push_back(p);
  }
  if (h > 0.0)
    profile.fail(key, "the mission must end on the ground (the reserve rules apply at landing)",
                 "last height " + format_number(h) + " m", "a final descend to 0 m");
  return phases;
}

}  // namespace sortie::io
