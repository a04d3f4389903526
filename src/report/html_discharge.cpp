#include "report/html_discharge.hpp"
#include "report/temperature_plot.hpp"

#include "report/discharge_report.hpp"
#include "report/html_page.hpp"
#include "report/svg_plot.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

namespace {

using html::keyed;

const char* kVoltage = "#0b6e8a";
const char* kOcv = "#4f6d7a";
const char* kCharge = "#c46a00";
const char* kCutoff = "#6b2737";
const char* kCurrent = "#7a3d8c";
const char* kPower = "#5c7f1f";

const char* end_words(sim::EndReason e) {
  switch (e) {
    case sim::EndReason::cutoff_voltage: return "The loaded cell voltage reached the cutoff";
    case sim::EndReason::soc_floor: return "The state of charge reached the floor";
    case sim::EndReason::power_collapse: return "Power collapse: the pack could not deliver the power asked for";
    case sim::EndReason::load_end: return "The load profile ended";
    case sim::EndReason::pack_full: return "The charging load brought the pack to full";
    case sim::EndReason::coverage_floor: return "The state of charge reached the lowest the cell model has data for";
  }
  return "";
}

}  // namespace

std::string discharge_html(const battery::Pack& pack, const std::string& load_label, const sim::DischargeSpec& spec,
                           const sim::DischargeResult& r) {
  const std::string name = pack.name.empty() ? pack.cell.name : pack.name;
  html::Page page("Discharge: " + name, "sortie discharge · " + pack.layout() + " " + fixed(pack.capacity_Ah(), 2) +
                                            " Ah at " + fixed(pack.temperature_C, 0) + " °C · " + load_label);
  const double rated_Ah = pack.cell.capacity_Ah * pack.parallel;
  std::vector<html::Card> cards = {
      {"time to end", keyed("time_to_end_s", fixed(r.time_to_end_s, 1) + " s"), duration_hms(r.time_to_end_s)},
      {"energy delivered", keyed("energy_Wh", fixed(r.energy_Wh, 2) + " Wh"), ""},
      {"charge delivered", keyed("charge_Ah", fixed(r.charge_Ah, 3) + " Ah"), ""},
      {"lowest loaded voltage", keyed("v_min_V", fixed(r.v_min_V, 3) + " V"),
       fixed(r.v_min_V / pack.series, 3) + " V per cell"},
      {"highest current", keyed("i_max_A", fixed(r.i_max_A, 2) + " A"), fixed(r.i_max_A / rated_Ah, 2) + " C"},
      {"charge at the end", keyed("soc_end", fixed(r.soc_end * 100, 1) + " %"), ""},
  };
  if (r.thermal)
    cards.push_back({"cell temperature", keyed("cell_temperature_C.max", fixed(r.temperature_max_C, 1) + " °C"),
                     "highest; " + fixed(pack.temperature_C, 1) + " °C at the start, air " + fixed(r.air_C, 1) + " °C",
                     r.temperature_max_C > battery::kCellHotC});
  page.add(html::cards(cards));
  page.section("Why it ended", "<p>" + html::esc(end_words(r.end_reason)) + " (" +
                                   keyed("end_reason", sim::to_string(r.end_reason)) + ").</p>\n");

  const double per_s = r.time_to_end_s > 150 ? 1.0 / 60.0 : 1.0;
  const std::string unit = r.time_to_end_s > 150 ? "min" : "s";
  svg::LinePlot v;
  v.id = kDischargePlots[0];
  v.title = "Pack voltage and state of charge during the discharge";
  v.x = {"time", unit, 0.0, std::max(r.time_to_end_s, 1e-3) * per_s, true};
  v.y = {"pack voltage", "V", {}, {}};
  v.y2 = svg::Axis{"state of charge", "%", 0.0, 100.0};
  svg::Line loaded{"loaded pack voltage", {}, {}, kVoltage};
  svg::Line ocv{"open-circuit pack voltage", {}, {}, kOcv, svg::Side::left, svg::Stroke::dashed, 1.8};
  svg::Line soc{"state of charge (right axis)", {}, {}, kCharge, svg::Side::right};
  svg::LinePlot ip;
  ip.id = kDischargePlots[1];
  ip.title = "Pack current and power during the discharge";
  ip.x = v.x;
  ip.y = {"pack current", "A", 0.0, {}};
  ip.y2 = svg::Axis{"power at the terminals", "W", 0.0, {}};
  svg::Line cur{"pack current", {}, {}, kCurrent};
  svg::Line pow{"power at the terminals (right axis)", {}, {}, kPower, svg::Side::right, svg::Stroke::dashed};
  for (const auto& s : r.trace) {
    const double t = s.t * per_s;
    loaded.x.push_back(t);
    loaded.y.push_back(s.term.v_terminal_V);
    ocv.x.push_back(t);
    ocv.y.push_back(s.term.v_ocv_V);
    soc.x.push_back(t);
    soc.y.push_back(s.x[battery::kSoc] * 100);
    cur.x.push_back(t);
    cur.y.push_back(s.term.current_A);
    pow.x.push_back(t);
    pow.y.push_back(s.term.power_W);
  }
  v.lines = {loaded, ocv, soc};
  v.levels.push_back({spec.cutoff_cell_V * pack.series,
                      "cutoff " + fixed(spec.cutoff_cell_V, 2) + " V × " + std::to_string(pack.series) + " = " +
                          fixed(spec.cutoff_cell_V * pack.series, 2) + " V",
                      kCutoff});
  if (spec.soc_floor > 0)
    v.levels.push_back({spec.soc_floor * 100, "floor " + fixed(spec.soc_floor * 100, 0) + " %", kCharge, svg::Side::right});
  ip.lines = {cur, pow};
  const std::string note = r.trace.empty() ? "No trace was recorded for this run." : "";
  std::string plots = html::figure("Pack voltage and state of charge", svg::render(v), note);
  plots += html::figure("Current and power", svg::render(ip), note);
  if (r.thermal) {
    std::vector<double> t, T;
    for (const auto& s : r.trace) {
      t.push_back(s.t * per_s);
      T.push_back(s.x[battery::kTemp]);
    }
    const svg::LinePlot tp = cell_temperature_plot(kDischargeThermalPlot, "Cell temperature during the discharge", v.x, t,
                                                   T, r.air_C, r.temperature_max_C);
    plots += html::figure("Cell temperature", svg::render(tp),
                          "One temperature per cell (a lumped thermal model), warming with the losses and cooling in the air. " +
                              note);
  }
  page.section("During the discharge", plots);

  if (!r.events.empty()) {
    std::string ev = "<ul class=\"events\">\n";
    for (const auto& e : r.events)
      ev += "<li><strong>" + html::esc(fixed(e.t_s, 1)) + " s</strong>, " + html::esc(e.kind) + ": " +
            html::esc(e.detail) + "</li>\n";
    page.section("Events", ev + "</ul>\n");
  }
  page.section("Pack", html::facts({
                           {"pack", name + ", " + pack.layout()},
                           {"cell", pack.cell.name},
                           {"capacity", fixed(pack.capacity_Ah(), 2) + " Ah at " + fixed(pack.temperature_C, 0) + " °C"},
                           {"starting charge", fixed(pack.soc0 * 100, 0) + " %"},
                           {"mass", fixed(pack.mass_kg(), 3) + " kg"},
                       }));
  return page.render();
}

}  // namespace sortie::report
