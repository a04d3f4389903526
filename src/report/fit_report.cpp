#include "report/fit_report.hpp"

#include <cmath>

#include "report/discharge_report.hpp"
#include "report/text_table.hpp"

namespace sortie::report {

namespace {

std::string mohm(double ohm) { return fixed(1000.0 * ohm, ohm < 0.01 ? 3 : 2); }

const char* anchor_words(fit::SocAnchor::Kind k) {
  switch (k) {
    case fit::SocAnchor::Kind::full: return "full";
    case fit::SocAnchor::Kind::empty: return "empty";
    case fit::SocAnchor::Kind::given: return "given (--soc0)";
  }
  return "";
}

const char* anchor_key(fit::SocAnchor::Kind k) {
  switch (k) {
    case fit::SocAnchor::Kind::full: return "full";
    case fit::SocAnchor::Kind::empty: return "empty";
    case fit::SocAnchor::Kind::given: return "given";
  }
  return "";
}

std::string where(const battery::CellLog& log, const fit::CellFitResult& r, std::size_t row) {
  const double soc = r.soc[row];
  return "line " + std::to_string(log.line[row]) + " (t = " + fixed(log.time_s[row] - log.time_s.front(), 1) +
         " s, SoC " + fixed(soc, 3) + ")" +
         (soc < -0.005 || soc > 1.005 ? ", beyond this log's own full or empty point, where the tables hold their end values"
                                      : "");
}

}  // namespace

std::string fit_cell_text(const battery::CellLog& log, const fit::CellFitResult& r,
                          const fit::VoltageErrors& e, const std::string& model_file) {
  const auto& se = r.soc_estimate;
  std::string out = "sortie fit cell: " + log.file + " -> " + model_file + "\n\n";
  KeyValues kv;
  kv.add("log", std::to_string(r.rows) + " rows in " + std::to_string(r.sections) + " section" +
                    (r.sections == 1 ? "" : "s") + ", " + duration_hms(r.duration_s) + ", time steps " +
                    fixed(r.dt_min_s, r.dt_min_s < 0.1 ? 3 : 2) + " s to " + fixed(r.dt_max_s, r.dt_max_s < 1.0 ? 3 : 1) + " s");
  for (const auto& nline : r.notes) kv.add("", nline);
  if (r.has_temperature)
    kv.add("cell temperature", fixed(r.temperature_mean_C, 1) + " °C mean (" + fixed(r.temperature_min_C, 1) +
                                   " to " + fixed(r.temperature_max_C, 1) + " °C)");
  for (const auto& a : se.anchors)
    kv.add("known SoC point", std::string(anchor_words(a.kind)) + (a.how.empty() ? "" : ": " + a.how) + ", " + where(log, r, a.row));
  kv.add("capacity", fixed(se.capacity_Ah, 3) + " Ah, " + se.capacity_source);
  kv.add("OCV", "fitted with the RC pairs, from " + std::to_string(r.ocv_rest_points) + " rest ends and " +
                    std::to_string(r.ocv_loaded_points) + " low-rate rows to start; table of " +
                    std::to_string(r.cell.ocv_V.size()) + " points, " + fixed(r.cell.ocv_V.y().front(), 3) + " V to " +
                    fixed(r.cell.ocv_V.y().back(), 3) + " V");
  kv.add("parameters", std::to_string(r.n_rc) + " RC pair" + (r.n_rc == 1 ? "" : "s") + ", " +
                           (r.tables ? "tables over " + std::to_string(r.bands.size()) + " SoC bands" : std::string("constants")) +
                           ", from " + std::to_string(r.steps) + " current steps; " + std::to_string(r.iterations) +
                           " Levenberg-Marquardt steps, " + fit::to_string(r.status));
  kv.add("voltage RMSE", fixed(1000.0 * e.all.rmse_V, 1) + " mV over " + std::to_string(e.all.rows) +
                             " rows (the written model re-simulated on the log's current)");
  kv.add("largest error", fixed(1000.0 * e.all.max_abs_V, 1) + " mV at " + where(log, r, e.all.max_row));
  if (r.rows_evaluated > 0 && r.rows_evaluated < r.rows)
    kv.add("rows merged", std::to_string(r.rows) + " log rows fitted as " + std::to_string(r.rows_evaluated) +
                              " steps: stretches of a held current merged into steps of up to 1 s, each weighted by "
                              "the rows it stands for (the response after every current change keeps each sample)");
  if (e.counted.rows > 0 && e.counted.rows < e.all.rows)
    kv.add("rows fitted", "RMSE " + fixed(1000.0 * e.counted.rmse_V, 1) + " mV, largest " +
                              fixed(1000.0 * e.counted.max_abs_V, 1) + " mV over the " + std::to_string(e.counted.rows) +
                              " rows the fit counts (long charges and the rests after them are left out: the OCV "
                              "on charge lies higher, by hysteresis)");
  kv.add("mean error", fixed(1000.0 * e.all.mean_V, 1) + " mV (model minus measured)");
  if (!r.rc_candidates.empty()) {
    std::string t;
    for (const auto& c : r.rc_candidates)
      t += (t.empty() ? "" : ", ") + std::to_string(c.rc_pairs) + " RC to " + fixed(c.tau_max_s, 0) + " s " +
           fixed(1000.0 * c.held_out_rmse_V, 1) + " mV" + (c.chosen ? " (chosen)" : "");
    kv.add("RC structure", t + " (held-out RMSE of the constants)");
  }
  if (r.held_out_rows > 0)
    kv.add("held-out RMSE", fixed(1000.0 * r.held_out_rmse_V, 1) + " mV over " + std::to_string(r.held_out_rows) +
                                " rows predicted by fits that did not see them (two folds over " +
                                std::to_string(r.held_out_blocks) + " blocks between long rests)");
  if (r.cell.fit_quality)
    kv.add("quality gate", std::string(r.cell.fit_quality->passed ? "passed" : "FAILED") + " (limit " +
                               fixed(1000.0 * r.cell.fit_quality->threshold_V, 0) + " mV on the " +
                               (r.held_out_rows > 0 ? "held-out" : "re-simulation") + " RMSE" +
                               (r.ocv_physical ? "" : "; OCV outside the chemistry's bounds") + ")");
  if (r.cell.coverage) {
    const auto& c = *r.cell.coverage;
    kv.add("covered", "SoC " + fixed(c.soc_min, 3) + " to " + fixed(c.soc_max, 3) +
                          (c.current_min_A && c.current_max_A
                               ? ", current " + fixed(*c.current_min_A, 2) + " to " + fixed(*c.current_max_A, 2) + " A"
                               : std::string()) +
                          (c.temperature_min_C ? ", " + fixed(*c.temperature_min_C, 1) + " to " + fixed(*c.temperature_max_C, 1) + " °C"
                                               : std::string()) +
                          " (written as \"coverage\"; outside it the model extrapolates)");
  }
  if (r.thermal && r.cell.thermal) {
    const auto& t = *r.thermal;
    kv.add("thermal block", "heat capacity " + fixed(t.heat_capacity_J_per_K, 1) + " J/K (" +
                                fixed(r.cell.thermal->c_J_per_kgK, 0) + " J/(kg·K) for " + fixed(r.cell.mass_kg, 3) +
                                " kg), hA " + fixed(t.hA_W_per_K, 4) + " W/K (time constant " +
                                (t.hA_W_per_K > 0 ? fixed(t.heat_capacity_J_per_K / t.hA_W_per_K / 60.0, 1) + " min"
                                                  : std::string("none")) +
                                "), air " + fixed(t.air_C, 1) + " °C" + (t.air_given ? " (given)" : " (fitted)"));
    kv.add("", "temperature RMSE " + fixed(t.rmse_K, 2) + " K, largest " + fixed(t.max_error_K, 2) +
                   " K (the block re-run on the circuit's heat over " + std::to_string(t.rows) + " rows)");
    kv.add("", t.how);
  }
  if (r.arrhenius)
    kv.add("R(T)", std::string(r.arrhenius->fitted ? "Arrhenius, fitted: " : "Arrhenius, prior: ") +
                                              r.arrhenius->how);
  out += kv.render();

  out += "\nparameters per SoC band (R0 step: -dV/dI across the band's current steps)\n";
  std::vector<std::string> head = {"SoC band", "steps", "R0 step mΩ", "R0 mΩ"};
  for (int p = 0; p < r.n_rc; ++p) {
    // Built by appending (GCC 12 warns falsely on "R" + std::to_string(...), -Wrestrict).
    std::string rk = "R", tk = "τ";
    rk.append(std::to_string(p + 1)).append(" mΩ");
    tk.append(std::to_string(p + 1)).append(" s");
    head.push_back(rk);
    head.push_back(tk);
  }
  head.insert(head.end(), {"RMSE mV", "max mV", "excitation"});
  TextTable t(head);
  for (std::size_t b = 0; b < r.bands.size(); ++b) {
    const auto& band = r.bands[b];
    std::vector<std::string> row = {fixed(band.soc_lo, 2) + "-" + fixed(band.soc_hi, 2), std::to_string(band.steps),
                                    std::isfinite(band.r0_step_ohm) ? mohm(band.r0_step_ohm) : "-",
                                    mohm(r.tables ? band.r0_ohm : r.cell.r0_ohm(band.soc))};
    for (int p = 0; p < r.n_rc; ++p) {
      row.push_back(mohm(r.tables ? band.r_ohm[p] : r.cell.rc[p].r_ohm(band.soc)));
      row.push_back(fixed(r.tables ? band.tau_s[p] : r.cell.rc[p].tau_s(band.soc), 1));
    }
    const bool has = b < e.bands.size() && e.bands[b].rows > 0;
    row.push_back(has ? fixed(1000.0 * e.bands[b].rmse_V, 1) : "-");
    row.push_back(has ? fixed(1000.0 * e.bands[b].max_abs_V, 1) : "-");
    row.push_back(band.excited ? "ok" : (band.rows == 0 ? "no data" : "too little"));
    t.add_row(row);
  }
  out += t.render();
  if (!r.tables) out += "  (constants written: the values above are the same in every band)\n";
  if (!r.warnings.empty()) {
    out += "\nwarnings:\n";
    for (const auto& w : r.warnings) out += "  " + w + "\n";
  }
  out += "\nA model fitted to one log: check it against another before trusting it, and respect the cell maker's limits.\n";
  return out;
}

nlohmann::ordered_json fit_cell_json(const battery::CellLog& log, const fit::CellFitResult& r,
                                     const fit::VoltageErrors& e, const std::string& model_file) {
  nlohmann::ordered_json j;
  j["schema"] = kFitCellSchema;
  j["log"] = {{"file", log.file},
              {"rows", r.rows},
              {"sections", r.sections},
              {"duration_s", r.duration_s},
              {"dt_min_s", r.dt_min_s},
              {"dt_max_s", r.dt_max_s}};
  if (r.has_temperature)
    j["log"]["temperature_C"] = {{"mean", r.temperature_mean_C}, {"min", r.temperature_min_C}, {"max", r.temperature_max_C}};
  j["model_file"] = model_file;
  const auto& se = r.soc_estimate;
  nlohmann::ordered_json anchors = nlohmann::ordered_json::array();
  for (const auto& a : se.anchors)
    anchors.push_back({{"kind", anchor_key(a.kind)}, {"line", log.line[a.row]}, {"soc", a.soc}, {"how", a.how}});
  j["soc"] = {{"capacity_Ah", se.capacity_Ah},
              {"capacity_from_log", se.capacity_from_log},
              {"capacity_source", se.capacity_source},
              {"known_points", anchors},
              {"v_max_V", r.cell.v_max_V},
              {"v_max_source", se.v_full_source},
              {"v_cutoff_V", r.cell.v_cutoff_V},
              {"v_cutoff_source", se.v_empty_source},
              {"chemistry", se.chemistry ? nlohmann::ordered_json(se.chemistry->name) : nlohmann::ordered_json()}};
  if (r.cell.coverage) {
    const auto& c = *r.cell.coverage;
    j["coverage"] = {{"soc_min", c.soc_min}, {"soc_max", c.soc_max}, {"current_max_A", c.current_max_A ? nlohmann::ordered_json(*c.current_max_A) : nlohmann::ordered_json()},
                     {"current_min_A", c.current_min_A ? nlohmann::ordered_json(*c.current_min_A) : nlohmann::ordered_json()},
                     {"source", c.source}};
    if (c.temperature_min_C) j["coverage"]["temperature_min_C"] = *c.temperature_min_C;
    if (c.temperature_max_C) j["coverage"]["temperature_max_C"] = *c.temperature_max_C;
  }
  j["ocv"] = {{"rest_points", r.ocv_rest_points}, {"loaded_points", r.ocv_loaded_points}, {"table_points", r.cell.ocv_V.size()}};
  j["rc_pairs"] = r.n_rc;
  if (!r.rc_candidates.empty()) {
    nlohmann::ordered_json cands = nlohmann::ordered_json::array();
    for (const auto& c : r.rc_candidates)
      cands.push_back({{"rc_pairs", c.rc_pairs}, {"tau_max_s", c.tau_max_s}, {"held_out_rmse_V", c.held_out_rmse_V}, {"chosen", c.chosen}});
    j["rc_selection"] = cands;
  }
  j["tables"] = r.tables;
  j["current_steps"] = r.steps;
  j["iterations"] = r.iterations;
  j["status"] = fit::to_string(r.status);
  j["voltage_rmse_V"] = e.all.rmse_V;
  j["voltage_max_error_V"] = e.all.max_abs_V;
  if (r.thermal && r.cell.thermal)
    j["thermal"] = {{"heat_capacity_J_per_K", r.thermal->heat_capacity_J_per_K},
                    {"c_J_per_kgK", r.cell.thermal->c_J_per_kgK},
                    {"hA_W_per_K", r.thermal->hA_W_per_K},
                    {"air_C", r.thermal->air_C},
                    {"air_given", r.thermal->air_given},
                    {"temperature_rmse_K", r.thermal->rmse_K},
                    {"temperature_max_error_K", r.thermal->max_error_K},
                    {"c_fitted", r.thermal->c_fitted},
                    {"hA_fitted", r.thermal->hA_fitted},
                    {"how", r.thermal->how}};
  if (r.arrhenius)
    j["resistance_temperature"] = {{"model", "arrhenius"},
                                   {"source", r.arrhenius->fitted ? "fitted" : "prior"},
                                   {"activation_energy_J_per_mol", r.arrhenius->ea_J_per_mol},
                                   {"reference_C", r.arrhenius->reference_C},
                                   {"temperature_spread_K", r.arrhenius->spread_K},
                                   {"steps_with_temperature", r.arrhenius->steps},
                                   {"how", r.arrhenius->how}};
  j["voltage_max_error_line"] = e.all.rows ? log.line[e.all.max_row] : 0;
  j["voltage_mean_error_V"] = e.all.mean_V;
  j["held_out_blocks"] = r.held_out_blocks;
  j["rows_evaluated"] = r.rows_evaluated;
  j["held_out_rows"] = r.held_out_rows;
  j["held_out_rmse_V"] = r.held_out_rows > 0 ? nlohmann::ordered_json(r.held_out_rmse_V) : nlohmann::ordered_json();
  if (r.cell.fit_quality)
    j["quality"] = {{"passed", r.cell.fit_quality->passed},
                    {"threshold_V", r.cell.fit_quality->threshold_V},
                    {"judged_on", r.held_out_rows > 0 ? "held_out" : "resimulation"},
                    {"ocv_physical", r.ocv_physical}};
  j["counted_rows"] = e.counted.rows;
  j["counted_voltage_rmse_V"] = e.counted.rmse_V;
  j["counted_voltage_max_error_V"] = e.counted.max_abs_V;
  nlohmann::ordered_json bands = nlohmann::ordered_json::array();
  for (std::size_t b = 0; b < r.bands.size(); ++b) {
    const auto& band = r.bands[b];
    nlohmann::ordered_json o;
    o["soc"] = band.soc;
    o["soc_lo"] = band.soc_lo;
    o["soc_hi"] = band.soc_hi;
    o["steps"] = band.steps;
    o["rows"] = band.rows;
    o["r0_step_ohm"] = std::isfinite(band.r0_step_ohm) ? nlohmann::ordered_json(band.r0_step_ohm) : nlohmann::ordered_json();
    o["r0_ohm"] = r.cell.r0_ohm(band.soc);
    nlohmann::ordered_json rc = nlohmann::ordered_json::array();
    for (int p = 0; p < r.n_rc; ++p)
      rc.push_back({{"r_ohm", r.cell.rc[p].r_ohm(band.soc)}, {"tau_s", r.cell.rc[p].tau_s(band.soc)},
                    {"se_r", band.se_r[p]}, {"se_tau", band.se_tau[p]}});
    o["rc"] = rc;
    o["se_r0"] = band.se_r0;
    if (b < e.bands.size() && e.bands[b].rows > 0) {
      o["voltage_rmse_V"] = e.bands[b].rmse_V;
      o["voltage_max_error_V"] = e.bands[b].max_abs_V;
    }
    o["excited"] = band.excited;
    if (!band.excited) o["why"] = band.why;
    bands.push_back(o);
  }
  j["bands"] = bands;
  j["notes"] = r.notes;
  j["warnings"] = r.warnings;
  return j;
}

std::string fit_cell_trace_csv(const battery::CellLog& log, const fit::CellFitResult& r,
                               const std::vector<double>& v_model) {
  std::string out = "time_s,line,current_A,v_measured_V,v_model_V,error_mV,soc\n";
  char buf[256];
  for (std::size_t k = 0; k < log.size(); ++k) {
    std::snprintf(buf, sizeof buf, "%.3f,%zu,%.6g,%.5f,%.5f,%.2f,%.5f\n", log.time_s[k], log.line[k],
                  log.current_A[k], log.voltage_V[k], v_model[k], 1000.0 * (v_model[k] - log.voltage_V[k]), r.soc[k]);
    out += buf;
  }
  return out;
}

}  // namespace sortie::report
