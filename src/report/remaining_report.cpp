#include "report/remaining_report.hpp"

#include "report/html_page.hpp"
#include "report/svg_plot.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

std::string remaining_html(const std::string& log_file, const std::string& profile_file, const sim::MeasuredFlight& log,
                           const estimate::Remaining& r, const estimate::FilterResult& whole, const nlohmann::json& j) {
  using namespace html;
  Page page("Time left in flight", "sortie remaining " + log_file + " --profile " + profile_file + " --at-s " + fixed(r.t_cut_s, 1));
  // The first rule reached is the one that binds.
  const estimate::RuleTime* first = nullptr;
  for (const auto& x : r.rules)
    if (x.time_s && (!first || *x.time_s < *first->time_s)) first = &x;
  page.add(cards({
      {"state of charge at the cut", keyed("soc", fixed(100 * r.soc, 1), "%") + " %", "± " + fixed(100 * r.soc_sd, 2) + " % (1 sd)", false},
      {"present power", keyed("present_power_W", fixed(r.power_W, 1)) + " W",
       "mean V·I over the last " + fixed(r.window_s, 0) + " s", false},
      {"first rule reached", first ? (first->already ? "already past" : fixed(*first->time_s, 0) + " s") : "none",
       first ? first->rule : "no rule is reached before the pack's end", first && first->already},
  }));
  page.add(facts_html({{"cut", keyed("t_cut_s", fixed(r.t_cut_s, 1)) + " s, " + std::to_string(r.rows) + " rows"},
                       {"state of charge", keyed("soc", fixed(100 * r.soc, 1), "%") + " % ± " + keyed("soc_sd", fixed(100 * r.soc_sd, 2), "%") + " % (1 sd)"},
                       {"pack soh", "capacity " + keyed("pack_soh.capacity", fixed(j["pack_soh"]["capacity"].get<double>(), 3)) +
                                        ", resistance " + keyed("pack_soh.resistance", fixed(j["pack_soh"]["resistance"].get<double>(), 3))}}));
  const std::size_t n = whole.rows.size();
  std::vector<double> t(n), soc(n), lo(n), hi(n), v_model(n);
  for (std::size_t k = 0; k < n; ++k) {
    t[k] = whole.rows[k].t_s;
    soc[k] = 100 * whole.rows[k].soc;
    lo[k] = 100 * (whole.rows[k].soc - whole.rows[k].soc_sd);
    hi[k] = 100 * (whole.rows[k].soc + whole.rows[k].soc_sd);
    v_model[k] = log.voltage_V[k] - whole.rows[k].innovation_V;
  }
  const std::vector<svg::Band> bands = {{r.t_cut_s, log.time_s.back(), "after the cut"}};
  svg::LinePlot sp;
  sp.id = "soc";
  sp.title = "filtered state of charge";
  sp.x = {"time from the first row", "s", {}, {}, true};
  sp.y = {"state of charge", "%", {}, {}, false};
  sp.lines = {{"filtered SoC", t, soc, "#0b6e8a", svg::Side::left, svg::Stroke::solid, 2.2, false},
              {"+1 sd", t, hi, "#7aa9b8", svg::Side::left, svg::Stroke::dashed, 1.2, false},
              {"-1 sd", t, lo, "#7aa9b8", svg::Side::left, svg::Stroke::dashed, 1.2, false}};
  sp.bands = bands;
  sp.right_margin = true;
  page.add(figure("State of charge from the filter with its ±1 sd band (after the cut: the filter run on over the rest of the log)",
                  svg::render(sp)));
  svg::LinePlot vp;
  vp.id = "voltage";
  vp.title = "pack voltage";
  vp.x = sp.x;
  vp.y = {"pack voltage", "V", {}, {}, false};
  vp.lines = {{"log", log.time_s, log.voltage_V, "#333333", svg::Side::left, svg::Stroke::solid, 1.4, false},
              {"filter prediction", t, v_model, "#c77d0a", svg::Side::left, svg::Stroke::dashed, 2.0, false}};
  vp.bands = bands;
  vp.right_margin = true;
  page.add(figure("Pack voltage: the log and the filter's one-step prediction", svg::render(vp)));
  svg::BarPlot bp;
  bp.id = "time-left";
  bp.title = "time left to each rule";
  bp.value = {"time left at the present power", "s", 0.0, {}, false};
  Table tab({"rule", "limit", "time left s", "sd s"}, {false, true, true, true});
  for (std::size_t i = 0; i < r.rules.size(); ++i) {
    const auto& x = r.rules[i];
    const std::string k = "rules." + std::to_string(i) + ".";
    svg::Bar b;
    b.label = x.rule;
    if (x.time_s && !x.already) {
      b.value = *x.time_s;
      b.value_text = fixed(*x.time_s, 0) + " s ± " + fixed(x.sd_s, 0);
    } else {
      b.value_text = x.already ? "already past" : "not reached";
      b.flagged = x.already;
    }
    bp.bars.push_back(b);
    const std::string limit = fixed(x.limit, x.unit == "s" ? 0 : 2) + (x.unit.empty() ? "" : " " + x.unit);
    tab.add_row({text_cell(x.rule), text_cell(limit),
                 x.time_s && !x.already ? number_cell(fixed(*x.time_s, 0), k + "time_left_s")
                                        : text_cell(x.already ? "already past" : "not reached"),
                 x.time_s && !x.already ? number_cell(fixed(x.sd_s, 0), k + "time_left_sd_s") : text_cell("-")},
                x.already ? "fail" : "");
  }
  page.add(figure("Time left to each reserve rule at the present power", svg::render(bp)));
  page.section("At the present power", tab.render());
  page.section("Method", "<p>" + esc(j.value("method", std::string())) + ".</p><p>" + esc(j.value("caution", std::string())) + "</p>");
  return page.render();
}

}  // namespace sortie::report
