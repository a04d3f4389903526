#include "report/discharge_report.hpp"

#include "core/text.hpp"

#include <cmath>

#include "report/model_range_report.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

std::string duration_hms(double s) {
  if (!std::isfinite(s)) return "-";
  const bool neg = s < 0;
  s = std::fabs(s);
  char buf[64];
  // Beyond a million hours the minutes mean nothing, and beyond about 3e22 s the hours no longer
  // fit a long (converting them was undefined behaviour).
  if (s >= 3.6e9) {
    std::snprintf(buf, sizeof buf, "%.4g h", s / 3600);
    return (neg ? "-" : "") + std::string(buf);
  }
  const long h = static_cast<long>(s / 3600);
  const long m = static_cast<long>((s - h * 3600) / 60);
  const double sec = s - h * 3600 - m * 60;
  if (h > 0) std::snprintf(buf, sizeof buf, "%ld h %02ld min %02.0f s", h, m, std::floor(sec));
  else if (m > 0) std::snprintf(buf, sizeof buf, "%ld min %04.1f s", m, sec);
  else std::snprintf(buf, sizeof buf, "%.1f s", sec);
  return (neg ? "-" : "") + std::string(buf);
}

namespace {
const char* reason_words(sim::EndReason r) {
  switch (r) {
    case sim::EndReason::cutoff_voltage: return "loaded cell voltage reached the cutoff";
    case sim::EndReason::soc_floor: return "state of charge reached the floor";
    case sim::EndReason::power_collapse: return "power collapse: the pack cannot deliver the power asked for";
    case sim::EndReason::load_end: return "the load profile ended";
    case sim::EndReason::pack_full: return "the charging load brought the pack to full";
    case sim::EndReason::coverage_floor: return "state of charge reached the lowest the cell model has data for";
  }
  return "";
}
}  // namespace

std::string discharge_text(const battery::Pack& pack, const std::string& load_label,
                           const sim::DischargeResult& r) {
  std::string out = "sortie discharge: " + printable(pack.name.empty() ? pack.cell.name : pack.name) + " (" +
                    pack.layout() + ", " + fixed(pack.capacity_Ah(), 2) + " Ah at " +
                    fixed(pack.temperature_C, 0) + " °C), " + load_label + "\n\n";
  KeyValues kv;
  kv.add("time to end", fixed(r.time_to_end_s, 1) + " s  (" + duration_hms(r.time_to_end_s) + ")");
  kv.add("ended because", reason_words(r.end_reason));
  if (r.end_reason == sim::EndReason::power_collapse)
    kv.add("power", fixed(r.power_asked_W, 1) + " W asked, at most " + fixed(r.power_max_W, 1) +
                        " W at the end state (E²/(4·R0))");
  kv.add("charge delivered", fixed(r.charge_Ah, 3) + " Ah");
  kv.add("energy delivered", fixed(r.energy_Wh, 2) + " Wh");
  kv.add("minimum loaded voltage", fixed(r.v_min_V, 3) + " V  (" + fixed(r.v_min_V / pack.series, 3) + " V per cell)");
  kv.add("maximum current", fixed(r.i_max_A, 2) + " A  (" +
                                fixed(r.i_max_A / (pack.cell.capacity_Ah * pack.parallel), 2) + " C)");
  kv.add("state of charge at end", fixed(r.soc_end * 100.0, 1) + " %");
  if (r.thermal)
    kv.add("cell temperature", fixed(pack.temperature_C, 1) + " °C at the start, " + fixed(r.temperature_end_C, 1) +
                                   " °C at the end, highest " + fixed(r.temperature_max_C, 1) + " °C (air " +
                                   fixed(r.air_C, 1) + " °C)");
  out += kv.render();
  bool warned = false;
  for (const auto& e : r.events) {
    if (e.kind != "over_current" && e.kind != "cell_hot") continue;
    if (!warned) out += "\nwarnings:\n";
    warned = true;
    out += "  at " + fixed(e.t_s, 1) + " s: " + e.detail + "\n";
  }
  if (!r.excursions.empty()) out += "\n" + excursions_text(r.excursions);
  out += "\nAn estimate from a model, not a guarantee: respect the cell maker's limits.\n";
  return out;
}

nlohmann::json discharge_json(const battery::Pack& pack, const std::string& load_label,
                              const sim::DischargeResult& r) {
  nlohmann::json j;
  j["schema"] = kDischargeSchema;
  j["pack"] = {{"name", pack.name},
               {"cell", pack.cell.name},
               {"series", pack.series},
               {"parallel", pack.parallel},
               {"capacity_Ah", pack.capacity_Ah()},
               {"mass_kg", pack.mass_kg()},
               {"soc0", pack.soc0},
               {"temperature_C", pack.temperature_C}};
  j["load"] = load_label;
  j["time_to_end_s"] = r.time_to_end_s;
  j["end_reason"] = sim::to_string(r.end_reason);
  j["charge_Ah"] = r.charge_Ah;
  j["energy_Wh"] = r.energy_Wh;
  j["v_min_V"] = r.v_min_V;
  j["i_max_A"] = r.i_max_A;
  j["soc_end"] = r.soc_end;
  if (r.thermal)
    j["cell_temperature_C"] = {{"start", pack.temperature_C}, {"end", r.temperature_end_C}, {"max", r.temperature_max_C},
                               {"air", r.air_C}};
  if (r.end_reason == sim::EndReason::power_collapse) {
    j["power_asked_W"] = r.power_asked_W;
    j["power_max_W"] = r.power_max_W;
  }
  j["model_range"] = {{"coverage", coverage_json(pack.cell)},
                      {"soc_floor_covered", r.soc_floor_covered},
                      {"excursions", excursions_json(r.excursions, false)}};
  nlohmann::json ev = nlohmann::json::array();
  for (const auto& e : r.events) ev.push_back({{"t_s", e.t_s}, {"kind", e.kind}, {"detail", e.detail}});
  j["events"] = ev;
  return j;
}

std::string discharge_trace_csv(const sim::DischargeResult& r) {
  std::string out = std::string("time_s,current_A,v_terminal_V,v_ocv_V,soc,power_W") +
                    (r.thermal ? ",cell_temperature_C" : "") + "\n";
  char buf[256];
  for (const auto& s : r.trace) {
    std::snprintf(buf, sizeof buf, "%.4f,%.6g,%.6f,%.6f,%.7f,%.6g", s.t, s.term.current_A,
                  s.term.v_terminal_V, s.term.v_ocv_V, s.x[battery::kSoc], s.term.power_W);
    out += buf;
    if (r.thermal) {
      std::snprintf(buf, sizeof buf, ",%.3f", s.x[battery::kTemp]);
      out += buf;
    }
    out += "\n";
  }
  return out;
}

}  // namespace sortie::report
