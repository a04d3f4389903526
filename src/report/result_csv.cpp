#include "report/result_csv.hpp"

#include <cmath>
#include <cstdio>

#include "report/compare_report.hpp"
#include "report/mission_report.hpp"

namespace sortie::report {

namespace {

// Rows of a JSON array of objects as CSV with the given columns: the CSV carries exactly the
// JSON result's keys and values, so the two cannot drift apart.
std::string rows_csv(const nlohmann::json& rows, const std::vector<std::string>& columns, const std::string& first = {},
                     bool index = false) {
  std::string out;
  if (index) out += csv_field(first) + ",";
  for (std::size_t c = 0; c < columns.size(); ++c) out += (c ? "," : "") + csv_field(columns[c]);
  out += "\n";
  std::size_t i = 0;
  for (const auto& row : rows) {
    if (index) out += std::to_string(++i) + ",";
    for (std::size_t c = 0; c < columns.size(); ++c) {
      if (c) out += ",";
      if (!row.contains(columns[c])) continue;
      const auto& v = row[columns[c]];
      if (v.is_number()) out += csv_number(v.get<double>());
      else if (v.is_boolean()) out += v.get<bool>() ? "true" : "false";
      else if (v.is_string()) out += csv_field(v.get<std::string>());
    }
    out += "\n";
  }
  return out;
}

}  // namespace

std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\r\n") == std::string::npos) return s;
  std::string q = "\"";
  for (char c : s) {
    if (c == '"') q += "\"\"";
    else q += c;
  }
  return q + "\"";
}

std::string csv_number(double v) {
  if (!std::isfinite(v)) return "";
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.10g", v);
  return buf;
}

std::string fly_phases_csv(const sim::Mission& m, const sim::MissionResult& r) {
  const auto j = fly_json(m, r, sim::SpareResult{});
  return rows_csv(j["phases"],
                  {"kind", "label", "start_s", "duration_s", "planned_s", "flown", "distance_m", "ground_speed_mps",
                   "density_kg_m3", "thrust_per_rotor_N", "energy_Wh", "charge_Ah", "v_min_cell_V", "i_max_A",
                   "c_rate_max", "duty_mean", "duty_max", "eta_mean"},
                  "phase", true);
}

std::string compare_csv(const std::vector<sim::CompareRow>& rows) {
  const auto j = compare_json(sim::Mission{}, rows);
  return rows_csv(j["rows"], {"rank", "pack", "layout", "series", "parallel", "capacity_Ah", "verdict", "refused",
                              "spare_s", "binding_rule", "flight_time_s", "landing_soc", "pack_mass_kg",
                              "all_up_mass_kg", "c_rate_max", "duty_mean", "eta_esc_mean", "limit", "meets_requirement",
                              "short_of", "pareto_front", "spare_per_kg_s_per_kg"});
}

std::string drive_csv(const DriveResult& r) {
  const auto j = drive_json(r);
  if (!r.drive && j.contains("bench"))
    return rows_csv(j["bench"]["rows"],
                    {"throttle_pct", "bus_V", "bus_A", "bus_W", "rpm", "thrust_N", "thrust_g", "torque_Nm", "shaft_W"});
  return rows_csv(j["points"],
                  {"cells", "cell_V", "bus_V", "throttle_pct", "duty", "thrust_N", "thrust_g", "rpm", "advance_ratio",
                   "beyond_prop_table", "torque_Nm", "shaft_W", "i_motor_A", "v_motor_V", "motor_loss_W", "esc_loss_W",
                   "bus_A", "bus_W", "eta_motor", "eta_esc", "eta_system", "g_per_W", "drive_thrust_N", "drive_bus_W",
                   "drive_bus_A", "status", "motor_over_current", "esc_over_current", "thrust_available_N",
                   "thrust_at_current_limit_N"});
}

}  // namespace sortie::report
