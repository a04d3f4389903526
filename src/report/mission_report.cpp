#include "report/mission_report.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/text.hpp"

#include "flight/atmosphere.hpp"
#include "report/best_speeds_report.hpp"
#include "report/discharge_report.hpp"
#include "report/model_range_report.hpp"
#include "report/phase_number.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

using sim::MissionResult;

std::string phase_name(const sim::Mission& m, int i) {
  if (i < 0 || static_cast<std::size_t>(i) >= m.phases.size()) return "after landing";
  const auto& p = m.phases[i];
  std::string s = std::to_string(i + 1) + " " + flight::to_string(p.kind);
  if (!p.label.empty()) s += " (" + p.label + ")";
  return s;
}

std::string rule_words(const std::string& name) {
  if (name == "mission_flown") return "whole mission flown";
  if (name == "soc_min") return "charge at landing";
  if (name == "soc_covered") return "charge at landing within the cell model's data";
  if (name == "hover_s") return "time on station left at landing";
  if (name == "v_rest_cell_min_V") return "resting cell voltage at landing";
  if (name == "v_load_cell_min_V") return "loaded cell voltage in flight";
  if (name == "cell_current_cont_A") return "cell current (continuous limit)";
  if (name == "cell_current_burst_A") return "cell current (burst limit)";
  if (name == "cell_current_cont_s") return "time above the continuous cell current";
  if (name == "motor_current_A") return "motor current";
  if (name == "esc_current_A") return "ESC current";
  if (name == "mtom_kg") return "take-off mass";
  if (name == "thrust_to_weight") return "thrust-to-weight at take-off";
  if (name == "hover_duty_max") return "hover duty";
  if (name == "cutoff_voltage") return "cell cutoff voltage";
  if (name == "saturation") return "full duty (saturation)";
  if (name == "power_collapse") return "power collapse";
  if (name == "soc_floor") return "empty pack";
  return name;
}

std::string rule_value(const sim::RuleCheck& r, double v) {
  if (r.name == "soc_min" || r.name == "soc_covered") return fixed(v * 100.0, 1) + " %";
  if (r.name == "hover_duty_max") return fixed(v * 100.0, 1) + " %";
  if (r.name == "thrust_to_weight") return fixed(v, 2) + ":1";
  if (r.unit == "V") return fixed(v, 3) + " V";
  if (r.unit == "s") return r.name == "cell_current_cont_s" ? fixed(v, 1) + " s" : fixed(v, 0) + " s";
  if (r.unit == "A") return fixed(v, 2) + " A";
  if (r.unit == "kg") return fixed(v, 3) + " kg";
  return fixed(v, 3);
}

namespace {
/// The excursions beyond the model's range, appended to the verdict: a verdict never rests on
/// an extrapolated figure without saying so.
std::string model_range_note(const MissionResult& r) {
  if (r.excursions.empty()) return "";
  std::string s = " [outside the model's data: ";
  for (std::size_t k = 0; k < r.excursions.size(); ++k) s += (k ? "; " : "") + sim::brief(r.excursions[k]);
  return s + "]";
}

std::string where_words(const sim::Mission& m, const sim::RuleCheck& r) {
  if (r.phase < 0) return "at landing";
  return "in phase " + phase_name(m, r.phase) + " at " + fixed(r.t_s, 0) + " s";
}

}  // namespace

std::string failure_reasons(const sim::Mission& m, const sim::MissionResult& r) {
  std::string why;
  if (!r.completed)
    why = "the flight ends early in phase " + phase_name(m, r.end_phase) + " at " + fixed(r.flight_time_s, 0) +
          " s: " + r.end_detail;
  for (const auto& rule : r.rules) {
    if (rule.pass || !rule.reached || rule.name == "mission_flown") continue;
    if (!why.empty()) why += "; ";
    why += rule_words(rule.name) + " " + rule_value(rule, rule.actual) + (rule.is_max ? ", limit " : ", needs ") +
           rule_value(rule, rule.required);
    if (rule.is_max || rule.name == "thrust_to_weight") why += " " + where_words(m, rule);
    if (!rule.note.empty() && rule.name == "hover_s") why += " (" + rule.note + ")";
  }
  return why;
}

std::string spare_words(const sim::Mission& m, const sim::SpareResult& s) {
  if (!s.phase) return s.note;
  const std::string ph = "phase " + phase_name(m, static_cast<int>(*s.phase));
  if (s.capped) return "more than " + fixed(s.spare_s, 0) + " s on " + ph + " (" + s.note + ")";
  if (!s.bounded) return s.note.empty() ? "no length of " + ph + " meets the rules" : s.note;
  return (s.spare_s >= 0 ? "+" : "") + fixed(s.spare_s, 0) + " s on " + ph +
         (s.binding_rule.empty() ? "" : ", limited by " + rule_words(s.binding_rule));
}

std::string verdict_line(const sim::Mission& m, const MissionResult& r, const sim::SpareResult& s) {
  if (r.go) {
    std::string line = "GO: the whole mission is flown and every reserve rule and limit holds";
    if (s.phase && s.capped) {
      line += "; " + spare_words(m, s);
    } else if (s.phase) {
      line += "; " + duration_hms(s.spare_s) + " to spare on phase " + phase_name(m, static_cast<int>(*s.phase));
      if (!s.binding_rule.empty()) line += " (then " + rule_words(s.binding_rule) + " binds)";
    }
    return line + model_range_note(r);
  }
  std::string line = "NO-GO: " + failure_reasons(m, r);
  if (!s.fixed_failures.empty()) {
    line += "; no change of the mission's length mends ";
    for (std::size_t k = 0; k < s.fixed_failures.size(); ++k)
      line += (k ? ", " : "") + rule_words(s.fixed_failures[k]);
  } else if (s.phase && !s.bounded) {
    line += "; " + s.note;
  } else if (s.phase && s.spare_s < 0) {
    line += "; shorten phase " + phase_name(m, static_cast<int>(*s.phase)) + " by " + duration_hms(-s.spare_s);
  }
  return line + model_range_note(r);
}

std::string fly_text(const sim::Mission& m, const MissionResult& r, const sim::SpareResult& s, const sim::TurnHome* home) {
  std::string out = "sortie fly: " + printable(m.name) + "\n\n";
  KeyValues head;
  const std::string af_name = flight::name(m.airframe);
  head.add("aircraft", std::string(flight::kind_name(m.airframe)) + (af_name.empty() ? "" : " \"" + af_name + "\"") +
                           ", all-up " + fixed(r.all_up_mass_kg, 3) + " kg (pack " + fixed(r.pack_mass_kg, 3) + " kg)");
  head.add("drive", (m.drive.name.empty() ? std::string("drive") : m.drive.name) + ", " +
                        std::to_string(m.drive.rotors) + " rotor" + (m.drive.rotors > 1 ? "s" : ""));
  head.add("pack", (m.pack.name.empty() ? m.pack.cell.name : m.pack.name) + ", " + m.pack.layout() + " " +
                       fixed(m.pack.capacity_Ah(), 2) + " Ah at " + fixed(m.pack.temperature_C, 0) +
                       " °C, starting at " + fixed(m.pack.soc0 * 100, 0) + " % charge");
  const auto& atm = m.environment.atmosphere;
  head.add("air", "field " + fixed(atm.field_elevation_m, 0) + " m, " +
                      fixed(atm.field_temperature_K() - flight::kCelsiusZero, 1) + " °C (ISA " +
                      (atm.isa_offset_K >= 0 ? "+" : "") + fixed(atm.isa_offset_K, 1) + " °C), wind " +
                      fixed(m.environment.wind.speed_mps, 1) + " m/s from " + fixed(m.environment.wind.from_deg, 0) + "°");
  if (m.avionics_W > 0) head.add("avionics", fixed(m.avionics_W, 1) + " W");
  if (const auto& w = r.wing_speeds)
    head.add("wing", "stall " + fixed(w->stall_mps, 1) + " m/s, minimum power " + fixed(w->min_power_mps, 1) +
                         " m/s, best L/D " + fixed(w->min_drag_mps, 1) + " m/s (L/D " + fixed(w->ld_max, 1) +
                         "), in level flight at the field" +
                         (w->min_power_below_stall ? "; minimum power is below stall: loiter faster" : ""));
  if (r.best_speeds) head.add("best speeds", best_speeds_line(*r.best_speeds, r.best_speeds_headwind));
  out += head.render() + "\n";
  out += (r.go ? "  >> " : "  !! ") + verdict_line(m, r, s) + "\n\n";

  out += "phases\n";
  TextTable pt({"phase", "start s", "time s", "dist m", "thrust/rotor N", "energy Wh", "charge Ah",
                "min cell V", "max A", "max C", "duty mean %", "duty max %", "η drive %"});
  for (std::size_t i = 0; i < r.phases.size(); ++i) {
    const auto& p = r.phases[i];
    const bool flown_any = p.duration_s > 0 || p.flown;
    std::string time = fixed(p.duration_s, 0);
    if (!p.flown) time += "/" + fixed(p.planned_s, 0);
    pt.add_row({phase_name(m, static_cast<int>(i)), fixed(p.start_s, 0), time, fixed(p.distance_m, 0),
                flown_any ? fixed(p.thrust_per_rotor_N, 2) : "-", fixed(p.energy_Wh, 2), fixed(p.charge_Ah, 3),
                flown_any ? fixed(p.v_min_cell_V, 3) : "-", flown_any ? fixed(p.i_max_A, 1) : "-",
                flown_any ? fixed(p.c_rate_max, 2) : "-", flown_any ? fixed(p.duty_mean * 100, 1) : "-",
                flown_any ? fixed(p.duty_max * 100, 1) : "-", flown_any ? fixed(p.eta_mean * 100, 1) : "-"});
  }
  out += pt.render();
  out += "  (time s: flown/planned where the flight ended early; η drive = shaft energy / drive energy, motor × ESC)\n\n";

  KeyValues land;
  land.add("flight time", fixed(r.flight_time_s, 0) + " s (" + duration_hms(r.flight_time_s) + ")" +
                              (r.completed ? "" : ", ended early"));
  land.add("energy used", fixed(r.energy_Wh, 2) + " Wh, " + fixed(r.charge_Ah, 3) + " Ah");
  land.add("state of charge at landing", fixed(r.landing.soc * 100, 1) + " %");
  land.add("energy left at landing", fixed(r.landing.energy_Wh, 2) + " Wh (open-circuit)");
  land.add("resting cell voltage at landing", fixed(r.landing.v_rest_cell_V, 3) + " V");
  land.add("lowest loaded cell voltage", fixed(r.v_min_cell_V, 3) + " V");
  land.add("highest current", fixed(r.i_max_A, 1) + " A (" + fixed(r.c_rate_max, 2) + " C)");
  if (r.thermal)
    land.add("cell temperature", fixed(r.temperature_start_C, 1) + " °C at take-off, " + fixed(r.landing.temperature_C, 1) +
                                     " °C at landing, highest " + fixed(r.temperature_max_C, 1) + " °C (air " +
                                     fixed(r.air_C, 1) + " °C)");
  land.add("mean duty, mean ESC efficiency", fixed(r.duty_mean * 100, 1) + " %, " + fixed(r.eta_esc_mean * 100, 1) + " %");
  if (m.reserve.hover_s && r.completed) {
    // Counted down to the covered SoC floor while the rule soc_covered holds the verdict to it.
    const bool to_floor = std::any_of(r.rules.begin(), r.rules.end(), [](const sim::RuleCheck& c) { return c.name == "soc_covered"; });
    land.add("time on station left at landing",
             fixed(r.reserve_time_s, 0) + " s" +
                 (!r.reserve_time_end ? "" : ", until " + (*r.reserve_time_end == sim::EndKind::refused
                                                                    ? sim::end_text(r.reserve_time_end, r.reserve_time_refusal)
                                                                    : rule_words(sim::to_string(*r.reserve_time_end)))) +
                 (to_floor ? " (down to " + fixed(r.soc_floor_covered * 100, 1) + " % charge, the lowest the cell model has data for)" : ""));
  }
  if (s.phase) land.add("spare time", spare_words(m, s));
  out += "landing\n" + land.render() + "\n";

  out += "reserve rules and limits (reserves at landing, limits in flight)\n";
  TextTable rt({"rule", "limit", "reached", "margin", "where", "result"});
  std::string notes;
  for (const auto& rule : r.rules) {
    std::string margin = rule.name == "soc_min" || rule.name == "soc_covered" || rule.name == "hover_duty_max"
                             ? fixed(rule.margin * 100, 1) + " %"
                             : rule_value(rule, rule.margin);
    if (rule.margin > 0 && margin[0] != '-') margin = "+" + margin;
    const std::string limit = (rule.is_max ? "max " : "min ") + rule_value(rule, rule.required);
    const std::string where = rule.name == "mission_flown" ? "-" : rule.phase < 0 ? "landing" : phase_name(m, rule.phase) + ", " + fixed(rule.t_s, 0) + " s";
    rt.add_row({rule_words(rule.name), limit, rule.reached ? rule_value(rule, rule.actual) : "not reached",
                rule.reached ? margin : "-", rule.reached ? where : "-", rule.pass ? "pass" : "FAIL"});
    if (!rule.note.empty()) notes += "  " + rule_words(rule.name) + ": " + rule.note + "\n";
  }
  out += rt.render();
  if (!r.completed) out += "  (not reached: the flight ended before landing; the verdict says why)\n";
  out += notes + "\n";

  if (home) {
    out += "turn home (straight back to the start at " + fixed(home->home_airspeed_mps, 1) +
           " m/s airspeed, then down at " + fixed(home->home_descent_mps, 1) + " m/s)\n";
    if (home->point)
      out += "  turn home by " + fixed(home->point->t_s, 0) + " s from take-off (" + duration_hms(home->point->t_s) +
             ", phase " + phase_name(m, static_cast<int>(*home->point_phase)) + "): charge " +
             fixed(home->point->soc * 100, 1) + " %, loaded cell " + fixed(home->point->v_load_cell_V, 3) +
             " V, resting cell " + fixed(home->point->v_rest_cell_V, 3) + " V" +
             (home->binding_rule.empty() ? "" : "; then " + rule_words(home->binding_rule) + " fails") + "\n";
    else
      out += "  turning home holds at every moment of the plan\n";
    TextTable ht({"phase", "latest turn s", "into phase s", "charge %", "loaded cell V", "resting cell V", "then fails"});
    for (const auto& tp : home->phases) {
      const int pi = static_cast<int>(tp.phase);
      if (!tp.latest_in_phase_s) {
        ht.add_row({phase_name(m, pi), "none", "-", "-", "-", "-", rule_words(tp.binding_rule)});
        continue;
      }
      std::string into = fixed(*tp.latest_in_phase_s, 0);
      if (tp.capped) into = "more than " + into;
      else if (tp.beyond_plan) into += " (past the plan)";
      else if (tp.whole_phase) into += " (all)";
      ht.add_row({phase_name(m, pi), fixed(tp.at->t_s, 0), into, fixed(tp.at->soc * 100, 1),
                  fixed(tp.at->v_load_cell_V, 3), fixed(tp.at->v_rest_cell_V, 3),
                  tp.binding_rule.empty() ? "-" : rule_words(tp.binding_rule)});
    }
    out += ht.render() + "\n";
  }

  if (!r.excursions.empty()) out += excursions_text(r.excursions) + "\n";
  if (!r.events.empty()) {
    out += "events\n";
    TextTable et({"t s", "phase", "event", "detail"});
    et.wrap_last(72);
    for (const auto& e : r.events) et.add_row({fixed(e.t_s, 1), phase_name(m, e.phase), e.kind, e.detail});
    out += et.render() + "\n";
  }
  out += "An estimate from models, not a clearance to fly: follow local aviation rules and the\n"
         "makers' limits, and keep your own reserve.\n";
  return out;
}

nlohmann::json fly_json(const sim::Mission& m, const MissionResult& r, const sim::SpareResult& s, const sim::TurnHome* home) {
  using nlohmann::json;
  json j;
  j["schema"] = kFlySchema;
  j["name"] = m.name;
  j["verdict"] = r.go ? "go" : "no-go";
  j["verdict_text"] = verdict_line(m, r, s);
  j["completed"] = r.completed;
  if (!r.completed) j["end"] = {{"kind", sim::end_text(r.end_kind)}, {"phase", phase_number_or_null(r.end_phase)}, {"detail", r.end_detail}};
  j["flight_time_s"] = r.flight_time_s;
  // spare_s only when it is a solved figure: null when nothing is lengthened, when the search
  // stopped at its cap (spare.at_least_s) or when no length of the phase meets the rules.
  j["spare_s"] = s.phase && s.bounded && !s.capped ? json(s.spare_s) : json();
  j["spare"] = {{"phase", phase_number_or_null(s.phase)}, {"binding_rule", s.binding_rule},
                {"bounded", s.bounded}, {"capped", s.capped}, {"at_least_s", s.capped ? json(s.spare_s) : json()},
                {"cut_phase_s", s.phase && !s.bounded ? json(-s.spare_s) : json()},
                {"cut_leg", s.cut_leg ? json(*s.cut_leg) : json()}, {"cut_leg_m", s.cut_leg_m ? json(*s.cut_leg_m) : json()},
                {"fixed_failures", s.fixed_failures}, {"note", s.note}, {"simulations", s.simulations}};
  j["mass"] = {{"all_up_kg", r.all_up_mass_kg}, {"pack_kg", r.pack_mass_kg}};
  if (const auto& w = r.wing_speeds)
    j["wing_speeds"] = {{"stall_mps", w->stall_mps}, {"min_power_mps", w->min_power_mps},
                        {"max_ld_mps", w->min_drag_mps}, {"ld_max", w->ld_max}};
  if (r.best_speeds) {
    j["best_speeds"] = best_speeds_json(*r.best_speeds);
    if (r.best_speeds_headwind) j["best_speeds"]["into_headwind"] = best_speeds_json(*r.best_speeds_headwind);
  }
  j["pack"] = {{"name", m.pack.name}, {"layout", m.pack.layout()}, {"series", m.pack.series},
               {"parallel", m.pack.parallel}, {"capacity_Ah", m.pack.capacity_Ah()}};
  j["energy_Wh"] = r.energy_Wh;
  j["charge_Ah"] = r.charge_Ah;
  j["v_min_cell_V"] = r.v_min_cell_V;
  j["i_max_A"] = r.i_max_A;
  j["c_rate_max"] = r.c_rate_max;
  j["duty_mean"] = r.duty_mean;
  j["eta_esc_mean"] = r.eta_esc_mean;
  j["eta_mean"] = r.eta_mean;
  j["landing"] = {{"soc", r.landing.soc}, {"energy_Wh", r.landing.energy_Wh},
                  {"v_rest_cell_V", r.landing.v_rest_cell_V}, {"v_load_cell_V", r.landing.v_load_cell_V},
                  {"reserve_time_s", r.reserve_time_s}, {"reserve_time_end", sim::end_text(r.reserve_time_end, r.reserve_time_refusal)}};
  if (r.thermal)
    j["cell_temperature_C"] = {{"start", r.temperature_start_C}, {"landing", r.landing.temperature_C},
                               {"max", r.temperature_max_C}, {"air", r.air_C}};
  json phases = json::array();
  for (std::size_t i = 0; i < r.phases.size(); ++i) {
    const auto& p = r.phases[i];
    phases.push_back({{"phase", phase_number(i)}, {"kind", flight::to_string(p.kind)}, {"label", p.label}, {"start_s", p.start_s},
                      {"duration_s", p.duration_s}, {"planned_s", p.planned_s}, {"flown", p.flown},
                      {"distance_m", p.distance_m}, {"energy_Wh", p.energy_Wh}, {"charge_Ah", p.charge_Ah},
                      {"v_min_cell_V", p.v_min_cell_V}, {"i_max_A", p.i_max_A}, {"c_rate_max", p.c_rate_max},
                      {"duty_mean", p.duty_mean}, {"duty_max", p.duty_max}, {"eta_mean", p.eta_mean},
                      {"thrust_per_rotor_N", p.thrust_per_rotor_N}, {"density_kg_m3", p.density_kg_m3},
                      {"ground_speed_mps", p.ground_speed_mps},
                      {"airspeed_mps", p.airspeed_mps}});
  }
  j["phases"] = phases;
  json ev = json::array();
  for (const auto& e : r.events)
    ev.push_back({{"t_s", e.t_s}, {"kind", e.kind}, {"phase", phase_number_or_null(e.phase)}, {"detail", e.detail}});
  j["events"] = ev;
  json rules = json::array();
  for (const auto& rule : r.rules)
    rules.push_back({{"name", rule.name}, {"unit", rule.unit}, {"limit", rule.is_max ? "max" : "min"},
                     {"required", rule.required}, {"actual", rule.reached ? json(rule.actual) : json()},
                     {"margin", rule.reached ? json(rule.margin) : json()}, {"pass", rule.pass},
                     {"reached", rule.reached}, {"t_s", rule.t_s}, {"phase", phase_number_or_null(rule.phase)},
                     {"length_dependent", rule.length_dependent}, {"note", rule.note}});
  j["rules"] = rules;
  j["model_range"] = {{"coverage", coverage_json(m.pack.cell)},
                      {"soc_floor_covered", r.soc_floor_covered},
                      {"accept_extrapolation", r.accept_extrapolation},
                      {"excursions", excursions_json(r.excursions, true)}};
  if (home) {
    auto state = [](const sim::FlightState& st) {
      return json{{"t_s", st.t_s}, {"soc", st.soc}, {"v_load_cell_V", st.v_load_cell_V}, {"v_rest_cell_V", st.v_rest_cell_V}};
    };
    json ph = json::array();
    for (const auto& tp : home->phases)
      ph.push_back({{"phase", phase_number(tp.phase)}, {"latest_in_phase_s", tp.latest_in_phase_s ? json(*tp.latest_in_phase_s) : json()},
                    {"at", tp.at ? state(*tp.at) : json()}, {"whole_phase", tp.whole_phase},
                    {"beyond_plan", tp.beyond_plan}, {"capped", tp.capped}, {"binding_rule", tp.binding_rule}});
    j["turn_home"] = {{"point", home->point ? state(*home->point) : json()},
                      {"phase", phase_number_or_null(home->point_phase)},
                      {"binding_rule", home->binding_rule}, {"home_airspeed_mps", home->home_airspeed_mps},
                      {"home_descent_mps", home->home_descent_mps}, {"phases", ph}, {"simulations", home->simulations}};
  }
  return j;
}

std::string fly_trace_csv(const MissionResult& r, const sim::TurnHome* home) {
  std::string out = std::string("time_s,current_A,v_terminal_V,v_ocv_V,soc,power_W,phase,duty,thrust_N") +
                    (r.thermal ? ",cell_temperature_C" : "") + ",height_m,past_turn_home\n";
  const double turn_t = home && home->point ? home->point->t_s : std::numeric_limits<double>::infinity();
  char buf[320];
  for (const auto& tp : r.trace) {
    const auto& s = tp.s;
    std::snprintf(buf, sizeof buf, "%.4f,%.6g,%.6f,%.6f,%.7f,%.6g,%d,%.5f,%.5g", s.t, s.term.current_A,
                  s.term.v_terminal_V, s.term.v_ocv_V, s.x[battery::kSoc], s.term.power_W, phase_number(tp.phase), tp.duty,
                  tp.thrust_N);
    out += buf;
    if (r.thermal) {
      std::snprintf(buf, sizeof buf, ",%.3f", s.x[battery::kTemp]);
      out += buf;
    }
    std::snprintf(buf, sizeof buf, ",%.3f,%d", tp.height_m, s.t > turn_t ? 1 : 0);
    out += buf;
    out += "\n";
  }
  return out;
}

}  // namespace sortie::report
