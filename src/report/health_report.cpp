#include "report/health_report.hpp"

#include "report/html_page.hpp"
#include "report/svg_plot.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

std::string health_html(const std::string& source, const battery::Pack& pack,
                        const std::vector<estimate::HealthFlight>& flights, const estimate::HealthEstimate& e,
                        const std::vector<estimate::HealthEstimate>& own, const nlohmann::json& j) {
  using namespace html;
  Page page("Pack state of health", "sortie health on " + std::to_string(flights.size()) + " log(s), pack of " + source);
  page.add(facts({{"pack", source + " (" + pack.layout() + ", " + pack.cell.name + ")"},
                  {"logs", std::to_string(flights.size()) + " given, " + std::to_string(e.logs_used) + " used"}}));
  if (e.refused) page.section("No estimate", "<p>" + esc(e.why_refused) + ".</p>", "alert");
  if (e.logs_used > 0) {
    const std::string tag = e.refused ? " (not accepted)" : "";
    page.add(cards({
        {"capacity factor" + tag, keyed("soh.capacity", fixed(e.capacity, 3)),
         "± " + fixed(e.capacity_sd, 3) + " (1 sd)", e.refused},
        {"resistance factor" + tag, keyed("soh.resistance", fixed(e.resistance, 3)),
         "± " + fixed(e.resistance_sd, 3) + " (1 sd, on R0)", e.refused},
        {"correlation", keyed("soh.correlation", fixed(e.correlation, 3)), "of the two factors", false},
        {"fit RMSE", keyed_scaled("fit.rmse_V", fixed(1000 * e.rmse_V, 1), 1000) + " mV",
         std::to_string(e.rows_used) + " rows, " + std::to_string(e.parameters) + " parameters", false},
    }));
    page.add(facts_html({{"capacity factor", keyed("soh.capacity", fixed(e.capacity, 3)) + " ± " +
                                                 keyed("soh.capacity_sd", fixed(e.capacity_sd, 3)) + " (1 sd)"},
                         {"resistance factor", keyed("soh.resistance", fixed(e.resistance, 3)) + " ± " +
                                                   keyed("soh.resistance_sd", fixed(e.resistance_sd, 3)) + " (1 sd, on R0)"}}));
  }
  // Measured against modelled voltage, per used log.
  std::size_t plotted = 0;
  for (std::size_t i = 0; i < e.flights.size() && i < flights.size(); ++i) {
    const auto& f = e.flights[i];
    if (!f.refused.empty() || e.logs_used == 0) continue;
    if (plotted == kHealthPlotsMax) break;
    const auto model = estimate::health_model_voltage(pack, flights[i].log, e.capacity, e.resistance, f.soc0);
    svg::LinePlot lp;
    lp.id = "voltage-" + std::to_string(i + 1);
    lp.title = "pack voltage of " + f.name;
    lp.x = {"time from the first row", "s", {}, {}, true};
    lp.y = {"pack voltage", "V", {}, {}, false};
    lp.lines = {{"log", flights[i].log.time_s, flights[i].log.voltage_V, "#333333", svg::Side::left, svg::Stroke::solid, 1.4, false},
                {"model, c " + fixed(e.capacity, 3) + ", r " + fixed(e.resistance, 3) + ", start SoC " + fixed(100 * f.soc0, 1) + " %",
                 flights[i].log.time_s, model, "#0b6e8a", svg::Side::left, svg::Stroke::dashed, 2.2, false}};
    page.add(figure("Pack voltage of " + f.name + ": the log and the model with the fitted factors",
                    svg::render(lp),
                    "RMSE " + fixed(1000 * f.rmse_V, 1) + " mV over " + std::to_string(f.rows) + " rows"));
    ++plotted;
  }
  if (plotted == kHealthPlotsMax && e.logs_used > kHealthPlotsMax)
    page.section("Plots", "<p>The first " + std::to_string(kHealthPlotsMax) + " logs used are plotted; every log is in the tables.</p>");
  Table t({"log", "rows", "charge Ah", "depth %", "I spread %", "start SoC %", "RMSE mV", "used"},
          {false, true, true, true, true, true, true, false});
  for (std::size_t i = 0; i < e.flights.size(); ++i) {
    const auto& f = e.flights[i];
    const std::string k = "flights." + std::to_string(i) + ".";
    const bool used = f.refused.empty();
    t.add_row({text_cell(f.name), number_cell(std::to_string(f.rows), k + "rows"),
               number_cell(fixed(f.charge_Ah, 3), k + "charge_Ah"), number_cell(fixed(100 * f.depth, 1), k + "depth", "%"),
               number_cell(fixed(100 * f.current_spread, 1), k + "current_spread", "%"),
               used ? number_cell(fixed(100 * f.soc0, 1), k + "soc0", "%") : text_cell("-"),
               used ? scaled_cell(fixed(1000 * f.rmse_V, 1), k + "rmse_V", 1000) : text_cell("-"),
               text_cell(used ? "yes" : "no: " + f.refused)},
              used ? "" : "fail");
  }
  page.section("Logs", t.render());
  if (!own.empty()) {
    Table a({"log", "capacity factor", "± sd", "resistance factor", "± sd", "correlation"},
            {false, true, true, true, true, true});
    for (std::size_t i = 0; i < own.size() && i < e.flights.size(); ++i) {
      const auto& x = own[i];
      const std::string k = "flights." + std::to_string(i) + ".own.";
      if (x.refused) {
        a.add_row({text_cell(e.flights[i].name), text_cell("no estimate: " + j["flights"][i]["own"].value("why_refused", std::string())),
                   text_cell(""), text_cell(""), text_cell(""), text_cell("")},
                  "fail");
      } else {
        a.add_row({text_cell(e.flights[i].name), number_cell(fixed(x.capacity, 3), k + "capacity"),
                   number_cell(fixed(x.capacity_sd, 3), k + "capacity_sd"), number_cell(fixed(x.resistance, 3), k + "resistance"),
                   number_cell(fixed(x.resistance_sd, 3), k + "resistance_sd"), number_cell(fixed(x.correlation, 3), k + "correlation")});
      }
    }
    page.section("Each log alone", a.render() + "<p>" + esc(j.value("per_log_note", std::string())) + ".</p>");
  }
  page.section("Method", "<p>" + esc(j.value("method", std::string())) + ".</p><p>" + esc(j.value("caution", std::string())) + "</p>");
  return page.render();
}

}  // namespace sortie::report
