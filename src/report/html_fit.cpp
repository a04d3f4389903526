#include "report/html_fit.hpp"

#include <algorithm>
#include <cmath>

#include "report/discharge_report.hpp"
#include "report/html_page.hpp"
#include "report/svg_plot.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

namespace {

using html::keyed;
using html::keyed_scaled;
using html::number_cell;
using html::scaled_cell;
using html::text_cell;

const char* kMeasured = "#1d2733";
const char* kModel = "#0b6e8a";
const char* kError = "#b23a48";
const char* kSecond = "#c46a00";
const char* kThird = "#7a3d8c";
const char* kFourth = "#5c7f1f";

std::string list(const std::vector<std::string>& items) {
  std::string o = "<ul class=\"events\">\n";
  for (const auto& s : items) o += "<li>" + html::esc(s) + "</li>\n";
  return o + "</ul>\n";
}

}  // namespace

std::string fit_cell_html(const battery::CellLog& log, const fit::CellFitResult& r, const fit::VoltageErrors& e,
                          const std::vector<double>& v_model, const std::string& model_file) {
  html::Page page("Cell fit: " + log.file, "sortie fit cell · model written to " + model_file + " · " +
                                               std::to_string(r.rows) + " log rows");
  std::vector<html::Card> cards = {
      {"voltage RMSE", keyed_scaled("voltage_rmse_V", fixed(e.all.rmse_V * 1000, 1) + " mV", 1000),
       "written model re-simulated on the log"},
      {"largest error", keyed_scaled("voltage_max_error_V", fixed(e.all.max_abs_V * 1000, 1) + " mV", 1000),
       "at log line " + std::to_string(e.all.rows ? log.line[e.all.max_row] : 0)},
      {"capacity", keyed("soc.capacity_Ah", fixed(r.soc_estimate.capacity_Ah, 3) + " Ah"), r.soc_estimate.capacity_source},
      {"log", keyed("log.duration_s", fixed(r.duration_s, 0) + " s"), duration_hms(r.duration_s)},
      {"current steps", keyed("current_steps", std::to_string(r.steps)),
       std::to_string(r.n_rc) + " RC pair" + (r.n_rc > 1 ? "s" : "") + (r.tables ? ", tables over SoC" : ", constants")},
      {"fit", keyed("iterations", std::to_string(r.iterations)) + " steps", fit::to_string(r.status),
       r.status != fit::LmStatus::converged},
  };
  page.add(html::cards(cards));

  // Time in hours for long logs, minutes for shorter ones.
  const double span = r.duration_s;
  const double per_s = span > 3 * 3600.0 ? 1.0 / 3600.0 : (span > 150.0 ? 1.0 / 60.0 : 1.0);
  const std::string unit = span > 3 * 3600.0 ? "h" : (span > 150.0 ? "min" : "s");
  const double t0 = log.time_s.empty() ? 0.0 : log.time_s.front();
  svg::LinePlot v;
  v.id = kFitCellPlots[0];
  v.title = "Measured and model cell voltage over the log";
  v.x = {"time", unit, {}, {}, true};
  v.y = {"cell voltage", "V", {}, {}};
  svg::Line meas{"measured", {}, {}, kMeasured, svg::Side::left, svg::Stroke::solid, 1.6};
  svg::Line model{"model (written file, re-simulated)", {}, {}, kModel, svg::Side::left, svg::Stroke::dashed, 2.0};
  svg::LinePlot er;
  er.id = kFitCellPlots[1];
  er.title = "Model minus measured voltage over the log";
  er.x = v.x;
  er.y = {"model − measured", "mV", {}, {}};
  svg::Line err{"model − measured", {}, {}, kError, svg::Side::left, svg::Stroke::solid, 1.4};
  for (std::size_t k = 0; k < log.size(); ++k) {
    const double t = (log.time_s[k] - t0) * per_s;
    meas.x.push_back(t);
    meas.y.push_back(log.voltage_V[k]);
    const double vm = k < v_model.size() ? v_model[k] : std::nan("");
    model.x.push_back(t);
    model.y.push_back(vm);
    err.x.push_back(t);
    err.y.push_back((vm - log.voltage_V[k]) * 1000.0);
  }
  v.lines = {meas, model};
  er.lines = {err};
  er.levels.push_back({e.all.rmse_V * 1000, "+RMSE " + fixed(e.all.rmse_V * 1000, 1) + " mV", kMeasured});
  er.levels.push_back({-e.all.rmse_V * 1000, "−RMSE", kMeasured});

  svg::LinePlot ocv;
  ocv.id = kFitCellPlots[2];
  ocv.title = "Fitted open-circuit voltage against state of charge";
  ocv.x = {"state of charge", "%", 0.0, 100.0};
  ocv.y = {"open-circuit voltage", "V", {}, {}};
  ocv.width = 590;
  ocv.height = 380;
  svg::Line ocv_line{"OCV table of the model", {}, {}, kModel, svg::Side::left, svg::Stroke::solid, 2.2, true};
  for (std::size_t k = 0; k < r.cell.ocv_V.x().size(); ++k) {
    ocv_line.x.push_back(r.cell.ocv_V.x()[k] * 100.0);
    ocv_line.y.push_back(r.cell.ocv_V.y()[k]);
  }
  ocv.lines = {ocv_line};

  svg::LinePlot res;
  res.id = kFitCellPlots[3];
  res.title = "Fitted resistances per state-of-charge band";
  res.x = {"state of charge", "%", 0.0, 100.0};
  res.y = {"resistance", "mΩ", 0.0, {}};
  res.width = 590;
  res.height = 380;
  const char* colours[] = {kModel, kSecond, kThird};
  std::vector<svg::Line> rl;
  rl.push_back({"R0", {}, {}, colours[0], svg::Side::left, svg::Stroke::solid, 2.2, true});
  for (int p = 0; p < r.n_rc; ++p)
    rl.push_back({"R" + std::to_string(p + 1), {}, {}, colours[p + 1], svg::Side::left, svg::Stroke::dashed, 2.0, true});
  for (const auto& b : r.bands) {
    rl[0].x.push_back(b.soc * 100);
    rl[0].y.push_back(r.cell.r0_ohm(b.soc) * 1000);
    for (int p = 0; p < r.n_rc; ++p) {
      rl[p + 1].x.push_back(b.soc * 100);
      rl[p + 1].y.push_back(r.cell.rc[p].r_ohm(b.soc) * 1000);
    }
  }
  res.lines = rl;

  std::string plots = html::figure("Cell voltage, measured and model", svg::render(v),
                                   "The model is the written file run on the log's current by the same integrator as "
                                   "the other commands, from the counted state of charge at the first row.");
  plots += html::figure("Model minus measured", svg::render(er));
  plots += "<div class=\"grid2\">\n" + html::figure("Open-circuit voltage", svg::render(ocv)) +
           html::figure("Resistances", svg::render(res), "R0 in series; R1, R2 of the RC pairs. Each point is a band.") +
           "</div>\n";
  page.section("Fit against the log", plots);

  std::vector<std::string> head = {"band SoC %", "rows", "steps", "R0 mΩ"};
  for (int p = 0; p < r.n_rc; ++p) {
    head.push_back("R" + std::to_string(p + 1) + " mΩ");
    head.push_back("τ" + std::to_string(p + 1) + " s");
  }
  head.insert(head.end(), {"RMSE mV", "excitation"});
  html::Table t(head);
  for (std::size_t b = 0; b < r.bands.size(); ++b) {
    const auto& band = r.bands[b];
    const std::string k = "bands." + std::to_string(b) + ".";
    std::vector<html::Cell> row = {
        html::html_cell(keyed(k + "soc_lo", fixed(band.soc_lo * 100, 0), "%") + "–" +
                            keyed(k + "soc_hi", fixed(band.soc_hi * 100, 0), "%"),
                        true),
        number_cell(std::to_string(band.rows), k + "rows"), number_cell(std::to_string(band.steps), k + "steps"),
        scaled_cell(fixed(r.cell.r0_ohm(band.soc) * 1000, 2), k + "r0_ohm", 1000)};
    for (int p = 0; p < r.n_rc; ++p) {
      const std::string kp = k + "rc." + std::to_string(p) + ".";
      row.push_back(scaled_cell(fixed(r.cell.rc[p].r_ohm(band.soc) * 1000, 2), kp + "r_ohm", 1000));
      row.push_back(number_cell(fixed(r.cell.rc[p].tau_s(band.soc), 1), kp + "tau_s"));
    }
    if (b < e.bands.size() && e.bands[b].rows > 0)
      row.push_back(scaled_cell(fixed(e.bands[b].rmse_V * 1000, 1), k + "voltage_rmse_V", 1000));
    else
      row.push_back(number_cell("-"));
    row.push_back(band.excited ? text_cell("enough") : html::html_cell(html::esc("too little: " + band.why), false, "fail"));
    t.add_row(row, band.excited ? "" : "muted");
  }
  page.section("Parameters per state-of-charge band", t.render());
  // The fit's notes and warnings include the log reader's.
  if (!r.notes.empty()) page.section("Notes", list(r.notes));
  if (!r.warnings.empty()) page.section("Warnings", list(r.warnings), "cautions");
  return page.render();
}

std::string fit_drive_html(const std::string& bench_file, const fit::DriveFitResult& r, const std::string& model_file) {
  html::Page page("Drive fit: " + bench_file, "sortie fit drive · model written to " + model_file + " · " +
                                                  std::to_string(r.points.size()) + " throttle steps");
  std::vector<html::Card> cards = {
      {"bus power error (RMS)", keyed("rms_power_pct", fixed(r.rms_power_pct, 2) + " %"),
       "largest " + fixed(r.max_power_pct, 2) + " %"},
      {"thrust error (RMS)", keyed("rms_thrust_pct", fixed(r.rms_thrust_pct, 2) + " %"), ""},
      {"speed error (RMS)", keyed("rms_rpm_pct", fixed(r.rms_rpm_pct, 2) + " %"), ""},
      {"fit", keyed("iterations", std::to_string(r.iterations)) + " steps", fit::to_string(r.status),
       r.status != fit::LmStatus::converged},
  };
  if (r.has_torque)
    cards.insert(cards.begin() + 3,
                 {"torque error (RMS)", keyed("rms_torque_pct", fixed(r.rms_torque_pct, 2) + " %"), ""});
  page.add(html::cards(cards));

  auto plot = [&](const char* id, const std::string& title, svg::Axis y) {
    svg::LinePlot p;
    p.id = id;
    p.title = title;
    p.x = {"throttle", "%", 0.0, 100.0};
    p.y = std::move(y);
    p.width = 590;
    p.height = 380;
    return p;
  };
  svg::LinePlot thrust = plot(kFitDrivePlots[0], "Thrust and speed against throttle", {"thrust", "N", 0.0, {}});
  thrust.y2 = svg::Axis{"speed", "rpm", 0.0, {}};
  svg::Line tm{"thrust, measured", {}, {}, kMeasured, svg::Side::left, svg::Stroke::dotted, 1.4, true};
  svg::Line tf{"thrust, model", {}, {}, kModel};
  svg::Line rm{"rpm, measured (right)", {}, {}, kSecond, svg::Side::right, svg::Stroke::dotted, 1.4, true};
  svg::Line rf{"rpm, model (right)", {}, {}, kSecond, svg::Side::right, svg::Stroke::dashed};
  svg::LinePlot power = plot(kFitDrivePlots[1], "Bus power against throttle", {"bus power", "W", 0.0, {}});
  svg::Line pm{"measured", {}, {}, kMeasured, svg::Side::left, svg::Stroke::dotted, 1.4, true};
  svg::Line pf{"model", {}, {}, kModel};
  svg::LinePlot resid = plot(kFitDrivePlots[2], "Model minus measured, per cent of measured", {"model − measured", "%", {}, {}});
  svg::Line er{"speed", {}, {}, kSecond, svg::Side::left, svg::Stroke::solid, 1.8, true};
  svg::Line et{"thrust", {}, {}, kModel, svg::Side::left, svg::Stroke::solid, 1.8, true};
  svg::Line ep{"bus power", {}, {}, kError, svg::Side::left, svg::Stroke::solid, 1.8, true};
  svg::Line eq{"torque", {}, {}, kThird, svg::Side::left, svg::Stroke::solid, 1.8, true};
  svg::LinePlot eff = r.has_torque ? plot(kFitDrivePlots[3], "System efficiency against throttle", {"system efficiency", "%", 0.0, 100.0})
                                   : plot(kFitDrivePlots[3], "Thrust per bus power against throttle", {"thrust per power", "g/W", 0.0, {}});
  svg::Line xm{"measured", {}, {}, kMeasured, svg::Side::left, svg::Stroke::dotted, 1.4, true};
  svg::Line xf{"model", {}, {}, kFourth};
  for (const auto& p : r.points) {
    const double x = p.measured.throttle_pct;
    tm.x.push_back(x), tm.y.push_back(p.measured.thrust_N);
    tf.x.push_back(x), tf.y.push_back(p.thrust_N);
    rm.x.push_back(x), rm.y.push_back(p.measured.rpm);
    rf.x.push_back(x), rf.y.push_back(p.rpm);
    pm.x.push_back(x), pm.y.push_back(p.measured.bus_W());
    pf.x.push_back(x), pf.y.push_back(p.bus_W);
    er.x.push_back(x), er.y.push_back(p.err_rpm_pct);
    et.x.push_back(x), et.y.push_back(p.err_thrust_pct);
    ep.x.push_back(x), ep.y.push_back(p.err_power_pct);
    eq.x.push_back(x), eq.y.push_back(p.err_torque_pct);
    xm.x.push_back(x), xm.y.push_back(r.has_torque ? p.eta_measured * 100 : p.g_per_W_measured);
    xf.x.push_back(x), xf.y.push_back(r.has_torque ? p.eta_model * 100 : p.g_per_W_model);
  }
  thrust.lines = {tm, tf, rm, rf};
  power.lines = {pm, pf};
  resid.lines = {er, et, ep};
  if (r.has_torque) resid.lines.push_back(eq);
  resid.levels.push_back({0.0, "", kMeasured});
  eff.lines = {xm, xf};
  std::string plots = "<div class=\"grid2\">\n";
  plots += html::figure("Thrust and speed", svg::render(thrust));
  plots += html::figure("Bus power", svg::render(power));
  plots += html::figure("Residuals", svg::render(resid), "Rows where the motor does not turn count bus power only.");
  plots += html::figure(r.has_torque ? "System efficiency" : "Thrust per bus power", svg::render(eff));
  plots += "</div>\n<p class=\"note\">Dots are the bench's measurements; lines are the fitted drive at the same "
           "throttle and bus voltage.</p>\n";
  page.section("Fit against the bench", plots);

  html::Table pt({"parameter", "value", "unit", "± 1 standard error %"});
  for (const auto& p : r.parameters) {
    const int digits = p.value >= 100 ? 1 : (p.value >= 1 ? 3 : 5);
    const std::string k = "parameters." + p.name + ".";
    pt.add_row({text_cell(p.name), number_cell(fixed(p.value, digits), k + "value"), text_cell(p.unit),
                p.at_bound ? html::html_cell("at bound", false, "fail")
                           : number_cell(fixed(100.0 * p.se_rel, 1), k + "se_rel", "%")});
  }
  page.section("Fitted parameters", pt.render());

  std::vector<std::string> head = {"throttle %", "bus V", "rpm", "model rpm", "rpm err %", "thrust N", "model N",
                                   "thrust err %", "bus W", "model W", "power err %"};
  html::Table t(head);
  for (std::size_t i = 0; i < r.points.size(); ++i) {
    const auto& p = r.points[i];
    const auto& m = p.measured;
    const std::string k = "points." + std::to_string(i) + ".";
    auto err = [&](double v, const std::string& key) {
      // Already in per cent in the JSON: scale 1.
      return std::isfinite(v) ? scaled_cell(fixed(v, 2), k + "error_pct." + key, 1.0) : number_cell("-");
    };
    t.add_row({number_cell(fixed(m.throttle_pct, 1), k + "throttle_pct"), number_cell(fixed(m.v_bus_V, 2), k + "v_bus_V"),
               number_cell(fixed(m.rpm, 0), k + "measured.rpm"), number_cell(fixed(p.rpm, 0), k + "model.rpm"),
               err(p.err_rpm_pct, "rpm"), number_cell(fixed(m.thrust_N, 3), k + "measured.thrust_N"),
               number_cell(fixed(p.thrust_N, 3), k + "model.thrust_N"), err(p.err_thrust_pct, "thrust"),
               number_cell(fixed(m.bus_W(), 2), k + "measured.bus_W"), number_cell(fixed(p.bus_W, 2), k + "model.bus_W"),
               err(p.err_power_pct, "bus_power")},
              p.running ? "" : "muted");
  }
  page.section("Per throttle step", t.render());
  if (!r.notes.empty()) page.section("Notes", list(r.notes));
  if (!r.warnings.empty()) page.section("Warnings", list(r.warnings), "cautions");
  return page.render();
}

}  // namespace sortie::report
