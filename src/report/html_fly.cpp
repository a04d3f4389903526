#include "report/html_fly.hpp"
#include "report/temperature_plot.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "flight/atmosphere.hpp"
#include "report/discharge_report.hpp"
#include "report/html_page.hpp"
#include "report/mission_report.hpp"
#include "report/svg_plot.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

namespace {

using html::Cell;
using html::esc;
using html::keyed;
using html::number_cell;
using html::text_cell;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// Our palette: each quantity keeps its colour on every page.
const char* kVoltage = "#0b6e8a";
const char* kOcv = "#4f6d7a";
const char* kCharge = "#c46a00";
const char* kReserve = "#b23a48";
const char* kCutoff = "#6b2737";
const char* kCurrent = "#7a3d8c";
const char* kDuty = "#0b6e8a";
const char* kEtaDrive = "#8a6d00";
const char* kEtaEsc = "#7a3d8c";
const char* kHeight = "#2f6b3a";
const char* kTurnHome = "#111111";

/// Time axis in minutes for anything longer than a few minutes, else seconds.
struct TimeAxis {
  double per_s = 1.0;
  std::string unit = "s";
};
TimeAxis time_axis(double span_s) {
  if (span_s > 150.0) return {1.0 / 60.0, "min"};
  return {};
}

std::string signed_fixed(double v, int digits) {
  std::string s = fixed(v, digits);
  if (v > 0 && s.find_first_not_of("0.") != std::string::npos) s = "+" + s;
  return s;
}

svg::Axis time_x(const sim::MissionResult& r, const TimeAxis& ta) {
  return {"time", ta.unit, 0.0, std::max(r.flight_time_s, 1.0) * ta.per_s, true};
}

std::vector<svg::Band> phase_bands(const sim::MissionResult& r, const TimeAxis& ta) {
  std::vector<svg::Band> bands;
  for (std::size_t i = 0; i < r.phases.size(); ++i) {
    const auto& p = r.phases[i];
    if (p.duration_s <= 0) continue;
    bands.push_back({p.start_s * ta.per_s, (p.start_s + p.duration_s) * ta.per_s, std::to_string(i + 1)});
  }
  return bands;
}

/// The turn-home point as a single marked point at (t, y), when there is one.
void mark_turn_home(svg::LinePlot& p, const sim::TurnHome* home, const TimeAxis& ta, double y) {
  if (!home || !home->point) return;
  svg::Line pt{"turn home by " + fixed(home->point->t_s, 0) + " s", {home->point->t_s * ta.per_s}, {y}, kTurnHome};
  pt.markers = true;
  p.lines.push_back(pt);
}

std::string height_plot(const sim::MissionResult& r, const sim::TurnHome* home, const TimeAxis& ta) {
  svg::LinePlot p;
  p.id = "fly-height";
  p.title = "Height above the field and the phases over the flight";
  p.x = time_x(r, ta);
  p.y = {"height above the field", "m", 0.0, {}};
  p.right_margin = true;
  svg::Line h{"height", {}, {}, kHeight};
  for (const auto& tp : r.trace) {
    h.x.push_back(tp.s.t * ta.per_s);
    h.y.push_back(tp.height_m);
  }
  p.lines = {h};
  if (home && home->point) {
    double y = 0.0;
    for (const auto& tp : r.trace)
      if (tp.s.t <= home->point->t_s) y = tp.height_m;
    mark_turn_home(p, home, ta, y);
  }
  p.bands = phase_bands(r, ta);
  return svg::render(p);
}

std::string setup_text(const sim::Mission& m, const sim::MissionResult& r, const std::string& what) {
  if (what == "aircraft") {
    const std::string af_name = flight::name(m.airframe);
    return std::string(flight::kind_name(m.airframe)) + (af_name.empty() ? "" : " \"" + af_name + "\"") +
           ", all-up " + fixed(r.all_up_mass_kg, 3) + " kg (pack " + fixed(r.pack_mass_kg, 3) + " kg)";
  }
  if (what == "drive")
    return (m.drive.name.empty() ? std::string("drive") : m.drive.name) + ", " + std::to_string(m.drive.rotors) +
           " rotor" + (m.drive.rotors > 1 ? "s" : "");
  if (what == "pack")
    return (m.pack.name.empty() ? m.pack.cell.name : m.pack.name) + ", " + m.pack.layout() + " " +
           fixed(m.pack.capacity_Ah(), 2) + " Ah at " + fixed(m.pack.temperature_C, 0) + " °C, starting at " +
           fixed(m.pack.soc0 * 100, 0) + " % charge";
  const auto& atm = m.environment.atmosphere;
  return "field " + fixed(atm.field_elevation_m, 0) + " m, " +
         fixed(atm.field_temperature_K() - flight::kCelsiusZero, 1) + " °C (ISA " +
         (atm.isa_offset_K >= 0 ? "+" : "") + fixed(atm.isa_offset_K, 1) + " °C), wind " +
         fixed(m.environment.wind.speed_mps, 1) + " m/s from " + fixed(m.environment.wind.from_deg, 0) + "°";
}

std::string no_trace_note(const sim::MissionResult& r) {
  return r.trace.empty() ? "No trace was recorded for this run, so only the phases are drawn." : "";
}

std::string voltage_plot(const sim::Mission& m, const sim::MissionResult& r, const sim::TurnHome* home, const TimeAxis& ta) {
  const double S = m.pack.series;
  svg::LinePlot p;
  p.id = "fly-voltage-soc";
  p.title = "Pack voltage and state of charge over the flight";
  p.x = time_x(r, ta);
  p.y = {"pack voltage", "V", {}, {}};
  p.y2 = svg::Axis{"state of charge", "%", 0.0, 100.0};
  svg::Line loaded{"loaded pack voltage", {}, {}, kVoltage};
  svg::Line ocv{"open-circuit pack voltage", {}, {}, kOcv, svg::Side::left, svg::Stroke::dashed, 1.8};
  svg::Line soc{"state of charge (right axis)", {}, {}, kCharge, svg::Side::right};
  for (const auto& tp : r.trace) {
    const double t = tp.s.t * ta.per_s;
    loaded.x.push_back(t);
    loaded.y.push_back(tp.s.term.v_terminal_V);
    ocv.x.push_back(t);
    ocv.y.push_back(tp.s.term.v_ocv_V);
    soc.x.push_back(t);
    soc.y.push_back(tp.s.x[battery::kSoc] * 100.0);
  }
  p.lines = {loaded, ocv, soc};
  if (home && home->point) mark_turn_home(p, home, ta, home->point->v_load_cell_V * S);
  if (m.reserve.v_load_cell_min_V)
    p.levels.push_back({*m.reserve.v_load_cell_min_V * S,
                        "loaded reserve " + fixed(*m.reserve.v_load_cell_min_V, 2) + " V × " +
                            std::to_string(m.pack.series) + " = " + fixed(*m.reserve.v_load_cell_min_V * S, 2) + " V",
                        kReserve});
  if (m.reserve.soc_min)
    p.levels.push_back({*m.reserve.soc_min * 100.0, "reserve charge " + fixed(*m.reserve.soc_min * 100.0, 0) + " %",
                        kCharge, svg::Side::right});
  const double cutoff = m.pack.cell.v_cutoff_V * S;
  double v_lo = std::numeric_limits<double>::infinity();
  for (const auto& tp : r.trace) v_lo = std::min(v_lo, tp.s.term.v_terminal_V);
  // The cell cutoff only when the flight came near it: otherwise it squeezes the curves.
  if (!r.trace.empty() && v_lo - cutoff < 0.25 * (r.trace.front().s.term.v_ocv_V - cutoff))
    p.levels.push_back({cutoff, "cutoff " + fixed(m.pack.cell.v_cutoff_V, 2) + " V × " + std::to_string(m.pack.series) +
                                    " = " + fixed(cutoff, 2) + " V",
                        kCutoff});
  p.bands = phase_bands(r, ta);
  return svg::render(p);
}

std::string current_plot(const sim::Mission& m, const sim::MissionResult& r, const TimeAxis& ta) {
  // C-rate: pack current over the rated pack capacity (cell capacity × parallel), as in the
  // phase table's max C.
  const double rated_Ah = m.pack.cell.capacity_Ah * m.pack.parallel;
  svg::LinePlot p;
  p.id = "fly-current";
  p.title = "Pack current and C-rate over the flight";
  p.x = time_x(r, ta);
  p.y = {"pack current", "A", 0.0, {}};
  p.y2 = svg::Axis{"C-rate", "", {}, {}};
  p.y2_per_y = 1.0 / rated_Ah;
  svg::Line i{"pack current (the right-hand scale reads it as C-rate)", {}, {}, kCurrent};
  for (const auto& tp : r.trace) {
    i.x.push_back(tp.s.t * ta.per_s);
    i.y.push_back(tp.s.term.current_A);
  }
  p.lines = {i};
  // The cell limits for the pack, drawn when the flight comes near them (otherwise they squeeze
  // the curve; the rules table gives them).
  const double limit = m.pack.cell.i_cont_max_A * m.pack.parallel;
  if (r.i_max_A > 0.7 * limit) p.levels.push_back({limit, "continuous limit " + fixed(limit, 0) + " A", kReserve});
  if (const auto& b = m.pack.cell.burst; b && r.i_max_A > 0.7 * b->i_max_A * m.pack.parallel)
    p.levels.push_back({b->i_max_A * m.pack.parallel,
                        "burst limit " + fixed(b->i_max_A * m.pack.parallel, 0) + " A for " + fixed(b->duration_s, 0) + " s",
                        kCutoff});
  p.bands = phase_bands(r, ta);
  return svg::render(p);
}

std::string temperature_plot(const sim::MissionResult& r, const TimeAxis& ta) {
  std::vector<double> t, T;
  for (const auto& tp : r.trace) {
    t.push_back(tp.s.t * ta.per_s);
    T.push_back(tp.s.x[battery::kTemp]);
  }
  svg::LinePlot p = cell_temperature_plot(kFlyThermalPlot, "Cell temperature over the flight", time_x(r, ta), t, T,
                                          r.air_C, r.temperature_max_C);
  p.bands = phase_bands(r, ta);
  return svg::render(p);
}

std::string duty_plot(const sim::MissionResult& r, const TimeAxis& ta) {
  const sim::RuleCheck* hover_rule = nullptr;
  for (const auto& rule : r.rules)
    if (rule.name == "hover_duty_max") hover_rule = &rule;
  svg::LinePlot p;
  p.id = "fly-duty-efficiency";
  p.title = "ESC duty over the flight and drive efficiencies by phase";
  p.x = time_x(r, ta);
  p.y = {"duty, efficiency", "%", 0.0, 100.0};
  // The same scale on the right too: easier reading at the end of the flight, and the frame
  // lines up with the plots above that have a second axis.
  p.y2 = p.y;
  p.y2_per_y = 1.0;
  svg::Line duty{"ESC duty", {}, {}, kDuty};
  for (const auto& tp : r.trace) {
    duty.x.push_back(tp.s.t * ta.per_s);
    duty.y.push_back(tp.duty * 100.0);
  }
  // Phase means drawn flat across each phase, with a gap between phases.
  svg::Line eta{"drive efficiency, motor × ESC (phase mean)", {}, {}, kEtaDrive, svg::Side::left, svg::Stroke::solid, 3.0};
  for (const auto& ph : r.phases) {
    if (ph.duration_s <= 0) continue;
    const double a = ph.start_s * ta.per_s, b = (ph.start_s + ph.duration_s) * ta.per_s;
    const double v = ph.eta_mean > 0 ? ph.eta_mean * 100.0 : kNaN;
    eta.x.insert(eta.x.end(), {a, b, b});
    eta.y.insert(eta.y.end(), {v, v, kNaN});
  }
  if (r.eta_esc_mean > 0)
    p.levels.push_back({r.eta_esc_mean * 100.0, "ESC efficiency, mean over the flight " + fixed(r.eta_esc_mean * 100.0, 1) + " %",
                        kEtaEsc});
  p.lines = {duty, eta};
  if (hover_rule)
    p.levels.push_back({hover_rule->required * 100.0, "hover duty limit " + fixed(hover_rule->required * 100.0, 0) + " %",
                        kReserve});
  p.bands = phase_bands(r, ta);
  return svg::render(p);
}

std::string energy_plot(const sim::Mission& m, const sim::MissionResult& r) {
  svg::BarPlot p;
  p.id = "fly-energy-per-phase";
  p.title = "Energy drawn from the pack in each phase";
  p.value = {"energy", "Wh", 0.0, {}};
  for (std::size_t i = 0; i < r.phases.size(); ++i) {
    const auto& ph = r.phases[i];
    svg::Bar b;
    b.label = phase_name(m, static_cast<int>(i));
    b.value = ph.energy_Wh;
    b.value_text = fixed(ph.energy_Wh, 2) + " Wh";
    if (!ph.flown) {
      b.flagged = true;
      b.flag_text = ph.duration_s > 0 ? "flight ended in this phase" : "not flown";
    }
    p.bars.push_back(b);
  }
  return svg::render(p);
}

std::string rules_table(const sim::Mission& m, const sim::MissionResult& r) {
  html::Table t({"rule", "limit", "reached", "margin", "where", "result"});
  std::string notes;
  for (const auto& rule : r.rules) {
    const std::string k = "rules." + rule.name + ".";
    const bool pct = rule.name == "soc_min" || rule.name == "soc_covered" || rule.name == "hover_duty_max";
    std::string margin = pct ? fixed(rule.margin * 100, 1) + " %" : rule_value(rule, rule.margin);
    if (rule.margin > 0 && margin[0] != '-' && margin.find_first_not_of("0. %sV") != std::string::npos) margin = "+" + margin;
    const std::string where = rule.name == "mission_flown" ? "-"
                              : rule.phase < 0            ? "landing"
                                                          : phase_name(m, rule.phase) + ", " + fixed(rule.t_s, 0) + " s";
    const std::string unit = pct ? "%" : "";
    t.add_row({text_cell(rule_words(rule.name)),
               html::html_cell(esc(rule.is_max ? "max " : "min ") + keyed(k + "required", rule_value(rule, rule.required)), true),
               rule.reached ? number_cell(rule_value(rule, rule.actual), k + "actual", unit) : text_cell("not reached"),
               rule.reached ? number_cell(margin, k + "margin", unit) : number_cell("-"),
               text_cell(rule.reached ? where : "-"),
               html::html_cell(rule.pass ? "pass" : "FAIL", false, rule.pass ? "pass" : "fail")},
              rule.pass ? "" : "fail");
    if (!rule.note.empty()) notes += "<li>" + esc(rule_words(rule.name) + ": " + rule.note) + "</li>\n";
  }
  std::string out = t.render();
  if (!r.completed)
    out += "<p class=\"note\">Not reached: the flight ended before landing; the verdict says why.</p>\n";
  if (!notes.empty()) out += "<ul class=\"note\">\n" + notes + "</ul>\n";
  return out;
}

std::string turn_home_html(const sim::Mission& m, const sim::TurnHome& home) {
  std::string out = "<p>Home is a straight cruise back to the start point at " + esc(fixed(home.home_airspeed_mps, 1)) +
                    " m/s airspeed (the last cruise leg's), in the wind, then the descent at " +
                    esc(fixed(home.home_descent_mps, 1)) + " m/s. ";
  if (home.point)
    out += "<strong>Turn home by " + keyed("turn_home.point.t_s", fixed(home.point->t_s, 0) + " s") +
           "</strong> from take-off (phase " + esc(phase_name(m, static_cast<int>(*home.point_phase))) + "): charge " +
           keyed("turn_home.point.soc", fixed(home.point->soc * 100, 1) + " %", "%") + ", loaded cell " +
           keyed("turn_home.point.v_load_cell_V", fixed(home.point->v_load_cell_V, 3) + " V") + ", resting cell " +
           keyed("turn_home.point.v_rest_cell_V", fixed(home.point->v_rest_cell_V, 3) + " V") +
           (home.binding_rule.empty() ? "" : esc("; later, " + rule_words(home.binding_rule) + " fails")) +
           ". The point is marked on the height and voltage plots.</p>\n";
  else
    out += "Turning home holds at every moment of the plan.</p>\n";
  html::Table t({"phase", "latest turn s", "into phase s", "charge %", "loaded cell V", "resting cell V", "then fails"});
  for (std::size_t i = 0; i < home.phases.size(); ++i) {
    const auto& tp = home.phases[i];
    const std::string k = "turn_home.phases." + std::to_string(i) + ".";
    const std::string name = phase_name(m, static_cast<int>(tp.phase));
    if (!tp.latest_in_phase_s || !tp.at) {
      t.add_row({text_cell(name), text_cell("none"), number_cell("-"), number_cell("-"), number_cell("-"),
                 number_cell("-"), text_cell(rule_words(tp.binding_rule))});
      continue;
    }
    std::string into = keyed(k + "latest_in_phase_s", fixed(*tp.latest_in_phase_s, 0));
    if (tp.capped) into = "more than " + into;
    else if (tp.beyond_plan) into += " (past the plan)";
    else if (tp.whole_phase) into += " (all)";
    t.add_row({text_cell(name), number_cell(fixed(tp.at->t_s, 0), k + "at.t_s"), html::html_cell(into, true),
               number_cell(fixed(tp.at->soc * 100, 1), k + "at.soc", "%"),
               number_cell(fixed(tp.at->v_load_cell_V, 3), k + "at.v_load_cell_V"),
               number_cell(fixed(tp.at->v_rest_cell_V, 3), k + "at.v_rest_cell_V"),
               text_cell(tp.binding_rule.empty() ? "-" : rule_words(tp.binding_rule))});
  }
  return out + t.render();
}

std::string phases_table(const sim::Mission& m, const sim::MissionResult& r) {
  html::Table t({"phase", "start s", "time s", "distance m", "thrust/rotor N", "energy Wh", "charge Ah", "min cell V",
                 "max current A", "max C‑rate C", "duty mean %", "duty max %", "η drive %"});
  for (std::size_t i = 0; i < r.phases.size(); ++i) {
    const auto& p = r.phases[i];
    const std::string k = "phases." + std::to_string(i) + ".";
    const bool any = p.duration_s > 0 || p.flown;
    auto maybe = [&](double v, int d, const std::string& key) -> Cell {
      return any ? number_cell(fixed(v, d), k + key) : number_cell("-");
    };
    Cell time = number_cell(fixed(p.duration_s, 0), k + "duration_s");
    if (!p.flown) time = html::html_cell(keyed(k + "duration_s", fixed(p.duration_s, 0)) + " of " +
                                             keyed(k + "planned_s", fixed(p.planned_s, 0)), true);
    t.add_row({text_cell(phase_name(m, static_cast<int>(i))), number_cell(fixed(p.start_s, 0), k + "start_s"), time,
               number_cell(fixed(p.distance_m, 0), k + "distance_m"), maybe(p.thrust_per_rotor_N, 2, "thrust_per_rotor_N"),
               number_cell(fixed(p.energy_Wh, 2), k + "energy_Wh"), number_cell(fixed(p.charge_Ah, 3), k + "charge_Ah"),
               maybe(p.v_min_cell_V, 3, "v_min_cell_V"), maybe(p.i_max_A, 1, "i_max_A"),
               maybe(p.c_rate_max, 2, "c_rate_max"),
               any ? number_cell(fixed(p.duty_mean * 100, 1), k + "duty_mean", "%") : number_cell("-"),
               any ? number_cell(fixed(p.duty_max * 100, 1), k + "duty_max", "%") : number_cell("-"),
               any ? number_cell(fixed(p.eta_mean * 100, 1), k + "eta_mean", "%") : number_cell("-")},
              p.flown ? "" : "muted");
  }
  return t.render();
}

}  // namespace

std::string fly_html(const sim::Mission& m, const sim::MissionResult& r, const sim::SpareResult& s,
                     const sim::TurnHome* home, const std::string& overrides_html) {
  html::Page page("Mission: " + m.name, "sortie fly · " + m.pack.layout() + " pack · " +
                                            std::to_string(r.phases.size()) + " phases");
  page.add(html::verdict_banner(r.go, verdict_line(m, r, s), "verdict_text"));

  std::vector<html::Card> cards;
  cards.push_back({"flight time", keyed("flight_time_s", fixed(r.flight_time_s, 0) + " s"),
                   duration_hms(r.flight_time_s) + (r.completed ? "" : ", ended early"), !r.completed});
  const auto* soc_rule = [&]() -> const sim::RuleCheck* {
    for (const auto& rule : r.rules)
      if (rule.name == "soc_min") return &rule;
    return nullptr;
  }();
  cards.push_back({"charge at landing", keyed("landing.soc", fixed(r.landing.soc * 100, 1) + " %"),
                   soc_rule ? "reserve " + fixed(soc_rule->required * 100, 0) + " %" : "no reserve rule on charge",
                   soc_rule && !soc_rule->pass});
  if (s.phase && s.bounded && !s.capped) {
    cards.push_back({"spare time", keyed("spare_s", signed_fixed(s.spare_s, 0) + " s"),
                     "on phase " + phase_name(m, static_cast<int>(*s.phase)),
                     s.spare_s < 0});
  } else if (s.phase) {
    cards.push_back({"spare time", esc(s.capped ? "more than " + fixed(s.spare_s, 0) + " s" : "none"), s.note, !s.capped});
  }
  if (home && home->point)
    cards.push_back({"turn home by", keyed("turn_home.point.t_s", fixed(home->point->t_s, 0) + " s"),
                     "charge " + fixed(home->point->soc * 100, 1) + " %, loaded cell " +
                         fixed(home->point->v_load_cell_V, 3) + " V",
                     false});
  cards.push_back({"energy used", keyed("energy_Wh", fixed(r.energy_Wh, 2) + " Wh"), fixed(r.charge_Ah, 3) + " Ah"});
  cards.push_back({"lowest cell voltage", keyed("v_min_cell_V", fixed(r.v_min_cell_V, 3) + " V"),
                   "under load; " + fixed(r.landing.v_rest_cell_V, 3) + " V resting at landing"});
  cards.push_back({"highest current", keyed("i_max_A", fixed(r.i_max_A, 1) + " A"), fixed(r.c_rate_max, 2) + " C"});
  if (r.thermal)
    cards.push_back({"cell temperature", keyed("cell_temperature_C.max", fixed(r.temperature_max_C, 1) + " °C"),
                     "highest; " + fixed(r.temperature_start_C, 1) + " °C at take-off, air " + fixed(r.air_C, 1) + " °C",
                     r.temperature_max_C > battery::kCellHotC});
  page.add(html::cards(cards));
  if (!overrides_html.empty()) page.section("What-if overrides in effect", overrides_html);

  page.section("Reserve rules and limits", rules_table(m, r));
  if (home) page.section("Turn home", turn_home_html(m, *home));

  const TimeAxis ta = time_axis(r.flight_time_s);
  const std::string trace_note = no_trace_note(r);
  std::string band_note = "Shaded bands are the phases, numbered as in the phase table.";
  std::string plots;
  const std::string mark_note =
      home && home->point ? " The black dot is the turn-home point." : "";
  plots += html::figure("Height and phases", height_plot(r, home, ta),
                        band_note + mark_note + " " + trace_note);
  plots += html::figure("Pack voltage and state of charge", voltage_plot(m, r, home, ta),
                        band_note + " Dash-dot lines are the reserves: the charge reserve on the right-hand scale, the "
                                    "loaded-voltage reserve (and the cell cutoff, when the flight comes near it) on the "
                                    "left. " + trace_note);
  plots += html::figure("Pack current and C-rate", current_plot(m, r, ta),
                        "C-rate is the pack current over the rated capacity, " +
                            fixed(m.pack.cell.capacity_Ah * m.pack.parallel, 2) +
                            " Ah; the cells' continuous limit is " +
                            fixed(m.pack.cell.i_cont_max_A * m.pack.parallel, 0) + " A for the pack. " + trace_note);
  if (r.thermal)
    plots += html::figure("Cell temperature", temperature_plot(r, ta),
                          "One temperature per cell (a lumped thermal model): the cells warm with their losses and give "
                          "heat to the air at the field. Resistance follows the cell's temperature table as they warm. " +
                              trace_note);
  plots += html::figure("ESC duty and drive efficiency", duty_plot(r, ta),
                        "Duty is the motor voltage over the bus voltage. Drive efficiency is each phase's shaft energy over "
                        "the energy into the ESCs; the ESC's share is shown as its mean over the flight. " + trace_note);
  plots += html::figure("Energy per phase", energy_plot(m, r));
  page.section("Over the flight", plots);

  std::vector<std::pair<std::string, std::string>> landing = {
      {"flight time", keyed("flight_time_s", fixed(r.flight_time_s, 0) + " s") + " (" +
                          esc(duration_hms(r.flight_time_s)) + (r.completed ? "" : ", ended early") + ")"},
      {"energy used", keyed("energy_Wh", fixed(r.energy_Wh, 2) + " Wh") + ", " +
                          keyed("charge_Ah", fixed(r.charge_Ah, 3) + " Ah")},
      {"state of charge at landing", keyed("landing.soc", fixed(r.landing.soc * 100, 1) + " %")},
      {"energy left at landing", keyed("landing.energy_Wh", fixed(r.landing.energy_Wh, 2) + " Wh") + " (open-circuit)"},
      {"resting cell voltage at landing", keyed("landing.v_rest_cell_V", fixed(r.landing.v_rest_cell_V, 3) + " V")},
      {"lowest loaded cell voltage", keyed("v_min_cell_V", fixed(r.v_min_cell_V, 3) + " V")},
      {"highest current", keyed("i_max_A", fixed(r.i_max_A, 1) + " A") + " (" +
                              keyed("c_rate_max", fixed(r.c_rate_max, 2) + " C") + ")"},
      {"mean duty", keyed("duty_mean", fixed(r.duty_mean * 100, 1) + " %")},
      {"mean ESC efficiency", keyed("eta_esc_mean", fixed(r.eta_esc_mean * 100, 1) + " %")},
      {"mean drive efficiency", keyed("eta_mean", fixed(r.eta_mean * 100, 1) + " %")},
  };
  if (m.reserve.hover_s)
    landing.emplace_back("time on station left at landing",
                         keyed("landing.reserve_time_s", fixed(r.reserve_time_s, 0) + " s"));
  page.section("Landing", html::facts_html(landing));

  page.section("Phases", phases_table(m, r) +
                             "<p class=\"note\">Where the flight ended early, time reads flown of planned. η drive = "
                             "shaft energy / drive energy (motor × ESC).</p>\n");

  std::vector<std::pair<std::string, std::string>> setup;
  for (const char* what : {"aircraft", "drive", "pack", "air"}) setup.emplace_back(what, setup_text(m, r, what));
  if (m.avionics_W > 0) setup.emplace_back("avionics", fixed(m.avionics_W, 1) + " W");
  page.section("Setup", html::facts(setup));

  if (!r.events.empty()) {
    std::string ev = "<ul class=\"events\">\n";
    for (const auto& e : r.events)
      ev += "<li><strong>" + esc(fixed(e.t_s, 1)) + " s</strong>, " + esc(phase_name(m, e.phase)) + ", " +
            esc(e.kind) + ": " + esc(e.detail) + "</li>\n";
    page.section("Events", ev + "</ul>\n");
  }
  return page.render();
}

}  // namespace sortie::report
