#include "report/flight_check_report.hpp"

#include <cmath>

#include "report/html_page.hpp"
#include "report/phase_number.hpp"
#include "report/svg_plot.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

namespace {
const char* kCaution =
    "Caution: lithium packs can burn. This check compares a model with one log; it estimates, it "
    "does not certify a pack or an aircraft. Follow local aviation rules and the manufacturer's limits.";
const char* kStationNote =
    "time on station left (log): the plan's end-of-station SoC, reached from the SoC read off the "
    "landing voltage (the replay's landing OCV moved by the mean measured − replayed voltage of the last 20 s) on the capacity "
    "estimated as counted charge / SoC used, at the plan's mean station current";
}  // namespace

std::string flight_check_text(const std::string& log_file, const std::string& profile_file,
                              const sim::FlightCheck& c) {
  std::string out = "Flight check: " + log_file + " against " + profile_file + "\n\n";
  KeyValues kv;
  kv.add("voltage RMSE vs plan", fixed(c.v_rmse_V, 3) + " V (mean measured − planned " + fixed(c.v_bias_V, 3) +
                                     " V, " + std::to_string(c.rows_compared) + " rows" +
                                     (c.rows_after_plan ? ", " + std::to_string(c.rows_after_plan) + " after the plan's landing not compared" : std::string()) + ")");
  kv.add("flight time", fixed(c.flight_time_meas_s, 1) + " s flown, " + fixed(c.flight_time_pred_s, 1) + " s planned");
  kv.add("energy", fixed(c.energy_meas_Wh, 2) + " Wh measured, " + fixed(c.energy_pred_Wh, 2) + " Wh planned");
  kv.add("charge", fixed(c.charge_meas_Ah, 3) + " Ah measured, " + fixed(c.charge_pred_Ah, 3) + " Ah planned");
  kv.add("landing SoC", fixed(100 * c.soc_land_voltage, 1) + " % from the voltage, " +
                            fixed(100 * c.soc_land_counted, 1) + " % counted on the profile pack's capacity, " +
                            fixed(100 * c.soc_land_pred, 1) + " % planned");
  kv.add("capacity (estimate)", fixed(c.capacity_est_Ah, 3) + " Ah");
  kv.add("time on station left", fixed(c.reserve_meas_s, 0) + " s from the log, " + fixed(c.reserve_pred_s, 0) +
                                     " s planned (" + (c.reserve_end.empty() ? std::string("end not computed") : "ends at " + c.reserve_end) +
                                     "; station current " + fixed(c.station_current_A, 2) + " A, " + c.station_phase + ")");
  kv.add("replay on logged current", "RMSE " + fixed(c.replay_rmse_V, 3) + " V, largest " + fixed(c.replay_max_V, 3) +
                                         " V at " + fixed(c.replay_max_t_s, 1) + " s (line " + std::to_string(c.replay_max_line) + ")");
  out += kv.render();
  out += "\nPer phase (the plan's timeline)\n";
  TextTable t({"phase", "start s", "end s", "energy Wh plan", "energy Wh log", "charge Ah plan", "charge Ah log", "in log"});
  for (const auto& p : c.phases)
    t.add_row({p.label, fixed(p.start_s, 1), fixed(p.end_s, 1), fixed(p.energy_pred_Wh, 2), fixed(p.energy_meas_Wh, 2),
               fixed(p.charge_pred_Ah, 3), fixed(p.charge_meas_Ah, 3), p.covered ? "whole" : "part"});
  out += t.render();
  out += "\nNote: " + std::string(kStationNote) + ".\n" + kCaution + "\n";
  return out;
}

nlohmann::json flight_check_json(const std::string& log_file, const std::string& profile_file,
                                 const sim::FlightCheck& c) {
  nlohmann::json j;
  j["log"] = log_file;
  j["profile"] = profile_file;
  j["rows_compared"] = c.rows_compared;
  j["rows_after_plan"] = c.rows_after_plan;
  j["v_rmse_V"] = c.v_rmse_V;
  j["v_bias_V"] = c.v_bias_V;
  j["flight_time_s"] = {{"measured", c.flight_time_meas_s}, {"planned", c.flight_time_pred_s}};
  j["energy_Wh"] = {{"measured", c.energy_meas_Wh}, {"planned", c.energy_pred_Wh}};
  j["charge_Ah"] = {{"measured", c.charge_meas_Ah}, {"planned", c.charge_pred_Ah}};
  j["landing_soc"] = {{"from_voltage", c.soc_land_voltage}, {"counted", c.soc_land_counted}, {"planned", c.soc_land_pred}};
  j["capacity_estimate_Ah"] = c.capacity_est_Ah;
  j["time_on_station_left"] = {{"from_log_s", c.reserve_meas_s}, {"planned_s", c.reserve_pred_s},
                                 {"planned_end", c.reserve_end}, {"station_current_A", c.station_current_A},
                                 {"station_phase", c.station_phase}, {"method", kStationNote}};
  j["replay"] = {{"v_rmse_V", c.replay_rmse_V}, {"v_max_error_V", c.replay_max_V},
                 {"v_max_error_t_s", c.replay_max_t_s}, {"v_max_error_line", c.replay_max_line}};
  nlohmann::json ph = nlohmann::json::array();
  for (const auto& p : c.phases)
    ph.push_back({{"label", p.label}, {"start_s", p.start_s}, {"end_s", p.end_s},
                  {"energy_Wh", {{"planned", p.energy_pred_Wh}, {"measured", p.energy_meas_Wh}}},
                  {"charge_Ah", {{"planned", p.charge_pred_Ah}, {"measured", p.charge_meas_Ah}}},
                  {"whole_phase_in_log", p.covered}});
  j["phases"] = ph;
  j["caution"] = kCaution;
  return j;
}

std::string flight_check_html(const std::string& log_file, const std::string& profile_file,
                              const sim::MeasuredFlight& log, const sim::FlightCheck& c) {
  using namespace html;
  Page page("Flight check", "sortie check " + log_file + " --profile " + profile_file);
  page.add(cards({
      {"voltage RMSE vs plan", keyed("v_rmse_V", fixed(c.v_rmse_V, 3)) + " V",
       "mean measured − planned " + fixed(c.v_bias_V, 3) + " V", false},
      {"replay RMSE", keyed("replay.v_rmse_V", fixed(c.replay_rmse_V, 3)) + " V",
       "largest " + fixed(c.replay_max_V, 3) + " V at " + fixed(c.replay_max_t_s, 1) + " s", false},
      {"landing SoC", keyed("landing_soc.from_voltage", fixed(100 * c.soc_land_voltage, 1), "%") + " %",
       "planned " + fixed(100 * c.soc_land_pred, 1) + " %", c.soc_land_voltage < c.soc_land_pred - 0.05},
      {"time on station left", keyed("time_on_station_left.from_log_s", fixed(c.reserve_meas_s, 0)) + " s",
       "planned " + fixed(c.reserve_pred_s, 0) + " s", c.reserve_meas_s < 0.9 * c.reserve_pred_s},
  }));
  std::vector<svg::Band> bands;
  for (const auto& p : c.phases) bands.push_back({p.start_s, p.end_s, p.label});
  auto plot = [&](const std::string& id, const std::string& title, const std::string& q, const std::string& unit,
                  std::vector<svg::Line> lines) {
    svg::LinePlot lp;
    lp.id = id;
    lp.title = title;
    lp.x = {"time from take-off", "s", {}, {}, true};
    lp.y = {q, unit, {}, {}, false};
    lp.lines = std::move(lines);
    lp.bands = bands;
    lp.right_margin = true;
    return svg::render(lp);
  };
  auto scaled = [](const std::vector<double>& v, double k) {
    std::vector<double> o(v);
    for (double& x : o) x *= k;
    return o;
  };
  page.add(figure("Pack voltage: log, plan and the model replayed on the logged current",
                  plot("voltage", "pack voltage", "pack voltage", "V",
                       {{"log", log.time_s, log.voltage_V, "#333333", svg::Side::left, svg::Stroke::solid, 1.4, false},
                        {"plan", log.time_s, c.pred_V, "#0b6e8a", svg::Side::left, svg::Stroke::dashed, 2.2, false},
                        {"replay", log.time_s, c.replay_V, "#c77d0a", svg::Side::left, svg::Stroke::dotted, 2.2, false}})));
  page.add(figure("Pack current: log and plan",
                  plot("current", "pack current", "pack current", "A",
                       {{"log", log.time_s, log.current_A, "#333333", svg::Side::left, svg::Stroke::solid, 1.4, false},
                        {"plan", log.time_s, c.pred_I, "#0b6e8a", svg::Side::left, svg::Stroke::dashed, 2.2, false}})));
  page.add(figure("State of charge: counted from the log on the profile pack's capacity, plan, replay",
                  plot("soc", "state of charge", "state of charge", "%",
                       {{"log (counted)", log.time_s, scaled(c.meas_soc, 100), "#333333", svg::Side::left, svg::Stroke::solid, 1.4, false},
                        {"plan", log.time_s, scaled(c.pred_soc, 100), "#0b6e8a", svg::Side::left, svg::Stroke::dashed, 2.2, false},
                        {"replay", log.time_s, scaled(c.replay_soc, 100), "#c77d0a", svg::Side::left, svg::Stroke::dotted, 2.2, false}})));
  Table t({"phase", "start s", "end s", "energy Wh plan", "energy Wh log", "charge Ah plan", "charge Ah log", "in log"},
          {false, true, true, true, true, true, true, false});
  for (std::size_t i = 0; i < c.phases.size(); ++i) {
    const auto& p = c.phases[i];
    const std::string k = "phases." + std::to_string(i) + ".";
    t.add_row({text_cell(p.label), number_cell(fixed(p.start_s, 1), k + "start_s"), number_cell(fixed(p.end_s, 1), k + "end_s"),
               number_cell(fixed(p.energy_pred_Wh, 2), k + "energy_Wh.planned"),
               number_cell(fixed(p.energy_meas_Wh, 2), k + "energy_Wh.measured"),
               number_cell(fixed(p.charge_pred_Ah, 3), k + "charge_Ah.planned"),
               number_cell(fixed(p.charge_meas_Ah, 3), k + "charge_Ah.measured"), text_cell(p.covered ? "whole" : "part")});
  }
  page.section("Per phase (the plan's timeline)", t.render());
  page.section("How the time on station left is read", "<p>" + esc(std::string(kStationNote)) + ".</p>");
  return page.render();
}

std::string flight_check_trace_csv(const sim::MeasuredFlight& log, const sim::FlightCheck& c) {
  std::string out = "time_s,v_log_V,v_plan_V,v_replay_V,current_log_A,current_plan_A,soc_counted,soc_plan,soc_replay,phase\n";
  auto num = [](double v, int d) { return std::isnan(v) ? std::string() : fixed(v, d); };
  std::size_t ph = 0;
  for (std::size_t k = 0; k < log.time_s.size(); ++k) {
    const double t = log.time_s[k];
    while (ph + 1 < c.phases.size() && t >= c.phases[ph].end_s) ++ph;
    const bool in_plan = !c.phases.empty() && t <= c.phases.back().end_s + 1e-3;
    out += fixed(t, 3) + "," + num(log.voltage_V[k], 4) + "," + num(c.pred_V[k], 4) + "," + num(c.replay_V[k], 4) + "," +
           num(log.current_A[k], 4) + "," + num(c.pred_I[k], 4) + "," + num(c.meas_soc[k], 5) + "," +
           num(c.pred_soc[k], 5) + "," + num(c.replay_soc[k], 5) + "," + (in_plan ? std::to_string(phase_number(ph)) : std::string()) + "\n";
  }
  return out;
}

}  // namespace sortie::report
