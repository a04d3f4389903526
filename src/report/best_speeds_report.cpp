#include "report/best_speeds_report.hpp"

#include "core/text.hpp"

namespace sortie::report {

namespace {

std::string f(double v, int d) { return format_fixed(v, d); }

std::string bound_note(const sim::BestSpeeds& b, bool on_bound) {
  if (!on_bound) return "";
  return b.endurance_mps <= b.search_lo_mps + 1e-9 || b.range_mps <= b.search_lo_mps + 1e-9
             ? ", at the lowest speed allowed (" + b.lower_bound + ")"
             : ", at the top of the search (" + b.upper_bound + ")";
}

}  // namespace

std::string best_speeds_line(const sim::BestSpeeds& calm, const std::optional<sim::BestSpeeds>& headwind) {
  if (!calm.found) return "none: " + calm.note;
  std::string s = "endurance " + f(calm.endurance_mps, 1) + " m/s (" + f(calm.endurance_W, 0) + " W" +
                  bound_note(calm, calm.endurance_on_bound) + "), range " + f(calm.range_mps, 1) + " m/s (" +
                  f(calm.range_W, 0) + " W, " + f(calm.range_m_per_Wh, 0) + " m/Wh" +
                  bound_note(calm, calm.range_on_bound) + ")";
  if (headwind) {
    if (headwind->found && headwind->range_W > 0.0)
      s += "; into a " + f(headwind->head_mps, 1) + " m/s headwind range " + f(headwind->range_mps, 1) + " m/s (" +
           f(headwind->range_W, 0) + " W, " + f(headwind->range_m_per_Wh, 0) + " m/Wh)";
    else
      s += "; into a " + f(headwind->head_mps, 1) + " m/s headwind: " + headwind->note;
  }
  s += "; level at the field, bus at " + f(calm.v_bus_V, 1) + " V";
  return s;
}

nlohmann::json best_speeds_json(const sim::BestSpeeds& b) {
  nlohmann::json j;
  j["found"] = b.found;
  j["note"] = b.note;
  j["mass_kg"] = b.mass_kg;
  j["density_kg_m3"] = b.density_kg_m3;
  j["v_bus_V"] = b.v_bus_V;
  j["search_lo_mps"] = b.search_lo_mps;
  j["search_hi_mps"] = b.search_hi_mps;
  j["lower_bound"] = b.lower_bound;
  j["upper_bound"] = b.upper_bound;
  j["head_mps"] = b.head_mps;
  j["cross_mps"] = b.cross_mps;
  j["endurance_mps"] = b.endurance_mps;
  j["endurance_W"] = b.endurance_W;
  j["endurance_on_bound"] = b.endurance_on_bound;
  j["range_mps"] = b.range_mps;
  j["range_W"] = b.range_W;
  j["range_ground_mps"] = b.range_ground_mps;
  j["range_m_per_Wh"] = b.range_m_per_Wh;
  j["range_on_bound"] = b.range_on_bound;
  return j;
}

}  // namespace sortie::report
