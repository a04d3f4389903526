#include "report/logbook_report.hpp"

#include <cmath>
#include <cstdio>

#include "report/html_page.hpp"
#include "report/svg_plot.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

namespace {

using logbook::Crossing;
using logbook::FactorTrend;

std::string fx(double v, int decimals) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, v);
  return buf;
}

std::string mmss(double s) {
  const long t = std::lround(s);
  char buf[32];
  std::snprintf(buf, sizeof buf, "%ld:%02ld", t / 60, t % 60);
  return buf;
}

const char* kCaution =
    "Caution: lithium packs can burn. These figures are estimates from logged flights and a model; they do not "
    "certify a pack. Retire packs by the manufacturer's limits and follow local aviation rules.";

const char* kExtrapolation =
    "an extrapolation of the fitted straight line beyond the logged cycles, assuming the pack keeps ageing at the "
    "same rate; the ± is one standard deviation of the crossing from the line's parameters only";

nlohmann::json line_json(const std::optional<logbook::LineFit>& f) {
  if (!f) return nullptr;
  return {{"intercept", f->intercept}, {"slope", f->slope}, {"intercept_sd", f->intercept_sd},
          {"slope_sd", f->slope_sd}, {"covariance", f->covariance}, {"residual_sd", f->residual_sd}, {"n", f->n}};
}

nlohmann::json crossing_json(const Crossing& c, bool is_day) {
  if (!c.reached) return {{"reached", false}, {"why_not", c.why_not}};
  nlohmann::json j = {{"reached", true}, {"extrapolated", true}};
  if (is_day) {
    j["date"] = logbook::date_from_days(std::lround(c.x));
    j["date_sd_days"] = c.x_sd;
  } else {
    j["cycle"] = c.x;
    j["cycle_sd"] = c.x_sd;
  }
  return j;
}

nlohmann::json factor_json(const FactorTrend& t) {
  return {{"limit", t.limit},
          {"by_cycle", line_json(t.by_cycle)},
          {"by_day", line_json(t.by_day)},
          {"at_limit_cycle", t.by_cycle ? crossing_json(t.cycle_at_limit, false) : nlohmann::json(nullptr)},
          {"at_limit_date", t.by_day ? crossing_json(t.day_at_limit, true) : nlohmann::json(nullptr)}};
}

nlohmann::json estimate_json(const logbook::EstimateRecord& e) {
  return {{"id", e.id}, {"cycle", e.cycle}, {"date", e.date}, {"flights", e.flight_ids},
          {"capacity", e.capacity}, {"capacity_sd", e.capacity_sd},
          {"resistance", e.resistance}, {"resistance_sd", e.resistance_sd}, {"method", e.method}};
}

std::string crossing_text(const std::string& what, const FactorTrend& t) {
  std::string out;
  if (!t.by_cycle) return out;
  const auto& f = *t.by_cycle;
  out += "  " + what + " per cycle: " + fx(f.slope, 5) + " ± " + fx(f.slope_sd, 5) + " (at cycle 0: " +
         fx(f.intercept, 4) + " ± " + fx(f.intercept_sd, 4) + "; residual sd " + fx(f.residual_sd, 4) + ")\n";
  const std::string lim = fx(t.limit, 3);
  if (t.cycle_at_limit.reached)
    out += "    reaches " + lim + " at cycle " + fx(t.cycle_at_limit.x, 1) + " ± " + fx(t.cycle_at_limit.x_sd, 1) +
           " (extrapolated)\n";
  else
    out += "    does not reach " + lim + " on this trend: " + t.cycle_at_limit.why_not + "\n";
  if (t.by_day && t.day_at_limit.reached)
    out += "    by date: " + logbook::date_from_days(std::lround(t.day_at_limit.x)) + " ± " +
           fx(t.day_at_limit.x_sd, 0) + " days (extrapolated, line against the flight dates)\n";
  else if (t.by_day)
    out += "    by date: not reached on this trend: " + t.day_at_limit.why_not + "\n";
  return out;
}

}  // namespace

nlohmann::json pack_json(const logbook::PackRecord& p) {
  return {{"id", p.id}, {"name", p.name}, {"serial", p.serial}, {"cell", p.cell_note},
          {"series", p.series}, {"parallel", p.parallel}, {"layout", std::to_string(p.series) + "S" + std::to_string(p.parallel) + "P"},
          {"first_use", p.first_use}, {"pack_file", p.pack_path}, {"pack_file_sha256", p.pack_sha256}, {"added_utc", p.added_utc}};
}

std::string history_text(const std::string& db, const logbook::PackRecord& p, const std::vector<logbook::FlightRecord>& fl,
                         const std::vector<logbook::EstimateRecord>& es) {
  std::string out = "Pack " + std::to_string(p.id) + " in " + db + ": " + p.name +
                    (p.serial.empty() ? "" : " (serial " + p.serial + ")") + ", " + std::to_string(p.series) + "S" +
                    std::to_string(p.parallel) + "P of " + p.cell_note + ", first use " + p.first_use + "\n\n";
  TextTable t({"flight", "date", "time m:s", "energy Wh", "charge Ah", "land SoC %", "V RMSE mV", "station left s",
               "SoH cap", "± cap", "SoH res", "± res", "cycle"});
  for (const auto& f : fl) {
    const logbook::EstimateRecord* e = nullptr;
    for (const auto& x : es)
      if (x.flight_ids.size() == 1 && x.flight_ids[0] == f.id) e = &x;
    t.add_row({std::to_string(f.id), f.date, mmss(f.flight_time_s), fx(f.energy_Wh, 1), fx(f.charge_Ah, 3),
               fx(100.0 * f.soc_land_counted, 1), fx(1000.0 * f.v_rmse_V, 0), fx(f.station_left_s, 0),
               e ? fx(e->capacity, 3) : "-", e ? fx(e->capacity_sd, 3) : "-", e ? fx(e->resistance, 3) : "-",
               e ? fx(e->resistance_sd, 3) : "-", e ? std::to_string(e->cycle) : "-"});
  }
  out += fl.empty() ? "  no flights logged yet\n" : t.render();
  out += "\n  land SoC: counted from the log on the pack file's capacity; SoH: the estimate from that flight (none: the "
         "estimate refused the log, see add-flight); " + std::string(kCycleNote) + ".\n\n" + kCaution + "\n";
  return out;
}

nlohmann::json history_json(const std::string& db, const logbook::PackRecord& p, const std::vector<logbook::FlightRecord>& fl,
                            const std::vector<logbook::EstimateRecord>& es) {
  nlohmann::json flights = nlohmann::json::array();
  for (const auto& f : fl)
    flights.push_back({{"id", f.id}, {"date", f.date}, {"profile", f.profile_path}, {"log", f.log_path},
                       {"log_sha256", f.log_sha256}, {"flight_time_s", f.flight_time_s}, {"energy_Wh", f.energy_Wh},
                       {"charge_Ah", f.charge_Ah}, {"soc_land_counted", f.soc_land_counted},
                       {"soc_land_voltage", f.soc_land_voltage}, {"v_rmse_V", f.v_rmse_V},
                       {"replay_rmse_V", f.replay_rmse_V ? nlohmann::json(*f.replay_rmse_V) : nlohmann::json(nullptr)},
                       {"station_left_s", f.station_left_s}});
  nlohmann::json ests = nlohmann::json::array();
  for (const auto& e : es) ests.push_back(estimate_json(e));
  return {{"logbook", db}, {"pack", pack_json(p)}, {"flights", flights}, {"estimates", ests},
          {"cycle_note", kCycleNote}, {"caution", kCaution}};
}

std::string trend_text(const std::string& db, const logbook::PackRecord& p, const logbook::PackTrend& t) {
  std::string out = "SoH trend of pack " + std::to_string(p.id) + " in " + db + ": " + p.name +
                    (p.serial.empty() ? "" : " (serial " + p.serial + ")") + "\n\n";
  TextTable tab({"cycle", "date", "capacity", "± sd", "resistance", "± sd", "flights"});
  for (const auto& e : t.points) {
    std::string ids;
    for (auto id : e.flight_ids) ids += (ids.empty() ? "" : ",") + std::to_string(id);
    tab.add_row({std::to_string(e.cycle), e.date, fx(e.capacity, 3), fx(e.capacity_sd, 3), fx(e.resistance, 3),
                 fx(e.resistance_sd, 3), ids});
  }
  out += t.points.empty() ? "  no estimates yet\n" : tab.render();
  out += "\n";
  if (!t.why_no_fit.empty()) {
    out += "  No trend: " + t.why_no_fit + ".\n";
  } else {
    out += "Fitted straight lines (least squares, each estimate counted once):\n";
    out += crossing_text("capacity", t.capacity);
    out += crossing_text("resistance", t.resistance);
    out += "  The limits (--capacity-limit, --resistance-limit) are crossed by " + std::string(kExtrapolation) + ".\n";
  }
  out += "  " + std::string(kCycleNote) + ".\n\n" + kCaution + "\n";
  return out;
}

nlohmann::json trend_json(const std::string& db, const logbook::PackRecord& p, const logbook::PackTrend& t) {
  nlohmann::json pts = nlohmann::json::array();
  for (const auto& e : t.points) pts.push_back(estimate_json(e));
  nlohmann::json j = {{"logbook", db}, {"pack", pack_json(p)}, {"estimates", pts}, {"cycle_note", kCycleNote},
                      {"caution", kCaution}};
  if (!t.why_no_fit.empty()) {
    j["trend"] = nullptr;
    j["why_no_trend"] = t.why_no_fit;
  } else {
    j["trend"] = {{"capacity", factor_json(t.capacity)}, {"resistance", factor_json(t.resistance)},
                  {"method", "ordinary least squares, each estimate counted once"}, {"crossing_note", kExtrapolation}};
  }
  return j;
}

namespace {

std::string factor_plot(const std::string& id, const std::string& what, const logbook::PackTrend& t, const FactorTrend& f,
                        bool capacity) {
  svg::LinePlot lp;
  lp.id = id;
  lp.title = what + " factor against cycle";
  lp.x = {"cycle", ""};
  lp.y = {what + " factor", ""};
  svg::Line pts, lo, hi;
  pts.label = "estimate";
  pts.markers = true;
  pts.width = 0.0;
  lo.label = "estimate − sd";
  hi.label = "estimate + sd";
  lo.stroke = hi.stroke = svg::Stroke::dotted;
  lo.markers = hi.markers = true;
  lo.width = hi.width = 0.0;
  lo.color = hi.color = "#7a8a99";
  for (const auto& e : t.points) {
    const double v = capacity ? e.capacity : e.resistance;
    const double sd = capacity ? e.capacity_sd : e.resistance_sd;
    pts.x.push_back(e.cycle);
    pts.y.push_back(v);
    lo.x.push_back(e.cycle);
    lo.y.push_back(v - sd);
    hi.x.push_back(e.cycle);
    hi.y.push_back(v + sd);
  }
  lp.lines = {pts, lo, hi};
  if (f.by_cycle) {
    double x_end = t.points.empty() ? 1.0 : double(t.points.back().cycle);
    if (f.cycle_at_limit.reached && f.cycle_at_limit.x > x_end && f.cycle_at_limit.x < 20.0 * (x_end + 1.0))
      x_end = f.cycle_at_limit.x;
    svg::Line fit;
    fit.label = "fitted line (dashed past the last estimate: extrapolated)";
    fit.color = "#b36b00";
    fit.stroke = svg::Stroke::dashed;
    for (int k = 0; k <= 50; ++k) {
      const double x = x_end * k / 50.0;
      fit.x.push_back(x);
      fit.y.push_back(f.by_cycle->intercept + f.by_cycle->slope * x);
    }
    lp.lines.push_back(fit);
  }
  lp.levels.push_back({f.limit, "limit " + fx(f.limit, 2)});
  return svg::render(lp);
}

}  // namespace

std::string trend_html(const std::string& db, const logbook::PackRecord& p, const logbook::PackTrend& t) {
  using namespace html;
  Page page("Pack SoH trend", "sortie logbook " + db + " trend --pack " + std::to_string(p.id));
  page.add(facts({{"pack", p.name + (p.serial.empty() ? "" : " (serial " + p.serial + ")")},
                  {"layout", std::to_string(p.series) + "S" + std::to_string(p.parallel) + "P, " + p.cell_note},
                  {"first use", p.first_use},
                  {"estimates", std::to_string(t.points.size())}}));
  if (!t.why_no_fit.empty()) {
    page.section("No trend", "<p>" + esc(t.why_no_fit) + ".</p>");
  } else {
    auto card = [&](const std::string& what, const std::string& key, const FactorTrend& f) {
      Card c;
      c.label = what + " reaches " + fx(f.limit, 2) + " (extrapolated)";
      if (f.cycle_at_limit.reached) {
        c.value_html = "cycle " + keyed("trend." + key + ".at_limit_cycle.cycle", fx(f.cycle_at_limit.x, 0)) + " ± " +
                       keyed("trend." + key + ".at_limit_cycle.cycle_sd", fx(f.cycle_at_limit.x_sd, 0));
        c.more = f.day_at_limit.reached ? "by date " + logbook::date_from_days(std::lround(f.day_at_limit.x)) + " ± " +
                                              fx(f.day_at_limit.x_sd, 0) + " days"
                                        : "by date: not reached on the line against dates";
      } else {
        c.value_html = "not on this trend";
        c.more = f.cycle_at_limit.why_not;
      }
      return c;
    };
    page.add(cards({card("capacity", "capacity", t.capacity), card("resistance", "resistance", t.resistance)}));
  }
  page.add(figure("Capacity factor against cycle, with the fitted line and the limit", factor_plot("cap", "capacity", t, t.capacity, true)));
  page.add(figure("Resistance factor against cycle, with the fitted line and the limit", factor_plot("res", "resistance", t, t.resistance, false)));
  Table tab({"cycle", "date", "capacity", "± sd", "resistance", "± sd"}, {true, false, true, true, true, true});
  for (std::size_t i = 0; i < t.points.size(); ++i) {
    const auto& e = t.points[i];
    const std::string k = "estimates." + std::to_string(i) + ".";
    tab.add_row({number_cell(std::to_string(e.cycle), k + "cycle"), text_cell(e.date),
                 number_cell(fx(e.capacity, 3), k + "capacity"), number_cell(fx(e.capacity_sd, 3), k + "capacity_sd"),
                 number_cell(fx(e.resistance, 3), k + "resistance"), number_cell(fx(e.resistance_sd, 3), k + "resistance_sd")});
  }
  page.section("Estimates", tab.render());
  page.section("How to read the crossing", "<p>The cycle and date where a limit is reached are " + esc(kExtrapolation) +
                                               ". " + esc(kCycleNote) + ".</p>");
  return page.render();
}

}  // namespace sortie::report
